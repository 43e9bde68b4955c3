package lbm

import (
	"fmt"
	"math"
)

// SetSolid marks node (k, j) as solid (inside a body) or fluid. Solid nodes
// are skipped by the kernel; their populations are only the values that
// boundary links write for their fluid neighbours. Call Refill for nodes
// that become fluid, and NodeMomentum before marking a fluid node solid.
func (s *Solver) SetSolid(k, j int, solid bool) {
	n := s.idx(k, j)
	if s.solid[n] == solid {
		return
	}
	s.solid[n] = solid
	s.resegment(j)
}

// Solid reports whether node (k, j) is solid.
func (s *Solver) Solid(k, j int) bool { return s.solid[s.idx(k, j)] }

// NodeMomentum returns the axial momentum of the post-collision
// populations of node (k, j) times its ring 2 pi r (lattice units): what a
// body covering the node takes from the fluid (Aidun, Lu & Ding 1998,
// J. Fluid Mech. 373, 287; METHODS.md 7.3).
func (s *Solver) NodeMomentum(k, j int) float64 {
	n := s.idx(k, j)
	var mz float64
	for i := 1; i < Q; i++ {
		mz += float64(Ez[i]) * s.pop(i, n)
	}
	return 2 * math.Pi * s.rows[j].r * mz
}

// Fresh is a node that a body has just uncovered: its position, the body's
// outward normal there and the wall velocity.
type Fresh struct {
	K, J   int
	Nz, Nr float64 // outward unit normal of the body at the node
	Uz, Ur float64 // wall velocity (lattice units)
}

// Refill gives newly uncovered nodes their populations and returns the
// ring-weighted axial momentum they received (lattice units), which the
// body gives up. The nodes must already be marked fluid.
//
// The scheme is the equilibrium at the wall velocity plus the
// non-equilibrium part of the neighbour along the lattice direction
// closest to the outward normal (Caiazzo 2008, Prog. Comput. Fluid Dyn. 8,
// 3, built on the non-equilibrium extrapolation of Guo, Zheng & Shi 2002,
// Chin. Phys. 11, 366; METHODS.md 6.2 option 3):
//
//	f_i(x) = f_i^eq(rho_n, u_w) + [f_i(x + e_k) - f_i^eq(rho_n, u_n)],
//
// with rho_n and u_n the moments of the neighbour's post-collision
// populations, so that the refilled node carries exactly mass rho_n and
// momentum rho_n u_w. Without a fluid neighbour it falls back to the
// equilibrium at unit density (METHODS.md 6.2 option 1).
func (s *Solver) Refill(nodes []Fresh) float64 {
	var total float64
	for _, f := range nodes {
		n := s.idx(f.K, f.J)
		if f.K == 0 || f.K == s.nz-1 {
			s.haloStale = true // the end ghosts copy this node
		}
		best, bn, bmirror := -2.0, -1, false
		for i := 1; i < Q; i++ {
			nn, d, ok := s.fluidAt(f.K+Ez[i], f.J+Er[i], i)
			if !ok || s.isFresh(nodes, nn) {
				continue
			}
			c := (f.Nz*float64(Ez[i]) + f.Nr*float64(Er[i])) / math.Hypot(float64(Ez[i]), float64(Er[i]))
			if c > best {
				best, bn, bmirror = c, nn, d != i
			}
		}
		var g [Q]float64
		rho := 1.0
		if bn >= 0 {
			for i := 0; i < Q; i++ {
				src := i
				if bmirror {
					src = Mirror[i]
				}
				g[i] = s.pop(src, bn)
			}
			var drho, jz, jr float64
			for i := 0; i < Q; i++ {
				drho += g[i]
				jz += float64(Ez[i]) * g[i]
				jr += float64(Er[i]) * g[i]
			}
			rho = 1 + drho
			un, vn := jz/rho, jr/rho
			for i := 0; i < Q; i++ {
				g[i] -= feqDeviation(i, rho, un, vn)
			}
		}
		var mz float64
		for i := 0; i < Q; i++ {
			s.setPop(i, n, feqDeviation(i, rho, f.Uz, f.Ur)+g[i])
			mz += float64(Ez[i]) * s.pop(i, n) // the stored value
		}
		total += 2 * math.Pi * s.rows[f.J].r * mz
	}
	return total
}

// isFresh reports whether storage index n is one of the nodes being
// refilled, which cannot serve as a neighbour. A move uncovers a handful
// of nodes per body and step (at most about two per row of the body: the
// wall CFL limit keeps a move below one cell), so a linear search costs
// less than building a set, and it allocates nothing.
func (s *Solver) isFresh(nodes []Fresh, n int) bool {
	for _, f := range nodes {
		if s.idx(f.K, f.J) == n {
			return true
		}
	}
	return false
}

