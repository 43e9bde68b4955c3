// Package cases implements the TOML case schema of axiswim: the types a case
// file decodes into, their defaults, strict decoding with line-numbered
// errors, validation, the mapping from SI inputs to lattice units, the
// dimensionless groups of each sphere and the embedded example cases.
//
// A case is written in SI units throughout. A typical caller does
//
//	c, err := cases.Load("swimmer.toml") // decode strictly, fill defaults
//	if err != nil { ... }
//	lat, err := cases.Resolve(c) // validate, choose dx and dt
//	if err != nil { ... }
//	for _, w := range lat.Warnings { ... }
//
// The keys of a case file are the toml tags of the schema types below
// (Case and the types it holds), with their units and defaults in the
// field comments; keys.go reads the key set from those tags, so that
// decoding, the missing-key and unknown-key checks and WriteTOML share it.
// 'axiswim cases demo' prints a complete example.
//
// The numerical background (stability limits, dimensionless groups and the
// SI-to-lattice mapping) is in METHODS.md sections 10 and 11; the comments
// in this package cite it by section.
package cases

import "math"

// Values of Container.Ends.
const (
	EndsClosed   = "closed"   // rigid end walls at z = ±length/2
	EndsPeriodic = "periodic" // the flow is periodic in z with period length
)

// Values of Solver.Collision.
const (
	CollisionTRT = "trt" // two relaxation times (METHODS.md 2.2)
	CollisionMRT = "mrt" // multiple relaxation times (METHODS.md 2.3)
	CollisionBGK = "bgk" // single relaxation time (METHODS.md 2.1)
)

// Values of Solver.Precision.
const (
	// PrecisionDouble stores the populations in float64 (the default).
	PrecisionDouble = "float64"
	// PrecisionSingle stores the deviations f_i - w_i of the populations in
	// float32 (all arithmetic stays float64): half the memory and memory
	// traffic, for large grids. Validated against float64 (README).
	PrecisionSingle = "float32"
)

// Values of Bodies.Coupling.
const (
	// CouplingVirtualMass is the virtual-mass stabilised update of
	// METHODS.md 8.2, which credits it to Schwarz, Kempe & Fröhlich 2015,
	// J. Comput. Phys. 281, 591 (unconfirmed there); Werner, Rettinger &
	// Rüde (arXiv:2103.10882) develop a virtual-mass correction for
	// lattice-Boltzmann coupling.
	CouplingVirtualMass = "virtual-mass"
	// CouplingExplicit is the plain explicit update, unstable for light
	// spheres (METHODS.md 8.1; on the lattice measured below a density
	// ratio of about 0.2 at 8 cells per radius); it is kept to show that
	// failure.
	CouplingExplicit = "explicit"
)

// AddedMass is the added-mass coefficient C_A of an isolated sphere in
// potential flow (METHODS.md 8.1): the explicit coupling is unstable for
// density ratios below it.
const AddedMass = 0.5

// Default values of the optional keys.
const (
	DefaultEnds             = EndsClosed
	DefaultRampPeriods      = 2.0
	DefaultGravity          = 9.81 // m/s^2
	DefaultCellsPerRadius   = 12
	DefaultCollision        = CollisionTRT
	DefaultPrecision        = PrecisionDouble
	DefaultMagic            = 3.0 / 16 // TRT magic parameter Λ (METHODS.md 2.2)
	DefaultSamplesPerPeriod = 20
	DefaultVirtualMass      = 0.5 // C_V of METHODS.md 8.2
	DefaultCoupling         = CouplingVirtualMass
	DefaultRepulsionRange   = 2.0 // cells (METHODS.md 9.5)
	// DefaultSamplesPerDuration is the number of samples taken over
	// run.duration when run.sample_interval is not given.
	DefaultSamplesPerDuration = 200
)

