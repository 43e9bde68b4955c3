package drive

import (
	"math"
	"testing"
)

// TestShakerDerivatives checks that Velocity and Acceleration are the time
// derivatives of Displacement (central differences, error O(h^2)), through
// the ramp and after it.
func TestShakerDerivatives(t *testing.T) {
	s := Shaker{Amplitude: 6e-4, Omega: 2 * math.Pi * 35, Ramp: 2 / 35.0,
		Harmonics: []Harmonic{{Order: 2, Amplitude: 1e-4, Phase: 0.3}}}
	checkDerivatives(t, s)
	if s.Displacement(0) != 0 || s.Velocity(0) != 0 {
		t.Error("the ramp must start from rest")
	}
	// A ramp from another drive (a warm start): the same, and it starts
	// exactly on that drive.
	from := Shaker{Amplitude: 5e-4, Omega: s.Omega, Harmonics: []Harmonic{{Order: 3, Amplitude: 2e-5}}}
	s.From = &from
	checkDerivatives(t, s)
	if s.Displacement(0) != from.Displacement(0) || s.Velocity(0) != from.Velocity(0) || s.Acceleration(0) != from.Acceleration(0) {
		t.Errorf("the ramp does not start on the earlier drive: %g, %g, %g against %g, %g, %g",
			s.Displacement(0), s.Velocity(0), s.Acceleration(0), from.Displacement(0), from.Velocity(0), from.Acceleration(0))
	}
	if a, b := s.Acceleration(0.2), (Shaker{Amplitude: s.Amplitude, Omega: s.Omega, Harmonics: s.Harmonics}).Acceleration(0.2); a != b {
		t.Errorf("after the ramp the drive is not the new one alone: %g and %g", a, b)
	}
}

func checkDerivatives(t *testing.T, s Shaker) {
	t.Helper()
	const h = 1e-7
	for _, tm := range []float64{0.001, 0.013, 0.03, 0.056, 0.2} {
		v := (s.Displacement(tm+h) - s.Displacement(tm-h)) / (2 * h)
		a := (s.Velocity(tm+h) - s.Velocity(tm-h)) / (2 * h)
		// relative to the amplitudes A omega and A omega^2; h^2 omega^2 ~ 5e-10
		if e := math.Abs(v-s.Velocity(tm)) / (s.Amplitude * s.Omega); e > 1e-6 {
			t.Errorf("t=%g: velocity off by %g of A omega", tm, e)
		}
		if e := math.Abs(a-s.Acceleration(tm)) / (s.Amplitude * s.Omega * s.Omega); e > 1e-6 {
			t.Errorf("t=%g: acceleration off by %g of A omega^2", tm, e)
		}
	}
}
