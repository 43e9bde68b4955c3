package record

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat"
)

// Speed is the mean swimming speed estimated from the stroboscopic centroid
// (sampled once per drive period, at the same phase, so the oscillation
// drops out).
type Speed struct {
	Mean        float64 // m/s, signed along +z
	Uncertainty float64 // m/s, standard error of the mean
	Periods     int     // periods analysed
	FirstPeriod int     // the first of them (1-based)
	Swimming    bool    // |Mean| > 2 Uncertainty
	Converged   bool
	Criterion   string
	HalfMeans   [2]float64 // means over the first and second half of the window
}

// SwimmingSpeed estimates the mean speed from the stroboscopic centroids
// c[p] at the end of periods p = 0..P (c[0] at the start) of duration T,
// skipping the first skip periods (the ramp and its transient) and using
// the later half of what remains, at least 2 periods. The per-period
// displacements d_p give the mean and, through their scatter, the standard
// error s/sqrt(N). The estimate counts as converged when the means of the
// window's two halves agree within twice their combined standard error
// plus 10% of the mean: a drift that is still settling shows as a
// difference between them.
func SwimmingSpeed(c []float64, T float64, skip int) Speed {
	P := len(c) - 1
	var s Speed
	if P < 2 {
		s.Criterion = "fewer than 2 periods: no estimate"
		return s
	}
	start := analysisStart(P, skip)
	d := make([]float64, 0, P-start)
	for p := start; p < P; p++ {
		d = append(d, (c[p+1]-c[p])/T)
	}
	s.FirstPeriod, s.Periods = start+1, len(d)
	mean, se := meanSE(d)
	s.Mean, s.Uncertainty = mean, se
	s.Swimming = math.Abs(mean) > 2*se && mean != 0
	h := len(d) / 2
	m1, s1 := meanSE(d[:h])
	m2, s2 := meanSE(d[h:])
	s.HalfMeans = [2]float64{m1, m2}
	tol := 2*math.Hypot(s1, s2) + 0.1*math.Abs(mean)
	s.Converged = len(d) >= 4 && math.Abs(m1-m2) <= tol
	s.Criterion = fmt.Sprintf("mean over periods %d-%d; converged when the means of the two halves "+
		"agree within 2 combined standard errors + 10%% (here %.3g vs %.3g m/s, tolerance %.3g)",
		s.FirstPeriod, s.FirstPeriod+s.Periods-1, m1, m2, tol)
	if len(d) < 4 {
		s.Criterion += "; needs at least 4 periods in the window"
	}
	return s
}

// meanSE returns the mean and its standard error s/sqrt(N), s the
// sample standard deviation (gonum's stat.MeanStdDev, with its corrected
// two-pass sum).
func meanSE(x []float64) (mean, se float64) {
	switch len(x) {
	case 0:
		return 0, 0
	case 1:
		return x[0], 0
	}
	mean, sd := stat.MeanStdDev(x, nil)
	return mean, stat.StdErr(sd, float64(len(x)))
}

// analysisStart is the first period (0-based) of the window over which the
// swimming speed and the mean fields are taken: the later half of the
// periods after skip, at least the last 2.
func analysisStart(P, skip int) int {
	start := skip
	if rem := P - skip; rem >= 4 {
		start = P - rem/2
	} else if rem < 2 {
		start = max(0, P-2)
	}
	return start
}

// Trends of a gap.
const (
	GapClosing = "closing"
	GapOpening = "opening"
	GapLocked  = "locked"
)

// GapTrend estimates how a stroboscopic gap series g (one value per
// period end, index 0 at the start) changes, like SwimmingSpeed does a
// centroid's; speed is the swimmers' mean speed, the scale of "locked".
func GapTrend(g []float64, T float64, skip int, speed float64) (rate, se float64, trend string) {
	sp := SwimmingSpeed(g, T, skip)
	rate, se = sp.Mean, sp.Uncertainty
	if sp.Periods == 0 {
		return math.NaN(), math.NaN(), GapLocked
	}
	switch {
	case math.Abs(rate) <= 2*se || math.Abs(rate) < 0.01*math.Abs(speed):
		trend = GapLocked
	case rate < 0:
		trend = GapClosing
	default:
		trend = GapOpening
	}
	return rate, se, trend
}
