package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"os/signal"
	"path/filepath"
	"strings"
	"syscall"
	"time"

	"axiswim/cases"
	"axiswim/drive/record"
	"axiswim/drive/run"
)

// errStopped marks a run interrupted by a signal.
var errStopped = errors.New("stopped by a signal")

func newFlags(name string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet("axiswim "+name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	return fs
}

// errHelp marks a command asked for its help (-h), which the flag set
// has printed: the command ends there, successfully.
var errHelp = errors.New("help shown")

// parseFlags parses args, turning a flag error into a usage error and -h
// into errHelp.
func parseFlags(fs *flag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return errHelp
		}
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	return nil
}

// loadCase reads a case file (or an embedded example by name, when no
// such file exists), or the embedded demo when path is empty, and
// resolves it to lattice units. It returns the case's short name.
func loadCase(path string) (*cases.Case, *cases.Lattice, string, error) {
	var c *cases.Case
	var err error
	name := "demo"
	if path == "" {
		src, gerr := cases.Get("demo")
		if gerr != nil {
			return nil, nil, "", gerr
		}
		c, err = cases.Parse("demo (embedded)", src)
	} else {
		name = strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		_, statErr := os.Stat(path)
		if src, gerr := cases.Get(path); statErr != nil && gerr == nil && !strings.ContainsAny(path, `/\.`) {
			c, err = cases.Parse(path+" (embedded)", src) // an example by name: axiswim run three-sphere-lag
		} else {
			c, err = cases.Load(path)
		}
	}
	if err != nil {
		return nil, nil, "", err
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return nil, nil, "", err
	}
	return c, l, name, nil
}

// freshDir returns runs/NAME, or runs/NAME-2, -3, ... if that is taken, so
// that a run without -out never touches an earlier run's files.
func freshDir(name string) string {
	base := filepath.Join("runs", name)
	dir := base
	for i := 2; ; i++ {
		entries, err := os.ReadDir(dir)
		if err != nil || len(entries) == 0 {
			return dir
		}
		dir = fmt.Sprintf("%s-%d", base, i)
	}
}

func cmdRun(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("run", stderr)
	out := fs.String("out", "", "run directory (default runs/NAME, a fresh one each run)")
	threads := fs.Int("threads", 0, "goroutines for the solver (0: all cores)")
	quiet := fs.Bool("quiet", false, "no progress output")
	force := fs.Bool("force", false, "replace files in a non-empty -out directory")
	resume := fs.String("resume", "", "continue the interrupted run in `DIR` from its checkpoint")
	ckMin := fs.Float64("checkpoint-minutes", 10, "wall time between checkpoints")
	ckPer := fs.Int("checkpoint-periods", 0, "also write a checkpoint every N drive periods (0: only by wall time)")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: axiswim run [-out DIR] [-threads N] [-quiet] [-force] [CASE.toml]")
		fmt.Fprintln(stderr, "       axiswim run -resume DIR [-threads N] [-quiet]")
		fmt.Fprintln(stderr, "With no case file, runs the embedded demo ('axiswim cases demo' prints it).")
		fs.PrintDefaults()
	}
	if err := parseFlags(fs, args); err != nil || fs.NArg() > 1 {
		if err == nil {
			err = fmt.Errorf("%w: one case file at most, got %q", errUsage, fs.Args())
		}
		return err
	}
	if *ckMin <= 0 || *ckPer < 0 {
		return fmt.Errorf("%w: -checkpoint-minutes must be positive and -checkpoint-periods 0 or more", errUsage)
	}
	if *threads < 0 {
		return fmt.Errorf("%w: -threads %d: give 0 (all cores) or a positive number", errUsage, *threads)
	}
	caseFile, dir := fs.Arg(0), *out
	if *resume != "" {
		if caseFile != "" || dir != "" {
			return fmt.Errorf("%w: -resume DIR takes its case from DIR/case.toml; give no case file and no -out", errUsage)
		}
		dir, caseFile = *resume, filepath.Join(*resume, "case.toml")
	}
	c, l, name, err := loadCase(caseFile)
	if err != nil {
		return err
	}
	if dir == "" {
		dir = freshDir(name)
	}
	for _, w := range l.Warnings {
		fmt.Fprintf(stderr, "warning: %s\n", w)
	}
	if !*quiet {
		fmt.Fprintf(stderr, "case %s: %dx%d cells, dx = %.4g m, dt = %.4g s, tau = %.4f (time step set by the %s limit), %d steps\n",
			name, l.Nz, l.Nr, l.Dx, l.Dt, l.Tau, l.Bound, l.Steps)
		fmt.Fprintf(stderr, "writing to %s\n", dir)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	go func() {
		// After the first signal the run finishes its step and flushes its
		// files; restoring the default handling lets a second signal end the
		// process at once.
		<-ctx.Done()
		stop()
		if !*quiet {
			fmt.Fprintln(stderr, "stopping after this step and writing what the run has; a second Ctrl-C ends it at once")
		}
	}()
	sum, err := run.Execute(ctx, c, l, run.Options{Out: dir, Force: *force, Threads: *threads, Quiet: *quiet, Log: stderr,
		Resume: *resume != "", CheckpointEvery: time.Duration(*ckMin * float64(time.Minute)), CheckpointPeriods: *ckPer})
	if sum != nil {
		printSummary(stdout, dir, sum)
	}
	if err != nil {
		return err
	}
	if sum.Interrupted {
		return fmt.Errorf("%w after %d steps; the files written so far and a checkpoint are in %s: continue with 'axiswim run -resume %s'",
			errStopped, sum.Steps, dir, dir)
	}
	return nil
}

