package run

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"time"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/drive/flow"
	"axiswim/drive/record"
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

// Run is one run of a case: opened (fresh or from its checkpoint) by
// Open, stepped to its end by Execute, which writes its outputs into
// Options.Out: case.toml (the case as resolved), series.csv, periods.csv
// (shaken cases with spheres), metrics.csv, fields/, pictures/ and
// summary.json.
type Run struct {
	c   *cases.Case
	l   *cases.Lattice
	opt Options

	sim      *drive.Simulation
	sum      *Summary
	caseHash string
	ckPath   string
	every    time.Duration // wall time between checkpoints
	warm     *WarmStart

	series     *output.Series
	periodsCSV *output.Series  // nil without a period record
	periods    *record.Periods // nil without spheres or shaking
	fields     *record.Fields  // nil without shaking
	hist       record.History  // what the charts need
	samples    []int64         // the steps at which series.csv has a row
	nextSample int             // the next of them
	row        []float64       // scratch of a series row

	prog     *output.Progress
	start    time.Time
	lastSave time.Time
	// failure is what stopped the run (a guard, the dynamics, an output);
	// outErr the first error writing a file.
	failure error
	outErr  error
}

// Execute opens a run of case c on lattice l and steps it to its end (see
// Run.Execute).
func Execute(ctx context.Context, c *cases.Case, l *cases.Lattice, opt Options) (*Summary, error) {
	r, err := Open(c, l, opt)
	if err != nil {
		return nil, err
	}
	defer r.Close()
	return r.Execute(ctx)
}

// Open prepares a run of case c on lattice l: it writes case.toml into a
// fresh run directory opt.Out (or, with opt.Resume, reads the checkpoint
// there), sets the case up, starts from another run's final state when
// asked, opens the series and records the first row.
func Open(c *cases.Case, l *cases.Lattice, opt Options) (*Run, error) {
	if opt.Log == nil {
		opt.Log = io.Discard
	}
	r := &Run{c: c, l: l, opt: opt, ckPath: filepath.Join(opt.Out, CheckpointFile)}
	resume, err := r.openDir()
	if err != nil {
		return nil, err
	}
	r.every = opt.CheckpointEvery
	if r.every <= 0 {
		r.every = 10 * time.Minute
	}
	if r.sim, err = drive.New(c, l, opt.Threads); err != nil {
		return nil, err
	}
	if err := r.open(resume); err != nil {
		r.Close()
		return nil, err
	}
	return r, nil
}

