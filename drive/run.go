package drive

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
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

	// Resume continues the run in Out from its checkpoint.
	Resume bool
	// CheckpointEvery is the wall time between checkpoints (0: 10
	// minutes). A checkpoint is also written when the run is interrupted.
	CheckpointEvery time.Duration
	// CheckpointPeriods, when positive, also writes a checkpoint every that
	// many drive periods.
	CheckpointPeriods int
	// StopAfter, when positive, stops the run after that many steps as
	// if it had been interrupted (for tests).
	StopAfter int64
	// SaveFinal keeps the state at the end of a completed run in
	// final.bin, for warm starts of other runs.
	SaveFinal bool
	// WarmFrom, when set, starts the run from the final state of the run
	// in that directory where their lattices agree (see WarmStart); the
	// summary records whether it did.
	WarmFrom string
}

// Summary is what summary.json records about a run.
type Summary struct {
	Title       string `json:"title,omitempty"`
	Completed   bool   `json:"completed"`
	Interrupted bool   `json:"interrupted,omitempty"`
	Failure     string `json:"failure,omitempty"`

	// The swimmer (absent without spheres).
	MeanVelocity            *float64 `json:"mean_velocity_m_s,omitempty"`
	MeanVelocityUncertainty *float64 `json:"mean_velocity_uncertainty_m_s,omitempty"`
	Swimming                *bool    `json:"swimming,omitempty"`
	Direction               string   `json:"direction,omitempty"`
	LeadingSphere           *int     `json:"leading_sphere,omitempty"`
	Converged               *bool    `json:"converged,omitempty"`
	ConvergenceCriterion    string   `json:"convergence_criterion,omitempty"`
	PeriodsAnalysed         int      `json:"periods_analysed,omitempty"`
	NetDisplacement         *float64 `json:"net_displacement_m,omitempty"`

	Streaming  *StreamingSummary    `json:"streaming,omitempty"`
	Groups     []cases.SphereGroups `json:"groups,omitempty"`
	Arms       []cases.ArmGroups    `json:"arm_groups,omitempty"` // the groups of each arm's stroke
	Model      *ModelResult         `json:"model,omitempty"`
	Comparison []Comparison         `json:"model_comparison,omitempty"`

	Steps         int64          `json:"steps"`
	SimulatedTime float64        `json:"simulated_time_s"`
	WallTime      float64        `json:"wall_time_s"`
	MLUPS         float64        `json:"mlups"`
	Lattice       LatticeSummary `json:"lattice"`
	MaxMach       float64        `json:"max_mach"`
	FinalMaxSpeed float64        `json:"final_max_speed_m_s"`
	WarmStart     *WarmStart     `json:"warm_start,omitempty"`
	// With several swimmers (spheres joined by springs or arms): each
	// one's speed and the gaps between neighbours.
	Swimmers []SwimmerSummary `json:"swimmers,omitempty"`
	Gaps     []GapSummary     `json:"gaps,omitempty"`
	// MinSurfaceGap is the smallest surface distance between two spheres
	// at any step (negative: they overlapped).
	MinSurfaceGap *float64 `json:"min_surface_gap_m,omitempty"`
	MaxMassDrift  float64  `json:"max_mass_drift"`
	MassCorrected float64  `json:"mass_correction_applied,omitempty"`
	Warnings      []string `json:"warnings"`
}

// Comparison is one quantity from the simulation beside the reduced
// linear model's value.
type Comparison struct {
	Quantity  string   `json:"quantity"`
	Simulated float64  `json:"simulated"`
	Model     float64  `json:"model"`
	Ratio     *float64 `json:"ratio,omitempty"` // simulated/model for amplitudes
	// Source names the model when it is not the reduced linear model
	// (the steady-Stokes chain model, for instance).
	Source string `json:"source,omitempty"`
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
	Kernel         string  `json:"kernel"` // the kernel path: avx512, avx2 or portable
}

