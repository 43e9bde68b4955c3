package record

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSwimmingSpeed: a steady drift with noise is recovered within its
// standard error, the error shrinks as 1/sqrt(N) (the standard error of a
// mean of independent samples), and a drift still accelerating is not
// called converged.
func TestSwimmingSpeed(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const T, U, noise = 0.02, 1e-4, 2e-7
	c := []float64{0}
	for p := 0; p < 40; p++ {
		c = append(c, c[p]+U*T+noise*rng.NormFloat64())
	}
	s := SwimmingSpeed(c, T, 2)
	if math.Abs(s.Mean-U) > 3*s.Uncertainty {
		t.Errorf("mean %g, want %g within 3 standard errors (%g)", s.Mean, U, s.Uncertainty)
	}
	want := noise / T / math.Sqrt(float64(s.Periods))
	if s.Uncertainty < want/2 || s.Uncertainty > 2*want {
		t.Errorf("uncertainty %g, want about %g", s.Uncertainty, want)
	}
	if !s.Swimming || !s.Converged {
		t.Errorf("steady drift: swimming %v converged %v (%s)", s.Swimming, s.Converged, s.Criterion)
	}
	// accelerating: the speed doubles across the window
	c = []float64{0}
	for p := 0; p < 40; p++ {
		c = append(c, c[p]+U*T*(1+float64(p)/20))
	}
	if s := SwimmingSpeed(c, T, 2); s.Converged {
		t.Errorf("an accelerating drift was called converged: %s", s.Criterion)
	}
	// no drift
	c = []float64{0}
	for p := 0; p < 40; p++ {
		c = append(c, c[p]+noise*rng.NormFloat64())
	}
	if s := SwimmingSpeed(c, T, 2); s.Swimming {
		t.Errorf("pure noise was called swimming: %g +- %g", s.Mean, s.Uncertainty)
	}
}
