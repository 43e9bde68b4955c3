package cases

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"
)

// strokeCase is the demo pair with every new key: two harmonics of the
// drive, an arm between the spheres instead of the spring, and a [bodies]
// section that gives only the virtual mass (zero, which must be kept).
// Sphere radii 1.2 and 0.8 mm, 3.6 mm apart; the grid is 90 cells across
// the 6 mm container, so a cell is 1/15 mm.
const strokeCase = `
[fluid]
density = 1180.0
viscosity = 0.012

[container]
radius = 0.006
length = 0.024

[shaking]
frequency = 35.0
amplitude = 0.0006

[[shaking.harmonic]]
order = 2
amplitude = 0.0001
phase = 90.0

[[shaking.harmonic]]
order = 3
amplitude = 0.00005

[[sphere]]
radius = 0.0012
density = 1300.0
z = -0.0018

[[sphere]]
radius = 0.0008
density = 775.0
z = 0.0018

[[arm]]
spheres = [1, 2]
length = 0.0036
amplitude = 0.0005
phase = 30.0

[bodies]
virtual_mass = 0.0

[grid]
cells_per_radius = 12

[run]
periods = 4
`

func TestParseStrokeKeys(t *testing.T) {
	c := mustParse(t, "stroke", strokeCase)
	wantH := []Harmonic{{Order: 2, Amplitude: 1e-4, Phase: 90}, {Order: 3, Amplitude: 5e-5}}
	if !reflect.DeepEqual(c.Shaking.Harmonics, wantH) {
		t.Errorf("harmonics = %+v, want %+v", c.Shaking.Harmonics, wantH)
	}
	// The arm frequency defaults to the shaking frequency.
	wantA := []Arm{{Spheres: [2]int{1, 2}, Length: 0.0036, Amplitude: 5e-4, Phase: 30, Frequency: 35}}
	if !reflect.DeepEqual(c.Arms, wantA) {
		t.Errorf("arms = %+v, want %+v", c.Arms, wantA)
	}
	// An explicit zero virtual mass is kept; the other [bodies] keys default.
	if want := (Bodies{VirtualMass: 0, Coupling: CouplingVirtualMass, RepulsionRange: 2}); c.Bodies != want {
		t.Errorf("bodies = %+v, want %+v", c.Bodies, want)
	}
	if err := c.Validate(); err != nil {
		t.Errorf("Validate: %v", err)
	}

	// Without a [bodies] section every key takes its default.
	d := mustParse(t, "worked", workedExample)
	if want := (Bodies{VirtualMass: 0.5, Coupling: CouplingVirtualMass, RepulsionRange: 2}); d.Bodies != want {
		t.Errorf("default bodies = %+v, want %+v", d.Bodies, want)
	}
	if d.Shaking.Harmonics != nil || d.Arms != nil {
		t.Errorf("harmonics %v and arms %v from a case without them", d.Shaking.Harmonics, d.Arms)
	}
	src := strings.Replace(strokeCase, "virtual_mass = 0.0", "coupling = \"explicit\"\nrepulsion_range = 1.5", 1)
	if b := mustParse(t, "stroke", src).Bodies; b != (Bodies{VirtualMass: 0.5, Coupling: CouplingExplicit, RepulsionRange: 1.5}) {
		t.Errorf("bodies = %+v", b)
	}
}