// printSummary tells the user what the run found, in a few lines.
func printSummary(w io.Writer, dir string, sum *run.Summary) {
	fmt.Fprintf(w, "%s: %d steps, %.4g s simulated in %.1f s wall (%.1f MLUPS, %s kernel, %d goroutines)\n",
		dir, sum.Steps, sum.SimulatedTime, sum.WallTime, sum.MLUPS, sum.Lattice.Kernel, sum.Lattice.Threads)
	if sum.MeanVelocity != nil {
		u, du := *sum.MeanVelocity, *sum.MeanVelocityUncertainty
		switch {
		case *sum.Swimming:
			fmt.Fprintf(w, "  swims along %s at %.3g +- %.2g m/s (sphere %d leads)", sum.Direction, math.Abs(u), du, *sum.LeadingSphere)
		default:
			fmt.Fprintf(w, "  does not swim measurably: mean speed %.3g +- %.2g m/s", u, du)
		}
		conv := "converged"
		if !*sum.Converged {
			conv = "NOT converged: run more periods"
		}
		fmt.Fprintf(w, " over the last %d periods, %s\n", sum.PeriodsAnalysed, conv)
		if sum.NetDisplacement != nil {
			fmt.Fprintf(w, "  net displacement of the centroid %.4g m over the whole run\n", *sum.NetDisplacement)
		}
		for _, c := range sum.Comparison {
			model := "linear model"
			if c.Source != "" {
				model = c.Source
			}
			if c.Ratio != nil {
				fmt.Fprintf(w, "  %-52s simulated %.4g, %s %.4g (ratio %.3f)\n", c.Quantity, c.Simulated, model, c.Model, *c.Ratio)
			} else {
				fmt.Fprintf(w, "  %-52s simulated %.4g, %s %.4g\n", c.Quantity, c.Simulated, model, c.Model)
			}
		}
	}
	for i, sw := range sum.Swimmers {
		line := fmt.Sprintf("  swimmer %d (spheres %v):", i+1, sw.Spheres)
		if sw.MeanVelocity != nil && sw.MeanVelocityUncertainty != nil {
			line += fmt.Sprintf(" %.4g +- %.2g m/s", *sw.MeanVelocity, *sw.MeanVelocityUncertainty)
		}
		if sw.LeadingSphere > 0 {
			line += fmt.Sprintf(", sphere %d leading", sw.LeadingSphere)
		}
		fmt.Fprintln(w, line)
	}
	for _, g := range sum.Gaps {
		trend := fmt.Sprintf("%s at %.3g +- %.2g m/s", g.Trend, math.Abs(g.Rate), g.Uncertainty)
		if g.Trend == record.GapLocked {
			trend = fmt.Sprintf("%s (rate %.3g +- %.2g m/s)", g.Trend, g.Rate, g.Uncertainty)
		}
		fmt.Fprintf(w, "  gap between swimmers %d and %d: %.4g -> %.4g m (least %.4g), %s\n",
			g.Swimmers[0], g.Swimmers[1], g.Initial, g.Final, g.Min, trend)
	}
	fmt.Fprintf(w, "  liquid: max Mach %.3g, max mass drift %.2g\n", sum.MaxMach, sum.MaxMassDrift)
	for _, x := range sum.Warnings {
		fmt.Fprintf(w, "  warning: %s\n", x)
	}
	if sum.Failure != "" {
		fmt.Fprintf(w, "  FAILED: %s\n", sum.Failure)
	}
	files := "case.toml (the case as resolved), series.csv (time series), summary.json"
	for _, f := range []struct{ name, what string }{
		{"periods.csv", "periods.csv (per period)"},
		{"metrics.csv", "metrics.csv (vortex rings)"},
		{"fields", "fields/ (VTK)"},
		{"pictures", "pictures/ (PNG)"},
		{"checkpoint.bin", "checkpoint.bin"},
	} {
		if _, err := os.Stat(filepath.Join(dir, f.name)); err == nil {
			files += ", " + f.what
		}
	}
	fmt.Fprintf(w, "  files: %s\n", files)
}
