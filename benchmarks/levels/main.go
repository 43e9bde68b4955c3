// Command levels measures the speed of issue 17's refined lattice against
// the uniform demo, in one run: the demo (360 x 90 cells, 12 per radius of
// the small sphere, closed ends, axisymmetric TRT, tau 0.55006, 3918 steps
// per period) at 24 cells per radius in a container 4 times its radius
// and length (24 mm x 96 mm), on 4 levels refined by 2 (lbm.Levels): the
// coarsest, 360 x 90 cells of 4 times the demo's spacing, and the finest,
// of half the demo's spacing, around the spheres and their excursion.
// newLayout says how the levels are placed and their relaxation times
// chosen (acoustic scaling: tau+ - 1/2 doubles per finer level).
//
// Both lattices are fluid only: no sphere, no boundary link, no solid
// node (the spheres' links cost the same on the finest level as on the
// uniform demo, and are not what the levels change). A uniform axial force
// G cos(omega t) of the drive's period keeps the liquid moving.
//
// It prints, per goroutine count (each level's lattice, like the uniform
// one, has its own pool of that many): node updates per period and wall
// time per period of the refined lattice against the uniform demo (issue
// 17's bounds: at most 10 and 15 times; the uniform lattice of the finest
// spacing over the whole container would be 512 times), each level's
// kernel rate (node updates over Solver.KernelTime) against the uniform
// demo's (bound: at least 0.8 times) and against a lattice of the level's
// own size alone, and the transfers between levels (Levels.TransferTime)
// as a share of a step (bound: at most 20%).
//
// Usage:
//
//	go run ./benchmarks/levels [-excursion 2] [-margin 2] [-coarse-margin 4] [-threads 1,2] [-seconds 20] [-batch 40ms]
//
// The same step as a Go benchmark:
//
//	go test -run '^$' -bench Levels ./benchmarks/levels/
//
// See README.md in this directory for the measured table.
package main

import (
	"axiswim/benchmarks/internal/host"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime"
	"strconv"
	"strings"
	"time"

	"axiswim/lbm"
)

func main() {
	fs := flag.NewFlagSet("levels", flag.ExitOnError)
	exc := fs.String("excursion", "2", "the spheres' excursion either way along the axis, mm (comma-separated for several layouts)")
	margin := fs.Float64("margin", 2, "the finest level's margin around the spheres and their excursion, in small-sphere radii")
	coarse := fs.Int("coarse-margin", 4, "each coarser level's margin around the next finer one, in its own cells (at least 2)")
	threadsFlag := fs.String("threads", "", "goroutine counts per lattice, comma-separated (default 1 and all cores)")
	seconds := fs.Float64("seconds", 20, "seconds of timing per layout and goroutine count, both lattices together")
	batch := fs.Duration("batch", 40*time.Millisecond, "length of each batch; the two lattices alternate batch by batch")
	alone := fs.Bool("alone", true, "also time each level's size as a lattice of its own")
	fine := fs.Bool("fine", true, "also time the uniform lattice of the finest spacing (2880 x 720, 300 MiB)")
	fs.Usage = func() {
		fmt.Fprintf(fs.Output(), "usage: go run ./benchmarks/levels [flags]\n\n"+
			"Times issue 17's speed case, the demo at 24 cells per radius in a container 4 times\n"+
			"its size on 4 levels, against the uniform demo, and prints the tables.\n\n")
		fs.PrintDefaults()
	}
	fs.Parse(os.Args[1:])
	var excursions []float64
	for _, f := range strings.Split(*exc, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || v < 0 {
			fmt.Fprintf(os.Stderr, "levels: -excursion %q: want millimetres, 0 or more\n", f)
			os.Exit(2)
		}
		excursions = append(excursions, v*1e-3)
	}
	threads, err := parseThreads(*threadsFlag)
	if err != nil {
		fmt.Fprintln(os.Stderr, "levels: -threads:", err)
		os.Exit(2)
	}
	if *seconds <= 0 || *batch <= 0 {
		fmt.Fprintln(os.Stderr, "levels: -seconds and -batch must be positive")
		os.Exit(2)
	}
	cfg := runConfig{threads: threads, dur: time.Duration(*seconds * float64(time.Second)), batch: *batch,
		alone: *alone, fine: *fine}
	for _, e := range excursions {
		cfg.layouts = append(cfg.layouts, params{excursion: e, fineMargin: *margin, coarseMargin: *coarse})
	}
	if err := run(os.Stdout, cfg); err != nil {
		fmt.Fprintln(os.Stderr, "levels:", err)
		os.Exit(1)
	}
}

