package run

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"axiswim/cases"
)

// TestResumeBitForBit: a run stopped part way (as by Ctrl-C, which writes
// a checkpoint) and resumed writes the same series, periods, metrics,
// fields and summary, byte for byte, as a run that never stopped (apart
// from the wall time and the speed of the run in the summary).
func TestResumeBitForBit(t *testing.T) {
	for _, prec := range []string{cases.PrecisionDouble, cases.PrecisionSingle} {
		t.Run(prec, func(t *testing.T) { testResume(t, prec, nil) })
	}
}

// TestResumeOnLevels: the same on two refined levels, the swimmer settling
// under gravity so that the levels follow it (several moves, one of them
// between the checkpoint and the end).
func TestResumeOnLevels(t *testing.T) {
	testResume(t, cases.PrecisionDouble, func(c *cases.Case) {
		c.Grid.Levels, c.Grid.CellsPerRadius, c.Shaking.Gravity = 2, 6, 3
	})
}

func testResume(t *testing.T, precision string, change func(*cases.Case)) {
	c, err := cases.Load("../../testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	c.Solver.Precision = precision
	if change != nil {
		change(c)
	}
	l, err := cases.Resolve(c)
	if err != nil {
		t.Fatal(err)
	}
	tmp := t.TempDir()
	whole, parts := filepath.Join(tmp, "whole"), filepath.Join(tmp, "parts")
	ctx := context.Background()
	if _, err := Execute(ctx, c, l, Options{Out: whole, Quiet: true}); err != nil {
		t.Fatal(err)
	}
	// stop in the middle of the third period, inside the averaging window
	stop := int64(l.StepsPerPeriod*4 + l.StepsPerPeriod/3)
	sum, err := Execute(ctx, c, l, Options{Out: parts, Quiet: true, StopAfter: stop})
	if err != nil || !sum.Interrupted {
		t.Fatalf("first part: interrupted %v, err %v", sum != nil && sum.Interrupted, err)
	}
	if _, err := os.Stat(filepath.Join(parts, CheckpointFile)); err != nil {
		t.Fatalf("no checkpoint after the interruption: %v", err)
	}
	if _, err := Execute(ctx, c, l, Options{Out: parts, Quiet: true, Resume: true}); err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"series.csv", "periods.csv", "metrics.csv", "fields/mean.vti",
		"fields/phase_03.vti", "fields/snapshot_p0006_05.vti", "fields/snapshots.pvd"} {
		a, err1 := os.ReadFile(filepath.Join(whole, f))
		b, err2 := os.ReadFile(filepath.Join(parts, f))
		if err1 != nil || err2 != nil {
			t.Errorf("%s: %v %v", f, err1, err2)
			continue
		}
		if !bytes.Equal(a, b) {
			t.Errorf("%s differs after the resume (%d and %d bytes)", f, len(a), len(b))
		}
	}
	strip := func(dir string) map[string]any {
		var m map[string]any
		data, _ := os.ReadFile(filepath.Join(dir, "summary.json"))
		if err := json.Unmarshal(data, &m); err != nil {
			t.Fatal(err)
		}
		delete(m, "wall_time_s")
		delete(m, "mlups")
		lat := m["lattice"].(map[string]any)
		delete(lat, "transfer_time_s")
		if lv, ok := lat["levels"].([]any); ok {
			for _, x := range lv {
				delete(x.(map[string]any), "kernel_time_s")
			}
		}
		return m
	}
	if c.Grid.Levels > 1 {
		var sum Summary
		data, _ := os.ReadFile(filepath.Join(whole, "summary.json"))
		if err := json.Unmarshal(data, &sum); err != nil {
			t.Fatal(err)
		}
		if sum.Lattice.LevelMoves < 2 || len(sum.Lattice.Levels) != 2 || sum.Failure != "" {
			t.Errorf("on levels: %d moves, %d levels in the summary, failure %q; want 2 or more moves of 2 levels", sum.Lattice.LevelMoves, len(sum.Lattice.Levels), sum.Failure)
		}
	}
	a, _ := json.Marshal(strip(whole))
	b, _ := json.Marshal(strip(parts))
	if !bytes.Equal(a, b) {
		t.Errorf("summaries differ:\n%s\n%s", a, b)
	}
}

// TestResumeRefusesOtherCase: a checkpoint is not resumed against a
// different case.toml.
func TestResumeRefusesOtherCase(t *testing.T) {
	c, err := cases.Load("../../testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	c.Run.Periods = 2
	l, _ := cases.Resolve(c)
	dir := filepath.Join(t.TempDir(), "run")
	if _, err := Execute(context.Background(), c, l, Options{Out: dir, Quiet: true, StopAfter: int64(l.StepsPerPeriod)}); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, "case.toml")
	src, _ := os.ReadFile(p)
	os.WriteFile(p, append(src, []byte("\n# edited\n")...), 0o644)
	if _, err := Execute(context.Background(), c, l, Options{Out: dir, Quiet: true, Resume: true}); err == nil {
		t.Error("resumed a checkpoint against an edited case")
	}
}
