package cases

import (
	"fmt"
	"math"

	"axiswim/lbm"
)

// Cs is the lattice speed of sound, 1/√3 (METHODS.md 1.1).
const Cs = 0.57735026918962576450914878050195745564760175127013

// Start-up limits of METHODS.md 10.1. Resolve chooses the time step from
// the first four and warns about the others.
const (
	MaxMach        = 0.1  // Ma = U_L/c_s; error ∝ Ma² (10.1, 10.2)
	MaxHe          = 1.0  // He = ω_L max(Nz, Nr)/c_s; acoustic compactness (10.1, 10.3 rule 1)
	MaxTau         = 1.0  // τ⁺ upper end of 0.51–1.0 (10.1)
	MinTau         = 0.51 // τ⁺ lower end (10.1; BGK loses stability near 1/2, 10.2)
	MinStokesCells = 3.0  // δ/Δx, Stokes-layer resolution (10.1)
	MinSphereCells = 8.0  // a/Δx of the small sphere (10.1, 7.5)
	MaxGridRe      = 10.0 // Re_Δ = U Δx/ν for TRT and MRT (10.1)
	MaxGridReBGK   = 5.0  // Re_Δ for BGK (10.1)
	MaxWallCFL     = 0.1  // V Δt/Δx (10.1)
	MinGapCells    = 2.0  // sphere gap g/Δx (10.1, 9.5)
	// MaxSphereRe bounds the sphere Reynolds number A ω 2a/ν: above about
	// 200 the flow past a sphere is no longer axisymmetric (Natarajan &
	// Acrivos 1993; Johnson & Patel 1999).
	MaxSphereRe = 200.0
	// MaxLengthError is the largest relative difference between the
	// container length and the effective length Nz Δx that passes
	// without a warning.
	MaxLengthError = 0.005
)

// Names of the limit that chose the time step, as in Lattice.Bound.
const (
	BoundMach     = "Mach"     // Ma <= MaxMach
	BoundAcoustic = "acoustic" // He <= MaxHe
	BoundTauMax   = "tau_max"  // τ⁺ <= MaxTau
	// BoundTauMin is the floor τ⁺ >= MinTau. Resolve never picks it for
	// a successful resolution (the time step is the largest admissible
	// one); it names the floor in the error when the limits conflict.
	BoundTauMin = "tau_min"
	BoundGiven  = "given" // grid.tau was given
	// BoundLevelTau: the upper limits put a level's tau+ or tau- within
	// lbm.TauCloseToOne of 1, and the time step was lowered below that
	// (grid.levels > 1).
	BoundLevelTau = "level_tau"
)