// seriesColumns returns the columns of series.csv.
func seriesColumns(sim *Simulation) []output.Column {
	cols := []output.Column{
		{Name: "time_s", Doc: "physical time"},
		{Name: "drive_displacement_m", Doc: "container displacement X(t) in the laboratory"},
	}
	for k := 0; k < sim.Spheres(); k++ {
		cols = append(cols,
			output.Column{Name: fmt.Sprintf("sphere%d_z_m", k+1), Doc: "centre, container frame"},
			output.Column{Name: fmt.Sprintf("sphere%d_velocity_m_s", k+1), Doc: "velocity, container frame"},
			output.Column{Name: fmt.Sprintf("sphere%d_force_N", k+1), Doc: "hydrodynamic force (modified pressure in closed containers)"})
	}
	if sim.sw != nil {
		for k := range sim.sw.dyn.Springs {
			cols = append(cols, output.Column{Name: fmt.Sprintf("spring%d_extension_m", k+1), Doc: "length minus rest length"})
		}
		cols = append(cols, output.Column{Name: "centroid_m", Doc: "mean of the sphere centres, container frame"})
		if sw := sim.swimmers; len(sw) > 1 {
			for g := range sw {
				cols = append(cols, output.Column{Name: fmt.Sprintf("swimmer%d_centroid_m", g+1),
					Doc: fmt.Sprintf("mean centre of swimmer %d (spheres %s), container frame", g+1, sphereList(sw[g]))})
			}
		}
	}
	return append(cols,
		output.Column{Name: "max_speed_m_s", Doc: "largest liquid speed in the container frame"},
		output.Column{Name: "mach", Doc: "largest lattice speed over the lattice sound speed"},
		output.Column{Name: "mass_drift", Doc: "relative change of the liquid's mass (3D, lattice)"})
}

