package verify

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/drive/model"
)

// threeSphereCase is a three-sphere swimmer of our own at low Reynolds
// number for the rows of Golestanian & Ajdari (2008): equal spheres of
// 0.3 mm on arms of 3 mm (a/L = 0.1) stroking 0.3 mm (d/L = 0.1) at 10 Hz,
// the second arm at phase phi2 (degrees), in a liquid of 1000 kg/m^3 whose
// viscosity makes omega L^2/nu = 1 (stroke Reynolds number 0.01), in a
// closed container of radius rOverL arm lengths and twice as long. The
// time step is set by tau = 2 rather than the default limit tau <= 1: at
// fixed cells the run is 3x shorter, and the speed moves by only -0.8%
// between tau = 1 and 2 (measured: 5.635, 5.592, 5.538 um per period at
// tau = 1, 2, 3.5 in the 2.5 L container at 5 cells per radius, TRT with
// the magic parameter 3/16, which makes steady solutions independent of
// tau: Ginzburg, Verhaeghe & d'Humieres 2008, Commun. Comput. Phys. 3,
// 427, citation from memory). omega L^2/nu = 1 is close enough to the
// quasi-steady limit: 4, 1 and 0.25 give 5.02, 5.59 and 5.64 um per
// period (tau = 2, same container). The ramp is one period; the speed is
// the displacement of the last period over the period (the third period
// moves within 0.1% of the fourth).
func threeSphereCase(rOverL float64, cells int, tau, phi2 float64, periods int) *cases.Case {
	const (
		a, L, d = 0.3e-3, 3e-3, 0.3e-3
		rho, f  = 1000.0, 10.0
	)
	omega := 2 * math.Pi * f
	nu := omega * L * L // omega L^2 / nu = 1
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: rho, Viscosity: nu * rho}
	c.Container = cases.Container{Radius: rOverL * L, Length: 2 * rOverL * L, Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{RampPeriods: 1, Gravity: 0}
	c.Spheres = []cases.Sphere{{Radius: a, Density: rho, Z: -L}, {Radius: a, Density: rho, Z: 0}, {Radius: a, Density: rho, Z: L}}
	c.Arms = []cases.Arm{
		{Spheres: [2]int{1, 2}, Length: L, Amplitude: d, Frequency: f},
		{Spheres: [2]int{2, 3}, Length: L, Amplitude: d, Frequency: f, Phase: phi2},
	}
	c.Grid.CellsPerRadius = cells
	c.Grid.Tau = tau
	c.Run.Periods = periods
	c.FillDefaults()
	return c
}

// lastPeriodSpeed runs c and returns the displacement of the centroid over
// the last period divided by the period.
func lastPeriodSpeed(c *cases.Case, o Options) (float64, error) {
	sim, err := setup(c, o)
	if err != nil {
		return 0, err
	}
	defer sim.Close()
	spp := sim.Lattice.StepsPerPeriod
	if err := sim.Advance(spp * (c.Run.Periods - 1)); err != nil {
		return 0, err
	}
	z0 := sim.Centroid()
	if err := sim.Advance(spp); err != nil {
		return 0, err
	}
	return (sim.Centroid() - z0) / (float64(spp) * sim.Lattice.Dt), nil
}

// threeSphereReference returns the leading-order speed (Golestanian &
// Ajdari 2008; its coefficient derived in model.ThreeSphereSpeed) and the
// chain model's (Rotne-Prager point forces, model.StokesChain) for c.
func threeSphereReference(c *cases.Case) (lead, chain float64, err error) {
	st, err := model.StokesChain(c)
	if err != nil {
		return 0, 0, err
	}
	if len(st) != 1 || st[0].LeadingOrder == nil {
		return 0, 0, fmt.Errorf("the three-sphere case is not one three-sphere swimmer")
	}
	return *st[0].LeadingOrder, st[0].Speed, nil
}

// gaSource is the source of the three-sphere rows.
const gaSource = "V = K d1 d2 omega sin(phi1-phi2), K = (a/6)(1/L1^2+1/L2^2-1/(L1+L2)^2) (Golestanian & Ajdari 2008; K derived, model.ThreeSphereSpeed)"

// tolGA is where the tolerance against the leading order comes from,
// chosen with the rows: the chain model alone is 6.4% above it at
// a/L = d/L = 0.1.
const tolGA = "ours: 15%, room for the leading order's neglect of a/L and d/L (the chain model is 6.4% above it)"

