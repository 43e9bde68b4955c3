package drive

import (
	"bytes"
	"context"
	"math"
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
	sum, err := Run(context.Background(), c, l, Options{Out: t.TempDir(), Threads: 2, Quiet: true})
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

// TestThreeSphereStroke: the scallop theorem and its way out, on the
// coarse three-sphere example (Reynolds number about 0.06). With the
// second arm a quarter period behind, the swimmer moves towards the end
// of the lagging arm; with the lag reversed it moves the other way at the
// same speed (the mirror image of the stroke, shifted a quarter period in
// time, which matters only while it ramps up: within 1% after 4 periods,
// 9% after 3); with the arms in
// phase (a reciprocal stroke) its net displacement is below 2% of the
// lagged one's (Purcell 1977; the row of issue 9; here it is zero to
// round-off, as the stroke is symmetric under z -> -z).
func TestThreeSphereStroke(t *testing.T) {
	lag := threeSphere(t, "three-sphere-lag", "")
	back := threeSphere(t, "three-sphere-lag", "90.0")
	rec := threeSphere(t, "three-sphere-reciprocal", "")
	u, ub := *lag.MeanVelocity, *back.MeanVelocity
	t.Logf("lag -90: %.4g m/s, lag +90: %.4g m/s, in phase: net %.3g m against %.3g m", u, ub, *rec.NetDisplacement, *lag.NetDisplacement)
	if !(u > 0) || *lag.LeadingSphere != 3 {
		t.Errorf("lagging arm 2: speed %.3g m/s, leading sphere %d; want +z, sphere 3", u, *lag.LeadingSphere)
	}
	if math.Abs(ub+u) > 0.01*math.Abs(u) {
		t.Errorf("reversed lag: %.4g m/s, want %.4g", ub, -u)
	}
	if r := math.Abs(*rec.NetDisplacement / *lag.NetDisplacement); !(r < 0.02) {
		t.Errorf("reciprocal stroke: net displacement %.3g of the lagged one's", r)
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
