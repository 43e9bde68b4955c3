package run

import (
	"context"
	"errors"
	"path/filepath"
	"strings"
	"testing"

	"axiswim/cases"
	"axiswim/drive"
)

// TestFailureKeepsItsChain: the error of a run stopped by a guard is the
// guard's own (errors.As finds the *drive.GuardError through the run's
// wrapping), and the summary says the same in words.
func TestFailureKeepsItsChain(t *testing.T) {
	c, err := cases.Load("../../testdata/unstable.toml")
	if err != nil {
		t.Fatal(err)
	}
	l, err := cases.Resolve(c)
	if err != nil {
		t.Fatal(err)
	}
	sum, err := Execute(context.Background(), c, l, Options{Out: filepath.Join(t.TempDir(), "run"), Threads: 1, Quiet: true})
	var ge *drive.GuardError
	if !errors.As(err, &ge) {
		t.Fatalf("error %v (%T): want one wrapping a *drive.GuardError", err, err)
	}
	if sum == nil || sum.Failure != err.Error() || !strings.Contains(ge.Diagnosis, "grid Reynolds") || ge.Time <= 0 {
		t.Errorf("summary failure %q, error %q, guard at t = %g: %q", sum.Failure, err, ge.Time, ge.Diagnosis)
	}
}
