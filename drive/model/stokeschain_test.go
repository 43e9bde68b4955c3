package model

import (
	"fmt"
	"math"
	"testing"

	"axiswim/cases"
)

// chainCase is three equal spheres of radius a on arms of mean lengths L1
// and L2 with strokes d, the second arm at phase phi2 (degrees), at 1 Hz in
// a liquid of viscosity 1 Pa s (the speed of a Stokes chain does not
// depend on the viscosity).
func chainCase(a, L1, L2, d, phi2 float64) *cases.Case {
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: 1000, Viscosity: 1}
	c.Container = cases.Container{Radius: 100 * (L1 + L2), Length: 200 * (L1 + L2), Ends: cases.EndsClosed}
	c.Shaking = cases.Shaking{Gravity: 0}
	c.Spheres = []cases.Sphere{{Radius: a, Density: 1000, Z: -L1}, {Radius: a, Density: 1000, Z: 0}, {Radius: a, Density: 1000, Z: L2}}
	c.Arms = []cases.Arm{
		{Spheres: [2]int{1, 2}, Length: L1, Amplitude: d, Frequency: 1},
		{Spheres: [2]int{2, 3}, Length: L2, Amplitude: d, Frequency: 1, Phase: phi2},
	}
	c.FillDefaults()
	return c
}

func chainSpeed(t *testing.T, c *cases.Case) StokesSwimmer {
	t.Helper()
	s, err := StokesChain(c)
	if err != nil {
		t.Fatal(err)
	}
	if len(s) != 1 {
		t.Fatalf("%d swimmers, want 1", len(s))
	}
	return s[0]
}

// TestThreeSphereSpeed: the chain model (Rotne–Prager point forces,
// integrated over a period) against the leading-order three-sphere speed
// of ThreeSphereSpeed (Golestanian & Ajdari 2008, its coefficient derived
// in ThreeSphereSpeed's comment, [D]). The difference is the model's
// correction in a/L, first order: at d/L = 0.01 (the stroke's own
// correction is O((d/L)²) = 1e-4) and a/L = 0.01, 0.005, 0.0025 the
// relative difference must halve with a/L (observed order within 0.1 of
// 1) and vanish with it, for equal and unequal arms (L2 = 1.6 L1, which
// checks the bracket 1/L1² + 1/L2² − 1/(L1+L2)²). The speed reverses
// exactly with the phase lag (the mirror image of the stroke), and with
// the arms in phase the chain does not swim (the scallop theorem, Purcell
// 1977: the reciprocal stroke retraces its path; zero to the integration's
// round-off, held to 1e-9 of the lagged speed).
func TestThreeSphereSpeed(t *testing.T) {
	const L, d = 1e-3, 1e-5
	for _, L2 := range []float64{L, 1.6 * L} {
		var dev []float64
		for _, aL := range []float64{0.01, 0.005, 0.0025} {
			s := chainSpeed(t, chainCase(aL*L, L, L2, d, -90))
			if s.LeadingOrder == nil {
				t.Fatal("no leading-order speed for three equal spheres")
			}
			dev = append(dev, s.Speed / *s.LeadingOrder - 1)
			t.Logf("L2/L1 = %.1f, a/L = %.4f: model %.6g m/s, leading order %.6g m/s, difference %.3g", L2/L, aL, s.Speed, *s.LeadingOrder, dev[len(dev)-1])
		}
		for i := 1; i < len(dev); i++ {
			order := math.Log2(dev[i-1] / dev[i])
			if math.Abs(order-1) > 0.1 {
				t.Errorf("L2/L1 = %.1f: order of the a/L correction %.3f, want 1", L2/L, order)
			}
		}
		if math.Abs(dev[len(dev)-1]) > 0.01 {
			t.Errorf("L2/L1 = %.1f: at a/L = 0.0025 the model is %.3g from the leading order, want within 1%%", L2/L, dev[len(dev)-1])
		}
	}
	lag := chainSpeed(t, chainCase(0.1*L, L, L, 0.1*L, -90))
	back := chainSpeed(t, chainCase(0.1*L, L, L, 0.1*L, 90))
	rec := chainSpeed(t, chainCase(0.1*L, L, L, 0.1*L, 0))
	t.Logf("a/L = d/L = 0.1: lag -90 %.6g, +90 %.6g, in phase %.3g m/s; leading order %.6g", lag.Speed, back.Speed, rec.Speed, *lag.LeadingOrder)
	if !(lag.Speed > 0) || math.Abs(back.Speed+lag.Speed) > 1e-9*lag.Speed {
		t.Errorf("lag -90: %.6g m/s, +90: %.6g m/s; want positive and opposite", lag.Speed, back.Speed)
	}
	if math.Abs(rec.Speed) > 1e-9*lag.Speed {
		t.Errorf("arms in phase: %.3g m/s, want 0 (reciprocal stroke)", rec.Speed)
	}
}

