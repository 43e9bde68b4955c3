package cases

import "math"

// SphereGroups are the dimensionless groups of one sphere (METHODS.md
// 11.1).
//
// A is the displacement amplitude of the container (shaking.amplitude),
// not the amplitude of the sphere relative to the liquid: that depends on
// the density contrast (in the inviscid limit about
// A |ρ_s - ρ_f|/(ρ_s + ρ_f/2), METHODS.md 11.1) and is an outcome of the
// run. Groups built from A are therefore upper-bound scales, exact only
// for a sphere held fixed in the laboratory frame.
type SphereGroups struct {
	Sphere  int     `json:"sphere"`  // 1-based index
	Epsilon float64 `json:"epsilon"` // amplitude ratio A/a
	M2      float64 `json:"m2"`      // frequency parameter ω a²/ν (Womersley number squared)
	Re      float64 `json:"re"`      // oscillatory Reynolds number A ω a/ν = ε M²
	ReS     float64 `json:"re_s"`    // streaming Reynolds number A² ω/ν = ε² M²
	// Delta is the Stokes-layer thickness √(2ν/ω) in metres, and
	// DeltaCells the same in cells of the lattice. Both are 0 without
	// shaking, and DeltaCells is 0 when no lattice is given.
	Delta      float64 `json:"stokes_layer_m"`
	DeltaCells float64 `json:"stokes_layer_cells"`
}

// Groups returns the groups of every sphere of c. l may be nil; it is used
// only for DeltaCells.
func (c *Case) Groups(l *Lattice) []SphereGroups {
	nu := c.Fluid.Viscosity / c.Fluid.Density
	omega := 2 * math.Pi * c.Shaking.Frequency
	A := c.Shaking.Amplitude
	var delta float64
	if omega > 0 {
		delta = math.Sqrt(2 * nu / omega)
	}
	gs := make([]SphereGroups, len(c.Spheres))
	for i, s := range c.Spheres {
		a := s.Radius
		g := SphereGroups{
			Sphere:  i + 1,
			Epsilon: A / a,
			M2:      omega * a * a / nu,
			Re:      A * omega * a / nu,
			ReS:     A * A * omega / nu,
			Delta:   delta,
		}
		if l != nil && l.Dx > 0 {
			g.DeltaCells = delta / l.Dx
		}
		gs[i] = g
	}
	return gs
}

// ArmGroups are the dimensionless groups of one arm's stroke, with a the
// larger radius of its two spheres, d its amplitude, L its mean length and
// ω its angular frequency.
type ArmGroups struct {
	Arm      int     `json:"arm"`      // 1-based index
	DOverA   float64 `json:"d_over_a"` // stroke amplitude over the radius
	Re       float64 `json:"re"`       // stroke Reynolds number a d ω/ν
	Unsteady float64 `json:"unsteady"` // ω L²/ν: below about 1 the flow over the arm is quasi-steady
	// Delta is the Stokes-layer thickness √(2ν/ω) of the stroke in metres,
	// DeltaCells the same in cells (0 when no lattice is given).
	Delta      float64 `json:"stokes_layer_m"`
	DeltaCells float64 `json:"stokes_layer_cells"`
}

// ArmGroups returns the groups of every arm of c (none without arms). l
// may be nil; it is used only for DeltaCells.
func (c *Case) ArmGroups(l *Lattice) []ArmGroups {
	nu := c.Fluid.Viscosity / c.Fluid.Density
	var gs []ArmGroups
	for k, arm := range c.Arms {
		f := arm.Frequency
		if f == 0 {
			f = c.Shaking.Frequency
		}
		omega := 2 * math.Pi * f
		a := 0.0
		for _, s := range arm.Spheres {
			if s >= 1 && s <= len(c.Spheres) {
				a = math.Max(a, c.Spheres[s-1].Radius)
			}
		}
		g := ArmGroups{Arm: k + 1, Re: a * arm.Amplitude * omega / nu, Unsteady: omega * arm.Length * arm.Length / nu}
		if a > 0 {
			g.DOverA = arm.Amplitude / a
		}
		if omega > 0 {
			g.Delta = math.Sqrt(2 * nu / omega)
		}
		if l != nil && l.Dx > 0 {
			g.DeltaCells = g.Delta / l.Dx
		}
		gs = append(gs, g)
	}
	return gs
}

// Shaken reports whether the container of c is shaken (a frequency and a
// nonzero amplitude): only then do the groups of Groups describe the case.
// In a run's summary it shows as a positive streaming Reynolds number.
func (c *Case) Shaken() bool {
	return c.Shaking.Frequency > 0 && c.Shaking.Amplitude != 0
}