// A Case is a complete simulation case in SI units. Its fields mirror the
// sections of a case file.
//
// For keys whose zero value is not a valid input (cell_size, tau, periods,
// duration, samples_per_period, sample_interval, rest_length, magic, ...)
// the zero value means "not given". Shaking.Gravity and
// Shaking.RampPeriods and Bodies.VirtualMass may legitimately be zero, so
// their defaults are applied only by [Default] and [Parse].
//
// The struct tags of Case and of the types of its fields are the schema of
// a case file: Parse decodes into these types and checks the keys against
// them, WriteTOML writes them out and a [Sweep] varies them. A struct is a
// table, a slice of structs an array of tables, any other field a value; a
// Go int takes whole numbers only. The tags are
//
//	toml:"key"           the key; with ",omitzero" the zero value means "not
//	                     given", and WriteTOML leaves it out
//	case:"required"      Parse reports the key missing when it is absent
//	note:"text"          the comment after the value in a written case; on an
//	                     array of tables, the comment of each header, %d
//	                     standing for the 1-based index
//	unset:"text"         the comment written in place of an omitted zero value
type Case struct {
	Fluid     Fluid     `toml:"fluid"`
	Container Container `toml:"container"`
	Shaking   Shaking   `toml:"shaking"`
	Spheres   []Sphere  `toml:"sphere" note:"sphere %d"` // [[sphere]], in file order; referred to 1-based
	Springs   []Spring  `toml:"spring"`                  // [[spring]]
	Arms      []Arm     `toml:"arm"`                     // [[arm]]
	Bodies    Bodies    `toml:"bodies"`
	Output    Output    `toml:"output"`
	Grid      Grid      `toml:"grid"`
	Solver    Solver    `toml:"solver"`
	Run       Run       `toml:"run"`
}

// Fluid is the [fluid] section.
type Fluid struct {
	Density   float64 `toml:"density" case:"required" note:"kg/m^3"`          // kg/m^3, required
	Viscosity float64 `toml:"viscosity" case:"required" note:"Pa s, dynamic"` // dynamic viscosity, Pa s, required
}

// Container is the [container] section: a liquid-filled cylinder whose axis
// is the z axis.
type Container struct {
	Radius float64 `toml:"radius" case:"required" note:"m"`                                     // m, required
	Length float64 `toml:"length" case:"required" note:"m; z runs from -length/2 to +length/2"` // m, required; z runs from -Length/2 to +Length/2
	Ends   string  `toml:"ends" note:"\"closed\" or \"periodic\""`                              // EndsClosed (default) or EndsPeriodic
}

// Shaking is the [shaking] section: the container is displaced along z by
//
//	X(t) = s(t) [A sin(ω t) + Σ_n A_n sin(n ω t + φ_n)],  ω = 2π Frequency,
//
// the ramp s(t) rising smoothly from 0 to 1 over RampPeriods periods; the
// sum runs over the optional Harmonics.
type Shaking struct {
	Frequency   float64 `toml:"frequency" note:"Hz; 0 = no shaking"`                               // Hz; 0 means no shaking
	Amplitude   float64 `toml:"amplitude" note:"m, container displacement amplitude"`              // m, displacement amplitude A of the container; default 0
	RampPeriods float64 `toml:"ramp_periods" note:"periods over which the amplitude is ramped up"` // default 2; 0 switches the ramp off
	Gravity     float64 `toml:"gravity" note:"m/s^2 along -z"`                                     // m/s^2 along -z; default 9.81; 0 allowed
	// Harmonics are the [[shaking.harmonic]] entries, in file order.
	Harmonics []Harmonic `toml:"harmonic"`
}

// Harmonic is one [[shaking.harmonic]] entry: an extra term
// A_n sin(n ω t + φ_n) of the container displacement.
type Harmonic struct {
	Order     int     `toml:"order" case:"required" note:"multiple of the drive frequency"` // n, at least 2
	Amplitude float64 `toml:"amplitude" case:"required" note:"m"`                           // A_n, m
	Phase     float64 `toml:"phase" note:"degrees"`                                         // φ_n, degrees; default 0
}

// Sphere is one [[sphere]] entry. Spheres are centred on the axis.
type Sphere struct {
	Radius  float64 `toml:"radius" case:"required" note:"m"`            // m
	Density float64 `toml:"density" case:"required" note:"kg/m^3"`      // kg/m^3
	Z       float64 `toml:"z" case:"required" note:"m, initial centre"` // initial centre, m
}

