package run

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
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

// TestResumeOnLevels: the same on two refined levels over 4 periods, the
// swimmer settling under gravity with a fine margin of 1.5 radii so that
// the levels follow it (moves before and after the checkpoint).
func TestResumeOnLevels(t *testing.T) {
	testResume(t, cases.PrecisionDouble, func(c *cases.Case) {
		c.Grid.Levels, c.Grid.CellsPerRadius, c.Shaking.Gravity, c.Grid.FineMargin = 2, 6, 3, 1.5
		c.Run.Periods = 4
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
	// stop a third into the second-last period, inside the averaging window
	stop := int64(l.StepsPerPeriod*(c.Run.Periods-2) + l.StepsPerPeriod/3)
	sum, err := Execute(ctx, c, l, Options{Out: parts, Quiet: true, StopAfter: stop})
	if err != nil || !sum.Interrupted {
		t.Fatalf("first part: interrupted %v, err %v", sum != nil && sum.Interrupted, err)
	}
	parts0 := sum.Lattice.LevelMoves
	if _, err := os.Stat(filepath.Join(parts, CheckpointFile)); err != nil {
		t.Fatalf("no checkpoint after the interruption: %v", err)
	}
	if _, err := Execute(ctx, c, l, Options{Out: parts, Quiet: true, Resume: true}); err != nil {
		t.Fatal(err)
	}
	last := fmt.Sprintf("fields/snapshot_p%04d_05", c.Run.Periods)
	files := []string{"series.csv", "periods.csv", "metrics.csv", "fields/mean.vti",
		"fields/phase_03.vti", last + ".vti", "fields/snapshots.pvd"}
	if c.Grid.Levels > 1 {
		files = append(files, last+".vtm", "fields/levels/snapshot_p"+last[len("fields/snapshot_p"):]+"_level1.vti", "fields/mean_fine.vti")
	}
	for _, f := range files {
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
		if parts0 == 0 || sum.Lattice.LevelMoves == parts0 || len(sum.Lattice.Levels) != 2 || sum.Failure != "" {
			t.Errorf("on levels: %d moves before the checkpoint and %d in all, %d levels in the summary, failure %q; want moves before and after it, 2 levels",
				parts0, sum.Lattice.LevelMoves, len(sum.Lattice.Levels), sum.Failure)
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
