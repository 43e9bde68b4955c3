package cases

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// A Problem is one invalid value of a case.
type Problem struct {
	Key    string // e.g. "sphere[2].radius" (arrays 1-based)
	Value  string // the offending value as written in TOML; "" if absent
	Reason string // what is wrong
	Fix    string // how to put it right; may be empty
}

// Error formats p on one line:
//
//	sphere[2].radius = -0.001: must be positive; fix: give the radius in metres, e.g. 0.0015
func (p Problem) Error() string {
	var b strings.Builder
	b.WriteString(p.Key)
	if p.Value != "" {
		b.WriteString(" = ")
		b.WriteString(p.Value)
	}
	b.WriteString(": ")
	b.WriteString(p.Reason)
	if p.Fix != "" {
		b.WriteString("; fix: ")
		b.WriteString(p.Fix)
	}
	return b.String()
}

// Problems is every problem found in a case, in schema order. Its Error
// method gives one line per problem.
type Problems []Problem

func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}

// Validate checks every value of c and returns all the problems at once,
// as [Problems], or nil if there are none. It checks values only; Parse
// has already checked the keys. The checks are: positive sizes, densities
// and viscosity; known ends and collision names; spheres inside the
// container, clear of its walls and of each other; springs joining two
// existing, distinct spheres with non-negative stiffness and damping; the
// grid keys (cells_per_radius >= 5 with spheres, cell_size without);
// tau > 1/2 when given; the periods/duration and sampling rules; the
// shaking parameters; and that the grid fits in memory.
func (c *Case) Validate() error {
	var v validator
	c.validateFluid(&v)
	c.validateContainer(&v)
	c.validateShaking(&v)
	c.validateSpheres(&v)
	c.validateSprings(&v)
	c.validateGrid(&v)
	c.validateSolver(&v)
	c.validateRun(&v)
	if len(v.ps) == 0 {
		return nil
	}
	return v.ps
}

type validator struct{ ps Problems }

func (v *validator) add(key string, value any, reason, fix string) {
	v.ps = append(v.ps, Problem{Key: key, Value: formatValue(value), Reason: reason, Fix: fix})
}

// positive requires 0 < x < ∞.
func (v *validator) positive(key string, x float64, fix string) bool {
	if x > 0 && !math.IsInf(x, 1) {
		return true
	}
	reason := "must be positive"
	if x == 0 {
		reason = "must be positive (it is required)"
	}
	v.add(key, x, reason, fix)
	return false
}

// nonNegative requires 0 <= x < ∞.
func (v *validator) nonNegative(key string, x float64, fix string) bool {
	if x >= 0 && !math.IsInf(x, 1) {
		return true
	}
	v.add(key, x, "must be zero or positive", fix)
	return false
}

// formatValue writes a value as it would appear in a case file; nil gives "".
func formatValue(x any) string {
	switch x := x.(type) {
	case nil:
		return ""
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	case string:
		return strconv.Quote(x)
	case [2]int:
		return fmt.Sprintf("[%d, %d]", x[0], x[1])
	default:
		return fmt.Sprint(x)
	}
}

func (c *Case) validateFluid(v *validator) {
	v.positive("fluid.density", c.Fluid.Density, "give the liquid density in kg/m^3, e.g. 1000 for water")
	v.positive("fluid.viscosity", c.Fluid.Viscosity, "give the dynamic viscosity in Pa s, e.g. 0.001 for water")
}

func (c *Case) validateContainer(v *validator) {
	v.positive("container.radius", c.Container.Radius, "give the inner radius in metres, e.g. 0.006")
	v.positive("container.length", c.Container.Length, "give the inner length in metres, e.g. 0.024")
	switch c.Container.Ends {
	case EndsClosed, EndsPeriodic:
	default:
		v.add("container.ends", c.Container.Ends, "unknown end condition",
			fmt.Sprintf("use %q or %q", EndsClosed, EndsPeriodic))
	}
}

func (c *Case) validateShaking(v *validator) {
	s := c.Shaking
	v.nonNegative("shaking.frequency", s.Frequency, "give the frequency in Hz, or 0 for no shaking")
	v.nonNegative("shaking.amplitude", s.Amplitude, "give the displacement amplitude in metres, e.g. 0.0005")
	if s.Amplitude > 0 && s.Frequency == 0 {
		v.add("shaking.amplitude", s.Amplitude, "needs shaking.frequency > 0",
			"give shaking.frequency in Hz, or set the amplitude to 0")
	}
	if v.nonNegative("shaking.ramp_periods", s.RampPeriods, "give a number of periods, e.g. 2, or 0 for no ramp") &&
		s.Frequency > 0 && c.Run.Periods > 0 && s.RampPeriods > float64(c.Run.Periods) {
		v.add("shaking.ramp_periods", s.RampPeriods,
			fmt.Sprintf("the ramp is longer than the run (run.periods = %d)", c.Run.Periods),
			"shorten the ramp or run more periods")
	}
	v.nonNegative("shaking.gravity", s.Gravity, "give the magnitude in m/s^2 (gravity acts along -z), e.g. 9.81, or 0")
}

