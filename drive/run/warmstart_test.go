package run

import (
	"bytes"
	"context"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"

	"axiswim/cases"
)

// smallAt is the small swimmer of testdata (without fields or pictures)
// at shaking amplitude a (m), run for the given number of periods.
func smallAt(t *testing.T, a float64, periods int) (*cases.Case, *cases.Lattice) {
	t.Helper()
	src, err := os.ReadFile("../../testdata/sweep-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	src = bytes.Replace(src, []byte("periods = 3"), []byte("periods = "+strconv.Itoa(periods)), 1)
	src = bytes.Replace(src, []byte("amplitude = 0.00035"), []byte("amplitude = "+strconv.FormatFloat(a, 'g', -1, 64)), 1)
	return mustCase(t, "small", src)
}

func runSmall(t *testing.T, a float64, periods int, o Options) *Summary {
	t.Helper()
	c, l := smallAt(t, a, periods)
	if o.Out == "" {
		o.Out = t.TempDir()
	}
	o.Threads, o.Quiet = 2, true
	sum, err := Execute(context.Background(), c, l, o)
	if err != nil {
		t.Fatal(err)
	}
	return sum
}

// warmSource is the run that the warm-start tests start from: the small
// swimmer at 0.30 mm for 6 periods with its final state kept, made once
// (in a folder that TestMain removes) and only read by the tests.
var warmSource struct {
	once sync.Once
	dir  string
	err  error
}

// sharedSource returns the folder of warmSource, running it on the first
// call.
func sharedSource(t *testing.T) string {
	t.Helper()
	warmSource.once.Do(func() {
		warmSource.dir, warmSource.err = os.MkdirTemp("", "axiswim-warm-")
		if warmSource.err != nil {
			return
		}
		c, l := smallAt(t, 3e-4, 6)
		_, warmSource.err = Execute(context.Background(), c, l, Options{Out: warmSource.dir, SaveFinal: true, Threads: 2, Quiet: true})
	})
	if warmSource.err != nil {
		t.Fatal(warmSource.err)
	}
	return warmSource.dir
}

func TestMain(m *testing.M) {
	code := m.Run()
	if warmSource.dir != "" {
		os.RemoveAll(warmSource.dir)
	}
	os.Exit(code)
}

// periodColumn reads one column of periods.csv.
func periodColumn(t *testing.T, dir, name string) []float64 {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, "periods.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	col := slices.Index(strings.Split(lines[0], ","), name)
	if col < 0 {
		t.Fatalf("periods.csv has no column %s", name)
	}
	var out []float64
	for _, line := range lines[1:] {
		v, err := strconv.ParseFloat(strings.Split(line, ",")[col], 64)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, v)
	}
	return out
}

// TestWarmStartContinues: a warm start with the same parameters carries
// the source run on: its periods are those of one run as long as both,
// to round-off (the drive's time restarts at 0, so sin(omega t) is
// evaluated at other arguments: differences of order 1e-16 relative,
// grown by the steps in between).
func TestWarmStartContinues(t *testing.T) {
	src, long, warm := sharedSource(t), t.TempDir(), t.TempDir()
	runSmall(t, 3e-4, 10, Options{Out: long})
	sum := runSmall(t, 3e-4, 4, Options{Out: warm, WarmFrom: src})
	if sum.WarmStart == nil || !sum.WarmStart.Used || sum.WarmStart.Skipped != 1 {
		t.Fatalf("warm start record %+v", sum.WarmStart)
	}
	for _, col := range []string{"centroid_m", "displacement_m", "spring1_amplitude_m", "sphere2_phase_deg"} {
		a, b := periodColumn(t, long, col)[6:], periodColumn(t, warm, col)
		for p := range b {
			if d := math.Abs(a[p] - b[p]); d > 1e-9*math.Abs(a[p]) {
				t.Errorf("%s, period %d after the source: %.10g warm, %.10g in one run", col, p+1, b[p], a[p])
			}
		}
	}
}

