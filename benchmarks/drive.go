package main

import (
	"fmt"
	"io"
	"os"
	"runtime"
	"time"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/lbm"
)

// driveCells are the resolutions of the demo whose drive step is timed:
// the demo as shipped (12 cells per radius of the small sphere) and a
// finer case at 24.
var driveCells = []int{12, 24}

// driveWarmUp is the number of steps a simulation takes before any
// timing: the lattice and scratch pages are touched, the workers are
// running, the mass keeper has corrected once (every 200 steps) and the
// spheres have crossed nodes, so that the boundary and body work is that of
// a running case.
const driveWarmUp = 400

// demoCase returns the embedded demo case with grid.cells_per_radius set
// to cells.
func demoCase(cells int) (*cases.Case, error) {
	c, err := cases.ParseExample("demo")
	if err != nil {
		return nil, err
	}
	c.Grid.CellsPerRadius = cells
	return c, nil
}

// newDemo sets up the demo at cells per radius with the given number of
// goroutines on kernel path p and takes the warm-up steps. It returns the
// time the set-up took (without the warm-up).
//
// drive takes the kernel path from AXISWIM_KERNEL, as a user chooses it, so
// the path is set there for the set-up and restored after it (the solver
// keeps the path it was made with).
func newDemo(cells, threads int, p lbm.KernelPath) (*drive.Simulation, time.Duration, error) {
	c, err := demoCase(cells)
	if err != nil {
		return nil, 0, err
	}
	if p != lbm.KernelAuto {
		old, had := os.LookupEnv(lbm.KernelEnv)
		os.Setenv(lbm.KernelEnv, string(p))
		if had {
			defer os.Setenv(lbm.KernelEnv, old)
		} else {
			defer os.Unsetenv(lbm.KernelEnv)
		}
	}
	t0 := time.Now()
	sim, err := drive.Setup(c, threads)
	if err != nil {
		return nil, 0, fmt.Errorf("demo at %d cells per radius: %w", cells, err)
	}
	setup := time.Since(t0)
	if err := sim.Advance(driveWarmUp); err != nil {
		sim.Close()
		return nil, 0, fmt.Errorf("demo at %d cells per radius, warm-up: %w", cells, err)
	}
	return sim, setup, nil
}

// driveResult is the timing of a stretch of drive steps.
type driveResult struct {
	cells, nz, nr  int
	path           lbm.KernelPath
	stepsPerPeriod int
	threads        int
	setup          time.Duration // drive.Setup
	batches        int           // batches timed
	steps          int           // steps per batch
	wall, kernel   time.Duration // the best batch's wall time, and its part in the fluid kernel
	allocs         uint64        // heap allocations during all batches
}

// perPeriod is the wall time per drive period.
func (r driveResult) perPeriod() time.Duration {
	return time.Duration(float64(r.wall) / float64(r.steps) * float64(r.stepsPerPeriod))
}

// outside is the share of a step's wall time spent outside the fluid
// kernel: halo, boundary links, bodies, dynamics, mass keeper.
func (r driveResult) outside() float64 { return 1 - float64(r.kernel)/float64(r.wall) }

// allocsPerStep is the number of heap allocations per step.
func (r driveResult) allocsPerStep() float64 {
	return float64(r.allocs) / float64(r.steps*r.batches)
}

// timed describes what was timed.
func (r driveResult) timed() string {
	return fmt.Sprintf("best of %d x %d steps", r.batches, r.steps)
}

// driveBatches is the number of batches measureDrive times; the best is
// kept, as for the kernel (a shared machine only ever slows a batch down).
const driveBatches = 3

