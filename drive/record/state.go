package record

import (
	"axiswim/drive"
	"axiswim/output"
)

// The parts of a run's checkpoint that the record keeps: the period
// record, the field averages and the picture frames. Field names are
// those of the checkpoint format (CheckpointVersion in drive/run): gob
// matches fields by name, so renaming one changes the format.

// PeriodsState is the period record of a checkpoint.
type PeriodsState struct {
	N           int
	Drive, Ramp complex128
	Ext, Body   []complex128
	Lo, Hi, Z0  []float64
	Centroids   []float64
	Rows        []RowState
	// several swimmers (absent from checkpoints of earlier versions)
	Swim, Gaps [][]float64
	GapMin     []float64
	MinGap     float64
	MinPair    [2]int
	HasMinGap  bool
}

// RowState is one closed period of a PeriodsState.
type RowState struct {
	Period                    int
	Time, Centroid, Displ     float64
	ExtAmp, ExtPhase, BodyAmp []float64
	BodyPhase                 []float64
	Swim, Gaps                []float64
}

// AverageState is one field average of a FieldsState.
type AverageState struct {
	Uz, Ur, Rho []float64
	Samples     int
	Covered     []bool
}

// FieldsState is the field record of a checkpoint.
type FieldsState struct {
	Mean   AverageState
	Phase  []AverageState
	Snaps  []output.CollectionEntry
	Frames []FrameState
	// refined levels: the fine window's average and the window (Z0, Nz,
	// Nr; absent before its first sample and from earlier checkpoints)
	Fine       *AverageState
	FineWindow [3]int
}

// FrameState is one picture frame of a FieldsState.
type FrameState struct {
	Field, Psi []float64
	Spheres    []output.Circle
	Boxes      []output.Box
	Title      string
}

// Capture returns the record's state.
func (p *Periods) Capture() *PeriodsState {
	t := &PeriodsState{N: p.n, Drive: p.drive, Ramp: p.ramp,
		Ext: append([]complex128(nil), p.ext...), Body: append([]complex128(nil), p.body...),
		Lo: append([]float64(nil), p.lo...), Hi: append([]float64(nil), p.hi...), Z0: append([]float64(nil), p.z0...),
		Centroids: append([]float64(nil), p.centroids...)}
	for _, r := range p.rows {
		t.Rows = append(t.Rows, RowState{Period: r.Period, Time: r.Time, Centroid: r.Centroid, Displ: r.Displacement,
			ExtAmp: r.ExtAmp, ExtPhase: r.ExtPhase, BodyAmp: r.BodyAmp, BodyPhase: r.BodyPhase, Swim: r.Swim, Gaps: r.Gaps})
	}
	t.Swim, t.Gaps = cloneRows(p.swim), cloneRows(p.gaps)
	t.GapMin = append([]float64(nil), p.gapMin...)
	t.MinGap, t.MinPair, t.HasMinGap = p.minGap, p.minPair, true
	return t
}

func cloneRows(x [][]float64) [][]float64 {
	var out [][]float64
	for _, r := range x {
		out = append(out, append([]float64(nil), r...))
	}
	return out
}

// Restore puts a captured state back.
func (p *Periods) Restore(t *PeriodsState) {
	p.n, p.drive, p.ramp = t.N, t.Drive, t.Ramp
	copy(p.ext, t.Ext)
	copy(p.body, t.Body)
	copy(p.lo, t.Lo)
	copy(p.hi, t.Hi)
	copy(p.z0, t.Z0)
	p.centroids = append([]float64(nil), t.Centroids...)
	p.rows = nil
	for _, r := range t.Rows {
		p.rows = append(p.rows, Row{Period: r.Period, Time: r.Time, Centroid: r.Centroid, Displacement: r.Displ,
			ExtAmp: r.ExtAmp, ExtPhase: r.ExtPhase, BodyAmp: r.BodyAmp, BodyPhase: r.BodyPhase, Swim: r.Swim, Gaps: r.Gaps})
	}
	if len(t.Swim) == len(p.swim) {
		p.swim, p.gaps = cloneRows(t.Swim), cloneRows(t.Gaps)
		copy(p.gapMin, t.GapMin)
	}
	if t.HasMinGap {
		p.minGap, p.minPair = t.MinGap, t.MinPair
	}
}

func (a *fieldAverage) capture() AverageState {
	return AverageState{Uz: append([]float64(nil), a.uz...), Ur: append([]float64(nil), a.ur...),
		Rho: append([]float64(nil), a.rho...), Samples: a.samples, Covered: append([]bool(nil), a.covered...)}
}

func (a *fieldAverage) restore(s AverageState) {
	copy(a.uz, s.Uz)
	copy(a.ur, s.Ur)
	copy(a.rho, s.Rho)
	copy(a.covered, s.Covered)
	a.samples = s.Samples
}

// Capture returns the record's state.
func (r *Fields) Capture() *FieldsState {
	st := &FieldsState{Mean: r.mean.capture(), Snaps: append([]output.CollectionEntry(nil), r.snaps...)}
	for _, p := range r.phase {
		st.Phase = append(st.Phase, p.capture())
	}
	for _, f := range r.frames {
		st.Frames = append(st.Frames, FrameState{Field: f.Field, Psi: f.Psi, Spheres: f.Spheres, Boxes: f.Boxes, Title: f.Title})
	}
	if r.fine != nil {
		a := r.fine.capture()
		st.Fine, st.FineWindow = &a, [3]int{r.win.Z0, r.win.Nz, r.win.Nr}
	}
	return st
}

// Restore puts a captured state back.
func (r *Fields) Restore(st *FieldsState) {
	r.mean.restore(st.Mean)
	for i, p := range r.phase {
		if i < len(st.Phase) {
			p.restore(st.Phase[i])
		}
	}
	r.snaps = append([]output.CollectionEntry(nil), st.Snaps...)
	r.fine = nil
	if st.Fine != nil {
		r.win = drive.Window{Z0: st.FineWindow[0], Nz: st.FineWindow[1], Nr: st.FineWindow[2]}
		r.fine = newFieldAverage(r.win.Nz, r.win.Nr)
		r.fine.restore(*st.Fine)
	}
	r.frames = nil
	for _, f := range st.Frames {
		r.frames = append(r.frames, output.FieldPicture{Nz: r.sim.View().Nz, Nr: r.sim.View().Nr,
			Field: f.Field, Odd: true, Diverging: true, Psi: f.Psi, Spheres: f.Spheres, Boxes: f.Boxes, Title: f.Title,
			Label: "vorticity (1/s)"})
	}
}
