package main

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// TestMain lets the tests run the command itself as a child process
// (AXISWIM_AS_MAIN=1): the signal tests need a real process to signal. It
// also keeps the folder of the runs that several tests share
// (smallSwimmer).
func TestMain(m *testing.M) {
	if os.Getenv("AXISWIM_AS_MAIN") == "1" {
		os.Exit(dispatch(os.Args[1:], os.Stdout, os.Stderr))
	}
	dir, err := os.MkdirTemp("", "axiswim-test-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	shared.dir = dir
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}

// shared holds the run of testdata/small-swimmer.toml that several tests
// read (TestRunWritesFieldsAndPictures checks its files, TestSignals
// compares interrupted runs with it), made once by smallSwimmer.
var shared struct {
	dir  string
	once sync.Once
	run  string // the run directory
	err  error
}

// smallSwimmer returns the directory of an uninterrupted run of
// testdata/small-swimmer.toml, made on the first call. Tests must only
// read it.
func smallSwimmer(t *testing.T) string {
	t.Helper()
	shared.once.Do(func() {
		shared.run = filepath.Join(shared.dir, "small-swimmer")
		var o, e bytes.Buffer
		if code := dispatch([]string{"run", "-quiet", "-out", shared.run, "testdata/small-swimmer.toml"}, &o, &e); code != exitOK {
			shared.err = fmt.Errorf("run testdata/small-swimmer.toml: exit %d: %s", code, e.String())
		}
	})
	if shared.err != nil {
		t.Fatal(shared.err)
	}
	return shared.run
}

// child starts the command in a child process.
func child(t *testing.T, args ...string) (*exec.Cmd, *bytes.Buffer) {
	t.Helper()
	cmd := exec.Command(os.Args[0], args...)
	cmd.Env = append(os.Environ(), "AXISWIM_AS_MAIN=1")
	var errb bytes.Buffer
	cmd.Stderr = &errb
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	return cmd, &errb
}

// waitFor waits until path exists or the deadline passes.
func waitFor(path string, d time.Duration) bool {
	for end := time.Now().Add(d); time.Now().Before(end); time.Sleep(20 * time.Millisecond) {
		if _, err := os.Stat(path); err == nil {
			return true
		}
	}
	return false
}

func sameFiles(t *testing.T, a, b string, names ...string) {
	t.Helper()
	for _, n := range names {
		x, err1 := os.ReadFile(filepath.Join(a, n))
		y, err2 := os.ReadFile(filepath.Join(b, n))
		if err1 != nil || err2 != nil {
			t.Errorf("%s: %v %v", n, err1, err2)
			continue
		}
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs from the uninterrupted run (%d and %d bytes)", n, len(x), len(y))
		}
	}
}

// TestSignals: SIGINT ends a run cleanly (exit status 4, a message that
// says how to resume, a checkpoint, complete files) and the resumed run
// matches an uninterrupted one; SIGKILL at random moments, including
// during checkpoint writes (one every period), always leaves a checkpoint
// that loads, and the resumed run matches bit for bit.
func TestSignals(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the small swimmer several times")
	}
	tmp := t.TempDir()
	ref := smallSwimmer(t)
	files := []string{"series.csv", "periods.csv", "metrics.csv", "fields/mean.vti", "fields/snapshots.pvd"}

	// SIGINT
	dir := filepath.Join(tmp, "int")
	cmd, errb := child(t, "run", "-quiet", "-checkpoint-periods", "1", "-out", dir, "testdata/small-swimmer.toml")
	if !waitFor(filepath.Join(dir, "checkpoint.bin"), 60*time.Second) {
		cmd.Process.Kill()
		t.Fatal("no checkpoint appeared")
	}
	cmd.Process.Signal(syscall.SIGINT)
	err := cmd.Wait()
	ee, ok := err.(*exec.ExitError)
	if !ok || ee.ExitCode() != exitStopped {
		t.Fatalf("SIGINT: %v, want exit status %d", err, exitStopped)
	}
	if !strings.Contains(errb.String(), "-resume "+dir) {
		t.Errorf("the message does not say how to resume:\n%s", errb.String())
	}
	if code, _, e := cli(t, "run", "-quiet", "-resume", dir); code != exitOK {
		t.Fatalf("resume after SIGINT: %d %s", code, e)
	}
	sameFiles(t, ref, dir, files...)

	// SIGKILL at random moments
	rng := rand.New(rand.NewPCG(2026, 12))
	for i := 0; i < 3; i++ {
		dir := filepath.Join(tmp, "kill", string(rune('a'+i)))
		cmd, _ := child(t, "run", "-quiet", "-checkpoint-periods", "1", "-out", dir, "testdata/small-swimmer.toml")
		if !waitFor(filepath.Join(dir, "checkpoint.bin"), 60*time.Second) {
			cmd.Process.Kill()
			t.Fatal("no checkpoint appeared")
		}
		time.Sleep(time.Duration(rng.IntN(1500)) * time.Millisecond)
		cmd.Process.Kill()
		cmd.Wait()
		if code, _, e := cli(t, "run", "-quiet", "-resume", dir); code != exitOK {
			t.Fatalf("resume after SIGKILL %d: %d %s", i, code, e)
		}
		sameFiles(t, ref, dir, files...)
	}
}
