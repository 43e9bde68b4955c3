// Command confinement measures how the container confines the demo
// swimmer (issue 17): the demo (cases/examples/demo.toml: spheres of 1.2
// and 0.8 mm in a closed cylinder 6 mm in radius and 24 mm long, 12 cells
// per radius of the small sphere) in containers k = 1, 2, 4 and 8 times
// its radius and length, that is container radii of 7.5, 15, 30 and 60
// small-sphere radii a, at the same finest spacing on refined levels
// (lbm.Levels, with grid.fine_margin = 4 radii: the margin at which the
// demo on levels agrees with the uniform demo, verify -full refined-demo),
// each run as `axiswim run` runs it (drive/run.Execute, 20 periods). It
// prints the mean swimming speed of each container with its standard
// error and the speed extrapolated to an unbounded liquid.
//
// The acoustic limit (METHODS.md 10.3, He = omega dt L/(c_s dx) <= 1 on
// the longest side) makes the finest level's tau+ - 1/2 k times smaller
// and its steps per period k times more in a container k times longer, so
// the larger containers need more levels for their coarse cells and
// reach the small tau+ of benchmarks/taustability's -container rows: 2, 3,
// 3 and 4 levels by default (the most whose coarsest level keeps
// tau+ >= 0.500625, cases.MinLevelTau).
//
// Extrapolation: wall effects on a body in a tube fall off as a power of
// a/R (the first correction to the Stokes drag of a sphere on the axis of
// a tube is linear in a/R: Haberman & Sayre 1958, David Taylor Model Basin
// report 1143; Happel & Brenner 1965, Low Reynolds Number Hydrodynamics,
// ch. 7). The power p is not assumed: from the three largest containers,
// whose radii double, p = log2((U_1 - U_2)/(U_2 - U_3)) and the unbounded
// speed U_inf = U_3 + (U_3 - U_2)/(2^p - 1) (Richardson's extrapolation
// with the observed order). A least-squares line U = U_inf + b a/R through
// the same three points is printed beside it. Where the differences change
// sign the observed order is undefined and only the line is given.
//
// Usage:
//
//	go run ./benchmarks/confinement [-out DIR] [-containers 1,2,4,8] [-levels 2,3,3,4] [-margin 4] [-periods 20] [-threads 0]
//
// Each container's run directory is DIR/kK (DIR must not exist yet: runs
// are never overwritten). The measured table is in README.md here.
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"gonum.org/v1/gonum/stat"

	"axiswim/benchmarks/internal/host"
	"axiswim/cases"
	"axiswim/drive/run"
)

// row is one container's result.
type row struct {
	k           float64
	radii       float64 // container radius in small-sphere radii
	levels      int
	tauFine     float64
	tauCoarse   float64
	nodes       float64 // node updates per period, all levels
	uniform     float64 // those of the uniform lattice of the finest spacing
	speed, err  float64 // m/s
	wall        float64 // s
	converged   bool
	imprint     float64
	warnings    int
	periods     int
	stepsPeriod int
}

func main() {
	fs := flag.NewFlagSet("confinement", flag.ExitOnError)
	out := fs.String("out", "", "directory for the runs (default a fresh one under the system's temporary directory)")
	ks := fs.String("containers", "1,2,4,8", "container sizes in units of the demo's (radius and length), comma-separated")
	ls := fs.String("levels", "2,3,3,4", "refined levels of each container, comma-separated")
	margin := fs.Float64("margin", 4, "grid.fine_margin, in small-sphere radii")
	periods := fs.Int("periods", 20, "drive periods per run")
	threads := fs.Int("threads", 0, "goroutines per run (0: all cores)")
	fs.Parse(os.Args[1:])
	k, err1 := floats(*ks)
	lv, err2 := floats(*ls)
	err := firstErr(err1, err2)
	if err == nil && len(k) != len(lv) {
		err = fmt.Errorf("-containers has %d values, -levels %d: give one number of levels per container", len(k), len(lv))
	}
	if err == nil && *out == "" {
		*out, err = os.MkdirTemp("", "confinement-")
	} else if err == nil {
		if _, serr := os.Stat(*out); serr == nil {
			err = fmt.Errorf("-out %s exists: choose a new directory (runs are never overwritten)", *out)
		}
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "confinement:", err)
		os.Exit(2)
	}
	if err := study(os.Stdout, *out, k, lv, *margin, *periods, *threads); err != nil {
		fmt.Fprintln(os.Stderr, "confinement:", err)
		os.Exit(1)
	}
}

func firstErr(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

func floats(s string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(v >= 1) {
			return nil, fmt.Errorf("%q: want numbers of at least 1", f)
		}
		out = append(out, v)
	}
	return out, nil
}

// containerCase is the demo in a container k times its radius and length.
func containerCase(k float64, levels int, margin float64, periods int) (*cases.Case, error) {
	c, err := cases.ParseExample("demo")
	if err != nil {
		return nil, err
	}
	c.Container.Radius *= k
	c.Container.Length *= k
	c.Grid.Levels, c.Grid.FineMargin = levels, margin
	c.Run.Periods = periods
	c.Run.Title = fmt.Sprintf("confinement: the demo in a container %g times its size", k)
	return c, nil
}

