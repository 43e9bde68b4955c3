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
// The keys of a case file are:
//
//	[fluid]      density (kg/m^3), viscosity (dynamic, Pa s)
//	[container]  radius (m), length (m; z runs from -length/2 to +length/2),
//	             ends = "closed" | "periodic"
//	[shaking]    frequency (Hz), amplitude (m), ramp_periods, gravity (m/s^2 along -z)
//	[[sphere]]   radius (m), density (kg/m^3), z (initial centre, m)
//	[[spring]]   spheres = [i, j] (1-based), stiffness (N/m), rest_length (m), damping (N s/m)
//	[grid]       cells_per_radius, cell_size (m), tau
//	[solver]     collision = "trt" | "mrt" | "bgk", magic
//	[run]        periods, duration (s), samples_per_period, sample_interval (s), title
//
// The numerical background (stability limits, dimensionless groups and the
// SI-to-lattice mapping) is in METHODS.md sections 10 and 11; the comments
// in this package cite it by section.
package cases

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

// Default values of the optional keys.
const (
	DefaultEnds             = EndsClosed
	DefaultRampPeriods      = 2.0
	DefaultGravity          = 9.81 // m/s^2
	DefaultCellsPerRadius   = 12
	DefaultCollision        = CollisionTRT
	DefaultMagic            = 3.0 / 16 // TRT magic parameter Λ (METHODS.md 2.2)
	DefaultSamplesPerPeriod = 20
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
// Shaking.RampPeriods may legitimately be zero, so their defaults are
// applied only by [Default] and [Parse].
type Case struct {
	Fluid     Fluid
	Container Container
	Shaking   Shaking
	Spheres   []Sphere // [[sphere]], in file order; referred to 1-based
	Springs   []Spring // [[spring]]
	Grid      Grid
	Solver    Solver
	Run       Run
}

// Fluid is the [fluid] section.
type Fluid struct {
	Density   float64 // kg/m^3, required
	Viscosity float64 // dynamic viscosity, Pa s, required
}

// Container is the [container] section: a liquid-filled cylinder whose axis
// is the z axis.
type Container struct {
	Radius float64 // m, required
	Length float64 // m, required; z runs from -Length/2 to +Length/2
	Ends   string  // EndsClosed (default) or EndsPeriodic
}

// Shaking is the [shaking] section: the container is displaced along z by
// Amplitude*sin(2π Frequency t), the amplitude being ramped up smoothly over
// RampPeriods periods.
type Shaking struct {
	Frequency   float64 // Hz; 0 means no shaking
	Amplitude   float64 // m, displacement amplitude of the container; default 0
	RampPeriods float64 // default 2; 0 switches the ramp off
	Gravity     float64 // m/s^2 along -z; default 9.81; 0 allowed
}

// Sphere is one [[sphere]] entry. Spheres are centred on the axis.
type Sphere struct {
	Radius  float64 // m
	Density float64 // kg/m^3
	Z       float64 // initial centre, m
}

// Spring is one [[spring]] entry joining two spheres.
type Spring struct {
	Spheres    [2]int  // 1-based sphere indices
	Stiffness  float64 // N/m
	RestLength float64 // m, centre to centre; default the initial centre distance
	Damping    float64 // N s/m; default 0
}

// Grid is the [grid] section.
type Grid struct {
	// CellsPerRadius is the number of cells across the radius of the
	// smallest sphere (default 12). It is used only when there are spheres.
	CellsPerRadius int
	// CellSize is the nominal cell size in metres. It is required, and
	// allowed, only when there is no sphere.
	CellSize float64
	// Tau is the relaxation time τ⁺. Zero means not given: Resolve then
	// chooses the time step from the stability limits.
	Tau float64
}

// Solver is the [solver] section.
type Solver struct {
	Collision string  // CollisionTRT (default), CollisionMRT or CollisionBGK
	Magic     float64 // TRT magic parameter Λ; default 3/16
}

// Run is the [run] section. A shaken case runs for Periods drive periods
// and samples SamplesPerPeriod times per period; an unshaken case runs for
// Duration seconds and samples every SampleInterval seconds.
type Run struct {
	Periods          int     // required when Shaking.Frequency > 0
	Duration         float64 // s; required when Shaking.Frequency == 0
	SamplesPerPeriod int     // default 20 (shaken cases)
	SampleInterval   float64 // s; default Duration/200 (unshaken cases)
	Title            string  // optional free text
}

// Default returns a case with every unconditional default filled in and
// the required values left zero. The defaults that depend on the rest of
// the case (cells_per_radius, samples_per_period or sample_interval,
// rest_length) are filled in by [Case.FillDefaults].
func Default() *Case {
	return &Case{
		Container: Container{Ends: DefaultEnds},
		Shaking:   Shaking{RampPeriods: DefaultRampPeriods, Gravity: DefaultGravity},
		Solver:    Solver{Collision: DefaultCollision, Magic: DefaultMagic},
	}
}

// FillDefaults fills in every optional value that is zero (that is, not
// given) and whose default follows from the rest of the case:
// ends, collision and magic; cells_per_radius when there are spheres and no
// cell_size; samples_per_period for shaken cases or sample_interval for
// unshaken ones, unless either is given; and the rest length of each spring
// that joins two existing spheres. It leaves Gravity and RampPeriods alone,
// since zero is a valid value for both.
func (c *Case) FillDefaults() {
	if c.Container.Ends == "" {
		c.Container.Ends = DefaultEnds
	}
	if c.Solver.Collision == "" {
		c.Solver.Collision = DefaultCollision
	}
	if c.Solver.Magic == 0 {
		c.Solver.Magic = DefaultMagic
	}
	if len(c.Spheres) > 0 && c.Grid.CellsPerRadius == 0 && c.Grid.CellSize == 0 {
		c.Grid.CellsPerRadius = DefaultCellsPerRadius
	}
	if c.Run.SamplesPerPeriod == 0 && c.Run.SampleInterval == 0 {
		switch {
		case c.Shaking.Frequency > 0:
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

// springSpheres returns the two spheres a spring joins, and whether both
// indices name existing, distinct spheres.
func (c *Case) springSpheres(s Spring) (a, b Sphere, ok bool) {
	i, j := s.Spheres[0], s.Spheres[1]
	n := len(c.Spheres)
	if i < 1 || i > n || j < 1 || j > n || i == j {
		return Sphere{}, Sphere{}, false
	}
	return c.Spheres[i-1], c.Spheres[j-1], true
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
