package cases

import (
	"errors"
	"strings"
	"testing"
)

func TestValidateExamples(t *testing.T) {
	for _, name := range List() {
		src, err := Get(name)
		if err != nil {
			t.Fatal(err)
		}
		c := mustParse(t, name, string(src))
		if err := c.Validate(); err != nil {
			t.Errorf("%s: Validate:\n%v", name, err)
		}
		l, err := Resolve(c)
		if err != nil {
			t.Errorf("%s: Resolve: %v", name, err)
			continue
		}
		if len(l.Warnings) > 0 {
			t.Errorf("%s: warnings %q", name, l.Warnings)
		}
	}
}

// TestDemoCost keeps the demo cheap: at most about 3e9 cell updates, a
// few minutes on 2 cores.
func TestDemoCost(t *testing.T) {
	src, err := Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	c := mustParse(t, "demo", string(src))
	l := mustResolve(t, c)
	t.Logf("demo: %d x %d cells, %d steps per period, %d steps, %.3g cell updates",
		l.Nz, l.Nr, l.StepsPerPeriod, l.Steps, l.CellUpdates())
	if l.CellUpdates() > 3e9 {
		t.Errorf("demo needs %.3g cell updates, want at most 3e9", l.CellUpdates())
	}
	// The pair is neutrally buoyant overall.
	var m, v float64
	for _, s := range c.Spheres {
		vol := s.Radius * s.Radius * s.Radius
		m += s.Density * vol
		v += vol
	}
	if !within(m/v, c.Fluid.Density, 1e-12) {
		t.Errorf("mean density of the pair %g, want the fluid's %g", m/v, c.Fluid.Density)
	}
	if d := c.Springs[0].RestLength; !within(d, 0.0036, 1e-12) {
		t.Errorf("rest length %g, want 3.6 mm", d)
	}
}

func TestValidateAllProblems(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	c.Fluid.Viscosity = 0
	c.Container.Ends = "open"
	c.Shaking.Amplitude = -1e-3
	c.Spheres = append(c.Spheres,
		Sphere{Radius: -0.001, Density: 1000, Z: 0.01},
		Sphere{Radius: 0.002, Density: 1000, Z: 0.0025},  // overlaps sphere 1
		Sphere{Radius: 0.016, Density: 1000, Z: -0.01},   // wider than the container
		Sphere{Radius: 0.001, Density: 1000, Z: 0.02995}, // into the end wall
	)
	c.Springs = []Spring{
		{Spheres: [2]int{1, 7}, Stiffness: 1, RestLength: 0.01},
		{Spheres: [2]int{2, 2}, Stiffness: -1, RestLength: 0.01, Damping: -1},
	}
	c.Grid.CellsPerRadius = 4
	c.Grid.Tau = 0.5
	c.Solver.Collision = "lbgk"
	c.Solver.Magic = 0
	c.Run.Duration = 1

	err := c.Validate()
	var ps Problems
	if !errors.As(err, &ps) {
		t.Fatalf("Validate = %v, want Problems", err)
	}
	got := make(map[string]bool)
	for _, p := range ps {
		got[p.Key] = true
	}
	for _, key := range []string{
		"fluid.viscosity", "container.ends", "shaking.amplitude",
		"sphere[2].radius", "sphere[3].z", "sphere[4].radius", "sphere[5].z",
		"spring[1].spheres", "spring[2].spheres", "spring[2].stiffness", "spring[2].damping",
		"grid.cells_per_radius", "grid.tau", "solver.collision", "solver.magic", "run.duration",
	} {
		if !got[key] {
			t.Errorf("no problem reported for %s", key)
		}
	}
	want := "sphere[2].radius = -0.001: must be positive; fix: give the radius in metres, e.g. 0.0015"
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != len(ps) {
		t.Errorf("%d lines for %d problems", len(lines), len(ps))
	}
	found := false
	for _, l := range lines {
		found = found || l == want
	}
	if !found {
		t.Errorf("no line\n%s\nin\n%s", want, err)
	}
}

