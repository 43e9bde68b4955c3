package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/cases"
)

// checkShakenClosed runs the embedded shaken-cell case (a closed container
// shaken with no sphere) through the driver for two periods past its ramp.
// The frame force is absorbed into the modified pressure, so the liquid
// must stay at rest: CHECKS.md 2d asks for a residual speed of at most
// 1e-6 of A omega.
func checkShakenClosed(o Options) ([]Row, error) {
	c, err := cases.ParseExample("shaken-cell")
	if err != nil {
		return nil, err
	}
	c.Run.Periods = 3
	sim, err := setup(c, o)
	if err != nil {
		return nil, err
	}
	defer sim.Close()
	l := sim.Lattice
	var umax float64
	per := l.StepsPerPeriod / 8
	for n := 0; n < 8*3; n++ {
		if err := sim.Advance(per); err != nil {
			return nil, err
		}
		umax = math.Max(umax, sim.Observe().MaxSpeed)
	}
	aw := c.Shaking.Amplitude * 2 * math.Pi * c.Shaking.Frequency
	return []Row{atMost("shaken closed cell", "max liquid speed / (A omega)", umax/aw, 1e-6,
		"rest in the container frame (modified pressure)", "CHECKS.md 2d")}, nil
}

// checkShakenPeriodic shakes a periodic tube with no sphere: the frame force
// then acts on the liquid, and the flow relative to the wall is Womersley
// flow driven by rho A omega^2 sin(omega t) (CHECKS.md 2d). The case is
// chosen at alpha = R sqrt(omega/nu) = 4 with R = 20 cells.
func checkShakenPeriodic(o Options) ([]Row, error) {
	const (
		rho, mu = 1000.0, 0.004 // nu = 4e-6 m^2/s
		R       = 0.002         // m
		alpha   = 4.0
	)
	nu := mu / rho
	omega := alpha * alpha * nu / (R * R)
	f := omega / (2 * math.Pi)
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: rho, Viscosity: mu}
	c.Container = cases.Container{Radius: R, Length: 2 * R / 20, Ends: cases.EndsPeriodic}
	c.Shaking = cases.Shaking{Frequency: f, Amplitude: 1e-4, RampPeriods: 0, Gravity: 0}
	c.Grid = cases.Grid{CellSize: R / 20, Tau: 0.8}
	c.Run.Periods = 1
	c.FillDefaults()
	sim, err := setup(c, o)
	if err != nil {
		return nil, err
	}
	defer sim.Close()
	l := sim.Lattice
	// settle 12 viscous times, a whole number of periods
	settle := int(12*R*R/nu/l.Dt/float64(l.StepsPerPeriod)+1) * l.StepsPerPeriod
	if err := sim.Advance(settle); err != nil {
		return nil, err
	}
	w := Womersley{R: R, Nu: nu, Omega: 2 * math.Pi / (float64(l.StepsPerPeriod) * l.Dt),
		G0: rho * c.Shaking.Amplitude * omega * omega, Rho: rho}
	var uc complex128
	for n := 0; n < l.StepsPerPeriod; n++ {
		o := sim.Observe()
		fl := sim.Fields()
		u := l.VelocitySI(fl.Uz[fl.At(0, 0)])
		uc += complex(u, 0) * cmplx.Exp(complex(0, -w.Omega*o.Time))
		if err := sim.Advance(1); err != nil {
			return nil, err
		}
	}
	uc *= complex(2/float64(l.StepsPerPeriod), 0)
	// drive sin(omega t) = cos(omega t - pi/2): amplitude -i V
	want := -1i * w.Velocity(l.Dx/2)
	cs := fmt.Sprintf("shaken periodic tube a=%g", alpha)
	return []Row{
		withinRel(cs, "|u| at r=dx/2 (cell frame)", cmplx.Abs(uc), cmplx.Abs(want), 0.01, srcWom, tolWom),
		within(cs, "phase of u vs drive (deg)", phaseDeg(uc, 1), phaseDeg(want, 1), 1, "deg", srcWom, tolWom),
	}, nil
}
