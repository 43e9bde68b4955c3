package cases

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// workedExample is the case of METHODS.md 11.3: one sphere a1 = 1.5 mm in
// water-glycerol (nu = 1e-5 m^2/s), f = 40 Hz, A = 0.5 mm, N = 24 cells per
// radius, a 40a x 10a cell (length 60 mm, radius 15 mm, 960 x 240 cells).
const workedExample = `
[fluid]
density = 1150.0
viscosity = 0.0115

[container]
radius = 0.015
length = 0.060

[shaking]
frequency = 40.0
amplitude = 0.0005

[[sphere]]
radius = 0.0015
density = 1150.0
z = 0.0

[grid]
cells_per_radius = 24

[run]
periods = 3
`

func mustParse(t *testing.T, name, src string) *Case {
	t.Helper()
	c, err := Parse(name, []byte(src))
	if err != nil {
		t.Fatalf("Parse(%s): %v", name, err)
	}
	return c
}

func mustResolve(t *testing.T, c *Case) *Lattice {
	t.Helper()
	l, err := Resolve(c)
	if err != nil {
		t.Fatalf("Resolve: %v", err)
	}
	return l
}

func within(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// TestResolveWorkedExample reproduces the first row of the table of the
// METHODS.md 11.3 worked example, [D] arithmetic: nu_L = 0.0061 bound by
// He, tau = 0.518, 10 447 steps per period, Ma = 0.008, Re_grid = 0.79,
// delta/dx = 4.5. The tolerance is 1% for the table's rounding and our
// rounding of the steps per period to an integer.
func TestResolveWorkedExample(t *testing.T) {
	l := mustResolve(t, mustParse(t, "worked", workedExample))
	if l.Nz != 960 || l.Nr != 240 {
		t.Errorf("grid = %d x %d, want 960 x 240", l.Nz, l.Nr)
	}
	if l.Bound != BoundAcoustic {
		t.Errorf("Bound = %q, want %q", l.Bound, BoundAcoustic)
	}
	for _, c := range []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"nu_L", l.NuL, 0.0061, 0.01},
		{"tau", l.Tau, 0.518, 0.001},
		{"steps per period", float64(l.StepsPerPeriod), 10447, 0.01},
		{"Mach", l.Mach, 0.008, 0.05}, // the table gives one significant figure: 0.00834
		{"Re_grid", l.ReGrid, 0.79, 0.01},
		{"delta/dx", l.StokesCells, 4.5, 0.01},
		{"nodes", float64(l.Nz * l.Nr), 230e3, 0.01},
	} {
		if !within(c.got, c.want, c.rel) {
			t.Errorf("%s = %.5g, want %.5g within %g%%", c.name, c.got, c.want, 100*c.rel)
		}
	}
	if l.Steps != 3*l.StepsPerPeriod {
		t.Errorf("Steps = %d, want 3 x %d", l.Steps, l.StepsPerPeriod)
	}
	// The Mach limit alone would allow nu_L ≈ 0.07 (11.3).
	machOnly := MaxMach * Cs * l.Nu / (l.RefVelocity * l.Dx)
	if !within(machOnly, 0.07, 0.1) {
		t.Errorf("Mach bound on nu_L = %.4g, want about 0.07", machOnly)
	}
}

