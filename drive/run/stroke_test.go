package run

import (
	"bytes"
	"context"
	"slices"
	"testing"

	"axiswim/cases"
)

// threeSphere is the three-sphere example, coarse (5 cells per radius),
// short (4 periods) and in a smaller container, with the second arm's
// phase set (degrees).
func threeSphere(t *testing.T, name string, phase string) *Summary {
	t.Helper()
	src, err := cases.Get(name)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range [][2]string{
		{"cells_per_radius = 8", "cells_per_radius = 5"},
		{"periods = 10", "periods = 4"},
		{"radius = 8e-3", "radius = 5e-3"}, // a smaller container: 10 mm across
		{"length = 40e-3", "length = 24e-3"},
	} {
		src = bytes.Replace(src, []byte(r[0]), []byte(r[1]), 1)
	}
	if phase != "" {
		src = bytes.Replace(src, []byte("phase = -90.0"), []byte("phase = "+phase), 1)
	}
	src = append(src, "\n[output]\nvtk = false\npictures = false\n"...)
	c, l := mustCase(t, name, src)
	sum, err := Execute(context.Background(), c, l, Options{Out: t.TempDir(), Threads: 2, Quiet: true})
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

// TestThreeSphereStroke: the three-sphere example through a whole run, on
// the coarse version (Reynolds number about 0.06): with the second arm a
// quarter period behind, the swimmer moves towards the end of the lagging
// arm (sphere 3 leads), and the summary sets its speed beside the models.
// The scallop theorem itself (the reversed lag swims the other way at the
// same speed, the in-phase stroke not at all; Purcell 1977) is the
// verification row three-sphere-stokes (drive/verify), which runs the same
// three strokes and is part of go test; this test ran them too until the
// AVX2 issue cut the duplicate runs from the test budget.
func TestThreeSphereStroke(t *testing.T) {
	lag := threeSphere(t, "three-sphere-lag", "")
	u := *lag.MeanVelocity
	t.Logf("lag -90: %.4g m/s, net %.3g m", u, *lag.NetDisplacement)
	if !(u > 0) || *lag.LeadingSphere != 3 {
		t.Errorf("lagging arm 2: speed %.3g m/s, leading sphere %d; want +z, sphere 3", u, *lag.LeadingSphere)
	}
	// The summary sets the speed beside the steady-Stokes chain model and
	// the leading-order formula, flagged as outside their range here
	// (omega L^2/nu = 3.4 > StokesMaxUnsteady).
	var sources []string
	for _, c := range lag.Comparison {
		if c.Source != "" {
			sources = append(sources, c.Source)
			if c.Simulated != u || c.Ratio == nil {
				t.Errorf("%s: simulated %g, ratio %v; want the mean speed %g and a ratio", c.Source, c.Simulated, c.Ratio, u)
			}
		}
	}
	want := []string{"Stokes chain model (outside its range, see the model notes)", "three-sphere leading order"}
	if !slices.Equal(sources, want) {
		t.Errorf("speed comparisons %q, want %q", sources, want)
	}
}
