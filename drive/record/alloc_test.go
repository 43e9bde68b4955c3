package record

import (
	"math"
	"testing"

	"axiswim/cases"
	"axiswim/drive"
)

// TestFieldSampleAllocatesNothing: a sample of the mean and phase
// averages (no snapshot file) allocates nothing once its scratch has grown
// (issue 7: zero allocations per step in steady state; the steps
// themselves: drive's TestAdvanceAllocatesNothing).
func TestFieldSampleAllocatesNothing(t *testing.T) {
	c, err := cases.Load("../../testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	sim, err := drive.Setup(c, 2)
	if err != nil {
		t.Fatal(err)
	}
	defer sim.Close()
	if err := sim.Advance(sim.Lattice.StepsPerPeriod); err != nil {
		t.Fatal(err)
	}
	// A sample of the mean and phase averages (no snapshot file).
	r := NewFields(sim, t.TempDir())
	p := r.avgStart
	if p >= r.snapStart {
		t.Fatalf("period %d of the averaging window also takes snapshots (from %d): pick a case with a longer window", p, r.snapStart)
	}
	n := int64(p*r.spp) + int64(math.Round(float64(r.spp)/float64(meanSamplesPerPeriod)))
	if a := testing.AllocsPerRun(3, func() { r.Step(n) }); a != 0 {
		t.Errorf("a field sample allocates %g times, want none", a)
	}
	if r.mean.samples == 0 || r.err != nil {
		t.Fatalf("the field sample was not taken (%d samples, error %v)", r.mean.samples, r.err)
	}
}
