package verify

import (
	"math"
	"math/cmplx"
)

// BesselJ0 and BesselJ1 evaluate the Bessel functions of the first kind of
// orders 0 and 1 for a complex argument by their power series,
//
//	J0(z) = sum_k (-z^2/4)^k / (k!)^2,  J1(z) = (z/2) sum_k (-z^2/4)^k / (k! (k+1)!)
//
// (Abramowitz & Stegun 1972, eq. 9.1.10). The series loses about 0.13|z|
// decimal digits to cancellation (CHECKS.md 2c), so it is accurate to about
// 1e-12 for |z| <= 20 and to about 5 digits at |z| = 40; callers here stay
// below |z| = 40 (Womersley numbers up to about 30).
func BesselJ0(z complex128) complex128 { return besselSeries(z, 0) }

// BesselJ1 is documented with BesselJ0.
func BesselJ1(z complex128) complex128 { return z / 2 * besselSeries(z, 1) }

// besselSeries sums (-z^2/4)^k / (k! (k+n)!) for n = 0 or 1.
func besselSeries(z complex128, n int) complex128 {
	q := -z * z / 4
	term := complex(1, 0)
	if n == 1 {
		term = 1 // 1/(0! 1!)
	}
	sum := term
	for k := 1; k < 300; k++ {
		term *= q / complex(float64(k)*float64(k+n), 0)
		sum += term
		if cmplx.Abs(term) < 1e-17*cmplx.Abs(sum) {
			break
		}
	}
	return sum
}

// Kelvin returns the Kelvin functions ber x and bei x, defined by
// ber x + i bei x = J0(x e^{3 pi i/4}) (Abramowitz & Stegun 1972, eq. 9.9.1).
func Kelvin(x float64) (ber, bei float64) {
	j := BesselJ0(complex(x, 0) * cmplx.Exp(complex(0, 3*math.Pi/4)))
	return real(j), imag(j)
}
