package main

import (
	"fmt"
	"math"
	"time"

	"axiswim/lbm"
)

// forceAmplitude is the amplitude of the axial body force that drives both
// lattices, G cos(omega t) in level 0's (the demo's) lattice units with
// the drive's period: it keeps the liquid moving, which the kernel's time
// does not depend on.
const forceAmplitude = 1e-6

// warmUp is the number of level-0 (demo) steps taken before any timing.
const warmUp = 8

// newUniform makes the uniform demo lattice (360 x 90, closed ends,
// axisymmetric TRT at the demo's tau), fluid only.
func newUniform(lo *layout, threads int) (*lbm.Solver, error) {
	return lbm.New(lbm.Config{Nz: lo.demo.Nz, Nr: lo.demo.Nr, Tau: lo.demo.Tau, Collision: lbm.TRT,
		Axisymmetric: true, Threads: threads})
}

// newRefined makes the four levels of lo, fluid only, with the force of
// the drive's period set before every step of every level.
func newRefined(lo *layout, threads int) (*lbm.Levels, error) {
	base := lo.cfgs[0]
	base.Threads = threads
	h, err := lbm.NewLevels(base, lo.blocks)
	if err != nil {
		return nil, err
	}
	for l := range lo.cfgs {
		if got, want := h.Level(l).Config().Tau, lo.cfgs[l].Tau; got != want {
			h.Close()
			return nil, fmt.Errorf("level %d: lbm made tau %v, the layout says %v", l, got, want)
		}
	}
	w := 2 * math.Pi / float64(lo.demo.StepsPerPeriod)
	h.SetForceFunc(func(t float64) (float64, float64) { return forceAmplitude * math.Cos(w*t), 0 })
	return h, nil
}

// levelTimes is what a stretch of refined steps spent on one level.
type levelTimes struct {
	steps  int64
	kernel time.Duration
}

// sample is one timed batch of both lattices.
type sample struct {
	uniWall, uniKernel time.Duration // the uniform demo: its batch, in all and in the kernel
	uniSteps           int
	refWall, transfer  time.Duration // the refined lattice: its batch, and in the transfers
	refSteps           int
	level              []levelTimes
}

// result is the measurement of one goroutine count.
type result struct {
	threads  int // goroutines per lattice (each level has its own pool of this many)
	rounds   int
	uni, ref sample // the fastest batch of each lattice
	// alone: each level's kernel rate on a lattice of its own (same size,
	// tau, ends open or closed as the level's sides are not: a plain
	// uniform lattice), MLUPS
	alone []float64
	// fine: the kernel rate of the uniform lattice of the finest spacing
	// over the whole container, MLUPS (0 when not measured)
	fine float64
}

