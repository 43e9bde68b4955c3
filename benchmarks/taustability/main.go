// Command taustability measures how fast a slow flow may be on the lbm
// lattice before it becomes unstable, as a function of the relaxation time
// tau+ close to 1/2: the regime of the coarse outer levels of a grid refined
// with acoustic scaling (issue 17; ../shared/METHODS.md 15.1), where every
// coarser level halves tau+ - 1/2 while the lattice velocity (the Mach
// number) stays the same.
//
// The lattice is lbm's D2Q9 with the axisymmetric source terms on
// (lbm.Config{Axisymmetric: true}) and the two-relaxation-time collision of
// Ginzburg, Verhaeghe & d'Humieres 2008 (Commun. Comput. Phys. 3, 427) with
// the magic parameter Lambda = 3/16 (lbm's default), on an Nz x Nr pipe
// (default 64 x 32 nodes) with periodic ends, the axis as a mirror at r = 0
// and a no-slip side wall halfway above the last row (halfway bounce-back).
// At fixed Lambda the odd rate follows from tau- - 1/2 = Lambda/(tau+ - 1/2):
// tau- = 75.5 at tau+ = 0.5025. Three flows:
//
//   - womersley: liquid at rest (plus the seed below) driven by the uniform
//     axial body force G cos(omega t), G = U omega, set with SetForce before
//     every step. Far from the wall the liquid moves as a plug with the
//     velocity U sin(omega t); the Stokes layer of thickness
//     delta = sqrt(2 nu/omega) sits at the side wall. The exact flow does not
//     depend on z, so whatever does is the lattice's own.
//   - jet: a steady axial jet on the axis, u_z(r) = U (1 - tanh((r - r0)/w))/2
//     with r0 = Nr/2 and w = 2 cells, no force: a free shear layer away
//     from the walls and a uniform stream U along the axis. It rolls up by
//     the Kelvin-Helmholtz instability (a physical one) and decays by
//     viscosity. It stands for a streaming jet crossing a coarse level.
//   - ring: an annular jet u_z = U exp(-((r - r0)/w)^2), w = 3 cells, with
//     no flow at the axis or at the wall: two free shear layers like the
//     jet's, but the axis row at rest. The pair jet/ring separates the axis
//     from the shear layers.
//
// The drive period follows acoustic scaling from the demo: the demo's finest
// lattice has tau+ = 0.55 and 3918 steps per period (axiswim check demo), and
// each coarser level halves both tau+ - 1/2 and the steps per period, so the
// period at tau+ is T = 3918 (tau+ - 1/2)/0.05 steps. The Stokes layer is
// then delta/dx = 4.56 (tau+ - 1/2)/0.05 cells: as under-resolved as on
// that level of a refined demo. Every run lasts -periods periods (default
// 20, the demo's run) of that T, the jet and the ring as long: 20 T is the
// number of steps that level takes in a 20-period run. With -container k
// the periods are those of the demo in a container k times its radius and
// length at the same finest spacing (issue 17's confinement study): the
// acoustic limit makes the finest tau+ - 1/2 k times smaller and the steps
// per period k times more, so T = k^2 x 3918 (tau+ - 1/2)/0.05.
//
// Seed: every run starts from the equilibrium of rho = 1 + 1e-6 x and
// u = 1e-6 (x, x), x uniform in [-1, 1) from a fixed PCG stream (so runs
// repeat bit for bit), plus the flow's initial field; the jet and the ring
// add the radial velocity 1e-3 U sin(2 pi (k + 1/2)/Nz) exp(-((r-r0)/w)^2)
// to start their roll-up.
//
// Instability (the criteria): a run is unstable when, at any of the samples
// taken every max(1, T/50) steps, (1) a velocity component is NaN or Inf
// (every population enters the density that divides the momentum, so this
// catches a NaN or Inf population too; the populations are also checked
// once at the end), or (2) the largest speed |u| on the lattice exceeds 0.3
// (Mach 0.52; the flows asked for stay below about 1.1 x 0.2). For the
// womersley flow a third, more sensitive criterion is reported beside the
// first two: the z-dependent part of the flow, P = max over nodes of
// sqrt((u_z - <u_z>_row)^2 + u_r^2), grows: its largest value over the last
// period exceeds 100 times its largest over the first period (where the
// flow is stable the seed's sound decays instead). The threshold of the
// search is that of (1) and (2); the growth column says where (3) alone
// puts it.
//
// Threshold search: the velocity scale U is raised from 0.0025 by factors
// of 2 up to 0.2 until a run is unstable, then bisected geometrically
// -bisect times (default 6: the bracket is then 2^(1/64), about 1.1%, wide).
// When U = 0.0025 is unstable already, U is halved down to 1e-5 until a run
// is stable, then bisected the same way ("<" when none was). This assumes
// that the runs below the first unstable U are all stable (it is checked
// only at the scan points). The table gives the bracket, the
// Mach number U/cs (cs = 1/sqrt 3) and the grid Reynolds number
// Re_g = U dx/nu (nu = (tau+ - 1/2)/3 in lattice units) at the last stable
// U, and the largest speed measured in that run over U. A threshold at or
// above 0.2 is printed as a lower bound (">=").
//
// Checks beside the main table (-checks, at -check-taus): the same searches
// with the grid doubled (128 x 64, same tau and period), with a period 4
// times longer (and so a run 4 times longer), with a run 4 times longer at
// the same period, with BGK instead of TRT, with TRT at Lambda = 1/12
// (tau- closer to 1/2), and with the axisymmetric terms off (planar).
//
// Usage:
//
//	go run ./benchmarks/taustability [-grid 64x32] [-periods 20] [-bisect 6] [-taus 0.5025,...] [-flows womersley,jet,ring] [-checks=true] [-check-taus 0.5025,0.50625] [-container 1]
//
// Every run uses one goroutine (lbm.Config.Threads = 1) and the kernel path
// lbm chooses (AXISWIM_KERNEL or the fastest; all give the same bits). The
// measured table is in README.md in this directory.
package main

