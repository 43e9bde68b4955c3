package study

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
)

// OnsetOptions are how FindOnset looks for the onset of swimming in one
// parameter (the shaking amplitude, say) between Lo and Hi.
type OnsetOptions struct {
	Lo, Hi float64 // the bracket searched; Lo < Hi
	Log    bool    // space the points geometrically (Lo > 0)
	Scan   int     // points of the first pass across [Lo, Hi] (0: 5; at least 2)
	// Tol ends the narrowing when the bracket's relative width,
	// (hi - lo)/hi, is at most Tol (0: 0.05).
	Tol float64
	// A point swims when its mean speed exceeds Sigmas standard errors
	// (0: 2, the run summary's rule) and Floor (m/s).
	Sigmas float64
	Floor  float64
	// Jobs points are run at once in each narrowing round, spaced evenly
	// inside the bracket (0: 1, plain bisection).
	Jobs int
	// MaxRuns bounds the number of points run (0: 60).
	MaxRuns int
	// ModelError is the relative error of a simulated speed that its
	// standard error does not show (resolution, the finite window),
	// added in quadrature in the fits (0: 0.02; negative: none).
	ModelError float64
}

func (o OnsetOptions) withDefaults() OnsetOptions {
	if o.Scan == 0 {
		o.Scan = 5
	}
	if o.Tol == 0 {
		o.Tol = 0.05
	}
	if o.Sigmas == 0 {
		o.Sigmas = 2
	}
	o.Jobs = max(o.Jobs, 1)
	if o.MaxRuns == 0 {
		o.MaxRuns = 60
	}
	switch {
	case o.ModelError == 0:
		o.ModelError = 0.02
	case o.ModelError < 0:
		o.ModelError = 0
	}
	return o
}

// Check reports whether the options (with their defaults) make a search.
func (o OnsetOptions) Check() error { return o.withDefaults().check() }

func (o OnsetOptions) check() error {
	switch {
	case !(o.Lo < o.Hi) || math.IsInf(o.Lo, 0) || math.IsInf(o.Hi, 0):
		return fmt.Errorf("bracket %g, %g: give LO < HI, both finite", o.Lo, o.Hi)
	case o.Log && !(o.Lo > 0):
		return fmt.Errorf("bracket %g, %g on a log scale: both ends must be positive", o.Lo, o.Hi)
	case o.Scan < 2:
		return fmt.Errorf("%d scan points: at least 2", o.Scan)
	case !(o.Tol > 0 && o.Tol < 1):
		return fmt.Errorf("tolerance %g: give a relative bracket width between 0 and 1, e.g. 0.05", o.Tol)
	case !(o.Sigmas > 0):
		return fmt.Errorf("%g standard errors: give a positive number, e.g. 2", o.Sigmas)
	case !(o.Floor >= 0) || math.IsInf(o.Floor, 0):
		return fmt.Errorf("floor %g m/s: give a speed of 0 or more", o.Floor)
	case o.MaxRuns < o.Scan:
		return fmt.Errorf("at most %d runs, fewer than the %d scan points", o.MaxRuns, o.Scan)
	}
	return nil
}

// OnsetPoint is one value of the parameter and what its run found.
type OnsetPoint struct {
	Value       float64  `json:"value"`
	Speed       float64  `json:"mean_speed_m_s"`            // signed along +z
	Uncertainty float64  `json:"speed_uncertainty_m_s"`     // standard error
	Converged   bool     `json:"converged"`                 // the run's own convergence test
	Swimming    bool     `json:"swimming"`                  // |Speed| > Sigmas Uncertainty and > Floor
	Round       int      `json:"round"`                     // 0: the scan, then each narrowing round
	Run         int      `json:"run"`                       // 1-based order in which it was asked for
	Dir         string   `json:"dir,omitempty"`             // its run directory
	WarmStart   string   `json:"warm_start_from,omitempty"` // the run it started from, if any
	Err         string   `json:"error,omitempty"`           // why it has no speed
	Note        string   `json:"note,omitempty"`            // e.g. not converged
	Warnings    []string `json:"warnings,omitempty"`        // the run's own warnings
}

