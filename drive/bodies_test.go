package drive

import (
	"math"
	"testing"

	"axiswim/cases"
)

// TestRefreshMatchesRelink: moving the links' fractions with the bodies
// (Bodies.refresh, when no node changed near a body) gives the same bits as
// finding the links again at every step: the demo's spheres, for 2000 steps
// after the ramp, forces and positions compared step by step.
func TestRefreshMatchesRelink(t *testing.T) {
	src, err := cases.Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	run := func(always bool) (*Simulation, error) {
		c, err := cases.Parse("demo", src)
		if err != nil {
			return nil, err
		}
		c.Grid.CellsPerRadius = 8 // cheaper; the spheres still cross nodes
		sim, err := Setup(c, 2)
		if err != nil {
			return nil, err
		}
		sim.sw.bodies.alwaysRelink = always
		return sim, nil
	}
	a, err := run(false)
	if err != nil {
		t.Fatal(err)
	}
	defer a.Close()
	b, err := run(true)
	if err != nil {
		t.Fatal(err)
	}
	defer b.Close()
	quiet := 0
	for n := range 2000 {
		if err := a.Advance(1); err != nil {
			t.Fatal(err)
		}
		if err := b.Advance(1); err != nil {
			t.Fatal(err)
		}
		for k, ba := range a.sw.bodies.List {
			bb := b.sw.bodies.List[k]
			if ba.Covered+ba.Uncovered == 0 {
				quiet++
			}
			if math.Float64bits(ba.LinkForce) != math.Float64bits(bb.LinkForce) || ba.Shape != bb.Shape || ba.Fallback != bb.Fallback {
				t.Fatalf("step %d, sphere %d: force %v at %v (%d fallbacks) with refreshed links, %v at %v (%d) with links found again",
					n, k+1, ba.LinkForce, ba.Shape.Z, ba.Fallback, bb.LinkForce, bb.Shape.Z, bb.Fallback)
			}
		}
	}
	if quiet < 1000 {
		t.Errorf("only %d sphere-steps without node changes: the refresh path was hardly tested", quiet)
	}
}