// openDir writes the resolved case into a fresh run directory, or for a
// resume reads the checkpoint that belongs to the case.toml there, and
// checks that the disk has room for the run.
func (r *Run) openDir() (*runState, error) {
	c, l, opt := r.c, r.l, r.opt
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		return nil, fmt.Errorf("resolve case: %w", err)
	}
	casePath := filepath.Join(opt.Out, "case.toml")
	var resume *runState
	if opt.Resume {
		// The case is the one written at the start; its hash must match the
		// checkpoint's.
		src, err := os.ReadFile(casePath)
		if err != nil {
			return nil, fmt.Errorf("resume: %w", err)
		}
		if resume, err = readCheckpoint(r.ckPath, HashCase(src)); err != nil {
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
	r.caseHash = HashCase(buf.Bytes())
	if free, err := output.FreeBytes(opt.Out); err == nil {
		if need := EstimateOutput(c, l); need > free {
			return nil, fmt.Errorf("the run would write about %.3g GB into %s but only %.3g GB are free: "+
				"free some space, write elsewhere with -out, or write fewer fields ([output] snapshots_per_period, vtk = false)",
				float64(need)/1e9, opt.Out, float64(free)/1e9)
		}
	}
	return resume, nil
}

// open restores a resumed run or starts a warm one, starts the summary,
// opens the series and the records, and records the first row.
func (r *Run) open(resume *runState) error {
	c, l, opt, sim := r.c, r.l, r.opt, r.sim
	switch {
	case resume != nil:
		if err := sim.Restore(resume.simulation()); err != nil {
			return fmt.Errorf("resume %s: %w", opt.Out, err)
		}
		if r.warm = resume.Warm; r.warm != nil && r.warm.Used {
			sim.ResumeWarm(resume.WarmDrive)
		}
	case opt.WarmFrom != "":
		var err error
		if r.warm, err = warmStart(sim, opt.WarmFrom); err != nil {
			return err
		}
	}
	r.sum = &Summary{
		Title:    c.Run.Title,
		Warnings: append([]string{}, l.Warnings...),
		Groups:   c.Groups(l),
		Arms:     c.ArmGroups(l),
		Lattice: LatticeSummary{Nz: l.Nz, Nr: l.Nr, CellSize: l.Dx, TimeStep: l.Dt, Tau: l.Tau,
			StepsPerPeriod: l.StepsPerPeriod, Bound: l.Bound, Threads: sim.Fluid.Threads(),
			Kernel: string(sim.Fluid.Kernel())},
		WarmStart: r.warm,
	}
	if w := r.warm; w != nil && !w.Used {
		r.sum.Warnings = append(r.sum.Warnings, "started from rest, not from "+w.From+": "+w.Reason)
	}
	var seriesOff, periodsOff int64
	if resume != nil {
		seriesOff, periodsOff = resume.SeriesBytes, resume.PeriodsBytes
	}
	var err error
	if r.series, err = r.openSeries(resume != nil, "series.csv", record.SeriesColumns(sim), seriesOff); err != nil {
		return err
	}
	if l.StepsPerPeriod > 0 {
		r.fields = record.NewFields(sim, opt.Out)
	}
	if sim.Spheres() > 0 && l.StepsPerPeriod > 0 {
		r.periods = record.NewPeriods(sim)
		if r.periodsCSV, err = r.openSeries(resume != nil, "periods.csv", r.periods.Columns(), periodsOff); err != nil {
			return err
		}
	}
	if r.periods != nil {
		sim.AfterStep(r.periodStep)
	}
	r.samples = sampleSteps(c, l)
	unit, total := "steps", int64(l.Steps)
	if l.StepsPerPeriod > 0 {
		unit, total = "periods", int64(l.Steps/l.StepsPerPeriod)
	}
	r.prog = output.NewProgress(opt.Log, opt.Quiet, total, unit, "run")
	r.start = time.Now()
	r.row = make([]float64, 0, 16)
	if resume == nil {
		r.failure = r.record()
	} else {
		r.nextSample = resume.NextSample
		r.hist = resume.Hist
		r.sum.MaxMach, r.sum.MaxMassDrift, r.sum.FinalMaxSpeed = resume.Summary.MaxMach, resume.Summary.MaxMassDrift, resume.Summary.FinalMaxSpeed
		if r.periods != nil && resume.Tracker != nil {
			r.periods.Restore(resume.Tracker)
		}
		if r.fields != nil && resume.Fields != nil {
			r.fields.Restore(resume.Fields)
		}
	}
	return nil
}

// openSeries creates the series file name, or reopens it at offset for a
// resumed run.
func (r *Run) openSeries(resumed bool, name string, cols []output.Column, offset int64) (*output.Series, error) {
	if resumed {
		return output.ReopenSeries(filepath.Join(r.opt.Out, name), len(cols), offset)
	}
	return output.CreateSeries(filepath.Join(r.opt.Out, name), cols)
}

// Close releases the simulation's goroutines and closes the files a run
// that did not reach Execute's end left open.
func (r *Run) Close() {
	if r.series != nil {
		r.series.Close()
	}
	if r.periodsCSV != nil {
		r.periodsCSV.Close()
	}
	r.sim.Close()
}

// keep remembers the first error writing a file.
func (r *Run) keep(err error) {
	if err != nil && r.outErr == nil {
		r.outErr = err
	}
}

// record observes the liquid and, when no guard fires, writes a row of
// series.csv; it returns the guard's diagnosis, so that no NaN reaches a
// file.
func (r *Run) record() error {
	sim, sum := r.sim, r.sum
	o := sim.Observe()
	if err := sim.Guard(o); err != nil {
		return err
	}
	r.row = record.SeriesRow(r.row, sim, o)
	if sim.Spheres() > 0 {
		ext := 0.0
		if sim.Springs() > 0 {
			ext = sim.SpringExtension(0)
		}
		r.hist.Add(o.Time, o.DriveDisplacement, sim.Centroid(), ext)
	}
	r.keep(r.series.Row(r.row...))
	sum.MaxMach = math.Max(sum.MaxMach, o.Mach)
	sum.FinalMaxSpeed = o.MaxSpeed
	sum.MaxMassDrift = math.Max(sum.MaxMassDrift, math.Abs(o.MassDrift))
	if r.periods == nil {
		done := sim.Step()
		if r.l.StepsPerPeriod > 0 {
			done /= int64(r.l.StepsPerPeriod)
		}
		r.prog.Set(done, fmt.Sprintf("max speed %.3g m/s", o.MaxSpeed))
	}
	return nil
}

// periodStep records a step in the period record and writes a period's
// row when one closes (Simulation.AfterStep).
func (r *Run) periodStep() {
	if r.periods.Step() {
		rows := r.periods.Rows()
		r.keep(r.periodsCSV.Row(rows[len(rows)-1].Values()...))
		r.prog.Set(int64(len(rows)), r.status())
	}
}

// status is the progress line's note: the mean speed so far.
func (r *Run) status() string {
	if r.periods == nil || len(r.periods.Centroids()) < 3 {
		return ""
	}
	sp := record.SwimmingSpeed(r.periods.Centroids(), r.periods.Period(), r.sim.SkipPeriods())
	return fmt.Sprintf("mean speed %.3g +- %.2g m/s", sp.Mean, sp.Uncertainty)
}

// save writes everything the run needs to continue to path.
func (r *Run) save(path string) error {
	sum := r.sum
	st := &runState{Hist: r.hist, NextSample: r.nextSample, Warm: r.warm, WarmDrive: r.sim.Shaker.From,
		Summary: summaryState{MaxMach: sum.MaxMach, MaxMassDrift: sum.MaxMassDrift, FinalMaxSpeed: sum.FinalMaxSpeed}}
	st.setSimulation(r.sim.Capture())
	var err error
	if st.SeriesBytes, err = r.series.Offset(); err != nil {
		return err
	}
	if r.periodsCSV != nil {
		if st.PeriodsBytes, err = r.periodsCSV.Offset(); err != nil {
			return err
		}
	}
	if r.periods != nil {
		st.Tracker = r.periods.Capture()
	}
	if r.fields != nil {
		st.Fields = r.fields.Capture()
	}
	return writeCheckpoint(path, r.caseHash, st)
}

// Execute steps the run to its end, or until ctx is cancelled (writing a
// checkpoint to resume from), a guard or the dynamics stop it, or a file
// cannot be written; then it finishes the records and writes the summary.
// The error is the one that stopped the run, its chain kept.
func (r *Run) Execute(ctx context.Context) (*Summary, error) {
	r.lastSave = time.Now()
	for r.failure == nil && r.step(ctx) {
	}
	return r.finish()
}

// step takes one lattice step with what goes with it (a checkpoint at a
// period's end when due, the records, the series rows); it reports
// whether the run goes on.
func (r *Run) step(ctx context.Context) bool {
	sim, l, opt := r.sim, r.l, r.opt
	if sim.Step() >= int64(l.Steps) {
		return false
	}
	if ctx.Err() != nil || (opt.StopAfter > 0 && sim.Step() >= opt.StopAfter) {
		r.sum.Interrupted = true
		r.keep(r.save(r.ckPath))
		return false
	}
	if l.StepsPerPeriod > 0 && sim.Step() > 0 && sim.Step()%int64(l.StepsPerPeriod) == 0 {
		p := sim.Step() / int64(l.StepsPerPeriod)
		if time.Since(r.lastSave) >= r.every || (opt.CheckpointPeriods > 0 && p%int64(opt.CheckpointPeriods) == 0) {
			r.keep(r.save(r.ckPath))
			r.lastSave = time.Now()
		}
	}
	// Stride is 1 on one lattice; on refined levels the steps of level 0
	// (the period record follows every finest step: AfterStep, periodStep).
	if err := sim.Advance(sim.Stride()); err != nil {
		r.failure = err
		return false
	}
	if r.fields != nil {
		r.keep(r.fields.Step(sim.Step()))
	}
	for r.nextSample < len(r.samples) && sim.Step() >= r.samples[r.nextSample] {
		r.nextSample++
		if err := r.record(); err != nil {
			r.failure = fmt.Errorf("stopped at step %d by a guard: %w", sim.Step(), err)
			return false
		}
	}
	if r.outErr != nil {
		// a file could not be written: stop, keeping a checkpoint if one
		// can still be written
		r.failure = fmt.Errorf("output: %w", r.outErr)
		r.keep(r.save(r.ckPath))
		return false
	}
	return true
}

// finish completes the summary (speeds, the model beside them, the mean
// flow's metrics), writes the last files and summary.json, and returns
// the first error of the run.
func (r *Run) finish() (*Summary, error) {
	sim, l, sum := r.sim, r.l, r.sum
	r.prog.Done()
	wall := time.Since(r.start).Seconds()
	if r.failure != nil {
		sum.Failure = r.failure.Error()
	}
	sum.Steps = sim.Step()
	sum.SimulatedTime = sim.Time()
	sum.WallTime = wall
	updates := float64(l.Nz*l.Nr) * float64(sum.Steps)
	if h := sim.Levels(); h != nil {
		updates = summarizeLevels(&sum.Lattice, sim)
	}
	if wall > 0 {
		sum.MLUPS = updates / wall / 1e6
	}
	drift, applied := sim.MassDrift()
	sum.MaxMassDrift = math.Max(sum.MaxMassDrift, drift)
	sum.MassCorrected = applied
	if tr := r.periods; tr != nil {
		summarizeSwimmer(sum, sim, tr)
		summarizeSwimmers(sum, sim, tr)
		compareStokes(sum)
		if g, _ := tr.MinSurfaceGap(); !math.IsInf(g, 0) {
			sum.MinSurfaceGap = &g
		}
		if w := overlapWarning(tr); w != "" {
			sum.Warnings = append(sum.Warnings, w)
		}
		if r.c.Output.Pictures {
			r.keep(record.WriteCharts(r.opt.Out, sim, &r.hist, tr))
		}
	}
	if r.fields != nil && sum.Failure == "" && !sum.Interrupted {
		mf, mask, err := r.fields.Finish()
		r.keep(err)
		if first, last, samples := r.fields.Averaged(); err == nil && sim.Spheres() > 0 && samples > 0 {
			sum.Streaming = flow.Measure(mf, mask, sim.FrameOnLiquid, swimmerSpan(sim), sim.View(), first, last)
			if sim.Levels() != nil {
				im := flow.Imprint(mf, mask, sim.FrameOnLiquid, sim.LevelOutlines())
				sum.InterfaceImprint = &im
				if im > flow.ImprintBound {
					sum.Warnings = append(sum.Warnings, fmt.Sprintf("the mean vorticity shows the level interfaces: a second difference of %.2g%% of its peak "+
						"across them (above %g%%; issue 17's bound for an imprint): widen grid.fine_margin or grid.level_margin, or use fewer levels",
						100*im, 100*flow.ImprintBound))
				}
			}
			r.keep(record.WriteMetrics(r.opt.Out, sum.Streaming))
		}
	}
	sum.Completed = sum.Failure == "" && !sum.Interrupted
	if sum.Completed && r.opt.SaveFinal {
		r.keep(r.save(filepath.Join(r.opt.Out, FinalStateFile)))
	}
	r.keep(r.series.Close())
	r.series = nil
	if r.periodsCSV != nil {
		r.keep(r.periodsCSV.Close())
		r.periodsCSV = nil
	}
	r.keep(output.WriteJSON(filepath.Join(r.opt.Out, "summary.json"), sum))
	if r.outErr != nil {
		return sum, r.outErr
	}
	return sum, r.failure
}

// summarizeLevels fills in the levels of a run on refined levels and
// returns the node updates of all levels so far.
func summarizeLevels(ls *LatticeSummary, sim *drive.Simulation) float64 {
	h, ly := sim.Levels(), sim.Lattice.Layout()
	ls.Levels = ls.Levels[:0]
	var updates float64
	for i := range h.Len() {
		s, lev := h.Level(i), ly.Levels[i]
		nz, nr := s.Size()
		u := float64(nz*nr) * float64(s.Steps())
		updates += u
		ls.Levels = append(ls.Levels, LevelSummary{Nz: nz, Nr: nr, CellSize: lev.Dx, TimeStep: lev.Dt, Tau: lev.Tau,
			NodeUpdates: u, KernelTime: s.KernelTime().Seconds()})
	}
	ls.TransferTime = h.TransferTime().Seconds()
	ls.LevelMoves, ls.LevelShift = sim.LevelMoves()
	ls.ImageSpacing = sim.View().Dx
	return updates
}

// swimmerSpan is where the spheres lie on the axis, in the cells of the
// simulation's View.
func swimmerSpan(sim *drive.Simulation) flow.Span {
	sp := flow.Span{Lo: math.Inf(1), Hi: math.Inf(-1)}
	v := float64(sim.ViewCells())
	for k := range sim.Spheres() {
		z, a := sim.SphereCells(k)
		z, a = z/v, a/v
		sp.Lo = math.Min(sp.Lo, z-a)
		sp.Hi = math.Max(sp.Hi, z+a)
		sp.MaxRadius = math.Max(sp.MaxRadius, a)
	}
	return sp
}
