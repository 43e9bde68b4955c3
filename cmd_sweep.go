package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"

	"axiswim/cases"
	"axiswim/drive/study"
	"axiswim/output"
)

func cmdSweep(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("sweep", stderr)
	out := fs.String("out", "", "sweep directory (default runs/sweep-NAME, a new one)")
	jobs := fs.Int("jobs", 1, "points run at once; the cores are split among them")
	threads := fs.Int("threads", 0, "goroutines shared by the jobs (0: all cores); with -plan, the cores of each array task (0: 4)")
	resume := fs.String("resume", "", "continue the sweep in this directory (finished points are not run again)")
	plan := fs.Bool("plan", false, "run nothing: write the sweep directory, points.csv and a Slurm array script (one task per point)")
	point := fs.Int("point", 0, "run only point `N` (from 1, as in points.csv) of the sweep directory given, as one array task does")
	quiet := fs.Bool("quiet", false, "no line per point on stderr")
	warm := fs.Bool("warm", false, "start each point from the final state of the nearest finished point (a shorter transient; with -jobs > 1 the choice depends on timing)")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: axiswim sweep [-out DIR] [-jobs N] [-threads N] [-warm] [-quiet] SWEEP.toml")
		fmt.Fprintln(stderr, "       axiswim sweep -resume DIR [-jobs N] [-threads N] [-warm] [-quiet]")
		fmt.Fprintln(stderr, "       axiswim sweep -plan [-out DIR] [-threads N] SWEEP.toml")
		fmt.Fprintln(stderr, "       axiswim sweep -point N [-threads N] [-quiet] DIR")
		fmt.Fprintln(stderr, "Runs every point of a sweep file (a base case and one or two keys varied) and writes results.csv.")
		fmt.Fprintln(stderr, "On a cluster: -plan writes DIR/slurm.sh, whose array tasks run -point; then 'axiswim collect DIR'.")
		fs.PrintDefaults()
	}
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	if *jobs < 1 || *threads < 0 {
		return fmt.Errorf("%w: -jobs must be at least 1 and -threads 0 or more", errUsage)
	}
	// Which flags go with which form.
	for _, c := range []struct {
		mode  string
		on    bool
		never []string
	}{
		{"-plan", *plan, []string{"resume", "point", "jobs", "quiet", "warm"}}, // array tasks run at once: no point to start from
		{"-point", set["point"], []string{"resume", "out", "jobs", "warm"}},
		{"-resume", *resume != "", []string{"out"}},
	} {
		for _, f := range c.never {
			if c.on && set[f] {
				fs.Usage()
				return fmt.Errorf("%w: %s and -%s do not go together", errUsage, c.mode, f)
			}
		}
	}
	switch {
	case *plan && fs.NArg() == 1:
		s, err := cases.LoadSweep(fs.Arg(0))
		if err != nil {
			return err
		}
		return planSweep(s, *out, *threads, stdout, stderr)
	case set["point"] && fs.NArg() == 1:
		return sweepPoint(fs.Arg(0), *point, *threads, *quiet, stdout, stderr)
	case *plan || set["point"]:
		fs.Usage()
		return fmt.Errorf("%w: -plan takes one sweep file and -point N one sweep directory, got %q", errUsage, fs.Args())
	}
	var s *cases.Sweep
	var dir string
	var err error
	switch {
	case *resume != "" && fs.NArg() == 0:
		dir = *resume
		if s, err = loadSweepDir(dir); err != nil {
			return fmt.Errorf("resume %s: %w", dir, err)
		}
	case *resume == "" && fs.NArg() == 1:
		if s, err = cases.LoadSweep(fs.Arg(0)); err != nil {
			return err
		}
		dir = *out
		if dir == "" {
			dir = freshDir("sweep-" + s.Name)
		}
		if err := output.RunDir(dir, false); err != nil {
			return fmt.Errorf("%w (continue a sweep with -resume %s)", err, dir)
		}
		if err := s.WriteFiles(dir, output.WriteFileAtomic); err != nil {
			return err
		}
	default:
		fs.Usage()
		return fmt.Errorf("%w: give one sweep file, or -resume DIR alone", errUsage)
	}
	ctx, stop := signalContext()
	defer stop()
	log := stderr
	if *quiet {
		log = io.Discard
	}
	n := len(s.Points())
	fmt.Fprintf(stderr, "%s: %d points, %d at a time\n", dir, n, *jobs)
	results, err := study.RunSweep(ctx, s, study.SweepOptions{Out: dir, Jobs: *jobs, Cores: *threads, Log: log, Warm: *warm})
	for _, r := range results {
		fmt.Fprintln(stdout, pointLine(s, r))
	}
	if err != nil {
		if ctx.Err() != nil {
			fmt.Fprintf(stderr, "stopped; continue with: axiswim sweep -resume %s\n", dir)
			return fmt.Errorf("%w: %v", errStopped, err)
		}
		return err
	}
	fmt.Fprintf(stdout, "%s written\n", filepath.Join(dir, study.ResultsFile))
	return study.SweepFailures(results)
}

