package main

import (
	"math"
	"testing"
)

// TestExtrapolateSpeeds: speeds made up as exact power laws in a/R,
// U = U_inf + b (a/R)^p, which Richardson's extrapolation with the
// observed order must return to rounding (the order too), and the line
// exactly where p = 1; differences of changing sign leave the order
// undefined.
func TestExtrapolateSpeeds(t *testing.T) {
	radii := [3]float64{15, 30, 60}
	const uInf, b = 5e-5, -3e-4
	for _, p := range []float64{1, 2, 0.5} {
		var u [3]float64
		for i, r := range radii {
			u[i] = uInf + b*math.Pow(1/r, p)
		}
		e := extrapolateSpeeds(radii, u)
		if !e.OK || math.Abs(e.P-p) > 1e-9 || math.Abs(e.Inf/uInf-1) > 1e-9 {
			t.Errorf("p = %g: got ok %v, order %.12g, U_inf %.12g; want order %g, U_inf %g", p, e.OK, e.P, e.Inf, p, uInf)
		}
		if p == 1 && (math.Abs(e.Line0/uInf-1) > 1e-9 || math.Abs(e.Line1/b-1) > 1e-9) {
			t.Errorf("p = 1: line %g + %g a/R, want %g + %g a/R", e.Line0, e.Line1, uInf, b)
		}
	}
	if e := extrapolateSpeeds(radii, [3]float64{1, 2, 1.5}); e.OK {
		t.Errorf("differences of changing sign gave an order %g", e.P)
	}
	if e := extrapolateSpeeds([3]float64{15, 30, 45}, [3]float64{1, 2, 2.5}); e.OK {
		t.Errorf("radii not doubling gave an order %g", e.P)
	}
}
