package lbm

import "math"

// FluidDensity returns the mean density of the fluid over all levels, the
// mass of Mass over the fluid's volume (each region counted on the finest
// level that covers it, with the same weights): the quantity a global mass
// correction holds (METHODS.md 6.3), as Solver.FluidDensity is on one
// lattice.
func (h *Levels) FluidDensity() float64 {
	return h.Mass() / h.volume()
}

// volume is the denominator of FluidDensity: sum over the fluid nodes that
// no finer level covers of 2 pi r dA (planar: dA), level 0's units.
func (h *Levels) volume() float64 {
	var v float64
	for l, s := range h.solvers {
		scale := math.Ldexp(1, -l)
		for j := 0; j < s.nr; j++ {
			var row float64
			for k := 0; k < s.nz; k++ {
				if !h.Covered(l, k, j) && !s.solid[s.idx(k, j)] {
					row++
				}
			}
			w := scale * scale
			if s.cfg.Axisymmetric {
				w *= 2 * math.Pi * s.rows[j].r * scale
			}
			v += row * w
		}
	}
	return v
}

// ShiftDensity adds w_i drho to every fluid node of every level, and to
// the couplings' saved rings (the parent's populations that the next
// transfers interpolate in time), so that the correction is the same
// uniform change of density everywhere and changes no momentum (METHODS.md
// 6.3).
func (h *Levels) ShiftDensity(drho float64) {
	for _, s := range h.solvers {
		s.ShiftDensity(drho)
	}
	for _, c := range h.links {
		if !c.prevOK {
			continue
		}
		for i := 0; i < Q; i++ {
			prev := c.prev[i][:len(c.ring)]
			for m := range prev {
				prev[m] += W[i] * drho
			}
		}
	}
}
