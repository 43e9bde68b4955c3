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
