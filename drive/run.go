package drive

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"time"

	"axiswim/cases"
	"axiswim/output"
)

// Options control a run.
type Options struct {
	Out     string    // run directory
	Force   bool      // replace files in a non-empty run directory
	Threads int       // goroutines (0: all cores)
	Quiet   bool      // no progress
	Log     io.Writer // progress and messages (usually os.Stderr)
}

// Summary is what summary.json records about a run.
type Summary struct {
	Title            string         `json:"title,omitempty"`
	Completed        bool           `json:"completed"`
	Interrupted      bool           `json:"interrupted,omitempty"`
	Failure          string         `json:"failure,omitempty"`
	Steps            int64          `json:"steps"`
	SimulatedTime    float64        `json:"simulated_time_s"`
	WallTime         float64        `json:"wall_time_s"`
	MLUPS            float64        `json:"mlups"`
	Lattice          LatticeSummary `json:"lattice"`
	MaxMach          float64        `json:"max_mach"`
	FinalMaxSpeed    float64        `json:"final_max_speed_m_s"`
	FinalMeanAxial   float64        `json:"final_mean_axial_velocity_m_s"`
	MaxMassDrift     float64        `json:"max_mass_drift"`
	SpheresSimulated bool           `json:"spheres_simulated"`
	Warnings         []string       `json:"warnings"`
}

// LatticeSummary records the lattice parameters of a run.
type LatticeSummary struct {
	Nz             int     `json:"nz"`
	Nr             int     `json:"nr"`
	CellSize       float64 `json:"cell_size_m"`
	TimeStep       float64 `json:"time_step_s"`
	Tau            float64 `json:"tau"`
	StepsPerPeriod int     `json:"steps_per_period,omitempty"`
	Bound          string  `json:"time_step_bound"`
	Threads        int     `json:"threads"`
}

// seriesColumns are the columns of series.csv at this stage of the tool.
var seriesColumns = []output.Column{
	{Name: "time_s", Doc: "physical time"},
	{Name: "drive_displacement_m", Doc: "container displacement X(t)"},
	{Name: "drive_velocity_m_s", Doc: "container velocity dX/dt"},
	{Name: "drive_acceleration_m_s2", Doc: "container acceleration"},
	{Name: "max_speed_m_s", Doc: "largest liquid speed in the container frame"},
	{Name: "mean_axial_velocity_m_s", Doc: "volume average of the axial velocity"},
	{Name: "mach", Doc: "largest lattice speed over the lattice sound speed"},
	{Name: "mass_drift", Doc: "relative change of the liquid's mass"},
}

