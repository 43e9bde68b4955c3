package cases

import (
	"fmt"
	"math"
	"strings"
)

// stokesSpeed is the Stokes settling speed 2|ρ_s - ρ_f| g a²/(9μ) of a
// sphere, 0 without gravity.
func (c *Case) stokesSpeed(s Sphere) float64 {
	return 2 * math.Abs(s.Density-c.Fluid.Density) * c.Shaking.Gravity * s.Radius * s.Radius / (9 * c.Fluid.Viscosity)
}

// driveSpeed is a bound on the container's speed, ω (A + Σ n A_n): the
// velocity amplitude of the drive with its harmonics in phase.
func (c *Case) driveSpeed() float64 {
	s := c.Shaking
	omega := 2 * math.Pi * s.Frequency
	u := s.Amplitude * omega
	for _, h := range s.Harmonics {
		u += float64(h.Order) * omega * h.Amplitude
	}
	return u
}

// ArmFrequency is the stroke frequency of arm a after defaulting (Hz):
// its own, or the shaking frequency.
func (c *Case) ArmFrequency(a Arm) float64 {
	if a.Frequency == 0 {
		return c.Shaking.Frequency
	}
	return a.Frequency
}

// armStart is the centre-to-centre distance arm a prescribes at t = 0: the
// ramp starts the stroke from zero amplitude.
func (c *Case) armStart(a Arm) float64 {
	want := a.Length
	if c.Shaking.RampPeriods == 0 {
		want += a.Amplitude * math.Sin(a.Phase*math.Pi/180)
	}
	return want
}

// strokeSpeed is the velocity amplitude 2π f A of the stroke of arm a.
func (c *Case) strokeSpeed(a Arm) float64 {
	return 2 * math.Pi * c.ArmFrequency(a) * a.Amplitude
}

// maxForcingOmega is the highest angular frequency of the forcing: the
// drive's, order x drive for each harmonic with a positive amplitude, and
// each arm's (Lattice.OmegaMax). The arms count like the drive, whatever
// their amplitude.
func (c *Case) maxForcingOmega() float64 {
	f := c.Shaking.Frequency
	for _, h := range c.Shaking.Harmonics {
		if h.Amplitude > 0 {
			f = math.Max(f, float64(h.Order)*c.Shaking.Frequency)
		}
	}
	for _, a := range c.Arms {
		f = math.Max(f, c.ArmFrequency(a))
	}
	return 2 * math.Pi * f
}

// referenceSpeed is the speed scale U of the Mach limit (METHODS.md 10.1,
// 11.2 step 3): the largest of the container speed bound ω (A + Σ n A_n),
// the stroke speed 2π f A of each arm, the Stokes settling speed of each
// sphere when gravity is on, and, for periodic ends with gravity, the
// Hagen–Poiseuille centre speed g R²/(4ν) of the column falling freely
// through the pipe.
func (c *Case) referenceSpeed(nu float64) float64 {
	u := c.driveSpeed()
	for _, a := range c.Arms {
		u = math.Max(u, c.strokeSpeed(a))
	}
	if c.Shaking.Gravity != 0 {
		for _, s := range c.Spheres {
			u = math.Max(u, c.stokesSpeed(s))
		}
		if c.Container.Ends == EndsPeriodic {
			R := c.Container.Radius
			u = math.Max(u, c.Shaking.Gravity*R*R/(4*nu))
		}
	}
	return u
}

// wallSpeed is the largest expected speed of a sphere surface relative to
// the container: the container speed bound times the inviscid relative
// amplitude ratio |ρ_s - ρ_f|/(ρ_s + ρ_f/2) (METHODS.md 11.1, added mass
// C_A = 1/2), plus the settling speed, plus the fastest stroke of an arm
// on the sphere. It is 0 without spheres.
func (c *Case) wallSpeed() float64 {
	rf := c.Fluid.Density
	u := c.driveSpeed()
	v := 0.0
	for i, s := range c.Spheres {
		stroke := 0.0
		for _, a := range c.Arms {
			if a.Spheres[0] == i+1 || a.Spheres[1] == i+1 {
				stroke = math.Max(stroke, c.strokeSpeed(a))
			}
		}
		rel := math.Abs(s.Density-rf) / (s.Density + rf/2)
		v = math.Max(v, rel*u+c.stokesSpeed(s)+stroke)
	}
	return v
}

