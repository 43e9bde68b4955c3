package cases

import (
	"errors"
	"reflect"
	"strings"
	"testing"
)

// misspelt has unknown keys of every kind the scanner has to locate.
const misspelt = `# a case with typos
[fluid]
density = 1180.0
viscocity = 0.012

[container]
radius = 0.006
length = 0.024
ends = "closed"
Ends = "closed"

[shaking]
frequency = 35.0
amplitude = 6e-4

[[sphere]]
radius = 0.0012
density = 1450.0
z = -0.0018

[[sphere]]
radus = 0.0008
radius = 0.0008
density = 268.75
z = 0.0018

[solvr]
collision = "trt"

[grid]
colour = "blue"

[run]
periods = 20
grid.tau = 0.6
`

func TestParseUnknownKeys(t *testing.T) {
	_, err := Parse("typos.toml", []byte(misspelt))
	var ke KeyErrors
	if !errors.As(err, &ke) {
		t.Fatalf("Parse = %v, want KeyErrors", err)
	}
	want := []struct {
		key  string
		line int
		hint string
	}{
		{"fluid.viscocity", 4, "viscosity"},
		{"container.Ends", 10, "ends"},
		{"sphere[2].radus", 22, "radius"},
		{"solvr", 27, "solver"},
		{"grid.colour", 31, `"cell_size", "cells_per_radius", "fine_margin", "level_margin", "levels", "tau"`},
		{"run.grid", 35, ""},
	}
	if len(ke) != len(want) {
		t.Fatalf("got %d key errors, want %d:\n%v", len(ke), len(want), err)
	}
	for i, w := range want {
		e := ke[i]
		if e.Key != w.key || e.Line != w.line || e.Missing || (w.hint != "" && e.Hint != w.hint) {
			t.Errorf("error %d = %+v, want key %q at line %d, hint %q", i, *e, w.key, w.line, w.hint)
		}
	}
	first := `typos.toml: unknown key "fluid.viscocity" at line 4: did you mean "viscosity"?`
	if lines := strings.Split(err.Error(), "\n"); lines[0] != first || len(lines) != len(want) {
		t.Errorf("error text:\n%s\nwant %d lines, the first\n%s", err, len(want), first)
	}
	if !ke[4].Close && !strings.Contains(ke[4].Error(), "valid keys here are") {
		t.Errorf("no list of valid keys in %q", ke[4].Error())
	}
}

