package lbm

import "fmt"

// LevelsState is everything a Levels step reads: each level's lattice
// state, where the refined levels are (MoveAll changes level 1's block)
// and each level's body force of its last collision, which the next
// coarse-to-fine transfer interpolates. Boundary links are not included:
// they follow from the bodies, as for LatticeState.
type LevelsState struct {
	Block1 Block // level 1's block in level 0 (the finer ones never move relative to it)
	Levels []LatticeState
	Force  [][2]float64
	// Rings: each coupling's parent populations of the step before, which
	// Levels.Fields extrapolates from (nil after a move, before a Step)
	Rings []RingState
}

// RingState is a coupling's saved ring: the parent's populations of its
// ring cells at the start of its last step and the force that made them.
type RingState struct {
	Pops  [Q][]float64
	Force [2]float64
}

// Snapshot copies the state of every level.
func (h *Levels) Snapshot() LevelsState {
	st := LevelsState{}
	if len(h.blocks) > 0 {
		st.Block1 = h.blocks[0]
	}
	for _, s := range h.solvers {
		st.Levels = append(st.Levels, s.Snapshot())
		st.Force = append(st.Force, [2]float64{s.gz, s.gr})
	}
	for _, c := range h.links {
		var r RingState
		if c.prevOK {
			for i := range r.Pops {
				r.Pops[i] = append([]float64(nil), c.prev[i][:len(c.ring)]...)
			}
			r.Force = c.prevG
		}
		st.Rings = append(st.Rings, r)
	}
	return st
}

// Restore puts back a state taken by Snapshot from levels of the same
// configuration, moved or not, so that the next Step produces the same bits
// as it would have.
func (h *Levels) Restore(st LevelsState) error {
	if len(st.Levels) != len(h.solvers) || len(st.Force) != len(h.solvers) || len(st.Rings) != len(h.links) {
		return fmt.Errorf("lbm: restore: state of %d levels for %d", len(st.Levels), len(h.solvers))
	}
	for l, s := range h.solvers { // everything checked before anything changes
		if len(st.Levels[l].Solid) != len(s.solid) {
			return fmt.Errorf("lbm: restore level %d: state of %d nodes for a lattice of %d", l, len(st.Levels[l].Solid), len(s.solid))
		}
	}
	c0 := (*coupling)(nil)
	if len(h.blocks) > 0 && st.Block1 != h.blocks[0] {
		b := h.blocks[0]
		if st.Block1.Nz != b.Nz || st.Block1.Nr != b.Nr || st.Block1.R0 != b.R0 {
			return fmt.Errorf("lbm: restore: level 1's block %+v is not this one's %+v moved along z", st.Block1, b)
		}
		cfg, err := childConfig(h.solvers[0].cfg, st.Block1)
		if err != nil || cfg.Open != h.solvers[1].cfg.Open {
			return fmt.Errorf("lbm: restore: level 1's block %+v does not fit these levels", st.Block1)
		}
		c, err := newCoupling(h.solvers[0], h.solvers[1], st.Block1)
		if err != nil {
			return fmt.Errorf("lbm: restore: %w", err)
		}
		c0 = c
	}
	for x, r := range st.Rings {
		c := h.links[x]
		if x == 0 && c0 != nil {
			c = c0
		}
		if r.Pops[0] != nil && len(r.Pops[0]) != len(c.ring) {
			return fmt.Errorf("lbm: restore: ring %d of %d cells for a coupling of %d", x, len(r.Pops[0]), len(c.ring))
		}
	}
	if c0 != nil {
		h.blocks[0], h.links[0] = st.Block1, c0
	}
	for x, r := range st.Rings {
		c := h.links[x]
		c.prevOK = r.Pops[0] != nil
		if c.prevOK {
			for i := range r.Pops {
				copy(c.prev[i], r.Pops[i])
			}
			c.prevG = r.Force
		}
	}
	for l, s := range h.solvers {
		if err := s.Restore(st.Levels[l]); err != nil {
			return fmt.Errorf("lbm: restore level %d: %w", l, err)
		}
		s.SetForce(st.Force[l][0], st.Force[l][1])
	}
	return nil
}
