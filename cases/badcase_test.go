package cases_test

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"axiswim/cases"
)

// badCaseBase is a small valid case: two spheres joined by a spring in a
// shaken, closed cylinder. Each row of TestBadCaseMessages breaks it in one
// way. With 8 cells per radius of 1 mm the grid is 160 x 40 cells.
const badCaseBase = `
[fluid]
density = 1000.0
viscosity = 0.01

[container]
radius = 0.005
length = 0.02

[shaking]
frequency = 20.0
amplitude = 0.0005

[[sphere]]
radius = 0.001
density = 1200.0
z = -0.002

[[sphere]]
radius = 0.001
density = 800.0
z = 0.002

[[spring]]
spheres = [1, 2]
stiffness = 0.05

[grid]
cells_per_radius = 8

[run]
periods = 4
`

// badCaseEdit returns badCaseBase with each old text replaced by the new
// one that follows it; every old text must occur exactly once, so that a
// change to the base cannot silently turn a row into a no-op.
func badCaseEdit(t *testing.T, pairs ...string) string {
	t.Helper()
	src := badCaseBase
	for i := 0; i+1 < len(pairs); i += 2 {
		old, new := pairs[i], pairs[i+1]
		if n := strings.Count(src, old); n != 1 {
			t.Fatalf("edit %q: found %d times in the base case, want once", old, n)
		}
		src = strings.Replace(src, old, new, 1)
	}
	return src
}

// The stage at which a bad case is refused.
const (
	stageParse    = "Parse"
	stageValidate = "Validate"
	stageResolve  = "Resolve"
)

func TestBadCaseBaseIsValid(t *testing.T) {
	c, err := cases.Parse("base", []byte(badCaseBase))
	if err != nil {
		t.Fatal(err)
	}
	if err := c.Validate(); err != nil {
		t.Fatal(err)
	}
	if _, err := cases.Resolve(c); err != nil {
		t.Fatal(err)
	}
}