// A Lattice is a case mapped to lattice units (METHODS.md 11.2): the grid,
// the time step, the relaxation time, the expected values of the
// start-up limits of METHODS.md 10.1, and the conversions between SI and
// lattice units. Lattice units have Δx = Δt = 1 and reference density
// ρ0 = 1; the lattice mass unit is ρ_f Δx³.
type Lattice struct {
	Dx, Dt float64 // cell size (m) and time step (s)
	Nz, Nr int     // cells along z and across the radius
	Single bool    // float32 storage of the populations (solver.precision)
	Tau    float64 // relaxation time τ⁺ = 3 NuL + 1/2
	NuL    float64 // lattice kinematic viscosity ν Δt/Δx²
	// NuLMax is the largest NuL the upper limits (Mach, acoustic, tau_max)
	// allow. With Bound != BoundGiven, NuL equals NuLMax, or is below it
	// by less than one part in StepsPerPeriod when the steps per period
	// were rounded up to an integer.
	NuLMax float64

	Length, Radius float64 // effective container size Nz Dx, Nr Dx (m)

	Density float64 // fluid density ρ_f (kg/m^3)
	Nu      float64 // fluid kinematic viscosity μ/ρ_f (m^2/s)
	// Omega is the angular frequency 2π f of the run's period: the drive's
	// (shaking.frequency) or, without shaking, the slowest arm stroke's; 0
	// when nothing is periodic.
	Omega  float64
	OmegaL float64 // Omega per step, Omega Dt
	// OmegaMax is the highest angular frequency of the forcing: of the
	// drive, of each harmonic with a positive amplitude (order x drive)
	// and of each arm stroke. The acoustic limit uses it; it equals Omega
	// without harmonics and arms.
	OmegaMax float64

	StepsPerPeriod int // steps per period of Omega; 0 when nothing is periodic
	Steps          int // total steps of the run

	// RefVelocity is the reference speed U (m/s) used for the Mach
	// limit: the largest of the container speed bound ω (A + Σ n A_n), the
	// stroke speed 2π f A of each arm, the Stokes settling speed of each
	// sphere (with gravity) and, for periodic ends with gravity, the centre
	// speed of Hagen–Poiseuille flow g R²/(4ν).
	RefVelocity float64

	// Expected values of the limits of METHODS.md 10.1.
	Mach        float64 // U Δt/Δx / c_s
	He          float64 // OmegaMax Δt max(Nz, Nr)/c_s
	HeRadial    float64 // OmegaMax Δt Nr/c_s
	ReGrid      float64 // U Δx/ν
	WallCFL     float64 // largest expected sphere speed relative to the container, in cells per step
	StokesCells float64 // Stokes-layer thickness δ = √(2ν/Omega) in cells; 0 when nothing is periodic

	Bound    string   // the limit that chose the time step: BoundMach, ..., BoundGiven
	Warnings []string // limits that are violated or nearly so, one sentence each

	// Levels is grid.levels: 1 is one uniform lattice; with more, Dx, Dt,
	// Tau and NuL are the finest level's and Nz x Nr the uniform lattice
	// of that spacing (see Resolve and Layout).
	Levels int
	layout Layout // made by Resolve; see Layout
}

// gridSpec is the grid a case asks for. Counts are float64 so that absurd
// inputs cannot overflow before Validate rejects them.
type gridSpec struct {
	dxNom, dx float64
	nz, nr    float64 // cells of the finest spacing across the container
	// levels is grid.levels; nz0 x nr0 are level 0's cells, nz x nr over
	// 2^(levels-1) (equal to them with one level).
	levels   int
	nz0, nr0 float64
}

// grid computes the grid (METHODS.md 11.2 step 2): the nominal cell size
// is the smallest sphere radius over cells_per_radius, or cell_size
// without spheres; Nr = round(R/dx_nominal) and then Dx = R/Nr exactly, so
// that the container wall sits exactly at R under halfway bounce-back;
// Nz = round(L/Dx). With grid.levels > 1 the same is done for level 0,
// whose nominal cell is 2^(levels-1) times the finest's: the container is
// rounded to whole coarsest cells, and the finest cell is level 0's over
// 2^(levels-1). ok is false if the inputs do not define a grid.
func (c *Case) grid() (g gridSpec, ok bool) {
	R, L := c.Container.Radius, c.Container.Length
	if len(c.Spheres) > 0 {
		a := c.smallestSphere()
		if c.Grid.CellsPerRadius <= 0 || !(a > 0) {
			return g, false
		}
		g.dxNom = a / float64(c.Grid.CellsPerRadius)
	} else {
		g.dxNom = c.Grid.CellSize
	}
	if !finitePositive(g.dxNom) || !finitePositive(R) || !finitePositive(L) {
		return g, false
	}
	if g.levels = c.levels(); g.levels < 1 || g.levels > MaxLevels {
		return g, false
	}
	f := refinement(g.levels) // 1 with one level: the arithmetic of one uniform lattice
	dx0 := g.dxNom * f
	g.nr0 = math.Round(R / dx0)
	if g.nr0 >= 1 {
		dx0 = R / g.nr0
	}
	g.nz0 = math.Round(L / dx0)
	g.dx = dx0 / f
	g.nr, g.nz = g.nr0*f, g.nz0*f
	return g, true
}

func finitePositive(x float64) bool { return x > 0 && !math.IsInf(x, 1) }