func (c *Case) validateSpheres(v *validator) {
	R, L := c.Container.Radius, c.Container.Length
	periodic := c.Container.Ends == EndsPeriodic
	for i, s := range c.Spheres {
		key := fmt.Sprintf("sphere[%d]", i+1)
		okR := v.positive(key+".radius", s.Radius, "give the radius in metres, e.g. 0.0015")
		v.positive(key+".density", s.Density, "give the density in kg/m^3, e.g. 1450")
		okZ := !math.IsNaN(s.Z) && !math.IsInf(s.Z, 0)
		if !okZ {
			v.add(key+".z", s.Z, "must be a finite number", "give the initial centre position in metres")
		}
		if !okR || !okZ {
			continue
		}
		if R > 0 && s.Radius >= R {
			v.add(key+".radius", s.Radius,
				fmt.Sprintf("the sphere touches or crosses the container wall (container.radius = %s)", formatValue(R)),
				"use a smaller sphere or a wider container")
		}
		if L <= 0 {
			continue
		}
		switch {
		case !periodic && math.Abs(s.Z)+s.Radius >= L/2:
			v.add(key+".z", s.Z,
				fmt.Sprintf("the sphere touches or crosses an end wall (|z| + radius must be < length/2 = %s)", formatValue(L/2)),
				fmt.Sprintf("keep |z| below %s, or use a longer container", formatValue(L/2-s.Radius)))
		case periodic && 2*s.Radius >= L:
			v.add(key+".radius", s.Radius,
				fmt.Sprintf("the sphere overlaps its periodic image (diameter >= container.length = %s)", formatValue(L)),
				"use a longer container")
		case periodic && math.Abs(s.Z) > L/2:
			v.add(key+".z", s.Z, fmt.Sprintf("outside the container, -%[1]s to %[1]s", formatValue(L/2)),
				"give z within ±length/2")
		}
	}
	for j := range c.Spheres {
		for i := range j {
			a, b := c.Spheres[i], c.Spheres[j]
			if !(a.Radius > 0 && b.Radius > 0) {
				continue
			}
			d := math.Abs(b.Z - a.Z)
			if periodic && L > 0 {
				d = math.Min(d, math.Abs(L-d))
			}
			if d <= a.Radius+b.Radius {
				v.add(fmt.Sprintf("sphere[%d].z", j+1), b.Z,
					fmt.Sprintf("the sphere overlaps sphere[%d] (centre distance %s <= sum of radii %s)",
						i+1, formatValue(d), formatValue(a.Radius+b.Radius)),
					"move the centres further apart than the sum of the radii")
			}
		}
	}
}

func (c *Case) validateSprings(v *validator) {
	n := len(c.Spheres)
	for i, s := range c.Springs {
		key := fmt.Sprintf("spring[%d]", i+1)
		ok := true
		for _, k := range s.Spheres {
			if k < 1 || k > n {
				ok = false
				v.add(key+".spheres", s.Spheres,
					fmt.Sprintf("sphere %d does not exist (there are %d spheres, numbered from 1)", k, n),
					"name two spheres by their 1-based position in the file")
				break
			}
		}
		if ok && s.Spheres[0] == s.Spheres[1] {
			v.add(key+".spheres", s.Spheres, "a spring must join two different spheres",
				"name two different spheres, e.g. [1, 2]")
		}
		v.nonNegative(key+".stiffness", s.Stiffness, "give the stiffness in N/m, e.g. 0.05")
		v.nonNegative(key+".damping", s.Damping, "give the damping coefficient in N s/m, or 0")
		if !(s.RestLength > 0) || math.IsInf(s.RestLength, 1) {
			v.add(key+".rest_length", s.RestLength, "must be positive",
				"give the centre-to-centre rest length in metres, or leave it out to use the initial distance")
		}
	}
}

