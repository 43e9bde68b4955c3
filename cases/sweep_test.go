package cases

import (
	"math"
	"strings"
	"testing"
)

func TestSweepPointsAndCases(t *testing.T) {
	src := `title = "amplitude and density"
base = "demo"
[[vary]]
key = "shaking.amplitude"
from = 1e-4
to = 1e-3
points = 3
scale = "log"
[[vary]]
key = "sphere[2].density"
values = [589.375, 600]
`
	s, err := ParseSweep("t", []byte(src), ".")
	if err != nil {
		t.Fatal(err)
	}
	pts := s.Points()
	if len(pts) != 6 {
		t.Fatalf("%d points, want 3 x 2", len(pts))
	}
	// log range: 1e-4, sqrt(1e-4 * 1e-3), 1e-3, first key slowest
	if pts[0][0] != 1e-4 || pts[5][0] != 1e-3 || math.Abs(pts[2][0]-math.Sqrt(1e-7)) > 1e-18 || pts[1][1] != 600 {
		t.Errorf("points %v", pts)
	}
	_, c, err := s.CaseAt(pts[3])
	if err != nil {
		t.Fatal(err)
	}
	if c.Shaking.Amplitude != pts[3][0] || c.Spheres[1].Density != 600 || c.Spheres[0].Density != 1355 {
		t.Errorf("case at %v: amplitude %g, densities %g %g", pts[3], c.Shaking.Amplitude, c.Spheres[0].Density, c.Spheres[1].Density)
	}
	// the base is not changed by a point
	_, c0, _ := s.CaseAt(pts[0])
	if c0.Spheres[1].Density != 589.375 || c0.Shaking.Amplitude != 1e-4 {
		t.Errorf("case at %v: amplitude %g, density %g", pts[0], c0.Shaking.Amplitude, c0.Spheres[1].Density)
	}
}

func TestSweepIntegerKey(t *testing.T) {
	s, err := ParseSweep("t", []byte("base = \"demo\"\n[[vary]]\nkey = \"grid.cells_per_radius\"\nvalues = [8, 10]\n"), ".")
	if err != nil {
		t.Fatal(err)
	}
	_, c, err := s.CaseAt(Point{10})
	if err != nil || c.Grid.CellsPerRadius != 10 {
		t.Fatalf("cells %v, err %v", c, err)
	}
	if _, err := ParseSweep("t", []byte("base = \"demo\"\n[[vary]]\nkey = \"grid.cells_per_radius\"\nvalues = [8.5]\n"), "."); err == nil ||
		!strings.Contains(err.Error(), "whole numbers") {
		t.Errorf("8.5 cells per radius: %v", err)
	}
}

// TestSweepErrors: a bad sweep file gets an error naming what is wrong.
func TestSweepErrors(t *testing.T) {
	for src, want := range map[string]string{
		"[[vary]]\nkey = \"shaking.amplitude\"\nvalues = [1e-3]\n": "base is missing",
		"base = \"demo\"\n": "0 [[vary]] tables",
		"base = \"demo\"\n[[vary]]\nkey = \"shaking.amplitud\"\nvalues = [1e-3]\n":                                "shaking.amplitud",
		"base = \"demo\"\n[[vary]]\nkey = \"sphere[3].density\"\nvalues = [1e3]\n":                                "from 1 to 2",
		"base = \"demo\"\n[[vary]]\nkey = \"shaking.amplitude\"\nfrom = 0\nto = 1\npoints = 3\nscale = \"log\"\n": "must be positive",
		"base = \"demo\"\n[[vary]]\nkey = \"shaking.amplitude\"\nfrom = 1\nto = 2\npoints = 1\n":                  "at least 2 points",
		"base = \"demo\"\n[[vary]]\nkey = \"shaking.amplitude\"\nvalues = [1]\nfrom = 1\n":                        "both values and a range",
		"base = \"demo\"\nbse = 1\n[[vary]]\nkey = \"shaking.amplitude\"\nvalues = [1e-3]\n":                      "unknown key \"bse\"",
		"base = \"nosuch.toml\"\n[[vary]]\nkey = \"shaking.amplitude\"\nvalues = [1e-3]\n":                        "nosuch.toml",
	} {
		_, err := ParseSweep("t", []byte(src), t.TempDir())
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: error %v, want one containing %q", src, err, want)
		}
	}
}

// TestExampleSweep: the sweeps shipped in cases/sweeps read, span the
// ranges they say, and their points are valid cases warning only of their
// coarse resolution.
func TestExampleSweep(t *testing.T) {
	for _, c := range []struct {
		file   string
		lo, hi float64
	}{
		{"sweeps/amplitude.toml", 5e-5, 4e-4},
		{"sweeps/three-sphere-viscosity.toml", 0.4, 0.01},
	} {
		s, err := LoadSweep(c.file)
		if err != nil {
			t.Fatal(err)
		}
		pts := s.Points()
		if len(pts) != 5 || pts[0][0] != c.lo || pts[4][0] != c.hi || !s.Params[0].Log {
			t.Fatalf("%s: points %v", c.file, pts)
		}
		for _, pt := range pts {
			_, cs, err := s.CaseAt(pt)
			if err != nil {
				t.Fatal(err)
			}
			l, err := Resolve(cs)
			if err != nil {
				t.Errorf("%s point %s: %v", c.file, s.Label(pt), err)
				continue
			}
			for _, w := range l.Warnings {
				// Coarse on purpose (quick looks): the spheres' and the
				// Stokes layer's cells may be few; nothing else may warn.
				if !strings.Contains(w, "cells per radius, below") && !strings.Contains(w, "Stokes layer is only") {
					t.Errorf("%s point %s: %s", c.file, s.Label(pt), w)
				}
			}
		}
	}
}
