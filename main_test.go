package main

import (
	"bytes"
	"encoding/json"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"axiswim/lbm"
)

func cli(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	code = dispatch(args, &o, &e)
	return code, o.String(), e.String()
}

func TestHelpListsCommands(t *testing.T) {
	code, out, _ := cli(t, "help")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	for _, c := range []string{"run", "check", "verify", "cases"} {
		if !strings.Contains(out, "axiswim "+c) {
			t.Errorf("help does not list %q:\n%s", c, out)
		}
	}
	if code, _, _ := cli(t, "frobnicate"); code != exitUsage {
		t.Errorf("unknown command: exit %d, want %d", code, exitUsage)
	}
}

// TestCheckTypo: a misspelt key is reported with its line and the nearest
// valid key, and check fails.
func TestCheckTypo(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "bad.toml")
	src := "[fluid]\ndensity = 1000.0\nviscocity = 0.001\n\n[container]\nradius = 0.01\nlength = 0.04\n\n[grid]\ncell_size = 0.001\n\n[run]\nduration = 0.1\n"
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := cli(t, "check", path)
	if code == exitOK {
		t.Fatal("check accepted a misspelt key")
	}
	for _, want := range []string{"viscocity", "line 3", "viscosity"} {
		if !strings.Contains(out+errOut, want) {
			t.Errorf("check does not mention %q:\n%s%s", want, out, errOut)
		}
	}
}

// TestRunPipe runs the embedded Poiseuille case, checks its files, and
// checks that a second run into the same directory is refused.
func TestRunPipe(t *testing.T) {
	dir := t.TempDir()
	src, err := os.ReadFile("cases/examples/pipe-poiseuille.toml")
	if err != nil {
		t.Fatal(err)
	}
	cs := filepath.Join(dir, "pipe.toml")
	if err := os.WriteFile(cs, src, 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	if code, _, e := cli(t, "run", "-quiet", "-out", out, cs); code != exitOK {
		t.Fatalf("run: exit %d: %s", code, e)
	}
	for _, f := range []string{"case.toml", "series.csv", "summary.json"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s: %v", f, err)
		}
	}
	var sum struct {
		Completed   bool    `json:"completed"`
		FinalMaxSpd float64 `json:"final_max_speed_m_s"`
		Lattice     struct {
			Kernel string `json:"kernel"`
		} `json:"lattice"`
	}
	data, _ := os.ReadFile(filepath.Join(out, "summary.json"))
	if err := json.Unmarshal(data, &sum); err != nil {
		t.Fatal(err)
	}
	// Hagen-Poiseuille centre speed g R^2/(4 nu) with g = 9.81, R = 2 mm,
	// nu = 1/1260 m^2/s; after four viscous times the start-up is complete
	// to exp(-23) (Szymanski 1932). The node nearest the axis is at r = dx/2,
	// 1/1600 of R^2 lower, inside the 0.1% tolerance.
	want := 9.81 * 0.002 * 0.002 / (4 * (1.0 / 1260))
	if !sum.Completed || sum.FinalMaxSpd < want*0.999 || sum.FinalMaxSpd > want*1.001 {
		t.Errorf("summary: completed %v, max speed %g, want %g (0.1%%)", sum.Completed, sum.FinalMaxSpd, want)
	}
	if k, err := lbm.ResolveKernel(lbm.KernelAuto); err != nil || sum.Lattice.Kernel != string(k) {
		t.Errorf("summary.json: lattice.kernel %q, want the path in use %q (%v)", sum.Lattice.Kernel, k, err)
	}
	// The resolved case runs as it is.
	if code, _, e := cli(t, "check", filepath.Join(out, "case.toml")); code != exitOK {
		t.Errorf("resolved case does not check: %s", e)
	}
	code, _, e := cli(t, "run", "-quiet", "-out", out, cs)
	if code == exitOK || !strings.Contains(e, "not empty") {
		t.Errorf("second run into %s: exit %d, %q; want a refusal", out, code, e)
	}
}

// TestKernelChoice: AXISWIM_KERNEL chooses the kernel path, check names
// it, and a path the machine cannot run (or no path at all) is refused
// before the command does anything.
func TestKernelChoice(t *testing.T) {
	for _, k := range lbm.Kernels() {
		t.Setenv(lbm.KernelEnv, string(k))
		code, out, e := cli(t, "check", "-quiet", "cases/examples/pipe-poiseuille.toml")
		if code != exitOK || !strings.Contains(out, "kernel          "+string(k)) ||
			!strings.Contains(out, "set by "+lbm.KernelEnv+"="+string(k)) {
			t.Errorf("%s=%s: check exit %d, does not name the path:\n%s%s", lbm.KernelEnv, k, code, out, e)
		}
	}
	t.Setenv(lbm.KernelEnv, "avx3")
	out := filepath.Join(t.TempDir(), "run")
	code, _, e := cli(t, "run", "-quiet", "-out", out, "cases/examples/pipe-poiseuille.toml")
	if code != exitUsage || !strings.Contains(e, lbm.KernelEnv+"=avx3") || !strings.Contains(e, "portable") {
		t.Errorf("%s=avx3: exit %d, %q; want a usage error naming the value and the choices", lbm.KernelEnv, code, e)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Errorf("%s=avx3: the refused run made %s", lbm.KernelEnv, out)
	}
}