func (c *Case) validateGrid(v *validator) {
	g := c.Grid
	spheres := len(c.Spheres) > 0
	switch {
	case g.CellSize != 0 && g.CellsPerRadius != 0:
		v.add("grid.cell_size", g.CellSize,
			fmt.Sprintf("given together with grid.cells_per_radius = %d", g.CellsPerRadius),
			"give grid.cells_per_radius when there are spheres, grid.cell_size when there are none")
	case spheres && g.CellSize != 0:
		v.add("grid.cell_size", g.CellSize, "not allowed when there are spheres",
			"give grid.cells_per_radius (cells across the smallest sphere radius) instead")
	case !spheres && g.CellsPerRadius != 0:
		v.add("grid.cells_per_radius", g.CellsPerRadius, "there is no sphere to measure it by",
			"give grid.cell_size in metres instead")
	case spheres && g.CellsPerRadius < 5:
		v.add("grid.cells_per_radius", g.CellsPerRadius,
			"must be at least 5 (METHODS.md 10.1: hard stop below 5, aim for 12)",
			"use 12 or more cells per radius")
	case !spheres:
		v.positive("grid.cell_size", g.CellSize,
			"give the cell size in metres (required when there is no sphere), e.g. radius/20")
	}
	if g.Tau != 0 && !(g.Tau > 0.5) {
		v.add("grid.tau", g.Tau, "must be greater than 0.5 (the viscosity is 3(tau - 1/2) in lattice units)",
			"give tau between 0.51 and 1, or leave it out to let the time step be chosen")
	}

	grid, ok := c.grid()
	if !ok {
		return
	}
	key, value := "grid.cell_size", any(g.CellSize)
	if spheres {
		key, value = "grid.cells_per_radius", any(g.CellsPerRadius)
	}
	if grid.nr < 3 || grid.nz < 1 {
		v.add(key, value, fmt.Sprintf("the grid has only %g x %g cells (z x r)", grid.nz, grid.nr),
			"use smaller cells: at least 3 across the container radius")
		return
	}
	need := memoryBytes(grid.nz, grid.nr)
	limit, source := MemoryLimit()
	if need > float64(limit) {
		v.add(key, value,
			fmt.Sprintf("the %.0f x %.0f grid needs about %s, more than the limit of %s (%s)",
				grid.nz, grid.nr, formatBytes(need), formatBytes(float64(limit)), source),
			"use fewer cells (coarser grid) or a smaller container")
	}
}

func (c *Case) validateSolver(v *validator) {
	switch c.Solver.Collision {
	case CollisionTRT, CollisionMRT, CollisionBGK:
	default:
		v.add("solver.collision", c.Solver.Collision, "unknown collision operator",
			fmt.Sprintf("use %q (recommended), %q or %q", CollisionTRT, CollisionMRT, CollisionBGK))
	}
	v.positive("solver.magic", c.Solver.Magic, "use 0.1875 (3/16) or 0.25")
}

func (c *Case) validateRun(v *validator) {
	r := c.Run
	if c.Shaking.Frequency > 0 {
		switch {
		case r.Periods == 0:
			v.add("run.periods", nil, "required when shaking.frequency > 0",
				"give the number of drive periods to run, e.g. 20")
		case r.Periods < 0:
			v.add("run.periods", r.Periods, "must be positive", "give the number of drive periods to run, e.g. 20")
		}
		if r.Duration != 0 {
			reason := "not allowed when the container is shaken: the run length is given in periods"
			if r.Periods != 0 {
				reason = "not allowed together with run.periods"
			}
			v.add("run.duration", r.Duration, reason, "remove run.duration and give run.periods")
		}
		if r.SampleInterval != 0 {
			v.add("run.sample_interval", r.SampleInterval, "only for runs given by duration",
				"give run.samples_per_period instead")
		}
		if r.SamplesPerPeriod < 1 {
			v.add("run.samples_per_period", r.SamplesPerPeriod, "must be at least 1", "e.g. 20")
		}
		return
	}
	switch {
	case r.Duration == 0:
		v.add("run.duration", nil, "required when shaking.frequency = 0",
			"give the simulated time in seconds")
	case !(r.Duration > 0) || math.IsInf(r.Duration, 1):
		v.add("run.duration", r.Duration, "must be positive", "give the simulated time in seconds")
	}
	if r.Periods != 0 {
		reason := "needs shaking.frequency > 0"
		if r.Duration != 0 {
			reason = "not allowed together with run.duration"
		}
		v.add("run.periods", r.Periods, reason, "without shaking give run.duration in seconds instead")
	}
	if r.SamplesPerPeriod != 0 {
		v.add("run.samples_per_period", r.SamplesPerPeriod, "needs shaking.frequency > 0",
			"give run.sample_interval in seconds instead")
	}
	if !(r.Duration > 0) {
		return
	}
	switch {
	case !(r.SampleInterval > 0):
		v.add("run.sample_interval", r.SampleInterval, "must be positive",
			"give the sampling interval in seconds, or leave it out for duration/200")
	case r.SampleInterval > r.Duration:
		v.add("run.sample_interval", r.SampleInterval,
			fmt.Sprintf("longer than run.duration = %s", formatValue(r.Duration)),
			"use a shorter interval, or leave it out for duration/200")
	}
}

func formatBytes(b float64) string {
	const gib = 1 << 30
	if b >= gib/10 {
		return fmt.Sprintf("%.1f GiB", b/gib)
	}
	return fmt.Sprintf("%.1f MiB", b/(1<<20))
}