// resolveCases are cases that must resolve: the examples and variations
// that make each limit bind.
func resolveCases(t *testing.T) map[string]*Case {
	t.Helper()
	cs := make(map[string]*Case)
	for _, name := range List() {
		src, err := Get(name)
		if err != nil {
			t.Fatal(err)
		}
		cs[name] = mustParse(t, name, string(src))
	}
	cs["worked"] = mustParse(t, "worked", workedExample)

	// Mach binds: fast shaking of a short, fine cell.
	mach := mustParse(t, "worked", workedExample)
	mach.Container.Length = 0.01
	mach.Container.Radius = 0.003
	mach.Shaking.Amplitude = 0.01
	mach.Shaking.Frequency = 10
	mach.Shaking.RampPeriods = 0
	cs["mach"] = mach

	// No shaking, no gravity: nothing moves, tau_max binds.
	still := mustParse(t, "worked", workedExample)
	still.Shaking = Shaking{}
	still.Run = Run{Duration: 0.01}
	still.FillDefaults()
	cs["still"] = still

	// Settling sphere without shaking: Mach binds, exactly (no rounding).
	settle := mustParse(t, "worked", workedExample)
	settle.Shaking = Shaking{Gravity: 9.81}
	settle.Spheres[0].Density = 1200
	settle.Fluid.Viscosity = 0.0115 / 4
	settle.Run = Run{Duration: 0.01}
	settle.FillDefaults()
	cs["settle"] = settle
	return cs
}

func TestResolveLimits(t *testing.T) {
	nuMin := (MinTau - 0.5) / 3
	nuMax := (MaxTau - 0.5) / 3
	bounds := make(map[string]bool)
	for name, c := range resolveCases(t) {
		l := mustResolve(t, c)
		bounds[l.Bound] = true
		if r := float64(l.Nr) * l.Dx; r != c.Container.Radius && !within(r, c.Container.Radius, 1e-15) {
			t.Errorf("%s: Nr Dx = %.17g, want container radius %.17g exactly", name, r, c.Container.Radius)
		}
		if l.Radius != float64(l.Nr)*l.Dx || l.Length != float64(l.Nz)*l.Dx {
			t.Errorf("%s: effective size %g x %g, want Nz Dx x Nr Dx", name, l.Length, l.Radius)
		}
		if f := c.PeriodFrequency(); f > 0 {
			T := 1 / f
			if !within(float64(l.StepsPerPeriod)*l.Dt, T, 1e-12) {
				t.Errorf("%s: %d steps of %g s = %g s, want the period %g s", name, l.StepsPerPeriod, l.Dt, float64(l.StepsPerPeriod)*l.Dt, T)
			}
			if l.Steps != l.StepsPerPeriod*c.Run.Periods {
				t.Errorf("%s: Steps = %d, want %d x %d", name, l.Steps, l.StepsPerPeriod, c.Run.Periods)
			}
		} else if l.StepsPerPeriod != 0 {
			t.Errorf("%s: StepsPerPeriod = %d without shaking or strokes", name, l.StepsPerPeriod)
		}
		if !within(l.NuL, l.Nu*l.Dt/(l.Dx*l.Dx), 1e-12) || !within(l.Tau, 3*l.NuL+0.5, 1e-12) {
			t.Errorf("%s: nu_L %g, tau %g inconsistent with dt %g", name, l.NuL, l.Tau, l.Dt)
		}

		// Every limit holds at the chosen nu_L.
		const tol = 1e-9
		if l.Mach > MaxMach*(1+tol) || l.He > MaxHe*(1+tol) || l.NuL > nuMax*(1+tol) || l.NuL < nuMin*(1-tol) {
			t.Errorf("%s: limits violated: Ma %g, He %g, nu_L %g", name, l.Mach, l.He, l.NuL)
		}
		if l.NuL > l.NuLMax*(1+tol) {
			t.Errorf("%s: nu_L %g above NuLMax %g", name, l.NuL, l.NuLMax)
		}
		if l.StepsPerPeriod > 0 && l.NuL < l.NuLMax*(1-1/float64(l.StepsPerPeriod))*(1-tol) {
			t.Errorf("%s: nu_L %g more than one step per period below NuLMax %g", name, l.NuL, l.NuLMax)
		}

		// The binding limit is tight at NuLMax (before the rounding of the
		// steps per period), and tight at NuL itself without shaking.
		scale := l.NuLMax / l.NuL
		var at float64 // the binding quantity at NuLMax, relative to its limit
		switch l.Bound {
		case BoundMach:
			at = l.Mach * scale / MaxMach
		case BoundAcoustic:
			at = l.He * scale / MaxHe
		case BoundTauMax:
			at = l.NuLMax / nuMax
		default:
			t.Errorf("%s: Bound = %q", name, l.Bound)
			continue
		}
		if math.Abs(at-1) > tol {
			t.Errorf("%s: binding limit %s at %.12g of its value, want 1", name, l.Bound, at)
		}
		if l.StepsPerPeriod == 0 && math.Abs(scale-1) > tol {
			t.Errorf("%s: without shaking nu_L = %.12g, want NuLMax %.12g", name, l.NuL, l.NuLMax)
		}
	}
	for _, b := range []string{BoundMach, BoundAcoustic, BoundTauMax} {
		if !bounds[b] {
			t.Errorf("no test case is bound by %s", b)
		}
	}
}