// Spring is one [[spring]] entry joining two spheres.
type Spring struct {
	Spheres    [2]int  `toml:"spheres" case:"required" note:"1-based sphere indices"` // 1-based sphere indices
	Stiffness  float64 `toml:"stiffness" case:"required" note:"N/m"`                  // N/m
	RestLength float64 `toml:"rest_length" note:"m, centre to centre"`                // m, centre to centre; default the initial centre distance
	Damping    float64 `toml:"damping" note:"N s/m"`                                  // N s/m; default 0
}

// Arm is one [[arm]] entry: a prescribed stroke between two spheres. The
// centre-to-centre distance of the spheres is held at
//
//	d(t) = Length + s(t) Amplitude sin(2π Frequency t + Phase),
//
// with the ramp s(t) of the shaking (over shaking.ramp_periods periods of
// the arm), and the group of spheres joined by arms moves force-free as a
// whole: the arms exert equal and opposite forces only.
type Arm struct {
	Spheres   [2]int  `toml:"spheres" case:"required" note:"1-based sphere indices"`           // 1-based sphere indices
	Length    float64 `toml:"length" case:"required" note:"m, mean centre-to-centre distance"` // mean centre-to-centre distance, m
	Amplitude float64 `toml:"amplitude" case:"required" note:"m, stroke amplitude"`            // stroke amplitude, m
	Phase     float64 `toml:"phase" note:"degrees"`                                            // degrees; default 0
	// Frequency is in Hz; default shaking.frequency.
	Frequency float64 `toml:"frequency,omitzero" note:"Hz" unset:"frequency not given (required without shaking)"`
}

// Bodies is the [bodies] section: how the spheres are coupled to the
// liquid.
type Bodies struct {
	// VirtualMass is the coefficient C_V of the virtual mass
	// m_V = C_V ρ_f Vol added to both sides of the sphere update
	// (METHODS.md 8.2); default 0.5, which keeps an isolated sphere of any
	// density stable; 0 allowed.
	VirtualMass float64 `toml:"virtual_mass" note:"virtual-mass coefficient C_V"`
	// Coupling is CouplingVirtualMass (default) or CouplingExplicit.
	Coupling string `toml:"coupling" note:"\"virtual-mass\" or \"explicit\""`
	// RepulsionRange is the range, in cells, of the short-range repulsion
	// between spheres and between a sphere and an end wall (Glowinski,
	// Pan, Hesla & Joseph 1999, Int. J. Multiphase Flow 25, 755; Glowinski,
	// Pan, Hesla, Joseph & Périaux 2001, J. Comput. Phys. 169, 363; both
	// cited from memory in METHODS.md 9.5); default 2.
	RepulsionRange float64 `toml:"repulsion_range" note:"cells"`
}

// Grid is the [grid] section.
type Grid struct {
	// CellsPerRadius is the number of cells across the radius of the
	// smallest sphere (default 12). It is used only when there are spheres.
	CellsPerRadius int `toml:"cells_per_radius,omitzero" note:"across the smallest sphere"`
	// CellSize is the nominal cell size in metres. It is required, and
	// allowed, only when there is no sphere.
	CellSize float64 `toml:"cell_size,omitzero" note:"m"`
	// Tau is the relaxation time τ⁺ (of the finest level). Zero means not
	// given: Resolve then chooses the time step from the stability limits.
	Tau float64 `toml:"tau,omitzero" note:"relaxation time" unset:"tau not given: the time step is chosen from the stability limits"`
	// Levels is the number of nested levels refined by 2 (issue 17;
	// default 1, one uniform lattice; at most MaxLevels; zero means not
	// given). With more,
	// level 0 covers the container with cells 2^(levels-1) times as wide
	// as the finest level's, and each finer level covers a block of its
	// parent around the spheres (see [Lattice.Layout]); CellsPerRadius is
	// the finest level's.
	Levels int `toml:"levels,omitzero" note:"nested levels refined by 2 toward the spheres (1: one uniform lattice)"`
	// FineMargin is the margin of the finest level around every sphere
	// and its excursion, in radii of the smallest sphere (default 2, the
	// issue's "about two small-sphere radii"; zero means not given). Used
	// only with Levels > 1.
	FineMargin float64 `toml:"fine_margin,omitzero" note:"finest level around each sphere and its excursion, in radii of the smallest sphere (levels > 1)"`
	// LevelMargin is the margin of each coarser level around the next
	// finer one, in the coarser level's cells (default
	// DefaultLevelMargin; at least 2, the coupling's rule; zero means not
	// given). Used only with Levels > 1.
	LevelMargin int `toml:"level_margin,omitzero" note:"each coarser level around the next finer one, in its cells (levels > 1)"`
}

