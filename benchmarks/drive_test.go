package main

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"axiswim/lbm"
)

// BenchmarkDemoStep times one drive step (drive.Simulation.Advance(1)) of
// the embedded demo at 12 and 24 cells per radius, with 1 goroutine and
// with all, as sub-benchmarks cells=C/threads=N. Besides ns/op (one step)
// and the allocations per step it reports the wall time per drive period
// ("s/period": a step's time times the steps per period) and the share of
// the step spent outside the fluid kernel ("outside-%").
func BenchmarkDemoStep(b *testing.B) {
	for _, cells := range driveCells {
		b.Run(fmt.Sprintf("cells=%d", cells), func(b *testing.B) {
			for _, n := range threadCounts() {
				b.Run(fmt.Sprintf("threads=%d", n), func(b *testing.B) {
					sim, _, err := newDemo(cells, n, lbm.KernelAuto) // set-up and warm-up are not timed
					if err != nil {
						b.Fatal(err)
					}
					defer sim.Close()
					spp := sim.Lattice.StepsPerPeriod
					b.ReportAllocs()
					k0 := sim.Fluid.KernelTime()
					for b.Loop() {
						if err := sim.Advance(1); err != nil {
							b.Fatal(err)
						}
					}
					wall := b.Elapsed()
					kern := sim.Fluid.KernelTime() - k0
					b.ReportMetric(wall.Seconds()/float64(b.N)*float64(spp), "s/period")
					b.ReportMetric(100*(1-kern.Seconds()/wall.Seconds()), "outside-%")
				})
			}
		})
	}
}

// TestDriveTable runs the drive table briefly and checks its shape and
// that every timing is positive and finite.
func TestDriveTable(t *testing.T) {
	if testing.Short() {
		t.Skip("sets up the demo at 24 cells per radius")
	}
	r, err := measureDrive(12, 1, lbm.KernelAuto, 20*time.Millisecond)
	if err != nil {
		t.Fatal(err)
	}
	if r.steps < 1 || !positiveFinite(r.perPeriod().Seconds()) || r.outside() < 0 || r.outside() >= 1 {
		t.Errorf("demo at 12 cells: %+v, %v per period, outside %v", r, r.perPeriod(), r.outside())
	}
	var sb strings.Builder
	if err := driveTable(&sb, []int{1}, []lbm.KernelPath{lbm.KernelAuto}, 10*time.Millisecond); err != nil {
		t.Fatal(err)
	}
	if got := strings.Count(sb.String(), "| demo |"); got != len(driveCells) {
		t.Errorf("%d rows, want %d:\n%s", got, len(driveCells), sb.String())
	}
}