// Resolve validates c and maps it to lattice units.
//
// The grid follows METHODS.md 11.2 step 2 (see Lattice). When grid.tau is
// not given, the time step is the largest one for which the lattice
// viscosity ν_L = ν Δt/Δx² satisfies every limit of METHODS.md 11.2 step 4,
// generalised:
//
//	Ma = U_L/c_s <= 0.1, U_L = U Δt/Δx          (Mach, METHODS.md 10.1)
//	He = ω_max Δt max(Nz, Nr)/c_s <= 1           (acoustic, METHODS.md 10.3)
//	τ⁺ = 3ν_L + 1/2 <= 1                         (tau_max, METHODS.md 10.1)
//	τ⁺ >= 0.51                                   (tau_min, METHODS.md 10.1)
//
// ω_max is the highest frequency of the forcing (Lattice.OmegaMax): a
// harmonic or an arm stroke rings the cell like the drive does. With
// shaking, or with an arm stroke, the steps per period (of Lattice.Omega)
// are then rounded up to an integer so that phases are sampled exactly, and
// Δt and ν_L recomputed. If the upper
// limits fall below the floor, Resolve returns [Problems] naming the
// conflicting limits and the resolution that would clear them. When tau is
// given it is used (adjusted slightly, with shaking, to make the period a
// whole number of steps) and every limit it violates is a warning.
//
// With grid.levels > 1 the lattice's Dx, Dt, Tau and NuL are the finest
// level's, Nz x Nr the uniform lattice of that spacing over the container
// (2^(levels-1) times level 0's cells each way), and the limits are those
// of a refined lattice: the upper ones as above (the Mach and acoustic
// numbers are the same on every level under acoustic scaling, tau_max
// applies to the finest level, which has the largest tau), and instead of
// tau_min the floor of the coarsest level, τ⁺ >= MinLevelTau
// (benchmarks/taustability), that is 3ν_L >= 2^(levels-1) (MinLevelTau -
// 1/2) on the finest level. No level's τ⁺ or τ⁻ may lie within
// lbm.TauCloseToOne of 1 (the coupling rescales by τ - 1, lbm.Levels):
// the time step is lowered below such a band (Bound = BoundLevelTau). The
// steps per period are rounded up to a whole number of level-0 steps, so
// Lattice.StepsPerPeriod and Steps are multiples of 2^(levels-1). The
// levels themselves are in [Lattice.Layout].
func Resolve(c *Case) (*Lattice, error) {
	if err := c.Validate(); err != nil {
		return nil, fmt.Errorf("invalid case: %w", err)
	}
	g, _ := c.grid() // Validate has checked it
	nu := c.Fluid.Viscosity / c.Fluid.Density
	l := &Lattice{
		Single:  c.Solver.Precision == PrecisionSingle,
		Dx:      g.dx,
		Nz:      int(g.nz),
		Nr:      int(g.nr),
		Levels:  g.levels,
		Density: c.Fluid.Density,
		Nu:      nu,
		Omega:   2 * math.Pi * c.PeriodFrequency(),
	}
	f := refinement(l.Levels) // finest steps per level-0 step
	l.OmegaMax = c.maxForcingOmega()
	l.Length = float64(l.Nz) * l.Dx
	l.Radius = float64(l.Nr) * l.Dx
	l.RefVelocity = c.referenceSpeed(nu)

	// Upper bounds on ν_L, from Δt = ν_L Δx²/ν:
	// Mach: U ν_L Δx/ν / c_s <= MaxMach.
	// Acoustic: ω ν_L Δx² max(Nz, Nr)/ν / c_s <= MaxHe. Both bounds grow
	// like 1/Δx as the grid is refined (max(Nz, Nr) Δx is fixed).
	dx2 := l.Dx * l.Dx
	lmax := float64(max(l.Nz, l.Nr))
	limits := []nuLimit{
		{BoundTauMax, fmt.Sprintf("tau <= %g", MaxTau), (MaxTau - 0.5) / 3},
		{BoundAcoustic, fmt.Sprintf("the acoustic limit He <= %g (METHODS.md 10.3)", MaxHe), math.Inf(1)},
		{BoundMach, fmt.Sprintf("the Mach limit Ma <= %g (METHODS.md 10.1)", MaxMach), math.Inf(1)},
	}
	if l.OmegaMax > 0 {
		limits[1].nuL = MaxHe * Cs * nu / (l.OmegaMax * dx2 * lmax)
	}
	if l.RefVelocity > 0 {
		limits[2].nuL = MaxMach * Cs * nu / (l.RefVelocity * l.Dx)
	}
	nuMin := (MinTau - 0.5) / 3
	floor := fmt.Sprintf("tau >= %g, METHODS.md 10.1", MinTau)
	bands := nearOneBands(l.Levels, c.Solver.Magic)
	if l.Levels > 1 {
		nuMin = f * (MinLevelTau - 0.5) / 3
		floor = fmt.Sprintf("of the finest level: the coarsest of %d levels needs tau+ >= %g, %s", l.Levels, MinLevelTau, bindingSource)
	}
	upper, bound := limits[0].nuL, limits[0].name
	for _, lim := range limits[1:] {
		if lim.nuL < upper {
			upper, bound = lim.nuL, lim.name
		}
	}
	l.NuLMax = upper

	var period float64
	if l.Omega > 0 {
		period = 1 / c.PeriodFrequency()
	}
	if c.Grid.Tau == 0 {
		l.Bound = bound
		nuL := upper
		// roundSteps sets the time step of nuL, with the steps per period
		// rounded up to whole level-0 steps: a shorter step keeps every
		// upper limit. The guard keeps an exact integer from gaining a
		// step through round-off.
		roundSteps := func(nuL float64) {
			l.Dt = nuL * dx2 / nu
			if period > 0 {
				spp := math.Ceil(period / (l.Dt * f) * (1 - 1e-12))
				l.Dt = period / (spp * f)
			}
			l.NuL = nu * l.Dt / dx2
		}
		roundSteps(nuL)
		// Below any band of a level's tau near 1: its lower edge, a hair
		// under; the rounding lowers nu_L again, by less than one part in
		// the steps per period, which may land in a lower band: try again.
		for range 2 * len(bands) {
			b, in := inBand(bands, l.NuL)
			if !in {
				break
			}
			l.Bound = BoundLevelTau
			nuL = b.lo * (1 - 1e-9)
			roundSteps(nuL)
		}
		var conflicts []string
		switch {
		case upper < nuMin:
			for _, lim := range limits {
				if lim.nuL < nuMin {
					conflicts = append(conflicts, fmt.Sprintf("%s needs nu_L <= %.3g", lim.desc, lim.nuL))
				}
			}
		case l.NuL < nuMin*(1-1e-12) && l.Bound == BoundLevelTau:
			conflicts = append(conflicts, fmt.Sprintf("keeping every level's tau+ and tau- at least %g from 1 (lbm.Levels rescales by tau - 1) needs nu_L <= %.3g",
				lbm.TauCloseToOne, l.NuL))
		case l.NuL < nuMin*(1-1e-12):
			conflicts = append(conflicts, fmt.Sprintf("%s needs nu_L <= %.3g once the steps per period are rounded up",
				boundDesc(limits, bound), l.NuL))
		}
		if len(conflicts) > 0 {
			return nil, c.timeStepConflict(conflicts, nuMin, min(upper, l.NuL), floor)
		}
	} else {
		l.Bound = BoundGiven
		l.NuL = (c.Grid.Tau - 0.5) / 3
		l.Dt = l.NuL * dx2 / nu
		if period > 0 {
			spp := math.Max(1, math.Round(period/(l.Dt*f)))
			l.Dt = period / (spp * f)
			l.NuL = nu * l.Dt / dx2
		}
		// The rounding moves tau by less than a part in the steps per
		// period; Validate has kept the given tau out of the bands.
		if b, in := inBand(bands, l.NuL); in {
			return nil, Problems{c.nearOneProblem(b, 3*l.NuL+0.5)}
		}
	}
	l.Tau = 3*l.NuL + 0.5

	if period > 0 {
		spp := math.Round(period / (l.Dt * f))
		steps := spp * float64(c.Run.Periods)
		if steps*f > 1<<53 {
			return nil, fmt.Errorf("resolve case: %.3g steps is too many to run", steps*f)
		}
		l.StepsPerPeriod = int(spp * f)
		l.Steps = int(steps * f)
	} else {
		steps := math.Ceil(c.Run.Duration / (l.Dt * f) * (1 - 1e-12))
		if steps*f > 1<<53 {
			return nil, fmt.Errorf("resolve case: %.3g steps is too many to run", steps*f)
		}
		l.Steps = int(max(steps, 1) * f)
	}

	// Expected values (METHODS.md 10.1, 11.2 step 3).
	uL := l.RefVelocity * l.Dt / l.Dx
	l.Mach = uL / Cs
	l.OmegaL = l.Omega * l.Dt
	l.He = l.OmegaMax * l.Dt * lmax / Cs
	l.HeRadial = l.OmegaMax * l.Dt * float64(l.Nr) / Cs
	l.ReGrid = l.RefVelocity * l.Dx / nu
	l.WallCFL = c.wallSpeed() * l.Dt / l.Dx
	if l.Omega > 0 {
		l.StokesCells = math.Sqrt(2*nu/l.Omega) / l.Dx
	}
	var err error
	if l.layout, err = c.newLayout(l); err != nil {
		return nil, fmt.Errorf("resolve case: %w", err)
	}
	l.Warnings = c.warnings(l)
	return l, nil
}

