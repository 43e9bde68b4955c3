package study

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"axiswim/cases"
	"axiswim/drive/run"
	"axiswim/output"
)

// SweepOptions are how RunSweep runs the points of a sweep.
type SweepOptions struct {
	Out   string    // the sweep directory: one run directory per point and results.csv
	Jobs  int       // points run at once (0: 1)
	Cores int       // goroutines shared among the jobs (0: all cores)
	Log   io.Writer // one line per point started and finished
	// Warm starts each point from the final state of the nearest point
	// finished by then (by the varied values, scaled to their ranges),
	// where their lattices agree; every point keeps its final state
	// (final.bin) for this. With Jobs > 1 which points have finished
	// depends on timing, so the results do too: each summary records its
	// source.
	Warm bool
}

// The errors of points that did not run to their end.
var (
	ErrInterrupted = errors.New("interrupted (resume the sweep to continue)")
	ErrNotRun      = errors.New("not run (the sweep was interrupted)")
)

// SweepResult is one point of a sweep: its values, where it ran, and what
// its run found (nil Summary when the run failed before it had one).
type SweepResult struct {
	Index   int
	Point   cases.Point
	Dir     string
	Summary *run.Summary
	Resumed bool  // continued from a checkpoint
	Skipped bool  // finished by an earlier invocation; nothing was run
	Err     error // why the run failed, if it did (the run's own error, its chain kept)
}

// PointDir is the run directory of point i of a sweep in out.
func PointDir(out string, i int) string { return filepath.Join(out, fmt.Sprintf("point_%03d", i+1)) }

// ResultsFile is the table RunSweep writes in the sweep directory.
const ResultsFile = "results.csv"

// RunSweep runs every point of s as an ordinary run (its own directory,
// checkpoints and summary) and writes results.csv and the speed pictures. Points are run Jobs at
// a time with Cores/Jobs goroutines each; each point's results are those
// of the same case run alone, bit for bit, whatever Jobs is (a run does
// not depend on its number of goroutines). A point whose summary says it
// completed is not run again, and one with a checkpoint continues from it,
// so a killed sweep resumes where it stopped. A point that fails is
// recorded with its error and the others go on; an interruption (ctx)
// stops every running point at a checkpoint.
func RunSweep(ctx context.Context, s *cases.Sweep, o SweepOptions) ([]SweepResult, error) {
	jobs := max(o.Jobs, 1)
	cores := o.Cores
	if cores <= 0 {
		cores = runtime.NumCPU()
	}
	threads := max(1, cores/jobs)
	if err := os.MkdirAll(o.Out, 0o755); err != nil {
		return nil, fmt.Errorf("sweep directory: %w", err)
	}
	log := o.Log
	if log == nil {
		log = io.Discard
	}
	pts := s.Points()
	results := make([]SweepResult, len(pts))
	var mu sync.Mutex // serialises log lines
	var doneMu sync.Mutex
	var done []int // points finished, for warm starts
	eachPoint(ctx, len(pts), jobs, func(i int) {
		from := ""
		if o.Warm {
			doneMu.Lock()
			if k := nearestPoint(s, pts, i, done); k >= 0 {
				from = PointDir(o.Out, k)
			}
			doneMu.Unlock()
		}
		r := runPoint(ctx, s, i, pts[i], o.Out, threads, log, &mu, from, o.Warm)
		results[i] = r
		if r.Err == nil && r.Summary != nil && r.Summary.Completed {
			doneMu.Lock()
			done = append(done, i)
			doneMu.Unlock()
		}
	})
	for i := range results {
		if results[i].Dir == "" { // not started: interrupted before its turn
			results[i] = SweepResult{Index: i, Point: pts[i], Dir: PointDir(o.Out, i), Err: ErrNotRun}
		}
	}
	if err := WriteSweepResults(filepath.Join(o.Out, ResultsFile), s, results); err != nil {
		return results, err
	}
	if err := WriteSweepPictures(o.Out, s, results); err != nil {
		return results, err
	}
	if ctx.Err() != nil {
		return results, fmt.Errorf("sweep interrupted: %w", ctx.Err())
	}
	return results, nil
}

