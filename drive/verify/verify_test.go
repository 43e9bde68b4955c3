package verify

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"testing"
)

// TestReferenceWomersley checks our Bessel-based Womersley solution against
// the amplitude and phase table of CHECKS.md 2b ([D], computed there from
// the exact formula with mpmath): centre-line speed and flow rate relative
// to the quasi-steady Poiseuille values, phases relative to the gradient.
// The table has 5 significant figures and 3 decimals in degrees.
func TestReferenceWomersley(t *testing.T) {
	table := []struct {
		alpha     float64
		ampQ, phQ float64
		ampU, phU float64
	}{
		{1, 0.98557, -9.453, 0.98493, -10.645},
		{3, 0.54835, -54.303, 0.52198, -64.292},
		{4, 0.35310, -65.568, 0.30802, -80.948},
		{8, 0.10480, -78.941, 0.06173, -91.219},
		{20, 0.01864, -85.803, 0.01000, -90.000},
	}
	for _, c := range table {
		w := Womersley{R: 1, Nu: 1, Omega: c.alpha * c.alpha, G0: 1, Rho: 1}
		ucP, qP := w.Poiseuille()
		u, q := w.Velocity(0), w.Flow()
		check := func(name string, got, want, tol float64) {
			if math.Abs(got-want) > tol {
				t.Errorf("alpha=%g %s = %.6f, CHECKS.md 2b gives %.5f", c.alpha, name, got, want)
			}
		}
		check("|u_c|/u_cP", cmplx.Abs(u)/ucP, c.ampU, 6e-5)
		check("|Q|/Q_P", cmplx.Abs(q)/qP, c.ampQ, 6e-5)
		check("phase u_c", phaseDeg(u, 1), c.phU, 6e-4)
		check("phase Q", phaseDeg(q, 1), c.phQ, 6e-4)
	}
}

// TestReferenceStartup checks the Szymanski series against the centre-line
// table of CHECKS.md 1b ([D], 5 decimals).
func TestReferenceStartup(t *testing.T) {
	table := []struct{ tau, u float64 }{
		{0.05, 0.19962}, {0.10, 0.38519}, {0.20, 0.65180},
		{0.30, 0.80455}, {0.50, 0.93852}, {1.00, 0.99659},
	}
	for _, c := range table {
		if got := StartupCentre(0, c.tau); math.Abs(got-c.u) > 6e-6 {
			t.Errorf("u_c/u_inf at tau=%g: %.6f, CHECKS.md 1b gives %.5f", c.tau, got, c.u)
		}
	}
	z := besselZeros(2)
	if math.Abs(z[0]-j01) > 1e-14 || math.Abs(z[1]-j02) > 1e-14 {
		t.Errorf("J0 zeros %v, CHECKS.md 1b gives %v %v", z, j01, j02)
	}
}

// TestChecks runs every quick verification case: each check must pass and
// say where its tolerance comes from; each known disagreement must still
// be computed and reported (a finite value and error against a finite
// reference, with its reason and source) and never pass; information rows
// never pass.
func TestChecks(t *testing.T) {
	for _, c := range Checks() {
		if c.Full {
			continue
		}
		t.Run(c.Name, func(t *testing.T) {
			rows, err := c.Run(Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(rows) == 0 {
				t.Fatal("no rows")
			}
			for _, r := range rows {
				if err := rowComplete(r); err != nil {
					t.Error(err)
				}
				if r.Failed() {
					t.Errorf("FAIL %s", r.Describe())
				}
			}
			if testing.Verbose() {
				WriteTable(os.Stdout, rows)
			}
		})
	}
}

// rowComplete returns an error when r is not a complete row of its kind:
// a check with its tolerance's origin, information that passes, or a
// known disagreement whose comparison was not made or not explained.
func rowComplete(r Row) error {
	switch r.Kind {
	case KindCheck:
		if r.TolFrom == "" || r.Source == "" {
			return fmt.Errorf("check %s: no source or no origin of the tolerance", r.Describe())
		}
		var verdict bool
		switch r.Compare {
		case AtMost:
			verdict = r.Computed <= r.Tolerance
		case AtLeast:
			verdict = r.Computed >= r.Tolerance
		default:
			verdict = r.Error <= r.Tolerance
		}
		if verdict != r.Pass || math.IsInf(r.Tolerance, 0) || math.IsNaN(r.Tolerance) {
			return fmt.Errorf("check %s: verdict %v not the one its value and tolerance give", r.Describe(), r.Pass)
		}
	case KindInfo:
		if r.Pass {
			return fmt.Errorf("information row %s passes", r.Describe())
		}
	case KindDisagreement:
		finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
		if r.Pass || !finite(r.Computed) || !finite(r.Reference) || !finite(r.Error) || r.Reason == "" || r.Source == "" {
			return fmt.Errorf("known disagreement %s: not computed and reported (value, reference, error, reason, source), or passes", r.Describe())
		}
	default:
		return fmt.Errorf("row %s: unknown kind %v", r.Describe(), r.Kind)
	}
	return nil
}

// TestChecksFloat32 runs a cheap selection of the quick checks with float32
// storage of the populations (Options.Single, `axiswim verify -float32`
// runs them all): the same rows and tolerances must pass, but for the
// exact-conservation bound, which becomes float32's round-off. The
// oscillating sphere in float32 is free-sphere's (sphere-oscillating, 70%
// of this test's time, left it for the test budget of the AVX2 issue).
func TestChecksFloat32(t *testing.T) {
	want := map[string]bool{"hagen-poiseuille": true, "mass-planar": true, "determinism-moving-sphere": true,
		"free-sphere": true, "model-vs-simulation": true}
	for _, c := range Checks() {
		if !want[c.Name] {
			continue
		}
		delete(want, c.Name)
		t.Run(c.Name, func(t *testing.T) {
			rows, err := c.Run(Options{Single: true})
			if err != nil {
				t.Fatal(err)
			}
			for _, r := range rows {
				if r.Failed() {
					t.Errorf("float32: FAIL %s", r.Describe())
				}
			}
		})
	}
	for name := range want {
		t.Errorf("no check named %q", name)
	}
}

// TestReferenceFreeSphere checks FreeSphereResponse against the table of
// CHECKS.md 4c ([D], 4 figures and 0.1 degree).
func TestReferenceFreeSphere(t *testing.T) {
	table := []struct{ s, x, amp, ph float64 }{
		{0.5, 0.5, 1.0134, -1.8}, {0.5, 2, 1.1500, -5.7}, {0.5, 10, 1.3944, -3.3},
		{2, 0.5, 0.9715, 3.4}, {2, 1, 0.8952, 6.7}, {2, 2, 0.7804, 7.8}, {2, 5, 0.6747, 5.1},
		{5, 1, 0.6536, 20.1}, {5, 2, 0.4565, 18.4},
	}
	for _, c := range table {
		r := FreeSphereResponse(c.s, c.x)
		if math.Abs(cmplx.Abs(r)-c.amp) > 6e-5 || math.Abs(phaseDeg(r, 1)-c.ph) > 0.06 {
			t.Errorf("s=%g a/delta=%g: %.5f at %.2f deg, CHECKS.md 4c gives %.4f at %.1f", c.s, c.x,
				cmplx.Abs(r), phaseDeg(r, 1), c.amp, c.ph)
		}
	}
}
