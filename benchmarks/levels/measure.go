package main

import (
	"fmt"
	"math"
	"slices"
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

// totals are the sums over all rounds of a measurement.
type totals struct {
	uniWall, uniKernel time.Duration // the uniform demo: in all, in the kernel
	uniSteps           int
	refWall, transfer  time.Duration // the refined lattice: in all, in the transfers
	refSteps           int
	level              []levelTimes
}

// result is the measurement of one goroutine count.
type result struct {
	threads int // goroutines per lattice (each level's lattice has this many)
	rounds  int
	sum     totals
	// ratios: each round's refined wall time per step over the uniform
	// demo's, sorted (their spread shows the machine's noise)
	ratios []float64
	// alone: each level's size and tau as a lattice of its own, its kernel
	// rate (MLUPS) and that rate over the uniform demo's measured beside
	// it; empty when not measured
	alone, aloneOf []float64
	// fine: the kernel rate of the uniform lattice of the finest spacing
	// over the whole container, MLUPS (0 when not measured)
	fine float64
}

// stepper steps a lattice n times.
type stepper func(n int)

// uniformStepper steps the uniform demo with the force of the drive's
// period.
func uniformStepper(lo *layout, u *lbm.Solver) stepper {
	w := 2 * math.Pi / float64(lo.demo.StepsPerPeriod)
	return func(n int) {
		for range n {
			u.SetForce(forceAmplitude*math.Cos(w*float64(u.Steps())), 0)
			u.Step()
		}
	}
}

// stepsFor returns how many steps of st take about d (at least one),
// from a timed probe of two steps.
func stepsFor(st stepper, d time.Duration) int {
	t := time.Now()
	st(2)
	per := max(time.Since(t)/2, time.Microsecond)
	return max(1, int(d/per))
}

// measure times the uniform demo and the refined lattice side by side in
// rounds of about batch each, alternating, for about dur in all: batches
// of tens of milliseconds share the machine's state (other processes, the
// clock), so the sums over all rounds keep its drift out of the ratios.
func measure(lo *layout, threads int, dur, batch time.Duration, alone, fine bool) (result, error) {
	res := result{threads: threads}
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
	stepUni := uniformStepper(lo, u)
	stepRef := func(n int) {
		for range n {
			h.Step()
		}
	}
	stepUni(warmUp)
	stepRef(warmUp)
	nu, nr := stepsFor(stepUni, batch), stepsFor(stepRef, batch)
	res.rounds = max(3, int(dur/(2*batch)))
	res.sum.level = make([]levelTimes, h.Len())
	for range res.rounds {
		k0 := u.KernelTime()
		t := time.Now()
		stepUni(nu)
		uw := time.Since(t)
		res.sum.uniWall += uw
		res.sum.uniKernel += u.KernelTime() - k0
		res.sum.uniSteps += nu

		before := make([]levelTimes, h.Len())
		for l := range before {
			before[l] = levelTimes{h.Level(l).Steps(), h.Level(l).KernelTime()}
		}
		tr0 := h.TransferTime()
		t = time.Now()
		stepRef(nr)
		rw := time.Since(t)
		res.sum.refWall += rw
		res.sum.transfer += h.TransferTime() - tr0
		res.sum.refSteps += nr
		for l := range before {
			res.sum.level[l].steps += h.Level(l).Steps() - before[l].steps
			res.sum.level[l].kernel += h.Level(l).KernelTime() - before[l].kernel
		}
		res.ratios = append(res.ratios, (rw.Seconds()/float64(nr))/(uw.Seconds()/float64(nu)))
	}
	slices.Sort(res.ratios)
	if alone {
		for l := range lo.cfgs {
			cfg := lo.cfgs[l]
			cfg.Threads = threads
			m, of, err := aloneRate(cfg, stepUni, u, batch, max(3, res.rounds/8))
			if err != nil {
				return res, fmt.Errorf("level %d alone: %w", l, err)
			}
			res.alone = append(res.alone, m)
			res.aloneOf = append(res.aloneOf, of)
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

// aloneRate times a uniform lattice of cfg (closed ends, a uniform force)
// in rounds batches of about batch, alternating with batches of the
// uniform demo (stepUni, u), and returns its kernel rate in MLUPS and that
// rate over the demo's in the same rounds.
func aloneRate(cfg lbm.Config, stepUni stepper, u *lbm.Solver, batch time.Duration, rounds int) (mlup, of float64, err error) {
	s, err := lbm.New(cfg)
	if err != nil {
		return 0, 0, err
	}
	defer s.Close()
	s.SetForce(forceAmplitude, 0)
	step := func(n int) {
		for range n {
			s.Step()
		}
	}
	step(2)
	n, nu := stepsFor(step, batch), stepsFor(stepUni, batch)
	var k, ku time.Duration
	for range rounds {
		k0 := s.KernelTime()
		step(n)
		k += s.KernelTime() - k0
		k0 = u.KernelTime()
		stepUni(nu)
		ku += u.KernelTime() - k0
	}
	nz, nr := s.Size()
	unz, unr := u.Size()
	m := mlups(nz*nr, int64(n*rounds), k)
	return m, m / mlups(unz*unr, int64(nu*rounds), ku), nil
}

// kernelRate times a uniform lattice of cfg (closed ends, a uniform force)
// for about dur after two warm-up steps, and returns its kernel rate in
// MLUPS: node updates over the time in the kernel (Solver.KernelTime).
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
// steps, the same number of level-0 steps), from the sums.
func (r result) uniPeriod(lo *layout) time.Duration {
	return time.Duration(float64(r.sum.uniWall) / float64(r.sum.uniSteps) * float64(lo.demo.StepsPerPeriod))
}

func (r result) refPeriod(lo *layout) time.Duration {
	return time.Duration(float64(r.sum.refWall) / float64(r.sum.refSteps) * float64(lo.demo.StepsPerPeriod))
}

// quartiles returns the lower quartile, the median and the upper quartile
// of the rounds' wall-time ratios.
func (r result) quartiles() (q1, q2, q3 float64) {
	at := func(p float64) float64 { return r.ratios[int(p*float64(len(r.ratios)-1)+0.5)] }
	return at(0.25), at(0.5), at(0.75)
}

// uniMLUPS is the uniform demo's kernel rate.
func (r result) uniMLUPS(lo *layout) float64 {
	return mlups(lo.demo.Nz*lo.demo.Nr, int64(r.sum.uniSteps), r.sum.uniKernel)
}

// levelMLUPS is level l's kernel rate in the refined lattice.
func (r result) levelMLUPS(lo *layout, l int) float64 {
	return mlups(lo.cells(l), r.sum.level[l].steps, r.sum.level[l].kernel)
}

// transferShare is the share of a refined step's wall time spent in the
// transfers between levels (Levels.TransferTime).
func (r result) transferShare() float64 { return r.sum.transfer.Seconds() / r.sum.refWall.Seconds() }

// kernelShare is the share of a refined step's wall time spent in the
// levels' kernels.
func (r result) kernelShare() float64 {
	var k time.Duration
	for _, lt := range r.sum.level {
		k += lt.kernel
	}
	return k.Seconds() / r.sum.refWall.Seconds()
}
