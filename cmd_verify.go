package main

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"time"

	"axiswim/drive/verify"
	"axiswim/output"
)

// errVerifyFailed marks a verification run with at least one failing
// check (information rows and known disagreements never fail a run).
var errVerifyFailed = errors.New("verification failed")

func cmdVerify(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("verify", stderr)
	full := fs.Bool("full", false, "also run the long convergence studies")
	threads := fs.Int("threads", 0, "goroutines for the solver (0: all cores)")
	quiet := fs.Bool("quiet", false, "no progress on stderr")
	only := fs.String("only", "", "run only these checks, quick or full (comma-separated names, as 'verify -list' prints them)")
	list := fs.Bool("list", false, "list the checks and stop")
	single := fs.Bool("float32", false, "store the populations in float32 (solver.precision = \"float32\") in every check")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if *list {
		for _, c := range verify.Checks() {
			kind := "quick"
			if c.Full {
				kind = "full"
			}
			fmt.Fprintf(stdout, "%-28s %s\n", c.Name, kind)
		}
		return nil
	}
	var checks []verify.Check
	if *only != "" {
		var err error
		if checks, err = verify.Select(strings.Split(*only, ",")); err != nil {
			return fmt.Errorf("-only %s: %w", *only, err)
		}
	} else {
		for _, c := range verify.Checks() {
			if !c.Full || *full {
				checks = append(checks, c)
			}
		}
	}
	start := time.Now()
	header := true
	var tally verify.Tally
	prog := output.NewProgress(stderr, *quiet, int64(len(checks)), "checks", "verify")
	done := 0
	if *single {
		fmt.Fprintln(stdout, "populations stored in float32 (-float32)")
	}
	_, err := verify.RunChecks(checks, verify.Options{Threads: *threads, Single: *single}, func(c verify.Check, rows []verify.Row) {
		done++
		prog.Set(int64(done), c.Name)
		if header {
			verify.WriteTable(stdout, rows)
			header = false
		} else {
			verify.WriteRows(stdout, rows)
		}
		tally.Add(rows)
	})
	prog.Done()
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "\n%s (%.0f s)\n", tally, time.Since(start).Seconds())
	if tally.Failed > 0 {
		return fmt.Errorf("%w: %d of %d checks", errVerifyFailed, tally.Failed, tally.Passed+tally.Failed)
	}
	return nil
}