// RunSweepPoint runs point i (from 0) of s alone, exactly as RunSweep
// runs it (same directory, same skip and resume rules, same results bit
// for bit) with o.Cores goroutines (0: all cores; o.Jobs is not used).
// It writes no results.csv: many points may run at once in separate
// processes (CollectSweep and WriteSweepResults gather them afterwards).
// The error is for an i out of range; a point that fails has Err set.
func RunSweepPoint(ctx context.Context, s *cases.Sweep, i int, o SweepOptions) (SweepResult, error) {
	pts := s.Points()
	if i < 0 || i >= len(pts) {
		return SweepResult{}, fmt.Errorf("point %d of a sweep of points 1 to %d", i+1, len(pts))
	}
	threads := o.Cores
	if threads <= 0 {
		threads = runtime.NumCPU()
	}
	if err := os.MkdirAll(o.Out, 0o755); err != nil {
		return SweepResult{}, fmt.Errorf("sweep directory: %w", err)
	}
	log := o.Log
	if log == nil {
		log = io.Discard
	}
	var mu sync.Mutex
	return runPoint(ctx, s, i, pts[i], o.Out, threads, log, &mu, "", false), nil
}

// runPoint runs point i, or resumes it from its checkpoint, or skips it
// when an earlier invocation finished it (completed, or failed without a
// checkpoint: a failed point's directory is kept as its record, not run
// over). A point with files but neither summary nor checkpoint was
// stopped before its first checkpoint: it runs again from the start, over
// those files, saying so. With warmFrom set the point starts from that
// run's final state (see Options.WarmFrom); with keep it keeps its own
// final state.
func runPoint(ctx context.Context, s *cases.Sweep, i int, pt cases.Point, out string, threads int, log io.Writer, mu *sync.Mutex, warmFrom string, keep bool) SweepResult {
	r := SweepResult{Index: i, Point: pt, Dir: PointDir(out, i)}
	say := func(format string, args ...any) {
		mu.Lock()
		defer mu.Unlock()
		fmt.Fprintf(log, "point %d (%s): %s\n", i+1, s.Label(pt), fmt.Sprintf(format, args...))
	}
	state, sum, why := InspectPoint(r.Dir)
	_, ckErr := os.Stat(filepath.Join(r.Dir, run.CheckpointFile))
	switch {
	case state == PointDone:
		r.Summary, r.Skipped = sum, true
		say("finished earlier, not run again")
		return r
	case state == PointFailed && ckErr == nil && sum != nil:
		// A run that failed writing its files kept a checkpoint to go on
		// from; a guard's failure resumed from an earlier checkpoint fails
		// again at the same step.
		state = PointUnfinished
	case state == PointFailed:
		r.Summary, r.Skipped, r.Err = sum, true, why
		say("failed earlier, not run again (%s); to run it again, remove %s", why, r.Dir)
		return r
	}
	_, c, err := s.CaseAt(pt)
	if err != nil {
		r.Err = err
		say("%v", err)
		return r
	}
	l, err := cases.Resolve(c)
	if err != nil {
		r.Err = err
		say("%v", err)
		return r
	}
	r.Resumed = state == PointUnfinished
	how := map[bool]string{true: "resuming", false: "running"}[r.Resumed]
	if state == PointPartial {
		how = "stopped before its first checkpoint earlier; running again from the start, replacing its files,"
	}
	if warmFrom != "" && !r.Resumed {
		how += " from the state of " + filepath.Base(warmFrom)
	} else {
		warmFrom = "" // a resumed run keeps the start it had
	}
	say("%s on %d goroutine(s)", how, threads)
	sum, err = run.Execute(ctx, c, l, run.Options{Out: r.Dir, Threads: threads, Quiet: true, Log: io.Discard,
		Resume: r.Resumed, Force: state == PointPartial, WarmFrom: warmFrom, SaveFinal: keep})
	r.Summary = sum
	switch {
	case err != nil:
		r.Err = err
		say("failed: %v", err)
	case sum != nil && sum.Interrupted:
		r.Err = ErrInterrupted
		say("interrupted at a checkpoint")
	default:
		say("done in %.1f s", sum.WallTime)
	}
	return r
}

// nearestPoint returns the point among done nearest to point i, the
// distance in each varied key scaled to the key's range (logarithmically
// for log ranges); -1 when done is empty. Ties go to the lower index.
func nearestPoint(s *cases.Sweep, pts []cases.Point, i int, done []int) int {
	return nearest(done, func(k int) float64 {
		var d float64
		for n, p := range s.Params {
			a, b := pts[i][n], pts[k][n]
			lo, hi := slices.Min(p.Values), slices.Max(p.Values)
			if p.Log && lo > 0 {
				a, b, lo, hi = math.Log(a), math.Log(b), math.Log(lo), math.Log(hi)
			}
			if hi > lo {
				d += ((a - b) / (hi - lo)) * ((a - b) / (hi - lo))
			}
		}
		return d
	})
}

