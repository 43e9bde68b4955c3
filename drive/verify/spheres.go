package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/drive"
	"axiswim/geometry"
	"axiswim/lbm"
)

// Source labels of the moving-sphere rows.
const (
	srcUniform = "uniform pressure exerts no force (ring weights at link midpoints, METHODS.md 7.4)"
	srcHS      = "Haberman & Sayre 1958 wall factor [M coefficients]"
	srcBohlin  = "Bohlin 1960 series [M coefficients]"
	srcNoise   = "force smoothness requirement"
	srcMass    = "mass conservation requirement"
	srcStokesO = "Stokes 1851 / Landau & Lifshitz §24 prob. 5"
)

// Where the tolerances of the moving-sphere rows come from.
const (
	tolUniform = "round-off: the ring-weighted link sum cancels to 1e-12 of the drag"
	tolWall    = "CHECKS.md 3b/9"
	tolNoise   = "issue 3: rms <= 2% of mean"
	tolMass    = "issue 3: <= 1e-6 per 1e4 steps"
	tolStokesO = "CHECKS.md 4d/9"
	tolWake    = "CHECKS.md 5b/9"
)

// tube makes a closed axisymmetric tube of nz x nr nodes holding one sphere
// of radius a centred at z0, with wall velocity v.
func tube(nz, nr int, tau, z0, a, v float64, o Options) (*lbm.Solver, *drive.Bodies, error) {
	fl, err := lbm.New(lbm.Config{Nz: nz, Nr: nr, Tau: tau, Axisymmetric: true, Threads: o.Threads, Single: o.Single})
	if err != nil {
		return nil, nil, err
	}
	bs, err := drive.NewBodies(fl, []geometry.Sphere{{Z: z0, Radius: a}}, []float64{v})
	if err != nil {
		fl.Close()
		return nil, nil, err
	}
	return fl, bs, nil
}

// checkUniformPressure: liquid at rest at a uniform density 1.05 (a
// pressure 0.05 c_s^2 above the reference, which the deviation storage does
// not remove) around a sphere at an off-lattice position. The ring-weighted
// link sum must vanish to round-off: at most 1e-12 of the Stokes drag
// 6 pi mu a U at Mach 0.01.
func checkUniformPressure(o Options) ([]Row, error) {
	const a, tau = 7.3, 0.8
	fl, bs, err := tube(48, 20, tau, 20.37, a, 0, o)
	if err != nil {
		return nil, err
	}
	defer fl.Close()
	fl.SetEquilibrium(func(k, j int) (float64, float64, float64) { return 1.05, 0, 0 })
	fl.Step()
	bs.Collect()
	nu := fl.Viscosity()
	scale := 6 * math.Pi * nu * a * 0.01 * math.Sqrt(lbm.Cs2)
	return []Row{atMost("sphere, uniform pressure", "|F| / Stokes drag at Ma 0.01",
		math.Abs(bs.List[0].Force())/scale, 1e-12, srcUniform, tolUniform)}, nil
}

// translation is the result of a sphere translating at constant speed.
type translation struct {
	K          float64 // F/(6 pi mu a U), mean over the averaging window
	rms, rmsL  float64 // rms fluctuation of the total and of the link force over |mean|
	massDrift  float64 // largest |mean density change| per 1e4 steps
	steps      int
	fallback   int
	cellsMoved float64
	lambda     float64 // a/R of the tube run
}

