package model

import (
	"encoding/json"
	"fmt"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"axiswim/cases"
)

// modelFreeSphere is a case with one sphere of density ratio s and a/δ = x: a
// 1 mm sphere in water (ν = 1e-6 m^2/s) shaken at the frequency that makes
// δ = √(2ν/ω) = a/x, with an amplitude of a/100.
func modelFreeSphere(t *testing.T, s, x float64) *cases.Case {
	t.Helper()
	const a, rho, mu = 1e-3, 1000.0, 1e-3
	delta := a / x
	omega := 2 * mu / rho / (delta * delta)
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: rho, Viscosity: mu}
	c.Container.Radius, c.Container.Length = 0.01, 0.04
	c.Shaking.Frequency = omega / (2 * math.Pi)
	c.Shaking.Amplitude = a / 100
	c.Shaking.Gravity = 0
	c.Spheres = []cases.Sphere{{Radius: a, Density: s * rho, Z: 0}}
	c.Grid.CellsPerRadius = 5
	c.Run.Periods = 4
	c.FillDefaults()
	return c
}

func mustModel(t *testing.T, c *cases.Case) *Result {
	t.Helper()
	r, err := Linear(c)
	if err != nil {
		t.Fatalf("Model: %v", err)
	}
	return r
}

// modelPhasor is the complex amplitude of a reported amplitude and phase.
func modelPhasor(amp, phaseDeg float64) complex128 { return cmplx.Rect(amp, phaseDeg*math.Pi/180) }

// TestModelFreeSphere checks a free sphere against the table of CHECKS.md
// 4c ([D], computed there from the Landau–Lifshitz force of 4a): with the
// liquid oscillating as U far away, the sphere moves with
// V/U = (-i m_f + Z)/(-i s m_f + Z) in the lab frame (e^{-iωt}, a positive
// angle is a lag). In the container frame of the model the liquid is at
// rest, the container moves with U = iωA and the sphere with V - U, so
// V/U = 1 + X/A with X the reported displacement relative to the container;
// our e^{+iωt} turns the lag φ into the angle -φ. The table gives 4 figures
// and 0.1 degree, so the tolerances are half a unit of the last figure:
// 5e-5 and 0.05 degree. A neutrally buoyant sphere (s = 1) feels no frame
// force and must not move relative to the container at all: exactly zero.
func TestModelFreeSphere(t *testing.T) {
	xs := []float64{0.5, 1, 2, 5, 10, 100}
	table := []struct {
		s     float64
		amp   []float64
		phase []float64 // degrees of lag
	}{
		{0.5, []float64{1.0134, 1.0553, 1.1500, 1.3077, 1.3944, 1.4888}, []float64{-1.8, -4.0, -5.7, -4.9, -3.3, -0.4}},
		{2, []float64{0.9715, 0.8952, 0.7804, 0.6747, 0.6369, 0.6036}, []float64{3.4, 6.7, 7.8, 5.1, 3.0, 0.3}},
		{5, []float64{0.8793, 0.6536, 0.4565, 0.3387, 0.3041, 0.2757}, []float64{12.6, 20.1, 18.4, 10.3, 5.7, 0.6}},
	}
	for _, row := range table {
		for i, x := range xs {
			c := modelFreeSphere(t, row.s, x)
			r := mustModel(t, c)
			sp := r.Spheres[0]
			if math.Abs(sp.RadiusOverDelta-x) > 1e-12*x {
				t.Errorf("s=%g: a/delta = %.15g, want %g", row.s, sp.RadiusOverDelta, x)
			}
			lab := 1 + modelPhasor(sp.Amplitude, sp.Phase)/complex(r.DriveAmplitude, 0)
			amp, lag := cmplx.Abs(lab), -modelPhase(lab)
			if math.Abs(amp-row.amp[i]) > 5e-5 || math.Abs(lag-row.phase[i]) > 0.05 {
				t.Errorf("s=%g a/delta=%g: |V/U| = %.5f at %.2f deg lag, CHECKS.md 4c gives %.4f at %.1f",
					row.s, x, amp, lag, row.amp[i], row.phase[i])
			}
		}
	}
	for _, x := range xs {
		if r := mustModel(t, modelFreeSphere(t, 1, x)); r.Spheres[0].Amplitude != 0 {
			t.Errorf("neutrally buoyant sphere at a/delta=%g moves by %g m relative to the container", x, r.Spheres[0].Amplitude)
		}
	}
}