// OnsetEval runs the points at values (at once where it can) and returns
// them in the same order, Value, Speed, Uncertainty and Converged filled
// in (Err where a run failed). An error stops the search.
type OnsetEval func(ctx context.Context, values []float64, round int) ([]OnsetPoint, error)

// Onset is what FindOnset found.
type Onset struct {
	Options OnsetOptions `json:"options"`
	Points  []OnsetPoint `json:"points"` // sorted by value

	// The bracket: Below does not swim, Above swims (Above < Below when
	// the swimming side is the low one, as for a viscosity). Found is
	// false when every point, or none, swims: then the onset lies outside
	// [Lo, Hi] and Side says which way.
	Found       bool          `json:"found"`
	Below       float64       `json:"not_swimming_at"`
	Above       float64       `json:"swimming_at"`
	Width       float64       `json:"relative_width"` // |Above - Below| / max(|Above|, |Below|)
	SwimsAbove  bool          `json:"swims_above"`    // the swimming side is the high one
	Side        string        `json:"outside,omitempty"`
	Tolerance   bool          `json:"within_tolerance"`
	Crossings   int           `json:"crossings"` // changes of class along the sorted points
	Power       *PowerFit     `json:"power_law,omitempty"`
	Threshold   *ThresholdFit `json:"threshold_law,omitempty"`
	Verdict     string        `json:"verdict"`
	Explanation string        `json:"explanation"`
	Caveats     []string      `json:"caveats"`
}

// errOnsetRuns marks a search stopped by the run budget.
var errOnsetRuns = errors.New("run budget spent")

// FindOnset looks for the onset of swimming: it runs Scan points across
// [Lo, Hi], classifies each as swimming or not, then narrows the bracket
// around the lowest change of class by running Jobs points inside it per
// round (bisection for one) until its relative width is within Tol, and
// fits the speeds on the swimming side with a power law and a threshold
// law (see FitOnset). The search is deterministic: the same results give
// the same sequence of values, so a search that was stopped can be
// repeated with finished runs reused.
func FindOnset(ctx context.Context, eval OnsetEval, o OnsetOptions) (*Onset, error) {
	o = o.withDefaults()
	if err := o.check(); err != nil {
		return nil, err
	}
	res := &Onset{Options: o}
	runs := 0
	run := func(values []float64, round int) error {
		if runs+len(values) > o.MaxRuns {
			return fmt.Errorf("%w: %d runs asked for, at most %d allowed", errOnsetRuns, runs+len(values), o.MaxRuns)
		}
		pts, err := eval(ctx, values, round)
		if err != nil {
			return err
		}
		if len(pts) != len(values) {
			return fmt.Errorf("onset: %d results for %d values", len(pts), len(values))
		}
		for i := range pts {
			runs++
			pts[i].Value, pts[i].Round, pts[i].Run = values[i], round, runs
			classify(&pts[i], o)
		}
		res.Points = append(res.Points, pts...)
		sort.SliceStable(res.Points, func(i, j int) bool { return res.Points[i].Value < res.Points[j].Value })
		return nil
	}
	if err := run(spaced(o.Lo, o.Hi, o.Scan, o.Log, true), 0); err != nil {
		return res, err
	}
	var stop error
	for round := 1; ; round++ {
		res.bracket()
		if !res.Found || res.Tolerance {
			break
		}
		lo, hi := min(res.Below, res.Above), max(res.Below, res.Above)
		if err := run(spaced(lo, hi, o.Jobs, o.Log, false), round); err != nil {
			if errors.Is(err, errOnsetRuns) {
				stop = err
				res.bracket()
				break
			}
			return res, err
		}
	}
	FitOnset(res)
	if stop != nil {
		res.Caveats = append(res.Caveats, fmt.Sprintf("the narrowing stopped before the tolerance: %v", stop))
	}
	return res, nil
}

