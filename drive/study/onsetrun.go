package study

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"github.com/BurntSushi/toml"

	"axiswim/cases"
	"axiswim/output"
)

// OnsetSearch is an onset search as recorded in its directory
// (search.toml beside base.toml), so that -resume repeats it exactly.
type OnsetSearch struct {
	Name       string  `toml:"name"`
	Key        string  `toml:"key"`
	Lo         float64 `toml:"from"`
	Hi         float64 `toml:"to"`
	Log        bool    `toml:"log"`
	Scan       int     `toml:"scan_points"`
	Tol        float64 `toml:"tolerance"`
	Floor      float64 `toml:"floor_m_s"`
	Sigmas     float64 `toml:"standard_errors"`
	Jobs       int     `toml:"jobs"`
	MaxRuns    int     `toml:"max_runs"`
	ModelError float64 `toml:"model_error"`
	// Warm starts each run of a narrowing round from the final state of
	// the nearest run of the earlier rounds (where their lattices agree).
	Warm bool `toml:"warm_starts"`
}

// Options returns the search's options.
func (s OnsetSearch) Options() OnsetOptions {
	return OnsetOptions{Lo: s.Lo, Hi: s.Hi, Log: s.Log, Scan: s.Scan, Tol: s.Tol, Floor: s.Floor,
		Sigmas: s.Sigmas, Jobs: s.Jobs, MaxRuns: s.MaxRuns, ModelError: s.ModelError}
}

// Files of an onset directory.
const (
	OnsetSearchFile = "search.toml"
	onsetBaseFile   = "base.toml"
	onsetRunsFile   = "runs.csv"
	OnsetTableFile  = "onset.csv"
	OnsetReportFile = "onset.json"
	OnsetChartFile  = "onset.png"
)

// OnsetRunOptions are how RunOnset runs the points.
type OnsetRunOptions struct {
	Out    string    // the onset directory: search.toml, base.toml, runs.csv, point_NNN, onset.*
	Cores  int       // goroutines shared by the points of a round (0: all cores)
	Log    io.Writer // a line per point
	Resume bool      // continue the search recorded in Out
}

// OnsetReport is onset.json: the search, what was found, and where.
type OnsetReport struct {
	Search OnsetSearch `json:"search"`
	Onset  *Onset      `json:"onset"`
}

// NewOnsetSweep is the one-key sweep of base (TOML) that an onset search
// runs its points from.
func NewOnsetSweep(s OnsetSearch, base []byte) (*cases.Sweep, error) {
	return cases.NewSweep(s.Name, onsetBaseFile, base, cases.Param{Key: s.Key, Values: []float64{s.Lo, s.Hi}, Log: s.Log})
}

// RunOnset runs an onset search on case base (TOML): FindOnset with each
// value an ordinary run in Out/point_NNN (numbered in the order asked
// for), then writes onset.csv, onset.json and onset.png. Both ends of the
// bracket are checked as cases before anything runs. With Resume, the
// search recorded in Out is repeated: finished runs are reused, a
// checkpointed one continues, and a value that differs from the record
// (the search would be another one) is an error.
func RunOnset(ctx context.Context, search OnsetSearch, base []byte, o OnsetRunOptions) (*Onset, error) {
	if err := search.Options().Check(); err != nil {
		return nil, fmt.Errorf("onset: %w", err)
	}
	s, err := NewOnsetSweep(search, base)
	if err != nil {
		return nil, err
	}
	for _, v := range []float64{search.Lo, search.Hi} {
		_, c, err := s.CaseAt(cases.Point{v})
		if err == nil {
			_, err = cases.Resolve(c)
		}
		if err != nil {
			return nil, fmt.Errorf("onset: the bracket's end %s = %g is not a case that runs: %w", search.Key, v, err)
		}
	}
	var recorded []string
	if o.Resume {
		if recorded, err = readOnsetRuns(filepath.Join(o.Out, onsetRunsFile)); err != nil {
			return nil, err
		}
	} else if err := writeOnsetFiles(o.Out, search, base); err != nil {
		return nil, err
	}
	cores := o.Cores
	if cores <= 0 {
		cores = runtime.NumCPU()
	}
	log := o.Log
	if log == nil {
		log = io.Discard
	}
	var mu sync.Mutex
	asked := append([]string(nil), recorded...)
	next := 0 // runs asked for so far
	type finished struct {
		v   float64
		dir string
	}
	var done []finished // runs of the earlier rounds, for warm starts
	eval := func(ctx context.Context, values []float64, round int) ([]OnsetPoint, error) {
		first := next
		for i, v := range values {
			k := first + i
			txt := strconv.FormatFloat(v, 'g', -1, 64)
			switch {
			case k < len(recorded) && recorded[k] != txt:
				return nil, fmt.Errorf("onset: run %d of the recorded search was %s = %s, this search asks for %s: the directory holds another search; start a new one with -out", k+1, search.Key, recorded[k], txt)
			case k >= len(asked):
				asked = append(asked, txt)
			}
		}
		next += len(values)
		if err := writeOnsetRuns(filepath.Join(o.Out, onsetRunsFile), asked); err != nil {
			return nil, err
		}
		jobs := min(max(search.Jobs, 1), len(values))
		threads := max(1, cores/jobs)
		pts := make([]OnsetPoint, len(values))
		earlier := make([]int, len(done))
		for k := range earlier {
			earlier[k] = k
		}
		eachPoint(ctx, len(values), jobs, func(i int) {
			v, from := values[i], ""
			if search.Warm {
				if k := nearest(earlier, func(k int) float64 { return onsetDistance(v, done[k].v, search.Log) }); k >= 0 {
					from = done[k].dir
				}
			}
			r := runPoint(ctx, s, first+i, cases.Point{v}, o.Out, threads, log, &mu, from, search.Warm)
			pts[i] = onsetPoint(r)
		})
		if ctx.Err() != nil {
			return nil, fmt.Errorf("onset search interrupted: %w", ctx.Err())
		}
		for i, p := range pts {
			if p.usable() {
				done = append(done, finished{values[i], p.Dir})
			}
		}
		return pts, nil
	}
	res, err := FindOnset(ctx, eval, search.Options())
	if res != nil && len(res.Points) > 0 && ctx.Err() == nil {
		if werr := WriteOnset(o.Out, search, res); werr != nil && err == nil {
			err = werr
		}
	}
	return res, err
}

