package cases_test

import (
	"math"
	"strings"
	"testing"

	"axiswim/cases"
	"axiswim/lbm"
)

// demoWith returns the embedded demo with the [grid] lines given added
// after cells_per_radius (replaced when one of them sets it).
func demoWith(t *testing.T, grid ...string) *cases.Case {
	t.Helper()
	src, err := cases.Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	s := string(src)
	extra := strings.Join(grid, "\n")
	if strings.Contains(extra, "cells_per_radius") {
		s = strings.Replace(s, "cells_per_radius = 12", extra, 1)
	} else {
		s = strings.Replace(s, "cells_per_radius = 12", "cells_per_radius = 12\n"+extra, 1)
	}
	c, err := cases.Parse("demo", []byte(s))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func resolve(t *testing.T, c *cases.Case) *cases.Lattice {
	t.Helper()
	l, err := cases.Resolve(c)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// newLevels checks that lbm accepts the layout as it is: the blocks and
// the relaxation times of every level.
func newLevels(t *testing.T, ly cases.Layout) {
	t.Helper()
	h, err := lbm.NewLevels(ly.Base, ly.Blocks)
	if err != nil {
		t.Fatalf("lbm.NewLevels refuses the layout: %v", err)
	}
	h.Close()
}

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.Abs(got-want) > rel*math.Abs(want) {
		t.Errorf("%s = %.10g, want %.10g (within %g)", what, got, want, rel)
	}
}

// TestMaxLevels: MaxLevels is the most levels whose coarsest tau+ can stay
// at MinLevelTau with tau+ = MaxTau on the finest (each coarser level
// halves tau+ - 1/2): the largest L with (MaxTau - 1/2)/2^(L-1) >=
// MinLevelTau - 1/2, that is L <= 1 + log2(0.5/0.0025) = 8.64.
func TestMaxLevels(t *testing.T) {
	want := int(math.Floor(1 + math.Log2((cases.MaxTau-0.5)/(cases.MinLevelTau-0.5))))
	if cases.MaxLevels != want {
		t.Errorf("MaxLevels = %d, the floor allows %d", cases.MaxLevels, want)
	}
}

// TestLayoutOneLevel: with grid.levels = 1 (the default) the layout is the
// uniform lattice, without blocks, and its configuration is the one the
// drive builds from the lattice (drive.New).
func TestLayoutOneLevel(t *testing.T) {
	c := demoWith(t)
	if c.Grid.Levels != 1 || c.Grid.FineMargin != 2 || c.Grid.LevelMargin != 4 {
		t.Fatalf("defaults: levels %d, fine_margin %g, level_margin %d; want 1, 2, 4",
			c.Grid.Levels, c.Grid.FineMargin, c.Grid.LevelMargin)
	}
	l := resolve(t, c)
	ly := l.Layout()
	// Zero means not given, as for the other keys whose zero is not a
	// value (cell_size, tau, ...): a case made without Default (as the
	// verification rows make theirs) or with levels = 0 in its file is
	// one uniform lattice.
	bare := *c
	bare.Grid = cases.Grid{CellsPerRadius: 12}
	if lb := resolve(t, &bare); lb.Levels != 1 || lb.Nz != l.Nz || lb.Dt != l.Dt {
		t.Errorf("grid without levels: %d levels, %d cells, dt %g; want the demo's", lb.Levels, lb.Nz, lb.Dt)
	}
	want := lbm.Config{Nz: l.Nz, Nr: l.Nr, Tau: l.Tau, Collision: lbm.TRT, Magic: c.Solver.Magic, Axisymmetric: true}
	if ly.Base != want {
		t.Errorf("Base = %+v, want %+v", ly.Base, want)
	}
	if len(ly.Blocks) != 0 || len(ly.Levels) != 1 || ly.Excursions != nil {
		t.Errorf("%d blocks, %d levels, excursions %v; want none, 1, nil", len(ly.Blocks), len(ly.Levels), ly.Excursions)
	}
	if ly.Ratio() != 1 || ly.MemoryBytes != l.MemoryBytes() || ly.Steps != l.Steps || ly.StepsPerPeriod != l.StepsPerPeriod {
		t.Errorf("ratio %g, memory %d (lattice %d), steps %d/%d (lattice %d/%d)", ly.Ratio(), ly.MemoryBytes, l.MemoryBytes(),
			ly.Steps, ly.StepsPerPeriod, l.Steps, l.StepsPerPeriod)
	}
	if lv := ly.Levels[0]; lv.Tau != l.Tau || lv.Dx != l.Dx || lv.Nz != l.Nz || lv.Binding != cases.RuleMinTau {
		t.Errorf("level 0 = %+v", lv)
	}
}

// TestLayoutDemo3 lays out the demo on 3 levels and compares with a hand
// calculation.
//
// Grid: the nominal finest cell is 0.8 mm/12; level 0's is 4 times that,
// 0.26667 mm, so Nr0 = round(6/0.26667) = round(22.5) = 23, dx0 = 6/23 mm
// and Nz0 = 24/(6/23) = 92 exactly; the finest cell is 6/92 mm =
// 0.065217 mm (the uniform lattice of that spacing 368 x 92).
//
// Excursions: A = 1 mm, no harmonics; the free ratios are 175/1945 =
// 0.08997 (sphere 1) and 590.625/1179.375 = 0.500795 (sphere 2); one
// swimmer (the spring), so both take 0.500795 mm.
//
// Region: margin 2 x 0.8 = 1.6 mm; z from -1.8 - 1.2 - 0.500795 - 1.6 =
// -5.100795 mm to 1.8 + 0.8 + 0.500795 + 1.6 = 4.700795 mm, r to 1.2 +
// 1.6 = 2.8 mm. In finest cells from the lower end: 6.899205/0.065217 =
// 105.79, 16.700795/0.065217 = 256.08, r 42.93.
//
// Level 2 in level 1's cells: floor(52.89) = 52, ceil(128.04) = 129, r
// ceil(21.47) = 22 (level 1 spans 184 x 46: no side within 2 cells).
// Level 1 needs [52 - 4, 129 + 4) x [0, 22 + 4) of its cells, in level 0's
// floor(24) = 24, ceil(66.5) = 67, r 13 (level 0 is 92 x 23: none within
// 2). So level 1 is block {24, 0, 43, 13}: 86 x 26 cells from its cell 48,
// and level 2 is {52 - 48 = 4, 0, 77, 22}: 154 x 44 cells.
//
// Node updates per step of level 0: 92·23 + 2·86·26 + 4·154·44 = 2116 +
// 4472 + 27104 = 33692; the uniform lattice 4·368·92 = 135424.
//
// Time: the acoustic limit on 368 cells needs 2π 368 √3 = 4004.9 finest
// steps per period, 1001.2 of level 0, rounded up to 1002: 4008 finest
// steps, dt = (1/35 s)/4008; nu_L = nu dt/dx^2 = 1.01695e-5 x 7.12860e-6 /
// (6.52174e-5)^2 = 0.017044, tau+ = 0.55113 on level 2, 0.52557 and
// 0.51278 on levels 1 and 0.
func TestLayoutDemo3(t *testing.T) {
	c := demoWith(t, "levels = 3")
	l := resolve(t, c)
	ly := l.Layout()
	if l.Levels != 3 || l.Nz != 368 || l.Nr != 92 {
		t.Fatalf("levels %d, %d x %d finest cells; want 3, 368 x 92", l.Levels, l.Nz, l.Nr)
	}
	near(t, "finest dx", l.Dx, 0.006/92, 1e-12)
	near(t, "level 0 dx", ly.Levels[0].Dx, 0.006/23, 1e-12)
	for i, e := range ly.Excursions {
		near(t, "excursion", e, 0.001*590.625/1179.375, 1e-12)
		_ = i
	}
	near(t, "region z min", ly.Region.ZMin, -0.005100795, 1e-6)
	near(t, "region z max", ly.Region.ZMax, 0.004700795, 1e-6)
	near(t, "region r max", ly.Region.RMax, 0.0028, 1e-12)
	wantBlocks := []lbm.Block{{Z0: 24, R0: 0, Nz: 43, Nr: 13}, {Z0: 4, R0: 0, Nz: 77, Nr: 22}}
	if len(ly.Blocks) != 2 || ly.Blocks[0] != wantBlocks[0] || ly.Blocks[1] != wantBlocks[1] {
		t.Errorf("blocks %+v, want %+v", ly.Blocks, wantBlocks)
	}
	wantCells := [][4]int{{92, 23, 0, 0}, {86, 26, 48, 0}, {154, 44, 104, 0}} // Nz, Nr, Z0, R0
	for k, w := range wantCells {
		lv := ly.Levels[k]
		if lv.Nz != w[0] || lv.Nr != w[1] || lv.Z0 != w[2] || lv.R0 != w[3] || lv.Steps != 1<<k {
			t.Errorf("level %d: %d x %d from (%d, %d), %d steps; want %d x %d from (%d, %d), %d", k,
				lv.Nz, lv.Nr, lv.Z0, lv.R0, lv.Steps, w[0], w[1], w[2], w[3], 1<<k)
		}
	}
	if ly.UpdatesPerStep != 33692 || ly.UniformUpdatesPerStep != 135424 {
		t.Errorf("node updates per step %g (uniform %g), want 33692 (135424)", ly.UpdatesPerStep, ly.UniformUpdatesPerStep)
	}
	if l.StepsPerPeriod != 4008 || ly.StepsPerPeriod != 1002 || ly.Steps != 20*1002 || l.Steps != 20*4008 {
		t.Errorf("steps per period %d (level 0 %d), steps %d (%d); want 4008 (1002), 80160 (20040)",
			l.StepsPerPeriod, ly.StepsPerPeriod, l.Steps, ly.Steps)
	}
	for k, want := range []float64{0.51278, 0.52557, 0.55113} {
		near(t, "tau+ of a level", ly.Levels[k].Tau, want, 1e-5)
	}
	// lbm derives the levels' taus from level 0's by doubling tau - 1/2.
	near(t, "finest tau+ from level 0's", 0.5+4*(ly.Base.Tau-0.5), l.Tau, 1e-14)
	if ly.Base.Nz != 92 || ly.Base.Nr != 23 || !ly.Base.Axisymmetric || ly.Base.PeriodicZ {
		t.Errorf("Base = %+v", ly.Base)
	}
	if l.MemoryBytes() != ly.MemoryBytes || ly.MemoryBytes >= ly.UniformMemoryBytes {
		t.Errorf("memory %d (lattice %d), uniform %d", ly.MemoryBytes, l.MemoryBytes(), ly.UniformMemoryBytes)
	}
	newLevels(t, ly)
}

// TestLayoutTouches: a block side within 2 parent cells of the
// container's side touches it; at 2 it stays (lbm.Block's rule). A sphere
// of 1 mm, density that of the liquid, no shaking, in a container 4 mm in
// radius and 20 mm long, 8 cells per radius, 2 levels: level 0 has cells
// of 0.25 mm (16 x 80) and the finest 0.125 mm.
//
// With fine_margin 2.6 at z = -6.1 mm the region is z -9.7 .. -2.5 mm, r
// to 3.6 mm: finest cells 2.4 .. 60 and 28.8, level 0's floor(1.2) = 1
// (within 2 of the end: 0), ceil(30) = 30, ceil(14.4) = 15 (within 2 of
// 16: 16): block {0, 0, 30, 16}. With fine_margin 2.4 at z = -5.9 mm the
// region is -9.3 .. -2.5 mm, r to 3.4 mm: finest 5.6 .. 60 and 27.2, level
// 0's 2, 30 and 14, each 2 cells clear: block {2, 0, 28, 14}.
//
// Nothing limits the time step but tau <= 1, which puts the finest tau+
// at 1: the time step is lowered under the band |tau+ - 1| < 0.05.
func TestLayoutTouches(t *testing.T) {
	src := `
[fluid]
density = 1000.0
viscosity = 0.001
[container]
radius = 0.004
length = 0.02
[[sphere]]
radius = 0.001
density = 1000.0
z = %Z
[grid]
cells_per_radius = 8
levels = 2
fine_margin = %M
[run]
duration = 0.01
`
	for _, r := range []struct {
		z, margin string
		want      lbm.Block
		wall      bool
	}{
		{"-0.0061", "2.6", lbm.Block{Z0: 0, R0: 0, Nz: 30, Nr: 16}, true},
		{"-0.0059", "2.4", lbm.Block{Z0: 2, R0: 0, Nz: 28, Nr: 14}, false},
	} {
		s := strings.NewReplacer("%Z", r.z, "%M", r.margin).Replace(src)
		c, err := cases.Parse("touch", []byte(s))
		if err != nil {
			t.Fatal(err)
		}
		l := resolve(t, c)
		ly := l.Layout()
		if ly.Levels[0].Nz != 80 || ly.Levels[0].Nr != 16 {
			t.Fatalf("level 0 %d x %d, want 80 x 16", ly.Levels[0].Nz, ly.Levels[0].Nr)
		}
		if len(ly.Blocks) != 1 || ly.Blocks[0] != r.want {
			t.Errorf("z %s, margin %s: blocks %+v, want %+v", r.z, r.margin, ly.Blocks, r.want)
		}
		if ly.Levels[1].Wall != r.wall || !ly.Levels[0].Wall {
			t.Errorf("z %s: level 1 reaches the wall %v, want %v", r.z, ly.Levels[1].Wall, r.wall)
		}
		if l.Bound != cases.BoundLevelTau || !(l.Tau <= 1-lbm.TauCloseToOne) || l.Tau < 0.9499 {
			t.Errorf("bound %s, finest tau %.6f; want %s, just under 0.95", l.Bound, l.Tau, cases.BoundLevelTau)
		}
		if l.Steps%2 != 0 {
			t.Errorf("%d finest steps: not whole steps of level 0", l.Steps)
		}
		newLevels(t, ly)
	}
}

// TestLayoutPeriodic: with periodic ends a fine region across an end
// takes the whole length (a block cannot wrap), and the level is then
// periodic itself; one inside stays a block with open ends. A sphere of
// 1 mm in a pipe 4 mm in radius and 10 mm long, 8 cells per radius, 2
// levels (level 0 cells of 0.25 mm, 40 x 16), fine margin 2 radii.
func TestLayoutPeriodic(t *testing.T) {
	src := `
[fluid]
density = 1000.0
viscosity = 0.001
[container]
radius = 0.004
length = 0.01
ends = "periodic"
[shaking]
gravity = 0.0
[[sphere]]
radius = 0.001
density = 1000.0
z = %Z
[grid]
cells_per_radius = 8
levels = 2
[run]
duration = 0.01
`
	// z = 0.0035: region 0.0005 .. 0.0065 m, past the end at 0.005.
	// z = 0: region -0.003 .. 0.003 m, finest cells 16 .. 64 of 80, level
	// 0's 8 .. 32 of 40; r 3 mm: 24 finest cells, 12 of level 0's 16.
	for _, r := range []struct {
		z    string
		want lbm.Block
	}{
		{"0.0035", lbm.Block{Z0: 0, R0: 0, Nz: 40, Nr: 12}},
		{"0.0", lbm.Block{Z0: 8, R0: 0, Nz: 24, Nr: 12}},
	} {
		c, err := cases.Parse("periodic", []byte(strings.Replace(src, "%Z", r.z, 1)))
		if err != nil {
			t.Fatal(err)
		}
		ly := resolve(t, c).Layout()
		if len(ly.Blocks) != 1 || ly.Blocks[0] != r.want || !ly.Base.PeriodicZ {
			t.Errorf("z %s: blocks %+v (periodic %v), want %+v", r.z, ly.Blocks, ly.Base.PeriodicZ, r.want)
		}
		if full := ly.Blocks[0].Nz == 40; ly.Levels[1].Ends != full {
			t.Errorf("z %s: level 1 spans the length %v, reported %v", r.z, full, ly.Levels[1].Ends)
		}
		newLevels(t, ly)
	}
}

// TestExcursions: the excursion bound of each sphere against hand values:
// the drive displacement (A + sum A_n) times the largest free-sphere
// ratio of the swimmer, plus the arms' strokes and starting corrections.
func TestExcursions(t *testing.T) {
	c := cases.Default()
	c.Fluid = cases.Fluid{Density: 1000, Viscosity: 0.001}
	c.Container = cases.Container{Radius: 0.01, Length: 0.04, Ends: cases.EndsClosed}
	c.Shaking.Frequency, c.Shaking.Amplitude = 10, 0.001
	c.Shaking.Harmonics = []cases.Harmonic{{Order: 2, Amplitude: 0.0002}}
	c.Shaking.RampPeriods = 1
	c.Spheres = []cases.Sphere{
		{Radius: 0.001, Density: 2000, Z: -0.005}, // ratio 1000/2500 = 0.4
		{Radius: 0.001, Density: 500, Z: 0},       // ratio 500/1000 = 0.5
		{Radius: 0.001, Density: 1000, Z: 0.004},  // ratio 0
		{Radius: 0.001, Density: 4000, Z: 0.01},   // ratio 3000/4500 = 2/3
	}
	// Spheres 3 and 4 joined by an arm of length 0.0055 (placed 0.006
	// apart: 0.0005 off at the start, the ramp starting the stroke at
	// zero) and stroke 0.0003; spheres 1 and 2 free.
	c.Arms = []cases.Arm{{Spheres: [2]int{3, 4}, Length: 0.0055, Amplitude: 0.0003}}
	D := 0.0012 // A + A_2
	want := []float64{0.4 * D, 0.5 * D, 2.0 / 3 * D, 2.0 / 3 * D}
	want[2] += 0.0003 + 0.0005
	want[3] += 0.0003 + 0.0005
	got := c.Excursions()
	for i := range want {
		near(t, "excursion of sphere "+string(rune('1'+i)), got[i], want[i], 1e-12)
	}
	// Without shaking only the strokes remain.
	c.Shaking.Frequency, c.Shaking.Amplitude, c.Shaking.Harmonics = 0, 0, nil
	c.Arms[0].Frequency = 5
	got = c.Excursions()
	if got[0] != 0 || got[1] != 0 {
		t.Errorf("free spheres without shaking move %g, %g; want 0", got[0], got[1])
	}
	near(t, "stroke alone", got[3], 0.0008, 1e-12)
}

// TestSpeedCase: issue 17's speed case, the demo at 24 cells per radius in
// a container 4 times its radius and length with 4 levels, at the default
// margins: the issue asks for node updates per period at most 10 times the
// uniform demo's (32400 cells x 3918 steps); the coarse levels' tau+ are
// those the issue names (0.525, 0.5125, 0.506, 0.503) and lbm accepts the
// layout.
func TestSpeedCase(t *testing.T) {
	c := demoWith(t, "cells_per_radius = 24\nlevels = 4")
	c.Container.Radius, c.Container.Length = 0.024, 0.096
	l := resolve(t, c)
	ly := l.Layout()
	uniform := resolve(t, demoWith(t))
	demo := float64(uniform.Nz*uniform.Nr) * float64(uniform.StepsPerPeriod)
	ratio := ly.NodeUpdates(ly.StepsPerPeriod) / demo
	t.Logf("node updates per period %.4g: %.3f times the uniform demo's, %.4f of the uniform lattice of the finest spacing",
		ly.NodeUpdates(ly.StepsPerPeriod), ratio, ly.Ratio())
	if ratio > 10 {
		t.Errorf("node updates per period %.3g times the uniform demo's, the issue allows 10", ratio)
	}
	for k, want := range []float64{0.503125, 0.50625, 0.5125, 0.525} {
		near(t, "tau+ of a level", ly.Levels[k].Tau, want, 2e-4)
		if ly.Levels[k].Tau < cases.MinLevelTau {
			t.Errorf("level %d: tau+ %.6f below the floor %g", k, ly.Levels[k].Tau, cases.MinLevelTau)
		}
	}
	newLevels(t, ly)
	// the default image of the fields (ImageNodesPerCell's comment)
	if got := l.ImageCells(0); got != 4 {
		t.Errorf("default image spacing %d finest cells, ImageNodesPerCell's comment says 4", got)
	}
}

// TestLevelsTimeStep: on refined levels the steps per period are whole
// steps of level 0, the coarsest level keeps tau+ >= MinLevelTau, and a
// case whose upper limits leave the coarsest level below it is refused
// with a fix that names fewer levels. The demo's acoustic limit gives
// tau+ = 0.551 on the finest level: on 6 levels the coarsest would have
// 0.5016 (the floor asks 0.58 on the finest).
func TestLevelsTimeStep(t *testing.T) {
	for n := 2; n <= 5; n++ {
		l := resolve(t, demoWith(t, "levels = "+string(rune('0'+n))))
		ly := l.Layout()
		f := 1 << (n - 1)
		if l.StepsPerPeriod%f != 0 || l.Steps%f != 0 || ly.StepsPerPeriod*f != l.StepsPerPeriod {
			t.Errorf("%d levels: %d steps per period, %d steps: not whole steps of level 0", n, l.StepsPerPeriod, l.Steps)
		}
		near(t, "lattice viscosity from the step", l.NuL, l.Nu*l.Dt/(l.Dx*l.Dx), 1e-12)
		if ly.Levels[0].Tau < cases.MinLevelTau {
			t.Errorf("%d levels: coarsest tau+ %.5f", n, ly.Levels[0].Tau)
		}
		newLevels(t, ly)
	}
	_, err := cases.Resolve(demoWith(t, "levels = 6"))
	if err == nil {
		t.Fatal("6 levels of the demo resolved")
	}
	for _, w := range []string{"grid.cells_per_radius = 12", "no admissible time step", "the coarsest of 6 levels needs tau+ >= 0.5025",
		"benchmarks/taustability", "or use fewer levels (grid.levels = 5 halves the floor)"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error lacks %q:\n%v", w, err)
		}
	}
}