// timeStepConflict explains why no time step satisfies the limits, as a
// Problem on the resolution key. Both the Mach and the acoustic bound on
// ν_L grow in proportion to 1/Δx (see Resolve), so refining the grid by
// nuMin/upper clears them.
//
// floor says where the floor comes from: "tau >= 0.51, METHODS.md 10.1"
// on one uniform lattice, the coarsest level's tau+ with more levels (the
// floor halves with each level fewer, which the fix then says too).
func (c *Case) timeStepConflict(conflicts []string, nuMin, upper float64, floor string) error {
	factor := nuMin / upper * 1.02 // a margin for the rounding of Nr and of the steps
	p := Problem{
		Reason: fmt.Sprintf("no admissible time step: %s, below the floor nu_L >= %.3g (%s)",
			strings.Join(conflicts, " and "), nuMin, floor),
	}
	if len(c.Spheres) > 0 {
		p.Key, p.Value = "grid.cells_per_radius", formatValue(c.Grid.CellsPerRadius)
		p.Fix = fmt.Sprintf("raise grid.cells_per_radius to at least %d (the Mach and acoustic bounds on nu_L both grow in proportion to the cells per radius)",
			int(math.Ceil(float64(c.Grid.CellsPerRadius)*factor)))
	} else {
		p.Key, p.Value = "grid.cell_size", formatValue(c.Grid.CellSize)
		p.Fix = fmt.Sprintf("lower grid.cell_size to at most %.3g m (the Mach and acoustic bounds on nu_L both grow as the cells shrink)",
			c.Grid.CellSize/factor)
	}
	joined := strings.Join(conflicts, " ")
	if strings.Contains(joined, "acoustic") {
		p.Fix += ", or shorten the container: the acoustic bound is inversely proportional to its longest side"
	}
	if strings.Contains(joined, "Mach") {
		p.Fix += ", or lower the reference speed (the amplitude or frequency of the shaking or of the arm strokes)"
	}
	if n := c.levels(); n > 2 { // one level has the higher floor MinTau
		p.Fix += fmt.Sprintf(", or use fewer levels (grid.levels = %d halves the floor)", n-1)
	}
	p.Fix += "; or give grid.tau to accept the violation"
	return Problems{p}
}

