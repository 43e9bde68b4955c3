package drive

import (
	"math"
	"testing"
)

// TestDashpotDecay: a damped two-body oscillator (implicit trapezoidal
// dashpot) decays at the analytic rate c/(2 mu) of the relative motion
// (underdamped oscillator, e.g. Landau & Lifshitz, Mechanics §25), within
// 1% (the leapfrog phase error is O((omega dt)^2)).
func TestDashpotDecay(t *testing.T) {
	m1, m2 := 2.0, 1.0
	mu := m1 * m2 / (m1 + m2)
	omega := 2 * math.Pi / 2000
	k := omega * omega * mu
	c := 0.02 * 2 * math.Sqrt(k*mu) // 2% of critical
	d := &Dynamics{
		Mass: []float64{m1, m2}, Volume: []float64{0, 0}, Radius: []float64{1, 1},
		Virtual: []float64{0, 0},
		Springs: []SpringLink{{I: 0, J: 1, K: k, L0: 10, C: c}},
		Ends:    [2]float64{math.NaN(), math.NaN()},
		Z:       []float64{0, 11},
		V:       []float64{0, 0},
	}
	if err := d.Init(); err != nil {
		t.Fatal(err)
	}
	zero := []float64{0, 0}
	amp := func(from, to int) float64 {
		var a float64
		for n := from; n < to; n++ {
			d.Step(zero, zero, float64(n+1))
			a = math.Max(a, math.Abs(d.Z[1]-d.Z[0]-10))
		}
		return a
	}
	a1 := amp(0, 2000)
	a2 := amp(2000, 12000) // the last period of five more
	_ = a2
	a3 := amp(12000, 14000)
	rate := math.Log(a1/a3) / 12000
	if want := c / (2 * mu); math.Abs(rate/want-1) > 0.01 {
		t.Errorf("decay rate %.5g, want c/(2 mu) = %.5g", rate, want)
	}
}

// TestArmHoldsDistance: a prescribed arm keeps the distance exactly and
// the pair's momentum changes only by the external force.
func TestArmHoldsDistance(t *testing.T) {
	L := func(tt float64) float64 { return 20 + 2*math.Sin(tt/50) }
	d := &Dynamics{
		Mass: []float64{5, 1}, Volume: []float64{0, 0}, Radius: []float64{3, 2},
		Virtual: []float64{0, 0},
		Arms:    []ArmLink{{I: 0, J: 1, Sign: 1, Length: L}},
		Ends:    [2]float64{math.NaN(), math.NaN()},
		Z:       []float64{100, 100 + L(0)},
	}
	d.V = []float64{0, L(1) - L(0)}
	if err := d.Init(); err != nil {
		t.Fatal(err)
	}
	ext := []float64{1e-4, 0}
	p0 := 5*d.V[0] + 1*d.V[1]
	for n := 0; n < 500; n++ {
		d.Step([]float64{0, 0}, ext, float64(n+1))
		if e := math.Abs(d.Z[1] - d.Z[0] - L(float64(n+1))); e > 1e-10 {
			t.Fatalf("step %d: distance off by %g", n, e)
		}
	}
	p := 5*d.V[0] + 1*d.V[1]
	if math.Abs(p-p0-500*1e-4) > 1e-12 {
		t.Errorf("momentum change %g, want the impulse 0.05", p-p0)
	}
}