type runConfig struct {
	layouts     []params
	threads     []int
	dur, batch  time.Duration
	alone, fine bool
}

// The bounds of issue 17's speed section.
const (
	maxUpdates  = 10   // node updates per period, times the uniform demo's
	maxWall     = 15   // wall time per period, times the uniform demo's
	minKernel   = 0.8  // each level's kernel rate, times the uniform demo's
	maxTransfer = 0.20 // transfers, share of a step
)

func verdict(ok bool) string {
	if ok {
		return "holds"
	}
	return "FAILS"
}

// run prints the machine, then for every layout its levels and the
// measurements of every goroutine count.
func run(w io.Writer, cfg runConfig) error {
	start := time.Now()
	fmt.Fprintf(w, "axiswim refined-lattice benchmark (issue 17, speed), %s\n\n", start.UTC().Format("2006-01-02 15:04 MST"))
	fmt.Fprintf(w, "CPU:    %s\n", host.CPUModel())
	fmt.Fprintf(w, "Cores:  %d (runtime.NumCPU), GOMAXPROCS %d\n", runtime.NumCPU(), runtime.GOMAXPROCS(0))
	fmt.Fprintf(w, "Go:     %s %s/%s\n", runtime.Version(), runtime.GOOS, runtime.GOARCH)
	def, err := lbm.ResolveKernel(lbm.KernelAuto)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "Kernel: %s, %s\n", def.Describe(), lbm.KernelOrigin())
	fmt.Fprintf(w, "Timed:  the uniform demo and the refined lattice in alternating batches of about %v, %v per goroutine count, summed; %d warm-up steps\n\n",
		cfg.batch, cfg.dur, warmUp)
	for _, p := range cfg.layouts {
		lo, err := newLayout(p)
		if err != nil {
			return err
		}
		printLayout(w, lo)
		var res []result
		for _, n := range cfg.threads {
			r, err := measure(lo, n, cfg.dur, cfg.batch, cfg.alone, cfg.fine)
			if err != nil {
				return fmt.Errorf("excursion %g mm, %d goroutines: %w", p.excursion*1e3, n, err)
			}
			res = append(res, r)
		}
		printResults(w, lo, res)
	}
	fmt.Fprintf(w, "Total time %.1f s.\n", time.Since(start).Seconds())
	return nil
}

