package main

import (
	"errors"
	"fmt"
	"io"
	"time"

	"axiswim/drive/verify"
	"axiswim/output"
)

// errVerifyFailed marks a verification run with at least one FAIL row.
var errVerifyFailed = errors.New("verification failed")

func cmdVerify(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("verify", stderr)
	full := fs.Bool("full", false, "also run the long convergence studies")
	threads := fs.Int("threads", 0, "goroutines for the solver (0: all cores)")
	quiet := fs.Bool("quiet", false, "no progress on stderr")
	single := fs.Bool("float32", false, "store the populations in float32 (solver.precision = \"float32\") in every check")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: axiswim verify [-full] [-float32] [-threads N] [-quiet]")
		fs.PrintDefaults()
	}
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	start := time.Now()
	header := true
	fails, total := 0, 0
	n := 0
	for _, c := range verify.Checks() {
		if !c.Full || *full {
			n++
		}
	}
	prog := output.NewProgress(stderr, *quiet, int64(n), "checks", "verify")
	done := 0
	if *single {
		fmt.Fprintln(stdout, "populations stored in float32 (-float32)")
	}
	_, err := verify.Run(*full, verify.Options{Threads: *threads, Single: *single}, func(c verify.Check, rows []verify.Row) {
		done++
		prog.Set(int64(done), c.Name)
		if header {
			verify.WriteTable(stdout, rows)
			header = false
		} else {
			verify.WriteRows(stdout, rows)
		}
		for _, r := range rows {
			total++
			if !r.Pass {
				fails++
			}
		}
	})
	prog.Done()
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "\n%d passed, %d failed (%.0f s)\n", total-fails, fails, time.Since(start).Seconds())
	if fails > 0 {
		return fmt.Errorf("%w: %d of %d rows", errVerifyFailed, fails, total)
	}
	return nil
}