func TestResolveConflict(t *testing.T) {
	// A coarse grid in a long cell: the acoustic bound falls below the
	// tau >= 0.51 floor.
	c := mustParse(t, "worked", workedExample)
	c.Grid.CellsPerRadius = 6
	c.Container.Length = 0.3
	_, err := Resolve(c)
	var ps Problems
	if !errors.As(err, &ps) || len(ps) != 1 {
		t.Fatalf("Resolve = %v, want one Problem", err)
	}
	p := ps[0]
	if p.Key != "grid.cells_per_radius" || !strings.Contains(p.Reason, "acoustic") ||
		!strings.Contains(p.Reason, "tau >= 0.51") || !strings.Contains(p.Fix, "raise grid.cells_per_radius") ||
		!strings.Contains(p.Fix, "shorten the container") {
		t.Errorf("conflict problem = %q", p.Error())
	}
	// The suggested resolution resolves.
	var n int
	if _, err := fmt.Sscanf(p.Fix, "raise grid.cells_per_radius to at least %d", &n); err != nil {
		t.Fatalf("no resolution in fix %q: %v", p.Fix, err)
	}
	c.Grid.CellsPerRadius = n
	if _, err := Resolve(c); err != nil {
		t.Errorf("with the suggested %d cells per radius: %v", n, err)
	}
}

func TestResolveGivenTau(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	c.Grid.Tau = 0.8 // far above the acoustic limit
	l := mustResolve(t, c)
	if l.Bound != BoundGiven {
		t.Errorf("Bound = %q, want %q", l.Bound, BoundGiven)
	}
	if !within(l.Tau, 0.8, 1e-3) {
		t.Errorf("Tau = %g, want about 0.8", l.Tau)
	}
	if !within(float64(l.StepsPerPeriod)*l.Dt, 1/c.Shaking.Frequency, 1e-12) {
		t.Errorf("period is not a whole number of steps")
	}
	if !hasWarning(l, "He =") {
		t.Errorf("no acoustic warning for tau = 0.8: %q", l.Warnings)
	}
	c.Grid.Tau = 1.4
	if l := mustResolve(t, c); !hasWarning(l, "exceeds 1") {
		t.Errorf("no tau_max warning for tau = 1.4: %q", l.Warnings)
	}
	c.Grid.Tau = 0.505
	if l := mustResolve(t, c); !hasWarning(l, "below 0.51") {
		t.Errorf("no tau_min warning for tau = 0.505: %q", l.Warnings)
	}
}

