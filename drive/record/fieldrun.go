package record

import (
	"fmt"
	"math"
	"os"
	"path/filepath"

	"axiswim/drive"
	"axiswim/lbm"
	"axiswim/output"
)

// Fields samples the liquid's fields during a periodic run: the
// mean (steady streaming) and phase-averaged fields over the averaging
// window, and instantaneous snapshots at chosen phases of the last
// periods, written as VTK files with a .pvd collection.
type Fields struct {
	sim       *drive.Simulation
	dir       string // run directory
	spp       int    // steps per period
	stride    int    // the simulation's steps per Advance (drive.Simulation.Stride)
	periods   int
	avgStart  int // first period of the averaging window (0-based)
	snapStart int // first period with snapshots
	phases    int // snapshots (and phase averages) per period
	mean      *fieldAverage
	phase     []*fieldAverage
	snaps     []output.CollectionEntry
	frames    []output.FieldPicture // vorticity of the last period's snapshots
	err       error

	// On refined levels, the mean flow over the averaging window on the
	// finest level's region where it was at the window's first sample
	// (drive.Simulation.FineWindow), at the finest spacing: the swimmer's
	// close-up (pictures/mean_vorticity_fine.png, fields/mean_fine.vti).
	win  drive.Window
	fine *fieldAverage

	// scratch of a sample, reused so that sampling allocates nothing
	solid []bool    // nodes inside a body
	body  []float64 // their velocity
	winF  *lbm.Fields
	winS  []bool
	winB  []float64
}

// NewFields starts the field record of a periodic simulation that writes
// into the run directory dir.
func NewFields(sim *drive.Simulation, dir string) *Fields {
	c, l := sim.Case, sim.Lattice
	P := l.Steps / l.StepsPerPeriod
	r := &Fields{sim: sim, dir: dir, spp: l.StepsPerPeriod, periods: P,
		phases: c.Output.SnapshotsPerPeriod, stride: sim.Stride()}
	r.avgStart = analysisStart(P, sim.SkipPeriods())
	if n := c.Output.AveragePeriods; n > 0 {
		r.avgStart = max(0, P-n)
	}
	r.snapStart = max(0, P-c.Output.SnapshotPeriods)
	v := sim.View()
	r.mean = newFieldAverage(v.Nz, v.Nr)
	for i := 0; i < r.phases; i++ {
		r.phase = append(r.phase, newFieldAverage(v.Nz, v.Nr))
	}
	return r
}

// phaseIndex returns which of n evenly spaced phases step s of a period
// is, or -1.
func phaseIndex(s, spp, n int) int {
	if n <= 0 {
		return -1
	}
	for m := 0; m < n; m++ {
		if int(math.Round(float64(m*spp)/float64(n))) == s {
			return m
		}
	}
	return -1
}

// Step looks at the state after lattice step n (1-based) and samples it
// when the schedule asks. After a file could not be written it samples
// no more and returns that error, as do all later calls.
func (r *Fields) Step(n int64) error {
	if r.err != nil {
		return r.err
	}
	p, s := int(n)/r.spp, int(n)%r.spp // period index and step within it
	if p >= r.periods || s%r.stride != 0 {
		return nil
	}
	// On refined levels the fields exist at level 0's steps only: the
	// phases fall on the nearest of them.
	inAvg := p >= r.avgStart
	mi := phaseIndex(s/r.stride, r.spp/r.stride, meanSamplesPerPeriod)
	pi := phaseIndex(s/r.stride, r.spp/r.stride, r.phases)
	snap := p >= r.snapStart && pi >= 0
	if !(inAvg && (mi >= 0 || pi >= 0)) && !snap {
		return nil
	}
	r.sim.Observe()
	f := r.sim.Fields()
	r.solid = r.sim.SolidMask(r.solid)
	r.body = r.sim.BodyVelocity(r.body, r.solid)
	solid, body := r.solid, r.body
	if inAvg && mi >= 0 {
		r.mean.add(f, solid, body)
		if r.sim.Levels() != nil {
			r.addFine()
		}
	}
	if inAvg && pi >= 0 {
		r.phase[pi].add(f, solid, body)
	}
	if snap && p == r.periods-1 && r.sim.Case.Output.Pictures {
		r.frames = append(r.frames, vorticityPicture(r.sim, f, solid, body,
			fmt.Sprintf("vorticity at phase %d/%d of period %d (t = %.4g s)", pi, r.phases, p+1, r.sim.Time())))
	}
	if snap && r.sim.Case.Output.VTK {
		name := fmt.Sprintf("snapshot_p%04d_%02d.vti", p+1, pi)
		if err := r.writeVTI(name, f, solid); err != nil {
			r.err = err
			return err
		}
		r.snaps = append(r.snaps, output.CollectionEntry{Time: r.sim.Time(), File: name})
		if r.sim.Levels() != nil {
			if err := r.writeLevels(fmt.Sprintf("snapshot_p%04d_%02d", p+1, pi)); err != nil {
				r.err = err
				return err
			}
		}
	}
	return nil
}