// Run runs the case c on lattice l and writes its outputs into opt.Out:
// case.toml (the case as resolved), series.csv, periods.csv (shaken cases
// with spheres) and summary.json. It stops early, flushing everything,
// when ctx is cancelled.
func Run(ctx context.Context, c *cases.Case, l *cases.Lattice, opt Options) (*Summary, error) {
	if opt.Log == nil {
		opt.Log = io.Discard
	}
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		return nil, fmt.Errorf("resolve case: %w", err)
	}
	casePath := filepath.Join(opt.Out, "case.toml")
	ckPath := filepath.Join(opt.Out, CheckpointFile)
	var resume *runState
	if opt.Resume {
		// The case is the one written at the start; its hash must match the
		// checkpoint's.
		src, err := os.ReadFile(casePath)
		if err != nil {
			return nil, fmt.Errorf("resume: %w", err)
		}
		if resume, err = readCheckpoint(ckPath, HashCase(src)); err != nil {
			return nil, fmt.Errorf("resume %s: %w", opt.Out, err)
		}
		buf.Reset()
		buf.Write(src)
	} else {
		if err := output.RunDir(opt.Out, opt.Force); err != nil {
			return nil, err
		}
		if err := output.WriteFileAtomic(casePath, buf.Bytes()); err != nil {
			return nil, err
		}
	}
	caseHash := HashCase(buf.Bytes())
	if free, err := output.FreeBytes(opt.Out); err == nil {
		if need := EstimateOutput(c, l); need > free {
			return nil, fmt.Errorf("the run would write about %.3g GB into %s but only %.3g GB are free: "+
				"free some space, write elsewhere with -out, or write fewer fields ([output] snapshots_per_period, vtk = false)",
				float64(need)/1e9, opt.Out, float64(free)/1e9)
		}
	}
	every := opt.CheckpointEvery
	if every <= 0 {
		every = 10 * time.Minute
	}
	sim, err := New(c, l, opt.Threads)
	if err != nil {
		return nil, err
	}
	defer sim.Close()
	var warm *WarmStart
	switch {
	case resume != nil:
		if err := sim.restore(resume); err != nil {
			return nil, fmt.Errorf("resume %s: %w", opt.Out, err)
		}
		if warm = resume.Warm; warm != nil && warm.Used {
			sim.warm, sim.Shaker.From = true, resume.WarmDrive
		}
	case opt.WarmFrom != "":
		if warm, err = sim.warmStart(opt.WarmFrom); err != nil {
			return nil, err
		}
	}

	sum := &Summary{
		Title:    c.Run.Title,
		Warnings: append([]string{}, l.Warnings...),
		Groups:   c.Groups(l),
		Arms:     c.ArmGroups(l),
		Lattice: LatticeSummary{Nz: l.Nz, Nr: l.Nr, CellSize: l.Dx, TimeStep: l.Dt, Tau: l.Tau,
			StepsPerPeriod: l.StepsPerPeriod, Bound: l.Bound, Threads: sim.Fluid.Threads(),
			Kernel: string(sim.Fluid.Kernel())},
		WarmStart: warm,
	}
	if warm != nil && !warm.Used {
		sum.Warnings = append(sum.Warnings, "started from rest, not from "+warm.From+": "+warm.Reason)
	}
	openSeries := func(name string, cols []output.Column, offset int64) (*output.Series, error) {
		if resume != nil {
			return output.ReopenSeries(filepath.Join(opt.Out, name), len(cols), offset)
		}
		return output.CreateSeries(filepath.Join(opt.Out, name), cols)
	}
	var seriesOff, periodsOff int64
	if resume != nil {
		seriesOff, periodsOff = resume.SeriesBytes, resume.PeriodsBytes
	}
	series, err := openSeries("series.csv", seriesColumns(sim), seriesOff)
	if err != nil {
		return nil, err
	}
	var tracker *periodTracker
	var periods *output.Series
	var fields *fieldRecorder
	if l.StepsPerPeriod > 0 {
		fields = newFieldRecorder(sim, opt.Out)
	}
	if sim.sw != nil && l.StepsPerPeriod > 0 {
		tracker = newPeriodTracker(sim)
		periods, err = openSeries("periods.csv", tracker.columns(), periodsOff)
		if err != nil {
			series.Close()
			return nil, err
		}
	}

	samples := sampleSteps(c, l)
	unit, total := "steps", int64(l.Steps)
	if l.StepsPerPeriod > 0 {
		unit, total = "periods", int64(l.Steps/l.StepsPerPeriod)
	}
	prog := output.NewProgress(opt.Log, opt.Quiet, total, unit, "run")
	start := time.Now()
	var runErr error
	keep := func(err error) {
		if err != nil && runErr == nil {
			runErr = err
		}
	}
	row := make([]float64, 0, 16)
	var hist history
	// record observes the liquid and, when no guard fires, writes a row;
	// it returns the guard's diagnosis, so that no NaN reaches a file.
	record := func() string {
		o := sim.Observe()
		if g := sim.Guard(o); g != "" {
			return g
		}
		row = append(row[:0], o.Time, o.DriveDisplacement)
		for k := 0; k < sim.Spheres(); k++ {
			z, v, f := sim.SphereState(k)
			row = append(row, z, v, f)
		}
		if sim.sw != nil {
			ext := 0.0
			for k := range sim.sw.dyn.Springs {
				row = append(row, sim.SpringExtension(k))
				if k == 0 {
					ext = sim.SpringExtension(0)
				}
			}
			row = append(row, sim.Centroid())
			if sw := sim.swimmers; len(sw) > 1 {
				for _, g := range sw {
					row = append(row, sim.swimmerCentroid(g))
				}
			}
			hist.add(o.Time, o.DriveDisplacement, sim.Centroid(), ext)
		}
		row = append(row, o.MaxSpeed, o.Mach, o.MassDrift)
		keep(series.Row(row...))
		sum.MaxMach = math.Max(sum.MaxMach, o.Mach)
		sum.FinalMaxSpeed = o.MaxSpeed
		sum.MaxMassDrift = math.Max(sum.MaxMassDrift, math.Abs(o.MassDrift))
		if tracker == nil {
			done := sim.Step()
			if l.StepsPerPeriod > 0 {
				done /= int64(l.StepsPerPeriod)
			}
			prog.Set(done, fmt.Sprintf("max speed %.3g m/s", o.MaxSpeed))
		}
		return ""
	}
	status := func() string {
		if tracker == nil || len(tracker.Centroids) < 3 {
			return ""
		}
		sp := SwimmingSpeed(tracker.Centroids, float64(l.StepsPerPeriod)*l.Dt, sim.skipPeriods())
		return fmt.Sprintf("mean speed %.3g +- %.2g m/s", sp.Mean, sp.Uncertainty)
	}
	nextSample := 0
	if resume == nil {
		if g := record(); g != "" {
			sum.Failure = g
		}
	} else {
		nextSample = resume.NextSample
		hist = resume.Hist
		sum.MaxMach, sum.MaxMassDrift, sum.FinalMaxSpeed = resume.Summary.MaxMach, resume.Summary.MaxMassDrift, resume.Summary.FinalMaxSpeed
		if tracker != nil && resume.Tracker != nil {
			tracker.restore(resume.Tracker)
		}
		if fields != nil && resume.Fields != nil {
			fields.restore(resume.Fields)
		}
	}
	save := func(path string) error {
		st := &runState{Hist: hist, NextSample: nextSample, Warm: warm, WarmDrive: sim.Shaker.From,
			Summary: summaryState{MaxMach: sum.MaxMach, MaxMassDrift: sum.MaxMassDrift, FinalMaxSpeed: sum.FinalMaxSpeed}}
		sim.capture(st)
		var err error
		if st.SeriesBytes, err = series.Offset(); err != nil {
			return err
		}
		if periods != nil {
			if st.PeriodsBytes, err = periods.Offset(); err != nil {
				return err
			}
		}
		if tracker != nil {
			st.Tracker = tracker.capture()
		}
		if fields != nil {
			st.Fields = fields.capture()
		}
		return writeCheckpoint(path, caseHash, st)
	}
	lastSave := time.Now()