// measureDrive sets up the demo at cells per radius, warms it up and times
// Advance in driveBatches batches of about dur/driveBatches each (the
// estimate of a step's time comes from the warm-up), keeping the fastest;
// its time per step is extrapolated to a period.
func measureDrive(cells, threads int, p lbm.KernelPath, dur time.Duration) (driveResult, error) {
	t0 := time.Now()
	sim, setup, err := newDemo(cells, threads, p)
	if err != nil {
		return driveResult{}, err
	}
	defer sim.Close()
	perStep := (time.Since(t0) - setup) / driveWarmUp
	l := sim.Lattice
	r := driveResult{cells: cells, path: sim.Fluid.Kernel(), nz: l.Nz, nr: l.Nr, stepsPerPeriod: l.StepsPerPeriod,
		threads: sim.Fluid.Threads(), setup: setup, batches: driveBatches}
	r.steps = max(1, int(dur/driveBatches/max(perStep, 1)))
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	for b := range driveBatches {
		k0 := sim.Fluid.KernelTime()
		start := time.Now()
		err = sim.Advance(r.steps)
		wall := time.Since(start)
		if err != nil {
			return driveResult{}, fmt.Errorf("demo at %d cells per radius: %w", cells, err)
		}
		if b == 0 || wall < r.wall {
			r.wall, r.kernel = wall, sim.Fluid.KernelTime()-k0
		}
	}
	runtime.ReadMemStats(&after)
	r.allocs = after.Mallocs - before.Mallocs
	return r, nil
}

// driveTable times the drive step of the demo at 12 and 24 cells per
// radius with each kernel path and goroutine count for about dur each, and
// prints a markdown table: wall time per drive period, the speed-up over
// the portable path when that was timed too, the share of a step spent
// outside the fluid kernel and the allocations per step.
func driveTable(w io.Writer, threads []int, paths []lbm.KernelPath, dur time.Duration) error {
	var rows []driveResult
	for _, cells := range driveCells {
		for _, n := range threads {
			for _, p := range paths {
				r, err := measureDrive(cells, n, p, dur)
				if err != nil {
					return fmt.Errorf("drive step, %d cells per radius, threads=%d, kernel %s: %w", cells, n, p, err)
				}
				rows = append(rows, r)
			}
		}
	}
	portable := map[[2]int]time.Duration{} // cells, goroutines -> the portable path's time per period
	for _, r := range rows {
		if r.path == lbm.KernelPortable {
			portable[[2]int{r.cells, r.threads}] = r.perPeriod()
		}
	}
	fmt.Fprintln(w, "| case | cells per radius | grid | steps per period | path | goroutines | timed | wall time per period | faster than portable | outside kernel | allocs per step |")
	fmt.Fprintln(w, "|---|---:|---|---:|---|---:|---:|---:|---:|---:|---:|")
	for _, r := range rows {
		speedup := "-"
		if p, ok := portable[[2]int{r.cells, r.threads}]; ok && r.path != lbm.KernelPortable {
			speedup = fmt.Sprintf("%.2fx", p.Seconds()/r.perPeriod().Seconds())
		}
		fmt.Fprintf(w, "| demo | %d | %dx%d | %d | %s | %d | %s | %.2f s | %s | %.1f%% | %.3g |\n",
			r.cells, r.nz, r.nr, r.stepsPerPeriod, r.path, r.threads, r.timed(),
			r.perPeriod().Seconds(), speedup, 100*r.outside(), r.allocsPerStep())
	}
	fmt.Fprintln(w)
	fmt.Fprintf(w, "Drive step: drive.Simulation.Advance on the embedded demo (grid.cells_per_radius as given), after %d warm-up steps;\n", driveWarmUp)
	fmt.Fprintf(w, "%d batches of about %v each, the fastest kept and its time per step extrapolated to a period.\n", driveBatches, (dur / driveBatches).Round(time.Millisecond))
	fmt.Fprintf(w, "Outside kernel: 1 - (time in the fused stream-and-collide kernel, lbm.Solver.KernelTime) / wall time:\n")
	fmt.Fprintf(w, "halo, boundary links, bodies, dynamics and the mass keeper (no observers). Allocs: heap allocations per step.\n")
	return nil
}