// TestWarmStartShortensTransient: a point started from a neighbour's
// final state (amplitude 0.30 -> 0.33 mm) reaches the long-run speed in
// fewer periods than one started from rest. Measured here: after 6
// periods the warm start is 0.2% from the 16-period speed from rest, the
// cold start 6.4% (the streaming flow and the swimmer's drift build up
// over several periods from rest). The rows: warm within 1% (four times
// the reference's standard error), and at least three times closer than
// cold.
func TestWarmStartShortensTransient(t *testing.T) {
	src := sharedSource(t)
	ref := *runSmall(t, 3.3e-4, 16, Options{}).MeanVelocity
	cold := *runSmall(t, 3.3e-4, 6, Options{}).MeanVelocity
	warm := *runSmall(t, 3.3e-4, 6, Options{WarmFrom: src}).MeanVelocity
	ew, ec := math.Abs(warm/ref-1), math.Abs(cold/ref-1)
	t.Logf("16 periods from rest %.5g m/s; 6 periods: warm %.5g (%.2g%%), cold %.5g (%.2g%%)", ref, warm, 100*ew, cold, 100*ec)
	if ew > 0.01 || ec < 3*ew {
		t.Errorf("warm start error %.2g%%, cold %.2g%%: want warm within 1%% and three times closer", 100*ew, 100*ec)
	}
}

// TestWarmStartFallsBack: a source on another lattice, or without a final
// state, gives a start from rest with the reason in the summary.
func TestWarmStartFallsBack(t *testing.T) {
	other := t.TempDir()
	c, _ := smallAt(t, 3e-4, 4)
	c.Grid.CellsPerRadius = 6
	var b bytes.Buffer
	if err := c.WriteTOML(&b); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(other, "case.toml"), b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	sum := runSmall(t, 3e-4, 3, Options{WarmFrom: other})
	if w := sum.WarmStart; w == nil || w.Used || !strings.Contains(w.Reason, "lattices differ") || !strings.Contains(w.Reason, "cells") {
		t.Errorf("another lattice: %+v", w)
	}
	if !strings.Contains(strings.Join(sum.Warnings, " "), "started from rest") {
		t.Errorf("no warning of the start from rest: %q", sum.Warnings)
	}
	same := t.TempDir()
	runSmall(t, 3e-4, 3, Options{Out: same}) // no final state kept
	if w := runSmall(t, 3e-4, 3, Options{WarmFrom: same}).WarmStart; w == nil || w.Used || !strings.Contains(w.Reason, FinalStateFile) {
		t.Errorf("no final state: %+v", w)
	}
}

// TestWarmStartResumes: a warm-started run interrupted during its ramp and
// resumed ends bit for bit as the uninterrupted one.
func TestWarmStartResumes(t *testing.T) {
	src, whole, part := sharedSource(t), t.TempDir(), t.TempDir()
	runSmall(t, 3.3e-4, 3, Options{Out: whole, WarmFrom: src})
	_, l := smallAt(t, 3.3e-4, 3)
	if s := runSmall(t, 3.3e-4, 3, Options{Out: part, WarmFrom: src, StopAfter: int64(l.StepsPerPeriod / 2)}); !s.Interrupted {
		t.Fatal("the run was not interrupted")
	}
	sum := runSmall(t, 3.3e-4, 3, Options{Out: part, Resume: true})
	if sum.WarmStart == nil || !sum.WarmStart.Used {
		t.Errorf("resumed run lost its warm start record: %+v", sum.WarmStart)
	}
	for _, f := range []string{"series.csv", "periods.csv"} {
		a, _ := os.ReadFile(filepath.Join(whole, f))
		b, _ := os.ReadFile(filepath.Join(part, f))
		if !bytes.Equal(a, b) || len(a) == 0 {
			t.Errorf("%s of the resumed warm start differs from the uninterrupted one", f)
		}
	}
}
