package main

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"axiswim/cases"
	"axiswim/drive/study"
)

// defaultFloorFraction sets the default speed floor of an onset search:
// this fraction of the shaking velocity amplitude A omega at the top of
// the bracket. Our own choice, stated in every report; -floor sets a
// floor of the user's (an experiment's detection limit, say).
const defaultFloorFraction = 1e-4

func cmdOnset(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("onset", stderr)
	param := fs.String("param", "shaking.amplitude", "the case key varied (section.key or table[N].key)")
	between := fs.String("between", "", "the bracket searched, LO,HI in the key's SI unit (default for the amplitude: A/8,A of the case)")
	scale := fs.String("scale", "", "spacing of the points: log or linear (default log when LO > 0)")
	scan := fs.Int("scan", 5, "points of the first pass across the bracket")
	tol := fs.Float64("tol", 0.05, "stop when the bracket's relative width (HI-LO)/HI is at most this")
	floor := fs.Float64("floor", -1, "speed (m/s) below which a run counts as not swimming (default 1e-4 of A omega at HI)")
	sigmas := fs.Float64("sigmas", 2, "standard errors the mean speed must exceed to count as swimming")
	modelErr := fs.Float64("model-error", 0.02, "relative speed error the standard error does not show, used in the fits (resolution, window)")
	maxRuns := fs.Int("max-runs", 60, "at most this many runs")
	jobs := fs.Int("jobs", 1, "runs at once (and points per narrowing round); the cores are split among them")
	threads := fs.Int("threads", 0, "goroutines shared by the runs (0: all cores)")
	out := fs.String("out", "", "onset directory (default runs/onset-NAME, a new one)")
	resume := fs.String("resume", "", "continue the search in this directory (finished runs are reused)")
	quiet := fs.Bool("quiet", false, "no line per run on stderr")
	warm := fs.Bool("warm", false, "start each narrowing run from the final state of the nearest earlier run (a shorter transient)")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := checkJobs(*jobs, *threads); err != nil {
		return err
	}
	var search study.OnsetSearch
	var base []byte
	var dir string
	var err error
	switch {
	case *resume != "" && fs.NArg() == 0:
		dir = *resume
		if search, base, err = study.LoadOnset(dir); err != nil {
			return fmt.Errorf("resume: %w", err)
		}
		if flagsSet(fs)["jobs"] && *jobs != search.Jobs {
			fmt.Fprintf(stderr, "note: the search runs %d point(s) a round as recorded; -jobs %d is not used on resuming (the rounds would ask for other values)\n", search.Jobs, *jobs)
		}
	case *resume == "" && fs.NArg() == 1:
		if search, base, err = newOnsetSearch(fs.Arg(0), *param, *between, *scale); err != nil {
			return err
		}
		search.Scan, search.Tol, search.Sigmas, search.Jobs, search.MaxRuns = *scan, *tol, *sigmas, *jobs, *maxRuns
		search.ModelError, search.Warm = *modelErr, *warm
		if *modelErr == 0 {
			search.ModelError = -1 // none (0 would mean the default)
		}
		if search.Floor, err = onsetFloor(search, base, *floor); err != nil {
			return err
		}
		if err := search.Options().Check(); err != nil {
			return usageErrorf("%w", err)
		}
		dir = runDir(*out, "onset-"+search.Name)
		if err := makeRunDir(dir, "continue a search with -resume "+dir); err != nil {
			return err
		}
	default:
		fs.Usage()
		return usageErrorf("give one case file, or -resume DIR alone")
	}
	ctx, stop := signalContext(nil)
	defer stop()
	fmt.Fprintf(stderr, "%s: onset in %s between %g and %g, to %g%%; swimming: |U| > %g standard errors and > %.3g m/s\n",
		dir, search.Key, search.Lo, search.Hi, 100*search.Tol, search.Sigmas, search.Floor)
	res, err := study.RunOnset(ctx, search, base, study.OnsetRunOptions{Out: dir, Cores: *threads, Log: progressLog(stderr, *quiet), Resume: *resume != ""})
	if err != nil {
		return stopped(ctx, err, stderr, "axiswim onset -resume "+dir)
	}
	printOnset(stdout, search, res)
	fmt.Fprintf(stdout, "written: %s, %s, %s\n", filepath.Join(dir, study.OnsetTableFile),
		filepath.Join(dir, study.OnsetReportFile), filepath.Join(dir, study.OnsetChartFile))
	return nil
}