// printLayout prints the levels of lo and what they cost.
func printLayout(w io.Writer, lo *layout) {
	p := lo.p
	fmt.Fprintf(w, "Layout: the demo's spheres (radii %s mm at z = %s mm), excursion +-%g mm, finest margin %g small-sphere radii (%g mm),\n",
		sphereList(lo, func(r, _ float64) float64 { return r }), sphereList(lo, func(_, z float64) float64 { return z }),
		p.excursion*1e3, p.fineMargin, p.fineMargin*lo.aSmall*1e3)
	fmt.Fprintf(w, "each coarser level %d of its own cells around the next (z-min, z-max and r-max; every level touches the axis);\n", p.coarseMargin)
	fmt.Fprintf(w, "container %.4g mm long, %.4g mm in radius; closed ends; axisymmetric TRT, magic 3/16; fluid only (no spheres, no solid nodes).\n\n",
		float64(lo.nzF)*lo.dxF*1e3, float64(lo.nrF)*lo.dxF*1e3)
	fmt.Fprintln(w, "| level | dx (mm) | cells | block in parent (Z0, R0, Nz, Nr) | z (mm) | r (mm) | margin z-/z+/r+ (own cells) | tau+ | tau- | steps per period | node updates per period | share |")
	fmt.Fprintln(w, "|---:|---:|---|---|---|---|---|---:|---:|---:|---:|---:|")
	total := lo.updatesPerPeriod()
	for l, c := range lo.cfgs {
		blk, marg := "whole container", "-"
		if l > 0 {
			b := lo.blocks[l-1]
			blk = fmt.Sprintf("%d, %d, %d, %d", b.Z0, b.R0, b.Nz, b.Nr)
			a, b2, c2 := lo.margins(l)
			if l == numLevels-1 {
				marg = fmt.Sprintf("%.3g/%.3g/%.3g (spheres)", a, b2, c2)
			}
		}
		if l > 0 && l < numLevels-1 {
			a, b2, c2 := lo.margins(l)
			marg = fmt.Sprintf("%.3g/%.3g/%.3g", a, b2, c2)
		}
		u := float64(lo.cells(l)) * float64(lo.stepsPerPeriod(l))
		fmt.Fprintf(w, "| %d | %.5g | %d x %d = %d | %s | %.4g .. %.4g | 0 .. %.4g | %s | %.6g | %.4g | %d | %.4g | %.1f%% |\n",
			l, lo.dx(l)*1e3, c.Nz, c.Nr, c.Nz*c.Nr, blk, lo.zSI(lo.z0[l])*1e3, lo.zSI(lo.z1[l])*1e3, lo.rSI(lo.r1[l])*1e3,
			marg, c.Tau, tauMinus(c.Tau), lo.stepsPerPeriod(l), u, 100*u/total)
	}
	fmt.Fprintln(w)
	d := lo.demoUpdates()
	fmt.Fprintf(w, "Node updates per period: refined %.4g = %.3gx the uniform demo's %.4g (%d x %d x %d; bound %dx: %s);\n",
		total, total/d, d, lo.demo.Nz, lo.demo.Nr, lo.demo.StepsPerPeriod, maxUpdates, verdict(total/d <= maxUpdates))
	fmt.Fprintf(w, "the finest level alone %.3gx; the uniform lattice of the finest spacing (%d x %d x %d steps) %.4g = %.0fx.\n",
		float64(lo.cells(numLevels-1))*float64(lo.stepsFine)/d, lo.nzF, lo.nrF, lo.stepsFine, lo.fineUpdates(), lo.fineUpdates()/d)
	// What other margins would cost (no timing).
	var alt []string
	for _, m := range []int{2, 4, 8} {
		q := p
		q.coarseMargin = m
		if l2, err := newLayout(q); err == nil {
			alt = append(alt, fmt.Sprintf("coarse margin %d: %.3gx", m, l2.updatesPerPeriod()/d))
		}
	}
	for _, e := range []float64{0, 0.5e-3, 1e-3, 2e-3} {
		q := p
		q.excursion = e
		if l2, err := newLayout(q); err == nil {
			alt = append(alt, fmt.Sprintf("excursion %g mm: %.3gx", e*1e3, l2.updatesPerPeriod()/d))
		}
	}
	fmt.Fprintf(w, "Node updates of other layouts (the rest as above): %s.\n\n", strings.Join(alt, ", "))
}

func sphereList(lo *layout, f func(r, z float64) float64) string {
	var s []string
	for _, sp := range lo.demoCase.Spheres {
		s = append(s, fmt.Sprintf("%g", f(sp.Radius, sp.Z)*1e3))
	}
	return strings.Join(s, ", ")
}

