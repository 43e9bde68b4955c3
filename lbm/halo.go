package lbm

// fillHalo writes into the halo of the post-collision lattice f the values
// that the pull step will read there, so that the kernel itself needs no
// boundary branches:
//
//   - axis (ghost row j = -1): the mirror image of row 0, f_i(k,-1) =
//     f_{mirror(i)}(k,0), specular reflection at r = 0 (METHODS.md 3.5.1);
//   - ends: a periodic copy, or halfway bounce-back;
//   - side wall (ghost row j = Nr): halfway bounce-back.
//
// Halfway bounce-back (Ladd 1994, J. Fluid Mech. 271, 285) in a pull scheme
// reads f_i(x, t+1) = f*_{opp(i)}(x, t) when x - e_i is a wall node; each
// (wall node, direction) pair feeds exactly one fluid node, so it is written
// as the ghost value f_i(g) = f*_{opp(i)}(g + e_i). Walls override the axis
// at the corners. The cost is proportional to the perimeter.
func (s *Solver) fillHalo() {
	if s.single {
		fillHalo(s, &s.a32)
	} else {
		fillHalo(s, &s.a)
	}
}

func fillHalo[T real](s *Solver, f *[Q][]T) {
	nz, nr := s.nz, s.nr
	// Axis: only directions entering row 0 from below are read (e_r = +1).
	for _, i := range [...]int{2, 5, 6} {
		m := Mirror[i]
		g := f[i][s.idx(0, -1) : s.idx(0, -1)+nz]
		src := f[m][s.idx(0, 0) : s.idx(0, 0)+nz]
		copy(g, src)
	}
	if s.cfg.PeriodicZ {
		for j := -1; j <= nr; j++ {
			for _, i := range [...]int{1, 5, 8} {
				f[i][s.idx(-1, j)] = f[i][s.idx(nz-1, j)]
			}
			for _, i := range [...]int{3, 6, 7} {
				f[i][s.idx(nz, j)] = f[i][s.idx(0, j)]
			}
		}
	} else {
		for j := -1; j <= nr; j++ {
			for _, i := range [...]int{1, 5, 8} { // left end, e_z = +1
				if jd := j + Er[i]; jd >= 0 && jd < nr {
					f[i][s.idx(-1, j)] = f[Opp[i]][s.idx(0, jd)]
				}
			}
			for _, i := range [...]int{3, 6, 7} { // right end, e_z = -1
				if jd := j + Er[i]; jd >= 0 && jd < nr {
					f[i][s.idx(nz, j)] = f[Opp[i]][s.idx(nz-1, jd)]
				}
			}
		}
	}
	// Side wall, e_r = -1 directions leave the ghost row toward row Nr-1:
	// f_i(k, Nr) = f*_opp(i)(k + e_iz, Nr-1) for every k with k + e_iz a
	// node, one contiguous copy per direction (i = 4, 7, 8: e_z = 0, -1, 1).
	src := s.idx(0, nr-1)
	for _, i := range [...]int{4, 7, 8} {
		dst := s.idx(-Ez[i], nr)
		copy(f[i][dst:dst+nz], f[Opp[i]][src:src+nz])
	}
}
