package drive

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/lbm"
)

// Simulation is a case set up on a lattice, ready to step.
type Simulation struct {
	Case    *cases.Case
	Lattice *cases.Lattice
	Fluid   *lbm.Solver
	Shaker  Shaker

	// FrameOnLiquid is true when the frame force and gravity act on the
	// liquid as a body force (periodic ends); false when they are absorbed
	// into the modified pressure (closed ends).
	FrameOnLiquid bool

	fields *lbm.Fields
	mass0  float64
	lv     *onLevels // nil on one uniform lattice
	after  func()    // AfterStep's function
	sw     *swimmer  // nil without spheres
	warm   bool      // started from another run's final state
	// swimmers are the groups of spheres joined by springs or arms
	// (Swimmers), lowest first.
	swimmers [][]int
}

// New sets up the case c on the lattice l with the given number of
// goroutines (0: all cores).
func New(c *cases.Case, l *cases.Lattice, threads int) (*Simulation, error) {
	col, ok := lbm.ParseCollision(c.Solver.Collision)
	if !ok {
		return nil, fmt.Errorf("solver.collision = %q: unknown operator", c.Solver.Collision)
	}
	periodic := c.Container.Ends == cases.EndsPeriodic
	s := &Simulation{Case: c, Lattice: l, FrameOnLiquid: periodic}
	if l.Levels > 1 {
		lv, err := newOnLevels(c, l, threads)
		if err != nil {
			return nil, err
		}
		s.lv, s.Fluid = lv, lv.finest()
	} else {
		fl, err := lbm.New(lbm.Config{
			Nz: l.Nz, Nr: l.Nr, Tau: l.Tau, Collision: col, Magic: c.Solver.Magic,
			Axisymmetric: true, PeriodicZ: periodic, Threads: threads,
			Single: c.Solver.Precision == cases.PrecisionSingle,
		})
		if err != nil {
			return nil, fmt.Errorf("set up the lattice: %w", err)
		}
		s.Fluid = fl
	}
	s.Shaker = shakerOf(c)
	if err := s.setupBodies(); err != nil {
		s.Close()
		return nil, err
	}
	s.swimmers = cases.Swimmers(c)
	if s.lv != nil {
		s.lv.hook(s)
		s.mass0 = s.lv.h.Mass()
		return s, nil
	}
	s.fields = s.Fluid.Fields(nil)
	s.mass0 = s.Fluid.Mass3D(s.fields)
	return s, nil
}

// shakerOf is the drive of case c.
func shakerOf(c *cases.Case) Shaker {
	var s Shaker
	if f := c.Shaking.Frequency; f > 0 {
		s = Shaker{Amplitude: c.Shaking.Amplitude, Omega: 2 * math.Pi * f, Ramp: c.Shaking.RampPeriods / f}
		for _, h := range c.Shaking.Harmonics {
			s.Harmonics = append(s.Harmonics, Harmonic{Order: h.Order, Amplitude: h.Amplitude, Phase: h.Phase * math.Pi / 180})
		}
	}
	return s
}

// Setup resolves c to lattice units and sets it up.
func Setup(c *cases.Case, threads int) (*Simulation, error) {
	l, err := cases.Resolve(c)
	if err != nil {
		return nil, err
	}
	return New(c, l, threads)
}

// Close releases the solver's goroutines.
func (s *Simulation) Close() {
	if s.lv != nil {
		s.lv.h.Close()
		return
	}
	s.Fluid.Close()
}

// Stride is the number of lattice steps (of the finest level, where the
// bodies live) that Advance takes at least and in multiples: 1 on one
// lattice, 2^(levels-1) on refined levels, whose coarsest level steps once
// while the finest steps that many times.
func (s *Simulation) Stride() int {
	if s.lv != nil {
		return s.lv.stride
	}
	return 1
}

// AfterStep sets fn to run after each lattice step of the bodies' lattice
// (the finest level), the bodies moved: Time, SphereState and the rest of
// the bodies' state are then those of that step. Observe and Fields are
// meant for the ends of Advance only (on refined levels the coarser levels
// are then between steps). A nil fn removes it.
func (s *Simulation) AfterStep(fn func()) { s.after = fn }

// Step returns the number of lattice steps taken.
func (s *Simulation) Step() int64 { return s.Fluid.Steps() }

// Time returns the physical time of the current state in seconds.
func (s *Simulation) Time() float64 { return float64(s.Fluid.Steps()) * s.Lattice.Dt }