// TestBadCaseMessages: every class of bad case is refused at the stage
// that owns the check, with a message that names the key (and the value,
// for a bad value), says what is wrong and says how to fix it, as
// DEVELOPERS.md asks ("a bad case gets an error naming the key, the value,
// the reason and the fix"). The expected texts are those of
// cases/validate.go, cases/limits.go and cases/decode.go.
func TestBadCaseMessages(t *testing.T) {
	type row struct {
		name  string
		edits []string // pairs of old, new text applied to badCaseBase
		stage string   // where the case is refused
		key   string   // the key the message must name
		value string   // the value as the Problem gives it (not for Parse rows)
		// reason and remedy are substrings of the message: what is wrong,
		// and the fix or suggestion.
		reason, remedy []string
	}
	rows := []row{
		{
			name:   "overlapping spheres",
			edits:  []string{"z = 0.002", "z = -0.0015"},
			stage:  stageValidate,
			key:    "sphere[2].z",
			value:  "-0.0015",
			reason: []string{"the sphere overlaps sphere[1] (centre distance 0.0005 <= sum of radii 0.002)"},
			remedy: []string{"fix: move the centres further apart than the sum of the radii"},
		},
		{
			name:   "sphere outside the container",
			edits:  []string{"z = -0.002", "z = -0.05"},
			stage:  stageValidate,
			key:    "sphere[1].z",
			value:  "-0.05",
			reason: []string{"the sphere touches or crosses an end wall (|z| + radius must be < length/2 = 0.01)"},
			// The bound is length/2 - radius printed with
			// strconv 'g' -1: "0.009000000000000001" today.
			remedy: []string{"fix: keep |z| below 0.009", ", or use a longer container"},
		},
		{
			// radius equal to the container radius: touching, not crossing
			name:   "sphere touching the container wall",
			edits:  []string{"radius = 0.005", "radius = 0.001"},
			stage:  stageValidate,
			key:    "sphere[1].radius",
			value:  "0.001",
			reason: []string{"the sphere touches or crosses the container wall (container.radius = 0.001)"},
			remedy: []string{"fix: use a smaller sphere or a wider container"},
		},
		{
			name:   "negative container radius",
			edits:  []string{"radius = 0.005", "radius = -0.005"},
			stage:  stageValidate,
			key:    "container.radius",
			value:  "-0.005",
			reason: []string{"must be positive"},
			remedy: []string{"fix: give the inner radius in metres"},
		},
		{
			name:   "zero container length",
			edits:  []string{"length = 0.02", "length = 0.0"},
			stage:  stageValidate,
			key:    "container.length",
			value:  "0",
			reason: []string{"must be positive (it is required)"},
			remedy: []string{"fix: give the inner length in metres"},
		},
		{
			name:   "negative sphere radius",
			edits:  []string{"radius = 0.001\ndensity = 800.0", "radius = -0.001\ndensity = 800.0"},
			stage:  stageValidate,
			key:    "sphere[2].radius",
			value:  "-0.001",
			reason: []string{"must be positive"},
			remedy: []string{"fix: give the radius in metres"},
		},
		{
			name:   "zero fluid density",
			edits:  []string{"density = 1000.0", "density = 0.0"},
			stage:  stageValidate,
			key:    "fluid.density",
			value:  "0",
			reason: []string{"must be positive (it is required)"},
			remedy: []string{"fix: give the liquid density in kg/m^3"},
		},
		{
			name:   "negative sphere density",
			edits:  []string{"density = 1200.0", "density = -1200.0"},
			stage:  stageValidate,
			key:    "sphere[1].density",
			value:  "-1200",
			reason: []string{"must be positive"},
			remedy: []string{"fix: give the density in kg/m^3"},
		},
		{
			name:   "negative viscosity",
			edits:  []string{"viscosity = 0.01", "viscosity = -0.01"},
			stage:  stageValidate,
			key:    "fluid.viscosity",
			value:  "-0.01",
			reason: []string{"must be positive"},
			remedy: []string{"fix: give the dynamic viscosity in Pa s"},
		},
		{
			name:   "unknown key",
			edits:  []string{"viscosity = 0.01", "viscocity = 0.01"},
			stage:  stageParse,
			key:    "fluid.viscocity",
			reason: []string{`unknown key "fluid.viscocity" at line 4`},
			remedy: []string{`did you mean "viscosity"?`},
		},
		{
			name:  "string for a number",
			edits: []string{"viscosity = 0.01", `viscosity = "0.01"`},
			stage: stageParse,
			key:   "fluid.viscosity",
			reason: []string{`line 4 (last key "fluid.viscosity")`,
				"incompatible types: TOML value has type string; destination has type float"},
			// The toml library's message (passed on by Parse with the
			// file name) names the key, the line and both types but
			// suggests no fix: nothing to assert as the remedy.
			remedy: nil,
		},
		{
			name:   "spring naming a missing sphere",
			edits:  []string{"spheres = [1, 2]", "spheres = [1, 3]"},
			stage:  stageValidate,
			key:    "spring[1].spheres",
			value:  "[1, 3]",
			reason: []string{"sphere 3 does not exist (there are 2 spheres, numbered from 1)"},
			remedy: []string{"fix: name two spheres by their 1-based position in the file"},
		},
		{
			name:   "fewer than 5 cells per radius",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 4"},
			stage:  stageValidate,
			key:    "grid.cells_per_radius",
			value:  "4",
			reason: []string{"must be at least 5"},
			remedy: []string{"fix: use 12 or more cells per radius"},
		},
		{
			name:   "tau at 1/2",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\ntau = 0.5"},
			stage:  stageValidate,
			key:    "grid.tau",
			value:  "0.5",
			reason: []string{"must be greater than 0.5"},
			remedy: []string{"fix: give tau between 0.51 and 1, or leave it out"},
		},
		{
			name:   "tau below 1/2",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\ntau = 0.3"},
			stage:  stageValidate,
			key:    "grid.tau",
			value:  "0.3",
			reason: []string{"must be greater than 0.5"},
			remedy: []string{"fix: give tau between 0.51 and 1, or leave it out"},
		},
		{
			// 5 cells per radius (dx = 0.2 mm) in a 40 mm cell (200 x 25
			// cells) shaken at 400 Hz with A = 0.5 mm: the acoustic bound
			// nu_L <= c_s nu/(omega dx^2 Nz) = 2.87e-4 and the Mach bound
			// nu_L <= 0.1 c_s nu/(A omega dx) = 2.30e-3 both fall below
			// the floor (0.51 - 1/2)/3 = 3.33e-3 of tau >= 0.51, though
			// every value is valid on its own.
			name: "limits that cannot all hold",
			edits: []string{
				"cells_per_radius = 8", "cells_per_radius = 5",
				"length = 0.02", "length = 0.04",
				"frequency = 20.0", "frequency = 400.0",
			},
			stage: stageResolve,
			key:   "grid.cells_per_radius",
			value: "5",
			reason: []string{
				"no admissible time step",
				"the acoustic limit He <= 1 (METHODS.md 10.3) needs nu_L <= 0.000287",
				"the Mach limit Ma <= 0.1 (METHODS.md 10.1) needs nu_L <= 0.0023",
				"below the floor nu_L >= 0.00333 (tau >= 0.51, METHODS.md 10.1)",
			},
			// ceil(5 x 3.33e-3/2.87e-4 x 1.02), the 1.02 being the
			// margin of timeStepConflict
			remedy: []string{"fix: raise grid.cells_per_radius to at least 60",
				"or shorten the container", "or lower the reference speed",
				"or give grid.tau to accept the violation"},
		},
		{
			// 1e5 cells per 1 mm radius: a 2e6 x 5e5 grid, some 200 TiB
			name:   "grid too big for memory",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 100000"},
			stage:  stageValidate,
			key:    "grid.cells_per_radius",
			value:  "100000",
			reason: []string{"the 2000000 x 500000 grid needs about ", "GiB, more than the limit of "},
			remedy: []string{"fix: use fewer cells (coarser grid) or a smaller container"},
		},
		{
			// 1e5 cells per 1 mm radius on 2 levels: level 0 alone is a
			// 1e6 x 2.5e5 grid, some 50 TiB
			name:   "levels too big for memory",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 100000\nlevels = 2"},
			stage:  stageValidate,
			key:    "grid.cells_per_radius",
			value:  "100000",
			reason: []string{"the 2 levels need about ", "GiB, more than the limit of "},
			remedy: []string{"fix: use fewer cells (coarser grid), more levels, smaller margins"},
		},
		{
			name:   "negative levels",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = -1"},
			stage:  stageValidate,
			key:    "grid.levels",
			value:  "-1",
			reason: []string{"must be 1 to 8", "the coarsest of more levels has tau+ below 0.5025", "benchmarks/taustability"},
			remedy: []string{"fix: use 1 (one uniform lattice) or 2 to 8 levels"},
		},
		{
			name:   "too many levels",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 9"},
			stage:  stageValidate,
			key:    "grid.levels",
			value:  "9",
			reason: []string{"must be 1 to 8"},
			remedy: []string{"fix: use 1 (one uniform lattice) or 2 to 8 levels"},
		},
		{
			// 8 cells per radius of 1 mm on 6 levels: level 0's nominal
			// cell is 32 x 0.125 = 4 mm, 1.25 across the 5 mm radius,
			// rounded to 1 (of 5 mm), and 20/5 = 4 along
			name:   "level 0 too coarse",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 6"},
			stage:  stageValidate,
			key:    "grid.levels",
			value:  "6",
			reason: []string{"level 0 has only 4 x 1 cells (z x r) of 0.005 m"},
			remedy: []string{"fix: use fewer levels, or raise grid.cells_per_radius"},
		},
		{
			name:   "MRT on levels",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 2\n[solver]\ncollision = \"mrt\""},
			stage:  stageValidate,
			key:    "solver.collision",
			value:  `"mrt"`,
			reason: []string{"grid.levels = 2 needs TRT", "not written for MRT (lbm.NewLevels refuses it)"},
			remedy: []string{`fix: use "trt", or grid.levels = 1`},
		},
		{
			name:   "BGK on levels",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 2\n[solver]\ncollision = \"bgk\""},
			stage:  stageValidate,
			key:    "solver.collision",
			value:  `"bgk"`,
			reason: []string{"grid.levels = 2 needs TRT", "measured for TRT", "BGK was unstable at tau+ = 0.5025"},
			remedy: []string{`fix: use "trt", or grid.levels = 1`},
		},
		{
			// 0.5 radii of 8 cells: 4 cells
			name:   "fine margin too thin",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 2\nfine_margin = 0.5"},
			stage:  stageValidate,
			key:    "grid.fine_margin",
			value:  "0.5",
			reason: []string{"is 4 cells of the finest level (grid.cells_per_radius = 8), fewer than 6"},
			remedy: []string{"fix: give at least 0.75 radii"},
		},
		{
			name:   "negative fine margin",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nfine_margin = -1.0"},
			stage:  stageValidate,
			key:    "grid.fine_margin",
			value:  "-1",
			reason: []string{"must be positive"},
			remedy: []string{"fix: give the margin of the finest level in radii of the smallest sphere, e.g. 2"},
		},
		{
			name:   "level margin of one cell",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 2\nlevel_margin = 1"},
			stage:  stageValidate,
			key:    "grid.level_margin",
			value:  "1",
			reason: []string{"must be at least 2", "(lbm.Block)"},
			remedy: []string{"fix: give the margin in cells of the coarser level, e.g. 4"},
		},
		{
			// tau = 0.88 on 2 levels: the finest level's tau- is
			// 1/2 + 0.1875/0.38 = 0.9934; the band of tau- within 0.05 of
			// 1 is tau+ in (1/2 + 0.1875/0.55, 1/2 + 0.1875/0.45)
			name:   "a level's tau- near 1",
			edits:  []string{"cells_per_radius = 8", "cells_per_radius = 8\nlevels = 2\ntau = 0.88"},
			stage:  stageValidate,
			key:    "grid.tau",
			value:  "0.88",
			reason: []string{"level 1 of 2 would have tau- = 0.9934", "within 0.05 of 1", "(lbm.Levels)"},
			remedy: []string{"fix: give grid.tau at most 0.8409 or at least 0.9167", "or change solver.magic"},
		},
	}
	for _, r := range rows {
		t.Run(r.name, func(t *testing.T) {
			src := badCaseEdit(t, r.edits...)
			err, stage := badCaseRun(src)
			if stage != r.stage {
				t.Fatalf("refused at %q (err %v), want at %s", stage, err, r.stage)
			}
			msg := err.Error()
			t.Logf("%s: %s", stage, msg)
			want := append(append([]string{r.key}, r.reason...), r.remedy...)
			for _, w := range want {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
			if r.stage == stageParse {
				return
			}
			// A value problem comes as a Problem on the key, with the
			// value and a fix.
			var ps cases.Problems
			if !errors.As(err, &ps) {
				t.Fatalf("error is %T, want cases.Problems", err)
			}
			p, ok := badCaseProblem(ps, r.key)
			if !ok {
				t.Fatalf("no problem on %s in\n%s", r.key, msg)
			}
			if p.Value != r.value {
				t.Errorf("%s: value %q, want %q", r.key, p.Value, r.value)
			}
			if p.Fix == "" {
				t.Errorf("%s: no fix", r.key)
			}
			if !strings.HasPrefix(p.Error(), r.key+" = "+r.value+": ") {
				t.Errorf("problem line %q does not start with the key and value", p.Error())
			}
			if r.stage == stageValidate {
				// Resolve validates first and refuses the same case with
				// the same problem.
				c, _ := cases.Parse("bad.toml", []byte(src))
				_, rerr := cases.Resolve(c)
				var rps cases.Problems
				if !errors.As(rerr, &rps) {
					t.Fatalf("Resolve: %v, want the Problems of Validate", rerr)
				}
				if _, ok := badCaseProblem(rps, r.key); !ok {
					t.Errorf("Resolve: no problem on %s in %v", r.key, rerr)
				}
			}
			if r.stage == stageResolve {
				// Following the fix resolves the case.
				var n int
				if _, err := fmt.Sscanf(p.Fix, "raise grid.cells_per_radius to at least %d", &n); err != nil {
					t.Fatalf("no resolution in the fix %q: %v", p.Fix, err)
				}
				fixed := strings.Replace(src, "cells_per_radius = 5", fmt.Sprintf("cells_per_radius = %d", n), 1)
				if err, stage := badCaseRun(fixed); err != nil {
					t.Errorf("with the suggested %d cells per radius, refused at %s: %v", n, stage, err)
				}
			}
		})
	}
}