// Solver is the [solver] section.
type Solver struct {
	Collision string  `toml:"collision" note:"\"trt\", \"mrt\" or \"bgk\""`                            // CollisionTRT (default), CollisionMRT or CollisionBGK
	Magic     float64 `toml:"magic" note:"TRT magic parameter"`                                        // TRT magic parameter Λ; default 3/16
	Precision string  `toml:"precision" note:"storage of the populations, \"float64\" or \"float32\""` // storage of the populations: PrecisionDouble (default) or PrecisionSingle
}

// Run is the [run] section. A shaken case runs for Periods drive periods
// and samples SamplesPerPeriod times per period; an unshaken case runs for
// Duration seconds and samples every SampleInterval seconds.
type Run struct {
	Periods          int     `toml:"periods,omitzero" note:"drive periods"` // required when Shaking.Frequency > 0
	Duration         float64 `toml:"duration,omitzero" note:"s"`            // s; required when Shaking.Frequency == 0
	SamplesPerPeriod int     `toml:"samples_per_period,omitzero"`           // default 20 (shaken cases)
	SampleInterval   float64 `toml:"sample_interval,omitzero" note:"s"`     // s; default Duration/200 (unshaken cases)
	Title            string  `toml:"title"`                                 // optional free text
}

// Default returns a case with every unconditional default filled in and
// the required values left zero. The defaults that depend on the rest of
// the case (cells_per_radius, samples_per_period or sample_interval,
// rest_length, the arm frequency) are filled in by [Case.FillDefaults].
func Default() *Case {
	return &Case{
		Container: Container{Ends: DefaultEnds},
		Shaking:   Shaking{RampPeriods: DefaultRampPeriods, Gravity: DefaultGravity},
		Bodies: Bodies{VirtualMass: DefaultVirtualMass, Coupling: DefaultCoupling,
			RepulsionRange: DefaultRepulsionRange},
		Solver: Solver{Collision: DefaultCollision, Magic: DefaultMagic, Precision: DefaultPrecision},
		Output: Output{SnapshotsPerPeriod: DefaultSnapshotsPerPeriod, SnapshotPeriods: 1,
			Mirror: true, VTK: true, Pictures: true},
	}
}

// DefaultSnapshotsPerPeriod is the number of field snapshots per drive
// period written over the last snapshot_periods periods.
const DefaultSnapshotsPerPeriod = 8

// Output is the [output] section: which fields and pictures a run writes.
type Output struct {
	// SnapshotsPerPeriod field snapshots at evenly spaced phases of each of
	// the last SnapshotPeriods periods (0: none).
	SnapshotsPerPeriod int `toml:"snapshots_per_period" note:"field snapshots per period (0: none)"`
	SnapshotPeriods    int `toml:"snapshot_periods" note:"over the last periods"`
	// AveragePeriods is the number of final periods over which the mean
	// (steady streaming) and phase-averaged fields are accumulated; 0 means
	// the window of the swimming-speed estimate.
	AveragePeriods int  `toml:"average_periods" note:"final periods of the mean fields (0: the speed window)"`
	Mirror         bool `toml:"mirror" note:"VTK shows the full meridian plane"` // VTK files show the full meridian plane -R..R
	VTK            bool `toml:"vtk"`                                             // write VTK XML fields
	Pictures       bool `toml:"pictures"`                                        // write PNG pictures
	// ImageSpacing is the node spacing (m) of the uniform image of the
	// fields on refined levels (grid.levels > 1), rounded to the finest
	// cell times a power of 2 (Lattice.ImageCells); 0 chooses one that
	// keeps the image's nodes at most the levels' cells. Unused on one
	// level, whose fields are the lattice's own.
	ImageSpacing float64 `toml:"image_spacing,omitzero" note:"m, image of the fields on levels" unset:"image_spacing not given: chosen from the levels' cells (levels > 1)"`
}