import (
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"time"

	"axiswim/lbm"
)

// Defaults of the study.
const (
	finestTau    = 0.55 // the demo's finest tau+ (axiswim check demo)
	finestPeriod = 3918 // the demo's steps per period at finestTau
	scanStart    = 0.0025
	scanMax      = 0.2  // largest velocity scale U tried
	scanMin      = 1e-5 // smallest U tried below an unstable scanStart
	maxSpeed     = 0.3  // criterion (2)
	growthFactor = 100  // criterion (3)
	seedAmp      = 1e-6
	jetWidth     = 2.0 // w of the jet, cells
	ringWidth    = 3.0 // w of the ring jet, cells
	samplesPer   = 50  // samples per period
)

var defaultTaus = []float64{0.5025, 0.503125, 0.505, 0.50625, 0.5075, 0.51, 0.5125, 0.525}

// flowKind is one of the two flows.
type flowKind int

const (
	womersley flowKind = iota
	jet
	ring
)

func (f flowKind) String() string {
	switch f {
	case jet:
		return "jet"
	case ring:
		return "ring"
	}
	return "womersley"
}

// setup is one configuration whose threshold is searched.
type setup struct {
	flow      flowKind
	planar    bool // the axisymmetric terms off (a check)
	nz, nr    int
	tau       float64
	collision lbm.Collision
	magic     float64 // TRT magic parameter; 0 is lbm's default 3/16
	period    int     // steps per period
	periods   int
}

func (s setup) nu() float64 { return lbm.Cs2 * (s.tau - 0.5) }

// delta is the Stokes-layer thickness sqrt(2 nu/omega) in cells.
func (s setup) delta() float64 {
	omega := 2 * math.Pi / float64(s.period)
	return math.Sqrt(2 * s.nu() / omega)
}

// outcome is what one run at one velocity scale gave.
type outcome struct {
	stable  bool   // criteria (1) and (2) held over the whole run
	reason  string // why not: "NaN", "|u|>0.3"; "" when stable
	umax    float64
	steps   int64   // steps taken (fewer than asked when it failed)
	pFirst  float64 // womersley: largest P over the first period
	pLast   float64 // womersley: largest P over the last period
	growing bool    // womersley: criterion (3)
}

