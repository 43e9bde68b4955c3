package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"axiswim/cases"
)

// demoOnLevels writes the embedded demo with the grid lines given added to
// [grid] into dir and returns its path.
func demoOnLevels(t *testing.T, dir string, grid string) string {
	t.Helper()
	src, err := cases.Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	s := strings.Replace(string(src), "cells_per_radius = 12", "cells_per_radius = 12\n"+grid, 1)
	path := filepath.Join(dir, "demo-levels.toml")
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestCheckLevels: check of the demo on 3 levels prints the container's
// rounding, the levels with their blocks and relaxation times, the fine
// region, the cost against the uniform lattice of the finest spacing and
// a run time estimate. The numbers are those of the hand calculation of
// cases.TestLayoutDemo3: level 0 has 92 x 23 cells of 6/23 mm (the
// container exactly), level 1 is the block {24, 0, 43, 13} of it (86 x 26
// cells), level 2 {4, 0, 77, 22} of level 1 (154 x 44); the finest tau+
// 0.55113 halves its excess over 1/2 per level, 0.52557 and 0.51278; the
// node updates per step of level 0, 33692, are 0.249 of the uniform
// lattice's 135424.
func TestCheckLevels(t *testing.T) {
	path := demoOnLevels(t, t.TempDir(), "levels = 3")
	code, out, e := cli(t, "check", "-quiet", path)
	if code != exitOK {
		t.Fatalf("check: exit %d\n%s%s", code, out, e)
	}
	for _, want := range []string{
		"lattice (3 levels refined by 2, level 0 the coarsest",
		"container       rounded to whole cells of level 0, 92 x 23 of 0.00026087 m: 0.024 m long (container.length 0.024 m, +0.000%), 0.006 m radius (exact)",
		"(12.27 cells per radius of the smallest sphere; the uniform lattice of this spacing would be 368 x 92 cells)",
		"steps/period    4008 (1002 of level 0",
		"the whole container",
		"86 x 26       2236  z0 24 r0 0, 43 x 13",
		"154 x 44       6776  z0 4 r0 0, 77 x 22",
		"0       0.51278",
		"1       0.52557",
		"2       0.55113",
		"binding rule",
		"fine region (level 2): z -0.0051008 .. 0.0047008 m, r up to 0.0028 m: one region around all the spheres",
		"node updates    3.37e+04 per step of level 0",
		"0.249 times the uniform lattice of the finest spacing (368 x 92 cells",
		"memory          ",
		"run time        about ",
		"MLUPS over", "interface transfers", "fields on a uniform image of 368 x 92 nodes",
		"interface transfers",
		"kernel          ",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q:\n%s", want, out)
		}
	}
	// the only warning: the default fine margin (cases.AccurateFineMargin)
	if _, w, _ := strings.Cut(out, "\nwarnings:"); strings.Count(w, "\n  ") != 1 || !strings.Contains(w, "grid.fine_margin = 2 radii") {
		t.Errorf("warnings for the demo on 3 levels, want only the fine margin's:\n%s", w)
	}
}

// TestRunOnLevels: run takes a case on two levels to its end and writes
// what a run on one lattice writes, with the levels in summary.json; a
// sweep over grid.levels plans both points.
func TestRunOnLevels(t *testing.T) {
	dir := t.TempDir()
	src, err := os.ReadFile("testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	s := strings.Replace(string(src), "cells_per_radius = 5", "cells_per_radius = 6\nlevels = 2", 1)
	s = strings.Replace(s, "periods = 6", "periods = 2", 1)
	path := filepath.Join(dir, "two.toml")
	os.WriteFile(path, []byte(s), 0o644)
	out := filepath.Join(dir, "out")
	code, _, e := cli(t, "run", "-quiet", "-out", out, path)
	if code != exitOK {
		t.Fatalf("run on levels: exit %d, %s", code, e)
	}
	for _, f := range []string{"summary.json", "series.csv", "periods.csv", "fields/mean.vti", "pictures/mean_vorticity.png",
		"fields/snapshot_p0002_00.vtm", "fields/levels/snapshot_p0002_00_level0.vti", "fields/levels/snapshot_p0002_00_level1.vti",
		"fields/mean_fine.vti", "pictures/mean_vorticity_fine.png"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("run on levels: %v", err)
		}
	}
	data, _ := os.ReadFile(filepath.Join(out, "summary.json"))
	var sum struct {
		Completed bool
		Lattice   struct{ Levels []struct{ Nz, Nr int } }
	}
	if err := json.Unmarshal(data, &sum); err != nil || !sum.Completed || len(sum.Lattice.Levels) != 2 {
		t.Errorf("summary of a run on 2 levels: completed %v, %d levels, %v", sum.Completed, len(sum.Lattice.Levels), err)
	}

	base, err := os.ReadFile("testdata/sweep-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "base.toml"), base, 0o644)
	sweep := filepath.Join(dir, "levels-sweep.toml")
	os.WriteFile(sweep, []byte("base = \"base.toml\"\n[[vary]]\nkey = \"grid.levels\"\nvalues = [1, 2]\n"), 0o644)
	if code, _, e := cli(t, "sweep", "-plan", "-out", filepath.Join(dir, "plan"), sweep); code != exitOK {
		t.Errorf("sweep -plan over grid.levels: exit %d, %s", code, e)
	}
}
