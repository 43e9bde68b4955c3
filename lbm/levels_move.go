package lbm

import "fmt"

// solidReach is how far from a solid node a body's boundary links read: the
// link's fluid node is next to it, and the interpolation reads up to two
// cells further (SetBoundary).
const solidReach = 3

// MoveAll moves every refined level (1 and finer) by dz cells of level 0
// along z, as one: the liquid stays where it is and the window of fine
// cells moves over it, so a body drifting towards the edge of its fine
// region can be kept inside (issue 17). Level l's populations, solid nodes
// and boundary links move by dz 2^l of its own cells, so every node keeps
// the state of its place in the container; its coordinates change by
// -dz 2^l cells, which the caller's bodies on the level must follow (the
// lattice itself is unchanged where the levels overlapped before and
// after). The cells entering a level are filled from its parent, by the
// coarse-to-fine transfer of the ghost cells (quadratic interpolation,
// rescaled non-equilibrium, the half force exchanged) from the parent's
// populations at the end of the last Step: half a parent step behind the
// level's own, an error of the order of one coarse-to-fine fill in the
// margin where it enters. Level 0's cells that leave the finer level's
// cover keep the values the restriction gave them, which are current.
//
// The move must keep level 1's sides of the same kind (touching the same
// ends as before, at least two level-0 cells from the others), and no
// solid node may come within solidReach cells of a level's open end (a
// body's links would reach its ghosts); MoveAll checks both before it
// changes anything. Levels.Fields right after a move, before the next
// Step, fills the ghosts half a parent step behind (the parent's
// populations of the step before are not kept across a move).
func (h *Levels) MoveAll(dz int) error {
	if dz == 0 || len(h.blocks) == 0 {
		return nil
	}
	b := h.blocks[0]
	nb := b
	nb.Z0 += dz
	p := h.solvers[0]
	cfg, err := childConfig(p.cfg, nb)
	if err != nil {
		return fmt.Errorf("lbm: move the levels by %d cells: %w", dz, err)
	}
	if cfg.Open != h.solvers[1].cfg.Open || cfg.PeriodicZ != h.solvers[1].cfg.PeriodicZ {
		return fmt.Errorf("lbm: move the levels by %d cells: level 1 would touch or leave an end (its sides must keep their kind)", dz)
	}
	for l := 1; l < len(h.solvers); l++ {
		s := h.solvers[l]
		shift := dz << l
		for j := 0; j < s.nr; j++ {
			for k := 0; k < s.nz; k++ {
				if !s.solid[s.idx(k, j)] {
					continue
				}
				// keep the links off an open side's ghosts
				lo, hi := 0, s.nz-1
				if s.cfg.Open&SideZMin != 0 {
					lo = solidReach
				}
				if s.cfg.Open&SideZMax != 0 {
					hi = s.nz - 1 - solidReach
				}
				if k-shift < lo || k-shift > hi {
					return fmt.Errorf("lbm: move the levels by %d cells: level %d's solid node (%d, %d) would come within %d cells of its edge", dz, l, k, j, solidReach)
				}
			}
		}
	}
	h.blocks[0] = nb
	for _, c := range h.links {
		c.prevOK = false // the rings' saved populations no longer match their cells
	}
	for l := 1; l < len(h.solvers); l++ {
		s := h.solvers[l]
		s.shiftWindow(dz << l)
		if l == 1 {
			c, err := newCoupling(p, s, nb)
			if err != nil {
				return fmt.Errorf("lbm: move the levels: %w", err)
			}
			h.links[0] = c
		}
		h.links[l-1].fillEntering(dz << l)
	}
	return nil
}

// shiftWindow moves the lattice's window by shift cells along z: node k
// takes the state of node k + shift (populations, solid flag, boundary
// links); the nodes with no such source are left fluid with their old
// populations, for fillEntering.
func (s *Solver) shiftWindow(shift int) {
	for j := 0; j < s.nr; j++ {
		base := s.idx(0, j)
		if s.single {
			for i := 0; i < Q; i++ {
				shiftRow(s.a32[i][base:base+s.nz], shift)
			}
		} else {
			for i := 0; i < Q; i++ {
				shiftRow(s.a[i][base:base+s.nz], shift)
			}
		}
		shiftRow(s.solid[base:base+s.nz], shift)
		lo, hi := s.nz-shift, s.nz // the entering columns
		if shift < 0 {
			lo, hi = 0, -shift
		}
		clear(s.solid[base+max(lo, 0) : base+min(hi, s.nz)])
		s.resegment(j)
	}
	for _, b := range s.bodies {
		b.touchesEnd = false
		for x := range b.links {
			p := &b.links[x]
			p.dst -= shift
			p.src -= shift
			if p.n1 >= 0 {
				p.n1 -= shift
			}
			if p.n2 >= 0 {
				p.n2 -= shift
			}
			if k := p.dst % s.w; k == 1 || k == s.nz {
				b.touchesEnd = true
			}
		}
	}
	s.haloStale = true
}

// shiftRow sets row[k] = row[k+shift] where k+shift lies in the row.
func shiftRow[T any](row []T, shift int) {
	if shift > 0 {
		copy(row, row[shift:])
	} else {
		copy(row[-shift:], row)
	}
}

// resegment lists row j's fluid runs again (see SetSolid).
func (s *Solver) resegment(j int) {
	s.segs[j] = s.segs[j][:0]
	start := -1
	base := s.idx(0, j)
	for kk := 0; kk <= s.nz; kk++ {
		fluid := kk < s.nz && !s.solid[base+kk]
		switch {
		case fluid && start < 0:
			start = kk
		case !fluid && start >= 0:
			s.segs[j] = append(s.segs[j], [2]int{start, kk})
			start = -1
		}
	}
}

// fillEntering fills the child's cells that a window shift of shift child
// cells brought in (the last shift columns for shift > 0, the first -shift
// for shift < 0) from the parent's current populations, as fillGhosts(1)
// fills the ghosts.
func (cp *coupling) fillEntering(shift int) {
	c, p, b := cp.child, cp.parent, cp.b
	k0, k1 := c.nz-shift, c.nz
	if shift < 0 {
		k0, k1 = 0, -shift
	}
	rlo := 0
	if p.cfg.Open&SideAxis == 0 {
		rlo = -2
	}
	var v [Q]float64
	for j := 0; j < c.nr; j++ {
		y := float64(b.R0) + (float64(j)+0.5)/2
		jr, wr := stencil1(y, rlo, p.nr-1, p.nr, false)
		for k := k0; k < k1; k++ {
			x := float64(b.Z0) + (float64(k)+0.5)/2
			kz, wz := stencil1(x, 0, p.nz-1, p.nz, p.cfg.PeriodicZ)
			for i := 0; i < Q; i++ {
				var sum float64
				for a := 0; a < 3; a++ {
					for d := 0; d < 3; d++ {
						kk, jj, di := kz+d, jr+a, i
						if p.cfg.PeriodicZ {
							kk = (kk%p.nz + p.nz) % p.nz
						}
						if jj < 0 {
							jj, di = -1-jj, Mirror[i]
						}
						sum += wz[d] * wr[a] * p.pop(di, p.idx(kk, jj))
					}
				}
				v[i] = sum
			}
			r := float64(p.cfg.RowOffset) + y
			cp.down.apply(&v, p.gz, p.gr, r)
			n := c.idx(k, j)
			for i := 0; i < Q; i++ {
				c.setPop(i, n, v[i])
			}
		}
	}
}