// newOnsetSearch reads the case (see readCase) and the bracket.
func newOnsetSearch(path, key, between, scale string) (study.OnsetSearch, []byte, error) {
	s := study.OnsetSearch{Key: key}
	cs, err := readCase(path)
	if err != nil {
		return s, nil, err
	}
	s.Name = cs.name
	c, err := cases.Parse(cs.label, cs.src)
	if err != nil {
		return s, nil, err
	}
	switch {
	case between != "":
		lo, hi, ok := strings.Cut(between, ",")
		var e1, e2 error
		s.Lo, e1 = strconv.ParseFloat(strings.TrimSpace(lo), 64)
		s.Hi, e2 = strconv.ParseFloat(strings.TrimSpace(hi), 64)
		if !ok || e1 != nil || e2 != nil {
			return s, nil, usageErrorf("-between %q: write two numbers LO,HI, e.g. -between 5e-5,4e-4", between)
		}
	case key == "shaking.amplitude":
		s.Hi = c.Shaking.Amplitude
		s.Lo = s.Hi / 8
	default:
		return s, nil, usageErrorf("-param %s needs -between LO,HI (the default bracket is only for the amplitude)", key)
	}
	switch scale {
	case "":
		s.Log = s.Lo > 0
	case cases.ScaleLog, cases.ScaleLinear:
		s.Log = scale == cases.ScaleLog
	default:
		return s, nil, usageErrorf("-scale %q: use log or linear", scale)
	}
	return s, cs.src, nil
}

// onsetFloor returns the floor asked for, or the default: 1e-4 of the
// shaking velocity amplitude of the case at the top of the bracket.
func onsetFloor(search study.OnsetSearch, base []byte, floor float64) (float64, error) {
	if floor >= 0 {
		return floor, nil
	}
	s, err := study.NewOnsetSweep(search, base)
	if err != nil {
		return 0, err
	}
	_, c, err := s.CaseAt(cases.Point{search.Hi})
	if err != nil {
		return 0, fmt.Errorf("the bracket's end %s = %g: %w", search.Key, search.Hi, err)
	}
	return defaultFloorFraction * c.Shaking.Amplitude * 2 * math.Pi * c.Shaking.Frequency, nil
}

// printOnset prints the runs, the bracket, the fits and the verdict.
func printOnset(w io.Writer, s study.OnsetSearch, r *study.Onset) {
	fmt.Fprintf(w, "%4s  %-12s  %-24s  %s\n", "run", s.Key, "mean speed (m/s)", "class")
	for _, p := range r.Points {
		class := "not swimming"
		if p.Swimming {
			class = "swimming"
		}
		speed := fmt.Sprintf("%10.4g +- %.2g", p.Speed, p.Uncertainty)
		if p.Err != "" {
			speed, class = "-", p.Err
		} else if p.Note != "" {
			class += " (" + p.Note + ")"
		}
		if p.WarmStart != "" {
			class += ", from " + p.WarmStart
		}
		fmt.Fprintf(w, "%4d  %-12.5g  %-24s  %s\n", p.Run, p.Value, speed, class)
	}
	if r.Found {
		fmt.Fprintf(w, "bracket: not swimming at %.5g, swimming at %.5g (relative width %.3g, tolerance %g)\n",
			r.Below, r.Above, r.Width, r.Options.Tol)
	} else {
		fmt.Fprintf(w, "no bracket: %s\n", r.Side)
	}
	if f := r.Power; f != nil {
		fmt.Fprintf(w, "power law:     U = %.4g A^%.4g (n +- %.2g); chi2 %.3g for %d dof, rms residual %.2g%%\n",
			f.C, f.N, f.NErr, f.Chi2, f.Dof, 100*f.RMS)
	}
	if f := r.Threshold; f != nil {
		fmt.Fprintf(w, "threshold law: U = %.4g (A - A_c)^%.4g (beta +- %.2g), A_c = %.5g (%.5g to %.5g); chi2 %.3g for %d dof, rms residual %.2g%%\n",
			f.C, f.Beta, f.BetaErr, f.Ac, f.AcLo, f.AcHi, f.Chi2, f.Dof, 100*f.RMS)
	}
	fmt.Fprintf(w, "verdict: %s\n  %s\n", r.Verdict, r.Explanation)
	if len(r.Caveats) > 0 {
		fmt.Fprintln(w, "caveats:")
		for _, c := range r.Caveats {
			fmt.Fprintf(w, "  - %s\n", c)
		}
	}
}