// ReadSummary reads summary.json of a run directory.
func ReadSummary(dir string) (*run.Summary, error) {
	data, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil {
		return nil, err
	}
	var sum run.Summary
	if err := json.Unmarshal(data, &sum); err != nil {
		return nil, fmt.Errorf("%s: %w", filepath.Join(dir, "summary.json"), err)
	}
	return &sum, nil
}

// WriteSweepResults writes results.csv: one row per point with the varied
// values, the dimensionless groups of sphere 1, the mean speed and its
// uncertainty, the steady-Stokes model's speed and whether the point is in
// its range (for a single swimmer driven by arms alone, see StokesChain;
// empty otherwise), whether it converged, the leading sphere, spring 1's
// extension amplitude and phase, the wall time, the point it was warm
// started from (empty: from rest) and the status.
func WriteSweepResults(path string, s *cases.Sweep, results []SweepResult) error {
	var b bytes.Buffer
	head := []string{"point"}
	for _, p := range s.Params {
		head = append(head, p.Key)
	}
	head = append(head, "epsilon", "M2", "Re", "Re_s", "mean_speed_m_s", "speed_uncertainty_m_s", "model_speed_m_s", "model_in_range", "converged",
		"leading_sphere", "extension_amplitude_m", "extension_phase_deg", "wall_time_s", "warm_start", "status")
	b.WriteString(strings.Join(head, ",") + "\n")
	num := func(v float64) string {
		if math.IsNaN(v) {
			return ""
		}
		return strconv.FormatFloat(v, 'g', 10, 64)
	}
	for _, r := range results {
		row := []string{strconv.Itoa(r.Index + 1)}
		for _, v := range r.Point {
			row = append(row, num(v))
		}
		nan := math.NaN()
		eps, m2, re, res := nan, nan, nan, nan
		speed, unc, amp, ph, wall := nan, nan, nan, nan, nan
		conv, lead, warm := "", "", ""
		model, inRange := sweepModelSpeed(r.Summary)
		if sum := r.Summary; sum != nil {
			if len(sum.Groups) > 0 && sum.Groups[0].ReS > 0 { // shaken (cases.Case.Shaken): the groups apply
				g := sum.Groups[0]
				eps, m2, re, res = g.Epsilon, g.M2, g.Re, g.ReS
			}
			if sum.MeanVelocity != nil {
				speed = *sum.MeanVelocity
			}
			if sum.MeanVelocityUncertainty != nil {
				unc = *sum.MeanVelocityUncertainty
			}
			if sum.Converged != nil {
				conv = strconv.FormatBool(*sum.Converged)
			}
			if sum.LeadingSphere != nil {
				lead = strconv.Itoa(*sum.LeadingSphere)
			}
			if a, p, ok := sum.Spring(1); ok {
				amp, ph = a, p
			}
			wall = sum.WallTime
			if w := sum.WarmStart; w != nil && w.Used {
				warm = filepath.Base(w.From)
			}
		}
		status := "done"
		switch {
		case r.Err != nil:
			status = r.Err.Error()
		case r.Summary == nil || !r.Summary.Completed:
			status = "not finished"
		}
		row = append(row, num(eps), num(m2), num(re), num(res), num(speed), num(unc), num(model), inRange, conv, lead,
			num(amp), num(ph), num(wall), csvQuote(warm), csvQuote(status))
		b.WriteString(strings.Join(row, ",") + "\n")
	}
	if err := output.WriteFileAtomic(path, b.Bytes()); err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	return nil
}

// sweepModelSpeed returns the steady-Stokes chain model's speed of the
// run's swimmer and "true"/"false" for whether the case is in the model's
// range, or NaN and "" when the summary has none (shaken cases, springs,
// several swimmers).
func sweepModelSpeed(sum *run.Summary) (float64, string) {
	if sum == nil || sum.Model == nil || len(sum.Model.Stokes) != 1 {
		return math.NaN(), ""
	}
	st := sum.Model.Stokes[0]
	return st.Speed, strconv.FormatBool(st.InRange)
}