// translate moves a sphere of radius a cells at Re = U 2a/nu = 0.05 along
// the axis of a closed tube of radius a/lambda, for 1.5 viscous times
// R^2/nu, and averages the force over the last two cells of travel. The
// tube's ends are 2.5 R beyond the sphere's path: the disturbance of a
// sphere in a tube decays like exp(-4.2 z/R) or faster [M: first Stokes
// eigenvalue of a tube from memory], so they cost well under 0.1%.
func translate(a, lambda float64, o Options) (translation, error) {
	const tau = 1.0 // TRT at Lambda = 3/16: the walls do not move with tau
	R := int(math.Round(a / lambda))
	nu := (tau - 0.5) / 3
	U := 0.05 * nu / (2 * a)
	steps := int(1.5 * float64(R*R) / nu)
	travel := U * float64(steps)
	L := int(5*float64(R) + 2*a + travel + 4)
	z0 := float64(L)/2 - travel/2 + 0.123 // off the lattice
	fl, bs, err := tube(L, R, tau, z0, a, U, o)
	if err != nil {
		return translation{}, err
	}
	defer fl.Close()
	mv := []drive.Prescribed{{Body: 0, Velocity: func(float64) float64 { return U }}}
	rho0 := fl.FluidDensity()
	win := int(math.Round(2 / U))
	var s, s2, sl, sl2, drift float64
	for n := 0; n < steps; n++ {
		if err := drive.StepPrescribed(fl, bs, mv); err != nil {
			return translation{}, err
		}
		if n%200 == 0 {
			drift = math.Max(drift, math.Abs(fl.FluidDensity()/rho0-1))
		}
		if n >= steps-win {
			b := bs.List[0]
			f, l := b.Force(), b.LinkForce
			s, s2, sl, sl2 = s+f, s2+f*f, sl+l, sl2+l*l
		}
	}
	w := float64(win)
	mean, meanL := s/w, sl/w
	t := translation{
		K:          -mean / (6 * math.Pi * nu * a * U),
		rms:        math.Sqrt(math.Max(0, s2/w-mean*mean)) / math.Abs(mean),
		rmsL:       math.Sqrt(math.Max(0, sl2/w-meanL*meanL)) / math.Abs(meanL),
		massDrift:  drift * math.Max(1, 1e4/float64(steps)),
		steps:      steps,
		fallback:   bs.List[0].Fallback,
		cellsMoved: travel,
		lambda:     a / float64(R),
	}
	return t, nil
}

func translationRows(a, lambda, tol float64, o Options) ([]Row, translation, error) {
	t, err := translate(a, lambda, o)
	if err != nil {
		return nil, t, err
	}
	cs := fmt.Sprintf("translating a=%g lam=%g", a, lambda)
	rows := []Row{
		withinRel(cs, "F/(6 pi mu a U) vs Haberman-Sayre", t.K, HabermanSayre(lambda), tol, srcHS, tolWall),
		withinRel(cs, "F/(6 pi mu a U) vs Bohlin", t.K, Bohlin(lambda), tol, srcBohlin, tolWall),
		atMost(cs, "force rms / mean (links + nodes)", t.rms, 0.02, srcNoise, tolNoise),
		atMost(cs, "force rms / mean (links only)", t.rmsL, 0.02, srcNoise, tolNoise),
		atMost(cs, "mean density drift per 1e4 steps", t.massDrift, 1e-6, srcMass, tolMass),
	}
	return rows, t, nil
}

func checkTranslating(o Options) ([]Row, error) {
	var rows []Row
	for _, lam := range []float64{0.2, 0.4} {
		r, _, err := translationRows(10, lam, 0.02, o)
		if err != nil {
			return nil, err
		}
		rows = append(rows, r...)
	}
	return rows, nil
}

// checkTranslatingFine adds 20 cells per radius (1%) and the observed order
// of the error against Haberman & Sayre between 10 and 20 cells.
func checkTranslatingFine(o Options) ([]Row, error) {
	var rows []Row
	for _, lam := range []float64{0.2, 0.4} {
		_, t10, err := translationRows(10, lam, 0.02, o)
		if err != nil {
			return nil, err
		}
		r, t20, err := translationRows(20, lam, 0.01, o)
		if err != nil {
			return nil, err
		}
		rows = append(rows, r...)
		ref := HabermanSayre(lam)
		e10, e20 := math.Abs(t10.K/ref-1), math.Abs(t20.K/ref-1)
		// The reference is known only to about 0.2% at lambda = 0.4 (Haberman-
		// Sayre and Bohlin differ by that, CHECKS.md 3b), so once the error
		// approaches it the order is not measurable: the row asks that the
		// error fall at least as 1/a (order >= 1) and prints the value.
		p := math.Log2(e10 / e20)
		rows = append(rows, atLeast(fmt.Sprintf("translating lam=%g", lam), "observed order vs H-S, a=10..20", p, 1,
			"~2 expected (CHECKS.md 7c) until the reference's own 0.2% uncertainty is reached",
			"order 1: the error at least halves per doubling (the reference's 0.2% limits the measurable order)"))
	}
	return rows, nil
}