func TestParseUnknownKeysInline(t *testing.T) {
	src := `fluid = { density = 1000.0, viscosity = 0.001, visc = 1 }
container.radius = 0.01
container.lenght = 0.04
container.length = 0.04
sphere = [
  { radius = 0.001, density = 1000.0, z = 0.0 },
  { radius = 0.001, density = 1000.0, z = 0.005, zz = 1 },
]
`
	_, err := Parse("", []byte(src))
	var ke KeyErrors
	if !errors.As(err, &ke) {
		t.Fatalf("Parse = %v, want KeyErrors", err)
	}
	got := make([]string, len(ke))
	for i, e := range ke {
		got[i] = e.Error()
	}
	want := []string{
		`unknown key "fluid.visc" at line 1: did you mean "viscosity"?`,
		`unknown key "container.lenght" at line 3: did you mean "length"?`,
		`unknown key "sphere[2].zz" at line 7: did you mean "z"?`,
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("errors\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}

func TestParseMissingKeys(t *testing.T) {
	src := `[fluid]
density = 1000.0

[[sphere]]
radius = 0.001
z = 0.0

[[spring]]
spheres = [1, 2]
`
	_, err := Parse("m.toml", []byte(src))
	var ke KeyErrors
	if !errors.As(err, &ke) {
		t.Fatalf("Parse = %v, want KeyErrors", err)
	}
	want := map[string]int{
		"fluid.viscosity":     1,
		"container.radius":    0,
		"container.length":    0,
		"sphere[1].density":   4,
		"spring[1].stiffness": 8,
	}
	if len(ke) != len(want) {
		t.Errorf("got %d errors, want %d:\n%v", len(ke), len(want), err)
	}
	for _, e := range ke {
		line, ok := want[e.Key]
		if !ok || !e.Missing || e.Line != line {
			t.Errorf("unexpected %+v", *e)
		}
	}
	if !strings.Contains(err.Error(), `m.toml: missing required key "sphere[1].density" in the table at line 4`) {
		t.Errorf("error text:\n%s", err)
	}
}

func TestParseLibraryErrorsKeepLine(t *testing.T) {
	for _, tc := range []struct{ name, src, want string }{
		{"syntax", "[fluid]\ndensity = 1000.0\nviscosity = = 1\n", "line 3"},
		{"type", "[fluid]\ndensity = 1000.0\nviscosity = \"thick\"\n", "line 3"},
		{"int", "[run]\n\nperiods = 2.5\n", "line 3"},
		{"pair", "[[spring]]\nspheres = [1, 2, 3]\nstiffness = 1.0\n", "line 2"},
	} {
		_, err := Parse(tc.name+".toml", []byte(tc.src))
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), tc.name+".toml: ") {
			t.Errorf("%s: Parse = %v, want an error at %s", tc.name, err, tc.want)
		}
	}
}

func TestParseDefaults(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	if c.Container.Ends != EndsClosed || c.Shaking.RampPeriods != 2 || c.Shaking.Gravity != 9.81 ||
		c.Solver.Collision != CollisionTRT || c.Solver.Magic != 0.1875 || c.Run.SamplesPerPeriod != 20 {
		t.Errorf("defaults not filled: %+v", c)
	}
	src := workedExample + "[[sphere]]\nradius = 0.001\ndensity = 1000.0\nz = 0.01\n" +
		"[[spring]]\nspheres = [2, 1]\nstiffness = 0.05\n"
	src = strings.Replace(src, "[shaking]\n", "[shaking]\ngravity = 0.0\nramp_periods = 0.0\n", 1)
	c = mustParse(t, "worked", src)
	if c.Shaking.Gravity != 0 || c.Shaking.RampPeriods != 0 {
		t.Errorf("explicit zero gravity and ramp not kept: %+v", c.Shaking)
	}
	if s := c.Springs[0]; s.RestLength != 0.01 || s.Damping != 0 {
		t.Errorf("spring defaults: %+v, want rest length 0.01", s)
	}
	src = strings.Replace(pipeSource(t), "duration = 0.02", "duration = 0.5", 1)
	if c := mustParse(t, "pipe", src); c.Run.SampleInterval != 0.5/200 || c.Grid.CellsPerRadius != 0 {
		t.Errorf("unshaken defaults: %+v", c.Run)
	}
}

func pipeSource(t *testing.T) string {
	src, err := Get("pipe-poiseuille")
	if err != nil {
		t.Fatal(err)
	}
	return string(src)
}

func TestEditDistance(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		d    int
	}{
		{"viscosity", "viscocity", 1},
		{"radius", "radus", 1},
		{"desnity", "density", 1}, // transposition
		{"", "abc", 3},
		{"kitten", "sitting", 3},
	} {
		if d := editDistance(tc.a, tc.b); d != tc.d {
			t.Errorf("editDistance(%q, %q) = %d, want %d", tc.a, tc.b, d, tc.d)
		}
	}
}

// TestOutputDefaults: without an [output] section a case writes 8
// snapshots over the last period, mirrored VTK and pictures; the keys are
// read when given.
func TestOutputDefaults(t *testing.T) {
	src, _ := Get("demo")
	c, err := Parse("demo", src)
	if err != nil {
		t.Fatal(err)
	}
	if o := c.Output; o.SnapshotsPerPeriod != 8 || o.SnapshotPeriods != 1 || !o.Mirror || !o.VTK || !o.Pictures {
		t.Errorf("defaults %+v", o)
	}
	c, err = Parse("x", append(append([]byte{}, src...), []byte("\n[output]\nvtk = false\nsnapshots_per_period = 4\n")...))
	if err != nil {
		t.Fatal(err)
	}
	if c.Output.VTK || c.Output.SnapshotsPerPeriod != 4 || !c.Output.Pictures {
		t.Errorf("given %+v", c.Output)
	}
}
