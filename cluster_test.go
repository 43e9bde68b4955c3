package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// testSweep is the cheapest sweep: three amplitudes of the small swimmer
// cut to 3 periods (about half a second a point on one core).
const testSweep = "testdata/sweep.toml"

// reference runs testSweep once with 'axiswim sweep' and keeps its
// results.csv for the tests that compare with an uninterrupted sweep.
var reference = sync.OnceValues(func() ([]byte, error) {
	dir, err := os.MkdirTemp("", "axiswim-ref-sweep-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(dir)
	out := filepath.Join(dir, "sweep")
	var o, e bytes.Buffer
	if code := dispatch([]string{"sweep", "-quiet", "-threads", "1", "-out", out, testSweep}, &o, &e); code != exitOK {
		return nil, fmt.Errorf("exit %d: %s", code, e.String())
	}
	return os.ReadFile(filepath.Join(out, "results.csv"))
})

func referenceTable(t *testing.T) []byte {
	t.Helper()
	table, err := reference()
	if err != nil {
		t.Fatalf("reference sweep: %v", err)
	}
	return table
}

// sameResults fails unless the two results.csv tables have the same
// header and rows, every column but wall_time_s exactly equal.
func sameResults(t *testing.T, want, got []byte) {
	t.Helper()
	w, err1 := csv.NewReader(bytes.NewReader(want)).ReadAll()
	g, err2 := csv.NewReader(bytes.NewReader(got)).ReadAll()
	if err1 != nil || err2 != nil || len(w) < 2 {
		t.Fatalf("results.csv does not read: %v %v\n%s\n%s", err1, err2, want, got)
	}
	if len(w) != len(g) || strings.Join(w[0], ",") != strings.Join(g[0], ",") {
		t.Fatalf("results.csv differs in its header or number of rows:\n%s\n%s", want, got)
	}
	wall := -1
	for j, h := range w[0] {
		if h == "wall_time_s" {
			wall = j
		}
	}
	if wall < 0 {
		t.Fatalf("results.csv has no wall_time_s column:\n%s", want)
	}
	for i := 1; i < len(w); i++ {
		if w[i][len(w[i])-1] != "done" {
			t.Errorf("reference row %d is not done: %v", i, w[i])
		}
		for j := range w[i] {
			if j != wall && (j >= len(g[i]) || g[i][j] != w[i][j]) {
				t.Errorf("row %d, column %s: %q, want %q", i, w[0][j], g[i][min(j, len(g[i])-1)], w[i][j])
			}
		}
	}
}

// TestSweepPlan: -plan writes the sweep, points.csv and a batch script
// whose array covers the points and whose task runs its point with the
// task's cores, by absolute paths; it refuses a directory that is not
// empty (changing nothing there), a path a #SBATCH line cannot carry and
// flags that belong to other forms.
func TestSweepPlan(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "plan")
	code, out, e := cli(t, "sweep", "-plan", "-threads", "2", "-out", dir, testSweep)
	if code != exitOK {
		t.Fatalf("plan: exit %d: %s", code, e)
	}
	if !strings.Contains(out, "sbatch "+filepath.Join(dir, "slurm.sh")) {
		t.Errorf("plan does not say how to submit:\n%s", out)
	}
	script, err := os.ReadFile(filepath.Join(dir, "slurm.sh"))
	if err != nil {
		t.Fatal(err)
	}
	exe, _ := os.Executable()
	for _, want := range []string{
		"#!/bin/bash\n",
		"\n#SBATCH --array=1-3\n",
		"\n#SBATCH --cpus-per-task=2\n",
		"\n#SBATCH --job-name=axiswim-sweep\n",
		"\n#SBATCH --output=" + filepath.Join(dir, "logs", "point_%a.log") + "\n",
		"\n##SBATCH --time=",
		"\nAXISWIM=${AXISWIM:-'" + exe + "'}\n",
		"\nexec \"$AXISWIM\" sweep -point \"$SLURM_ARRAY_TASK_ID\" -threads \"${SLURM_CPUS_PER_TASK:-1}\" '" + dir + "'\n",
	} {
		if !bytes.Contains(script, []byte(want)) {
			t.Errorf("slurm.sh lacks %q:\n%s", want, script)
		}
	}
	// sbatch reads #SBATCH lines only up to the first command.
	first := bytes.Index(script, []byte("\nset -eu"))
	if last := bytes.LastIndex(script, []byte("\n#SBATCH")); first < 0 || last > first {
		t.Errorf("an #SBATCH line comes after the first command:\n%s", script)
	}
	if fi, err := os.Stat(filepath.Join(dir, "logs")); err != nil || !fi.IsDir() {
		t.Errorf("no logs directory: %v", err)
	}
	points, _ := os.ReadFile(filepath.Join(dir, "points.csv"))
	if want := "point,shaking.amplitude,dir\n1,0.0001,point_001\n2,0.0002,point_002\n3,0.00035,point_003\n"; string(points) != want {
		t.Errorf("points.csv:\n%s\nwant\n%s", points, want)
	}
	for _, f := range []string{"sweep.toml", "base.toml"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("missing %s", f)
		}
	}

	// Planning again into the same directory is refused and changes nothing.
	os.WriteFile(filepath.Join(dir, "slurm.sh"), []byte("# edited\n"), 0o644)
	if code, _, e := cli(t, "sweep", "-plan", "-out", dir, testSweep); code == exitOK || !strings.Contains(e, "not empty") {
		t.Errorf("plan into a planned directory: exit %d, %q; want a refusal", code, e)
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "slurm.sh")); string(b) != "# edited\n" {
		t.Error("a refused plan rewrote slurm.sh")
	}
	spaced := filepath.Join(t.TempDir(), "a b")
	if code, _, e := cli(t, "sweep", "-plan", "-out", spaced, testSweep); code != exitUsage || !strings.Contains(e, "#SBATCH") {
		t.Errorf("plan into %q: exit %d, %q; want a usage error naming #SBATCH", spaced, code, e)
	}
	if _, err := os.Stat(spaced); err == nil {
		t.Errorf("a refused plan made %s", spaced)
	}
	for _, args := range [][]string{
		{"sweep", "-plan", "-jobs", "2", testSweep},
		{"sweep", "-plan", "-resume", dir},
		{"sweep", "-point", "1", "-out", dir, dir},
		{"sweep", "-plan"},
		{"collect"},
	} {
		if code, _, e := cli(t, args...); code != exitUsage || !strings.Contains(e, "usage: axiswim") {
			t.Errorf("%v: exit %d, %q; want a usage error", args, code, e)
		}
	}
}