// warnings lists the limits of METHODS.md 10.1 that l violates or nearly
// violates.
func (c *Case) warnings(l *Lattice) []string {
	var w []string
	warn := func(format string, args ...any) { w = append(w, fmt.Sprintf(format, args...)) }

	if L := c.Container.Length; math.Abs(l.Length-L) > MaxLengthError*L {
		warn("effective container length %.4g m (%d cells of %.4g m) differs from container.length = %.4g m by %.2f%%",
			l.Length, l.Nz, l.Dx, L, 100*math.Abs(l.Length-L)/L)
	}
	if l.Bound == BoundGiven {
		if given := c.Grid.Tau; math.Abs(l.Tau-given) > 1e-9*given {
			warn("tau adjusted from %g to %.6g so that a drive period is a whole number of steps (%d)",
				given, l.Tau, l.StepsPerPeriod)
		}
		if l.Tau > MaxTau {
			warn("tau = %.4g exceeds %g (METHODS.md 10.1); the acoustic error grows with tau (10.3)", l.Tau, MaxTau)
		}
		if l.Levels <= 1 && l.Tau < MinTau {
			warn("tau = %.4g is below %g (METHODS.md 10.1): close to the stability limit 1/2", l.Tau, MinTau)
		}
	}
	if l.Mach > MaxMach {
		warn("expected Mach number %.3g exceeds %g (METHODS.md 10.1): compressibility error grows as Ma^2", l.Mach, MaxMach)
	}
	if l.He > MaxHe {
		warn("acoustic compactness He = %.3g exceeds %g (METHODS.md 10.3): the cell may ring; lower tau", l.He, MaxHe)
	}
	if l.Omega > 0 && l.StokesCells < MinStokesCells {
		warn("Stokes layer is only %.2f cells thick, below %g (METHODS.md 10.1): raise the resolution", l.StokesCells, MinStokesCells)
	}
	gridRe := MaxGridRe
	if c.Solver.Collision == CollisionBGK {
		gridRe = MaxGridReBGK
	}
	if l.ReGrid > gridRe {
		warn("grid Reynolds number %.3g exceeds %g (METHODS.md 10.1): raise the resolution", l.ReGrid, gridRe)
	}
	if l.WallCFL > MaxWallCFL {
		warn("expected sphere speed %.3g cells per step exceeds %g (METHODS.md 10.1)", l.WallCFL, MaxWallCFL)
	}
	for i, s := range c.Spheres {
		if n := s.Radius / l.Dx; n < MinSphereCells {
			warn("sphere[%d] has only %.1f cells per radius, below %g (METHODS.md 10.1)", i+1, n, MinSphereCells)
		}
		// Reynolds number from the container velocity amplitude; the
		// relative amplitude depends on the density contrast (11.1).
		if re := c.Shaking.Amplitude * l.Omega * 2 * s.Radius / l.Nu; re > MaxSphereRe {
			warn("sphere[%d] Reynolds number A omega 2a/nu = %.3g exceeds %g: the flow is likely not axisymmetric (Natarajan & Acrivos 1993; Johnson & Patel 1999)",
				i+1, re, MaxSphereRe)
		}
		// Gaps of METHODS.md 10.1 and 9.5: to the side wall, the end walls
		// and the other spheres.
		if g := (c.Container.Radius - s.Radius) / l.Dx; g < MinGapCells {
			warn("sphere[%d] is %.2f cells from the container wall, below %g (METHODS.md 9.5)", i+1, g, MinGapCells)
		}
		if c.Container.Ends == EndsClosed {
			if g := (c.Container.Length/2 - math.Abs(s.Z) - s.Radius) / l.Dx; g < MinGapCells {
				warn("sphere[%d] is %.2f cells from an end wall, below %g (METHODS.md 9.5)", i+1, g, MinGapCells)
			}
		}
		for j := range i {
			o := c.Spheres[j]
			d := math.Abs(s.Z - o.Z)
			if c.Container.Ends == EndsPeriodic {
				d = math.Min(d, math.Abs(c.Container.Length-d))
			}
			if g := (d - s.Radius - o.Radius) / l.Dx; g < MinGapCells {
				warn("spheres %d and %d are %.2f cells apart, below %g (METHODS.md 9.5)", j+1, i+1, g, MinGapCells)
			}
		}
	}
	c.bodyWarnings(l, warn)
	if l.Levels > 1 {
		c.levelWarnings(l, warn)
	}
	if l.StepsPerPeriod > 0 && c.Run.SamplesPerPeriod > l.StepsPerPeriod {
		warn("run.samples_per_period = %d exceeds the %d steps per period: sampling every step",
			c.Run.SamplesPerPeriod, l.StepsPerPeriod)
	}
	if l.StepsPerPeriod == 0 && c.Run.SampleInterval < l.Dt {
		warn("run.sample_interval = %g s is shorter than the time step %.3g s: sampling every step",
			c.Run.SampleInterval, l.Dt)
	}
	return w
}