loop:
	for sum.Failure == "" && sim.Step() < int64(l.Steps) {
		if ctx.Err() != nil || (opt.StopAfter > 0 && sim.Step() >= opt.StopAfter) {
			sum.Interrupted = true
			keep(save(ckPath))
			break
		}
		if l.StepsPerPeriod > 0 && sim.Step() > 0 && sim.Step()%int64(l.StepsPerPeriod) == 0 {
			p := sim.Step() / int64(l.StepsPerPeriod)
			if time.Since(lastSave) >= every || (opt.CheckpointPeriods > 0 && p%int64(opt.CheckpointPeriods) == 0) {
				keep(save(ckPath))
				lastSave = time.Now()
			}
		}
		if err := sim.Advance(1); err != nil {
			sum.Failure = err.Error()
			break
		}
		if fields != nil {
			fields.step(sim.Step())
			if fields.err != nil {
				keep(fields.err)
			}
		}
		if tracker != nil {
			before := len(tracker.rows)
			tracker.step()
			if len(tracker.rows) > before {
				keep(periods.Row(tracker.rows[len(tracker.rows)-1].values()...))
				prog.Set(int64(len(tracker.rows)), status())
			}
		}
		for nextSample < len(samples) && sim.Step() >= samples[nextSample] {
			nextSample++
			if g := record(); g != "" {
				sum.Failure = fmt.Sprintf("stopped at step %d by a guard: %s", sim.Step(), g)
				break loop
			}
		}
		if runErr != nil {
			// a file could not be written: stop, keeping a checkpoint if
			// one can still be written
			sum.Failure = "output: " + runErr.Error()
			keep(save(ckPath))
			break
		}
	}
	prog.Done()
	wall := time.Since(start).Seconds()
	sum.Steps = sim.Step()
	sum.SimulatedTime = sim.Time()
	sum.WallTime = wall
	if wall > 0 {
		sum.MLUPS = float64(l.Nz*l.Nr) * float64(sum.Steps) / wall / 1e6
	}
	drift, applied := sim.MassDrift()
	sum.MaxMassDrift = math.Max(sum.MaxMassDrift, drift)
	sum.MassCorrected = applied
	if tracker != nil {
		summarizeSwimmer(sum, sim, tracker)
		summarizeSwimmers(sum, sim, tracker)
		compareStokes(sum)
		if g := tracker.minGap; !math.IsInf(g, 0) {
			sum.MinSurfaceGap = &g
		}
		if w := overlapWarning(tracker); w != "" {
			sum.Warnings = append(sum.Warnings, w)
		}
		if c.Output.Pictures {
			keep(writeCharts(opt.Out, sim, &hist, tracker))
		}
	}
	if fields != nil && sum.Failure == "" && !sum.Interrupted {
		mf, mask, err := fields.finish()
		keep(err)
		if err == nil && sim.sw != nil && fields.mean.samples > 0 {
			st, err := sim.streamingMetrics(opt.Out, mf, mask, fields.avgStart, fields.periods)
			keep(err)
			sum.Streaming = st
		}
	}
	sum.Completed = sum.Failure == "" && !sum.Interrupted
	if sum.Completed && opt.SaveFinal {
		keep(save(filepath.Join(opt.Out, FinalStateFile)))
	}
	keep(series.Close())
	if periods != nil {
		keep(periods.Close())
	}
	keep(output.WriteJSON(filepath.Join(opt.Out, "summary.json"), sum))
	if runErr == nil && sum.Failure != "" {
		runErr = errors.New(sum.Failure)
	}
	return sum, runErr
}