// TestSweepPointsAndCollect runs a planned sweep as Slurm would, each
// point by the batch script itself (bash, with the variables Slurm sets),
// and collects it: with a point missing, collect names it, writes its
// status and fails; with all, results.csv equals that of 'axiswim sweep'
// of the same file but for the wall times. A point out of range is a
// usage error naming the range, and a finished point is not run again.
func TestSweepPointsAndCollect(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash to run the batch script")
	}
	want := referenceTable(t)
	dir := filepath.Join(t.TempDir(), "planned")
	if code, _, e := cli(t, "sweep", "-plan", "-threads", "1", "-out", dir, testSweep); code != exitOK {
		t.Fatalf("plan: exit %d: %s", code, e)
	}
	task := func(n int) {
		t.Helper()
		cmd := exec.Command("bash", filepath.Join(dir, "slurm.sh"))
		cmd.Dir = t.TempDir() // any working directory
		cmd.Env = append(os.Environ(), "AXISWIM_AS_MAIN=1", "SLURM_ARRAY_TASK_ID="+strconv.Itoa(n), "SLURM_CPUS_PER_TASK=1")
		if b, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("array task %d: %v\n%s", n, err, b)
		}
	}
	task(1)
	task(3)
	if _, err := os.Stat(filepath.Join(dir, "results.csv")); err == nil {
		t.Error("a point wrote results.csv")
	}
	code, out, e := cli(t, "collect", dir)
	if code != exitError || !strings.Contains(e, "not run: point(s) 2\n") || !strings.Contains(e, "sbatch --array=2 ") {
		t.Errorf("collect with point 2 missing: exit %d (want %d)\n%s%s", code, exitError, out, e)
	}
	table, _ := os.ReadFile(filepath.Join(dir, "results.csv"))
	rows := strings.Split(strings.TrimSpace(string(table)), "\n")
	if len(rows) != 4 || !strings.HasSuffix(rows[1], ",done") || !strings.HasSuffix(rows[2], ",not run") || !strings.HasSuffix(rows[3], ",done") {
		t.Errorf("results.csv with point 2 missing:\n%s", table)
	}

	if code, _, e := cli(t, "sweep", "-point", "4", dir); code != exitUsage || !strings.Contains(e, "points 1 to 3") {
		t.Errorf("-point 4: exit %d, %q; want a usage error naming the range", code, e)
	}
	task(2)
	info, _ := os.Stat(filepath.Join(dir, "point_001", "series.csv"))
	if code, _, e := cli(t, "sweep", "-point", "1", dir); code != exitOK || !strings.Contains(e, "finished earlier, not run again") {
		t.Errorf("-point 1 again: exit %d, %q", code, e)
	}
	if again, _ := os.Stat(filepath.Join(dir, "point_001", "series.csv")); !again.ModTime().Equal(info.ModTime()) {
		t.Error("-point 1 again rewrote its series")
	}
	if code, out, e := cli(t, "collect", dir); code != exitOK || !strings.Contains(out, "3 of 3 points done") {
		t.Fatalf("collect: exit %d\n%s%s", code, out, e)
	}
	got, _ := os.ReadFile(filepath.Join(dir, "results.csv"))
	sameResults(t, want, got)
	for _, f := range []string{"speed.png", "speed_re_s.png", "logs"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("missing %s", f)
		}
	}
}

