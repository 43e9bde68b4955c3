package drive

import "math"

// Shaker is the prescribed motion of the container along the axis,
// X(t) = s(t) [A sin(omega t) + sum_n A_n sin(n omega t + phi_n)], with the
// ramp s(t) = (1 - cos(pi t/T_r))/2 for t < T_r and 1 afterwards; X, its
// velocity and its acceleration are exact derivatives of one another.
type Shaker struct {
	Amplitude float64 // m
	Omega     float64 // rad/s
	Ramp      float64 // ramp duration T_r, s (0: none)
	Harmonics []Harmonic
}

// Harmonic is an extra term A sin(n omega t + phase) of the drive.
type Harmonic struct {
	Order     int
	Amplitude float64 // m
	Phase     float64 // rad
}

// terms calls fn for every term of the drive with its amplitude, angular
// frequency and phase.
func (s Shaker) terms(fn func(a, w, ph float64)) {
	fn(s.Amplitude, s.Omega, 0)
	for _, h := range s.Harmonics {
		fn(h.Amplitude, float64(h.Order)*s.Omega, h.Phase)
	}
}

// ramp returns s, s' and s” at time t.
func (s Shaker) ramp(t float64) (v, d1, d2 float64) {
	if s.Ramp <= 0 || t >= s.Ramp {
		return 1, 0, 0
	}
	if t <= 0 {
		return 0, 0, 0
	}
	k := math.Pi / s.Ramp
	return 0.5 * (1 - math.Cos(k*t)), 0.5 * k * math.Sin(k*t), 0.5 * k * k * math.Cos(k*t)
}

// Displacement returns X(t) in metres.
func (s Shaker) Displacement(t float64) float64 {
	v, _, _ := s.ramp(t)
	var x float64
	s.terms(func(a, w, ph float64) { x += a * math.Sin(w*t+ph) })
	return v * x
}

// Velocity returns dX/dt in m/s.
func (s Shaker) Velocity(t float64) float64 {
	v, d1, _ := s.ramp(t)
	var x float64
	s.terms(func(a, w, ph float64) {
		sn, cs := math.Sincos(w*t + ph)
		x += a * (d1*sn + v*w*cs)
	})
	return x
}

// Acceleration returns d2X/dt2 in m/s^2.
func (s Shaker) Acceleration(t float64) float64 {
	v, d1, d2 := s.ramp(t)
	var x float64
	s.terms(func(a, w, ph float64) {
		sn, cs := math.Sincos(w*t + ph)
		x += a * (d2*sn + 2*d1*w*cs - v*w*w*sn)
	})
	return x
}
