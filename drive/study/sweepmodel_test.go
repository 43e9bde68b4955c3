package study

import (
	"axiswim/drive/model"
	"axiswim/drive/run"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"axiswim/cases"
)

// TestSweepModelColumns: for a sweep of an arm-driven swimmer,
// results.csv carries the steady-Stokes model's speed (model.StokesChain) and
// whether each point is in its range, leaves the groups of the shaking
// empty (there is none), and the pictures are speed.png with the model
// beside the points but no speed_re_s.png (Re_s is a group of the
// shaking). The summaries are made from the cases, not run: this checks
// the writing, TestThreeSphereSpeed the model.
func TestSweepModelColumns(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "cases", "sweeps", "three-sphere.toml"))
	if err != nil {
		t.Fatal(err)
	}
	mus := []float64{0.4, 0.01}
	s, err := cases.NewSweep("visc", "three-sphere.toml", src, cases.Param{Key: "fluid.viscosity", Values: mus, Log: true})
	if err != nil {
		t.Fatal(err)
	}
	pts := s.Points()
	var results []SweepResult
	var want []model.StokesSwimmer
	for i, p := range pts {
		_, c, err := s.CaseAt(p)
		if err != nil {
			t.Fatal(err)
		}
		m, err := model.Linear(c)
		if err != nil {
			t.Fatal(err)
		}
		if len(m.Stokes) != 1 {
			t.Fatalf("point %d: %d steady-Stokes swimmers, want 1", i+1, len(m.Stokes))
		}
		want = append(want, m.Stokes[0])
		u, du := 0.9*m.Stokes[0].Speed, 1e-7
		results = append(results, SweepResult{Index: i, Point: p, Summary: &run.Summary{Completed: true,
			MeanVelocity: &u, MeanVelocityUncertainty: &du, Groups: c.Groups(nil), Model: m}})
	}
	dir := t.TempDir()
	if err := WriteSweepResults(filepath.Join(dir, ResultsFile), s, results); err != nil {
		t.Fatal(err)
	}
	if err := WriteSweepPictures(dir, s, results); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(filepath.Join(dir, ResultsFile))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for k, h := range rows[0] {
		col[h] = k
	}
	for i, r := range rows[1:] {
		got, err := strconv.ParseFloat(r[col["model_speed_m_s"]], 64)
		if err != nil || math.Abs(got-want[i].Speed) > 1e-9*want[i].Speed { // written to 10 digits
			t.Errorf("point %d: model_speed_m_s %q, want %g", i+1, r[col["model_speed_m_s"]], want[i].Speed)
		}
		if r[col["model_in_range"]] != strconv.FormatBool(want[i].InRange) {
			t.Errorf("point %d: model_in_range %q, want %v", i+1, r[col["model_in_range"]], want[i].InRange)
		}
		if g := r[col["epsilon"]] + r[col["M2"]] + r[col["Re"]] + r[col["Re_s"]]; g != "" {
			t.Errorf("point %d: groups of the shaking %q for an unshaken case, want empty", i+1, g)
		}
	}
	// 0.4 Pa s is within the model's range (omega L^2/nu = 0.85), 0.01 is not.
	if !want[0].InRange || want[1].InRange {
		t.Errorf("in range at 0.4 and 0.01 Pa s: %v %v, want true false", want[0].InRange, want[1].InRange)
	}
	if _, err := os.Stat(filepath.Join(dir, "speed.png")); err != nil {
		t.Error(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "speed_re_s.png")); err == nil {
		t.Error("speed_re_s.png drawn for an unshaken sweep")
	} else if !strings.Contains(err.Error(), "no such file") {
		t.Error(err)
	}
}