// run makes the lattice of s, seeds it, drives it with velocity scale u
// and watches it (see the package comment).
func run(s setup, u float64) (outcome, error) {
	sol, err := lbm.New(lbm.Config{
		Nz: s.nz, Nr: s.nr, Tau: s.tau, Collision: s.collision, Magic: s.magic,
		Axisymmetric: !s.planar, PeriodicZ: true, Threads: 1,
	})
	if err != nil {
		return outcome{}, err
	}
	defer sol.Close()

	rng := rand.New(rand.NewPCG(17, 2008))
	noise := func() float64 { return seedAmp * (2*rng.Float64() - 1) }
	r0 := float64(s.nr) / 2
	sol.SetEquilibrium(func(k, j int) (float64, float64, float64) {
		rho, uz, ur := 1+noise(), noise(), noise()
		r := float64(j) + 0.5
		switch s.flow {
		case jet:
			x := (r - r0) / jetWidth
			uz += u * 0.5 * (1 - math.Tanh(x))
			ur += 1e-3 * u * math.Sin(2*math.Pi*(float64(k)+0.5)/float64(s.nz)) * math.Exp(-x*x)
		case ring:
			x := (r - r0) / ringWidth
			uz += u * math.Exp(-x*x)
			ur += 1e-3 * u * math.Sin(2*math.Pi*(float64(k)+0.5)/float64(s.nz)) * math.Exp(-x*x)
		}
		return rho, uz, ur
	})

	omega := 2 * math.Pi / float64(s.period)
	g := u * omega
	total := int64(s.period) * int64(s.periods)
	every := int64(max(1, s.period/samplesPer))
	var f *lbm.Fields
	var o outcome
	for sol.Steps() < total {
		if s.flow == womersley {
			sol.SetForce(g*math.Cos(omega*float64(sol.Steps())), 0)
		}
		sol.Step()
		if sol.Steps()%every != 0 && sol.Steps() != total {
			continue
		}
		if s.flow == womersley {
			sol.SetForce(g*math.Cos(omega*float64(sol.Steps())), 0)
		}
		f = sol.Fields(f)
		speed, finite := maxSpeedOf(f)
		o.umax = max(o.umax, speed)
		if !finite {
			o.reason = "NaN"
			break
		}
		if speed > maxSpeed {
			o.reason = fmt.Sprintf("|u|>%g", maxSpeed)
			break
		}
		if s.flow == womersley {
			p := perturbation(f)
			if sol.Steps() <= int64(s.period) {
				o.pFirst = max(o.pFirst, p)
			}
			if sol.Steps() > total-int64(s.period) {
				o.pLast = max(o.pLast, p)
			}
		}
	}
	o.steps = sol.Steps()
	if o.reason == "" && !populationsFinite(sol) {
		o.reason = "NaN"
	}
	o.stable = o.reason == ""
	o.growing = !o.stable || (s.flow == womersley && o.pLast > growthFactor*o.pFirst)
	return o, nil
}

// maxSpeedOf returns the largest speed on the lattice and whether every
// velocity component is finite.
func maxSpeedOf(f *lbm.Fields) (float64, bool) {
	m := 0.0
	for n := range f.Uz {
		uz, ur := f.Uz[n], f.Ur[n]
		if math.IsNaN(uz) || math.IsInf(uz, 0) || math.IsNaN(ur) || math.IsInf(ur, 0) {
			return m, false
		}
		m = max(m, math.Hypot(uz, ur))
	}
	return m, true
}

// perturbation is P, the largest size of the z-dependent part of the
// velocity: sqrt((u_z - <u_z>_row)^2 + u_r^2) over all nodes.
func perturbation(f *lbm.Fields) float64 {
	p := 0.0
	for j := 0; j < f.Nr; j++ {
		row := f.Uz[f.At(0, j) : f.At(0, j)+f.Nz]
		mean := 0.0
		for _, v := range row {
			mean += v
		}
		mean /= float64(f.Nz)
		for k, v := range row {
			p = max(p, math.Hypot(v-mean, f.Ur[f.At(k, j)]))
		}
	}
	return p
}

