package cases

import "testing"

// TestGroupsWorkedExample checks the groups of METHODS.md 11.3 (worked
// example, [D] arithmetic): large sphere a = 1.5 mm: M² = 56.5,
// ε = 0.333, Re = 18.8, Re_s = 6.28, δ = 0.282 mm; small sphere a = 1 mm:
// M² = 25.1, ε = 0.5, Re = 12.6.
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
		{"delta/dx", gs[1].DeltaCells, gs[1].Delta / l.Dx},
	} {
		if !within(tc.got, tc.want, 0.005) {
			t.Errorf("%s = %.4g, want %.4g", tc.name, tc.got, tc.want)
		}
	}
	if gs[0].Sphere != 1 || gs[1].Sphere != 2 {
		t.Errorf("sphere indices %d, %d", gs[0].Sphere, gs[1].Sphere)
	}
	if g := c.Groups(nil); g[0].DeltaCells != 0 || g[0].M2 != gs[0].M2 {
		t.Errorf("Groups(nil) = %+v", g[0])
	}
}