// liquidForce returns the lattice body-force density on the liquid at time
// t: in the container frame the liquid feels -rho_f (a(t) + g) along z,
// which is applied only when FrameOnLiquid (see the package comment).
// F_L = F dt^2/(rho_f dx) (METHODS.md 1.4).
func (s *Simulation) liquidForce(t float64) float64 {
	if !s.FrameOnLiquid {
		return 0
	}
	return -s.Lattice.Acceleration(s.Shaker.Acceleration(t) + s.Case.Shaking.Gravity)
}

// Advance takes n lattice steps: the liquid streams and collides, then
// the bodies move under the forces of that step (METHODS.md 9.4).
// On refined levels n must be a multiple of Stride: the levels take n/Stride
// steps of level 0, the bodies move after each step of the finest level,
// and the refined levels follow the spheres (onLevels.follow).
func (s *Simulation) Advance(n int) error {
	if s.lv != nil {
		return s.lv.advance(s, n)
	}
	for i := 0; i < n; i++ {
		s.Fluid.SetForce(s.liquidForce(s.Time()), 0)
		s.Fluid.Step()
		if err := s.afterLatticeStep(); err != nil {
			return err
		}
	}
	return nil
}

// afterLatticeStep is what follows each step of the bodies' lattice (the
// finest level on refined levels): the bodies move, then AfterStep's
// function runs.
func (s *Simulation) afterLatticeStep() error {
	if s.sw != nil {
		if err := s.stepBodies(s.Fluid.Steps()); err != nil {
			return err
		}
	}
	if s.after != nil {
		s.after()
	}
	return nil
}

// Observation is the state of the liquid at one time, in SI units.
type Observation struct {
	Time              float64    // s
	DriveDisplacement float64    // m
	DriveVelocity     float64    // m/s
	DriveAcceleration float64    // m/s^2
	MaxSpeed          float64    // m/s, in the container frame
	Mach              float64    // max lattice speed / c_s
	MeanAxialVelocity float64    // m/s, volume average of u_z
	MassDrift         float64    // relative change of the 3D mass
	Finite            bool       // no NaN or Inf in the fields
	MinRho, MaxRho    float64    // lattice density range over the fluid nodes
	MaxAt             [2]float64 // where the largest speed is (z, r), m
}

// Observe computes the liquid's observables at the current time.
func (s *Simulation) Observe() Observation {
	if s.lv != nil {
		return s.lv.observe(s)
	}
	t := s.Time()
	s.Fluid.SetForce(s.liquidForce(t), 0)
	var rho float64 // the liquid's mean density, needed with spheres
	if s.sw != nil {
		s.fields, rho = s.Fluid.FieldsDensity(s.fields)
	} else {
		s.fields = s.Fluid.Fields(s.fields)
	}
	f := s.fields
	var umax2, flux, vol float64
	finite := true
	minRho, maxRho := math.Inf(1), math.Inf(-1)
	var at [2]int
	for j := 0; j < f.Nr; j++ {
		r := float64(j) + 0.5
		for k := 0; k < f.Nz; k++ {
			if s.Fluid.Solid(k, j) {
				continue
			}
			o := f.At(k, j)
			uz, ur := f.Uz[o], f.Ur[o]
			u2 := uz*uz + ur*ur
			if math.IsNaN(u2) || math.IsInf(u2, 0) || math.IsNaN(f.Rho[o]) {
				finite = false
			}
			if u2 > umax2 {
				umax2, at = u2, [2]int{k, j}
			}
			minRho, maxRho = math.Min(minRho, f.Rho[o]), math.Max(maxRho, f.Rho[o])
			flux += r * uz
			vol += r
		}
	}
	l := s.Lattice
	umax := math.Sqrt(umax2)
	return Observation{
		Time:              t,
		DriveDisplacement: s.Shaker.Displacement(t),
		DriveVelocity:     s.Shaker.Velocity(t),
		DriveAcceleration: s.Shaker.Acceleration(t),
		MaxSpeed:          l.VelocitySI(umax),
		Mach:              umax / math.Sqrt(lbm.Cs2),
		MeanAxialVelocity: l.VelocitySI(flux / vol),
		MassDrift:         s.massDrift(f, rho),
		Finite:            finite,
		MinRho:            minRho,
		MaxRho:            maxRho,
		MaxAt:             [2]float64{l.ZSI(float64(at[0]) + 0.5), l.DistanceSI(float64(at[1]) + 0.5)},
	}
}