func study(w io.Writer, dir string, ks, levels []float64, margin float64, periods, threads int) error {
	start := time.Now()
	fmt.Fprintf(w, "The demo swimmer in containers k times the demo's radius and length, 12 cells per small-sphere radius on the finest level,\n"+
		"fine margin %g radii, %d periods per run (drive/run.Execute); runs in %s\n\n", margin, periods, dir)
	fmt.Fprintln(w, "| k | R/a | L/a | levels | tau+ finest | tau+ coarsest | steps/period | node updates/period | vs uniform | mean speed (m/s) | +- | converged | imprint | warnings | wall (s) |")
	fmt.Fprintln(w, "|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|---:|---:|---:|")
	var rows []row
	for i, k := range ks {
		c, err := containerCase(k, int(levels[i]), margin, periods)
		if err != nil {
			return err
		}
		l, err := cases.Resolve(c)
		if err != nil {
			return fmt.Errorf("container %g: %w", k, err)
		}
		ly := l.Layout()
		t0 := time.Now()
		sum, err := run.Execute(context.Background(), c, l, run.Options{Out: filepath.Join(dir, fmt.Sprintf("k%g", k)), Quiet: true, Threads: threads})
		if err != nil {
			return fmt.Errorf("container %g: %w", k, err)
		}
		if !sum.Completed || sum.MeanVelocity == nil {
			return fmt.Errorf("container %g: the run did not complete (%s)", k, sum.Failure)
		}
		r := row{k: k, radii: c.Container.Radius / c.Spheres[1].Radius, levels: len(ly.Levels),
			tauFine: ly.Levels[len(ly.Levels)-1].Tau, tauCoarse: ly.Levels[0].Tau, nodes: ly.NodeUpdates(ly.StepsPerPeriod),
			uniform: ly.NodeUpdates(ly.StepsPerPeriod) / ly.Ratio(), speed: *sum.MeanVelocity,
			err: *sum.MeanVelocityUncertainty, wall: time.Since(t0).Seconds(), converged: sum.Converged != nil && *sum.Converged,
			warnings: len(sum.Warnings), periods: periods, stepsPeriod: l.StepsPerPeriod}
		if sum.InterfaceImprint != nil {
			r.imprint = *sum.InterfaceImprint
		}
		rows = append(rows, r)
		fmt.Fprintf(w, "| %g | %g | %g | %d | %.5f | %.6f | %d | %.3g | %.3g | %.4e | %.1e | %v | %.2g%% | %d | %.0f |\n",
			r.k, r.radii, 4*r.radii, r.levels, r.tauFine, r.tauCoarse, r.stepsPeriod, r.nodes, r.nodes/r.uniform,
			r.speed, r.err, r.converged, 100*r.imprint, r.warnings, r.wall)
	}
	fmt.Fprintln(w)
	if len(rows) >= 3 {
		extrapolate(w, rows[len(rows)-3:])
	}
	fmt.Fprintf(w, "\n%s, %d goroutine(s) per run; total %.0f s.\n", host.CPUModel(), threads, time.Since(start).Seconds())
	return nil
}

// extrapolation is the unbounded speed from three containers (the package
// comment says how): the least-squares line U = Line0 + Line1 a/R and,
// where the radii double and the differences D1 = U_1 - U_2, D2 = U_2 -
// U_3 keep their sign (OK), the observed order P and Richardson's
// unbounded speed.
type extrapolation struct {
	Line0, Line1 float64
	D1, D2       float64
	OK           bool
	P, Inf       float64
}

// extrapolateSpeeds extrapolates the speeds u measured at container radii
// radii (in small-sphere radii, increasing) to an unbounded liquid.
func extrapolateSpeeds(radii, u [3]float64) extrapolation {
	x := make([]float64, 3)
	for i := range radii {
		x[i] = 1 / radii[i]
	}
	var e extrapolation
	e.Line0, e.Line1 = stat.LinearRegression(x, u[:], nil, false)
	e.D1, e.D2 = u[0]-u[1], u[1]-u[2]
	e.OK = radii[1] == 2*radii[0] && radii[2] == 2*radii[1] && e.D1*e.D2 > 0
	if e.OK {
		e.P = math.Log2(e.D1 / e.D2)
		e.Inf = u[2] + (u[2]-u[1])/(math.Pow(2, e.P)-1)
	}
	return e
}

// extrapolate prints the unbounded speed from the three largest
// containers.
func extrapolate(w io.Writer, r []row) {
	e := extrapolateSpeeds([3]float64{r[0].radii, r[1].radii, r[2].radii}, [3]float64{r[0].speed, r[1].speed, r[2].speed})
	fmt.Fprintf(w, "Line through R/a = %g, %g, %g: U = %.4e %+.4e a/R m/s: unbounded speed %.4e m/s (%+.1f%% from R/a = %g)\n",
		r[0].radii, r[1].radii, r[2].radii, e.Line0, e.Line1, e.Line0, 100*(e.Line0/r[2].speed-1), r[2].radii)
	if !e.OK {
		fmt.Fprintf(w, "Observed order: undefined (radii not doubling, or the differences %.3g and %.3g m/s change sign)\n", e.D1, e.D2)
		return
	}
	fmt.Fprintf(w, "Observed order in a/R: p = %.2f; Richardson: unbounded speed %.4e m/s (%+.1f%% from R/a = %g)\n",
		e.P, e.Inf, 100*(e.Inf/r[2].speed-1), r[2].radii)
	fmt.Fprintf(w, "(the standard errors of the speeds, %.1e to %.1e m/s, against their differences %.2g and %.2g m/s)\n",
		minErr(r), maxErr(r), e.D1, e.D2)
}

func minErr(r []row) float64 {
	m := math.Inf(1)
	for _, x := range r {
		m = math.Min(m, x.err)
	}
	return m
}

func maxErr(r []row) float64 {
	var m float64
	for _, x := range r {
		m = math.Max(m, x.err)
	}
	return m
}
