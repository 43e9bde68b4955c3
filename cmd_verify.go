package main

import (
	"errors"
	"fmt"
	"io"
	"time"

	"axiswim/drive/verify"
)

// errVerifyFailed marks a verification run with at least one FAIL row.
var errVerifyFailed = errors.New("verification failed")

func cmdVerify(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("verify", stderr)
	full := fs.Bool("full", false, "also run the long convergence studies")
	threads := fs.Int("threads", 0, "goroutines for the solver (0: all cores)")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: axiswim verify [-full] [-threads N]")
		fs.PrintDefaults()
	}
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	start := time.Now()
	header := true
	fails, total := 0, 0
	_, err := verify.Run(*full, *threads, func(c verify.Check, rows []verify.Row) {
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
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "\n%d passed, %d failed (%.0f s)\n", total-fails, fails, time.Since(start).Seconds())
	if fails > 0 {
		return fmt.Errorf("%w: %d of %d rows", errVerifyFailed, fails, total)
	}
	return nil
}
