package flow

import (
	"math"
	"testing"

	"axiswim/lbm"
)

// hill fills a mean field with Hill's spherical vortex (Hill 1894, Phil.
// Trans. R. Soc. A 185, 213; e.g. Batchelor 1967 §7.2) of radius a centred
// at z0, in the frame moving with it (the stream far away is -U):
//
//	inside:  psi = A r^2 (a^2 - r^2 - (z - z0)^2),  A = 3U/(4a^2)
//	outside: psi = -(U/2) r^2 (1 - a^3/rho^3),      rho^2 = r^2 + (z - z0)^2
//
// so u_z = (1/r) dpsi/dr and u_r = -(1/r) dpsi/dz, the vorticity inside is
// omega = 10 A r, and the ring's centre, where psi is largest, lies at
// r = a/sqrt(2) in the equatorial plane z = z0; its circulation, the
// integral of omega over the half-disk, is (20/3) A a^3 = 5 U a [D: derived
// here from the streamfunction].
func hill(nz, nr int, z0, a, U float64) *MeanField {
	m := &MeanField{Nz: nz, Nr: nr, Uz: make([]float64, nz*nr), Ur: make([]float64, nz*nr),
		Rho: make([]float64, nz*nr), Solid: make([]bool, nz*nr)}
	A := 3 * U / (4 * a * a)
	for j := 0; j < nr; j++ {
		for k := 0; k < nz; k++ {
			z, r := float64(k)+0.5-z0, float64(j)+0.5
			rho2 := z*z + r*r
			i := j*nz + k
			if rho2 < a*a {
				m.Uz[i] = A * (2*a*a - 4*r*r - 2*z*z)
				m.Ur[i] = 2 * A * z * r
			} else {
				rho := math.Sqrt(rho2)
				a3 := a * a * a
				// psi = -(U/2)(r^2 - a^3 r^2 rho^-3)
				// dpsi/dr = -(U/2)(2r - a^3 (2r rho^-3 - 3 r^3 rho^-5))
				// dpsi/dz = -(U/2)(3 a^3 r^2 z rho^-5)
				dpr := -0.5 * U * (2*r - a3*(2*r/(rho2*rho)-3*r*r*r/(rho2*rho2*rho)))
				dpz := -0.5 * U * 3 * a3 * r * r * z / (rho2 * rho2 * rho)
				m.Uz[i] = dpr / r
				m.Ur[i] = -dpz / r
			}
			m.Rho[i] = 1
		}
	}
	return m
}

// TestHillVortex: the ring of Hill's vortex is found within a tenth of a
// cell of r = a/sqrt(2), z = z0, and its circulation within 1% of 5 U a
// (issue 5), at a = 20 cells.
func TestHillVortex(t *testing.T) {
	const nz, nr, z0, a, U = 120, 60, 60.3, 20.0, 1e-3
	m := hill(nz, nr, z0, a, U)
	f := &lbm.Fields{Nz: nz, Nr: nr, Uz: m.Uz, Ur: m.Ur, Rho: m.Rho}
	psi := lbm.Streamfunction(f)
	omega := lbm.Vorticity(f, false)
	rings := FindRings(m, psi, omega, 1e-3)
	if len(rings) != 1 {
		t.Fatalf("%d rings, want 1: %+v", len(rings), rings)
	}
	r := rings[0]
	if d := math.Hypot(r.Z-z0, r.R-a/math.Sqrt2); d > 0.1 {
		t.Errorf("ring centre (%.3f, %.3f), want (%.3f, %.3f): off by %.3f cells", r.Z, r.R, z0, a/math.Sqrt2, d)
	}
	if e := math.Abs(r.Circulation/(5*U*a) - 1); e > 0.01 {
		t.Errorf("circulation %.5g, want 5 U a = %.5g (%.2f%% off)", r.Circulation, 5*U*a, 100*e)
	}
	t.Logf("centre (%.4f, %.4f) vs (%.4f, %.4f); circulation %.5g vs %.5g", r.Z, r.R, z0, a/math.Sqrt2, r.Circulation, 5*U*a)
}

// TestStreamfunctionConsistent: psi = 0 on the axis and d psi/dr = r u_z
// to second order: on Hill's vortex the centred difference of psi between
// rows matches r u_z at the midpoint within the trapezoidal rule's error,
// which falls by 4 when the grid is refined by 2.
func TestStreamfunctionConsistent(t *testing.T) {
	errAt := func(scale float64) float64 {
		nz, nr := int(60*scale), int(30*scale)
		a, z0 := 10*scale, 30.3*scale
		m := hill(nz, nr, z0, a, 1e-3)
		f := &lbm.Fields{Nz: nz, Nr: nr, Uz: m.Uz, Ur: m.Ur, Rho: m.Rho}
		psi := lbm.Streamfunction(f)
		// exact psi at the nodes, inside the vortex
		A := 3e-3 / (4 * a * a)
		var worst float64
		for j := 0; j < nr; j++ {
			for k := 0; k < nz; k++ {
				z, r := float64(k)+0.5-z0, float64(j)+0.5
				if z*z+r*r < 0.8*a*a {
					ex := A * r * r * (a*a - r*r - z*z)
					worst = math.Max(worst, math.Abs(psi[j*nz+k]-ex)/(A*a*a*a*a/4))
				}
			}
		}
		return worst
	}
	e1, e2 := errAt(1), errAt(2)
	if order := math.Log2(e1 / e2); order < 1.8 {
		t.Errorf("streamfunction error %.3g -> %.3g: order %.2f, want about 2", e1, e2, order)
	}
	if e2 > 1e-2 {
		t.Errorf("streamfunction error %.3g of its maximum at 20 cells per radius", e2)
	}
}