// A nuLimit is an upper bound on the lattice viscosity from one limit.
type nuLimit struct {
	name string  // BoundMach, ...
	desc string  // for error messages
	nuL  float64 // largest admissible ν_L
}

func boundDesc(limits []nuLimit, name string) string {
	for _, l := range limits {
		if l.name == name {
			return l.desc
		}
	}
	return name
}

// SI to lattice units and back (METHODS.md 1.4 and 11.2 step 5). The
// lattice mass unit is ρ_f Δx³ and the lattice reference density ρ0 = 1.

// Distance converts a length in metres to cells.
func (l *Lattice) Distance(m float64) float64 { return m / l.Dx }

// DistanceSI converts a length in cells to metres.
func (l *Lattice) DistanceSI(cells float64) float64 { return cells * l.Dx }

// Time converts a time in seconds to steps.
func (l *Lattice) Time(s float64) float64 { return s / l.Dt }

// TimeSI converts a time in steps to seconds.
func (l *Lattice) TimeSI(steps float64) float64 { return steps * l.Dt }

// Velocity converts a speed in m/s to lattice units, u Δt/Δx.
func (l *Lattice) Velocity(v float64) float64 { return v * l.Dt / l.Dx }

// VelocitySI converts a lattice speed to m/s: uL times the lattice's unit
// of speed Δx/Δt (computed first, as the field conversions always did).
func (l *Lattice) VelocitySI(uL float64) float64 { return uL * (l.Dx / l.Dt) }