// bodyWarnings warns about the coupling of light spheres (METHODS.md 8.1,
// 8.2), fast strokes and arms whose spheres do not start at the prescribed
// distance.
func (c *Case) bodyWarnings(l *Lattice, warn func(format string, args ...any)) {
	rf := c.Fluid.Density
	for i, s := range c.Spheres {
		ratio := s.Density / rf
		switch c.Bodies.Coupling {
		case CouplingExplicit:
			// The explicit update is unstable for ρ_s/ρ_f < C_A by the
			// added-mass argument of METHODS.md 8.1; on the lattice the
			// added mass builds up over several steps and the verification
			// (light-sphere rows) measured failure only below about 0.2 at 8
			// cells per radius, but a light sphere is at risk either way.
			if ratio < AddedMass {
				warn("bodies.coupling = %q may be unstable for sphere[%d]: its density ratio %.3g is below the added-mass coefficient C_A = %g (METHODS.md 8.1; measured failures below about 0.2 at 8 cells per radius); use %q",
					CouplingExplicit, i+1, ratio, AddedMass, CouplingVirtualMass)
			}
		case CouplingVirtualMass:
			// Stable iff C_V > (C_A - ρ_s/ρ_f)/2 (METHODS.md 8.2).
			if need := (AddedMass - ratio) / 2; c.Bodies.VirtualMass <= need {
				warn("bodies.virtual_mass = %g is at or below the stability bound (C_A - rho_s/rho_f)/2 = %.3g of sphere[%d] (METHODS.md 8.2); use %g or more",
					c.Bodies.VirtualMass, need, i+1, DefaultVirtualMass)
			}
		}
	}
	for k, a := range c.Arms {
		si, sj, ok := c.pairSpheres(a.Spheres)
		if !ok {
			continue
		}
		if re := c.strokeSpeed(a) * 2 * math.Max(si.Radius, sj.Radius) / l.Nu; re > MaxSphereRe {
			warn("arm[%d] stroke Reynolds number 2 pi f A 2a/nu = %.3g exceeds %g: the flow is likely not axisymmetric (Natarajan & Acrivos 1993; Johnson & Patel 1999)",
				k+1, re, MaxSphereRe)
		}
		want := c.armStart(a)
		if d := math.Abs(sj.Z - si.Z); math.Abs(d-want) > 1e-6*want {
			sign := 1.0
			if sj.Z < si.Z {
				sign = -1
			}
			warn("arm[%d] prescribes a distance of %.6g m at t = 0 but spheres %d and %d are placed %.6g m apart: the arm sets the distance, so the run does not start from the positions in the file; set sphere[%d].z = %.6g m to make them agree",
				k+1, want, a.Spheres[0], a.Spheres[1], d, a.Spheres[1], si.Z+sign*want)
		}
	}
}

// levelWarnings warns about the levels of a refined lattice: a level below
// the measured floor of tau+ (only with grid.tau given: otherwise the time
// step keeps it), above the grid Reynolds number of the per-level rule
// (benchmarks/taustability), a level that covers all of its parent, and a
// side wall's Stokes layer on a coarse level where the drive acts on the
// liquid.
func (c *Case) levelWarnings(l *Lattice, warn func(format string, args ...any)) {
	ly := l.layout
	if m := c.fineMargin(); m < AccurateFineMargin {
		warn("grid.fine_margin = %g radii of the smallest sphere: steady flow (streaming, settling) reaches the coarser levels; "+
			"the demo on 2 levels swims 5.2%% slow at 2 radii and agrees with the uniform lattice at %g (README, \"Runs on refined levels\"; "+
			"verify -full refined-demo): set grid.fine_margin = %g, or check the speed against a uniform run", m, AccurateFineMargin, AccurateFineMargin)
	}
	for k, lv := range ly.Levels {
		if lv.Tau < MinLevelTau {
			warn("level %d has tau+ = %.5g, below %g, the smallest measured (%s): it may be unstable; raise grid.tau or use fewer levels",
				k, lv.Tau, MinLevelTau, bindingSource)
		}
		if lv.ReGrid > MaxLevelGridRe {
			warn("level %d has a grid Reynolds number of %.3g at the reference speed %.3g m/s, above %g (%s: steady flow along the axis failed from about 60): raise grid.cells_per_radius or use fewer levels (the far field is slower than the reference speed: this is the cautious reading)",
				k, lv.ReGrid, l.RefVelocity, MaxLevelGridRe, bindingSource)
		}
		if k > 0 {
			if b, p := ly.Blocks[k-1], ly.Levels[k-1]; b.Nz == p.Nz && b.Nr == p.Nr {
				warn("level %d covers all of level %d (the fine region with its margins fills it): level %d only adds work; use fewer levels, smaller margins or a larger container",
					k, k-1, k-1)
			}
		}
	}
	if c.Container.Ends == EndsPeriodic && c.Shaken() {
		for k, lv := range ly.Levels {
			if lv.Wall && lv.StokesCells < MinStokesCells {
				warn("the side wall lies on level %d, where its Stokes layer is %.2f cells thick, below %g (METHODS.md 10.1): with periodic ends the drive acts on the liquid and the wall's Stokes layer carries it; use fewer levels or a finer grid",
					k, lv.StokesCells, MinStokesCells)
				break
			}
		}
	}
}
