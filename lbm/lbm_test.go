package lbm

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// steady runs s to steady state under the force (g, 0) for the given
// number of viscous times H^2/nu.
func steady(s *Solver, g float64, h int, times float64) *Fields {
	s.SetForce(g, 0)
	steps := int(times * float64(h*h) / s.Viscosity())
	for n := 0; n < steps; n++ {
		s.Step()
	}
	return s.Fields(nil)
}

// TestPlanePoiseuilleTRT: force-driven plane Poiseuille flow between the
// mirror line y = 0 and a halfway bounce-back wall at y = H is exact to
// round-off with TRT at Lambda = 3/16, for any tau (Ginzburg, Verhaeghe &
// d'Humieres 2008; CHECKS.md 7b, tolerance 1e-10 of u_max).
func TestPlanePoiseuilleTRT(t *testing.T) {
	const h, g = 16, 1e-6
	for _, tau := range []float64{0.6, 0.8, 1.4} {
		s, err := New(Config{Nz: 1, Nr: h, Tau: tau, PeriodicZ: true})
		if err != nil {
			t.Fatal(err)
		}
		f := steady(s, g, h, 30)
		s.Close()
		nu := s.Viscosity()
		umax := g * h * h / (2 * nu)
		var worst float64
		for j := 0; j < h; j++ {
			y := float64(j) + 0.5
			ex := g / (2 * nu) * (h*h - y*y)
			worst = math.Max(worst, math.Abs(f.Uz[f.At(0, j)]-ex))
		}
		if worst > 1e-10*umax {
			t.Errorf("tau=%g: max error %.3g of u_max, want <= 1e-10", tau, worst/umax)
		}
	}
}

// TestPlanePoiseuilleBGKOffset: with BGK at tau = 1 (Lambda = 1/4) the
// halfway-bounce-back solution is the exact parabola plus a uniform offset
// (16 Lambda - 3)/24 F/nu = F/(24 nu) (CHECKS.md 7b [D], checked there node
// by node; tolerance 1e-6 relative).
func TestPlanePoiseuilleBGKOffset(t *testing.T) {
	const h, g = 16, 1e-6
	s, err := New(Config{Nz: 1, Nr: h, Tau: 1, Collision: BGK, PeriodicZ: true})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	f := steady(s, g, h, 40)
	nu := s.Viscosity()
	want := g / (24 * nu)
	for j := 0; j < h; j++ {
		y := float64(j) + 0.5
		off := f.Uz[f.At(0, j)] - g/(2*nu)*(h*h-y*y)
		if math.Abs(off-want) > 1e-6*want {
			t.Errorf("row %d: offset %.9g, want F/(24 nu) = %.9g", j, off, want)
		}
	}
}

// randomState fills the post-collision lattice with small random deviations.
func randomState(s *Solver, seed uint64) {
	s.haloStale = true
	rng := rand.New(rand.NewPCG(seed, 1))
	for i := 0; i < Q; i++ {
		for n := range s.planeLen() {
			s.setPop(i, n, 1e-3*(rng.Float64()-0.5))
		}
	}
}

// TestKernelMatchesReference checks the written-out kernel against the
// readable reference functions macro and collideTRT / collideMRT, node by
// node, after one step from a random state: they are the same arithmetic up
// to the order of operations.
func TestKernelMatchesReference(t *testing.T) {
	for _, col := range []Collision{TRT, MRT, BGK} {
		for _, axi := range []bool{false, true} {
			s, err := New(Config{Nz: 9, Nr: 7, Tau: 0.7, Collision: col, Axisymmetric: axi, Threads: 1})
			if err != nil {
				t.Fatal(err)
			}
			randomState(s, 7)
			s.SetForce(3e-5, -2e-5)
			s.fillHalo()
			pre := s.State()
			s.Step()
			var worst float64
			for j := 0; j < s.nr; j++ {
				for k := 0; k < s.nz; k++ {
					n := s.idx(k, j)
					var d [Q]float64
					for i := range d {
						d[i] = pre[i][n-s.off[i]]
					}
					m := macro(&d, &s.rows[j], 3e-5, -2e-5, s.wp, s.nIter)
					if col == MRT {
						collideMRT(&d, &m, s.mrt)
					} else {
						collideTRT(&d, &m, s.wp, s.wm)
					}
					for i := range d {
						worst = math.Max(worst, math.Abs(d[i]-s.a[i][n]))
					}
				}
			}
			s.Close()
			if worst > 1e-15 {
				t.Errorf("%v axisymmetric=%v: kernel and reference differ by %.3g", col, axi, worst)
			}
		}
	}
}

// TestMRTReducesToTRT: MRT whose even moments all relax at 1/tau and whose
// non-conserved odd moments relax at the TRT odd rate is the TRT operator
// (Ginzburg, Verhaeghe & d'Humieres 2008 present TRT as this special case).
func TestMRTReducesToTRT(t *testing.T) {
	const tau = 0.8
	run := func(col Collision) [Q][]float64 {
		s, err := New(Config{Nz: 12, Nr: 8, Tau: tau, Collision: col, EpsilonRate: 1 / tau, Axisymmetric: true})
		if err != nil {
			t.Fatal(err)
		}
		defer s.Close()
		randomState(s, 3)
		for n := 0; n < 20; n++ {
			s.SetForce(1e-5, 1e-5)
			s.Step()
		}
		return s.State()
	}
	a, b := run(TRT), run(MRT)
	var worst float64
	for i := range a {
		for n := range a[i] {
			worst = math.Max(worst, math.Abs(a[i][n]-b[i][n]))
		}
	}
	if worst > 1e-14 {
		t.Errorf("MRT with TRT rates differs from TRT by %.3g", worst)
	}
}

// TestConfigErrors: a bad configuration is refused with a reason.
func TestConfigErrors(t *testing.T) {
	for _, c := range []Config{
		{Nz: 0, Nr: 4, Tau: 0.8},
		{Nz: 4, Nr: 4, Tau: 0.5},
		{Nz: 4, Nr: 4, Tau: 0.8, Magic: -1},
		{Nz: 4, Nr: 4, Tau: 0.8, Threads: -2},
	} {
		if _, err := New(c); err == nil {
			t.Errorf("%+v: no error", c)
		}
	}
}

// ExampleNew runs Hagen-Poiseuille flow in a periodic pipe of radius 8
// nodes and prints the centre-line speed against G R^2/(4 nu).
func ExampleNew() {
	s, err := New(Config{Nz: 2, Nr: 8, Tau: 0.8, Axisymmetric: true, PeriodicZ: true})
	if err != nil {
		panic(err)
	}
	defer s.Close()
	const g = 1e-6
	s.SetForce(g, 0)
	for n := 0; n < 8000; n++ {
		s.Step()
	}
	f := s.Fields(nil)
	nu := s.Viscosity()
	fmt.Printf("u(r=1/2) = %.6e, exact %.6e\n", f.Uz[f.At(0, 0)], g/(4*nu)*(64-0.25))
	// Output: u(r=1/2) = 1.593750e-04, exact 1.593750e-04
}
