package lbm

// streamCollideRows is the fused pull stream-and-collide for rows [lo, hi):
// every fluid node gathers f*_i(x - e_i) from lattice a (its halo already
// filled by fillHalo), computes its moments, collides, and writes lattice b.
// Only fluid runs are visited; solid nodes are left alone.
func (s *Solver) streamCollideRows(lo, hi, _ int) {
	for j := lo; j < hi; j++ {
		rc := &s.rows[j]
		base := s.idx(0, j)
		for _, seg := range s.segs[j] {
			n0, n1 := base+seg[0], base+seg[1]
			if s.mrt != nil {
				s.runMRT(n0, n1, rc)
			} else {
				s.runTRT(n0, n1, rc)
			}
		}
	}
}

// runTRT streams and collides nodes [n0, n1) of one row with TRT (or BGK).
// The slices are cut to the run's length so that the loop needs no bounds
// checks.
func (s *Solver) runTRT(n0, n1 int, rc *rowConst) {
	a, b, o := &s.a, &s.b, &s.off
	n := n1 - n0
	a0 := a[0][n0-o[0] : n1-o[0]]
	a1 := a[1][n0-o[1] : n1-o[1]][:n]
	a2 := a[2][n0-o[2] : n1-o[2]][:n]
	a3 := a[3][n0-o[3] : n1-o[3]][:n]
	a4 := a[4][n0-o[4] : n1-o[4]][:n]
	a5 := a[5][n0-o[5] : n1-o[5]][:n]
	a6 := a[6][n0-o[6] : n1-o[6]][:n]
	a7 := a[7][n0-o[7] : n1-o[7]][:n]
	a8 := a[8][n0-o[8] : n1-o[8]][:n]
	b0 := b[0][n0:n1][:n]
	b1 := b[1][n0:n1][:n]
	b2 := b[2][n0:n1][:n]
	b3 := b[3][n0:n1][:n]
	b4 := b[4][n0:n1][:n]
	b5 := b[5][n0:n1][:n]
	b6 := b[6][n0:n1][:n]
	b7 := b[7][n0:n1][:n]
	b8 := b[8][n0:n1][:n]
	gz, gr, wp, wm, nIter := s.gz, s.gr, s.wp, s.wm, s.nIter
	for x := range a0 {
		d := [Q]float64{a0[x], a1[x], a2[x], a3[x], a4[x], a5[x], a6[x], a7[x], a8[x]}
		m := macro(&d, rc, gz, gr, wp, nIter)
		collideTRT(&d, &m, wp, wm)
		b0[x], b1[x], b2[x], b3[x], b4[x] = d[0], d[1], d[2], d[3], d[4]
		b5[x], b6[x], b7[x], b8[x] = d[5], d[6], d[7], d[8]
	}
}

// runMRT is runTRT with the MRT operator.
func (s *Solver) runMRT(n0, n1 int, rc *rowConst) {
	for n := n0; n < n1; n++ {
		var d [Q]float64
		for i := 0; i < Q; i++ {
			d[i] = s.a[i][n-s.off[i]]
		}
		m := macro(&d, rc, s.gz, s.gr, s.wp, s.nIter)
		collideMRT(&d, &m, s.mrt)
		for i := 0; i < Q; i++ {
			s.b[i][n] = d[i]
		}
	}
}
