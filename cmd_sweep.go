package main

import (
	"fmt"
	"io"
	"path/filepath"

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
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	set := flagsSet(fs)
	if err := checkJobs(*jobs, *threads); err != nil {
		return err
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
				return usageErrorf("%s and -%s do not go together", c.mode, f)
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
		return usageErrorf("-plan takes one sweep file and -point N one sweep directory, got %q", fs.Args())
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
		dir = runDir(*out, "sweep-"+s.Name)
		if err := makeRunDir(dir, "continue a sweep with -resume "+dir); err != nil {
			return err
		}
		if err := s.WriteFiles(dir, output.WriteFileAtomic); err != nil {
			return err
		}
	default:
		fs.Usage()
		return usageErrorf("give one sweep file, or -resume DIR alone")
	}
	ctx, stop := signalContext(nil)
	defer stop()
	n := len(s.Points())
	fmt.Fprintf(stderr, "%s: %d points, %d at a time\n", dir, n, *jobs)
	results, err := study.RunSweep(ctx, s, study.SweepOptions{Out: dir, Jobs: *jobs, Cores: *threads, Log: progressLog(stderr, *quiet), Warm: *warm})
	for _, r := range results {
		fmt.Fprintln(stdout, pointLine(s, r))
	}
	if err != nil {
		return stopped(ctx, err, stderr, "axiswim sweep -resume "+dir)
	}
	fmt.Fprintf(stdout, "%s written\n", filepath.Join(dir, study.ResultsFile))
	return study.SweepFailures(results)
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
		return usageErrorf("-point %d: the sweep in %s has points 1 to %d (see %s)", n, dir, total,
			filepath.Join(dir, study.PointsFile))
	}
	ctx, stop := signalContext(nil)
	defer stop()
	r, err := study.RunSweepPoint(ctx, s, n-1, study.SweepOptions{Out: dir, Cores: threads, Log: progressLog(stderr, quiet)})
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