func TestResolveWarnings(t *testing.T) {
	c := mustParse(t, "worked", workedExample)
	c.Grid.CellsPerRadius = 6   // below 8 cells per radius; Stokes layer 1.1 cells
	c.Shaking.Amplitude = 0.005 // sphere Re = A omega 2a/nu = 377, Ma > 0.1
	c.Grid.Tau = 0.6            // no admissible automatic time step
	l := mustResolve(t, c)
	for _, want := range []string{"cells per radius", "Stokes layer", "not axisymmetric", "Mach", "He ="} {
		if !hasWarning(l, want) {
			t.Errorf("no warning containing %q in %q", want, l.Warnings)
		}
	}

	// The effective length: 5 cells per radius gives cells of 0.3 mm.
	c = mustParse(t, "worked", workedExample)
	c.Grid.CellsPerRadius = 5
	for _, tc := range []struct {
		length float64
		warn   bool
	}{
		{0.0216, false},  // 72 cells exactly
		{0.0214, false},  // 71.33 -> 71 cells, 0.47% short
		{0.02144, true},  // 71.47 -> 71 cells, 0.65% short
		{0.02156, false}, // 71.87 -> 72 cells, 0.19% long
	} {
		c.Container.Length = tc.length
		l := mustResolve(t, c)
		rel := math.Abs(l.Length-tc.length) / tc.length
		if got := hasWarning(l, "effective container length"); got != (rel > MaxLengthError) {
			t.Errorf("length %g m -> %g m (%.2f%%): length warning %v", tc.length, l.Length, 100*rel, got)
		}
		if tc.warn != (rel > MaxLengthError) {
			t.Errorf("length %g m -> %g m (%.2f%%): test expects warning %v", tc.length, l.Length, 100*rel, tc.warn)
		}
	}
}

func hasWarning(l *Lattice, sub string) bool {
	for _, w := range l.Warnings {
		if strings.Contains(w, sub) {
			return true
		}
	}
	return false
}

func TestConversions(t *testing.T) {
	l := mustResolve(t, mustParse(t, "worked", workedExample))
	rho, dx, dt := l.Density, l.Dx, l.Dt
	for _, c := range []struct {
		name      string
		to, back  func(float64) float64
		x, factor float64 // lattice value = x * factor
	}{
		{"distance", l.Distance, l.DistanceSI, 0.003, 1 / dx},
		{"time", l.Time, l.TimeSI, 0.25, 1 / dt},
		{"velocity", l.Velocity, l.VelocitySI, 0.1, dt / dx},
		{"acceleration", l.Acceleration, l.AccelerationSI, 9.81, dt * dt / dx},
		{"force density", l.ForceDensity, l.ForceDensitySI, 1e4, dt * dt / (rho * dx)},
		{"force", l.Force3D, l.Force3DSI, 1e-5, dt * dt / (rho * math.Pow(dx, 4))},
		{"mass", l.Mass, l.MassSI, 1e-6, 1 / (rho * math.Pow(dx, 3))},
		{"stiffness", l.Stiffness, l.StiffnessSI, 0.05, dt * dt / (rho * math.Pow(dx, 3))},
		{"damping", l.Damping, l.DampingSI, 1e-4, dt / (rho * math.Pow(dx, 3))},
		{"viscosity", l.Viscosity, nil, l.Nu, dt / (dx * dx)},
	} {
		got := c.to(c.x)
		if !within(got, c.x*c.factor, 1e-12) {
			t.Errorf("%s(%g) = %g, want %g", c.name, c.x, got, c.x*c.factor)
		}
		if c.back != nil && !within(c.back(got), c.x, 1e-12) {
			t.Errorf("%sSI(%s(%g)) = %g", c.name, c.name, c.x, c.back(got))
		}
	}
	if !within(l.Viscosity(l.Nu), l.NuL, 1e-12) {
		t.Errorf("Viscosity(nu) = %g, want NuL %g", l.Viscosity(l.Nu), l.NuL)
	}
	// p - p0 = rho_f (dx/dt)^2 (rho_L - 1)/3.
	rhoL := 1.001
	want := rho * (dx / dt) * (dx / dt) * (rhoL - 1) / 3
	if got := l.PressureSI(rhoL); !within(got, want, 1e-12) {
		t.Errorf("PressureSI(%g) = %g, want %g", rhoL, got, want)
	}
	if got := l.Pressure(want); !within(got, rhoL, 1e-12) {
		t.Errorf("Pressure(%g) = %g, want %g", want, got, rhoL)
	}
}
