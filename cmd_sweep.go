package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/output"
)

func cmdSweep(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("sweep", stderr)
	out := fs.String("out", "", "sweep directory (default runs/sweep-NAME, a new one)")
	jobs := fs.Int("jobs", 1, "points run at once; the cores are split among them")
	threads := fs.Int("threads", 0, "goroutines shared by the jobs (0: all cores)")
	resume := fs.String("resume", "", "continue the sweep in this directory (finished points are not run again)")
	quiet := fs.Bool("quiet", false, "no line per point on stderr")
	warm := fs.Bool("warm", false, "start each point from the final state of the nearest finished point (a shorter transient; with -jobs > 1 the choice depends on timing)")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: axiswim sweep [-out DIR] [-jobs N] [-threads N] [-quiet] SWEEP.toml")
		fmt.Fprintln(stderr, "       axiswim sweep -resume DIR [-jobs N] [-threads N] [-quiet]")
		fmt.Fprintln(stderr, "Runs every point of a sweep file (a base case and one or two keys varied) and writes results.csv.")
		fs.PrintDefaults()
	}
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if *jobs < 1 || *threads < 0 {
		return fmt.Errorf("%w: -jobs must be at least 1 and -threads 0 or more", errUsage)
	}
	var s *cases.Sweep
	var dir string
	var err error
	switch {
	case *resume != "" && fs.NArg() == 0:
		dir = *resume
		if s, err = cases.LoadSweep(filepath.Join(dir, "sweep.toml")); err != nil {
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
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	go func() {
		<-ctx.Done()
		stop() // a second signal ends the process at once
	}()
	log := stderr
	if *quiet {
		log = io.Discard
	}
	n := len(s.Points())
	fmt.Fprintf(stderr, "%s: %d points, %d at a time\n", dir, n, *jobs)
	results, err := drive.RunSweep(ctx, s, drive.SweepOptions{Out: dir, Jobs: *jobs, Cores: *threads, Log: log, Warm: *warm})
	for _, r := range results {
		line := fmt.Sprintf("  %3d  %-40s", r.Index+1, s.Label(r.Point))
		switch sum := r.Summary; {
		case r.Err != "":
			line += "  " + r.Err
		case sum != nil && sum.MeanVelocity != nil && sum.MeanVelocityUncertainty != nil:
			line += fmt.Sprintf("  %10.4g +- %.2g m/s", *sum.MeanVelocity, *sum.MeanVelocityUncertainty)
		default:
			line += "  no speed"
		}
		fmt.Fprintln(stdout, line)
	}
	if err != nil {
		if ctx.Err() != nil {
			fmt.Fprintf(stderr, "stopped; continue with: axiswim sweep -resume %s\n", dir)
			return fmt.Errorf("%w: %v", errStopped, err)
		}
		return err
	}
	fmt.Fprintf(stdout, "%s written\n", filepath.Join(dir, drive.ResultsFile))
	return drive.SweepFailures(results)
}