// TestSweepResumeAfterKill: a sweep killed (SIGKILL) after its first point
// finished and before the last runs no finished point again when resumed
// (their files unchanged, byte for byte and in modification time, and the
// log says so), and ends with the results.csv of an uninterrupted sweep but
// for the wall times.
func TestSweepResumeAfterKill(t *testing.T) {
	want := referenceTable(t)
	dir := filepath.Join(t.TempDir(), "killed")
	cmd, errb := child(t, "sweep", "-threads", "1", "-out", dir, testSweep)
	completed := func(n int) bool {
		var sum struct {
			Completed bool `json:"completed"`
		}
		data, err := os.ReadFile(filepath.Join(dir, "point_00"+strconv.Itoa(n), "summary.json"))
		return err == nil && json.Unmarshal(data, &sum) == nil && sum.Completed
	}
	for end := time.Now().Add(60 * time.Second); !completed(1); time.Sleep(10 * time.Millisecond) {
		if time.Now().After(end) {
			cmd.Process.Kill()
			t.Fatalf("point 1 did not finish in a minute:\n%s", errb)
		}
	}
	cmd.Process.Signal(syscall.SIGKILL)
	cmd.Wait()
	if completed(3) {
		t.Fatalf("the sweep finished before it was killed:\n%s", errb)
	}
	_, err := os.Stat(filepath.Join(dir, "point_002", "case.toml"))
	startedTwo := err == nil && !completed(2)
	type file struct {
		data []byte
		mod  time.Time
	}
	kept := map[string]file{}
	for n := 1; n <= 3 && completed(n); n++ {
		for _, f := range []string{"summary.json", "series.csv", "periods.csv", "case.toml"} {
			path := filepath.Join(dir, "point_00"+strconv.Itoa(n), f)
			data, err := os.ReadFile(path)
			info, err2 := os.Stat(path)
			if err != nil || err2 != nil {
				t.Fatal(err, err2)
			}
			kept[path] = file{data, info.ModTime()}
		}
	}

	t.Logf("killed with point 2 started: %v", startedTwo)
	code, _, e := cli(t, "sweep", "-threads", "1", "-resume", dir)
	if code != exitOK {
		t.Fatalf("resume: exit %d\n%s", code, e)
	}
	if !strings.Contains(e, "point 1 (shaking.amplitude=0.0001): finished earlier, not run again\n") {
		t.Errorf("the resume log does not say point 1 was finished earlier:\n%s", e)
	}
	if startedTwo && !strings.Contains(e, "point 2 (shaking.amplitude=0.0002): stopped before its first checkpoint earlier; running again from the start") {
		t.Errorf("the resume log does not say point 2 runs again from the start:\n%s", e)
	}
	for path, f := range kept {
		data, _ := os.ReadFile(path)
		info, err := os.Stat(path)
		if err != nil || !bytes.Equal(data, f.data) || !info.ModTime().Equal(f.mod) {
			t.Errorf("%s of a finished point changed on resume", path)
		}
	}
	got, _ := os.ReadFile(filepath.Join(dir, "results.csv"))
	sameResults(t, want, got)
}
