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
// existing, distinct spheres with non-negative stiffness and damping; arms
// joining two existing, distinct spheres that no spring joins, forming no
// loop, with a closest approach at least MinGapCells cells clear and a
// positive frequency; harmonics of order >= 2 of a shaken container; the
// [bodies] keys; the grid keys (cells_per_radius >= 5 with spheres,
// cell_size without); tau > 1/2 when given; the periods/duration and
// sampling rules; the shaking parameters; and that the grid fits in memory.
//
// An arm frequency of zero stands for its default, shaking.frequency, as
// [Case.FillDefaults] fills it in.
func (c *Case) Validate() error {
	var v validator
	c.validateFluid(&v)
	c.validateContainer(&v)
	c.validateShaking(&v)
	c.validateSpheres(&v)
	c.validateSprings(&v)
	c.validateArms(&v)
	c.validateBodies(&v)
	c.validateGrid(&v)
	c.validateSolver(&v)
	c.validateRun(&v)
	c.validateOutput(&v)
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

// finite requires a finite number.
func (v *validator) finite(key string, x float64, fix string) bool {
	if !math.IsNaN(x) && !math.IsInf(x, 0) {
		return true
	}
	v.add(key, x, "must be a finite number", fix)
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
		c.PeriodFrequency() > 0 && c.Run.Periods > 0 && s.RampPeriods > float64(c.Run.Periods) {
		v.add("shaking.ramp_periods", s.RampPeriods,
			fmt.Sprintf("the ramp is longer than the run (run.periods = %d)", c.Run.Periods),
			"shorten the ramp or run more periods")
	}
	v.nonNegative("shaking.gravity", s.Gravity, "give the magnitude in m/s^2 (gravity acts along -z), e.g. 9.81, or 0")

	first := make(map[int]int) // order -> first entry (1-based)
	for i, h := range s.Harmonics {
		key := fmt.Sprintf("shaking.harmonic[%d]", i+1)
		if s.Frequency == 0 {
			v.add(key, nil, "a harmonic needs shaking.frequency > 0 (its frequency is order x shaking.frequency)",
				"give shaking.frequency in Hz, or remove the [[shaking.harmonic]] entry")
		}
		switch {
		case h.Order < 2:
			v.add(key+".order", h.Order, "must be at least 2 (order 1 is the fundamental, shaking.amplitude)",
				"give the multiple of the drive frequency, e.g. 2 or 3")
		case first[h.Order] > 0:
			v.add(key+".order", h.Order,
				fmt.Sprintf("order %d is already given by shaking.harmonic[%d]", h.Order, first[h.Order]),
				"give each order once: merge the two entries into one amplitude and phase")
		default:
			first[h.Order] = i + 1
		}
		v.nonNegative(key+".amplitude", h.Amplitude, "give the displacement amplitude of this harmonic in metres, e.g. 0.0001")
		v.finite(key+".phase", h.Phase, "give the phase in degrees, or leave it out for 0")
	}
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
				fmt.Sprintf("keep |z| below %.6g, or use a longer container", L/2-s.Radius))
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

// pair checks that key (spring[i].spheres or arm[i].spheres) names two
// existing, distinct spheres; what is "a spring" or "an arm".
func (c *Case) pair(v *validator, key, what string, p [2]int) bool {
	n := len(c.Spheres)
	for _, k := range p {
		if k < 1 || k > n {
			v.add(key, p,
				fmt.Sprintf("sphere %d does not exist (there are %d spheres, numbered from 1)", k, n),
				"name two spheres by their 1-based position in the file")
			return false
		}
	}
	if p[0] == p[1] {
		v.add(key, p, what+" must join two different spheres", "name two different spheres, e.g. [1, 2]")
		return false
	}
	return true
}

func samePair(a, b [2]int) bool {
	return a == b || a[0] == b[1] && a[1] == b[0]
}

func (c *Case) validateSprings(v *validator) {
	for i, s := range c.Springs {
		key := fmt.Sprintf("spring[%d]", i+1)
		c.pair(v, key+".spheres", "a spring", s.Spheres)
		v.nonNegative(key+".stiffness", s.Stiffness, "give the stiffness in N/m, e.g. 0.05")
		v.nonNegative(key+".damping", s.Damping, "give the damping coefficient in N s/m, or 0")
		// A rest length left out defaults to the initial distance; when the
		// spring names a missing sphere there is none, and the pair error
		// above says so already.
		_, _, pairOK := c.springSpheres(s)
		if pairOK && (!(s.RestLength > 0) || math.IsInf(s.RestLength, 1)) {
			v.add(key+".rest_length", s.RestLength, "must be positive",
				"give the centre-to-centre rest length in metres, or leave it out to use the initial distance")
		}
	}
}

// gapCell returns the cell size used to measure the clearance of an arm:
// the grid's, when the grid can be computed, and otherwise a tenth of the
// smaller radius a (the coarsest resolution Validate accepts is 5 cells per
// radius, the recommended one 12; METHODS.md 10.1). how says which.
func (c *Case) gapCell(a float64) (dx float64, how string) {
	if g, ok := c.grid(); ok && g.dx > 0 {
		return g.dx, "the grid's cell size"
	}
	return a / 10, "a tenth of the smaller radius, as the grid is not defined"
}

func (c *Case) validateArms(v *validator) {
	// Arms joining spheres into groups, to find loops. Spheres are 1-based
	// here and a bad index is reported by pair, so the sets run over 0..n.
	groups := NewUnionFind(len(c.Spheres) + 1)
	for i, a := range c.Arms {
		key := fmt.Sprintf("arm[%d]", i+1)
		okPair := c.pair(v, key+".spheres", "an arm", a.Spheres)
		okLen := v.positive(key+".length", a.Length, "give the mean centre-to-centre distance in metres, e.g. 0.004")
		okAmp := v.nonNegative(key+".amplitude", a.Amplitude, "give the stroke amplitude in metres, e.g. 0.0005, or 0")
		v.finite(key+".phase", a.Phase, "give the phase in degrees, or leave it out for 0")
		switch f := a.Frequency; {
		case f == 0 && c.Shaking.Frequency == 0:
			v.add(key+".frequency", nil, "required when there is no shaking (it defaults to shaking.frequency)",
				"give the stroke frequency in Hz, e.g. 10")
		case f == 0:
			// the default, shaking.frequency, is positive
		case !(f > 0) || math.IsInf(f, 1):
			v.add(key+".frequency", f, "must be positive",
				"give the stroke frequency in Hz, or leave it out to use shaking.frequency")
		}
		if !okPair {
			continue
		}
		si, sj := c.Spheres[a.Spheres[0]-1], c.Spheres[a.Spheres[1]-1]
		if okLen && okAmp && si.Radius > 0 && sj.Radius > 0 {
			dx, how := c.gapCell(math.Min(si.Radius, sj.Radius))
			touch := si.Radius + sj.Radius
			need := touch + MinGapCells*dx // the shortest distance allowed
			if short := a.Length - a.Amplitude; short < need {
				fix := fmt.Sprintf("raise %s.length to at least %s m", key, roundUp(need+a.Amplitude))
				if a.Amplitude > 0 && a.Length > need {
					fix += fmt.Sprintf(", or lower %s.amplitude to at most %s m", key, roundDown(a.Length-need))
				}
				v.add(key+".length", a.Length,
					fmt.Sprintf("at its shortest (length - amplitude = %s m) the arm leaves a gap of %s m between spheres %d and %d, less than %g cells (%s, %s m)",
						formatValue(short), fmt.Sprintf("%.4g", short-touch), a.Spheres[0], a.Spheres[1],
						MinGapCells, how, fmt.Sprintf("%.4g", dx)),
					fix)
			}
		}
		for k, s := range c.Springs {
			if samePair(s.Spheres, a.Spheres) {
				v.add(key+".spheres", a.Spheres,
					fmt.Sprintf("spheres %d and %d are also joined by spring[%d]: a pair may have an arm or a spring, not both",
						a.Spheres[0], a.Spheres[1], k+1),
					fmt.Sprintf("remove spring[%d] or %s", k+1, key))
			}
		}
		if !groups.Union(a.Spheres[0], a.Spheres[1]) {
			v.add(key+".spheres", a.Spheres,
				fmt.Sprintf("the arms form a loop: spheres %d and %d are already joined through other arms, and the distances around a loop cannot all be prescribed",
					a.Spheres[0], a.Spheres[1]),
				"remove one arm of the loop (a chain or a tree of arms is fine)")
		}
	}
}

// roundUp and roundDown write x > 0 to four significant figures, rounded
// away from the limit they state.
func roundUp(x float64) string   { return round4(x, math.Ceil) }
func roundDown(x float64) string { return round4(x, math.Floor) }

func round4(x float64, f func(float64) float64) string {
	if !(x > 0) || math.IsInf(x, 1) {
		return formatValue(x)
	}
	p := math.Pow(10, math.Floor(math.Log10(x))-3)
	return strconv.FormatFloat(f(x/p)*p, 'g', 4, 64)
}

func (c *Case) validateBodies(v *validator) {
	b := c.Bodies
	v.nonNegative("bodies.virtual_mass", b.VirtualMass,
		"give the virtual-mass coefficient C_V, e.g. 0.5 (METHODS.md 8.2), or 0")
	switch b.Coupling {
	case CouplingVirtualMass, CouplingExplicit:
	default:
		v.add("bodies.coupling", b.Coupling, "unknown coupling",
			fmt.Sprintf("use %q (recommended) or %q", CouplingVirtualMass, CouplingExplicit))
	}
	if !(b.RepulsionRange >= 0.5) || math.IsInf(b.RepulsionRange, 1) {
		v.add("bodies.repulsion_range", b.RepulsionRange, "must be at least 0.5 cells",
			fmt.Sprintf("give the range of the short-range repulsion in cells, e.g. %g", DefaultRepulsionRange))
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

	before := len(v.ps)
	c.validateLevels(v)

	grid, ok := c.grid()
	if !ok {
		return
	}
	key, value := "grid.cell_size", any(g.CellSize)
	if spheres {
		key, value = "grid.cells_per_radius", any(g.CellsPerRadius)
	}
	if grid.levels > 1 {
		c.validateLevelGrid(v, grid, key, value, len(v.ps) == before)
		return
	}
	if grid.nr < 3 || grid.nz < 1 {
		v.add(key, value, fmt.Sprintf("the grid has only %g x %g cells (z x r)", grid.nz, grid.nr),
			"use smaller cells: at least 3 across the container radius")
		return
	}
	need := memoryBytes(grid.nz, grid.nr, c.Solver.Precision == PrecisionSingle)
	limit, source := MemoryLimit()
	if need > float64(limit) {
		v.add(key, value,
			fmt.Sprintf("the %.0f x %.0f grid needs about %s, more than the limit of %s (%s)",
				grid.nz, grid.nr, formatBytes(need), formatBytes(float64(limit)), source),
			"use fewer cells (coarser grid) or a smaller container")
	}
}

// validateLevelGrid checks the grid of a refined lattice: level 0 large
// enough, and the levels' memory (laid out only when the case has no
// problem so far, clean, since the layout needs valid spheres, arms and
// margins). key and value are the resolution's key.
func (c *Case) validateLevelGrid(v *validator, grid gridSpec, key string, value any, clean bool) {
	if grid.nr0 < 3 || grid.nz0 < 1 {
		v.add("grid.levels", grid.levels,
			fmt.Sprintf("level 0 has only %g x %g cells (z x r) of %.4g m, 2^%d times the finest", grid.nz0, grid.nr0, grid.dx*refinement(grid.levels), grid.levels-1),
			fmt.Sprintf("use fewer levels, or raise %s: level 0 needs at least 3 cells across the container radius", key))
		return
	}
	single := c.Solver.Precision == PrecisionSingle
	limit, source := MemoryLimit()
	need := memoryBytes(grid.nz0, grid.nr0, single)
	if need <= float64(limit) && clean {
		l := &Lattice{Dx: grid.dx, Nz: int(grid.nz), Nr: int(grid.nr), Levels: grid.levels}
		l.Length, l.Radius = float64(l.Nz)*l.Dx, float64(l.Nr)*l.Dx
		_, levels, _, _ := c.layoutGeometry(l)
		need = layoutMemory(levels, single)
	}
	if need > float64(limit) {
		v.add(key, value,
			fmt.Sprintf("the %d levels need about %s, more than the limit of %s (%s)",
				grid.levels, formatBytes(need), formatBytes(float64(limit)), source),
			"use fewer cells (coarser grid), more levels, smaller margins (grid.fine_margin, grid.level_margin) or a smaller container")
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
	switch c.Solver.Precision {
	case PrecisionDouble, PrecisionSingle:
	default:
		v.add("solver.precision", c.Solver.Precision, "unknown storage precision",
			fmt.Sprintf("use %q (default) or %q (half the memory, for large grids)", PrecisionDouble, PrecisionSingle))
	}
}

func (c *Case) validateRun(v *validator) {
	r := c.Run
	if c.PeriodFrequency() > 0 {
		why := "required when shaking.frequency > 0"
		if c.Shaking.Frequency == 0 {
			why = fmt.Sprintf("required when an arm strokes (the run counts periods of the slowest stroke, %g Hz)",
				c.PeriodFrequency())
		}
		switch {
		case r.Periods == 0:
			v.add("run.periods", nil, why,
				"give the number of drive periods to run, e.g. 20")
		case r.Periods < 0:
			v.add("run.periods", r.Periods, "must be positive", "give the number of drive periods to run, e.g. 20")
		}
		if r.Duration != 0 {
			reason := "not allowed when the container is shaken or an arm strokes: the run length is given in periods"
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
		v.add("run.duration", nil, "required when nothing is periodic (shaking.frequency = 0 and no arm)",
			"give the simulated time in seconds")
	case !(r.Duration > 0) || math.IsInf(r.Duration, 1):
		v.add("run.duration", r.Duration, "must be positive", "give the simulated time in seconds")
	}
	if r.Periods != 0 {
		reason := "needs shaking.frequency > 0 or an arm"
		if r.Duration != 0 {
			reason = "not allowed together with run.duration"
		}
		v.add("run.periods", r.Periods, reason, "without shaking give run.duration in seconds instead")
	}
	if r.SamplesPerPeriod != 0 {
		v.add("run.samples_per_period", r.SamplesPerPeriod, "needs shaking.frequency > 0 or an arm",
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

func (c *Case) validateOutput(v *validator) {
	o := c.Output
	if o.SnapshotsPerPeriod < 0 {
		v.add("output.snapshots_per_period", o.SnapshotsPerPeriod, "must not be negative", "give 0 for none, or e.g. 8")
	}
	if o.SnapshotPeriods < 0 {
		v.add("output.snapshot_periods", o.SnapshotPeriods, "must not be negative", "give the number of final periods, e.g. 1")
	}
	if o.AveragePeriods < 0 {
		v.add("output.average_periods", o.AveragePeriods, "must not be negative", "give 0 for the swimming-speed window, or a number of periods")
	}
	if p := c.Run.Periods; p > 0 && o.AveragePeriods > p {
		v.add("output.average_periods", o.AveragePeriods, fmt.Sprintf("exceeds run.periods = %d", p), "give at most run.periods, or 0")
	}
	if v.nonNegative("output.image_spacing", o.ImageSpacing, "give the image's node spacing in m, or leave it out to have it chosen") &&
		o.ImageSpacing > c.Container.Radius && c.Container.Radius > 0 {
		v.add("output.image_spacing", o.ImageSpacing, fmt.Sprintf("exceeds container.radius = %s", formatValue(c.Container.Radius)),
			"give a spacing of a few finest cells, or leave it out")
	}
}
