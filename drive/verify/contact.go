package verify

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/drive"
)

// bounceCase is a glass-like sphere of our own (radius 0.5 mm, density
// 2500 kg/m^3, 8 cells per radius) released at rest with its surface
// 4.5 mm above the bottom end of a closed container (radius 4 mm, 16 mm
// long) in a liquid of density 1000 and viscosity mu, under gravity; the
// contact with the end wall is the short-range repulsion of the given
// range (cells).
func bounceCase(mu, rangeCells, duration float64) *cases.Case {
	const a = 0.5e-3
	return settleCase(mu, 16e-3, rangeCells, duration, cases.Sphere{Radius: a, Density: 2500, Z: -8e-3 + a + 4.5e-3})
}

// settleCase is spheres settling under gravity in a closed container of
// radius 4 mm and the given length, in a liquid of density 1000 and
// viscosity mu, at 8 cells per radius of the smallest, with the repulsion
// of the given range (cells), for duration seconds.
func settleCase(mu, length, rangeCells, duration float64, spheres ...cases.Sphere) *cases.Case {
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: 1000, Viscosity: mu}
	c.Container = cases.Container{Radius: 4e-3, Length: length, Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{Gravity: 9.81}
	c.Spheres = spheres
	c.Bodies.RepulsionRange = rangeCells
	c.Grid.CellsPerRadius = 8
	c.Run.Duration = duration
	c.FillDefaults()
	return c
}

// bounce runs c and returns the impact speed (the largest downward speed
// before the first rebound), the rebound speed (the largest upward speed
// of that rebound) and the Stokes number St = rho_s U (2a) / (9 mu) of the
// impact (impactStokes with the sphere's own mass and radius).
func bounce(c *cases.Case, o Options) (impact, rebound, st float64, err error) {
	impact, rebound, err = firstRebound(c, o, func(sim *drive.Simulation) float64 {
		_, v, _ := sim.SphereState(0)
		return v // the gap to the wall below changes at the sphere's speed
	})
	if err != nil {
		return 0, 0, 0, err
	}
	s := c.Spheres[0]
	return impact, rebound, impactStokes(c, sphereMass(s), s.Radius, impact), nil
}

// firstRebound runs c and follows the rate of change of a gap, rate: it
// returns the largest closing speed before the gap first opens again and
// the largest opening speed while it does, stopping there.
func firstRebound(c *cases.Case, o Options, rate func(*drive.Simulation) float64) (impact, rebound float64, err error) {
	sim, err := setup(c, o)
	if err != nil {
		return 0, 0, err
	}
	defer sim.Close()
	steps := int(math.Ceil(c.Run.Duration / sim.Lattice.Dt))
	up := false
	for n := 0; n < steps; n++ {
		if err := sim.Advance(1); err != nil {
			return 0, 0, fmt.Errorf("step %d: %w", n, err)
		}
		w := rate(sim)
		switch {
		case !up && w > 0 && impact > 0:
			up = true
		case !up:
			impact = math.Max(impact, -w)
		case w <= 0: // the first rebound is over
			return impact, rebound, nil
		default:
			rebound = math.Max(rebound, w)
		}
	}
	return impact, rebound, nil
}

// impactStokes is the Stokes number m U / (6 pi mu a^2) of an impact at
// speed U with mass m and radius a (for two spheres their reduced mass and
// radius): rho_s U (2a) / (9 mu) for one sphere on a wall.
func impactStokes(c *cases.Case, m, a, u float64) float64 {
	return m * u / (6 * math.Pi * c.Fluid.Viscosity * a * a)
}

// sphereMass is the mass of sphere s, kg.
func sphereMass(s cases.Sphere) float64 {
	return s.Density * 4 * math.Pi / 3 * s.Radius * s.Radius * s.Radius
}

// pairCase is a sphere of radius 0.5 mm falling onto one of 0.35 mm
// (both of density 2500 kg/m^3, 8 cells per radius of the smaller) that
// falls more slowly ahead of it, 2 mm below, in a closed container of
// radius 4 mm and 40 mm long: the larger one catches up and they collide
// in the liquid (viscosity 0.0049 Pa s) through the repulsion of the
// given range, as the spheres of two swimmers do.
func pairCase(rangeCells, duration float64) *cases.Case {
	const a1, a2 = 0.35e-3, 0.5e-3
	return settleCase(0.0049, 40e-3, rangeCells, duration,
		cases.Sphere{Radius: a1, Density: 2500, Z: 10e-3}, cases.Sphere{Radius: a2, Density: 2500, Z: 10e-3 + a1 + a2 + 2e-3})
}

