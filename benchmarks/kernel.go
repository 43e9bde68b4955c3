package main

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"

	"axiswim/lbm"
)

// kernel is one configuration of the lattice-Boltzmann step to time.
type kernel struct {
	name      string
	collision lbm.Collision
	axisym    bool
	single    bool           // float32 storage of the populations
	path      lbm.KernelPath // the kernel path (KernelAuto: AXISWIM_KERNEL or the fastest)
}

// on returns k on kernel path p.
func (k kernel) on(p lbm.KernelPath) kernel {
	k.path = p
	return k
}

// bytes is the DRAM traffic of one node update of k (see bytesPerUpdate).
func (k kernel) bytes() int {
	if k.single {
		return bytesPerUpdate / 2
	}
	return bytesPerUpdate
}

// latticeBytes is the size of the two population lattices of k on g.
func (k kernel) latticeBytes(g grid) int {
	if k.single {
		return g.latticeBytes() / 2
	}
	return g.latticeBytes()
}

// kernels are the configurations measured, in table order, each on every
// kernel path asked for.
var kernels = []kernel{
	{name: "planar BGK", collision: lbm.BGK, axisym: false},
	{name: "axisymmetric TRT", collision: lbm.TRT, axisym: true},
	{name: "axisymmetric TRT, float32", collision: lbm.TRT, axisym: true, single: true},
}

// parsePaths reads the -kernels flag: a comma-separated list of kernel
// paths (portable, avx2, avx512), "all" for every path this machine runs,
// or "" for the one lbm chooses (AXISWIM_KERNEL, else the fastest). Each
// path is checked against the processor; the list is returned resolved,
// without repeats.
func parsePaths(s string) ([]lbm.KernelPath, error) {
	s = strings.TrimSpace(s)
	if s == "all" {
		return lbm.Kernels(), nil
	}
	var ps []lbm.KernelPath
	for _, f := range strings.Split(s, ",") {
		p, err := lbm.ResolveKernel(lbm.KernelPath(strings.TrimSpace(f)))
		if err != nil {
			return nil, err
		}
		if !slices.Contains(ps, p) {
			ps = append(ps, p)
		}
	}
	return ps, nil
}

const (
	benchTau    = 0.8  // relaxation time of the benchmark lattices
	benchForce  = 1e-6 // uniform body force along z, lattice units
	warmUpSteps = 3    // steps taken before any timing
)

// bytesPerUpdate is the DRAM traffic of one node update counted the way the
// triad is counted: nine float64 reads plus nine float64 writes.
const bytesPerUpdate = 9*8 + 9*8

// grid is a lattice size, Nz x Nr.
type grid struct{ nz, nr int }

func (g grid) String() string { return fmt.Sprintf("%dx%d", g.nz, g.nr) }

// cells is the number of lattice nodes updated per step.
func (g grid) cells() int { return g.nz * g.nr }

// latticeBytes is the size of the two population lattices (nine float64
// planes each, with the one-node halo) that one step streams through.
func (g grid) latticeBytes() int { return 2 * lbm.Q * (g.nz + 2) * (g.nr + 2) * 8 }

var (
	defaultGrids = []grid{{256, 128}, {960, 240}, {4096, 1024}}
	allGrids     = []grid{{256, 128}, {512, 256}, {960, 240}, {2048, 1024}, {4096, 1024}}
)

// parseGrids reads a comma-separated list such as "960x240,4096x1024";
// "" gives the default grids and "all" every known grid.
func parseGrids(s string) ([]grid, error) {
	s = strings.TrimSpace(s)
	switch s {
	case "":
		return defaultGrids, nil
	case "all":
		return allGrids, nil
	}
	var gs []grid
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		zs, rs, ok := strings.Cut(f, "x")
		if !ok {
			return nil, fmt.Errorf("grid %q: want NZxNR, e.g. 512x256", f)
		}
		nz, err1 := strconv.Atoi(zs)
		nr, err2 := strconv.Atoi(rs)
		if err1 != nil || err2 != nil || nz < 1 || nr < 1 {
			return nil, fmt.Errorf("grid %q: want two positive integers NZxNR", f)
		}
		gs = append(gs, grid{nz, nr})
	}
	if len(gs) == 0 {
		return nil, fmt.Errorf("no grid in %q", s)
	}
	return gs, nil
}

// newSolver builds the lattice of kernel k on grid g with the given number
// of goroutines, sets the body force and takes the warm-up steps, so that
// the caller can start its timer right away. The caller must Close it.
func newSolver(k kernel, g grid, threads int) (*lbm.Solver, error) {
	s, err := lbm.New(lbm.Config{
		Nz:           g.nz,
		Nr:           g.nr,
		Tau:          benchTau,
		Collision:    k.collision,
		Axisymmetric: k.axisym,
		PeriodicZ:    true,
		Threads:      threads,
		Kernel:       k.path,
		Single:       k.single,
	})
	if err != nil {
		return nil, err
	}
	s.SetForce(benchForce, 0)
	for range warmUpSteps {
		s.Step()
	}
	return s, nil
}

// mlups converts cells*steps node updates in d into million lattice
// updates per second.
func mlups(cells, steps int, d time.Duration) float64 {
	return float64(cells) * float64(steps) / d.Seconds() / 1e6
}

// kernelResult is one timed kernel configuration.
type kernelResult struct {
	mlups   float64 // best batch rate
	threads int     // goroutines the solver used
	steps   int     // steps timed in total
}

// measureKernel times kernel k on grid g with the given number of
// goroutines for about dur: after the warm-up it runs batches of steps
// (each about dur/5 long, at least one step) until dur has passed, at least
// three batches, and reports the best batch rate, the way STREAM reports
// its best repetition.
func measureKernel(k kernel, g grid, threads int, dur time.Duration) (kernelResult, error) {
	s, err := newSolver(k, g, threads)
	if err != nil {
		return kernelResult{}, err
	}
	defer s.Close()

	t0 := time.Now()
	s.Step()
	one := max(time.Since(t0), time.Microsecond)
	batch := max(1, int(dur/5/one))

	res := kernelResult{threads: s.Threads()}
	var total time.Duration
	for n := 0; n < 3 || total < dur; n++ {
		t := time.Now()
		for range batch {
			s.Step()
		}
		d := time.Since(t)
		total += d
		res.steps += batch
		res.mlups = max(res.mlups, mlups(g.cells(), batch, d))
	}
	return res, nil
}

// kernelHeader describes the kernel paths of the run: the one lbm
// chooses by default here, how it was chosen, and every one the machine
// runs.
func kernelHeader() string {
	def, err := lbm.ResolveKernel(lbm.KernelAuto)
	if err != nil {
		return err.Error()
	}
	return fmt.Sprintf("%s, %s; paths this machine runs: %s", def.Describe(), lbm.KernelOrigin(), lbm.KernelNames(lbm.Kernels()))
}