// onsetDistance is how far apart two values are for a warm start.
func onsetDistance(a, b float64, geometric bool) float64 {
	if geometric {
		return math.Abs(math.Log(a / b))
	}
	return math.Abs(a - b)
}

// onsetPoint reads a run's result into an OnsetPoint.
func onsetPoint(r SweepResult) OnsetPoint {
	p := OnsetPoint{Dir: r.Dir, Speed: math.NaN()}
	if r.Err != nil {
		p.Err = r.Err.Error() // the onset record is written to files
	}
	sum := r.Summary
	switch {
	case p.Err != "":
	case sum == nil || !sum.Completed:
		p.Err = "the run did not finish"
	case sum.MeanVelocity == nil || sum.MeanVelocityUncertainty == nil:
		p.Err = "the run has no swimming speed (too few periods?)"
	default:
		for _, w := range sum.Warnings {
			if !strings.HasPrefix(w, "the swimming speed has not converged") { // counted on its own
				p.Warnings = append(p.Warnings, w)
			}
		}
		p.Speed, p.Uncertainty = *sum.MeanVelocity, *sum.MeanVelocityUncertainty
		if w := sum.WarmStart; w != nil && w.Used {
			p.WarmStart = filepath.Base(w.From)
		}
		p.Converged = sum.Converged != nil && *sum.Converged
		if !p.Converged {
			p.Note = "not converged"
		}
	}
	return p
}

// writeOnsetFiles records a new search in out.
func writeOnsetFiles(out string, search OnsetSearch, base []byte) error {
	var b bytes.Buffer
	b.WriteString("# the onset search as run (axiswim onset -resume DIR repeats it); the case is base.toml\n")
	if err := toml.NewEncoder(&b).Encode(search); err != nil {
		return fmt.Errorf("write %s: %w", OnsetSearchFile, err)
	}
	if err := output.WriteFileAtomic(filepath.Join(out, onsetBaseFile), base); err != nil {
		return err
	}
	return output.WriteFileAtomic(filepath.Join(out, OnsetSearchFile), b.Bytes())
}

// LoadOnset reads the search recorded in an onset directory and its case.
func LoadOnset(dir string) (OnsetSearch, []byte, error) {
	var s OnsetSearch
	path := filepath.Join(dir, OnsetSearchFile)
	md, err := toml.DecodeFile(path, &s)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return s, nil, fmt.Errorf("%s has no %s: is it an onset directory? (axiswim onset -out DIR makes one)", dir, OnsetSearchFile)
		}
		return s, nil, fmt.Errorf("%s: %w", path, err)
	}
	if un := md.Undecoded(); len(un) > 0 {
		return s, nil, fmt.Errorf("%s: unknown key %q", path, un[0].String())
	}
	base, err := os.ReadFile(filepath.Join(dir, onsetBaseFile))
	if err != nil {
		return s, nil, fmt.Errorf("onset directory %s: %w", dir, err)
	}
	return s, base, nil
}

// runs.csv lists the values asked for, in order: run,value.
func writeOnsetRuns(path string, values []string) error {
	var b strings.Builder
	b.WriteString("run,value\n")
	for i, v := range values {
		fmt.Fprintf(&b, "%d,%s\n", i+1, v)
	}
	return output.WriteFileAtomic(path, []byte(b.String()))
}

func readOnsetRuns(path string) ([]string, error) {
	data, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil // stopped before its first run
	}
	if err != nil {
		return nil, fmt.Errorf("onset: %w", err)
	}
	var out []string
	for n, line := range strings.Split(strings.TrimSpace(string(data)), "\n")[1:] {
		_, v, ok := strings.Cut(line, ",")
		if _, err := strconv.ParseFloat(v, 64); !ok || err != nil {
			return nil, fmt.Errorf("%s line %d: %q is not run,value", path, n+2, line)
		}
		out = append(out, v)
	}
	return out, nil
}

