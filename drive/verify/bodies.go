package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/cases"
	"axiswim/drive"
)

// FreeSphereResponse returns V/U for a free sphere of density ratio s in a
// liquid oscillating with velocity U far away (lab frame), from the
// unsteady Stokes force (CHECKS.md 4c, [D] there from 4a):
//
//	V/U = (-i m + Z)/(-i s m + Z),  Z = (1 + x) - i (x + 2x^2/9),  m = (4/9) x^2,
//
// x = a/delta, in the e^{-i omega t} convention of CHECKS.md (a phase
// arg(V/U) > 0 means the sphere lags the liquid).
func FreeSphereResponse(s, x float64) complex128 {
	z := complex(1+x, -(x + 2*x*x/9))
	m := complex(0, -4*x*x/9) // -i m
	return (m + z) / (complex(s, 0)*m + z)
}

// freeSphereCase is a single sphere of density ratio s in a closed
// container shaken at a/delta = x: a = 1 mm at 8 cells, water-like
// liquid, container radius 5 a (lambda = 0.2) and length 30 a, no
// gravity, amplitude chosen so that the relative motion is 2% of a.
func freeSphereCase(s, x float64) *cases.Case {
	const a, rho, mu = 1e-3, 1000.0, 1e-3
	nu := mu / rho
	delta := a / x
	omega := 2 * nu / (delta * delta)
	rel := cmplx.Abs(FreeSphereResponse(s, x) - 1)
	amp := 0.02 * a / math.Max(rel, 0.05)
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: rho, Viscosity: mu}
	c.Container = cases.Container{Radius: 5 * a, Length: 30 * a, Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{Frequency: omega / (2 * math.Pi), Amplitude: amp, RampPeriods: 1, Gravity: 0}
	c.Spheres = []cases.Sphere{{Radius: a, Density: s * rho, Z: 0.0001 * a}}
	c.Grid.CellsPerRadius = 8
	c.Run.Periods = 5
	c.FillDefaults()
	return c
}

// sphereResponse runs a free-sphere case and returns the fundamental of the
// sphere's displacement relative to the container over the last period,
// divided by that of the drive displacement (e^{+i omega t} convention),
// and the largest relative speed over (A omega).
func sphereResponse(c *cases.Case, threads int) (ratio complex128, vmax float64, err error) {
	sim, err := drive.Setup(c, threads)
	if err != nil {
		return 0, 0, err
	}
	defer sim.Close()
	l := sim.Lattice
	T := l.StepsPerPeriod
	z0, _, _ := sim.SphereState(0)
	var zs, xs complex128
	aw := c.Shaking.Amplitude * 2 * math.Pi * c.Shaking.Frequency
	for n := 0; n < c.Run.Periods*T; n++ {
		if err := sim.Advance(1); err != nil {
			return 0, 0, err
		}
		z, v, _ := sim.SphereState(0)
		vmax = math.Max(vmax, math.Abs(v)/aw)
		if n >= (c.Run.Periods-1)*T {
			t := sim.Time()
			ph := cmplx.Exp(complex(0, -l.Omega*t))
			zs += complex(z-z0, 0) * ph
			xs += complex(sim.Shaker.Displacement(t), 0) * ph
		}
	}
	return zs / xs, vmax, nil
}

func checkFreeSphere(threads int) ([]Row, error) {
	const s, x = 2.0, 2.0
	ratio, _, err := sphereResponse(freeSphereCase(s, x), threads)
	if err != nil {
		return nil, err
	}
	// Relative motion in the container frame: v_rel/U = V/U - 1; our
	// e^{+i omega t} amplitudes are the complex conjugates of CHECKS.md's.
	want := cmplx.Conj(FreeSphereResponse(s, x) - 1)
	cs := fmt.Sprintf("free sphere s=%g a/delta=%g", s, x)
	src := "unsteady Stokes response, CHECKS.md 4c; tol 3% / 3 deg (issue 4), lambda = 0.2"
	rows := []Row{
		relRow(cs, "relative amplitude / A", cmplx.Abs(ratio), cmplx.Abs(want), 0.03, src),
		absRow(cs, "relative phase vs drive (deg)", phaseDeg(ratio, 1), phaseDeg(want, 1), 3, "deg", src),
	}
	_, vmax, err := sphereResponse(freeSphereCase(1, x), threads)
	if err != nil {
		return nil, err
	}
	rows = append(rows, boundRow("free sphere s=1", "max relative speed / (A omega)", vmax, 1e-6,
		"a neutrally buoyant sphere follows the liquid (CHECKS.md 4c, exact)"))
	return rows, nil
}