// csvQuote quotes a CSV field when it holds a comma, quote or newline.
func csvQuote(s string) string {
	if !strings.ContainsAny(s, ",\"\n") {
		return s
	}
	return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
}

// errSweepFailed marks a sweep with failed points.
var errSweepFailed = errors.New("some points failed")

// SweepFailures returns an error naming the failed points, or nil.
func SweepFailures(results []SweepResult) error {
	var bad []string
	for _, r := range results {
		if r.Err != nil {
			bad = append(bad, strconv.Itoa(r.Index+1))
		}
	}
	if len(bad) == 0 {
		return nil
	}
	return fmt.Errorf("%w: point(s) %s (see results.csv and each point's summary.json)", errSweepFailed, strings.Join(bad, ", "))
}

// WriteSweepPictures draws the mean speed of the points with its error bar
// against the first varied key (one line per value of the second), as
// speed.png, and, when every point is shaken, against the streaming
// Reynolds number of sphere 1 as speed_re_s.png, in the sweep directory.
// Where the points have a steady-Stokes model speed (StokesChain), it is
// drawn beside them. Points without a speed are left out; with fewer than
// two points nothing is drawn.
func WriteSweepPictures(dir string, s *cases.Sweep, results []SweepResult) error {
	type pt struct{ x, res, v, e, model float64 }
	lines := map[float64][]pt{}
	var order []float64
	n, shaken := 0, true
	for _, r := range results {
		sum := r.Summary
		if sum == nil || sum.MeanVelocity == nil || sum.MeanVelocityUncertainty == nil || len(sum.Groups) == 0 {
			continue
		}
		shaken = shaken && sum.Groups[0].ReS > 0
		key := 0.0
		if len(r.Point) > 1 {
			key = r.Point[1]
		}
		if _, ok := lines[key]; !ok {
			order = append(order, key)
		}
		model, _ := sweepModelSpeed(sum)
		lines[key] = append(lines[key], pt{r.Point[0], sum.Groups[0].ReS, *sum.MeanVelocity, *sum.MeanVelocityUncertainty, model})
		n++
	}
	if n < 2 {
		return nil
	}
	var byKey, byRe []output.Line
	for _, key := range order {
		label := ""
		if len(s.Params) > 1 {
			label = fmt.Sprintf("%s = %g", s.Params[1].Key, key)
		}
		var l1, l2 output.Line
		l1.Label, l2.Label, l1.Points, l2.Points = label, label, true, true
		for _, p := range lines[key] {
			l1.X, l1.Y, l1.YErr = append(l1.X, p.x), append(l1.Y, p.v), append(l1.YErr, p.e)
			l2.X, l2.Y, l2.YErr = append(l2.X, p.res), append(l2.Y, p.v), append(l2.YErr, p.e)
		}
		byKey, byRe = append(byKey, l1), append(byRe, l2)
		// The steady-Stokes model beside the measured speeds, where the
		// points have it.
		m1 := output.Line{Label: "steady-Stokes model"}
		m2 := m1
		if label != "" {
			m1.Label += ", " + label
			m2.Label = m1.Label
		}
		for _, p := range lines[key] {
			if !math.IsNaN(p.model) {
				m1.X, m1.Y = append(m1.X, p.x), append(m1.Y, p.model)
				m2.X, m2.Y = append(m2.X, p.res), append(m2.Y, p.model)
			}
		}
		if len(m1.X) > 0 {
			byKey, byRe = append(byKey, m1), append(byRe, m2)
			name := "simulated"
			if label != "" {
				name += ", " + label
			}
			byKey[len(byKey)-2].Label, byRe[len(byRe)-2].Label = name, name
		}
	}
	title := s.Title
	if title == "" {
		title = "sweep " + s.Name
	}
	// With a model, its line often runs along the top: the legend goes
	// to the bottom.
	opt := output.ChartOptions{LogX: s.Params[0].Log, LegendBottom: len(byKey) > len(order)}
	if err := output.WriteChartPNGWith(filepath.Join(dir, "speed.png"), title, s.Params[0].Key,
		"mean speed (m/s)", byKey, opt); err != nil {
		return err
	}
	if !shaken {
		return nil // Re_s is a group of the shaking: no speed_re_s.png without it
	}
	return output.WriteChartPNGWith(filepath.Join(dir, "speed_re_s.png"), title, "Re_s = A^2 omega/nu, sphere 1",
		"mean speed (m/s)", byRe, opt)
}