func TestValidateRunRules(t *testing.T) {
	shaken := func() *Case { return mustParse(t, "worked", workedExample) }
	still := func() *Case {
		c := mustParse(t, "pipe", pipeSource(t))
		return c
	}
	for _, tc := range []struct {
		name string
		c    *Case
		edit func(*Case)
		key  string // "" for valid
	}{
		{"shaken ok", shaken(), func(c *Case) {}, ""},
		{"no periods", shaken(), func(c *Case) { c.Run.Periods = 0 }, "run.periods"},
		{"duration with periods", shaken(), func(c *Case) { c.Run.Duration = 1 }, "run.duration"},
		{"sample interval when shaken", shaken(), func(c *Case) { c.Run.SampleInterval = 0.1 }, "run.sample_interval"},
		{"ramp longer than run", shaken(), func(c *Case) { c.Shaking.RampPeriods = 5 }, "shaking.ramp_periods"},
		{"amplitude without frequency", still(), func(c *Case) { c.Shaking.Amplitude = 1e-3 }, "shaking.amplitude"},
		{"still ok", still(), func(c *Case) {}, ""},
		{"no duration", still(), func(c *Case) { c.Run.Duration = 0 }, "run.duration"},
		{"periods without shaking", still(), func(c *Case) { c.Run.Periods = 10 }, "run.periods"},
		{"samples per period without shaking", still(), func(c *Case) { c.Run.SamplesPerPeriod = 10 }, "run.samples_per_period"},
		{"interval too long", still(), func(c *Case) { c.Run.SampleInterval = 1 }, "run.sample_interval"},
		{"cell size with spheres", shaken(), func(c *Case) { c.Grid.CellSize = 1e-4 }, "grid.cell_size"},
		{"cells per radius without spheres", still(), func(c *Case) { c.Grid.CellsPerRadius = 12 }, "grid.cell_size"},
		{"no cell size", still(), func(c *Case) { c.Grid.CellSize = 0 }, "grid.cell_size"},
		{"periodic overlap", shaken(), func(c *Case) {
			c.Container.Ends = EndsPeriodic
			c.Spheres = append(c.Spheres, Sphere{Radius: 0.0015, Density: 1000, Z: 0.0295})
			c.Spheres[0].Z = -0.0295 // 1 mm apart through the periodic boundary
		}, "sphere[2].z"},
		{"periodic through the end", shaken(), func(c *Case) {
			c.Container.Ends = EndsPeriodic
			c.Spheres[0].Z = 0.0295 // fine: the ends are periodic
		}, ""},
		{"too much memory", shaken(), func(c *Case) {
			c.Container.Radius, c.Container.Length = 10, 10 // 1.6e5 x 1.6e5 cells
		}, "grid.cells_per_radius"},
	} {
		tc.edit(tc.c)
		err := tc.c.Validate()
		if tc.key == "" {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			}
			continue
		}
		var ps Problems
		if !errors.As(err, &ps) {
			t.Errorf("%s: Validate = %v, want a problem with %s", tc.name, err, tc.key)
			continue
		}
		found := false
		for _, p := range ps {
			found = found || p.Key == tc.key
		}
		if !found {
			t.Errorf("%s: no problem with %s in\n%v", tc.name, tc.key, err)
		}
	}
}

func TestResolveRejectsInvalid(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	c.Fluid.Density = -1
	_, err := Resolve(c)
	var ps Problems
	if !errors.As(err, &ps) || ps[0].Key != "fluid.density" {
		t.Errorf("Resolve = %v, want the fluid.density problem", err)
	}
}

func TestMemoryLimit(t *testing.T) {
	limit, source := MemoryLimit()
	if limit <= 0 || source == "" {
		t.Errorf("MemoryLimit() = %d, %q", limit, source)
	}
	l := mustResolve(t, mustParse(t, "worked", workedExample))
	if got, want := l.MemoryBytes(), int64(224*962*242); got != want {
		t.Errorf("MemoryBytes = %d, want %d", got, want)
	}
}
