package study

import (
	"axiswim/drive/run"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestSweepWarm: with warm starts and one job, each point after the first
// starts from its finished neighbour (the nearest, scaled to the key's
// range), and results.csv says so; a point on another lattice
// (cells_per_radius varied) starts from rest and its summary says why.
func TestSweepWarm(t *testing.T) {
	s := testSweep(t, "amp", "shaking.amplitude", "1e-4, 3e-4, 1.2e-4")
	out := t.TempDir()
	res, err := RunSweep(context.Background(), s, SweepOptions{Out: out, Jobs: 1, Cores: 2, Warm: true})
	if err != nil {
		t.Fatal(err)
	}
	// 3e-4 starts from 1e-4 (the only one done); 1.2e-4 from 1e-4, nearer than 3e-4.
	want := []string{"", "point_001", "point_001"}
	for i, r := range res {
		got := ""
		if w := r.Summary.WarmStart; w != nil && w.Used {
			got = filepath.Base(w.From)
		}
		if got != want[i] {
			t.Errorf("point %d: warm start from %q, want %q", i+1, got, want[i])
		}
		if _, err := os.Stat(filepath.Join(r.Dir, run.FinalStateFile)); err != nil {
			t.Errorf("point %d keeps no final state: %v", i+1, err)
		}
	}
	table, _ := os.ReadFile(filepath.Join(out, ResultsFile))
	if lines := strings.Split(string(table), "\n"); !strings.Contains(lines[0], ",warm_start,") || !strings.Contains(lines[3], ",point_001,") {
		t.Errorf("results.csv does not name the warm starts:\n%s", table)
	}

	s = testSweep(t, "res", "grid.cells_per_radius", "5, 6")
	res, err = RunSweep(context.Background(), s, SweepOptions{Out: t.TempDir(), Jobs: 1, Cores: 2, Warm: true})
	if err != nil {
		t.Fatal(err)
	}
	if w := res[1].Summary.WarmStart; w == nil || w.Used || !strings.Contains(w.Reason, "lattices differ") {
		t.Errorf("another resolution: warm start %+v, want a start from rest with the reason", w)
	}
}