func TestCasesPrintsDemo(t *testing.T) {
	code, out, _ := cli(t, "cases", "demo")
	if code != exitOK || !strings.Contains(out, "[[sphere]]") {
		t.Errorf("cases demo: exit %d\n%s", code, out)
	}
	if code, _, _ := cli(t, "cases", "no-such-case"); code != exitUsage {
		t.Errorf("unknown case: exit %d", code)
	}
}

// TestRunWritesFieldsAndPictures: a short swimmer run writes its VTK fields
// (a mean, phase averages and snapshots, with their collections), the
// metrics, and PNG pictures that decode, have a plausible size and are not
// blank (pixel variance above 1% of the largest an 8-bit image can have).
func TestRunWritesFieldsAndPictures(t *testing.T) {
	out := smallSwimmer(t)
	for _, f := range []string{"fields/mean.vti", "fields/phase_00.vti", "fields/phases.pvd",
		"fields/snapshot_p0006_07.vti", "fields/snapshots.pvd", "metrics.csv", "periods.csv"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s", f)
		}
	}
	for _, f := range []string{"mean_vorticity.png", "centroid.png", "speed.png", "spring.png", "frames/frame_00.png", "frames/frame_07.png"} {
		fh, err := os.Open(filepath.Join(out, "pictures", f))
		if err != nil {
			t.Errorf("missing picture %s", f)
			continue
		}
		img, err := png.Decode(fh)
		fh.Close()
		if err != nil {
			t.Errorf("%s: %v", f, err)
			continue
		}
		b := img.Bounds()
		if b.Dx() < 300 || b.Dy() < 200 {
			t.Errorf("%s: %dx%d pixels, too small", f, b.Dx(), b.Dy())
		}
		var s, s2, n float64
		for y := b.Min.Y; y < b.Max.Y; y += 3 {
			for x := b.Min.X; x < b.Max.X; x += 3 {
				r, g, bl, _ := img.At(x, y).RGBA()
				v := float64(r+g+bl) / 3 / 257
				s, s2, n = s+v, s2+v*v, n+1
			}
		}
		if variance := s2/n - (s/n)*(s/n); variance < 0.01*127.5*127.5 {
			t.Errorf("%s looks blank: pixel variance %.1f", f, variance)
		}
	}
	var sum struct {
		Streaming *struct {
			Rings []struct {
				Z float64 `json:"z_m"`
			} `json:"vortex_rings"`
		} `json:"streaming"`
	}
	data, _ := os.ReadFile(filepath.Join(out, "summary.json"))
	if err := json.Unmarshal(data, &sum); err != nil || sum.Streaming == nil || len(sum.Streaming.Rings) == 0 {
		t.Errorf("summary has no streaming rings (%v)", err)
	}
}

// TestGuardCatchesInstability: a case with tau too close to 1/2 at a high
// grid Reynolds number is stopped by a guard that names the cause and the
// remedy, in the message and in summary.json, before any NaN reaches a
// file.
func TestGuardCatchesInstability(t *testing.T) {
	out := filepath.Join(t.TempDir(), "run")
	code, stdout, e := cli(t, "run", "-quiet", "-out", out, "testdata/unstable.toml")
	if code != exitError {
		t.Fatalf("exit %d, want %d (a failed run)\n%s", code, exitError, e)
	}
	for _, want := range []string{"tau = 0.5003", "grid Reynolds", "raise grid.tau"} {
		if !strings.Contains(e, want) || !strings.Contains(stdout, want) {
			t.Errorf("the diagnosis does not say %q:\n%s\n%s", want, e, stdout)
		}
	}
	var sum struct {
		Failure string `json:"failure"`
	}
	data, _ := os.ReadFile(filepath.Join(out, "summary.json"))
	if err := json.Unmarshal(data, &sum); err != nil || !strings.Contains(sum.Failure, "grid Reynolds") {
		t.Errorf("summary failure %q (%v)", sum.Failure, err)
	}
	for _, f := range []string{"series.csv", "summary.json"} {
		b, _ := os.ReadFile(filepath.Join(out, f))
		if strings.Contains(strings.ToLower(string(b)), "nan") {
			t.Errorf("%s contains NaN", f)
		}
	}
}