// Run runs the case c on lattice l and writes its outputs into opt.Out:
// case.toml (the case as resolved), series.csv and summary.json. It stops
// early, flushing everything, when ctx is cancelled.
func Run(ctx context.Context, c *cases.Case, l *cases.Lattice, opt Options) (*Summary, error) {
	if opt.Log == nil {
		opt.Log = io.Discard
	}
	if err := output.RunDir(opt.Out, opt.Force); err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		return nil, fmt.Errorf("resolve case: %w", err)
	}
	if err := output.WriteFileAtomic(filepath.Join(opt.Out, "case.toml"), buf.Bytes()); err != nil {
		return nil, err
	}
	sim, err := New(c, l, opt.Threads)
	if err != nil {
		return nil, err
	}
	defer sim.Close()

	sum := &Summary{
		Title:    c.Run.Title,
		Warnings: append([]string{}, l.Warnings...),
		Lattice: LatticeSummary{Nz: l.Nz, Nr: l.Nr, CellSize: l.Dx, TimeStep: l.Dt, Tau: l.Tau,
			StepsPerPeriod: l.StepsPerPeriod, Bound: l.Bound, Threads: sim.Fluid.Threads()},
	}
	if len(c.Spheres) > 0 {
		w := "this version solves the liquid only: the spheres are parsed and validated but not yet simulated"
		sum.Warnings = append(sum.Warnings, w)
		fmt.Fprintf(opt.Log, "warning: %s\n", w)
	}

	series, err := output.CreateSeries(filepath.Join(opt.Out, "series.csv"), seriesColumns)
	if err != nil {
		return nil, err
	}
	samples := sampleSteps(c, l)
	unit, total := "steps", int64(l.Steps)
	if l.StepsPerPeriod > 0 {
		unit, total = "periods", int64(l.Steps/l.StepsPerPeriod)
	}
	prog := output.NewProgress(opt.Log, opt.Quiet, total, unit, "run")
	start := time.Now()
	var runErr error
	record := func() Observation {
		o := sim.Observe()
		if err := series.Row(o.Time, o.DriveDisplacement, o.DriveVelocity, o.DriveAcceleration,
			o.MaxSpeed, o.MeanAxialVelocity, o.Mach, o.MassDrift); err != nil && runErr == nil {
			runErr = err
		}
		sum.MaxMach = math.Max(sum.MaxMach, o.Mach)
		sum.MaxMassDrift = math.Max(sum.MaxMassDrift, math.Abs(o.MassDrift))
		sum.FinalMaxSpeed, sum.FinalMeanAxial = o.MaxSpeed, o.MeanAxialVelocity
		return o
	}
	record()
	for _, next := range samples {
		if ctx.Err() != nil {
			sum.Interrupted = true
			break
		}
		sim.Advance(int(next - sim.Step()))
		o := record()
		if !o.Finite || o.Mach > 0.3 {
			sum.Failure = fmt.Sprintf("unstable at t = %.6g s (step %d): max Mach %.3g%s; "+
				"lower grid.tau or raise grid.cells_per_radius", o.Time, sim.Step(), o.Mach, nanNote(o.Finite))
			break
		}
		done := sim.Step()
		if l.StepsPerPeriod > 0 {
			done /= int64(l.StepsPerPeriod)
		}
		prog.Set(done, fmt.Sprintf("max speed %.3g m/s", o.MaxSpeed))
	}
	prog.Done()
	wall := time.Since(start).Seconds()
	sum.Steps = sim.Step()
	sum.SimulatedTime = sim.Time()
	sum.WallTime = wall
	if wall > 0 {
		sum.MLUPS = float64(l.Nz*l.Nr) * float64(sum.Steps) / wall / 1e6
	}
	sum.Completed = sum.Failure == "" && !sum.Interrupted
	if err := series.Close(); err != nil && runErr == nil {
		runErr = err
	}
	if err := output.WriteJSON(filepath.Join(opt.Out, "summary.json"), sum); err != nil && runErr == nil {
		runErr = err
	}
	if runErr == nil && sum.Failure != "" {
		runErr = errors.New(sum.Failure)
	}
	return sum, runErr
}

func nanNote(finite bool) string {
	if finite {
		return ""
	}
	return " and non-finite values in the fields"
}

// sampleSteps returns the steps at which the series is sampled: evenly in
// each drive period for a shaken case, every sample interval otherwise,
// and always the last step.
func sampleSteps(c *cases.Case, l *cases.Lattice) []int64 {
	var out []int64
	if l.StepsPerPeriod > 0 {
		per := c.Run.SamplesPerPeriod
		for p := 0; p < l.Steps/l.StepsPerPeriod; p++ {
			for k := 1; k <= per; k++ {
				out = append(out, int64(p*l.StepsPerPeriod+k*l.StepsPerPeriod/per))
			}
		}
	} else {
		every := int64(math.Max(1, math.Round(c.Run.SampleInterval/l.Dt)))
		for n := every; n <= int64(l.Steps); n += every {
			out = append(out, n)
		}
	}
	if len(out) == 0 || out[len(out)-1] != int64(l.Steps) {
		out = append(out, int64(l.Steps))
	}
	// keep them strictly increasing
	w := 0
	for i, n := range out {
		if i == 0 || n > out[w-1] {
			out[w] = n
			w++
		}
	}
	return out[:w]
}
