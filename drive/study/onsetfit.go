package study

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// The two laws fitted to the speed near the onset. Both are fitted to
// ln|U| by weighted least squares, each point weighted by the inverse
// variance of ln|U|: (sigma/|U|)^2 from the run's standard error plus
// ModelError^2 for what the standard error does not show. The threshold
// law nests the power law (A_c = 0 on a positive parameter), so the drop
// in chi-square it brings is compared with the 95% point of chi-square
// with one degree of freedom, 3.84 (a likelihood-ratio test, e.g.
// Press et al., Numerical Recipes, 3rd ed., section 15.6; the boundary at
// A_c = 0 makes it somewhat conservative).
var chi2OneDof95 = chi2Quantile95(1) // 3.841

// chi2Quantile95 is the 95% point of chi-square with k degrees of freedom.
func chi2Quantile95(k int) float64 { return distuv.ChiSquared{K: float64(k)}.Quantile(0.95) }

// PowerFit is U = C A^N fitted to the swimming points.
type PowerFit struct {
	C         float64   `json:"c"`
	N         float64   `json:"n"`
	NErr      float64   `json:"n_uncertainty"`
	Chi2      float64   `json:"chi2"`
	Dof       int       `json:"dof"`
	RMS       float64   `json:"rms_relative_residual"`
	Values    []float64 `json:"values"`
	Residuals []float64 `json:"relative_residuals"` // U_fit/U - 1 at each value
}

// ThresholdFit is U = C (s (A - Ac))^Beta fitted to the swimming points,
// s = +1 when the swimming side is above Ac, -1 when below; AcLo and AcHi
// bound Ac where chi-square is within 1 of its minimum (the profile
// likelihood interval, about one standard error).
type ThresholdFit struct {
	C, Beta   float64
	BetaErr   float64   `json:"beta_uncertainty"`
	Ac        float64   `json:"a_c"`
	AcLo      float64   `json:"a_c_low"`
	AcHi      float64   `json:"a_c_high"`
	AtBound   bool      `json:"a_c_at_search_bound"` // Ac went to the far end of an arbitrary search range
	Chi2      float64   `json:"chi2"`
	Dof       int       `json:"dof"`
	RMS       float64   `json:"rms_relative_residual"`
	Values    []float64 `json:"values"`
	Residuals []float64 `json:"relative_residuals"`
}

// Verdicts of FitOnset.
const (
	VerdictThreshold = "threshold"
	VerdictPower     = "power law"
	VerdictUndecided = "undecided"
)

// FitOnset fits both laws to the swimming side of r's bracket and says
// which one the data support, with its caveats.
func FitOnset(r *Onset) {
	o := r.Options
	pts := r.fitPoints()
	r.Caveats = append(r.Caveats, onsetCaveats(r)...)
	r.Power, r.Threshold = nil, nil
	x := make([]float64, len(pts))
	y := make([]float64, len(pts))
	w := make([]float64, len(pts))
	positive := true
	for i, p := range pts {
		a := math.Abs(p.Speed)
		x[i], y[i] = p.Value, math.Log(a)
		rel := p.Uncertainty / a
		w[i] = 1 / (rel*rel + o.ModelError*o.ModelError)
		positive = positive && p.Value > 0
	}
	if len(pts) >= 3 && positive {
		r.Power = fitPower(x, y, w)
	}
	if len(pts) >= 4 {
		r.Threshold = fitThreshold(x, y, w, r.swimsAbove(), o.Log || positive)
	}
	r.Verdict, r.Explanation = verdict(r)
	var chosen string
	var chi2 float64
	var dof int
	switch {
	case r.Verdict == VerdictThreshold && r.Threshold != nil:
		chosen, chi2, dof = "threshold", r.Threshold.Chi2, r.Threshold.Dof
	case r.Verdict == VerdictPower && r.Power != nil:
		chosen, chi2, dof = "power", r.Power.Chi2, r.Power.Dof
	}
	if chosen != "" && dof > 0 && chi2 > chi2Quantile95(dof) {
		r.Caveats = append(r.Caveats, fmt.Sprintf("the %s law itself does not fit within the stated uncertainties (chi2 %.3g for %d dof, above the 95%% point %.3g): "+
			"the speed follows neither law exactly over the points fitted (a narrower range near the onset, or a larger -model-error, would say more)", chosen, chi2, dof, chi2Quantile95(dof)))
	}
}

// line fits y = a + b x by weighted least squares (gonum's
// stat.LinearRegression) and returns a, b, the standard error of b,
// 1/sqrt(sum w (x - mean x)^2) for weights w = 1/sigma^2, and chi-square.
func line(x, y, w []float64) (a, b, bErr, chi2 float64) {
	a, b = stat.LinearRegression(x, y, w, false)
	mx := stat.Mean(x, w)
	var sxx float64
	for i := range x {
		sxx += w[i] * (x[i] - mx) * (x[i] - mx)
	}
	bErr = 1 / math.Sqrt(sxx)
	for i := range x {
		r := y[i] - a - b*x[i]
		chi2 += w[i] * r * r
	}
	return a, b, bErr, chi2
}