// TestCheckListsAllProblems: a misspelt key and a bad value are reported
// together, each with its fix.
func TestCheckListsAllProblems(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.toml")
	src := "[fluid]\ndensity = 1000.0\nviscocity = 0.001\n\n[container]\nradius = -0.01\nlength = 0.04\n\n[grid]\ncell_size = 0.001\n\n[run]\nduration = 0.1\n"
	os.WriteFile(path, []byte(src), 0o644)
	code, out, _ := cli(t, "check", path)
	if code == exitOK {
		t.Fatal("check accepted a bad case")
	}
	for _, want := range []string{"fluid.viscocity", "did you mean", "container.radius = -0.01", "fix:"} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q:\n%s", want, out)
		}
	}
}

// TestSweepUsage: sweep without a file, or with both a file and -resume,
// is a usage error (exit status 2) that shows how to call it.
func TestSweepUsage(t *testing.T) {
	for _, args := range [][]string{{"sweep"}, {"sweep", "-resume", "x", "y.toml"}} {
		var out, errb bytes.Buffer
		if code := dispatch(args, &out, &errb); code != 2 || !strings.Contains(errb.String(), "usage: axiswim sweep") {
			t.Errorf("%v: exit %d, stderr %q", args, code, errb.String())
		}
	}
}

// TestOnsetUsage: a bad onset command line is refused with the fix.
func TestOnsetUsage(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"onset"}, "usage: axiswim onset"},
		{[]string{"onset", "-between", "1e-4", "testdata/small-swimmer.toml"}, "write two numbers LO,HI"},
		{[]string{"onset", "-between", "4e-4,1e-4", "testdata/small-swimmer.toml"}, "give LO < HI"},
		{[]string{"onset", "-param", "fluid.viscosity", "testdata/small-swimmer.toml"}, "needs -between"},
		{[]string{"onset", "-scale", "cubic", "testdata/small-swimmer.toml"}, "use log or linear"},
		{[]string{"onset", "-tol", "2", "testdata/small-swimmer.toml"}, "relative bracket width"},
	} {
		var out, errb bytes.Buffer
		if code := dispatch(c.args, &out, &errb); code != exitUsage || !strings.Contains(errb.String(), c.want) {
			t.Errorf("%v: exit %d, stderr %q, want %q", c.args, code, errb.String(), c.want)
		}
	}
}

// TestHelpFlag: COMMAND -h prints the command's usage once and does
// nothing else (run -h once went on to run the demo), exit status 0.
func TestHelpFlag(t *testing.T) {
	for _, c := range commands() {
		if c.run == nil {
			continue
		}
		var out, errb bytes.Buffer
		code := dispatch([]string{c.name, "-h"}, &out, &errb)
		if n := strings.Count(errb.String(), "usage: axiswim "+c.name); code != exitOK || n != 1 || out.Len() > 0 {
			t.Errorf("%s -h: exit %d, usage printed %d times, stdout %q", c.name, code, n, out.String())
		}
	}
}

// TestVerifySelect: verify -list names every check, quick and full;
// verify -only runs just the named one (the cheapest, Kelvin functions);
// an unknown name is refused with the list of known ones.
func TestVerifySelect(t *testing.T) {
	code, out, _ := cli(t, "verify", "-list")
	if code != exitOK || !strings.Contains(out, "three-sphere-container") || !strings.Contains(out, "kelvin-functions") {
		t.Errorf("verify -list: exit %d\n%s", code, out)
	}
	code, out, errOut := cli(t, "verify", "-quiet", "-only", "kelvin-functions")
	if code != exitOK || !strings.Contains(out, "kelvin functions") || !strings.Contains(out, "10 passed") || strings.Contains(out, "poiseuille") {
		t.Errorf("verify -only kelvin-functions: exit %d\n%s%s", code, out, errOut)
	}
	code, _, errOut = cli(t, "verify", "-only", "kelvin,hagen-poiseuille")
	if code == exitOK || !strings.Contains(errOut, `no verification check "kelvin"`) || !strings.Contains(errOut, "kelvin-functions") {
		t.Errorf("verify -only with an unknown name: exit %d, stderr %q", code, errOut)
	}
}

// TestReadmeCommands: the README's command block is the help's list of
// command forms, line for line (help's table in main.go is the source).
func TestReadmeCommands(t *testing.T) {
	readme, err := os.ReadFile("README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, help, _ := cli(t, "help")
	var want, got []string
	for _, l := range strings.Split(help, "\n") {
		if strings.HasPrefix(l, "  axiswim ") {
			want = append(want, strings.TrimSpace(l))
		}
	}
	_, block, _ := strings.Cut(string(readme), "## Commands\n\n")
	block, _, _ = strings.Cut(block, "\n\n")
	for _, l := range strings.Split(block, "\n") {
		got = append(got, strings.TrimSpace(l))
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("README's command block:\n%s\nhelp's forms:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}