// massDrift is the relative change of the liquid's 3D mass, or with
// moving spheres (whose covered and uncovered nodes change the liquid's
// lattice volume) of its mean density rho (lbm.Solver.FluidDensity), after
// the corrections.
func (s *Simulation) massDrift(f *lbm.Fields, rho float64) float64 {
	if s.sw != nil {
		return rho/s.sw.mass.Rho0 - 1
	}
	return s.Fluid.Mass3D(f)/s.mass0 - 1
}

// Fields returns the fields of the last Observe on the nodes of View: the
// lattice's own on one level, on refined levels their uniform image
// (lbm.Levels.SampleFrom).
func (s *Simulation) Fields() *lbm.Fields {
	if s.lv != nil {
		return s.lv.image(s)
	}
	return s.fields
}

// View is the lattice of the nodes that Fields, SolidMask and BodyVelocity
// give: Lattice itself on one level, the uniform image of refined levels
// (cases.Lattice.Image) at the spacing of ViewCells.
func (s *Simulation) View() *cases.Lattice {
	if s.lv != nil {
		return s.lv.view
	}
	return s.Lattice
}

// ViewCells is View's cell in cells of Lattice (the finest level's): 1 on
// one level.
func (s *Simulation) ViewCells() int {
	if s.lv != nil {
		return s.lv.viewCells
	}
	return 1
}

// Hard stops of the run-time guards (METHODS.md 10.1): Mach 0.3, and a
// density departing from the reference by more than 10% (our choice: the
// weakly compressible scheme's density errors grow as Ma^2, about 9% at
// Ma 0.3).
const (
	guardMach    = 0.3
	guardDensity = 0.1
)

// GuardError is the diagnosis of a hard limit broken by an observation
// (Simulation.Guard) or by a step of the bodies (Advance: a sphere faster
// than the wall CFL limit, a gap closed below a cell): which limit, where,
// and the remedy.
type GuardError struct {
	Time      float64 // s
	Diagnosis string
}

func (e *GuardError) Error() string { return e.Diagnosis }

// Guard returns a *GuardError when an observation breaks a hard limit,
// nil when all is well.
func (s *Simulation) Guard(o Observation) error {
	if d := s.diagnose(o); d != "" {
		return &GuardError{Time: o.Time, Diagnosis: d}
	}
	return nil
}

// diagnose names the hard limit an observation breaks, where, and the
// remedy; "" when all is well.
func (s *Simulation) diagnose(o Observation) string {
	// where is only formatted when a limit is broken: a guard that holds
	// allocates nothing.
	where := func() string {
		return fmt.Sprintf("at t = %.6g s, largest speed at z = %.4g m, r = %.4g m", o.Time, o.MaxAt[0], o.MaxAt[1])
	}
	switch {
	case !o.Finite:
		return "non-finite values (NaN or Inf) in the fields " + where() + ": " + s.instabilityRemedy()
	case o.Mach > guardMach:
		return fmt.Sprintf("Mach number %.3g above %g %s: lower the velocity scale on the lattice "+
			"(raise grid.cells_per_radius, or let the tool choose the time step by removing grid.tau)", o.Mach, guardMach, where())
	case o.MaxRho-1 > guardDensity || 1-o.MinRho > guardDensity:
		return fmt.Sprintf("lattice density range %.4g to %.4g, more than %g%% from the reference, %s: the weakly "+
			"compressible scheme no longer holds; raise grid.cells_per_radius or lower the time step", o.MinRho, o.MaxRho, 100*guardDensity, where())
	}
	return ""
}

// instabilityRemedy names the likely cause of a blow-up and its fix.
func (s *Simulation) instabilityRemedy() string {
	l := s.Lattice
	if l.Tau < 0.51 || l.ReGrid > 10 {
		return fmt.Sprintf("the lattice is unstable: tau = %.4g is close to 1/2 while the grid Reynolds number is about %.3g "+
			"(METHODS.md 10.1-10.2); raise grid.tau toward 1 (or remove it and let the tool choose the time step), "+
			"or raise grid.cells_per_radius", l.Tau, l.ReGrid)
	}
	return "the run is unstable; for a sphere lighter than the liquid raise bodies.virtual_mass to 1, " +
		"otherwise raise grid.cells_per_radius"
}