// TestStokesChainRefuses: cases the chain model does not describe.
func TestStokesChainRefuses(t *testing.T) {
	shaken := chainCase(1e-4, 1e-3, 1e-3, 1e-4, -90)
	shaken.Shaking.Frequency, shaken.Shaking.Amplitude = 1, 1e-4
	sprung := chainCase(1e-4, 1e-3, 1e-3, 1e-4, -90)
	sprung.Springs = []cases.Spring{{Spheres: [2]int{1, 3}, Stiffness: 1, RestLength: 2e-3}}
	mixed := chainCase(1e-4, 1e-3, 1e-3, 1e-4, -90)
	mixed.Arms[1].Frequency = 2
	for name, c := range map[string]*cases.Case{"shaken": shaken, "springs": sprung, "two frequencies": mixed} {
		if _, err := StokesChain(c); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
}

func ExampleStokesChain() {
	src, err := cases.Get("three-sphere-lag")
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := cases.Parse("three-sphere-lag", src)
	if err != nil {
		fmt.Println(err)
		return
	}
	swimmers, err := StokesChain(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range swimmers {
		fmt.Printf("swimmer %d (spheres %v): %.3g um/s in steady Stokes flow, %.3g um/s to leading order in a/L\n",
			s.Swimmer, s.Spheres, s.Speed*1e6, *s.LeadingOrder*1e6)
	}
	// Output:
	// swimmer 1 (spheres [1 2 3]): 49.6 um/s in steady Stokes flow, 45.8 um/s to leading order in a/L
}

// TestStokesChainSwimmers: two copies of the lagged three-sphere swimmer
// far apart (1000 arm lengths: their interaction, a force dipole's flow,
// falls as 1/r^2, here 1e-6 of the self-propulsion) each swim at the
// speed of one alone, within 1e-4; a chain of four spheres with its
// three arms in phase swims not at all (reciprocal: Purcell 1977).
func TestStokesChainSwimmers(t *testing.T) {
	const L, a, d = 1e-3, 1e-4, 1e-4
	one := chainSpeed(t, chainCase(a, L, L, d, -90))
	two := chainCase(a, L, L, d, -90)
	far := 1000 * L
	two.Container.Length = 4 * far
	for k := range 3 {
		s := two.Spheres[k]
		s.Z += far
		two.Spheres = append(two.Spheres, s)
	}
	for _, arm := range two.Arms[:2] {
		arm.Spheres = [2]int{arm.Spheres[0] + 3, arm.Spheres[1] + 3}
		two.Arms = append(two.Arms, arm)
	}
	st, err := StokesChain(two)
	if err != nil {
		t.Fatal(err)
	}
	if len(st) != 2 {
		t.Fatalf("%d swimmers, want 2", len(st))
	}
	for _, s := range st {
		if math.Abs(s.Speed-one.Speed) > 1e-4*one.Speed {
			t.Errorf("swimmer %d (spheres %v): %.6g m/s, alone %.6g", s.Swimmer, s.Spheres, s.Speed, one.Speed)
		}
	}
	four := chainCase(a, L, L, d, 0)
	four.Spheres = append(four.Spheres, cases.Sphere{Radius: a, Density: 1000, Z: 2 * L})
	four.Arms = append(four.Arms, cases.Arm{Spheres: [2]int{3, 4}, Length: L, Amplitude: d, Frequency: 1})
	st4 := chainSpeed(t, four)
	if st4.LeadingOrder != nil || st4.Speed != 0 {
		t.Errorf("four spheres in phase: %.3g m/s, leading order %v; want 0 and none", st4.Speed, st4.LeadingOrder)
	}
}