// oscillate moves a sphere of radius a as X0 sin(omega t) along the axis of
// a closed tube, with omega set by a/delta, and returns the complex force
// coefficient F/U (lattice units) from the last of four periods, the
// reference impedance for an unbounded fluid and the Stokes-layer
// thickness in cells.
func oscillate(a, aOverDelta, lambda float64, o Options) (z, ref complex128, delta float64, err error) {
	R := int(math.Round(a / lambda))
	L := 6 * R
	delta = a / aOverDelta
	// The acoustic limit (METHODS.md 10.3): omega L/c_s <= 1 at the
	// largest nu; omega = 2 nu/delta^2.
	omega := math.Sqrt(lbm.Cs2) / float64(L)
	nu := omega * delta * delta / 2
	tau := 3*nu + 0.5
	period := int(math.Ceil(2 * math.Pi / omega))
	omega = 2 * math.Pi / float64(period)
	nu = omega * delta * delta / 2
	tau = 3*nu + 0.5
	const eps = 0.02 // X0/a
	X0 := eps * a
	U := X0 * omega
	z0 := float64(L)/2 + 0.217
	vel := func(t float64) float64 { return U * math.Cos(omega*t) }
	fl, bs, err := tube(L, R, tau, z0, a, vel(0.5), o)
	if err != nil {
		return 0, 0, 0, err
	}
	defer fl.Close()
	mv := []drive.Prescribed{{Body: 0, Velocity: vel}}
	const periods = 4
	var fz complex128
	for n := 0; n < periods*period; n++ {
		if err := drive.StepPrescribed(fl, bs, mv); err != nil {
			return 0, 0, 0, err
		}
		if n >= (periods-1)*period {
			// the force of the step from t_n to t_{n+1} is centred at n + 1/2
			t := float64(n) + 0.5
			fz += complex(bs.List[0].Force(), 0) * cmplx.Exp(complex(0, -omega*t))
		}
	}
	fz *= complex(2/float64(period), 0)
	z = fz / complex(U, 0) // velocity U cos(omega t) has amplitude U at phase 0
	ref = StokesOscillatingForce(a, nu, 1, omega)
	return z, ref, delta, nil
}

// checkOscillating: the force on a sphere oscillating along the axis
// against the unsteady Stokes impedance, at two Stokes-layer thicknesses
// (the third, delta = 3 cells, is the full check sphere-oscillating-thin).
func checkOscillating(o Options) ([]Row, error) {
	return oscillatingRows(o, []oscillation{
		{8, 1, 0.125}, // delta = 8 cells; (R - a)/delta = 7: Stokeslet far field screened
		{8, 2, 0.2},   // delta = 4 cells
	})
}

// checkOscillatingThin is sphere-oscillating's thinnest Stokes layer, a
// full check: delta = 3 cells, the least CHECKS.md 4d allows, at 15 cells
// per radius (56% of the quick check's time when it was part of it).
func checkOscillatingThin(o Options) ([]Row, error) {
	return oscillatingRows(o, []oscillation{{15, 5, 0.2}})
}

// oscillation is one case of the oscillating sphere: radius a in cells,
// a/delta and a/R.
type oscillation struct{ a, aod, lambda float64 }

func oscillatingRows(o Options, cs []oscillation) ([]Row, error) {
	var rows []Row
	for _, c := range cs {
		z, ref, delta, err := oscillate(c.a, c.aod, c.lambda, o)
		if err != nil {
			return nil, err
		}
		cs := fmt.Sprintf("oscillating a/delta=%g a=%g", c.aod, c.a)
		rows = append(rows,
			withinRel(cs, fmt.Sprintf("|F|/|U| (delta=%.3g cells)", delta), cmplx.Abs(z), cmplx.Abs(ref), 0.03, srcStokesO, tolStokesO),
			within(cs, "phase of F vs U (deg)", phaseDeg(z, 1), phaseDeg(ref, 1), 2, "deg", srcStokesO, tolStokesO))
	}
	return rows, nil
}

