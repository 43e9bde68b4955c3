package verify

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/drive"
)

// twoSphereCase is a cheap two-sphere swimmer of our own for the
// verification rows: spheres of 0.7 mm and 0.5 mm (7 and 5 cells), centres
// 2.2 mm apart on a spring, in a closed container 3.5 mm in radius and
// 21 mm long, shaken with amplitude amp at a frequency set by M^2 of the
// large sphere for the given kinematic viscosity-to-be (the liquid's
// viscosity is chosen to make M^2 = m2). Densities rho1, rho2 against a
// liquid of 1000 kg/m^3; no gravity (it would only stretch the spring).
func twoSphereCase(m2, amp, rho1, rho2, stiffness float64, periods int) *cases.Case {
	const (
		a1, a2 = 0.7e-3, 0.5e-3
		rho    = 1000.0
		f      = 20.0 // Hz
	)
	omega := 2 * math.Pi * f
	nu := omega * a1 * a1 / m2
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: rho, Viscosity: nu * rho}
	c.Container = cases.Container{Radius: 5 * a1, Length: 30 * a1, Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{Frequency: f, Amplitude: amp, RampPeriods: 1, Gravity: 0}
	c.Spheres = []cases.Sphere{{Radius: a1, Density: rho1, Z: -1.1e-3}, {Radius: a2, Density: rho2, Z: 1.1e-3}}
	c.Springs = []cases.Spring{{Spheres: [2]int{1, 2}, Stiffness: stiffness, RestLength: 2.2e-3}}
	c.Grid.CellsPerRadius = 5
	c.Run.Periods = periods
	c.FillDefaults()
	return c
}

// swim runs a case and returns the stroboscopic centroids (index 0 at the
// start), the stroke amplitude (half the range of the spring extension
// over the last period) and the period.
func swim(c *cases.Case, threads int) (cent []float64, stroke, T float64, err error) {
	sim, err := drive.Setup(c, threads)
	if err != nil {
		return nil, 0, 0, err
	}
	defer sim.Close()
	spp := sim.Lattice.StepsPerPeriod
	cent = []float64{sim.Centroid()}
	lo, hi := math.Inf(1), math.Inf(-1)
	for p := 0; p < c.Run.Periods; p++ {
		for n := 0; n < spp; n++ {
			if err := sim.Advance(1); err != nil {
				return nil, 0, 0, err
			}
			if p == c.Run.Periods-1 {
				e := sim.SpringExtension(0)
				lo, hi = math.Min(lo, e), math.Max(hi, e)
			}
		}
		cent = append(cent, sim.Centroid())
	}
	return cent, 0.5 * (hi - lo), float64(spp) * sim.Lattice.Dt, nil
}

// checkScallop: the reciprocal limit. The same swimmer in ever more viscous
// liquid (M^2 = 1, 0.3, 0.1) must swim ever less per period relative to
// its stroke, toward zero (Purcell 1977, Am. J. Phys. 45, 3: no net motion
// for a reciprocal stroke without inertia), with a power-law exponent
// above 0.5 (weak-inertia theory expects about 1 or more: Lauga 2007,
// Phys. Fluids 19, 061703; Gonzalez-Rodriguez & Lauga 2009, CHECKS.md
// 8.2-8.3 [C abstracts]).
func checkScallop(threads int) ([]Row, error) {
	m2s := []float64{1, 0.3, 0.1}
	var ratio []float64
	var rows []Row
	for _, m2 := range m2s {
		c := twoSphereCase(m2, 0.35e-3, 1500, 600, 0.02, 8)
		cent, stroke, _, err := swim(c, threads)
		if err != nil {
			return nil, fmt.Errorf("M^2=%g: %w", m2, err)
		}
		P := len(cent) - 1
		perPeriod := math.Abs(cent[P]-cent[P-2]) / 2
		ratio = append(ratio, perPeriod/stroke)
	}
	mono := ratio[0] > ratio[1] && ratio[1] > ratio[2]
	// least-squares slope of log(ratio) against log(M^2)
	var sx, sy, sxx, sxy float64
	for i, m2 := range m2s {
		x, y := math.Log(m2), math.Log(ratio[i])
		sx, sy, sxx, sxy = sx+x, sy+y, sxx+x*x, sxy+x*y
	}
	n := float64(len(m2s))
	slope := (n*sxy - sx*sy) / (n*sxx - sx*sx)
	for i, m2 := range m2s {
		rows = append(rows, Row{Case: "scallop limit", Quantity: fmt.Sprintf("displacement/period / stroke, M^2=%g", m2),
			Computed: ratio[i], Error: ratio[i], Tolerance: math.Inf(1), Unit: "info",
			Source: "falls monotonically toward 0 (Purcell 1977)", Pass: mono})
	}
	rows = append(rows, Row{Case: "scallop limit", Quantity: "power-law exponent in M^2", Computed: slope,
		Reference: 0.5, Error: slope, Tolerance: 0.5, Unit: "min",
		Source: "> 0.5; weak-inertia theory ~1 or more (Lauga 2007; CHECKS.md 8.2-8.3)", Pass: slope > 0.5 && mono})
	return rows, nil
}

// checkSymmetric: two identical spheres placed symmetrically about the
// container's centre cannot swim: the mirror z -> -z maps the swimmer onto
// itself with the drive reversed, and in the periodic state a reversed
// drive is the same drive half a period later, so the mean velocity is
// exactly zero. At most 1e-9 of A omega (round-off and the decay of the
// start-up transient).
func checkSymmetric(threads int) ([]Row, error) {
	c := twoSphereCase(1, 0.35e-3, 1500, 1500, 0.02, 8)
	c.Spheres[1].Radius = c.Spheres[0].Radius
	c.Spheres[0].Z, c.Spheres[1].Z = -1.4e-3, 1.4e-3
	c.Springs[0].RestLength = 2.8e-3
	c.Grid.CellsPerRadius = 7
	cent, _, T, err := swim(c, threads)
	if err != nil {
		return nil, err
	}
	P := len(cent) - 1
	u := (cent[P] - cent[P-2]) / (2 * T)
	aw := c.Shaking.Amplitude * 2 * math.Pi * c.Shaking.Frequency
	return []Row{boundRow("identical spheres, symmetric", "|mean velocity| / (A omega)", math.Abs(u)/aw, 1e-9,
		"mirror symmetry: no swimming (CHECKS.md 8, Felderhof 2016)")}, nil
}
