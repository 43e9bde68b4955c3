package run

import (
	"bytes"
	"context"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"axiswim/cases"
)

// no fields or pictures.
func trainCase(t *testing.T) (*cases.Case, *cases.Lattice) {
	t.Helper()
	src, err := cases.Get("dumbbell-train")
	if err != nil {
		t.Fatal(err)
	}
	src = bytes.Replace(src, []byte("cells_per_radius = 8"), []byte("cells_per_radius = 5"), 1)
	src = bytes.Replace(src, []byte("periods = 12"), []byte("periods = 4"), 1)
	src = append(src, "\n[output]\nvtk = false\npictures = false\n"...)
	return mustCase(t, "train", src)
}

// TestTrain: a train of two identical dumbbells runs, each swimmer gets
// its speed and leading sphere, the gap series is written once per
// period, the spheres never overlap, and a run interrupted and resumed
// gives the same periods and swimmer summaries, bit for bit.
func TestTrain(t *testing.T) {
	c, l := trainCase(t)
	whole, part := t.TempDir(), t.TempDir()
	ctx := context.Background()
	sum, err := Execute(ctx, c, l, Options{Out: whole, Threads: 1, Quiet: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(sum.Swimmers) != 2 || len(sum.Gaps) != 1 {
		t.Fatalf("%d swimmers and %d gaps, want 2 and 1", len(sum.Swimmers), len(sum.Gaps))
	}
	for i, sw := range sum.Swimmers {
		if sw.MeanVelocity == nil || !reflect.DeepEqual(sw.Spheres, []int{2*i + 1, 2*i + 2}) {
			t.Errorf("swimmer %d: %+v", i+1, sw)
		}
	}
	if g := sum.Gaps[0]; !(g.Min > 0 && g.Initial > 2.5e-3 && g.Trend != "") {
		t.Errorf("gap %+v", g)
	}
	if sum.MinSurfaceGap == nil || *sum.MinSurfaceGap <= 0 {
		t.Errorf("spheres came within %v m of each other", sum.MinSurfaceGap)
	}
	for _, w := range sum.Warnings {
		if strings.Contains(w, "touched") {
			t.Errorf("the train's swimmers never meet, but: %s", w)
		}
	}
	data, err := os.ReadFile(filepath.Join(whole, "periods.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	if !strings.HasSuffix(lines[0], "swimmer1_centroid_m,swimmer2_centroid_m,gap1_2_m") || len(lines) != 5 {
		t.Errorf("periods.csv: %d lines, header %s", len(lines), lines[0])
	}
	// series.csv has each swimmer's centroid at every sample: the mean of
	// the two is the centroid of the four equal-count spheres.
	series, err := os.ReadFile(filepath.Join(whole, "series.csv"))
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(series)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for k, h := range rows[0] {
		col[h] = k
	}
	c1, ok1 := col["swimmer1_centroid_m"]
	c2, ok2 := col["swimmer2_centroid_m"]
	if !ok1 || !ok2 || len(rows) < 3 {
		t.Fatalf("series.csv: %d rows, header %v", len(rows), rows[0])
	}
	for _, r := range rows[1:] {
		num := func(k int) float64 { v, _ := strconv.ParseFloat(r[k], 64); return v }
		if d := math.Abs((num(c1)+num(c2))/2 - num(col["centroid_m"])); d > 1e-12 {
			t.Fatalf("series.csv at t = %s: swimmer centroids %s, %s against the centroid %s", r[0], r[c1], r[c2], r[col["centroid_m"]])
		}
	}
	if s, err := Execute(ctx, c, l, Options{Out: part, Threads: 1, Quiet: true, StopAfter: int64(l.StepsPerPeriod*2 + 7)}); err != nil || !s.Interrupted {
		t.Fatalf("interrupting: %v", err)
	}
	res, err := Execute(ctx, c, l, Options{Out: part, Threads: 1, Quiet: true, Resume: true})
	if err != nil {
		t.Fatal(err)
	}
	again, _ := os.ReadFile(filepath.Join(part, "periods.csv"))
	if !bytes.Equal(data, again) || !reflect.DeepEqual(res.Swimmers, sum.Swimmers) || !reflect.DeepEqual(res.Gaps, sum.Gaps) ||
		*res.MinSurfaceGap != *sum.MinSurfaceGap {
		t.Errorf("the resumed train differs: gaps %+v and %+v", res.Gaps, sum.Gaps)
	}
}

// mustCase parses and resolves a case for a test.
func mustCase(t *testing.T, name string, src []byte) (*cases.Case, *cases.Lattice) {
	t.Helper()
	c, err := cases.Parse(name, src)
	if err != nil {
		t.Fatal(err)
	}
	l, err := cases.Resolve(c)
	if err != nil {
		t.Fatal(err)
	}
	return c, l
}

// TestTouchWarning: two lone neutrally buoyant spheres placed one cell
// apart, closer than the repulsion range (2 cells), are pushed apart by
// it; the run warns that the swimmers touched, names them and points to
// the README's measured restitution. The train of TestTrain, whose gap
// stays millimetres wide, gets no such warning.
func TestTouchWarning(t *testing.T) {
	src := []byte(`
[fluid]
density = 1000.0
viscosity = 0.01
[container]
radius = 2e-3
length = 8e-3
[shaking]
frequency = 20.0
amplitude = 1e-6
gravity = 0.0
ramp_periods = 0.0
[[sphere]]
radius = 0.5e-3
density = 1000.0
z = -0.55e-3
[[sphere]]
radius = 0.5e-3
density = 1000.0
z = 0.55e-3
[bodies]
repulsion_range = 2.0
[grid]
cells_per_radius = 5
[output]
vtk = false
pictures = false
[run]
periods = 2
`)
	c, l := mustCase(t, "touch", src)
	sum, err := Execute(context.Background(), c, l, Options{Out: t.TempDir(), Threads: 1, Quiet: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(sum.Gaps) != 1 {
		t.Fatalf("%d gaps, want 1", len(sum.Gaps))
	}
	var touched []string
	for _, w := range sum.Warnings {
		if strings.Contains(w, "touched") {
			touched = append(touched, w)
		}
	}
	if len(touched) != 1 || !strings.Contains(touched[0], "swimmers 1 and 2") || !strings.Contains(touched[0], "README, Contacts") {
		t.Errorf("touch warnings %q; want one naming swimmers 1 and 2 (gaps %+v)", touched, sum.Gaps[0])
	}
	if g := sum.Gaps[0]; !(g.Final > g.Initial) {
		t.Errorf("gap %.3g m -> %.3g m: the repulsion should have pushed the spheres apart", g.Initial, g.Final)
	}
}