func TestParseStrokeKeyErrors(t *testing.T) {
	src := strings.NewReplacer(
		"order = 3", "ordr = 3\norder = 3", // line 20
		"phase = 30.0", "phase = 30.0\nfrequncy = 35.0", // line 39, after the line above
		"virtual_mass = 0.0", "virtual_mass = 0.0\nrepulsion = 2.0", // line 43
	).Replace(strokeCase)
	_, err := Parse("typos.toml", []byte(src))
	var ke KeyErrors
	if !errors.As(err, &ke) {
		t.Fatalf("Parse = %v, want KeyErrors", err)
	}
	want := []struct {
		key  string
		line int
		hint string
	}{
		{"shaking.harmonic[2].ordr", 20, "order"},
		{"arm[1].frequncy", 39, "frequency"},
		{"bodies.repulsion", 43, "repulsion_range"},
	}
	if len(ke) != len(want) {
		t.Fatalf("got %d key errors, want %d:\n%v", len(ke), len(want), err)
	}
	for i, w := range want {
		if e := ke[i]; e.Key != w.key || e.Line != w.line || !e.Close || e.Hint != w.hint {
			t.Errorf("error %d = %v, want %s at line %d, did you mean %q", i, e, w.key, w.line, w.hint)
		}
	}

	// The same tables written inline.
	// The arm comes first, as a top-level key (line 1); the harmonics
	// follow the shaking amplitude of the worked example (line 13).
	inline := "arm = [{ spheres = [1, 2], length = 0.004, amplitude = 1e-4, frequency = 35.0, lenght = 1.0 }]" +
		strings.Replace(workedExample, "amplitude = 0.0005\n",
			"amplitude = 0.0005\nharmonic = [{ order = 2, amplitude = 1e-4 }, { order = 3, amplitude = 1e-5, phse = 3.0 }]\n", 1)
	_, err = Parse("inline.toml", []byte(inline))
	if !errors.As(err, &ke) || len(ke) != 2 || ke[0].Key != "arm[1].lenght" || ke[0].Line != 1 || ke[0].Hint != "length" ||
		ke[1].Key != "shaking.harmonic[2].phse" || ke[1].Line != 13 || ke[1].Hint != "phase" {
		t.Errorf("inline tables: %v", err)
	}

	// Required keys of the new tables.
	src = strings.NewReplacer("order = 2\n", "", "length = 0.0036\n", "", "amplitude = 0.0005\n", "").Replace(strokeCase)
	_, err = Parse("m.toml", []byte(src))
	if !errors.As(err, &ke) {
		t.Fatalf("Parse = %v, want KeyErrors", err)
	}
	// The lines are those of the tables: [[shaking.harmonic]] at 14 and,
	// one line up after the removal, [[arm]] at 32.
	wantMissing := map[string]int{"shaking.harmonic[1].order": 14, "arm[1].length": 32, "arm[1].amplitude": 32}
	if len(ke) != len(wantMissing) {
		t.Errorf("got %d errors, want %d:\n%v", len(ke), len(wantMissing), err)
	}
	for _, e := range ke {
		if line, ok := wantMissing[e.Key]; !ok || !e.Missing || e.Line != line {
			t.Errorf("unexpected %v (line %d)", e, e.Line)
		}
	}
}

func TestWriteTOMLRoundTripStroke(t *testing.T) {
	c := mustParse(t, "stroke", strokeCase)
	c.Arms = append(c.Arms, Arm{Spheres: [2]int{2, 3}, Length: 0.004, Amplitude: 0, Phase: -45, Frequency: 12.5})
	c.Spheres = append(c.Spheres, Sphere{Radius: 0.0008, Density: 1000, Z: 0.0058})
	c.Bodies = Bodies{VirtualMass: 1, Coupling: CouplingExplicit, RepulsionRange: 0.75}
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		t.Fatal(err)
	}
	back, err := Parse("back", buf.Bytes())
	if err != nil {
		t.Fatalf("Parse(WriteTOML()): %v\n%s", err, buf.String())
	}
	if !reflect.DeepEqual(back, c) {
		t.Errorf("round trip\n got %+v\nwant %+v\n%s", back, c, buf.String())
	}
	for _, want := range []string{"[[shaking.harmonic]]\norder = 3", "[[arm]]\nspheres = [2, 3]", "frequency = 12.5",
		"[bodies]\nvirtual_mass = 1.0", `coupling = "explicit"`, "repulsion_range = 0.75"} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("output lacks %q:\n%s", want, buf.String())
		}
	}
	// The clone behind WriteTOML does not share the new slices.
	cc := c.clone()
	cc.Arms[0].Length, cc.Shaking.Harmonics[0].Order = 1, 9
	if c.Arms[0].Length == 1 || c.Shaking.Harmonics[0].Order == 9 {
		t.Error("clone shares the arms or harmonics of the original")
	}
}