// populationsFinite reports whether every population of the lattice is
// finite.
func populationsFinite(sol *lbm.Solver) bool {
	nz, nr := sol.Size()
	for i := 0; i < lbm.Q; i++ {
		for j := 0; j < nr; j++ {
			for k := 0; k < nz; k++ {
				v := sol.Population(i, k, j)
				if math.IsNaN(v) || math.IsInf(v, 0) {
					return false
				}
			}
		}
	}
	return true
}

// threshold is the result of one search.
type threshold struct {
	s          setup
	lo, hi     float64 // last stable and first unstable velocity scale (hi = 0: none below scanMax)
	atLo       outcome // the run at lo
	why        string  // why the run at hi failed
	growthLo   float64 // the largest stable U by criterion (3) among the runs made (0: none)
	growthHint string  // "" or a note when (3) binds below lo
	runs       int
	steps      int64
	wall       time.Duration
}

// search finds the threshold of s by scan and bisection.
func search(s setup, bisect int) (threshold, error) {
	t0 := time.Now()
	th := threshold{s: s}
	try := func(u float64) (outcome, error) {
		o, err := run(s, u)
		th.runs++
		th.steps += o.steps
		if err == nil && !o.growing && u > th.growthLo {
			th.growthLo = u
		}
		return o, err
	}
	// probe runs at u and moves the bracket's end that u belongs to; it
	// reports whether u was stable.
	probe := func(u float64) (bool, error) {
		o, err := try(u)
		if err != nil {
			return false, err
		}
		if o.stable {
			th.lo, th.atLo = u, o
		} else {
			th.hi, th.why = u, o.reason
		}
		return o.stable, nil
	}
	for u := scanStart; u <= scanMax*(1+1e-9); u *= 2 {
		stable, err := probe(u)
		if err != nil {
			return th, err
		}
		if !stable {
			break
		}
	}
	if th.hi == 0 {
		// Stable up to the cap: the scan's last point is 0.16; try the cap too.
		if _, err := probe(scanMax); err != nil {
			return th, err
		}
	}
	// Unstable already at the scan start: halve down to scanMin.
	for th.lo == 0 && th.hi > scanMin {
		if _, err := probe(th.hi / 2); err != nil {
			return th, err
		}
	}
	if th.lo == 0 {
		th.wall = time.Since(t0)
		return th, nil // unstable down to scanMin: no bracket
	}
	for i := 0; i < bisect && th.hi > 0; i++ {
		if _, err := probe(math.Sqrt(th.lo * th.hi)); err != nil {
			return th, err
		}
	}
	th.wall = time.Since(t0)
	return th, nil
}

func main() {
	fs := flag.NewFlagSet("taustability", flag.ExitOnError)
	gridFlag := fs.String("grid", "64x32", "lattice NZxNR")
	periods := fs.Int("periods", 20, "drive periods per run")
	bisect := fs.Int("bisect", 6, "bisection steps after the scan (bracket 2^(1/2^n))")
	tausFlag := fs.String("taus", "", "tau+ values, comma-separated (default the study's eight)")
	flowsFlag := fs.String("flows", "womersley,jet,ring", "flows: womersley, jet, ring")
	checks := fs.Bool("checks", true, "also run the grid, period and BGK checks")
	checkTausFlag := fs.String("check-taus", "0.5025,0.50625", "tau+ values of the checks, comma-separated")
	container := fs.Float64("container", 1, "periods of the demo in a container this many times its radius and length (k^2 times the demo's steps per period at a tau+)")
	fs.Usage = func() {
		fmt.Fprintf(fs.Output(), "usage: go run ./benchmarks/taustability [flags]\n\n"+
			"Measures the largest stable flow speed of TRT near tau = 1/2 and prints a table.\n\n")
		fs.PrintDefaults()
	}
	fs.Parse(os.Args[1:])
	nz, nr, err := parseGrid(*gridFlag)
	if err == nil && (*periods < 1 || *bisect < 0 || !(*container >= 1)) {
		err = fmt.Errorf("-periods must be positive, -bisect at least 0 and -container at least 1")
	}
	taus := defaultTaus
	if err == nil && *tausFlag != "" {
		taus, err = parseTaus(*tausFlag)
	}
	var checkTaus []float64
	if err == nil {
		checkTaus, err = parseTaus(*checkTausFlag)
	}
	var flows []flowKind
	if err == nil {
		flows, err = parseFlows(*flowsFlag)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "taustability:", err)
		os.Exit(2)
	}
	if err := study(os.Stdout, nz, nr, *periods, *bisect, *container, taus, flows, *checks, checkTaus); err != nil {
		fmt.Fprintln(os.Stderr, "taustability:", err)
		os.Exit(1)
	}
}