// signalContext is cancelled by SIGINT or SIGTERM (Slurm's signal at the
// time limit), upon which the running points stop at a checkpoint; a
// second signal ends the process at once.
func signalContext() (context.Context, context.CancelFunc) {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	go func() {
		<-ctx.Done()
		stop()
	}()
	return ctx, stop
}

// loadSweepDir reads the sweep of a sweep directory (its sweep.toml).
func loadSweepDir(dir string) (*cases.Sweep, error) {
	path := filepath.Join(dir, "sweep.toml")
	if _, err := os.Stat(path); errors.Is(err, os.ErrNotExist) {
		if _, derr := os.Stat(dir); derr != nil {
			return nil, fmt.Errorf("%w: no sweep directory %s: give the directory that 'axiswim sweep' or 'axiswim sweep -plan' made", errUsage, dir)
		}
		return nil, fmt.Errorf("%w: %s is not a sweep directory (it has no sweep.toml): give the directory that 'axiswim sweep' or 'axiswim sweep -plan' made", errUsage, dir)
	}
	return cases.LoadSweep(path)
}

// pointLine is the line printed for a point: number, values, speed or error.
func pointLine(s *cases.Sweep, r study.SweepResult) string {
	line := fmt.Sprintf("  %3d  %-40s", r.Index+1, s.Label(r.Point))
	switch sum := r.Summary; {
	case r.Err != nil:
		line += "  " + r.Err.Error()
	case sum != nil && sum.MeanVelocity != nil && sum.MeanVelocityUncertainty != nil:
		line += fmt.Sprintf("  %10.4g +- %.2g m/s", *sum.MeanVelocity, *sum.MeanVelocityUncertainty)
	default:
		line += "  no speed"
	}
	return line
}

// sweepPoint runs point n (from 1) of the sweep in dir: what one task of
// the Slurm array of -plan does.
func sweepPoint(dir string, n, threads int, quiet bool, stdout, stderr io.Writer) error {
	s, err := loadSweepDir(dir)
	if err != nil {
		return fmt.Errorf("-point %d %s: %w", n, dir, err)
	}
	total := len(s.Points())
	if n < 1 || n > total {
		return fmt.Errorf("%w: -point %d: the sweep in %s has points 1 to %d (see %s)", errUsage, n, dir, total,
			filepath.Join(dir, study.PointsFile))
	}
	ctx, stop := signalContext()
	defer stop()
	log := stderr
	if quiet {
		log = io.Discard
	}
	r, err := study.RunSweepPoint(ctx, s, n-1, study.SweepOptions{Out: dir, Cores: threads, Log: log})
	if err != nil {
		return err
	}
	fmt.Fprintln(stdout, pointLine(s, r))
	switch {
	case r.Err != nil && ctx.Err() != nil:
		fmt.Fprintf(stderr, "stopped at a checkpoint; continue with: axiswim sweep -point %d %s (or submit its array task again)\n", n, dir)
		return fmt.Errorf("%w: point %d", errStopped, n)
	case r.Err != nil:
		return fmt.Errorf("point %d: %w", n, r.Err)
	}
	return nil
}
