package verify

import (
	"math"
	"math/cmplx"
)

// Womersley is the exact oscillating flow in a rigid pipe of radius R driven
// by a uniform force density G0 cos(omega t) in a fluid of density Rho and
// kinematic viscosity Nu (Womersley 1955, J. Physiol. 127, 553; CHECKS.md
// 2a). Any consistent units.
type Womersley struct {
	R, Nu, Omega, G0, Rho float64
}

// k returns the complex wavenumber i^{3/2} sqrt(omega/nu).
func (w Womersley) k() complex128 {
	return complex(math.Sqrt(w.Omega/w.Nu), 0) * cmplx.Exp(complex(0, 3*math.Pi/4))
}

// Velocity returns the complex velocity amplitude at radius r: the axial
// velocity is Re{V(r) e^{i omega t}}, with
// V(r) = G0/(i omega rho) [1 - J0(k r)/J0(k R)].
func (w Womersley) Velocity(r float64) complex128 {
	k := w.k()
	return complex(w.G0/(w.Omega*w.Rho), 0) / 1i *
		(1 - BesselJ0(k*complex(r, 0))/BesselJ0(k*complex(w.R, 0)))
}

// Flow returns the complex amplitude of the volume flow rate,
// Q = pi R^2 G0/(i omega rho) [1 - 2 J1(kR)/(kR J0(kR))].
func (w Womersley) Flow() complex128 {
	kr := w.k() * complex(w.R, 0)
	return complex(math.Pi*w.R*w.R*w.G0/(w.Omega*w.Rho), 0) / 1i *
		(1 - 2*BesselJ1(kr)/(kr*BesselJ0(kr)))
}

// Poiseuille returns the quasi-steady centre-line speed G0 R^2/(4 mu) and
// flow rate pi G0 R^4/(8 mu) for the gradient amplitude G0.
func (w Womersley) Poiseuille() (uc, q float64) {
	mu := w.Rho * w.Nu
	return w.G0 * w.R * w.R / (4 * mu), math.Pi * w.G0 * math.Pow(w.R, 4) / (8 * mu)
}

// j01 and j02 are the first zeros of J0 (CHECKS.md 1b, [D]).
const (
	j01 = 2.404825557695773
	j02 = 5.520078110286311
)

// StartupCentre returns u_c(t)/u_c(inf) on the axis for the start-up of
// Hagen-Poiseuille flow from rest (Szymanski 1932, J. Math. Pures Appl. 11,
// 67; CHECKS.md 1b) at radius fraction y = r/R and viscous time
// tau = nu t / R^2:
//
//	u/u_inf = (1 - y^2) - 8 sum_n J0(j_n y)/(j_n^3 J1(j_n)) exp(-j_n^2 tau).
func StartupCentre(y, tau float64) float64 {
	u := 1 - y*y
	for _, jn := range besselZeros(60) {
		u -= 8 * math.J0(jn*y) / (jn * jn * jn * math.J1(jn)) * math.Exp(-jn*jn*tau)
	}
	return u
}

// besselZeros returns the first n zeros of J0, refined by Newton's method
// from McMahon's asymptotic estimate (Abramowitz & Stegun 1972, eq. 9.5.12).
func besselZeros(n int) []float64 {
	z := make([]float64, n)
	for m := 1; m <= n; m++ {
		b := (float64(m) - 0.25) * math.Pi
		x := b + 1/(8*b)
		for it := 0; it < 50; it++ {
			dx := math.J0(x) / (-math.J1(x))
			x -= dx
			if math.Abs(dx) < 1e-15*x {
				break
			}
		}
		z[m-1] = x
	}
	return z
}