// periodAt is the steps per period at tau+ under acoustic scaling from the
// demo's finest level.
func periodAt(tau float64) int {
	return periodIn(tau, 1)
}

// periodIn is the steps per period at tau+ on the levels of the demo in a
// container k times its radius and length (lengths in proportion), the
// finest spacing the same: the acoustic limit He = omega_L L/c_s <= 1 then
// takes k times more finest steps per period, each k times shorter, so the
// finest tau+ - 1/2 is k times smaller and a level at a given tau+ takes
// k^2 times more steps per period than in the demo.
func periodIn(tau, k float64) int {
	return int(math.Round(k * k * finestPeriod * (tau - 0.5) / (finestTau - 0.5)))
}

func study(w io.Writer, nz, nr, periods, bisect int, k float64, taus []float64, flows []flowKind, checks bool, checkTaus []float64) error {
	start := time.Now()
	fmt.Fprintf(w, "TRT (Lambda = 3/16) stability near tau = 1/2: axisymmetric D2Q9, %dx%d, periodic ends, %d periods per run\n", nz, nr, periods)
	if k == 1 {
		fmt.Fprintf(w, "period T = %d (tau+ - 1/2)/%g steps (acoustic scaling from the demo's finest level)\n\n", finestPeriod, finestTau-0.5)
	} else {
		fmt.Fprintf(w, "period T = %g^2 x %d (tau+ - 1/2)/%g steps (acoustic scaling from the finest level of the demo in a container %g times its size)\n\n",
			k, finestPeriod, finestTau-0.5, k)
	}
	var rows []threshold
	for _, fl := range flows {
		for _, tau := range taus {
			s := setup{flow: fl, nz: nz, nr: nr, tau: tau, collision: lbm.TRT, period: periodIn(tau, k), periods: periods}
			th, err := search(s, bisect)
			if err != nil {
				return err
			}
			rows = append(rows, th)
		}
	}
	printTable(w, rows)
	if checks {
		fmt.Fprintf(w, "\nChecks at tau+ = %s: the same search with the grid doubled, the period 4 times longer (and so the run),\n"+
			"the run 4 times longer at the same period, BGK instead of TRT, and the axisymmetric terms off (planar).\n\n", floats(checkTaus))
		var cr []threshold
		for _, fl := range flows {
			for _, tau := range checkTaus {
				base := setup{flow: fl, nz: nz, nr: nr, tau: tau, collision: lbm.TRT, period: periodIn(tau, k), periods: periods}
				for _, s := range []setup{base,
					with(base, func(s *setup) { s.nz, s.nr = 2*nz, 2*nr }),
					with(base, func(s *setup) { s.period *= 4 }),
					with(base, func(s *setup) { s.periods *= 4 }),
					with(base, func(s *setup) { s.collision = lbm.BGK }),
					with(base, func(s *setup) { s.magic = 1.0 / 12 }),
					with(base, func(s *setup) { s.planar = true })} {
					th, err := search(s, bisect)
					if err != nil {
						return err
					}
					cr = append(cr, th)
				}
			}
		}
		printTable(w, cr)
	}
	fmt.Fprintf(w, "\nU: velocity scale (womersley: core amplitude G/omega; jet: centre-line speed; ring: peak speed); bracket = last stable .. first unstable U.\n")
	fmt.Fprintf(w, "Ma = U/cs and Re_g = U dx/nu, nu = (tau+ - 1/2)/3, at the last stable U; u_max/U: the largest |u| sampled in that run over U\n")
	fmt.Fprintf(w, "(above 1: the Stokes-layer overshoot, the roll-up, or a mode still growing when the run ended).\n")
	fmt.Fprintf(w, "failed by: the criterion the first unstable run broke. growth-stable U: largest U among the runs made with no growth\n")
	fmt.Fprintf(w, "of the z-dependent part (womersley only, criterion 3 of the package comment); P1, Pn: that part's largest size\n")
	fmt.Fprintf(w, "in the first and last period of the last stable run.\n")
	fmt.Fprintf(w, "\nTotal time %.1f s.\n", time.Since(start).Seconds())
	return nil
}