// Acceleration converts an acceleration in m/s^2 to lattice units, a Δt²/Δx.
func (l *Lattice) Acceleration(a float64) float64 { return a * l.Dt * l.Dt / l.Dx }

// AccelerationSI converts a lattice acceleration to m/s^2.
func (l *Lattice) AccelerationSI(aL float64) float64 { return aL * l.Dx / (l.Dt * l.Dt) }

// ForceDensity converts a force density in N/m^3 to lattice units,
// F_L = F Δt²/(ρ_f Δx).
func (l *Lattice) ForceDensity(f float64) float64 { return f * l.Dt * l.Dt / (l.Density * l.Dx) }

// ForceDensitySI converts a lattice force density to N/m^3, F = ρ_f Δx/Δt² F_L.
func (l *Lattice) ForceDensitySI(fL float64) float64 { return fL * l.Density * l.Dx / (l.Dt * l.Dt) }

// Force3D converts a force on a body in newtons to lattice units,
// F_L = F Δt²/(ρ_f Δx⁴).
func (l *Lattice) Force3D(f float64) float64 { return f * l.Dt * l.Dt / (l.Density * pow4(l.Dx)) }

// Force3DSI converts a ring-integrated (3D) lattice force on a body to
// newtons, F = ρ_f Δx⁴/Δt² F_L.
func (l *Lattice) Force3DSI(fL float64) float64 { return fL * l.Density * pow4(l.Dx) / (l.Dt * l.Dt) }

