package drive

import (
	"fmt"

	"axiswim/output"
)

// simState captures the simulation: lattice, bodies, mass keeper.
func (s *Simulation) capture(st *runState) {
	st.Lattice = s.Fluid.Snapshot()
	st.Mass0 = s.mass0
	if s.sw == nil {
		return
	}
	d := s.sw.dyn
	for k, b := range s.sw.bodies.List {
		st.Bodies = append(st.Bodies, bodyState{Z: d.Z[k], V: d.V[k], VPrev: d.VPrev[k],
			LinkForce: b.LinkForce, NodeForce: b.NodeForce, NodeImpulse: b.NodeImpulse,
			Spread: append([]float64(nil), b.spread...), Tick: b.tick, Covered: b.Covered, Uncovered: b.Uncovered})
	}
	m := s.sw.mass
	st.Mass = massState{Every: m.Every, Rho0: m.Rho0, Drift: m.Drift, Applied: m.Applied, N: m.n}
}

// restore puts a captured state back into a simulation freshly set up from
// the same case.
func (s *Simulation) restore(st *runState) error {
	if err := s.Fluid.Restore(st.Lattice); err != nil {
		return err
	}
	s.mass0 = st.Mass0
	if s.sw == nil {
		return nil
	}
	if len(st.Bodies) != len(s.sw.bodies.List) {
		return fmt.Errorf("checkpoint has %d spheres, the case %d", len(st.Bodies), len(s.sw.bodies.List))
	}
	d := s.sw.dyn
	for k, b := range s.sw.bodies.List {
		bs := st.Bodies[k]
		d.Z[k], d.V[k], d.VPrev[k] = bs.Z, bs.V, bs.VPrev
		b.Shape.Z, b.V = bs.Z, bs.V
		b.LinkForce, b.NodeForce, b.NodeImpulse = bs.LinkForce, bs.NodeForce, bs.NodeImpulse
		b.spread, b.tick = append([]float64(nil), bs.Spread...), bs.Tick
		b.Covered, b.Uncovered = bs.Covered, bs.Uncovered
	}
	for k := range s.sw.bodies.List {
		if err := s.sw.bodies.relink(k); err != nil {
			return err
		}
	}
	m := s.sw.mass
	m.Every, m.Rho0, m.Drift, m.Applied, m.n = st.Mass.Every, st.Mass.Rho0, st.Mass.Drift, st.Mass.Applied, st.Mass.N
	return nil
}

func (p *periodTracker) capture() *trackerState {
	t := &trackerState{N: p.n, Drive: p.drive, Ramp: p.ramp,
		Ext: append([]complex128(nil), p.ext...), Body: append([]complex128(nil), p.body...),
		Lo: append([]float64(nil), p.lo...), Hi: append([]float64(nil), p.hi...), Z0: append([]float64(nil), p.z0...),
		Centroids: append([]float64(nil), p.Centroids...)}
	for _, r := range p.rows {
		t.Rows = append(t.Rows, rowState{Period: r.period, Time: r.time, Centroid: r.centroid, Displ: r.displacement,
			ExtAmp: r.extAmp, ExtPhase: r.extPhase, BodyAmp: r.bodyAmp, BodyPhase: r.bodyPhas, Swim: r.swim, Gaps: r.gaps})
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

func (p *periodTracker) restore(t *trackerState) {
	p.n, p.drive, p.ramp = t.N, t.Drive, t.Ramp
	copy(p.ext, t.Ext)
	copy(p.body, t.Body)
	copy(p.lo, t.Lo)
	copy(p.hi, t.Hi)
	copy(p.z0, t.Z0)
	p.Centroids = append([]float64(nil), t.Centroids...)
	p.rows = nil
	for _, r := range t.Rows {
		p.rows = append(p.rows, periodRow{period: r.Period, time: r.Time, centroid: r.Centroid, displacement: r.Displ,
			extAmp: r.ExtAmp, extPhase: r.ExtPhase, bodyAmp: r.BodyAmp, bodyPhas: r.BodyPhase, swim: r.Swim, gaps: r.Gaps})
	}
	if len(t.Swim) == len(p.swim) {
		p.swim, p.gaps = cloneRows(t.Swim), cloneRows(t.Gaps)
		copy(p.gapMin, t.GapMin)
	}
	if t.HasMinGap {
		p.minGap, p.minPair = t.MinGap, t.MinPair
	}
}

func (a *fieldAverage) capture() averageState {
	return averageState{Uz: append([]float64(nil), a.uz...), Ur: append([]float64(nil), a.ur...),
		Rho: append([]float64(nil), a.rho...), Samples: a.samples, Covered: append([]bool(nil), a.covered...)}
}

func (a *fieldAverage) restore(s averageState) {
	copy(a.uz, s.Uz)
	copy(a.ur, s.Ur)
	copy(a.rho, s.Rho)
	copy(a.covered, s.Covered)
	a.samples = s.Samples
}

func (r *fieldRecorder) capture() *recorderState {
	st := &recorderState{Mean: r.mean.capture(), Snaps: append([]output.CollectionEntry(nil), r.snaps...)}
	for _, p := range r.phase {
		st.Phase = append(st.Phase, p.capture())
	}
	for _, f := range r.frames {
		st.Frames = append(st.Frames, frameState{Field: f.Field, Psi: f.Psi, Spheres: f.Spheres, Title: f.Title})
	}
	return st
}

func (r *fieldRecorder) restore(st *recorderState) {
	r.mean.restore(st.Mean)
	for i, p := range r.phase {
		if i < len(st.Phase) {
			p.restore(st.Phase[i])
		}
	}
	r.snaps = append([]output.CollectionEntry(nil), st.Snaps...)
	r.frames = nil
	for _, f := range st.Frames {
		r.frames = append(r.frames, output.FieldPicture{Nz: r.sim.Lattice.Nz, Nr: r.sim.Lattice.Nr,
			Field: f.Field, Odd: true, Diverging: true, Psi: f.Psi, Spheres: f.Spheres, Title: f.Title,
			Label: "vorticity (1/s)"})
	}
}