// TestBadCaseAllAtOnce: a case with three distinct problems gets all three
// in one error, each on its own line with its key and fix; so does a case
// file with three unknown keys.
func TestBadCaseAllAtOnce(t *testing.T) {
	t.Run("values", func(t *testing.T) {
		src := badCaseEdit(t,
			"viscosity = 0.01", "viscosity = -0.01", // fluid.viscosity
			"z = 0.002", "z = -0.0015", // sphere[2].z overlaps sphere[1]
			"cells_per_radius = 8", "cells_per_radius = 8\ntau = 0.45", // grid.tau
		)
		err, stage := badCaseRun(src)
		if stage != stageValidate {
			t.Fatalf("refused at %q (err %v), want at Validate", stage, err)
		}
		var ps cases.Problems
		if !errors.As(err, &ps) {
			t.Fatalf("error is %T, want cases.Problems", err)
		}
		keys := []string{"fluid.viscosity", "sphere[2].z", "grid.tau"}
		if len(ps) != len(keys) {
			t.Errorf("%d problems, want %d:\n%v", len(ps), len(keys), err)
		}
		lines := strings.Split(err.Error(), "\n")
		for _, k := range keys {
			p, ok := badCaseProblem(ps, k)
			if !ok {
				t.Errorf("no problem on %s in\n%v", k, err)
				continue
			}
			if p.Fix == "" {
				t.Errorf("%s: no fix", k)
			}
			found := false
			for _, l := range lines {
				found = found || strings.HasPrefix(l, k+" = ") && strings.Contains(l, "; fix: ")
			}
			if !found {
				t.Errorf("no line for %s with a fix in\n%v", k, err)
			}
		}
	})
	t.Run("keys", func(t *testing.T) {
		src := badCaseEdit(t,
			"viscosity = 0.01", "viscocity = 0.01",
			"stiffness = 0.05", "stifness = 0.05",
			"periods = 4", "periods = 4\ntitel = \"three typos\"",
		)
		err, stage := badCaseRun(src)
		if stage != stageParse {
			t.Fatalf("refused at %q (err %v), want at Parse", stage, err)
		}
		var ke cases.KeyErrors
		if !errors.As(err, &ke) {
			t.Fatalf("error is %T, want cases.KeyErrors", err)
		}
		want := []struct{ key, hint string }{
			{"fluid.viscocity", "viscosity"},
			{"spring[1].stifness", "stiffness"},
			{"run.titel", "title"},
		}
		if len(ke) != len(want) {
			t.Errorf("%d key errors, want %d:\n%v", len(ke), len(want), err)
		}
		for i, w := range want {
			if i >= len(ke) {
				break
			}
			e := ke[i]
			if e.Key != w.key || !e.Close || e.Hint != w.hint || e.Missing {
				t.Errorf("key error %d = %+v, want unknown %s, did you mean %q", i, *e, w.key, w.hint)
			}
			if line := fmt.Sprintf("did you mean %q?", w.hint); !strings.Contains(e.Error(), line) {
				t.Errorf("key error %d: %q lacks %q", i, e.Error(), line)
			}
		}
	})
}

// badCaseRun parses, validates and resolves src, and returns the first
// error and the stage that gave it; stage is "" if the case resolves.
func badCaseRun(src string) (error, string) {
	c, err := cases.Parse("bad.toml", []byte(src))
	if err != nil {
		return err, stageParse
	}
	if err := c.Validate(); err != nil {
		return err, stageValidate
	}
	if _, err := cases.Resolve(c); err != nil {
		return err, stageResolve
	}
	return nil, ""
}

func badCaseProblem(ps cases.Problems, key string) (cases.Problem, bool) {
	for _, p := range ps {
		if p.Key == key {
			return p, true
		}
	}
	return cases.Problem{}, false
}