// residuals returns U_fit/U - 1 from log residuals and their rms.
func residuals(y, fit []float64) ([]float64, float64) {
	out := make([]float64, len(y))
	var ss float64
	for i := range y {
		out[i] = math.Exp(fit[i]-y[i]) - 1
		ss += out[i] * out[i]
	}
	return out, math.Sqrt(ss / float64(len(y)))
}

func fitPower(A, y, w []float64) *PowerFit {
	x := make([]float64, len(A))
	for i := range A {
		x[i] = math.Log(A[i])
	}
	a, b, bErr, chi2 := line(x, y, w)
	fit := make([]float64, len(x))
	for i := range x {
		fit[i] = a + b*x[i]
	}
	res, rms := residuals(y, fit)
	return &PowerFit{C: math.Exp(a), N: b, NErr: bErr, Chi2: chi2, Dof: len(x) - 2, RMS: rms,
		Values: A, Residuals: res}
}

// fitThreshold fits U = C (s (A - Ac))^Beta: for each Ac the law is a
// straight line in ln(s (A - Ac)), so chi-square is profiled over Ac alone
// (a grid in the gap between Ac and the nearest swimming point, refined by
// golden-section search). Ac is searched from that point out to 0 for a
// positive parameter on the high swimming side, otherwise out to ten
// times the spread of the points.
func fitThreshold(A, y, w []float64, above, positive bool) *ThresholdFit {
	s := 1.0
	edge, spread := math.Inf(1), 0.0
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, a := range A {
		lo, hi = min(lo, a), max(hi, a)
	}
	spread = hi - lo
	edge = lo
	if !above {
		s, edge = -1, hi
	}
	G := 10 * spread // the gap searched
	nested := above && positive
	if nested {
		G = edge // out to Ac = 0: the power law
	}
	x := make([]float64, len(A))
	prof := func(g float64) (a, b, bErr, chi2 float64) {
		ac := edge - s*g
		for i := range A {
			x[i] = math.Log(s * (A[i] - ac))
		}
		return line(x, y, w)
	}
	chi := func(g float64) float64 { _, _, _, c := prof(g); return c }
	// Grid: logarithmic in the gap from 1e-9 G to G, and linear.
	var grid []float64
	for k := 0; k <= 180; k++ {
		grid = append(grid, G*math.Pow(10, -9+9*float64(k)/180))
	}
	for k := 1; k < 100; k++ {
		grid = append(grid, G*float64(k)/100)
	}
	slices.Sort(grid)
	best := 0
	cs := make([]float64, len(grid))
	for k, g := range grid {
		cs[k] = chi(g)
		if cs[k] < cs[best] {
			best = k
		}
	}
	g := grid[best]
	if best > 0 && best < len(grid)-1 {
		g = golden(chi, grid[best-1], grid[best+1])
	}
	a, b, bErr, chi2 := prof(g)
	f := &ThresholdFit{C: math.Exp(a), Beta: b, BetaErr: bErr, Ac: edge - s*g, Chi2: chi2, Dof: len(A) - 3,
		AtBound: best == len(grid)-1 && !nested}
	// The range of Ac with chi-square within 1 of the minimum.
	gLo, gHi := g, g
	for k := best; k >= 0 && cs[k] <= chi2+1; k-- {
		gLo = grid[k]
		if k > 0 && cs[k-1] > chi2+1 {
			gLo = bisectLevel(chi, grid[k-1], grid[k], chi2+1)
		}
	}
	for k := best; k < len(grid) && cs[k] <= chi2+1; k++ {
		gHi = grid[k]
		if k < len(grid)-1 && cs[k+1] > chi2+1 {
			gHi = bisectLevel(chi, grid[k+1], grid[k], chi2+1)
		}
	}
	f.AcLo, f.AcHi = min(edge-s*gLo, edge-s*gHi), max(edge-s*gLo, edge-s*gHi)
	fit := make([]float64, len(A))
	for i := range A {
		fit[i] = a + b*math.Log(s*(A[i]-f.Ac))
	}
	f.Values = A
	f.Residuals, f.RMS = residuals(y, fit)
	return f
}