// rampPeriods is the number of periods the swimming-speed estimate skips:
// the ramp and as many periods again for the transient it leaves.
func rampPeriods(c *cases.Case) int {
	return int(math.Ceil(2 * c.Shaking.RampPeriods))
}

// summarizeSwimmer fills in the swimming speed, the leading sphere and the
// comparison with the reduced model.
func summarizeSwimmer(sum *Summary, sim *Simulation, tr *periodTracker) {
	c := sim.Case
	T := float64(tr.steps) * sim.Lattice.Dt
	sp := SwimmingSpeed(tr.Centroids, T, sim.skipPeriods())
	net := tr.Centroids[len(tr.Centroids)-1] - tr.Centroids[0]
	sum.NetDisplacement = &net
	if sp.Periods == 0 {
		sum.ConvergenceCriterion = sp.Criterion
		sum.Warnings = append(sum.Warnings, "too few periods for a swimming speed: "+sp.Criterion)
		return
	}
	sum.MeanVelocity, sum.MeanVelocityUncertainty = &sp.Mean, &sp.Uncertainty
	sum.Swimming, sum.Converged = &sp.Swimming, &sp.Converged
	sum.ConvergenceCriterion, sum.PeriodsAnalysed = sp.Criterion, sp.Periods
	lead := 0
	switch {
	case sp.Swimming && sp.Mean > 0:
		sum.Direction = "+z"
		lead = argExtreme(sim, +1)
	case sp.Swimming:
		sum.Direction = "-z"
		lead = argExtreme(sim, -1)
	default:
		sum.Direction = "none (not distinguishable from zero)"
	}
	sum.LeadingSphere = &lead
	if !sp.Converged {
		sum.Warnings = append(sum.Warnings, "the swimming speed has not converged: run more periods ("+sp.Criterion+")")
	}
	if w := settlingWarning(c, sp.Mean); w != "" {
		sum.Warnings = append(sum.Warnings, w)
	}
	m, err := Model(c)
	if err != nil {
		sum.Warnings = append(sum.Warnings, "reduced model: "+err.Error())
		return
	}
	sum.Model = m
	last := tr.rows[len(tr.rows)-1]
	for _, ms := range m.Springs {
		k := ms.Spring - 1
		sum.Comparison = append(sum.Comparison, compare(fmt.Sprintf("spring %d extension amplitude (m)", ms.Spring), last.extAmp[k], ms.Amplitude))
		sum.Comparison = append(sum.Comparison, Comparison{Quantity: fmt.Sprintf("spring %d extension phase (deg)", ms.Spring),
			Simulated: finiteOr0(last.extPhase[k]), Model: ms.Phase})
	}
	for _, ms := range m.Spheres {
		k := ms.Sphere - 1
		sum.Comparison = append(sum.Comparison, compare(fmt.Sprintf("sphere %d amplitude relative to the container (m)", ms.Sphere), last.bodyAmp[k], ms.Amplitude))
	}
}

