package lbm

// fillHalo writes into the halo of the post-collision lattice f the values
// that the pull step will read there, so that the kernel itself needs no
// boundary branches:
//
//   - axis (ghost row j = -1): the mirror image of row 0, f_i(k,-1) =
//     f_{mirror(i)}(k,0), specular reflection at r = 0 (METHODS.md 3.5.1);
//   - ends: a periodic copy, or halfway bounce-back;
//   - side wall (ghost row j = Nr): halfway bounce-back;
//   - open sides (Config.Open): nothing; the coupling to the neighbouring
//     level writes them (see Levels).
//
// Halfway bounce-back (Ladd 1994, J. Fluid Mech. 271, 285) in a pull scheme
// reads f_i(x, t+1) = f*_{opp(i)}(x, t) when x - e_i is a wall node; each
// (wall node, direction) pair feeds exactly one fluid node, so it is written
// as the ghost value f_i(g) = f*_{opp(i)}(g + e_i). Walls override the axis
// at the corners. The cost is proportional to the perimeter.
//
// The ends are a column each, and writing a column touches one cache line
// per row and plane: it was the largest serial part of a demo step. So the
// kernel writes the ends' ghost values itself, row by row, while the row's
// values are in cache (endGhosts), and fillHalo fills them only when the
// lattice changed since the last step (haloStale: a refill at an end,
// a density shift, a restore, an equilibrium) or a body's links write
// into an end column.
func (s *Solver) fillHalo() {
	ends := s.haloStale
	for _, b := range s.bodies {
		ends = ends || b.touchesEnd
	}
	if s.single {
		fillHalo(s, &s.a32, ends)
	} else {
		fillHalo(s, &s.a, ends)
	}
	s.haloStale = false
}

// endGhosts writes the end ghost values that row j of lattice f feeds, as
// fillHalo would from it: with periodic ends the row's own ghosts, with
// closed ends the halfway bounce-back ghosts of rows j-1, j and j+1 whose
// directions enter row j. Each ghost value is written by exactly one row,
// so the workers do not share any.
func endGhosts[T real](s *Solver, f *[Q][]T, j int) {
	nz := s.nz
	open := s.cfg.Open
	if s.cfg.PeriodicZ {
		for _, i := range [...]int{1, 5, 8} {
			f[i][s.idx(-1, j)] = f[i][s.idx(nz-1, j)]
		}
		for _, i := range [...]int{3, 6, 7} {
			f[i][s.idx(nz, j)] = f[i][s.idx(0, j)]
		}
		return
	}
	if open&SideZMin == 0 {
		for _, i := range [...]int{1, 5, 8} { // left end, e_z = +1
			f[i][s.idx(-1, j-Er[i])] = f[Opp[i]][s.idx(0, j)]
		}
	}
	if open&SideZMax == 0 {
		for _, i := range [...]int{3, 6, 7} { // right end, e_z = -1
			f[i][s.idx(nz, j-Er[i])] = f[Opp[i]][s.idx(nz-1, j)]
		}
	}
}

// fillHalo fills the halo of f; the ends' ghost values of rows 0..Nr-1
// (with closed ends, those of all rows) only when ends is true.
func fillHalo[T real](s *Solver, f *[Q][]T, ends bool) {
	nz, nr := s.nz, s.nr
	open := s.cfg.Open
	// Axis: only directions entering row 0 from below are read (e_r = +1).
	for _, i := range [...]int{2, 5, 6} {
		if open&SideAxis != 0 {
			break
		}
		m := Mirror[i]
		g := f[i][s.idx(0, -1) : s.idx(0, -1)+nz]
		src := f[m][s.idx(0, 0) : s.idx(0, 0)+nz]
		copy(g, src)
	}
	if s.cfg.PeriodicZ {
		for j := -1; j <= nr; j++ {
			if !ends && j == 0 {
				j = nr // the kernel wrote rows 0..Nr-1 (endGhosts)
			}
			for _, i := range [...]int{1, 5, 8} {
				f[i][s.idx(-1, j)] = f[i][s.idx(nz-1, j)]
			}
			for _, i := range [...]int{3, 6, 7} {
				f[i][s.idx(nz, j)] = f[i][s.idx(0, j)]
			}
		}
	} else if ends {
		for j := -1; j <= nr; j++ {
			for _, i := range [...]int{1, 5, 8} { // left end, e_z = +1
				if jd := j + Er[i]; jd >= 0 && jd < nr && open&SideZMin == 0 {
					f[i][s.idx(-1, j)] = f[Opp[i]][s.idx(0, jd)]
				}
			}
			for _, i := range [...]int{3, 6, 7} { // right end, e_z = -1
				if jd := j + Er[i]; jd >= 0 && jd < nr && open&SideZMax == 0 {
					f[i][s.idx(nz, j)] = f[Opp[i]][s.idx(nz-1, jd)]
				}
			}
		}
	}
	// Side wall, e_r = -1 directions leave the ghost row toward row Nr-1:
	// f_i(k, Nr) = f*_opp(i)(k + e_iz, Nr-1) for every k with k + e_iz a
	// node, one contiguous copy per direction (i = 4, 7, 8: e_z = 0, -1, 1).
	if open&SideWall != 0 {
		return
	}
	src := s.idx(0, nr-1)
	for _, i := range [...]int{4, 7, 8} {
		dst := s.idx(-Ez[i], nr)
		copy(f[i][dst:dst+nz], f[Opp[i]][src:src+nz])
	}
}