// addFine adds the present fields of the fine window to its average,
// choosing the window at the first sample.
func (r *Fields) addFine() {
	if r.fine == nil {
		r.win, _ = r.sim.FineWindow()
		r.fine = newFieldAverage(r.win.Nz, r.win.Nr)
	}
	r.winF = r.sim.WindowFields(r.win, r.winF)
	r.winS = r.sim.WindowSolid(r.win, r.winS)
	r.winB = r.sim.WindowBodyVelocity(r.win, r.winB, r.winS)
	r.fine.add(r.winF, r.winS, r.winB)
}

func (r *Fields) fieldsDir() (string, error) {
	d := filepath.Join(r.dir, "fields")
	if err := os.MkdirAll(d, 0o755); err != nil {
		return "", fmt.Errorf("fields: %w", err)
	}
	return d, nil
}

func (r *Fields) writeVTI(name string, f *lbm.Fields, solid []bool) error {
	d, err := r.fieldsDir()
	if err != nil {
		return err
	}
	return output.WriteVTI(filepath.Join(d, name), vtkGrid(r.sim.View()), vtkFields(r.sim, f, solid), r.sim.Case.Output.Mirror)
}

// writeLevels writes the refined levels' fields of the last Observe as
// they are, each level an ImageData file of its own spacing in
// fields/levels/, joined by fields/NAME.vtm (a multiblock data set that
// VTK's readers open as-is, output.WriteVTM): level 0 first, each finer
// level over the part of its parent it covers (the parent's cells there
// hold the restricted values). Nodes inside a body are marked solid, with
// the velocity zero.
func (r *Fields) writeLevels(name string) error {
	d, err := r.fieldsDir()
	if err != nil {
		return err
	}
	if err := os.MkdirAll(filepath.Join(d, "levels"), 0o755); err != nil {
		return fmt.Errorf("fields: %w", err)
	}
	h, l := r.sim.Levels(), r.sim.Lattice
	var blocks []output.BlockEntry
	for lev := range h.Len() {
		f, s := r.sim.LevelFields(lev), h.Level(lev)
		solid := make([]bool, f.Nz*f.Nr)
		for j := range f.Nr {
			for k := range f.Nz {
				solid[f.At(k, j)] = s.Solid(k, j)
			}
		}
		// level lev's cell is 2^(levels-1-lev) finest cells (l's)
		ll := l.Image(1 << (h.Len() - 1 - lev))
		z0, r0 := h.Origin(lev) // level 0's cells
		c0 := float64(int(1) << (h.Len() - 1))
		g := output.Grid{Nz: f.Nz, Nr: f.Nr, Z0: l.ZSI(z0*c0) + 0.5*ll.Dx, R0: l.DistanceSI(r0*c0) + 0.5*ll.Dx, Spacing: ll.Dx}
		file := filepath.Join("levels", fmt.Sprintf("%s_level%d.vti", name, lev))
		if err := output.WriteVTI(filepath.Join(d, file), g, vtkFieldsOn(ll, r.sim.FrameOnLiquid, f, solid, nil), r.sim.Case.Output.Mirror); err != nil {
			return err
		}
		blocks = append(blocks, output.BlockEntry{Name: fmt.Sprintf("level %d", lev), File: file})
	}
	return output.WriteVTM(filepath.Join(d, name+".vtm"), blocks)
}

