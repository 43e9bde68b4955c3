package main

import (
	"fmt"
	"math"
	"strings"
	"testing"
	"time"
)

// defaultParams are the layout's defaults (the flags').
var defaultParams = params{excursion: 2e-3, fineMargin: 2, coarseMargin: 4}

// BenchmarkLevels times one step of the refined lattice (one level-0
// step: 2^l steps of level l) and one of the uniform demo, each with 1
// goroutine and with all, as sub-benchmarks refined/threads=N and
// uniform/threads=N. Besides ns/op it reports the wall time per drive
// period ("s/period"), and for the refined lattice the node updates per
// period over the uniform demo's ("x-updates") and the transfers' share of
// the step ("transfer-%"). The program (go run ./benchmarks/levels)
// measures both side by side for their ratios.
func BenchmarkLevels(b *testing.B) {
	lo, err := newLayout(defaultParams)
	if err != nil {
		b.Fatal(err)
	}
	spp := float64(lo.demo.StepsPerPeriod)
	for _, n := range benchThreads() {
		b.Run(fmt.Sprintf("refined/threads=%d", n), func(b *testing.B) {
			h, err := newRefined(lo, n)
			if err != nil {
				b.Fatal(err)
			}
			defer h.Close()
			for range warmUp {
				h.Step()
			}
			b.ReportAllocs()
			tr0 := h.TransferTime()
			for b.Loop() {
				h.Step()
			}
			b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)*spp, "s/period")
			b.ReportMetric(lo.updatesPerPeriod()/lo.demoUpdates(), "x-updates")
			b.ReportMetric(100*(h.TransferTime()-tr0).Seconds()/b.Elapsed().Seconds(), "transfer-%")
		})
		b.Run(fmt.Sprintf("uniform/threads=%d", n), func(b *testing.B) {
			u, err := newUniform(lo, n)
			if err != nil {
				b.Fatal(err)
			}
			defer u.Close()
			for range warmUp {
				u.Step()
			}
			b.ReportAllocs()
			for b.Loop() {
				u.SetForce(forceAmplitude, 0)
				u.Step()
			}
			b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)*spp, "s/period")
		})
	}
}

func benchThreads() []int {
	ts, _ := parseThreads("")
	return ts
}

// TestLayout checks the speed case's layout against what issue 17 and the
// demo say: level 0 is the demo's 360 x 90 cells of 4 times its spacing,
// the finest spacing is the small sphere's radius over 24, each level
// nests in its parent with at least the margin asked for, the spheres and
// their excursion lie in the finest level with at least the margin, and
// tau+ - 1/2 is the demo's over 16 on level 0, doubling per finer level
// (exact up to the rounding of the doubling, 1e-15). The uniform lattice of
// the finest spacing does 512 times the demo's node updates (8 x 8 cells
// x 8 steps), exactly.
func TestLayout(t *testing.T) {
	lo, err := newLayout(defaultParams)
	if err != nil {
		t.Fatal(err)
	}
	if c := lo.cfgs[0]; c.Nz != 360 || c.Nr != 90 {
		t.Errorf("level 0: %dx%d, want 360x90", c.Nz, c.Nr)
	}
	if got, want := lo.dx(0), 4*lo.demo.Dx; math.Abs(got-want) > 1e-15*want {
		t.Errorf("level 0 spacing %g, want 4 x the demo's %g", got, want)
	}
	if got, want := lo.dxF, 0.8e-3/24; math.Abs(got-want) > 1e-12*want {
		t.Errorf("finest spacing %g, want %g", got, want)
	}
	if r := lo.fineUpdates() / lo.demoUpdates(); r != 512 {
		t.Errorf("uniform finest lattice: %g x the demo's node updates, want 512", r)
	}
	for l, c := range lo.cfgs {
		want := (lo.demo.Tau - 0.5) / 16 * math.Ldexp(1, l)
		if math.Abs((c.Tau-0.5)-want) > 1e-15 {
			t.Errorf("level %d: tau+ - 1/2 = %g, want %g", l, c.Tau-0.5, want)
		}
		if l == 0 {
			continue
		}
		zmin, zmax, rmax := lo.margins(l)
		need := float64(defaultParams.coarseMargin)
		if l == numLevels-1 {
			need = defaultParams.fineMargin * lo.aSmall / lo.dxF
		}
		if zmin < need-1e-9 || zmax < need-1e-9 || rmax < need-1e-9 {
			t.Errorf("level %d: margins %g/%g/%g of its cells, want at least %g", l, zmin, zmax, rmax, need)
		}
	}
	h, err := newRefined(lo, 1)
	if err != nil {
		t.Fatal(err)
	}
	h.Close()
}

// TestMeasure runs the measurement briefly and checks that every rate and
// share is positive and finite and the tables print.
func TestMeasure(t *testing.T) {
	if testing.Short() {
		t.Skip("steps the refined lattice")
	}
	lo, err := newLayout(defaultParams)
	if err != nil {
		t.Fatal(err)
	}
	r, err := measure(lo, 1, 60*time.Millisecond, 10*time.Millisecond, true, false)
	if err != nil {
		t.Fatal(err)
	}
	ok := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) && !math.IsNaN(v) }
	if !ok(r.uniMLUPS(lo)) || !ok(r.refPeriod(lo).Seconds()) || !ok(r.transferShare()) || r.transferShare() >= 1 {
		t.Errorf("measurement: %+v", r)
	}
	for l := range lo.cfgs {
		if m := r.levelMLUPS(lo, l); !ok(m) || r.sum.level[l].steps != int64(r.sum.refSteps)<<l || !ok(r.alone[l]) || !ok(r.aloneOf[l]) {
			t.Errorf("level %d: %g MLUPS over %d steps, alone %v", l, m, r.sum.level[l].steps, r.alone)
		}
	}
	var sb strings.Builder
	printLayout(&sb, lo)
	printResults(&sb, lo, []result{r})
	for _, want := range []string{"| 3 | 0.033333 |", "512x", "wall ratio"} {
		if !strings.Contains(sb.String(), want) {
			t.Errorf("tables lack %q:\n%s", want, sb.String())
		}
	}
}