// golden minimises f on [a, b] by golden-section search.
func golden(f func(float64) float64, a, b float64) float64 {
	const r = 0.6180339887498949
	c, d := b-r*(b-a), a+r*(b-a)
	fc, fd := f(c), f(d)
	for range 80 {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - r*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + r*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}

// bisectLevel finds where f crosses level between out (f > level) and in
// (f <= level).
func bisectLevel(f func(float64) float64, out, in, level float64) float64 {
	for range 60 {
		m := (out + in) / 2
		if f(m) > level {
			out = m
		} else {
			in = m
		}
	}
	return in
}

// verdict says which law the fits support and why.
func verdict(r *Onset) (string, string) {
	p, t := r.Power, r.Threshold
	n := len(r.fitPoints())
	switch {
	case p == nil && t == nil:
		return VerdictUndecided, fmt.Sprintf("%d point(s) with a speed distinguishable from zero: the power law needs 3 and the threshold law 4 to be fitted and judged; widen the bracket or run more points", n)
	case t == nil:
		return VerdictUndecided, fmt.Sprintf("only %d points with a speed distinguishable from zero: the power law fits with n = %.3g +- %.2g (chi2 %.3g for %d dof), but the threshold law needs 4 points to be judged", n, p.N, p.NErr, p.Chi2, p.Dof)
	case p == nil:
		return VerdictThreshold, fmt.Sprintf("the parameter is not positive throughout, so only the threshold law was fitted: A_c = %.4g (%.4g to %.4g), beta = %.3g", t.Ac, t.AcLo, t.AcHi, t.Beta)
	}
	drop := p.Chi2 - t.Chi2
	if drop > chi2OneDof95 && !t.AtBound {
		return VerdictThreshold, fmt.Sprintf("sharp onset: the threshold at A_c = %.4g lowers chi-square by %.3g (more than %.2f, the 95%% point for one more parameter), so the data support a threshold over a power law",
			t.Ac, drop, chi2OneDof95)
	}
	return VerdictPower, fmt.Sprintf("smooth onset: a threshold lowers chi-square by only %.3g (less than %.2f, the 95%% point for one more parameter), so the data support a power law, U ~ A^%.3g, with no threshold; the bracket marks where the speed falls below the floor or its uncertainty, not a threshold",
		drop, chi2OneDof95, p.N)
}

// onsetCaveats lists what a reader of the onset should know.
func onsetCaveats(r *Onset) []string {
	o := r.Options
	var out []string
	var unconv, failed []string
	for _, p := range r.Points {
		switch {
		case !p.usable():
			failed = append(failed, fmt.Sprintf("%.4g (%s)", p.Value, p.Err))
		case !p.Converged:
			unconv = append(unconv, fmt.Sprintf("%.4g", p.Value))
		}
	}
	if len(failed) > 0 {
		out = append(out, "points without a speed, left out: "+strings.Join(failed, "; "))
	}
	if len(unconv) > 0 {
		out = append(out, fmt.Sprintf("%d of %d runs did not pass their own convergence test (more periods would settle them): %s",
			len(unconv), len(r.Points), strings.Join(unconv, ", ")))
	}
	warm := 0
	for _, p := range r.Points {
		if p.WarmStart != "" {
			warm++
		}
	}
	if warm > 0 && len(unconv) > 0 {
		out = append(out, fmt.Sprintf("%d runs were warm-started and %d runs are not converged: a warm-started run carries on its source's flow, so it has run longer in all than a run from rest; "+
			"until the runs converge, warm and cold points differ by more than their standard errors (and the fits show it). Run more periods, or search without -warm to compare", warm, len(unconv)))
	}
	seen := map[string]int{}
	var order []string
	for _, p := range r.Points {
		for _, w := range p.Warnings {
			if seen[w] == 0 {
				order = append(order, w)
			}
			seen[w]++
		}
	}
	for _, w := range order {
		out = append(out, fmt.Sprintf("%d of %d runs warned: %s", seen[w], len(r.Points), w))
	}
	if r.Crossings > 1 {
		out = append(out, fmt.Sprintf("the class changes %d times along the parameter: the bracket is the lowest change, and the others are not narrowed", r.Crossings))
	}
	pos, neg := 0, 0
	for _, p := range r.fitPoints() {
		if p.Speed > 0 {
			pos++
		} else {
			neg++
		}
	}
	if pos > 0 && neg > 0 {
		out = append(out, fmt.Sprintf("the swimming direction is not the same at every point (%d towards +z, %d towards -z): the fits use the speed's size", pos, neg))
	}
	out = append(out, fmt.Sprintf("a point counts as swimming when its mean speed exceeds %g standard errors and the floor of %.3g m/s: below the floor a speed is called zero, so the bracket depends on the floor", o.Sigmas, o.Floor))
	if o.ModelError > 0 {
		out = append(out, fmt.Sprintf("the fits weigh each speed by its standard error and a %.3g%% error its standard error does not show (resolution, window): chi-square is judged against that", 100*o.ModelError))
	}
	return out
}
