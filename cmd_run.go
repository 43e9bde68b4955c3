package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"time"

	"axiswim/drive/record"
	"axiswim/drive/run"
)

func cmdRun(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("run", stderr)
	out := fs.String("out", "", "run directory (default runs/NAME, a fresh one each run)")
	threads := fs.Int("threads", 0, "goroutines for the solver (0: all cores)")
	quiet := fs.Bool("quiet", false, "no progress output")
	force := fs.Bool("force", false, "replace files in a non-empty -out directory")
	resume := fs.String("resume", "", "continue the interrupted run in `DIR` from its checkpoint")
	ckMin := fs.Float64("checkpoint-minutes", 10, "wall time between checkpoints")
	ckPer := fs.Int("checkpoint-periods", 0, "also write a checkpoint every N drive periods (0: only by wall time)")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() > 1 {
		return usageErrorf("one case file at most, got %q", fs.Args())
	}
	if *ckMin <= 0 || *ckPer < 0 {
		return usageErrorf("-checkpoint-minutes must be positive and -checkpoint-periods 0 or more")
	}
	if *threads < 0 {
		return usageErrorf("-threads %d: give 0 (all cores) or a positive number", *threads)
	}
	caseFile, dir := fs.Arg(0), *out
	if *resume != "" {
		if caseFile != "" || dir != "" {
			return usageErrorf("-resume DIR takes its case from DIR/case.toml; give no case file and no -out")
		}
		dir, caseFile = *resume, filepath.Join(*resume, "case.toml")
	}
	c, l, name, err := loadCase(caseFile)
	if err != nil {
		return err
	}
	dir = runDir(dir, name)
	for _, w := range l.Warnings {
		fmt.Fprintf(stderr, "warning: %s\n", w)
	}
	if !*quiet {
		fmt.Fprintf(stderr, "case %s: %dx%d cells, dx = %.4g m, dt = %.4g s, tau = %.4f (time step set by the %s limit), %d steps\n",
			name, l.Nz, l.Nr, l.Dx, l.Dt, l.Tau, l.Bound, l.Steps)
		fmt.Fprintf(stderr, "writing to %s\n", dir)
	}
	// After the first signal the run finishes its step and flushes its
	// files; a second signal ends the process at once.
	ctx, stop := signalContext(func() {
		if !*quiet {
			fmt.Fprintln(stderr, "stopping after this step and writing what the run has; a second Ctrl-C ends it at once")
		}
	})
	defer stop()
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
	if lv := sum.Lattice; len(lv.Levels) > 0 {
		fmt.Fprintf(w, "  on %d levels (cells %.4g m to %.4g m; steps counted on the finest), the refined ones moved %d times (%d cells of level 0); transfers between levels %.0f%% of the wall time\n",
			len(lv.Levels), lv.Levels[len(lv.Levels)-1].CellSize, lv.Levels[0].CellSize, lv.LevelMoves, lv.LevelShift, 100*lv.TransferTime/math.Max(sum.WallTime, 1e-9))
	}
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
