package cases

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// WriteTOML writes c as a case file with every default filled in (it calls
// FillDefaults on a copy first), so that the output documents exactly what
// was run. Parse reads the output back into an equal Case. Values that are
// zero because they were not given (cell_size, tau, periods, duration, ...)
// are left out, or written as a comment.
func (c *Case) WriteTOML(w io.Writer) error {
	cc := c.clone()
	cc.FillDefaults()
	e := &encoder{w: bufio.NewWriter(w)}

	if cc.Run.Title != "" {
		e.comment(cc.Run.Title)
	}
	e.comment("axiswim case; every default is filled in. SI units.")

	e.table("fluid")
	e.float("density", cc.Fluid.Density, "kg/m^3")
	e.float("viscosity", cc.Fluid.Viscosity, "Pa s, dynamic")

	e.table("container")
	e.float("radius", cc.Container.Radius, "m")
	e.float("length", cc.Container.Length, "m; z runs from -length/2 to +length/2")
	e.str("ends", cc.Container.Ends, `"closed" or "periodic"`)

	e.table("shaking")
	e.float("frequency", cc.Shaking.Frequency, "Hz; 0 = no shaking")
	e.float("amplitude", cc.Shaking.Amplitude, "m, container displacement amplitude")
	e.float("ramp_periods", cc.Shaking.RampPeriods, "periods over which the amplitude is ramped up")
	e.float("gravity", cc.Shaking.Gravity, "m/s^2 along -z")
	for _, h := range cc.Shaking.Harmonics {
		e.array("shaking.harmonic", "")
		e.line("order = %d # multiple of the drive frequency", h.Order)
		e.float("amplitude", h.Amplitude, "m")
		e.float("phase", h.Phase, "degrees")
	}

	for i, s := range cc.Spheres {
		e.array("sphere", fmt.Sprintf("sphere %d", i+1))
		e.float("radius", s.Radius, "m")
		e.float("density", s.Density, "kg/m^3")
		e.float("z", s.Z, "m, initial centre")
	}

	for _, s := range cc.Springs {
		e.array("spring", "")
		e.line("spheres = [%d, %d] # 1-based sphere indices", s.Spheres[0], s.Spheres[1])
		e.float("stiffness", s.Stiffness, "N/m")
		e.float("rest_length", s.RestLength, "m, centre to centre")
		e.float("damping", s.Damping, "N s/m")
	}

	for _, a := range cc.Arms {
		e.array("arm", "")
		e.line("spheres = [%d, %d] # 1-based sphere indices", a.Spheres[0], a.Spheres[1])
		e.float("length", a.Length, "m, mean centre-to-centre distance")
		e.float("amplitude", a.Amplitude, "m, stroke amplitude")
		e.float("phase", a.Phase, "degrees")
		if a.Frequency != 0 {
			e.float("frequency", a.Frequency, "Hz")
		} else {
			e.comment("frequency not given (required without shaking)")
		}
	}

	e.table("bodies")
	e.float("virtual_mass", cc.Bodies.VirtualMass, "virtual-mass coefficient C_V")
	e.str("coupling", cc.Bodies.Coupling, `"virtual-mass" or "explicit"`)
	e.float("repulsion_range", cc.Bodies.RepulsionRange, "cells")

	e.table("output")
	e.line("snapshots_per_period = %d # field snapshots per period (0: none)", cc.Output.SnapshotsPerPeriod)
	e.line("snapshot_periods = %d # over the last periods", cc.Output.SnapshotPeriods)
	e.line("average_periods = %d # final periods of the mean fields (0: the speed window)", cc.Output.AveragePeriods)
	e.line("mirror = %t # VTK shows the full meridian plane", cc.Output.Mirror)
	e.line("vtk = %t", cc.Output.VTK)
	e.line("pictures = %t", cc.Output.Pictures)

	e.table("grid")
	if cc.Grid.CellsPerRadius != 0 {
		e.line("cells_per_radius = %d # across the smallest sphere", cc.Grid.CellsPerRadius)
	}
	if cc.Grid.CellSize != 0 {
		e.float("cell_size", cc.Grid.CellSize, "m")
	}
	if cc.Grid.Tau != 0 {
		e.float("tau", cc.Grid.Tau, "relaxation time")
	} else {
		e.comment("tau not given: the time step is chosen from the stability limits")
	}

	e.table("solver")
	e.str("collision", cc.Solver.Collision, `"trt", "mrt" or "bgk"`)
	e.float("magic", cc.Solver.Magic, "TRT magic parameter")
	e.str("precision", cc.Solver.Precision, `storage of the populations, "float64" or "float32"`)

	e.table("run")
	if cc.Run.Periods != 0 {
		e.line("periods = %d # drive periods", cc.Run.Periods)
	}
	if cc.Run.Duration != 0 {
		e.float("duration", cc.Run.Duration, "s")
	}
	if cc.Run.SamplesPerPeriod != 0 {
		e.line("samples_per_period = %d", cc.Run.SamplesPerPeriod)
	}
	if cc.Run.SampleInterval != 0 {
		e.float("sample_interval", cc.Run.SampleInterval, "s")
	}
	e.str("title", cc.Run.Title, "")

	if e.err != nil {
		return fmt.Errorf("write case: %w", e.err)
	}
	if err := e.w.Flush(); err != nil {
		return fmt.Errorf("write case: %w", err)
	}
	return nil
}

// clone returns a deep copy of c.
func (c *Case) clone() *Case {
	cc := *c
	cc.Spheres = append([]Sphere(nil), c.Spheres...)
	cc.Springs = append([]Spring(nil), c.Springs...)
	cc.Arms = append([]Arm(nil), c.Arms...)
	cc.Shaking.Harmonics = append([]Harmonic(nil), c.Shaking.Harmonics...)
	return &cc
}

type encoder struct {
	w   *bufio.Writer
	err error
}

func (e *encoder) line(format string, args ...any) {
	if e.err == nil {
		_, e.err = fmt.Fprintf(e.w, format+"\n", args...)
	}
}

// comment writes text as comment lines; control characters, which TOML
// forbids even in comments, are written as \uXXXX escapes.
func (e *encoder) comment(text string) {
	for _, l := range strings.Split(text, "\n") {
		q := quoteString(l)
		e.line("# %s", strings.ReplaceAll(q[1:len(q)-1], `\"`, `"`))
	}
}

func (e *encoder) table(name string) {
	e.line("\n[%s]", name)
}

func (e *encoder) array(name, comment string) {
	if comment != "" {
		e.line("\n[[%s]] # %s", name, comment)
	} else {
		e.line("\n[[%s]]", name)
	}
}

func (e *encoder) float(key string, v float64, comment string) {
	e.keyValue(key, formatFloat(v), comment)
}

func (e *encoder) str(key, v, comment string) {
	e.keyValue(key, quoteString(v), comment)
}

func (e *encoder) keyValue(key, v, comment string) {
	if comment != "" {
		e.line("%s = %s # %s", key, v, comment)
	} else {
		e.line("%s = %s", key, v)
	}
}

// formatFloat writes v as a TOML float that parses back to exactly v.
func formatFloat(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan"
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	s := strconv.FormatFloat(v, 'g', -1, 64)
	if !strings.ContainsAny(s, ".e") {
		s += ".0"
	}
	return s
}

// quoteString writes s as a TOML basic string.
func quoteString(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"' || r == '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
