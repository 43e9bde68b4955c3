package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/cases"
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
func sphereResponse(c *cases.Case, o Options) (ratio complex128, vmax float64, err error) {
	sim, err := setup(c, o)
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

func checkFreeSphere(o Options) ([]Row, error) {
	const s, x = 2.0, 2.0
	ratio, _, err := sphereResponse(freeSphereCase(s, x), o)
	if err != nil {
		return nil, err
	}
	// Relative motion in the container frame: v_rel/U = V/U - 1; our
	// e^{+i omega t} amplitudes are the complex conjugates of CHECKS.md's.
	want := cmplx.Conj(FreeSphereResponse(s, x) - 1)
	cs := fmt.Sprintf("free sphere s=%g a/delta=%g", s, x)
	src := "unsteady Stokes response, CHECKS.md 4c; lambda = 0.2"
	rows := []Row{
		withinRel(cs, "relative amplitude / A", cmplx.Abs(ratio), cmplx.Abs(want), 0.03, src, "issue 4: 3%"),
		within(cs, "relative phase vs drive (deg)", phaseDeg(ratio, 1), phaseDeg(want, 1), 3, "deg", src, "issue 4: 3 deg"),
	}
	_, vmax, err := sphereResponse(freeSphereCase(1, x), o)
	if err != nil {
		return nil, err
	}
	rows = append(rows, atMost("free sphere s=1", "max relative speed / (A omega)", vmax, 1e-6,
		"a neutrally buoyant sphere follows the liquid (CHECKS.md 4c, exact)",
		"CHECKS.md 9: s = 1 exact, as 1e-6 of A omega (the shaken cell's rest tolerance, CHECKS.md 2d)"))
	return rows, nil
}

// lightSphereCase is a sphere of density ratio s (a = 1 mm, 8 cells) in
// a closed container 5 mm in radius and 30 mm long, shaken at 10 Hz with
// amplitude 0.2 mm and rising under gravity (at s = 0.5 the Stokes rise
// speed is 22 mm/s, Re about 0.9), for two periods.
func lightSphereCase(s float64, coupling string) *cases.Case {
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: 1000, Viscosity: 0.05}
	c.Container = cases.Container{Radius: 5e-3, Length: 30e-3, Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{Frequency: 10, Amplitude: 0.2e-3, RampPeriods: 0.5, Gravity: 9.81}
	c.Spheres = []cases.Sphere{{Radius: 1e-3, Density: 1000 * s, Z: -8e-3}}
	c.Grid.CellsPerRadius = 8
	c.Bodies.Coupling = coupling
	c.Run.Periods = 2
	c.FillDefaults()
	return c
}

// lightRun runs a light-sphere case; ok is false if the coupling failed
// (the run stopped on the sphere-speed guard or produced NaN). zeta is the
// immediate reaction coefficient of the sphere's links and vol its volume.
func lightRun(s float64, coupling string, o Options) (ok bool, vmax, zeta, vol float64, err error) {
	c := lightSphereCase(s, coupling)
	sim, err := setup(c, o)
	if err != nil {
		return false, 0, 0, 0, err
	}
	defer sim.Close()
	a := c.Spheres[0].Radius / sim.Lattice.Dx
	vol = 4.0 / 3 * math.Pi * a * a * a
	zeta = sim.Fluid.BoundaryReaction(0)
	n := c.Run.Periods * sim.Lattice.StepsPerPeriod
	for i := 0; i < n; i++ {
		if err := sim.Advance(1); err != nil {
			return false, vmax, zeta, vol, nil
		}
		_, v, _ := sim.SphereState(0)
		if math.IsNaN(v) {
			return false, vmax, zeta, vol, nil
		}
		vmax = math.Max(vmax, math.Abs(v))
	}
	return true, vmax, zeta, vol, nil
}

// checkLightSphere: light spheres with the virtual-mass scheme stay stable
// (density ratio 0.5 rising and oscillating, and 0.1); plain explicit
// coupling fails where theory says it must.
//
// Which theory: the link force of a step reacts at once to the wall
// velocity of that step through the moving-wall terms, F = F0 - zeta V
// (Ladd & Verberg 2001; METHODS.md 8.4), so the explicit update is unstable
// when zeta/m > 2, i.e. below the density ratio s* = zeta/(2 rho_f Vol),
// about 0.1 at 8 cells per radius (zeta is measured from the links). The
// added-mass argument of METHODS.md 8.1 (unstable below s = C_A = 1/2)
// assumes the whole added mass reacts within one step; on the lattice it
// builds up over the acoustic time a/c_s (14 steps here), and explicit
// coupling was measured stable at s = 0.2 to 0.5 for these two periods, so
// the rows test the threshold that applies: explicit coupling fails at
// 0.7 s* and runs at 4 s*. (Between s* and about 2.5 s* it was measured to
// fail too: the Galilean-invariant term, the refilled nodes and the part of
// the added mass that reacts within a few steps add to zeta; the simple
// criterion is a lower bound.) The virtual-mass scheme, whose mass m + m_V
// puts zeta/(m + m_V) far below 2, runs at 0.5 and at 0.1.
func checkLightSphere(o Options) ([]Row, error) {
	src := "virtual mass (Schwarz, Kempe & Froehlich 2015); explicit threshold zeta/m = 2 (Ladd & Verberg 2001)"
	var rows []Row
	okVM, vmax, zeta, vol, err := lightRun(0.5, cases.CouplingVirtualMass, o)
	if err != nil {
		return nil, err
	}
	// The Stokes rise speed 2 (rho_f - rho_s) g a^2/(9 mu) bounds the mean
	// rise; the oscillation adds at most about A omega.
	bound := 2*500*9.81*1e-6/(9*0.05) + 0.2e-3*2*math.Pi*10
	rows = append(rows,
		within("light sphere s=0.5", "virtual mass: run completes (1 = yes)", yes(okVM), 1, 0, "yes", src,
			"the run must complete"),
		atMost("light sphere s=0.5", "virtual mass: max |v| / (Stokes rise + A omega)", vmax/bound, 1.2, src,
			"ours: a 20% margin on that upper estimate"))
	sStar := zeta / (2 * vol)
	for _, c := range []struct {
		s        float64
		coupling string
		want     bool
	}{
		{0.1, cases.CouplingVirtualMass, true},
		{4 * sStar, cases.CouplingExplicit, true},
		{0.7 * sStar, cases.CouplingExplicit, false},
	} {
		ok, _, _, _, err := lightRun(c.s, c.coupling, o)
		if err != nil {
			return nil, err
		}
		verb := "completes"
		if !c.want {
			verb = "fails"
		}
		rows = append(rows, within(fmt.Sprintf("light sphere s=%.3g", c.s),
			fmt.Sprintf("%s: run %s (1 = yes; s* = %.3g)", c.coupling, verb, sStar),
			yes(ok == c.want), 1, 0, "yes", src, "the outcome the threshold predicts, exactly"))
	}
	return rows, nil
}
