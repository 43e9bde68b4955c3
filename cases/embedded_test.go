package cases

import (
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
