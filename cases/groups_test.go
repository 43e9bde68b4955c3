package cases

import (
	"math"
	"testing"
)

// TestGroupsWorkedExample checks the groups of METHODS.md 11.3 (worked
// example, [D] arithmetic): large sphere a = 1.5 mm: M² = 56.5,
// ε = 0.333, Re = 18.8, Re_s = 6.28, δ = 0.282 mm; small sphere a = 1 mm:
// M² = 25.1, ε = 0.5, Re = 12.6; DeltaCells is that δ of 0.282 mm over
// the lattice's cell (the cell is an input here: with the second, smaller
// sphere the grid is finer than that of the example's table).
func TestGroupsWorkedExample(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	c.Spheres = append(c.Spheres, Sphere{Radius: 0.001, Density: 1150, Z: 0.01})
	l := mustResolve(t, c)
	gs := c.Groups(l)
	if len(gs) != 2 {
		t.Fatalf("%d groups, want 2", len(gs))
	}
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"M2 large", gs[0].M2, 56.5},
		{"epsilon large", gs[0].Epsilon, 0.333},
		{"Re large", gs[0].Re, 18.8},
		{"Re_s large", gs[0].ReS, 6.28},
		{"delta", gs[0].Delta * 1e3, 0.282},
		{"M2 small", gs[1].M2, 25.1},
		{"epsilon small", gs[1].Epsilon, 0.5},
		{"Re small", gs[1].Re, 12.6},
		{"Re_s small", gs[1].ReS, 6.28},
	} {
		if !within(tc.got, tc.want, 0.005) {
			t.Errorf("%s = %.4g, want %.4g", tc.name, tc.got, tc.want)
		}
	}
	if want := 0.282e-3 / l.Dx; !within(gs[1].DeltaCells, want, 0.005) {
		t.Errorf("delta/dx = %.4g, want %.4g (0.282 mm, METHODS.md 11.3, over dx)", gs[1].DeltaCells, want)
	}
	if gs[0].Sphere != 1 || gs[1].Sphere != 2 {
		t.Errorf("sphere indices %d, %d", gs[0].Sphere, gs[1].Sphere)
	}
	if g := c.Groups(nil); g[0].DeltaCells != 0 || g[0].M2 != gs[0].M2 {
		t.Errorf("Groups(nil) = %+v", g[0])
	}
}

// TestArmGroups: the groups of the three-sphere-lag example's strokes
// against a hand calculation: a = 0.5 mm, d = 0.3 mm, L = 3 mm, 5 Hz,
// nu = 0.1/1200 m^2/s: d/a = 0.6, Re = a d omega/nu = 0.056549,
// omega L^2/nu = 3.3929, delta = sqrt(2 nu/omega) = 2.3033 mm (5 digits;
// the tolerance is their rounding).
func TestArmGroups(t *testing.T) {
	src, err := Get("three-sphere-lag")
	if err != nil {
		t.Fatal(err)
	}
	c, err := Parse("three-sphere-lag", src)
	if err != nil {
		t.Fatal(err)
	}
	gs := c.ArmGroups(nil)
	if len(gs) != 2 {
		t.Fatalf("%d arm groups, want 2", len(gs))
	}
	for _, g := range gs {
		for _, q := range []struct {
			name      string
			got, want float64
		}{{"d/a", g.DOverA, 0.6}, {"Re", g.Re, 0.056549}, {"omega L^2/nu", g.Unsteady, 3.3929}, {"delta", g.Delta, 2.3033e-3}} {
			if math.Abs(q.got-q.want) > 5e-5*q.want {
				t.Errorf("arm %d: %s = %.6g, want %.5g", g.Arm, q.name, q.got, q.want)
			}
		}
	}
	if len(Default().ArmGroups(nil)) != 0 {
		t.Error("groups for a case without arms")
	}
}