// TestNearOneAgreesWithLbm: the band that Validate keeps a given tau out
// of is the one lbm.NewLevels refuses. The demo on 2 levels with tau =
// 0.88 has tau- = 1/2 + (3/16)/0.38 = 0.9934 on the finest level; the
// band of tau- within 0.05 of 1 there is tau+ in (1/2 + 0.1875/0.55,
// 1/2 + 0.1875/0.45) = (0.8409, 0.9167).
func TestNearOneAgreesWithLbm(t *testing.T) {
	for _, r := range []struct {
		tau    float64
		refuse bool
	}{{0.88, true}, {0.84, false}, {0.92, false}, {0.97, true}} {
		c := demoWith(t, "levels = 2")
		c.Grid.Tau = r.tau
		err := c.Validate()
		if refused := err != nil; refused != r.refuse {
			t.Errorf("tau %g: Validate refused %v (%v), want %v", r.tau, refused, err, r.refuse)
		}
		if err != nil && !strings.Contains(err.Error(), "grid.tau") {
			t.Errorf("tau %g: error does not name grid.tau: %v", r.tau, err)
		}
		// lbm on the same two levels (the tau as given: the period's
		// rounding moves it by less than a part in a thousand).
		base := lbm.Config{Nz: 20, Nr: 10, Tau: 0.5 + (r.tau-0.5)/2, Axisymmetric: true, Magic: c.Solver.Magic}
		h, lerr := lbm.NewLevels(base, []lbm.Block{{Z0: 4, R0: 0, Nz: 8, Nr: 4}})
		if h != nil {
			h.Close()
		}
		if refused := lerr != nil; refused != r.refuse {
			t.Errorf("tau %g: lbm refused %v (%v), want %v", r.tau, refused, lerr, r.refuse)
		}
	}
}