// Pressure converts a pressure difference p - p0 in Pa to the lattice
// density ρ_L it corresponds to: ρ_L = 1 + 3 (p - p0)/(ρ_f (Δx/Δt)²).
func (l *Lattice) Pressure(dp float64) float64 {
	return 1 + 3*dp/(l.Density*sq(l.Dx/l.Dt))
}

// PressureSI converts a lattice density ρ_L to the pressure difference
// p - p0 in Pa: p - p0 = ρ_f (Δx/Δt)² (ρ_L - 1)/3.
func (l *Lattice) PressureSI(rhoL float64) float64 {
	return l.Density * sq(l.Dx/l.Dt) * (rhoL - 1) / 3
}

// Mass converts a mass in kg to lattice units, m/(ρ_f Δx³).
func (l *Lattice) Mass(m float64) float64 { return m / (l.Density * cube(l.Dx)) }

// MassSI converts a lattice mass to kg.
func (l *Lattice) MassSI(mL float64) float64 { return mL * l.Density * cube(l.Dx) }

// Stiffness converts a spring stiffness in N/m to lattice units,
// k_L = k Δt²/(ρ_f Δx³).
func (l *Lattice) Stiffness(k float64) float64 { return k * l.Dt * l.Dt / (l.Density * cube(l.Dx)) }

// StiffnessSI converts a lattice stiffness to N/m.
func (l *Lattice) StiffnessSI(kL float64) float64 { return kL * l.Density * cube(l.Dx) / (l.Dt * l.Dt) }

// Damping converts a damping coefficient in N s/m to lattice units,
// c_L = c Δt/(ρ_f Δx³).
func (l *Lattice) Damping(c float64) float64 { return c * l.Dt / (l.Density * cube(l.Dx)) }

// DampingSI converts a lattice damping coefficient to N s/m.
func (l *Lattice) DampingSI(cL float64) float64 { return cL * l.Density * cube(l.Dx) / l.Dt }

// Viscosity converts a kinematic viscosity in m^2/s to lattice units.
func (l *Lattice) Viscosity(nu float64) float64 { return nu * l.Dt / (l.Dx * l.Dx) }

// Z converts a container-frame axial position in metres to the lattice
// coordinate, in which node k sits at k + 1/2 and the lower end at 0.
func (l *Lattice) Z(z float64) float64 { return (z + 0.5*l.Length) / l.Dx }

// ZSI converts a lattice axial coordinate back to metres, container frame
// (the container's centre at 0).
func (l *Lattice) ZSI(zl float64) float64 { return zl*l.Dx - 0.5*l.Length }

// RateSI converts a lattice rate (vorticity, strain rate) to 1/s.
func (l *Lattice) RateSI(rL float64) float64 { return rL / l.Dt }

// CirculationSI converts a lattice circulation to m^2/s.
func (l *Lattice) CirculationSI(gL float64) float64 { return gL * l.Dx * l.Dx / l.Dt }

// StreamfunctionSI converts a lattice Stokes streamfunction to m^3/s.
func (l *Lattice) StreamfunctionSI(psiL float64) float64 { return psiL * l.Dx * l.Dx * l.Dx / l.Dt }

// CellUpdates is the total work of the run: Steps x Nz x Nr node updates,
// or on refined levels the levels' node updates (Layout.NodeUpdates).
func (l *Lattice) CellUpdates() float64 {
	if l.Levels > 1 {
		return l.layout.NodeUpdates(l.layout.Steps)
	}
	return float64(l.Steps) * float64(l.Nz) * float64(l.Nr)
}

func sq(x float64) float64   { return x * x }
func cube(x float64) float64 { return x * x * x }
func pow4(x float64) float64 { return sq(sq(x)) }
