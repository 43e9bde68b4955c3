package output

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestRunDirRefusesNonEmpty: a missing directory is created, an empty one
// used, a non-empty one refused without force, and force leaves files
// that are not replaced in place.
func TestRunDirRefusesNonEmpty(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "run")
	if err := RunDir(dir, false); err != nil {
		t.Fatalf("new directory: %v", err)
	}
	if err := RunDir(dir, false); err != nil {
		t.Fatalf("empty directory: %v", err)
	}
	keep := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	err := RunDir(dir, false)
	if err == nil || !strings.Contains(err.Error(), "not empty") || !strings.Contains(err.Error(), "-force") {
		t.Fatalf("non-empty directory: %v, want a refusal naming -force", err)
	}
	if err := RunDir(dir, true); err != nil {
		t.Fatalf("with force: %v", err)
	}
	if b, _ := os.ReadFile(keep); string(b) != "mine" {
		t.Error("force touched a file it was not asked to replace")
	}
}

// TestWriteFileAtomic: the file has the new content and no temporary file
// is left behind.
func TestWriteFileAtomic(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "summary.json")
	for _, s := range []string{"first", "second"} {
		if err := WriteFileAtomic(p, []byte(s)); err != nil {
			t.Fatal(err)
		}
	}
	if b, _ := os.ReadFile(p); string(b) != "second" {
		t.Errorf("content %q", b)
	}
	if es, _ := os.ReadDir(dir); len(es) != 1 {
		t.Errorf("%d entries, want only the file", len(es))
	}
}

// TestSeries: header then rows, one value per column, and a wrong row
// length is an error.
func TestSeries(t *testing.T) {
	p := filepath.Join(t.TempDir(), "series.csv")
	s, err := CreateSeries(p, []Column{{Name: "time_s"}, {Name: "x_m"}})
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Row(0.5, 1e-3); err != nil {
		t.Fatal(err)
	}
	if err := s.Row(1); err == nil {
		t.Error("a short row was accepted")
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(p)
	if got, want := string(b), "time_s,x_m\n0.5,0.001\n"; got != want {
		t.Errorf("file %q, want %q", got, want)
	}
}