// TestLevelWarnings: a level whose grid Reynolds number at the reference
// speed exceeds 20 is warned about, with the rule's source, and the
// rule's floor then binds: the demo on 5 levels (benchmarks/taustability's
// example), whose level 0 has cells of 1 mm (Nr0 = round(6/(16 x
// 0.8/12)) = round(5.625) = 6): Re_g = U dx0/nu = 0.21991 x 0.001 /
// 1.01695e-5 = 21.6.
func TestLevelWarnings(t *testing.T) {
	l := resolve(t, demoWith(t, "levels = 5"))
	ly := l.Layout()
	near(t, "level 0's cell", ly.Levels[0].Dx, 0.001, 1e-12)
	near(t, "level 0's grid Reynolds number", ly.Levels[0].ReGrid, 0.21991148575*0.001/(0.012/1180), 1e-9)
	if ly.Levels[0].Binding != cases.RuleGridRe || ly.Levels[0].Tau >= ly.Levels[0].TauFloor {
		t.Errorf("level 0: tau+ %.6f, floor %.6f (%s); want the Re_g floor, above tau+", ly.Levels[0].Tau, ly.Levels[0].TauFloor, ly.Levels[0].Binding)
	}
	found := false
	for _, w := range l.Warnings {
		found = found || strings.Contains(w, "level 0 has a grid Reynolds number of 21.6") && strings.Contains(w, "benchmarks/taustability")
		if strings.Contains(w, "level 1 has a grid Reynolds") {
			t.Errorf("level 1 (Re_g 10.8) warned about: %s", w)
		}
	}
	if !found {
		t.Errorf("no warning about level 0's grid Reynolds number in %q", l.Warnings)
	}
}

// TestLevelsNeedSpheres: the levels refine toward the spheres; a case
// without any (the embedded pipe) is refused on more than one level.
func TestLevelsNeedSpheres(t *testing.T) {
	src, err := cases.Get("pipe-poiseuille")
	if err != nil {
		t.Fatal(err)
	}
	c, err := cases.Parse("pipe", src)
	if err != nil {
		t.Fatal(err)
	}
	c.Grid.Levels = 2
	err = c.Validate()
	if err == nil || !strings.Contains(err.Error(), "grid.levels = 2: the levels refine toward the spheres, and the case has none") ||
		!strings.Contains(err.Error(), "fix: use grid.levels = 1") {
		t.Errorf("pipe on 2 levels: %v", err)
	}
}