// feqDeviation is f_i^eq(rho, u) - w_i (METHODS.md 1.2).
func feqDeviation(i int, rho, uz, ur float64) float64 {
	eu := float64(Ez[i])*uz + float64(Er[i])*ur
	return W[i] * ((rho - 1) + rho*(3*eu+4.5*eu*eu-1.5*(uz*uz+ur*ur)))
}

// FluidDensity returns the mean density of the fluid, sum 2 pi r rho over
// sum 2 pi r on the fluid nodes, from the post-collision populations.
func (s *Solver) FluidDensity() float64 {
	return s.sumRows(task{fn: fluidMassRows}) / s.fluidVolume()
}

// fluidVolume is the denominator of FluidDensity, sum over fluid nodes of
// r, added row by row in row order. It reads only the fluid runs, so it
// is done on the calling goroutine.
func (s *Solver) fluidVolume() float64 {
	var vol float64
	for j := range s.segs {
		var v float64
		for _, seg := range s.segs[j] {
			v += float64(seg[1] - seg[0])
		}
		vol += v * s.rows[j].r
	}
	return vol
}

func fluidMassRows(t *task, lo, hi, _ int) {
	for j := lo; j < hi; j++ {
		t.s.rowSum[j] = t.s.fluidMassRow(j)
	}
}

// fluidMassRow is row j's share of the numerator of FluidDensity:
// r sum over its fluid nodes of rho.
func (s *Solver) fluidMassRow(j int) float64 {
	var m float64
	base := s.idx(0, j)
	for _, seg := range s.segs[j] {
		for n := base + seg[0]; n < base+seg[1]; n++ {
			var d float64
			for i := 0; i < Q; i++ {
				d += s.pop(i, n)
			}
			m += 1 + d
		}
	}
	return m * s.rows[j].r
}

// ShiftDensity adds w_i drho to every fluid node: a global mass correction
// that changes the density and not the momentum (METHODS.md 6.3).
func (s *Solver) ShiftDensity(drho float64) {
	s.haloStale = true
	s.runRows(task{x: drho, fn: shiftRows})
}

func shiftRows(t *task, lo, hi, _ int) {
	s, drho := t.s, t.x
	for j := lo; j < hi; j++ {
		base := s.idx(0, j)
		for _, seg := range s.segs[j] {
			for i := 0; i < Q; i++ {
				if s.single {
					shift(s.a32[i][base+seg[0]:base+seg[1]], W[i]*drho)
				} else {
					shift(s.a[i][base+seg[0]:base+seg[1]], W[i]*drho)
				}
			}
		}
	}
}

// shift adds w to every value of p (in float64, then stored).
func shift[T real](p []T, w float64) {
	for x := range p {
		p[x] = T(float64(p[x]) + w)
	}
}

// LatticeState is everything a Step reads of the lattice: the
// post-collision populations (with the halo), the solid flags and the step
// count. Boundary links are not included: they follow from the bodies.
type LatticeState struct {
	Steps int64
	Pops  [Q][]float64
	Solid []bool
}

// Snapshot copies the lattice state.
func (s *Solver) Snapshot() LatticeState {
	st := LatticeState{Steps: s.steps, Solid: append([]bool(nil), s.solid...)}
	for i := range st.Pops {
		st.Pops[i] = s.plane(i)
	}
	return st
}

// Restore puts back a state taken by Snapshot from a lattice of the same
// size, so that the next Step produces the same bits as it would have.
func (s *Solver) Restore(st LatticeState) error {
	s.haloStale = true
	if len(st.Solid) != len(s.solid) {
		return fmt.Errorf("lbm: restore: state of %d nodes for a lattice of %d", len(st.Solid), len(s.solid))
	}
	for i := range st.Pops {
		if len(st.Pops[i]) != s.planeLen() {
			return fmt.Errorf("lbm: restore: plane %d has %d values, want %d", i, len(st.Pops[i]), s.planeLen())
		}
		if s.single {
			for n, v := range st.Pops[i] {
				s.a32[i][n] = float32(v) // exact: the values were float32
			}
		} else {
			copy(s.a[i], st.Pops[i])
		}
	}
	s.steps = st.Steps
	for j := 0; j < s.nr; j++ {
		for k := 0; k < s.nz; k++ {
			n := s.idx(k, j)
			if s.solid[n] != st.Solid[n] {
				s.SetSolid(k, j, st.Solid[n])
			}
		}
	}
	return nil
}