// FillDefaults fills in every optional value that is zero (that is, not
// given) and whose default follows from the rest of the case:
// ends, collision, magic, coupling and repulsion_range; the grid's levels
// and margins; cells_per_radius when there are spheres and no cell_size; the frequency of each arm from
// the shaking; samples_per_period for periodic cases (shaken, or with an
// arm) or sample_interval for the others, unless either is given; and the
// rest length of each spring that joins two existing spheres. It leaves
// Gravity, RampPeriods and VirtualMass alone, since zero is a valid value
// for each.
func (c *Case) FillDefaults() {
	if c.Container.Ends == "" {
		c.Container.Ends = DefaultEnds
	}
	if c.Bodies.Coupling == "" {
		c.Bodies.Coupling = DefaultCoupling
	}
	if c.Bodies.RepulsionRange == 0 {
		c.Bodies.RepulsionRange = DefaultRepulsionRange
	}
	for i := range c.Arms {
		if c.Arms[i].Frequency == 0 {
			c.Arms[i].Frequency = c.Shaking.Frequency
		}
	}
	if c.Solver.Collision == "" {
		c.Solver.Collision = DefaultCollision
	}
	if c.Solver.Precision == "" {
		c.Solver.Precision = DefaultPrecision
	}
	if c.Solver.Magic == 0 {
		c.Solver.Magic = DefaultMagic
	}
	c.Grid.Levels, c.Grid.FineMargin, c.Grid.LevelMargin = c.levels(), c.fineMargin(), c.levelMargin()
	if len(c.Spheres) > 0 && c.Grid.CellsPerRadius == 0 && c.Grid.CellSize == 0 {
		c.Grid.CellsPerRadius = DefaultCellsPerRadius
	}
	if c.Run.SamplesPerPeriod == 0 && c.Run.SampleInterval == 0 {
		switch {
		case c.PeriodFrequency() > 0:
			c.Run.SamplesPerPeriod = DefaultSamplesPerPeriod
		case c.Run.Duration > 0:
			c.Run.SampleInterval = c.Run.Duration / DefaultSamplesPerDuration
		}
	}
	for i := range c.Springs {
		s := &c.Springs[i]
		if s.RestLength != 0 {
			continue
		}
		if a, b, ok := c.springSpheres(*s); ok {
			s.RestLength = abs(b.Z - a.Z)
		}
	}
}

// PeriodFrequency is the frequency (Hz) whose periods count the run: the
// shaking frequency, or without shaking the lowest positive arm frequency
// (the slowest stroke); 0 when nothing is periodic.
func (c *Case) PeriodFrequency() float64 {
	if c.Shaking.Frequency > 0 {
		return c.Shaking.Frequency
	}
	f := 0.0
	for _, a := range c.Arms {
		if a.Frequency > 0 && !math.IsInf(a.Frequency, 1) && (f == 0 || a.Frequency < f) {
			f = a.Frequency
		}
	}
	return f
}

// pairSpheres returns the two spheres a pair of 1-based indices names, and
// whether both name existing, distinct spheres.
func (c *Case) pairSpheres(p [2]int) (a, b Sphere, ok bool) {
	i, j := p[0], p[1]
	n := len(c.Spheres)
	if i < 1 || i > n || j < 1 || j > n || i == j {
		return Sphere{}, Sphere{}, false
	}
	return c.Spheres[i-1], c.Spheres[j-1], true
}

// springSpheres returns the two spheres a spring joins, and whether both
// indices name existing, distinct spheres.
func (c *Case) springSpheres(s Spring) (a, b Sphere, ok bool) {
	return c.pairSpheres(s.Spheres)
}

// smallestSphere returns the smallest sphere radius, or 0 without spheres.
func (c *Case) smallestSphere() float64 {
	r := 0.0
	for i, s := range c.Spheres {
		if i == 0 || s.Radius < r {
			r = s.Radius
		}
	}
	return r
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
