package lbm

import "math"

// Origin returns where level l's first cell begins, along z and r, in
// level 0's cells.
func (h *Levels) Origin(l int) (z, r float64) {
	for m := 0; m < l; m++ {
		z += math.Ldexp(float64(h.blocks[m].Z0), -m)
	}
	return z, math.Ldexp(float64(h.solvers[l].cfg.RowOffset), -l)
}

// Sample computes the fields of every level (Levels.Fields) and
// interpolates them onto a uniform image of nz x nr nodes of the given
// spacing (in level 0's cells), node (k, j) at z = (k + 1/2) spacing,
// r = (j + 1/2) spacing, into dst (allocated when nil): each node takes
// the bilinear interpolation of the finest level whose four nodes around
// it lie on that level (mirrored across the axis below its first row:
// u_r odd, the rest even), so that every value comes from the finest
// spacing that holds it and no interpolation reaches past a level's open
// edge; between a physical side (an end, the wall) and the nodes next to
// it, the last two nodes extrapolate linearly. Solid nodes are read as
// Fields gives them (zero). levels, when not nil, gets the level each node
// came from (-1 for a node outside level 0's nodes and sides).
func (h *Levels) Sample(nz, nr int, spacing float64, dst *Fields, levels []int8) *Fields {
	fs := make([]*Fields, h.Len())
	for l := range fs {
		fs[l] = h.Fields(l, nil)
	}
	return h.SampleFrom(fs, nz, nr, spacing, dst, levels)
}

// SampleFrom is Sample from fields fs[l] of each level l that the caller
// computed (Levels.Fields) or averaged over time: the same interpolation,
// with the levels where they are now.
func (h *Levels) SampleFrom(fs []*Fields, nz, nr int, spacing float64, dst *Fields, levels []int8) *Fields {
	return h.SampleWindow(fs, 0, nz, nr, spacing, dst, levels)
}

// SampleWindow is SampleFrom onto an image that starts at zStart (level 0's
// cells) along the axis: node (k, j) at z = zStart + (k + 1/2) spacing,
// r = (j + 1/2) spacing. A window on part of the container, such as the
// finest level's region at its own spacing.
func (h *Levels) SampleWindow(fs []*Fields, zStart float64, nz, nr int, spacing float64, dst *Fields, levels []int8) *Fields {
	if dst == nil || dst.Nz != nz || dst.Nr != nr {
		dst = NewFields(nz, nr)
	}
	for j := 0; j < nr; j++ {
		r := (float64(j) + 0.5) * spacing
		for k := 0; k < nz; k++ {
			z := zStart + (float64(k)+0.5)*spacing
			done := false
			for l := h.Len() - 1; l >= 0 && !done; l-- {
				z0, r0 := h.Origin(l)
				scale := math.Ldexp(1, l) // level l's cells per level-0 cell
				x := (z-z0)*scale - 0.5   // in level l's node indices
				y := (r-r0)*scale - 0.5
				f := fs[l]
				cfg := h.solvers[l].cfg
				k0, j0 := int(math.Floor(x)), int(math.Floor(y))
				// Inside the level's nodes, or beyond its outermost ones by
				// less than a cell towards one of its physical sides (an end,
				// the wall), where the last two nodes extrapolate linearly.
				// Below the first row on the axis the mirror image is used.
				switch {
				case cfg.PeriodicZ:
				case k0 < 0 && k0 >= -1 && cfg.Open&SideZMin == 0:
					k0 = 0
				case k0 >= f.Nz-1 && k0 < f.Nz && cfg.Open&SideZMax == 0:
					k0 = f.Nz - 2
				case k0 < 0 || k0+1 >= f.Nz:
					continue
				}
				axis := cfg.RowOffset == 0 && cfg.Open&SideAxis == 0
				switch {
				case j0 == -1 && axis:
				case j0 >= f.Nr-1 && j0 < f.Nr && cfg.Open&SideWall == 0:
					j0 = f.Nr - 2
				case j0 < 0 || j0+1 >= f.Nr:
					continue
				}
				tx, ty := x-float64(k0), y-float64(j0)
				var rho, uz, ur float64
				for b := 0; b < 2; b++ {
					for a := 0; a < 2; a++ {
						wz, wr := 1-tx, 1-ty
						if a == 1 {
							wz = tx
						}
						if b == 1 {
							wr = ty
						}
						w := wz * wr
						kk, jj, sign := k0+a, j0+b, 1.0
						if cfg.PeriodicZ {
							kk = (kk%f.Nz + f.Nz) % f.Nz
						}
						if jj < 0 {
							jj, sign = -1-jj, -1
						}
						n := f.At(kk, jj)
						rho += w * f.Rho[n]
						uz += w * f.Uz[n]
						ur += w * sign * f.Ur[n]
					}
				}
				o := dst.At(k, j)
				dst.Rho[o], dst.Uz[o], dst.Ur[o] = rho, uz, ur
				if levels != nil {
					levels[o] = int8(l)
				}
				done = true
			}
			if !done && levels != nil {
				levels[dst.At(k, j)] = -1
			}
		}
	}
	return dst
}