// checkThreeSphere: the quick row of issue 9 at 5 cells per radius in a
// container 2.5 arm lengths in radius (5 across), with tau = 3.5 (the
// speed is 2% below the tau = 1 one there; see threeSphereCase): the
// quarter-period lag swims within 15% of the leading-order speed (the
// chain model, which keeps the finite size of the spheres, is 6.4% above
// it at a/L = d/L = 0.1; the container 5 arm lengths across takes about
// 1%, the coarse spheres and tau a few % more; measured 1.0% above the
// leading order, 8 s per run on 2 cores, over the second period, 0.4%
// above the third); the reversed lag swims
// back at the same speed within 1% (mirror image of the stroke); the arms
// in phase (a reciprocal stroke) move less than 2% of the lagged
// displacement per period (Purcell 1977; zero by the mirror symmetry of
// the stroke).
func checkThreeSphere(o Options) ([]Row, error) {
	const cells, tau, periods = 5, 3.5, 2
	lag := threeSphereCase(2.5, cells, tau, -90, periods)
	lead, _, err := threeSphereReference(lag)
	if err != nil {
		return nil, err
	}
	var u [3]float64
	for i, phi := range []float64{-90, 90, 0} {
		if u[i], err = lastPeriodSpeed(threeSphereCase(2.5, cells, tau, phi, periods), o); err != nil {
			return nil, fmt.Errorf("phase %g: %w", phi, err)
		}
	}
	return []Row{
		withinRel("three-sphere a/L=0.1", "speed, lag -90 deg, R = 2.5 L (m/s)", u[0], lead, 0.15, gaSource, tolGA),
		withinRel("three-sphere a/L=0.1", "speed, lag +90 deg (m/s)", u[1], -u[0], 0.01, "equal and opposite: mirror image of the stroke",
			"ours: 1%, the other errors of the row cancel in the mirror image"),
		atMost("three-sphere a/L=0.1", "in phase: |displacement| / lagged", math.Abs(u[2]/u[0]), 0.02, "reciprocal stroke does not swim (Purcell 1977)",
			"ours: 2% of the lagged displacement, a ceiling (zero by the mirror symmetry of the stroke)"),
	}, nil
}

// checkThreeSphereContainer: the full row of issue 9, at 5 cells per radius
// and tau = 2, in containers 2.5, 5 and 10 arm lengths in radius (5, 10
// and 20 across; 25, 55 and 200 s on 2 cores): the speed within 15% of the
// leading-order formula in the two larger ones, with the trend printed
// (measured 5.587, 5.630 and 5.623 um per period: +0.8% from 2.5 to 5 L,
// -0.1% from 5 to 10 L, so the container no longer matters at 10 arm
// lengths across; 2.3% above the leading order), and, in the largest,
// within 5% of the chain model, which keeps the spheres' finite size
// (measured 3.8% below it: tau = 2 takes about 1%, omega L^2/nu = 1 0.8%
// (5.59 against 5.64 at 0.25, and 5.02 at 4), the coarse spheres the rest).
func checkThreeSphereContainer(o Options) ([]Row, error) {
	var rows []Row
	var last, chainLast float64
	for _, k := range []float64{2.5, 5, 10} {
		c := threeSphereCase(k, 5, 2, -90, 3)
		lead, chain, err := threeSphereReference(c)
		if err != nil {
			return nil, err
		}
		u, err := lastPeriodSpeed(c, o)
		if err != nil {
			return nil, fmt.Errorf("R = %g L: %w", k, err)
		}
		qty := fmt.Sprintf("speed, R = %g L (m/s)", k)
		if k < 5 {
			// the trend only: the container is smaller than 10 arm lengths across
			rows = append(rows, info("three-sphere container", qty, u, lead,
				"the trend: smaller than 10 arm lengths across; against "+gaSource))
		} else {
			rows = append(rows, withinRel("three-sphere container", qty, u, lead, 0.15, gaSource, tolGA))
		}
		last, chainLast = u, chain
	}
	rows = append(rows, withinRel("three-sphere container", "speed, R = 10 L, against chain model", last, chainLast, 0.05,
		"Rotne-Prager point forces, unbounded (model.StokesChain; Rotne & Prager 1969)", "ours: 5%"))
	return rows, nil
}

// checkThreeSphereResolution: the full row's swimmer in the container 10
// arm lengths across at 5, 6 and 8 cells per radius (about 1, 2 and 6 min
// on 2 cores). The speed must rise with the resolution toward the chain
// model (measured 5.630, 5.663, 5.690 um per period; the last periods of
// a 5-period run vary by 0.1% at 5 cells, 0.04% at 8), and its Richardson
// extrapolation from 6 and 8 cells at second order (the order of the
// scheme; the three values give 2 to 4 within that scatter) must lie
// within 3% of the chain model: measured 5.725 against 5.848 (2.1% below),
// of which omega L^2/nu = 1 accounts for 0.8%; the rest is the lattice's
// tau = 2 and the model's own neglect of the spheres' higher multipoles.
func checkThreeSphereResolution(o Options) ([]Row, error) {
	cells := []int{5, 6, 8}
	u := make([]float64, len(cells))
	var chain float64
	for i, n := range cells {
		c := threeSphereCase(5, n, 2, -90, 3)
		_, ch, err := threeSphereReference(c)
		if err != nil {
			return nil, err
		}
		chain = ch
		if u[i], err = lastPeriodSpeed(c, o); err != nil {
			return nil, fmt.Errorf("%d cells per radius: %w", n, err)
		}
	}
	const rise = "rises toward the chain model (model.StokesChain)"
	rows := []Row{info("three-sphere resolution", fmt.Sprintf("speed, %d cells per radius (m/s)", cells[0]), u[0], chain,
		"the coarsest; the chain model in the reference column")}
	for i := 1; i < len(cells); i++ {
		rows = append(rows, atLeast("three-sphere resolution", fmt.Sprintf("speed, %d cells per radius (m/s)", cells[i]), u[i], u[i-1],
			rise, fmt.Sprintf("monotone: at least the speed at %d cells", cells[i-1])))
	}
	h6, h8 := 1/6.0, 1/8.0
	extra := u[2] + (u[2]-u[1])*h8*h8/(h6*h6-h8*h8)
	return append(rows, withinRel("three-sphere resolution", "Richardson (6, 8 cells, 2nd order) (m/s)", extra, chain, 0.03,
		"Rotne-Prager chain model (model.StokesChain); omega L^2/nu = 1 alone takes 0.8%", "ours: 3%")), nil
}