// printResults prints the timing of every goroutine count.
func printResults(w io.Writer, lo *layout, res []result) {
	d := lo.demoUpdates()
	up := lo.updatesPerPeriod() / d
	fmt.Fprintln(w, "| goroutines | rounds | uniform demo per period | refined per period | wall ratio (<= 15) | rounds' ratio: quartiles | node updates ratio (<= 10) | transfers (<= 20% of a step) | kernels | other | uniform finest spacing per period (estimate) |")
	fmt.Fprintln(w, "|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|")
	for _, r := range res {
		ratio := r.refPeriod(lo).Seconds() / r.uniPeriod(lo).Seconds()
		q1, q2, q3 := r.quartiles()
		fineEst := "-"
		if r.fine > 0 {
			s := lo.fineUpdates() / (r.fine * 1e6)
			fineEst = fmt.Sprintf("%.0f s (%.0fx; kernel %.1f MLUPS)", s, s/r.uniPeriod(lo).Seconds(), r.fine)
		}
		fmt.Fprintf(w, "| %d | %d | %.3f s | %.2f s | %.2fx %s | %.1f, %.1f, %.1f | %.2fx %s | %.1f%% %s | %.1f%% | %.1f%% | %s |\n",
			r.threads, r.rounds, r.uniPeriod(lo).Seconds(), r.refPeriod(lo).Seconds(), ratio, verdict(ratio <= maxWall),
			q1, q2, q3, up, verdict(up <= maxUpdates), 100*r.transferShare(), verdict(r.transferShare() <= maxTransfer),
			100*r.kernelShare(), 100*(1-r.kernelShare()-r.transferShare()), fineEst)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "| goroutines | level | cells | steps timed | kernel MLUPS | of the uniform demo's (>= 0.8) | alone MLUPS | alone, of the uniform demo's |")
	fmt.Fprintln(w, "|---:|---:|---:|---:|---:|---:|---:|---:|")
	for _, r := range res {
		um := r.uniMLUPS(lo)
		fmt.Fprintf(w, "| %d | uniform demo | %d | %d | %.1f | - | - | - |\n", r.threads, lo.demo.Nz*lo.demo.Nr, r.sum.uniSteps, um)
		for l := range lo.cfgs {
			m := r.levelMLUPS(lo, l)
			al, of := "-", "-"
			if len(r.alone) > l {
				al, of = fmt.Sprintf("%.1f", r.alone[l]), fmt.Sprintf("%.2f", r.aloneOf[l])
			}
			fmt.Fprintf(w, "| %d | %d | %d | %d | %.1f | %.2f %s | %s | %s |\n",
				r.threads, l, lo.cells(l), r.sum.level[l].steps, m, m/um, verdict(m/um >= minKernel), al, of)
		}
	}
	fmt.Fprintln(w)
	fmt.Fprintf(w, "Per period: the sums' wall time per step times %d steps (level 0's and the demo's steps per period). Wall ratio:\n", lo.demo.StepsPerPeriod)
	fmt.Fprintf(w, "of the sums; rounds' ratio: the lower quartile, median and upper quartile of the ratio in each round (the machine's noise).\n")
	fmt.Fprintf(w, "Transfers: Levels.TransferTime (save, ghost filling, restriction) over the refined wall time; kernels: the levels'\n")
	fmt.Fprintf(w, "Solver.KernelTime; other: the rest (halo, force, the pools' hand-offs). Kernel MLUPS: a level's cells x steps over its\n")
	fmt.Fprintf(w, "KernelTime; alone: a uniform lattice of the level's size and tau (closed ends), timed in batches alternating with the\n")
	fmt.Fprintf(w, "uniform demo's. Uniform finest spacing: %d x %d x %d steps per period at the rate its kernel measured here.\n\n", lo.nzF, lo.nrF, lo.stepsFine)
}

// parseThreads reads a comma-separated list of goroutine counts; "" gives
// 1 and all cores.
func parseThreads(s string) ([]int, error) {
	if strings.TrimSpace(s) == "" {
		if n := runtime.NumCPU(); n > 1 {
			return []int{1, n}, nil
		}
		return []int{1}, nil
	}
	var ns []int
	for _, f := range strings.Split(s, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n < 1 {
			return nil, fmt.Errorf("%q: want positive goroutine counts such as 1,2", f)
		}
		ns = append(ns, n)
	}
	return ns, nil
}