// WriteOnset writes onset.csv (one row per run, sorted by value),
// onset.json (the search, the bracket, both fits, the verdict and its
// caveats) and onset.png (the speeds with their error bars and both
// fitted laws) in dir.
func WriteOnset(dir string, search OnsetSearch, r *Onset) error {
	var b strings.Builder
	fmt.Fprintf(&b, "run,%s,mean_speed_m_s,speed_uncertainty_m_s,converged,swimming,round,dir,warm_start,note\n", search.Key)
	for _, p := range r.Points {
		note := p.Note
		if p.Err != "" {
			note = p.Err
		}
		fmt.Fprintf(&b, "%d,%s,%s,%s,%t,%t,%d,%s,%s,%s\n", p.Run, strconv.FormatFloat(p.Value, 'g', 10, 64),
			numOrEmpty(p.Speed), numOrEmpty(p.Uncertainty), p.Converged, p.Swimming, p.Round,
			csvQuote(filepath.Base(p.Dir)), csvQuote(p.WarmStart), csvQuote(note))
	}
	if err := output.WriteFileAtomic(filepath.Join(dir, OnsetTableFile), []byte(b.String())); err != nil {
		return err
	}
	js, err := json.MarshalIndent(OnsetReport{Search: search, Onset: r}, "", "  ")
	if err != nil {
		return fmt.Errorf("onset report: %w", err)
	}
	if err := output.WriteFileAtomic(filepath.Join(dir, OnsetReportFile), append(js, '\n')); err != nil {
		return err
	}
	return writeOnsetChart(filepath.Join(dir, OnsetChartFile), search, r)
}

func numOrEmpty(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', 10, 64)
}

// writeOnsetChart draws |U| against the parameter, swimming and
// non-swimming points apart, with the fitted laws over the swimming side.
func writeOnsetChart(path string, search OnsetSearch, r *Onset) error {
	var swim, still output.Line
	swim.Label, still.Label = "swimming", "not swimming"
	swim.NoLine, still.NoLine = true, true
	logY := true
	for _, p := range r.Points {
		if !p.usable() {
			continue
		}
		l := &still
		if p.Swimming {
			l = &swim
		}
		l.X, l.Y, l.YErr = append(l.X, p.Value), append(l.Y, math.Abs(p.Speed)), append(l.YErr, p.Uncertainty)
		logY = logY && math.Abs(p.Speed) > 0
	}
	var lines []output.Line
	for _, l := range []output.Line{swim, still} {
		if len(l.X) > 0 {
			lines = append(lines, l)
		}
	}
	if len(lines) == 0 {
		return nil
	}
	if f := r.Power; f != nil && len(f.Values) > 1 {
		l := output.Line{Label: fmt.Sprintf("power law, n = %.3g", f.N)}
		for _, a := range curveX(f.Values, search.Log, math.NaN()) {
			l.X, l.Y = append(l.X, a), append(l.Y, f.C*math.Pow(a, f.N))
		}
		lines = append(lines, l)
	}
	if f := r.Threshold; f != nil && len(f.Values) > 1 && !(f.Ac == 0 && r.Power != nil) { // Ac = 0: the power law
		l := output.Line{Label: fmt.Sprintf("threshold law, A_c = %.3g, beta = %.3g", f.Ac, f.Beta)}
		s := 1.0
		if !r.swimsAbove() {
			s = -1
		}
		for _, a := range curveX(f.Values, search.Log, f.Ac) {
			if g := s * (a - f.Ac); g > 0 {
				l.X, l.Y = append(l.X, a), append(l.Y, f.C*math.Pow(g, f.Beta))
			}
		}
		lines = append(lines, l)
	}
	if o := r.Options; o.Floor > 0 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, l := range lines {
			lo, hi = min(lo, slices.Min(l.X)), max(hi, slices.Max(l.X))
		}
		lines = append(lines, output.Line{Label: fmt.Sprintf("floor, %.3g m/s", o.Floor), X: []float64{lo, hi}, Y: []float64{o.Floor, o.Floor}})
	}
	title := fmt.Sprintf("onset of swimming in %s: %s", search.Key, r.Verdict)
	return output.WriteChartPNGWith(path, title, search.Key, "|mean speed| (m/s)", lines,
		output.ChartOptions{LogX: search.Log, LogY: logY, LegendLeft: r.swimsAbove()})
}

// curveX returns points to draw a fitted law over the span of xs; for a
// threshold law (ac set) the span reaches towards ac, the points crowding
// near it so that the law's start shows.
func curveX(xs []float64, geometric bool, ac float64) []float64 {
	lo, hi := slices.Min(xs), slices.Max(xs)
	out := spaced(lo, hi, 100, geometric && lo > 0, true)
	if math.IsNaN(ac) {
		return out
	}
	edge := lo
	if ac > hi {
		edge = hi
	}
	if geometric && !(ac > lo/10 && ac < 10*hi) {
		return out // too far from the points to draw on a log axis
	}
	for k := range 24 {
		out = append(out, ac+(edge-ac)*math.Pow(10, -float64(k)/4))
	}
	slices.Sort(out)
	return slices.Compact(out)
}