// finiteOr0 maps NaN (not valid JSON) to 0.
func finiteOr0(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	return x
}

func compare(q string, sim, model float64) Comparison {
	c := Comparison{Quantity: q, Simulated: finiteOr0(sim), Model: model}
	if model != 0 {
		r := sim / model
		c.Ratio = &r
	}
	return c
}

// argExtreme returns the 1-based index of the sphere furthest along
// sign * z.
func argExtreme(sim *Simulation, sign float64) int {
	best, arg := math.Inf(-1), 0
	for k := 0; k < sim.Spheres(); k++ {
		z, _, _ := sim.SphereState(k)
		if sign*z > best {
			best, arg = sign*z, k+1
		}
	}
	return arg
}

// sampleSteps returns the steps at which the series is sampled: evenly in
// each drive period for a shaken case, every sample interval otherwise,
// and always the last step.
func sampleSteps(c *cases.Case, l *cases.Lattice) []int64 {
	var out []int64
	if l.StepsPerPeriod > 0 {
		per := max(1, c.Run.SamplesPerPeriod)
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
	w := 0
	for i, n := range out {
		if i == 0 || n > out[w-1] {
			out[w] = n
			w++
		}
	}
	return out[:w]
}

// settlingWarning says when the spheres are not neutrally buoyant as a
// whole and gravity alone would move them at a speed comparable with the
// swimming speed u: the estimate is the net weight over the sum of the
// spheres' Stokes drags 6 pi mu a (isolated spheres; walls slow it down).
func settlingWarning(c *cases.Case, u float64) string {
	g := c.Shaking.Gravity
	if g == 0 || len(c.Springs)+len(c.Arms) == 0 {
		return ""
	}
	var w, drag float64
	for _, s := range c.Spheres {
		vol := 4.0 / 3 * math.Pi * s.Radius * s.Radius * s.Radius
		w += (s.Density - c.Fluid.Density) * vol * g
		drag += 6 * math.Pi * c.Fluid.Viscosity * s.Radius
	}
	v := w / drag
	if math.Abs(v) < 0.1*math.Abs(u) {
		return ""
	}
	return fmt.Sprintf("the spheres are not neutrally buoyant as a whole: their net weight %.3g N alone would move them "+
		"at about %.2g m/s (Stokes estimate), %.0f%% of the swimming speed; the measured speed includes that settling",
		w, v, 100*math.Abs(v/u))
}

// EstimateOutput returns the bytes a run of c on l is expected to write:
// the series and periods files, the VTK fields (snapshots, phase averages
// and the mean, five arrays of 64-bit values, seven values a node, twice
// as many rows when mirrored), the pictures (about 300 kB each) and the
// checkpoint (the populations and the field accumulators).
func EstimateOutput(c *cases.Case, l *cases.Lattice) int64 {
	nodes := int64(l.Nz) * int64(l.Nr)
	cols := int64(8 + 3*len(c.Spheres) + len(c.Springs))
	samples := int64(len(sampleSteps(c, l)))
	total := samples * cols * 18 // about 18 characters a number
	if l.StepsPerPeriod == 0 {
		return total + 9*8*nodes
	}
	periods := int64(l.Steps / l.StepsPerPeriod)
	total += periods * int64(4+2*len(c.Springs)+2*len(c.Spheres)) * 18
	o := c.Output
	if o.VTK {
		files := int64(o.SnapshotsPerPeriod*min(o.SnapshotPeriods, int(periods)) + o.SnapshotsPerPeriod + 1)
		per := nodes * 7 * 8
		if o.Mirror {
			per *= 2
		}
		total += files * per
	}
	if o.Pictures && len(c.Spheres) > 0 {
		total += int64(4+o.SnapshotsPerPeriod) * 300 << 10
	}
	accum := int64(3 * (1 + o.SnapshotsPerPeriod))
	total += (9*(int64(l.Nz)+2)*(int64(l.Nr)+2) + accum*nodes + 2*int64(o.SnapshotsPerPeriod)*nodes) * 8
	return total
}