// wakeRun moves a sphere of radius a at Re = 2aU/nu through a closed tube
// of radius a/lambda at U = 0.05 (Mach 0.087) for travel diameters, the
// liquid at rest far ahead, and returns C_D = F/(rho U^2 pi a^2/2) averaged
// over the last diameter of travel and the recirculation length behind the
// sphere in diameters (0 if the wake is attached). The tube's far end stays
// 2R + 7 diameters ahead of the sphere.
func wakeRun(a, lambda, re, travel float64, o Options) (cd, ls float64, err error) {
	const U = 0.05
	nu := U * 2 * a / re
	tau := 3*nu + 0.5
	R := int(math.Round(a / lambda))
	dist := travel * 2 * a
	L := int(dist + 3*float64(R) + 2*a + 14*a)
	z0 := float64(R) + a + 0.31
	fl, bs, err := tube(L, R, tau, z0, a, U, o)
	if err != nil {
		return 0, 0, err
	}
	defer fl.Close()
	mv := []drive.Prescribed{{Body: 0, Velocity: func(float64) float64 { return U }}}
	steps := int(dist / U)
	win := int(2 * a / U)
	var s float64
	for n := 0; n < steps; n++ {
		if err := drive.StepPrescribed(fl, bs, mv); err != nil {
			return 0, 0, err
		}
		if n >= steps-win {
			s += bs.List[0].Force()
		}
	}
	cd = -s / float64(win) / (0.5 * U * U * math.Pi * a * a)
	return cd, recirculation(fl.Fields(nil), fl.Solid, bs.List[0].Shape.Z-a, a, U), nil
}

// recirculation returns the length of the recirculation behind a sphere
// of radius a moving at U whose rear is at z = rear (lattice units), in
// diameters, from the fields f of its lattice (solid reports its solid
// nodes): on the row next to the axis behind the sphere the liquid moves
// faster than the sphere (reversed flow in its frame) up to the
// separation's end, found by linear interpolation; 0 if the wake is
// attached.
func recirculation(f *lbm.Fields, solid func(k, j int) bool, rear, a, U float64) float64 {
	prev, prevZ := math.NaN(), 0.0
	for k := int(math.Floor(rear - 0.5)); k >= 0; k-- {
		z := float64(k) + 0.5
		if solid(k, 0) {
			continue
		}
		rel := f.Uz[f.At(k, 0)] - U
		if math.IsNaN(prev) && rel <= 0 {
			return 0 // attached
		}
		if prev > 0 && rel <= 0 {
			zs := prevZ + (z-prevZ)*prev/(prev-rel)
			return (rear - zs) / (2 * a)
		}
		prev, prevZ = rel, z
	}
	return 0
}

// Sources of the wake rows.
const (
	srcCGW = "Clift, Grace & Weber 1978 standard drag curve [M coefficients]"
	srcJP  = "Johnson & Patel 1999, J. Fluid Mech. 378, 19 [M table values]"
)

// checkWake: steady drag at Re = 20 and 50 (and 100 in the full check
// sphere-wake-100) against the standard drag curve (3%), and the
// recirculation length at Re = 50 and 100 against Johnson & Patel (5%).
// The tube radius is 10 sphere radii: the closed tube raises the drag by about 1.4% at Re = 20 (measured against lambda = 0.05)
// and less at higher Re. Re = 100 needs 12 cells per radius: its boundary
// layer is about a/sqrt(Re) thick (C_D error 3.9% at 8 cells, 2.8% at 10).
func checkWake(o Options) ([]Row, error) {
	return wakeRows(o, []wake{{8, 20}, {8, 50}})
}

// checkWake100 is sphere-wake at Re = 100, a full check (63% of the quick
// check's time when it was part of it).
func checkWake100(o Options) ([]Row, error) {
	return wakeRows(o, []wake{{12, 100}})
}

// wake is one case of the sphere wake: radius a in cells and Reynolds
// number.
type wake struct{ a, re float64 }

func wakeRows(o Options, cs []wake) ([]Row, error) {
	var rows []Row
	for _, c := range cs {
		cd, ls, err := wakeRun(c.a, 0.1, c.re, 15, o)
		if err != nil {
			return nil, err
		}
		cs := fmt.Sprintf("sphere wake Re=%g a=%g", c.re, c.a)
		rows = append(rows, withinRel(cs, "drag coefficient C_D", cd, StandardDragCurve(c.re), 0.03, srcCGW, tolWake))
		if ref, ok := RecirculationLength(c.re); ok {
			rows = append(rows, withinRel(cs, "recirculation length L_s/d", ls, ref, 0.05, srcJP, tolWake))
		}
	}
	return rows, nil
}