func floats(xs []float64) string {
	var b []string
	for _, x := range xs {
		b = append(b, strconv.FormatFloat(x, 'g', -1, 64))
	}
	return strings.Join(b, ", ")
}

func with(s setup, f func(*setup)) setup {
	f(&s)
	return s
}

func printTable(w io.Writer, rows []threshold) {
	fmt.Fprintln(w, "| flow | collision | grid | tau+ | nu | T (steps) | steps | delta/dx | U bracket | Ma | Re_g | u_max/U | failed by | growth-stable U | P1 | Pn | runs | s |")
	fmt.Fprintln(w, "|---|---|---|---:|---:|---:|---:|---:|---|---:|---:|---:|---|---:|---:|---:|---:|---:|")
	for _, t := range rows {
		s := t.s
		bracket := fmt.Sprintf("%.4g .. %.4g", t.lo, t.hi)
		ge := ""
		switch {
		case t.hi == 0:
			bracket, ge = fmt.Sprintf(">= %.4g", t.lo), ">= "
		case t.lo == 0:
			bracket, ge = fmt.Sprintf("< %.4g", t.hi), "< "
		}
		why := t.why
		if why == "" {
			why = "-"
		}
		gs, p1, pn := "-", "-", "-"
		if s.flow == womersley {
			gs = fmt.Sprintf("%.4g", t.growthLo)
			p1, pn = fmt.Sprintf("%.2g", t.atLo.pFirst), fmt.Sprintf("%.2g", t.atLo.pLast)
		}
		um, lo := t.atLo.umax/t.lo, t.lo
		if t.lo == 0 {
			um, lo = math.NaN(), t.hi
		}
		coll := s.collision.String()
		if s.magic != 0 {
			coll += fmt.Sprintf(" Lambda=%.4g", s.magic)
		}
		if s.planar {
			coll += " planar"
		}
		fmt.Fprintf(w, "| %s | %s | %dx%d | %g | %.4g | %d | %d | %.3g | %s | %s%.3g | %s%.3g | %.3g | %s | %s | %s | %s | %d | %.1f |\n",
			s.flow, coll, s.nz, s.nr, s.tau, s.nu(), s.period, s.period*s.periods, s.delta(), bracket,
			ge, lo/math.Sqrt(lbm.Cs2), ge, lo/s.nu(), um, why, gs, p1, pn, t.runs, t.wall.Seconds())
	}
}

func parseGrid(s string) (int, int, error) {
	a, b, ok := strings.Cut(s, "x")
	nz, e1 := strconv.Atoi(a)
	nr, e2 := strconv.Atoi(b)
	if !ok || e1 != nil || e2 != nil || nz < 4 || nr < 4 {
		return 0, 0, fmt.Errorf("-grid %q: want NZxNR, both at least 4, such as 64x32", s)
	}
	return nz, nr, nil
}

func parseTaus(s string) ([]float64, error) {
	var ts []float64
	for _, f := range strings.Split(s, ",") {
		t, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(t > 0.5) || periodAt(t) < 1 {
			return nil, fmt.Errorf("-taus: %q: want values above 1/2 such as 0.505", f)
		}
		ts = append(ts, t)
	}
	return ts, nil
}

func parseFlows(s string) ([]flowKind, error) {
	var fl []flowKind
	for _, f := range strings.Split(s, ",") {
		switch strings.TrimSpace(f) {
		case "womersley":
			fl = append(fl, womersley)
		case "jet":
			fl = append(fl, jet)
		case "ring":
			fl = append(fl, ring)
		default:
			return nil, fmt.Errorf("-flows: %q: want womersley, jet or ring", f)
		}
	}
	return fl, nil
}
