package study

import (
	"axiswim/drive/run"
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"axiswim/cases"
)

// TestCollectSweepStates: CollectSweep tells each state of a point's
// directory from what the directory holds, without running anything, and
// a point whose case is invalid is failed with the case's error.
func TestCollectSweepStates(t *testing.T) {
	// Point 6's density makes the case invalid.
	s := testSweep(t, "states", "sphere[1].density", "1500, 1600, 1700, 1800, 1900, -1")
	out := t.TempDir()
	write := func(i int, name, content string) {
		dir := PointDir(out, i)
		os.MkdirAll(dir, 0o755)
		if err := os.WriteFile(filepath.Join(dir, name), []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write(0, "summary.json", `{"completed": true, "mean_velocity_m_s": 1e-5, "wall_time_s": 1}`)
	write(1, "case.toml", "# a run stopped before its first checkpoint\n")
	write(2, run.CheckpointFile, "not read by CollectSweep")
	write(3, "summary.json", `{"completed": false, "failure": "stopped at step 9 by a guard: NaN"}`)
	write(4, "summary.json", `{"completed": tr`)
	results, states := CollectSweep(s, out)
	want := []PointState{PointDone, PointPartial, PointUnfinished, PointFailed, PointFailed, PointFailed}
	for i, st := range states {
		if st != want[i] {
			t.Errorf("point %d: %v, want %v", i+1, st, want[i])
		}
	}
	for i, sub := range []string{"", "no summary", "unfinished", "by a guard: NaN", "cannot be read", "density"} {
		if msg := errText(results[i].Err); !strings.Contains(msg, sub) || (sub == "") != (results[i].Err == nil) {
			t.Errorf("point %d: error %q, want one with %q", i+1, results[i].Err, sub)
		}
	}
	if r := results[0]; r.Summary == nil || r.Summary.MeanVelocity == nil || *r.Summary.MeanVelocity != 1e-5 {
		t.Errorf("point 1: summary %+v", r.Summary)
	}
	// An empty directory is a point not run.
	os.RemoveAll(PointDir(out, 1))
	os.MkdirAll(PointDir(out, 1), 0o755)
	if _, states := CollectSweep(s, out); states[1] != PointNotRun {
		t.Errorf("empty directory: %v, want %v", states[1], PointNotRun)
	}
}

// TestRunSweepPointAgain: a point whose directory holds the files of a run
// stopped before its first checkpoint runs again from the start and gives
// the series of a fresh run, bit for bit; a point that failed earlier is
// not run over; a point out of range is an error naming the range.
func TestRunSweepPointAgain(t *testing.T) {
	src := "base = \"sweep-swimmer.toml\"\n[[vary]]\nkey = \"shaking.amplitude\"\nvalues = [1e-4, 2e-4]\n"
	s, err := cases.ParseSweep("again", []byte(src), "../../testdata")
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	fresh, stale := t.TempDir(), t.TempDir()
	if _, err := RunSweepPoint(ctx, s, 0, SweepOptions{Out: fresh, Cores: 1}); err != nil {
		t.Fatal(err)
	}
	os.MkdirAll(PointDir(stale, 0), 0o755)
	os.WriteFile(filepath.Join(PointDir(stale, 0), "series.csv"), []byte("time_s\n0\n"), 0o644)
	failed := `{"completed": false, "failure": "an earlier failure"}`
	os.MkdirAll(PointDir(stale, 1), 0o755)
	os.WriteFile(filepath.Join(PointDir(stale, 1), "summary.json"), []byte(failed), 0o644)
	var log bytes.Buffer
	r, err := RunSweepPoint(ctx, s, 0, SweepOptions{Out: stale, Cores: 1, Log: &log})
	if err != nil || r.Err != nil || r.Skipped || r.Resumed {
		t.Fatalf("stale point: %v %+v", err, r)
	}
	want, _ := os.ReadFile(filepath.Join(PointDir(fresh, 0), "series.csv"))
	got, _ := os.ReadFile(filepath.Join(PointDir(stale, 0), "series.csv"))
	if len(want) == 0 || !bytes.Equal(got, want) {
		t.Error("the point run again over a stopped run's files differs from a fresh run")
	}
	if !strings.Contains(log.String(), "running again from the start") {
		t.Errorf("the log does not say the point runs again:\n%s", log.String())
	}
	r, err = RunSweepPoint(ctx, s, 1, SweepOptions{Out: stale, Cores: 1})
	if err != nil || !r.Skipped || errText(r.Err) != "an earlier failure" {
		t.Errorf("failed point: %v %+v", err, r)
	}
	if b, _ := os.ReadFile(filepath.Join(PointDir(stale, 1), "summary.json")); string(b) != failed {
		t.Error("a failed point's summary was rewritten")
	}
	if _, err := RunSweepPoint(ctx, s, 2, SweepOptions{Out: stale}); err == nil || !strings.Contains(err.Error(), "points 1 to 2") {
		t.Errorf("point 3 of 2: %v", err)
	}
}

// errText is err's message, "" for nil.
func errText(err error) string {
	if err == nil {
		return ""
	}
	return err.Error()
}