// measure times the uniform demo and the refined lattice side by side:
// rounds rounds, each a batch of the uniform demo of about dur/rounds/2
// and one of the refined lattice of about the same, keeping each
// lattice's fastest batch (a shared machine only slows a batch down, and
// alternating the two keeps a drift of the machine's speed out of their
// ratio).
func measure(lo *layout, threads, rounds int, dur time.Duration, alone, fine bool) (result, error) {
	res := result{threads: threads, rounds: rounds}
	u, err := newUniform(lo, threads)
	if err != nil {
		return res, err
	}
	defer u.Close()
	h, err := newRefined(lo, threads)
	if err != nil {
		return res, err
	}
	defer h.Close()
	w := 2 * math.Pi / float64(lo.demo.StepsPerPeriod)
	stepUniform := func(n int) {
		for range n {
			u.SetForce(forceAmplitude*math.Cos(w*float64(u.Steps())), 0)
			u.Step()
		}
	}
	// Warm up and estimate a step of each.
	stepUniform(warmUp)
	for range warmUp {
		h.Step()
	}
	t0 := time.Now()
	stepUniform(warmUp)
	perUni := time.Since(t0) / warmUp
	t0 = time.Now()
	for range warmUp {
		h.Step()
	}
	perRef := time.Since(t0) / warmUp
	batch := dur / time.Duration(2*rounds)
	nu := max(1, int(batch/max(perUni, time.Microsecond)))
	nr := max(1, int(batch/max(perRef, time.Microsecond)))

	for r := range rounds {
		var s sample
		k0 := u.KernelTime()
		t := time.Now()
		stepUniform(nu)
		s.uniWall, s.uniKernel, s.uniSteps = time.Since(t), u.KernelTime()-k0, nu

		before := make([]levelTimes, h.Len())
		for l := range before {
			before[l] = levelTimes{h.Level(l).Steps(), h.Level(l).KernelTime()}
		}
		tr0 := h.TransferTime()
		t = time.Now()
		for range nr {
			h.Step()
		}
		s.refWall, s.transfer, s.refSteps = time.Since(t), h.TransferTime()-tr0, nr
		for l := range before {
			s.level = append(s.level, levelTimes{h.Level(l).Steps() - before[l].steps, h.Level(l).KernelTime() - before[l].kernel})
		}
		if r == 0 || s.uniWall.Seconds()/float64(s.uniSteps) < res.uni.uniWall.Seconds()/float64(res.uni.uniSteps) {
			res.uni = s
		}
		if r == 0 || s.refWall.Seconds()/float64(s.refSteps) < res.ref.refWall.Seconds()/float64(res.ref.refSteps) {
			res.ref = s
		}
	}
	if alone {
		for l := range lo.cfgs {
			cfg := lo.cfgs[l]
			cfg.Threads = threads
			m, err := kernelRate(cfg, min(dur/time.Duration(2*len(lo.cfgs)), time.Second))
			if err != nil {
				return res, fmt.Errorf("level %d alone: %w", l, err)
			}
			res.alone = append(res.alone, m)
		}
	}
	if fine {
		cfg := lbm.Config{Nz: lo.nzF, Nr: lo.nrF, Tau: lo.cfgs[len(lo.cfgs)-1].Tau, Collision: lbm.TRT, Axisymmetric: true, Threads: threads}
		m, err := kernelRate(cfg, min(dur/4, time.Second))
		if err != nil {
			return res, fmt.Errorf("uniform lattice of the finest spacing: %w", err)
		}
		res.fine = m
	}
	return res, nil
}

// kernelRate times a uniform lattice of cfg (closed ends, no force) for
// about dur after two warm-up steps, and returns its kernel rate in MLUPS:
// node updates over the time in the kernel (Solver.KernelTime).
func kernelRate(cfg lbm.Config, dur time.Duration) (float64, error) {
	s, err := lbm.New(cfg)
	if err != nil {
		return 0, err
	}
	defer s.Close()
	s.SetForce(forceAmplitude, 0)
	s.Step()
	s.Step()
	k0, n0 := s.KernelTime(), s.Steps()
	t := time.Now()
	for n := 0; n < 3 || time.Since(t) < dur; n++ {
		s.Step()
	}
	nz, nr := s.Size()
	return mlups(nz*nr, s.Steps()-n0, s.KernelTime()-k0), nil
}

// mlups converts cells x steps node updates in d into millions per second.
func mlups(cells int, steps int64, d time.Duration) float64 {
	return float64(cells) * float64(steps) / d.Seconds() / 1e6
}

// uniPeriod and refPeriod are the wall times per drive period (3918 demo
// steps, the same number of level-0 steps).
func (r result) uniPeriod(lo *layout) time.Duration {
	return time.Duration(float64(r.uni.uniWall) / float64(r.uni.uniSteps) * float64(lo.demo.StepsPerPeriod))
}

func (r result) refPeriod(lo *layout) time.Duration {
	return time.Duration(float64(r.ref.refWall) / float64(r.ref.refSteps) * float64(lo.demo.StepsPerPeriod))
}

// uniMLUPS is the uniform demo's kernel rate in its fastest batch.
func (r result) uniMLUPS(lo *layout) float64 {
	return mlups(lo.demo.Nz*lo.demo.Nr, int64(r.uni.uniSteps), r.uni.uniKernel)
}

// levelMLUPS is level l's kernel rate in the refined lattice's fastest
// batch.
func (r result) levelMLUPS(lo *layout, l int) float64 {
	return mlups(lo.cells(l), r.ref.level[l].steps, r.ref.level[l].kernel)
}

// transferShare is the share of a refined step's wall time spent in the
// transfers between levels (Levels.TransferTime).
func (r result) transferShare() float64 { return r.ref.transfer.Seconds() / r.ref.refWall.Seconds() }

// kernelShare is the share of a refined step's wall time spent in the
// levels' kernels.
func (r result) kernelShare() float64 {
	var k time.Duration
	for _, lt := range r.ref.level {
		k += lt.kernel
	}
	return k.Seconds() / r.ref.refWall.Seconds()
}