// modelDemo returns the embedded demo case: spheres of 1.2 and 0.8 mm, 1300 and
// 775 kg/m^3, 3.6 mm apart, in a liquid of 1180 kg/m^3 and 0.012 Pa s,
// joined by a spring of 0.05 N/m, shaken at 35 Hz with 0.6 mm.
func modelDemo(t *testing.T) *cases.Case {
	t.Helper()
	src, err := cases.Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	c, err := cases.Parse("demo", src)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestModelSpringPair checks the demo pair, with a dashpot added, against
// a hand calculation written out here independently of the solver: with
// Z_k = -6π μ a_k [(1 + x_k) + i (x_k + 2x_k²/9)] (CHECKS.md 4a, for
// e^{+iωt}) and κ = k + iωc, the displacements relative to the container
// solve
//
//	(-ω² m1 - iω Z1 + κ) X1 - κ X2 = (m1 - ρ Vol1) ω² A
//	-κ X1 + (-ω² m2 - iω Z2 + κ) X2 = (m2 - ρ Vol2) ω² A
//
// which Cramer's rule gives in closed form. Both are the same arithmetic up
// to the order of the operations, so they must agree to round-off: 1e-12
// relative. The static extension of the spring must hold the net weight of
// the heavy sphere, (m1 - ρ Vol1) g/k (the pair is neutrally buoyant, so
// the spring holds the whole of it), to 1e-9: the demo balances only to
// the round-off of its densities.
func TestModelSpringPair(t *testing.T) {
	c := modelDemo(t)
	c.Springs[0].Damping = 1e-4
	r := mustModel(t, c)

	rho, mu := c.Fluid.Density, c.Fluid.Viscosity
	omega := 2 * math.Pi * c.Shaking.Frequency
	delta := math.Sqrt(2 * mu / rho / omega)
	A := c.Shaking.Amplitude
	var m, vol [2]float64
	var z [2]complex128
	for k := range 2 {
		a := c.Spheres[k].Radius
		vol[k] = 4.0 / 3 * math.Pi * a * a * a
		m[k] = c.Spheres[k].Density * vol[k]
		x := a / delta
		z[k] = complex(-6*math.Pi*mu*a*(1+x), -6*math.Pi*mu*a*(x+2*x*x/9))
	}
	kappa := complex(c.Springs[0].Stiffness, omega*c.Springs[0].Damping)
	iw := complex(0, omega)
	a11 := complex(-omega*omega*m[0], 0) - iw*z[0] + kappa
	a22 := complex(-omega*omega*m[1], 0) - iw*z[1] + kappa
	a12, a21 := -kappa, -kappa
	f1 := complex((m[0]-rho*vol[0])*omega*omega*A, 0)
	f2 := complex((m[1]-rho*vol[1])*omega*omega*A, 0)
	det := a11*a22 - a12*a21
	x1 := (f1*a22 - a12*f2) / det
	x2 := (a11*f2 - a21*f1) / det

	if math.Abs(r.Omega-omega) > 1e-15*omega || r.DriveAmplitude != A {
		t.Errorf("omega %g, A %g; want %g, %g", r.Omega, r.DriveAmplitude, omega, A)
	}
	for k, want := range []complex128{x1, x2} {
		got := modelPhasor(r.Spheres[k].Amplitude, r.Spheres[k].Phase)
		if cmplx.Abs(got-want) > 1e-12*cmplx.Abs(want) {
			t.Errorf("sphere %d: X = %.6g, hand calculation %.6g", k+1, got, want)
		}
	}
	// Sphere 2 starts above sphere 1: the extension is X2 - X1.
	s := r.Springs[0]
	if got, want := modelPhasor(s.Amplitude, s.Phase), x2-x1; cmplx.Abs(got-want) > 1e-12*cmplx.Abs(want) {
		t.Errorf("spring extension %.6g, want X2 - X1 = %.6g", got, want)
	}
	wantStatic := (m[0] - rho*vol[0]) * c.Shaking.Gravity / c.Springs[0].Stiffness
	if !s.Balanced || math.Abs(s.Static-wantStatic) > 1e-9*wantStatic {
		t.Errorf("static extension %g (balanced %v), want %g", s.Static, s.Balanced, wantStatic)
	}
	// The heavy sphere moves less than the container and the light one
	// more: relative to the container their in-phase parts have opposite
	// signs, as for isolated inviscid spheres, X/A = -(s - 1)/(s + 1/2)
	// (METHODS.md 11.1; -0.06 and +0.30 here).
	if real(x1) >= 0 || real(x2) <= 0 {
		t.Errorf("X1 = %.3g, X2 = %.3g: want the heavy sphere to trail the container and the light one to overshoot it", x1, x2)
	}
}

// modelArmForces returns, for the reported response, the force the arms must
// supply to each sphere: R_k = -ω² m_k X_k - [iω Z_k X_k + F_frame + F_springs],
// everything computed here from the case and the reported amplitudes, and
// the largest magnitude of the terms summed.
func modelArmForces(c *cases.Case, r *Result) (rk []complex128, scale float64) {
	rho, mu := c.Fluid.Density, c.Fluid.Viscosity
	omega := r.Omega
	delta := math.Sqrt(2 * mu / rho / omega)
	iw := complex(0, omega)
	x := make([]complex128, len(c.Spheres))
	for k, s := range r.Spheres {
		x[k] = modelPhasor(s.Amplitude, s.Phase)
	}
	ac := complex(-omega*omega*r.DriveAmplitude, 0)
	for k, s := range c.Spheres {
		vol := 4.0 / 3 * math.Pi * s.Radius * s.Radius * s.Radius
		m := s.Density * vol
		terms := []complex128{
			complex(-omega*omega*m, 0) * x[k],
			-iw * modelImpedance(mu, s.Radius, delta) * x[k],
			complex(m-rho*vol, 0) * ac,
		}
		for _, sp := range c.Springs {
			kappa := complex(sp.Stiffness, omega*sp.Damping)
			switch k + 1 {
			case sp.Spheres[0]:
				terms = append(terms, -kappa*(x[sp.Spheres[1]-1]-x[k]))
			case sp.Spheres[1]:
				terms = append(terms, -kappa*(x[sp.Spheres[0]-1]-x[k]))
			}
		}
		var sum complex128
		for _, v := range terms {
			sum += v
			scale = math.Max(scale, cmplx.Abs(v))
		}
		rk = append(rk, sum)
	}
	return rk, scale
}

// TestModelArm checks prescribed strokes: the reported extension of each
// arm equals the imposed one, the arms' forces on each group sum to zero
// (the group is force-free), and, without shaking and springs, the mean
// power of the arm equals the power the drag dissipates,
// Σ ½ 6π μ a (1 + a/δ) |ω X_k|² (the real part of -Z in CHECKS.md 4a).
// The tolerance, 1e-13 relative to the largest force term, is the
// round-off of a backward-stable elimination (error of order n ε times the
// terms, n <= 5, ε = 1.1e-16) with a margin for the conversion to and
// from amplitude and phase; the residuals measured are below 2e-15. The
// power balance is held to 1e-13 of the power, for the same reason.
func TestModelArm(t *testing.T) {
	// The demo pair with an arm instead of the spring, stroking at 20 Hz
	// without shaking.
	free := modelDemo(t)
	free.Springs = nil
	free.Shaking.Frequency, free.Shaking.Amplitude = 0, 0
	free.Arms = []cases.Arm{{Spheres: [2]int{1, 2}, Length: 0.0036, Amplitude: 3e-4, Phase: 30, Frequency: 20}}

	// Shaken, with the arm given from the upper sphere to the lower one
	// and a third sphere hung from the light one by a spring and dashpot.
	chain := modelDemo(t)
	chain.Springs = []cases.Spring{{Spheres: [2]int{2, 3}, Stiffness: 0.02, RestLength: 0.004, Damping: 1e-5}}
	chain.Spheres = append(chain.Spheres, cases.Sphere{Radius: 0.0008, Density: 1000, Z: 0.0058})
	chain.Arms = []cases.Arm{{Spheres: [2]int{2, 1}, Length: 0.0036, Amplitude: 2e-4, Phase: -60}}
	chain.FillDefaults() // the arm strokes at the shaking frequency

	for name, c := range map[string]*cases.Case{"free pair": free, "shaken chain": chain} {
		r := mustModel(t, c)
		arm := c.Arms[0]
		i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
		sg := 1.0
		if c.Spheres[j].Z < c.Spheres[i].Z {
			sg = -1
		}
		xi := modelPhasor(r.Spheres[i].Amplitude, r.Spheres[i].Phase)
		xj := modelPhasor(r.Spheres[j].Amplitude, r.Spheres[j].Phase)
		want := modelPhasor(arm.Amplitude, arm.Phase)
		if got := complex(sg, 0) * (xj - xi); cmplx.Abs(got-want) > 1e-12*arm.Amplitude {
			t.Errorf("%s: extension %.6g, imposed %.6g", name, got, want)
		}

		rk, scale := modelArmForces(c, r)
		// The group joined by the arm is spheres 1 and 2.
		if net := rk[0] + rk[1]; cmplx.Abs(net) > 1e-13*scale {
			t.Errorf("%s: net force of the arm on its group %.3g N (terms up to %.3g N)", name, net, scale)
		}
		for k := 2; k < len(rk); k++ {
			if cmplx.Abs(rk[k]) > 1e-13*scale {
				t.Errorf("%s: sphere %d is not on an arm but needs a force %.3g N", name, k+1, rk[k])
			}
		}
		// The reported push is the arm's force on sphere j along the pair.
		push := modelPhasor(r.Arms[0].Force, r.Arms[0].ForcePhase)
		if cmplx.Abs(push-complex(sg, 0)*rk[j]) > 1e-13*scale {
			t.Errorf("%s: arm force %.6g, the balance of sphere %d gives %.6g", name, push, j+1, complex(sg, 0)*rk[j])
		}
	}

	r := mustModel(t, free)
	delta := math.Sqrt(2 * free.Fluid.Viscosity / free.Fluid.Density / r.Omega)
	dissipated := 0.0
	for k, s := range free.Spheres {
		v := r.Omega * r.Spheres[k].Amplitude
		dissipated += 0.5 * 6 * math.Pi * free.Fluid.Viscosity * s.Radius * (1 + s.Radius/delta) * v * v
	}
	if p := r.Arms[0].Power; math.Abs(p-dissipated) > 1e-13*dissipated {
		t.Errorf("arm power %.6g W, drag dissipates %.6g W", p, dissipated)
	}
	if r.Omega != 2*math.Pi*20 || r.DriveAmplitude != 0 {
		t.Errorf("free pair: omega %g, drive %g; want the stroke's 2 pi 20 and no drive", r.Omega, r.DriveAmplitude)
	}
}

// TestModelNotes checks what the model says it cannot do.
func TestModelNotes(t *testing.T) {
	c := modelFreeSphere(t, 2, 1)
	c.Shaking.Gravity = 9.81
	c.Shaking.Harmonics = []cases.Harmonic{{Order: 2, Amplitude: 1e-6}}
	r := mustModel(t, c)
	all := strings.Join(r.Notes, "\n")
	for _, want := range []string{"hydrodynamic interaction", "container walls", "streaming", "nonlinearity",
		"only the fundamental", "sphere 1 has a net weight", "sinks"} {
		if !strings.Contains(all, want) {
			t.Errorf("notes lack %q:\n%s", want, all)
		}
	}
	if _, err := json.Marshal(r); err != nil {
		t.Errorf("the result does not encode as JSON: %v", err)
	}

	// A spring that cannot hold a group that is not neutrally buoyant.
	d := modelDemo(t)
	d.Spheres[1].Density = 700
	r = mustModel(t, d)
	if s := r.Springs[0]; s.Balanced || s.Static != 0 || !strings.Contains(strings.Join(r.Notes, "\n"), "the group of spheres 1, 2") {
		t.Errorf("unbalanced pair: spring %+v, notes\n%s", s, strings.Join(r.Notes, "\n"))
	}

	still := modelFreeSphere(t, 2, 1)
	still.Shaking.Frequency, still.Shaking.Amplitude = 0, 0
	still.Run = cases.Run{Duration: 1}
	still.FillDefaults()
	if _, err := Linear(still); err == nil || !strings.Contains(err.Error(), "nothing oscillates") {
		t.Errorf("Model without a drive: %v", err)
	}
	bad := modelFreeSphere(t, 2, 1)
	bad.Fluid.Viscosity = -1
	if _, err := Linear(bad); err == nil || !strings.Contains(err.Error(), "fluid.viscosity") {
		t.Errorf("Model of an invalid case: %v", err)
	}
}

func ExampleLinear() {
	src, err := cases.Get("demo")
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := cases.Parse("demo", src)
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := Linear(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("f = %.4g Hz, drive amplitude %.3g mm\n", r.Omega/(2*math.Pi), r.DriveAmplitude*1e3)
	for _, s := range r.Spheres {
		fmt.Printf("sphere %d: %.4f mm at %+.1f deg relative to the container (a/delta = %.2f)\n",
			s.Sphere, s.Amplitude*1e3, s.Phase, s.RadiusOverDelta)
	}
	for _, s := range r.Springs {
		fmt.Printf("spring %d: %.4f mm at %+.1f deg, static extension %.4f mm\n",
			s.Spring, s.Amplitude*1e3, s.Phase, s.Static*1e3)
	}
	// Output:
	// f = 35 Hz, drive amplitude 1 mm
	// sphere 1: 0.0793 mm at -153.9 deg relative to the container (a/delta = 3.95)
	// sphere 2: 0.2838 mm at +40.8 deg relative to the container (a/delta = 2.63)
	// spring 1: 0.3611 mm at +37.6 deg, static extension 0.2485 mm
}