// Finish writes the averaged fields, the snapshot collection and the
// pictures, and returns the mean field (lattice units) and the nodes a
// body covered, for the flow metrics.
func (r *Fields) Finish() (*lbm.Fields, []bool, error) {
	if r.err != nil {
		return nil, nil, r.err
	}
	mf, mask := r.mean.mean()
	if err := r.writePictures(mf, mask); err != nil {
		return nil, nil, err
	}
	if !r.sim.Case.Output.VTK || r.mean.samples == 0 {
		return mf, mask, nil
	}
	if err := r.writeVTI("mean.vti", mf, mask); err != nil {
		return nil, nil, err
	}
	if r.fine != nil && r.fine.samples > 0 {
		d, err := r.fieldsDir()
		if err != nil {
			return nil, nil, err
		}
		l := r.sim.Lattice
		g := output.Grid{Nz: r.win.Nz, Nr: r.win.Nr, Z0: l.ZSI(float64(r.win.Z0)) + 0.5*l.Dx, R0: 0.5 * l.Dx, Spacing: l.Dx}
		ff, fm := r.fine.mean()
		if err := output.WriteVTI(filepath.Join(d, "mean_fine.vti"), g, vtkFieldsOn(l, r.sim.FrameOnLiquid, ff, fm, nil), r.sim.Case.Output.Mirror); err != nil {
			return nil, nil, err
		}
	}
	var phases []output.CollectionEntry
	T := r.sim.Lattice.TimeSI(float64(r.spp))
	for i, a := range r.phase {
		if a.samples == 0 {
			continue
		}
		f, m := a.mean()
		name := fmt.Sprintf("phase_%02d.vti", i)
		if err := r.writeVTI(name, f, m); err != nil {
			return nil, nil, err
		}
		phases = append(phases, output.CollectionEntry{Time: T * float64(i) / float64(len(r.phase)), File: name})
	}
	d, _ := r.fieldsDir()
	if len(phases) > 0 {
		if err := output.WritePVD(filepath.Join(d, "phases.pvd"), phases); err != nil {
			return nil, nil, err
		}
	}
	if len(r.snaps) > 0 {
		if err := output.WritePVD(filepath.Join(d, "snapshots.pvd"), r.snaps); err != nil {
			return nil, nil, err
		}
	}
	return mf, mask, nil
}

// writePictures writes the mean vorticity with the mean streamlines and
// the frames of the last period, all frames on one colour range and one
// streamline spacing so that they can be played in sequence.
func (r *Fields) writePictures(mf *lbm.Fields, mask []bool) error {
	if !r.sim.Case.Output.Pictures {
		return nil
	}
	d, err := picturesDir(r.dir)
	if err != nil {
		return err
	}
	if r.mean.samples > 0 {
		p := vorticityPicture(r.sim, mf, mask, nil, fmt.Sprintf("mean flow (steady streaming) over periods %d-%d: vorticity and streamlines",
			r.avgStart+1, r.periods))
		if err := output.WriteFieldPNG(filepath.Join(d, "mean_vorticity.png"), p); err != nil {
			return err
		}
	}
	if r.fine != nil && r.fine.samples > 0 {
		ff, fm := r.fine.mean()
		p := finePicture(r.sim, r.win, ff, fm, fmt.Sprintf("mean flow near the swimmer at the finest spacing over periods %d-%d: vorticity and streamlines, refined levels dashed",
			r.avgStart+1, r.periods))
		if err := output.WriteFieldPNG(filepath.Join(d, "mean_vorticity_fine.png"), p); err != nil {
			return err
		}
	}
	if len(r.frames) == 0 {
		return nil
	}
	var rng, step float64
	for i := range r.frames {
		rng = math.Max(rng, r.frames[i].ColorRange())
		step = math.Max(step, r.frames[i].ContourStep())
	}
	fd := filepath.Join(d, "frames")
	if err := os.MkdirAll(fd, 0o755); err != nil {
		return fmt.Errorf("pictures: %w", err)
	}
	for i := range r.frames {
		r.frames[i].Range, r.frames[i].PsiStep = rng, step
		if err := output.WriteFieldPNG(filepath.Join(fd, fmt.Sprintf("frame_%02d.png", i)), r.frames[i]); err != nil {
			return err
		}
	}
	return nil
}

// Averaged returns the periods of the averaging window (first 0-based,
// last 1-based) and the number of samples of the mean so far.
func (r *Fields) Averaged() (first, last, samples int) { return r.avgStart, r.periods, r.mean.samples }
