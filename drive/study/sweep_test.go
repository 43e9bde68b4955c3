package study

import (
	"axiswim/drive/run"
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"axiswim/cases"
)

// sweepCase is the small swimmer cut to 2 periods, without fields or
// pictures, for sweep tests.
func sweepCase(t *testing.T) string {
	src, err := os.ReadFile("../../testdata/sweep-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "base.toml")
	if err := os.WriteFile(path, bytes.Replace(src, []byte("periods = 3"), []byte("periods = 2"), 1), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// testSweep is a sweep of sweepCase with one key varied over values (a
// TOML list's contents).
func testSweep(t *testing.T, name, key, values string) *cases.Sweep {
	t.Helper()
	base := sweepCase(t)
	src := "base = \"" + filepath.Base(base) + "\"\n[[vary]]\nkey = \"" + key + "\"\nvalues = [" + values + "]\n"
	s, err := cases.ParseSweep(name, []byte(src), filepath.Dir(base))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestSweepMatchesSingleRuns: the points of a sweep run with one job and
// with two give the same series, bit for bit, as the same cases run one
// by one, and a second invocation runs no finished point again.
func TestSweepMatchesSingleRuns(t *testing.T) {
	s := testSweep(t, "amp", "shaking.amplitude", "1e-4, 2e-4, 3e-4")
	ctx := context.Background()
	out1, out2 := filepath.Join(t.TempDir(), "jobs1"), filepath.Join(t.TempDir(), "jobs2")
	if _, err := RunSweep(ctx, s, SweepOptions{Out: out1, Jobs: 1, Cores: 2}); err != nil {
		t.Fatal(err)
	}
	res, err := RunSweep(ctx, s, SweepOptions{Out: out2, Jobs: 2, Cores: 2})
	if err != nil {
		t.Fatal(err)
	}
	if err := SweepFailures(res); err != nil {
		t.Fatal(err)
	}
	for i, pt := range s.Points() {
		_, c, err := s.CaseAt(pt)
		if err != nil {
			t.Fatal(err)
		}
		l, err := cases.Resolve(c)
		if err != nil {
			t.Fatal(err)
		}
		alone := filepath.Join(t.TempDir(), "alone")
		if _, err := run.Execute(ctx, c, l, run.Options{Out: alone, Quiet: true, Threads: 1}); err != nil {
			t.Fatal(err)
		}
		want, _ := os.ReadFile(filepath.Join(alone, "series.csv"))
		for _, out := range []string{out1, out2} {
			got, err := os.ReadFile(filepath.Join(PointDir(out, i), "series.csv"))
			if err != nil || !bytes.Equal(got, want) || len(want) == 0 {
				t.Errorf("point %d in %s: series differs from the case run alone (%v)", i+1, filepath.Base(out), err)
			}
		}
	}
	table, err := os.ReadFile(filepath.Join(out2, ResultsFile))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(table)), "\n")
	if len(lines) != 4 || !strings.HasPrefix(lines[0], "point,shaking.amplitude,epsilon,M2") || !strings.HasSuffix(lines[3], ",done") {
		t.Errorf("results.csv:\n%s", table)
	}
	// Again: every point is finished, none runs, no file changes.
	info, _ := os.Stat(filepath.Join(PointDir(out2, 0), "series.csv"))
	time.Sleep(10 * time.Millisecond)
	res, err = RunSweep(ctx, s, SweepOptions{Out: out2, Jobs: 2, Cores: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range res {
		if !r.Skipped {
			t.Errorf("point %d ran again", r.Index+1)
		}
	}
	if info2, _ := os.Stat(filepath.Join(PointDir(out2, 0), "series.csv")); !info2.ModTime().Equal(info.ModTime()) {
		t.Error("a finished point's series was rewritten")
	}
	again, _ := os.ReadFile(filepath.Join(out2, ResultsFile))
	if !bytes.Equal(again, table) {
		t.Errorf("results.csv changed on the second invocation:\n%s\n%s", table, again)
	}
}