// pairBounce runs c and returns the largest approach speed of the upper
// sphere on the lower before they first separate, the largest separation
// speed while they do (the repulsion then holds them about 3.6 cells
// apart as they fall together), and the Stokes number of the impact on
// the reduced mass and radius, m_r = m1 m2/(m1 + m2), a_r = a1 a2/(a1 + a2)
// (the wall's St when one sphere is infinitely large).
func pairBounce(c *cases.Case, o Options) (impact, rebound, st float64, err error) {
	impact, rebound, err = firstRebound(c, o, func(sim *drive.Simulation) float64 {
		_, v0, _ := sim.SphereState(0)
		_, v1, _ := sim.SphereState(1)
		return v1 - v0 // sphere 2 is above sphere 1
	})
	if err != nil {
		return 0, 0, 0, err
	}
	s1, s2 := c.Spheres[0], c.Spheres[1]
	m1, m2 := sphereMass(s1), sphereMass(s2)
	return impact, rebound, impactStokes(c, m1*m2/(m1+m2), s1.Radius*s2.Radius/(s1.Radius+s2.Radius), impact), nil
}

// checkContact measures the effective restitution of a contact in the
// liquid (issue 9: documented, measured): the sphere of bounceCase
// settles onto the end wall at two viscosities (impact Stokes numbers
// about 4.2 and 0.7) with repulsion_range = 4 cells (the default 2 lets
// this impact close the gap below one cell, and the run stops there with
// its explanation; README, Contacts). The coefficient e = rebound speed /
// impact speed must be below 1 (a passive contact cannot return more
// energy than it received: the repulsion is conservative and the liquid
// dissipates) and rise with St (as in experiments): those are checks. The
// values set beside the experiments, where spheres do not rebound below St
// of about 10, are known disagreements (printed KNOWN, never a pass, until
// the contact physics is fixed; Joseph, Zenit, Hunt & Rosenwinkel 2001, J. Fluid Mech. 433, 329;
// Gondret, Lance & Petit 2002, Phys. Fluids 14, 643: from memory, not
// checked against the papers): measured e = 0.54 at St = 4.2 and 0.18 at
// St = 0.72, so contacts here are too elastic at moderate St (the
// unresolved lubrication film below a cell, and a conservative force
// where the real film dissipates). Two spheres, as those of two swimmers
// meet (pairCase: the larger catching up with the smaller as they settle),
// give e = 0.53 at St = 2.4 on the reduced mass and radius: below 1, and
// as much too elastic (sphere-sphere experiments, Yang & Hunt 2006, from
// memory, show the same St ~ 10 threshold).
func checkContact(o Options) ([]Row, error) {
	var e, st [2]float64
	for i, mu := range []float64{0.0049, 0.0147} {
		u, r, s, err := bounce(bounceCase(mu, 4, 0.15), o)
		if err != nil {
			return nil, fmt.Errorf("mu = %g: %w", mu, err)
		}
		if !(u > 0) {
			return nil, fmt.Errorf("mu = %g: the sphere did not fall", mu)
		}
		e[i], st[i] = r/u, s
	}
	u, r, stPair, err := pairBounce(pairCase(4, 0.15), o)
	if err != nil {
		return nil, fmt.Errorf("sphere pair: %w", err)
	}
	if !(u > 0) {
		return nil, fmt.Errorf("sphere pair: the spheres did not approach")
	}
	ePair := r / u
	const (
		passive = "passive contact: e < 1 (the repulsion is conservative, the liquid dissipates)"
		reason  = "too elastic: the lubrication film below a cell is unresolved and the repulsion conserves the energy the real film dissipates"
		wallSrc = "experiments: no rebound below St ~ 10 (Joseph, Zenit, Hunt & Rosenwinkel 2001, J. Fluid Mech. 433, 329; Gondret, Lance & Petit 2002, Phys. Fluids 14, 643; from memory)"
		pairSrc = "experiments: no rebound below St ~ 10 (Yang & Hunt 2006, J. Fluid Mech. 559, 43; from memory)"
	)
	rows := []Row{
		atMost("contact with end wall", fmt.Sprintf("restitution e, St = %.2g", st[0]), e[0], 1, passive, "physics: e <= 1"),
		atMost("contact with end wall", fmt.Sprintf("restitution e, St = %.2g", st[1]), e[1], e[0],
			"e rises with St (as in experiments)", fmt.Sprintf("monotone: at most e at St = %.2g", st[0])),
	}
	for i := range e {
		rows = append(rows, disagreement("contact with end wall", fmt.Sprintf("e against experiment, St = %.2g", st[i]),
			e[i], 0, "abs", reason, wallSrc))
	}
	rows = append(rows,
		atMost("contact of two spheres", fmt.Sprintf("restitution e, St = %.2g", stPair), ePair, 1, passive, "physics: e <= 1"),
		disagreement("contact of two spheres", fmt.Sprintf("e against experiment, St = %.2g", stPair), ePair, 0, "abs", reason, pairSrc))
	return rows, nil
}
