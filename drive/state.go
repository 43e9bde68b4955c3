package drive

import (
	"fmt"

	"axiswim/lbm"
)

// State is everything of a simulation that a checkpoint keeps to continue
// bit for bit: the lattice (or, on refined levels, the levels), the bodies
// and the mass keeper.
type State struct {
	Lattice lbm.LatticeState
	Levels  *lbm.LevelsState // refined levels; nil on one lattice
	// LevelMoves and LevelShift count the refined levels' moves with the
	// spheres and their sum in level 0's cells (Simulation.LevelMoves).
	LevelMoves, LevelShift int
	Bodies                 []BodyState
	Mass                   MassState
	Mass0                  float64
}

// BodyState is one body's part of a State.
type BodyState struct {
	Z, V, VPrev                       float64
	LinkForce, NodeForce, NodeImpulse float64
	Spread                            []float64
	Tick, Covered, Uncovered          int
}

// MassState is the mass keeper's part of a State.
type MassState struct {
	Every          int
	Rho0           float64
	Drift, Applied float64
	N              int
}

// Capture returns the simulation's state.
func (s *Simulation) Capture() State {
	var st State
	if s.lv != nil {
		ls := s.lv.h.Snapshot()
		st.Levels = &ls
		st.LevelMoves, st.LevelShift = s.lv.moves, s.lv.shift
	} else {
		st.Lattice = s.Fluid.Snapshot()
	}
	st.Mass0 = s.mass0
	if s.sw == nil {
		return st
	}
	d := s.sw.dyn
	for k, b := range s.sw.bodies.List {
		st.Bodies = append(st.Bodies, BodyState{Z: d.Z[k], V: d.V[k], VPrev: d.VPrev[k],
			LinkForce: b.LinkForce, NodeForce: b.NodeForce, NodeImpulse: b.NodeImpulse,
			Spread: append([]float64(nil), b.spread...), Tick: b.tick, Covered: b.Covered, Uncovered: b.Uncovered})
	}
	m := s.sw.mass
	st.Mass = MassState{Every: m.Every, Rho0: m.Rho0, Drift: m.Drift, Applied: m.Applied, N: m.n}
	return st
}

// Restore puts a captured state back into a simulation freshly set up
// from the same case.
func (s *Simulation) Restore(st State) error {
	switch {
	case s.lv != nil && st.Levels == nil:
		return fmt.Errorf("the state is of one lattice, the case has %d levels", s.lv.h.Len())
	case s.lv == nil && st.Levels != nil:
		return fmt.Errorf("the state is of %d refined levels, the case has one lattice", len(st.Levels.Levels))
	case s.lv != nil:
		if err := s.lv.h.Restore(*st.Levels); err != nil {
			return err
		}
		s.lv.moved()
		s.lv.moves, s.lv.shift = st.LevelMoves, st.LevelShift
	default:
		if err := s.Fluid.Restore(st.Lattice); err != nil {
			return err
		}
	}
	s.mass0 = st.Mass0
	if s.sw == nil {
		return nil
	}
	if len(st.Bodies) != len(s.sw.bodies.List) {
		return fmt.Errorf("checkpoint has %d spheres, the case %d", len(st.Bodies), len(s.sw.bodies.List))
	}
	d := s.sw.dyn
	off := float64(s.zoff())
	for k, b := range s.sw.bodies.List {
		bs := st.Bodies[k]
		d.Z[k], d.V[k], d.VPrev[k] = bs.Z, bs.V, bs.VPrev
		b.Shape.Z, b.V = bs.Z-off, bs.V
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

// Steps is the step count of the state: the lattice's, or on refined levels
// the finest level's (the steps of Simulation.Step).
func (st State) Steps() int64 {
	if st.Levels != nil {
		return st.Levels.Levels[len(st.Levels.Levels)-1].Steps
	}
	return st.Lattice.Steps
}