// problemKeys validates c and returns the keys of its problems.
func problemKeys(t *testing.T, c *Case) map[string]Problem {
	t.Helper()
	got := make(map[string]Problem)
	err := c.Validate()
	if err == nil {
		return got
	}
	var ps Problems
	if !errors.As(err, &ps) {
		t.Fatalf("Validate = %v, want Problems", err)
	}
	for _, p := range ps {
		got[p.Key] = p
	}
	return got
}

func TestValidateStrokeRules(t *testing.T) {
	base := func() *Case { return mustParse(t, "stroke", strokeCase) }
	for _, tc := range []struct {
		name string
		edit func(*Case)
		key  string // "" for valid
		in   string // text the problem must contain
	}{
		{"ok", func(c *Case) {}, "", ""},
		{"harmonic order 1", func(c *Case) { c.Shaking.Harmonics[0].Order = 1 }, "shaking.harmonic[1].order", "at least 2"},
		{"harmonic order twice", func(c *Case) { c.Shaking.Harmonics[1].Order = 2 }, "shaking.harmonic[2].order", "already given"},
		{"harmonic amplitude", func(c *Case) { c.Shaking.Harmonics[1].Amplitude = -1e-5 }, "shaking.harmonic[2].amplitude", "zero or positive"},
		{"harmonic phase", func(c *Case) { c.Shaking.Harmonics[1].Phase = math.Inf(1) }, "shaking.harmonic[2].phase", "finite"},
		{"harmonic without frequency", func(c *Case) {
			c.Shaking.Frequency, c.Shaking.Amplitude = 0, 0
			c.Arms[0].Frequency = 10
		}, "shaking.harmonic[1]", "needs shaking.frequency"},
		{"arm sphere missing", func(c *Case) { c.Arms[0].Spheres = [2]int{1, 3} }, "arm[1].spheres", "does not exist"},
		{"arm same sphere", func(c *Case) { c.Arms[0].Spheres = [2]int{2, 2} }, "arm[1].spheres", "two different spheres"},
		{"arm length", func(c *Case) { c.Arms[0].Length = 0 }, "arm[1].length", "positive"},
		{"arm amplitude", func(c *Case) { c.Arms[0].Amplitude = -1e-4 }, "arm[1].amplitude", "zero or positive"},
		{"arm phase", func(c *Case) { c.Arms[0].Phase = math.NaN() }, "arm[1].phase", "finite"},
		{"arm frequency", func(c *Case) { c.Arms[0].Frequency = -3 }, "arm[1].frequency", "positive"},
		{"arm frequency without shaking", func(c *Case) {
			c.Shaking = Shaking{Gravity: 9.81}
			c.Arms[0].Frequency = 0
		}, "arm[1].frequency", "required when there is no shaking"},
		{"arm frequency defaults", func(c *Case) { c.Arms[0].Frequency = 0 }, "", ""},
		{"arm too short", func(c *Case) { c.Arms[0].Amplitude = 0.0015 }, "arm[1].length", "less than 2 cells"},
		{"arm and spring", func(c *Case) {
			c.Springs = []Spring{{Spheres: [2]int{2, 1}, Stiffness: 0.05, RestLength: 0.0036}}
		}, "arm[1].spheres", "also joined by spring[1]"},
		{"arm loop", func(c *Case) {
			c.Spheres = append(c.Spheres, Sphere{Radius: 0.0008, Density: 1000, Z: 0.0058})
			c.Arms = append(c.Arms,
				Arm{Spheres: [2]int{2, 3}, Length: 0.004, Amplitude: 1e-4, Frequency: 35},
				Arm{Spheres: [2]int{3, 1}, Length: 0.0076, Amplitude: 1e-4, Frequency: 35})
		}, "arm[3].spheres", "loop"},
		{"arm chain", func(c *Case) {
			c.Spheres = append(c.Spheres, Sphere{Radius: 0.0008, Density: 1000, Z: 0.0058})
			c.Arms = append(c.Arms, Arm{Spheres: [2]int{2, 3}, Length: 0.004, Amplitude: 1e-4, Frequency: 35})
		}, "", ""},
		{"arm twice", func(c *Case) { c.Arms = append(c.Arms, c.Arms[0]) }, "arm[2].spheres", "loop"},
		{"virtual mass", func(c *Case) { c.Bodies.VirtualMass = -0.5 }, "bodies.virtual_mass", "zero or positive"},
		{"coupling", func(c *Case) { c.Bodies.Coupling = "implicit" }, "bodies.coupling", "unknown coupling"},
		{"repulsion range", func(c *Case) { c.Bodies.RepulsionRange = 0.4 }, "bodies.repulsion_range", "at least 0.5"},
		{"stroke without periods", func(c *Case) {
			c.Shaking = Shaking{Gravity: 9.81}
			c.Arms[0].Frequency = 10
			c.Run.Periods = 0
		}, "run.periods", "required when an arm strokes"},
		{"stroke with duration", func(c *Case) {
			c.Shaking = Shaking{Gravity: 9.81}
			c.Arms[0].Frequency = 10
			c.Run = Run{Duration: 1, SampleInterval: 0.01}
		}, "run.duration", "an arm strokes"},
	} {
		c := base()
		tc.edit(c)
		got := problemKeys(t, c)
		if tc.key == "" {
			if len(got) > 0 {
				t.Errorf("%s: %v", tc.name, c.Validate())
			}
			continue
		}
		p, ok := got[tc.key]
		if !ok || !strings.Contains(p.Error(), tc.in) || p.Fix == "" {
			t.Errorf("%s: want a problem with %s saying %q and a fix, got\n%v", tc.name, tc.key, tc.in, c.Validate())
		}
	}
}

