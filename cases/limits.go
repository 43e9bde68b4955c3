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

// referenceSpeed is the speed scale U of the Mach limit (METHODS.md 10.1,
// 11.2 step 3): the largest of the container velocity amplitude A ω, the
// Stokes settling speed of each sphere when gravity is on, and, for
// periodic ends with gravity, the Hagen–Poiseuille centre speed g R²/(4ν)
// of the column falling freely through the pipe.
func (c *Case) referenceSpeed(nu float64) float64 {
	u := c.Shaking.Amplitude * 2 * math.Pi * c.Shaking.Frequency
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
// the container: the inviscid relative amplitude A |ρ_s - ρ_f|/(ρ_s + ρ_f/2)
// (METHODS.md 11.1, added mass C_A = 1/2) times ω, plus the settling
// speed. It is 0 without spheres.
func (c *Case) wallSpeed() float64 {
	omega := 2 * math.Pi * c.Shaking.Frequency
	rf := c.Fluid.Density
	v := 0.0
	for _, s := range c.Spheres {
		rel := c.Shaking.Amplitude * math.Abs(s.Density-rf) / (s.Density + rf/2)
		v = math.Max(v, rel*omega+c.stokesSpeed(s))
	}
	return v
}

// timeStepConflict explains why no time step satisfies the limits, as a
// Problem on the resolution key. Both the Mach and the acoustic bound on
// ν_L grow in proportion to 1/Δx (see Resolve), so refining the grid by
// nuMin/upper clears them.
func (c *Case) timeStepConflict(conflicts []string, nuMin, upper float64) error {
	factor := nuMin / upper * 1.02 // a margin for the rounding of Nr and of the steps
	p := Problem{
		Reason: fmt.Sprintf("no admissible time step: %s, below the floor nu_L >= %.3g (tau >= %g, METHODS.md 10.1)",
			strings.Join(conflicts, " and "), nuMin, MinTau),
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
		p.Fix += ", or lower the reference speed (shaking amplitude or frequency)"
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
		if l.Tau < MinTau {
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
