package cases

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"testing"
)

func TestList(t *testing.T) {
	want := []string{"demo", "dumbbell-train", "pipe-poiseuille", "shaken-cell", "stroke-pair", "three-sphere-lag", "three-sphere-reciprocal"}
	if got := List(); !reflect.DeepEqual(got, want) {
		t.Errorf("List() = %q, want %q", got, want)
	}
	if _, err := Get("demo.toml"); err != nil {
		t.Errorf("Get(demo.toml): %v", err)
	}
	for _, bad := range []string{"nope", "", "../embedded.go", "examples/demo"} {
		if _, err := Get(bad); err == nil {
			t.Errorf("Get(%q) succeeded", bad)
		}
	}
}

func TestExampleScenarios(t *testing.T) {
	get := func(name string) *Case {
		src, err := Get(name)
		if err != nil {
			t.Fatal(err)
		}
		return mustParse(t, name, string(src))
	}
	if c := get("pipe-poiseuille"); c.Container.Ends != EndsPeriodic || len(c.Spheres) != 0 ||
		c.Shaking.Frequency != 0 || c.Shaking.Gravity == 0 || c.Grid.CellSize == 0 {
		t.Errorf("pipe-poiseuille is not a gravity-driven periodic pipe: %+v", c)
	} else {
		l := mustResolve(t, c)
		viscous := c.Container.Radius * c.Container.Radius / l.Nu
		if d := c.Run.Duration / viscous; d < 2 || d > 10 {
			t.Errorf("pipe-poiseuille runs %.2g viscous times, want a few", d)
		}
	}
	if c := get("shaken-cell"); c.Container.Ends != EndsClosed || len(c.Spheres) != 0 || c.Shaking.Amplitude == 0 {
		t.Errorf("shaken-cell is not a closed shaken container without spheres: %+v", c)
	}
}

// TestOpenFileFirst: a file of an example's name shadows the example; a
// bare name without a file is the example; a name with a directory or an
// extension is only ever a file.
func TestOpenFileFirst(t *testing.T) {
	dir := t.TempDir()
	mine := []byte("# my own demo\n")
	if err := os.WriteFile(filepath.Join(dir, "demo"), mine, 0o644); err != nil {
		t.Fatal(err)
	}
	if src, embedded, err := Open("demo", dir); err != nil || embedded || string(src) != string(mine) {
		t.Errorf("Open(demo) beside a file demo: %q, embedded %v, %v; want the file", src, embedded, err)
	}
	want, _ := Get("demo")
	if src, embedded, err := Open("demo", t.TempDir()); err != nil || !embedded || string(src) != string(want) {
		t.Errorf("Open(demo) without a file: embedded %v, %v; want the example", embedded, err)
	}
	if _, _, err := Open("demo.toml", t.TempDir()); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("Open(demo.toml) without a file: %v, want the file's not-exist error", err)
	}
}