// TestValidateArmGap checks the clearance rule on its numbers: radii 1.2
// and 0.8 mm, a cell of 6/90 mm, so the shortest distance allowed is
// 2 + 2/15 = 2.1333 mm. A stroke of 1.5 mm on a 3.6 mm arm comes to 2.1 mm.
// Both fixes the problem offers must clear it.
func TestValidateArmGap(t *testing.T) {
	c := mustParse(t, "stroke", strokeCase)
	c.Arms[0].Amplitude = 0.0015
	p, ok := problemKeys(t, c)["arm[1].length"]
	if !ok {
		t.Fatalf("no arm[1].length problem: %v", c.Validate())
	}
	var length, amp float64
	if _, err := fmt.Sscanf(p.Fix, "raise arm[1].length to at least %g m, or lower arm[1].amplitude to at most %g m", &length, &amp); err != nil {
		t.Fatalf("fix %q: %v", p.Fix, err)
	}
	if !within(length, 0.0036333, 1e-3) || !within(amp, 0.0014667, 1e-3) {
		t.Errorf("fix %q: want length 3.633 mm, amplitude 1.467 mm", p.Fix)
	}
	if !strings.Contains(p.Reason, "grid's cell size") {
		t.Errorf("reason %q does not say which cell size", p.Reason)
	}
	for _, fix := range []func(*Case){
		func(c *Case) { c.Arms[0].Length = length },
		func(c *Case) { c.Arms[0].Amplitude = amp },
	} {
		d := mustParse(t, "stroke", strokeCase)
		d.Arms[0].Amplitude = 0.0015
		fix(d)
		if _, bad := problemKeys(t, d)["arm[1].length"]; bad {
			t.Errorf("the suggested fix does not clear the problem: %v", d.Validate())
		}
	}
	// Without a grid the cell is a tenth of the smaller radius, 0.08 mm:
	// the shortest distance allowed is 2.16 mm.
	c = mustParse(t, "stroke", strokeCase)
	c.Grid.CellsPerRadius = 0
	c.Arms[0].Length, c.Arms[0].Amplitude = 0.00265, 0.0005 // 2.15 mm at its shortest
	p, ok = problemKeys(t, c)["arm[1].length"]
	if !ok || !strings.Contains(p.Reason, "tenth of the smaller radius") || !strings.Contains(p.Fix, "0.00266") {
		t.Errorf("without a grid: %v", c.Validate())
	}
}

