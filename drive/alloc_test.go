package drive

import (
	"fmt"
	"testing"

	"axiswim/cases"
)

// TestAdvanceAllocatesNothing: once its scratch has grown to working size
// (one drive period), a step of the coupled swimmer (lattice, boundary
// links, covering and refilling, dynamics, the mass keeper's correction)
// allocates nothing, and neither does an observation (the field sample:
// record's TestFieldSampleAllocatesNothing) (issue 7: zero allocations per step in steady state). The
// counts are exact, not averages: one call of many steps is counted.
// AllocsPerRun counts at GOMAXPROCS 1 (the pool's goroutines still run);
// with more processors the Go runtime itself allocates a few sudogs for
// the pool's WaitGroup while its per-processor caches fill (measured: a
// handful in the first few thousand steps of the demo, then none), which
// is not this code's doing.
func TestAdvanceAllocatesNothing(t *testing.T) {
	for _, levels := range []int{1, 2} {
		t.Run(fmt.Sprintf("levels=%d", levels), func(t *testing.T) { advanceAllocatesNothing(t, levels) })
	}
}

// advanceAllocatesNothing is TestAdvanceAllocatesNothing on the given
// number of levels (on refined levels a step is every level's steps and
// transfers, an observation every level's fields).
func advanceAllocatesNothing(t *testing.T, levels int) {
	c, err := cases.Load("../testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	c.Grid.Levels = levels
	sim, err := Setup(c, 2)
	if err != nil {
		t.Fatal(err)
	}
	defer sim.Close()
	spp := sim.Lattice.StepsPerPeriod
	if err := sim.Advance(spp); err != nil {
		t.Fatal(err)
	}
	// Two mass corrections per call; AllocsPerRun calls once more before
	// counting.
	steps := 2 * massCadence
	var stepErr error
	allocs := testing.AllocsPerRun(1, func() {
		if err := sim.Advance(steps); err != nil {
			stepErr = err
		}
	})
	if stepErr != nil {
		t.Fatal(stepErr)
	}
	if allocs != 0 {
		t.Errorf("%g allocations in %d steps of the swimmer, want none", allocs, steps)
	}
	if a := testing.AllocsPerRun(3, func() { sim.Observe() }); a != 0 {
		t.Errorf("an observation allocates %g times, want none", a)
	}
}
