package main

import (
	"math"
	"testing"

	"axiswim/lbm"
)

// TestPerturbation checks criterion (3)'s measure on fields made by hand: a
// z-independent flow has none, and one node raised by a has a(1 - 1/Nz)
// (the row mean moves by a/Nz). Exact up to the round-off of subtracting
// means of values up to 0.4: tolerance 1e-15 absolute, about ten ulps of 0.4.
func TestPerturbation(t *testing.T) {
	f := lbm.NewFields(8, 4)
	for j := 0; j < f.Nr; j++ {
		for k := 0; k < f.Nz; k++ {
			f.Uz[f.At(k, j)] = 0.1 * float64(j+1)
		}
	}
	if p := perturbation(f); p > 1e-16 {
		t.Fatalf("z-independent flow: P = %g, want 0", p)
	}
	const a = 1e-3
	f.Uz[f.At(3, 2)] += a
	want := a * (1 - 1.0/8)
	if p := perturbation(f); math.Abs(p-want) > 1e-15 {
		t.Fatalf("one node raised by %g: P = %g, want %g", a, p, want)
	}
}

// TestMaxSpeedOf checks criteria (1) and (2)'s measure: the largest speed,
// and a NaN or Inf anywhere reported as not finite.
func TestMaxSpeedOf(t *testing.T) {
	f := lbm.NewFields(4, 4)
	f.Uz[5], f.Ur[5] = 0.3, 0.4
	if m, ok := maxSpeedOf(f); !ok || m != 0.5 {
		t.Fatalf("got %g, %v; want 0.5, true", m, ok)
	}
	for _, bad := range []float64{math.NaN(), math.Inf(1)} {
		f.Ur[9] = bad
		if _, ok := maxSpeedOf(f); ok {
			t.Fatalf("u_r = %g not caught", bad)
		}
	}
}

// TestPeriodAt checks the acoustic scaling of the period: the demo's 3918
// steps at tau+ = 0.55, halved with tau+ - 1/2 per level (3918/16 = 244.9
// at the fourth level).
func TestPeriodAt(t *testing.T) {
	for _, c := range []struct {
		tau  float64
		want int
	}{{0.55, 3918}, {0.525, 1959}, {0.503125, 245}} {
		if got := periodAt(c.tau); got != c.want {
			t.Errorf("periodAt(%g) = %d, want %d", c.tau, got, c.want)
		}
	}
	// In a container 8 times the demo's (radius 48 mm, length 192 mm) the
	// finest level has tau+ - 1/2 = 0.05/8 and 8 x 3918 steps per period,
	// so its level 0 of 4 (tau+ - 1/2 = 0.05/64) has 3918 again.
	if got := periodIn(0.5+0.05/64, 8); got != 3918 {
		t.Errorf("periodIn(0.5 + 0.05/64, 8) = %d, want 3918", got)
	}
}