// TestResolveStroke: an arm stroking without shaking gives the run its
// period, and enters the Mach (stroke speed 2 pi f A) and acoustic limits
// like the drive would.
func TestResolveStroke(t *testing.T) {
	c := mustParse(t, "stroke", strokeCase)
	c.Shaking = Shaking{Gravity: 9.81, RampPeriods: 2}
	c.Arms[0].Frequency = 20
	c.Bodies.VirtualMass = 0.5
	c.Run.SamplesPerPeriod = 0
	c.FillDefaults()
	if c.Run.SamplesPerPeriod != DefaultSamplesPerPeriod {
		t.Errorf("samples_per_period = %d, want the default %d for a stroked case", c.Run.SamplesPerPeriod, DefaultSamplesPerPeriod)
	}
	l := mustResolve(t, c)
	if !within(l.Omega, 2*math.Pi*20, 1e-15) || l.OmegaMax != l.Omega {
		t.Errorf("Omega = %g, OmegaMax = %g, want 2 pi 20", l.Omega, l.OmegaMax)
	}
	if l.StepsPerPeriod == 0 || !within(float64(l.StepsPerPeriod)*l.Dt, 1.0/20, 1e-12) || l.Steps != 4*l.StepsPerPeriod {
		t.Errorf("%d steps per period of %g s, %d steps: want a whole number of steps per 1/20 s and 4 periods",
			l.StepsPerPeriod, l.Dt, l.Steps)
	}
	if want := 2 * math.Pi * 20 * 0.0005; !within(l.RefVelocity, want, 1e-12) {
		t.Errorf("reference speed %g, want the stroke speed %g", l.RefVelocity, want)
	}
	if l.Bound == BoundAcoustic && !within(l.He*l.NuLMax/l.NuL, MaxHe, 1e-9) {
		t.Errorf("acoustic bound not tight at the stroke frequency: He = %g", l.He)
	}

	// The harmonics raise the acoustic frequency to 3 x 35 Hz and add
	// n omega A_n to the container speed.
	s := mustParse(t, "stroke", strokeCase)
	l = mustResolve(t, s)
	omega := 2 * math.Pi * 35
	if !within(l.Omega, omega, 1e-15) || !within(l.OmegaMax, 3*omega, 1e-15) {
		t.Errorf("Omega %g, OmegaMax %g, want %g and %g", l.Omega, l.OmegaMax, omega, 3*omega)
	}
	if want := omega * (6e-4 + 2*1e-4 + 3*5e-5); !within(l.RefVelocity, want, 1e-12) {
		t.Errorf("reference speed %g, want %g", l.RefVelocity, want)
	}
	if l.He > MaxHe*(1+1e-9) {
		t.Errorf("He = %g at the highest harmonic exceeds %g", l.He, MaxHe)
	}
	s.Shaking.Harmonics = nil
	if l0 := mustResolve(t, s); l0.StepsPerPeriod >= l.StepsPerPeriod {
		t.Errorf("the third harmonic did not shorten the step: %d steps per period with it, %d without",
			l.StepsPerPeriod, l0.StepsPerPeriod)
	}
}

func TestResolveBodyWarnings(t *testing.T) {
	light := func() *Case {
		c := mustParse(t, "stroke", strokeCase)
		c.Spheres[1].Density = 400 // density ratio 0.34 < C_A = 1/2
		return c
	}
	c := light()
	c.Bodies.Coupling = CouplingExplicit
	if l := mustResolve(t, c); !hasWarning(l, `"explicit" may be unstable for sphere[2]`) || hasWarning(l, "sphere[1]: its") {
		t.Errorf("explicit coupling warnings: %q", l.Warnings)
	}
	c = light() // virtual_mass = 0: below (1/2 - 0.34)/2
	if l := mustResolve(t, c); !hasWarning(l, "stability bound") {
		t.Errorf("no virtual-mass warning: %q", l.Warnings)
	}
	c.Bodies.VirtualMass = DefaultVirtualMass
	if l := mustResolve(t, c); hasWarning(l, "stability bound") || hasWarning(l, "unstable") {
		t.Errorf("warning with the default virtual mass: %q", l.Warnings)
	}
	// A sphere away from the arm's prescribed distance at t = 0.
	c.Spheres[1].Z = 0.002
	if l := mustResolve(t, c); !hasWarning(l, "set sphere[2].z = 0.0018 m") {
		t.Errorf("no start-distance warning: %q", l.Warnings)
	}
}