// classify decides whether p swims.
func classify(p *OnsetPoint, o OnsetOptions) {
	if p.Err != "" || math.IsNaN(p.Speed) {
		p.Swimming = false
		return
	}
	a := math.Abs(p.Speed)
	p.Swimming = a > o.Sigmas*p.Uncertainty && a > o.Floor
}

// usable reports whether a point has a speed.
func (p OnsetPoint) usable() bool { return p.Err == "" && !math.IsNaN(p.Speed) }

// spaced returns n values from lo to hi, with the ends (ends) or strictly
// inside (n values splitting [lo, hi] into n+1 equal parts), evenly or
// geometrically spaced.
func spaced(lo, hi float64, n int, geometric, ends bool) []float64 {
	out := make([]float64, n)
	parts, first := float64(n+1), 1.0
	if ends {
		parts, first = float64(n-1), 0
	}
	for i := range out {
		f := (first + float64(i)) / parts
		if geometric {
			out[i] = lo * math.Pow(hi/lo, f)
		} else {
			out[i] = lo + (hi-lo)*f
		}
	}
	if ends {
		out[0], out[n-1] = lo, hi
	}
	return out
}

// bracket finds the lowest change of class among the usable points and
// whether it is narrow enough.
func (r *Onset) bracket() {
	var pts []OnsetPoint
	for _, p := range r.Points {
		if p.usable() {
			pts = append(pts, p)
		}
	}
	r.Found, r.Tolerance, r.Crossings, r.Side = false, false, 0, ""
	first := -1
	for i := 1; i < len(pts); i++ {
		if pts[i].Swimming != pts[i-1].Swimming {
			r.Crossings++
			if first < 0 {
				first = i
			}
		}
	}
	if first < 0 {
		swim := len(pts) > 0 && pts[0].Swimming
		if swim {
			r.Side = "every point swims: the onset, if any, lies outside the bracket, on the side where the speed falls"
		} else {
			r.Side = "no point swims: the onset, if any, lies outside the bracket, on the side where the speed grows"
		}
		if len(pts) > 1 {
			grows := math.Abs(pts[len(pts)-1].Speed) > math.Abs(pts[0].Speed)
			switch {
			case swim && grows, !swim && !grows:
				r.Side += fmt.Sprintf(" (below %g)", pts[0].Value)
			default:
				r.Side += fmt.Sprintf(" (above %g)", pts[len(pts)-1].Value)
			}
		}
		return
	}
	a, b := pts[first-1], pts[first]
	r.Found = true
	r.SwimsAbove = b.Swimming
	if r.SwimsAbove {
		r.Below, r.Above = a.Value, b.Value
	} else {
		r.Below, r.Above = b.Value, a.Value
	}
	r.Width = math.Abs(b.Value-a.Value) / max(math.Abs(a.Value), math.Abs(b.Value))
	r.Tolerance = r.Width <= r.Options.Tol
}

// fitPoints returns the points the laws are fitted to: every point whose
// mean speed is distinguishable from zero (more than Sigmas standard
// errors), whatever the floor - a speed under the floor is still a
// measured speed, and a threshold law must explain it too.
func (r *Onset) fitPoints() []OnsetPoint {
	var out []OnsetPoint
	for _, p := range r.Points {
		if p.usable() && p.Speed != 0 && math.Abs(p.Speed) > r.Options.Sigmas*p.Uncertainty {
			out = append(out, p)
		}
	}
	return slices.Clip(out)
}

// swimsAbove reports whether the speed grows with the parameter: the
// bracket's orientation, or without one the trend of the fitted points.
func (r *Onset) swimsAbove() bool {
	if r.Found {
		return r.SwimsAbove
	}
	pts := r.fitPoints()
	return len(pts) < 2 || math.Abs(pts[len(pts)-1].Speed) >= math.Abs(pts[0].Speed)
}
