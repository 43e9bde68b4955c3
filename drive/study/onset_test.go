package study

import (
	"bytes"
	"context"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// synthetic returns an evaluator of a known speed law: U(A) plus noise
// drawn uniformly within +-sigma(A), reported with uncertainty sigma(A).
// Uniform, bounded noise keeps the classification of a zero speed exact
// (|noise| <= sigma < 2 sigma), so the test checks the search and the
// fits, not luck. sigma = 1% of U plus 1e-8 m/s, about the standard
// errors of the example sweep's runs (0.2-1.6% of the speed).
func synthetic(law func(a float64) float64, seed uint64) (OnsetEval, *int) {
	rng := rand.New(rand.NewPCG(seed, 1))
	runs := 0
	return func(_ context.Context, values []float64, _ int) ([]OnsetPoint, error) {
		out := make([]OnsetPoint, len(values))
		for i, a := range values {
			u := law(a)
			sigma := 0.01*math.Abs(u) + 1e-8
			out[i] = OnsetPoint{Speed: u + sigma*(2*rng.Float64()-1), Uncertainty: sigma, Converged: true}
			runs++
		}
		return out, nil
	}, &runs
}

// TestOnsetThreshold: data from a threshold law U = c (A - A_c)^beta
// (zero below A_c) with A_c = 1.7e-4 m. The search must bracket A_c
// within the tolerance, the threshold law must be chosen, and its A_c
// must agree with the true one within the bracket tolerance; beta is
// recovered for a linear (beta = 1) and a square-root (beta = 1/2, a
// supercritical pitchfork) onset.
func TestOnsetThreshold(t *testing.T) {
	const ac, tol = 1.7e-4, 0.02
	for _, beta := range []float64{1, 0.5} {
		c := 5e-5 / math.Pow(4e-4-ac, beta) // 50 um/s at the top of the bracket
		law := func(a float64) float64 {
			if a <= ac {
				return 0
			}
			return c * math.Pow(a-ac, beta)
		}
		eval, runs := synthetic(law, 7)
		r, err := FindOnset(context.Background(), eval, OnsetOptions{Lo: 5e-5, Hi: 4e-4, Log: true, Tol: tol, Floor: 1e-8, Jobs: 2})
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("beta %g: %d runs, bracket %.5g-%.5g; %s: %s", beta, *runs, r.Below, r.Above, r.Verdict, r.Explanation)
		if !r.Found || !r.Tolerance || !r.SwimsAbove {
			t.Fatalf("beta %g: no bracket within %g (found %v, width %.3g)", beta, tol, r.Found, r.Width)
		}
		if !(r.Below <= ac && ac <= r.Above) {
			t.Errorf("beta %g: bracket %.5g-%.5g misses A_c = %g", beta, r.Below, r.Above, ac)
		}
		if r.Verdict != VerdictThreshold {
			t.Errorf("beta %g: verdict %q, want %q", beta, r.Verdict, VerdictThreshold)
		}
		if got := r.Threshold.Ac; math.Abs(got-ac) > tol*ac {
			t.Errorf("beta %g: fitted A_c = %.5g, want %g within %g%%", beta, got, ac, 100*tol)
		}
		// beta: within 3 of its own standard errors (plus 2%: the noise
		// is uniform, not normal).
		if d := math.Abs(r.Threshold.Beta - beta); d > 3*r.Threshold.BetaErr+0.02*beta {
			t.Errorf("beta %g: fitted %.4g +- %.2g", beta, r.Threshold.Beta, r.Threshold.BetaErr)
		}
	}
}

// TestOnsetPowerLaw: data from a power law U = c A^2 (the small-amplitude
// law of inertial streaming, U ~ epsilon^2), with a floor of 1 um/s. The
// power law must be chosen with n = 2 recovered, and the bracket must
// close on where the speed crosses the floor, A = sqrt(floor/c).
func TestOnsetPowerLaw(t *testing.T) {
	const c, floor, tol = 350.0, 1e-6, 0.02
	eval, runs := synthetic(func(a float64) float64 { return c * a * a }, 11)
	r, err := FindOnset(context.Background(), eval, OnsetOptions{Lo: 2e-5, Hi: 4e-4, Log: true, Tol: tol, Floor: floor})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%d runs, bracket %.5g-%.5g; %s: %s", *runs, r.Below, r.Above, r.Verdict, r.Explanation)
	if r.Verdict != VerdictPower {
		t.Errorf("verdict %q, want %q", r.Verdict, VerdictPower)
	}
	if r.Power == nil || math.Abs(r.Power.N-2) > 3*r.Power.NErr+0.01 {
		t.Errorf("power fit %+v, want n = 2", r.Power)
	}
	cross := math.Sqrt(floor / c)
	if !r.Found || !(r.Below <= cross*(1+0.01) && cross*(1-0.01) <= r.Above) || !r.Tolerance {
		t.Errorf("bracket %.5g-%.5g (width %.3g), want around the floor crossing %.5g", r.Below, r.Above, r.Width, cross)
	}
	if !strings.Contains(r.Explanation, "smooth onset") {
		t.Errorf("explanation does not say smooth: %s", r.Explanation)
	}
}

// TestOnsetOutside: when every point swims, or none does, there is no
// bracket and the result says which side the onset lies on; a swimming
// side below the threshold (a viscosity, say) is bracketed the other way
// round.
func TestOnsetOutside(t *testing.T) {
	ctx := context.Background()
	all, _ := synthetic(func(a float64) float64 { return 350 * a * a }, 1)
	r, err := FindOnset(ctx, all, OnsetOptions{Lo: 1e-4, Hi: 4e-4, Log: true, Floor: 1e-7})
	if err != nil {
		t.Fatal(err)
	}
	if r.Found || !strings.Contains(r.Side, "every point swims") || !strings.Contains(r.Side, "below 0.0001") {
		t.Errorf("all swimming: found %v, %q", r.Found, r.Side)
	}
	none, _ := synthetic(func(float64) float64 { return 0 }, 2)
	if r, err = FindOnset(ctx, none, OnsetOptions{Lo: 1e-4, Hi: 4e-4, Floor: 1e-7}); err != nil {
		t.Fatal(err)
	}
	if r.Found || !strings.Contains(r.Side, "no point swims") || r.Verdict != VerdictUndecided {
		t.Errorf("none swimming: found %v, %q, verdict %q", r.Found, r.Side, r.Verdict)
	}
	// Swimming below nu_c = 2e-6 m^2/s: U = c (nu_c - nu).
	down, _ := synthetic(func(nu float64) float64 { return max(0, 20*(2e-6-nu)) }, 3)
	if r, err = FindOnset(ctx, down, OnsetOptions{Lo: 5e-7, Hi: 5e-6, Log: true, Tol: 0.02, Floor: 1e-8}); err != nil {
		t.Fatal(err)
	}
	if !r.Found || r.SwimsAbove || !(r.Above <= 2e-6 && 2e-6 <= r.Below) {
		t.Errorf("swimming below: found %v, swims above %v, bracket %g-%g", r.Found, r.SwimsAbove, r.Above, r.Below)
	}
	if r.Threshold == nil || math.Abs(r.Threshold.Ac-2e-6) > 0.02*2e-6 {
		t.Errorf("swimming below: threshold fit %+v, want A_c = 2e-6", r.Threshold)
	}
}

// TestOnsetRepeatable: the search asks for the same values in the same
// order when given the same results (what lets a stopped search resume
// with its finished runs), and respects the run budget.
func TestOnsetRepeatable(t *testing.T) {
	law := func(a float64) float64 { return max(0, 0.2*(a-1.7e-4)) }
	var seqs [2][]float64
	for k := range seqs {
		eval, _ := synthetic(law, 5)
		rec := func(ctx context.Context, v []float64, round int) ([]OnsetPoint, error) {
			seqs[k] = append(seqs[k], v...)
			return eval(ctx, v, round)
		}
		if _, err := FindOnset(context.Background(), rec, OnsetOptions{Lo: 5e-5, Hi: 4e-4, Log: true, Tol: 0.01, Jobs: 2}); err != nil {
			t.Fatal(err)
		}
	}
	if len(seqs[0]) != len(seqs[1]) {
		t.Fatalf("%d and %d runs", len(seqs[0]), len(seqs[1]))
	}
	for i := range seqs[0] {
		if seqs[0][i] != seqs[1][i] {
			t.Fatalf("run %d: %g then %g", i+1, seqs[0][i], seqs[1][i])
		}
	}
	eval, runs := synthetic(law, 5)
	r, err := FindOnset(context.Background(), eval, OnsetOptions{Lo: 5e-5, Hi: 4e-4, Log: true, Tol: 1e-6, MaxRuns: 9})
	if err != nil {
		t.Fatal(err)
	}
	if *runs > 9 || r.Tolerance || !strings.Contains(strings.Join(r.Caveats, " "), "budget") {
		t.Errorf("budget of 9: %d runs, within tolerance %v, caveats %q", *runs, r.Tolerance, r.Caveats)
	}
}

// TestOnsetOptions: bad options are refused with the reason.
func TestOnsetOptions(t *testing.T) {
	eval, _ := synthetic(func(float64) float64 { return 0 }, 1)
	for _, o := range []OnsetOptions{
		{Lo: 2, Hi: 1},
		{Lo: 0, Hi: 1, Log: true},
		{Lo: 1, Hi: 2, Tol: 1.5},
		{Lo: 1, Hi: 2, Floor: -1},
		{Lo: 1, Hi: 2, Scan: 1},
	} {
		if _, err := FindOnset(context.Background(), eval, o); err == nil {
			t.Errorf("%+v accepted", o)
		}
	}
}

// TestRunOnsetResume: an onset search on real (cheap) runs, with warm
// starts, writes its table, report and picture; a search stopped after its first runs and
// resumed reuses them (runs nothing twice) and ends with the same table,
// byte for byte; a directory whose record asks for other values is
// refused.
func TestRunOnsetResume(t *testing.T) {
	base, err := os.ReadFile("../../testdata/sweep-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	base = bytes.Replace(base, []byte("periods = 3"), []byte("periods = 4"), 1) // 2 analysed after the ramp
	search := OnsetSearch{Name: "small", Key: "shaking.amplitude", Lo: 5e-5, Hi: 4e-4, Log: true, Scan: 3, Tol: 0.4, Floor: 5e-6, Warm: true}
	ctx := context.Background()
	full := t.TempDir()
	r, err := RunOnset(ctx, search, base, OnsetRunOptions{Out: full, Cores: 2})
	if err != nil {
		t.Fatal(err)
	}
	n := len(r.Points)
	if n < 4 || !r.Found {
		t.Fatalf("%d runs, bracket found %v: the test needs a scan and at least one narrowing (%+v)", n, r.Found, r.Points)
	}
	for _, f := range []string{OnsetTableFile, OnsetReportFile, OnsetChartFile, OnsetSearchFile} {
		if _, err := os.Stat(filepath.Join(full, f)); err != nil {
			t.Error(err)
		}
	}
	for _, p := range r.Points {
		if (p.Round > 0) != strings.HasPrefix(p.WarmStart, "point_") {
			t.Errorf("run %d of round %d: warm start %q (the scan starts from rest, the narrowing from earlier runs)", p.Run, p.Round, p.WarmStart)
		}
	}
	// A search stopped after its scan: its directory holds the record,
	// the scan's runs and the list of values asked for so far.
	part := t.TempDir()
	for _, f := range []string{OnsetSearchFile, onsetBaseFile} {
		copyFile(t, filepath.Join(full, f), filepath.Join(part, f))
	}
	runs, err := readOnsetRuns(filepath.Join(full, onsetRunsFile))
	if err != nil || len(runs) != n {
		t.Fatalf("runs.csv: %d values (%v), want %d", len(runs), err, n)
	}
	if err := writeOnsetRuns(filepath.Join(part, onsetRunsFile), runs[:search.Scan]); err != nil {
		t.Fatal(err)
	}
	for i := range search.Scan {
		if err := os.CopyFS(PointDir(part, i), os.DirFS(PointDir(full, i))); err != nil {
			t.Fatal(err)
		}
	}
	before, _ := os.ReadFile(filepath.Join(PointDir(part, 0), "summary.json"))
	s, b, err := LoadOnset(part)
	if err != nil {
		t.Fatal(err)
	}
	var log bytes.Buffer
	if _, err := RunOnset(ctx, s, b, OnsetRunOptions{Out: part, Cores: 2, Log: &log, Resume: true}); err != nil {
		t.Fatal(err)
	}
	if got := strings.Count(log.String(), "finished earlier"); got != search.Scan {
		t.Errorf("resumed search reused %d runs, want the %d of the scan:\n%s", got, search.Scan, log.String())
	}
	if after, _ := os.ReadFile(filepath.Join(PointDir(part, 0), "summary.json")); !bytes.Equal(before, after) {
		t.Error("a finished run's summary changed on resuming")
	}
	want, _ := os.ReadFile(filepath.Join(full, OnsetTableFile))
	got, _ := os.ReadFile(filepath.Join(part, OnsetTableFile))
	if !bytes.Equal(want, got) || len(want) == 0 {
		t.Errorf("resumed table differs:\n%s\nwant\n%s", got, want)
	}
	// Another search's record: refused, naming the run.
	runs[1] = "1e-4"
	if err := writeOnsetRuns(filepath.Join(part, onsetRunsFile), runs); err != nil {
		t.Fatal(err)
	}
	if _, err := RunOnset(ctx, s, b, OnsetRunOptions{Out: part, Cores: 2, Resume: true}); err == nil || !strings.Contains(err.Error(), "run 2") {
		t.Errorf("a record of other values: %v", err)
	}
}

func copyFile(t *testing.T, from, to string) {
	t.Helper()
	data, err := os.ReadFile(from)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(to, data, 0o644); err != nil {
		t.Fatal(err)
	}
}
