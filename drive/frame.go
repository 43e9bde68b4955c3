package drive

import "math"

// Shaker is the prescribed motion of the container along the axis,
// X(t) = s(t) [A sin(omega t) + sum_n A_n sin(n omega t + phi_n)], with the
// ramp s(t) = (1 - cos(pi t/T_r))/2 for t < T_r and 1 afterwards; X, its
// velocity and its acceleration are exact derivatives of one another.
//
// With From set, the ramp goes from that drive to this one instead of from
// rest: X(t) = s(t) X_this(t) + (1 - s(t)) X_from(t) (a warm start from a
// run with another drive).
type Shaker struct {
	Amplitude float64 // m
	Omega     float64 // rad/s
	Ramp      float64 // ramp duration T_r, s (0: none)
	Harmonics []Harmonic
	From      *Shaker // the drive the ramp starts from (nil: rest); its own ramp is not used
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
	if s.From != nil {
		x0, _, _ := s.From.steady(t)
		return v*x + (1-v)*x0
	}
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
	if s.From != nil {
		x0, v0, _ := s.From.steady(t)
		return x - d1*x0 + (1-v)*v0
	}
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
	if s.From != nil {
		x0, v0, a0 := s.From.steady(t)
		return x - d2*x0 - 2*d1*v0 + (1-v)*a0
	}
	return x
}

// steady returns X, dX/dt and d2X/dt2 of the drive without its ramp.
func (s Shaker) steady(t float64) (x, v, a float64) {
	s.terms(func(amp, w, ph float64) {
		sn, cs := math.Sincos(w*t + ph)
		x += amp * sn
		v += amp * w * cs
		a -= amp * w * w * sn
	})
	return x, v, a
}
