package lbm

// streamCollideRows is the fused pull stream-and-collide for rows [lo, hi):
// every fluid node gathers f*_i(x - e_i) from lattice a (its halo already
// filled by fillHalo), computes its moments, collides, and writes lattice b.
// Only fluid runs are visited; solid nodes are left alone.
func (s *Solver) streamCollideRows(lo, hi, _ int) {
	for j := lo; j < hi; j++ {
		base := s.idx(0, j)
		for _, seg := range s.segs[j] {
			s.sweep(base+seg[0], base+seg[1], &s.rows[j], nil, 0)
		}
	}
}

// sweep streams nodes [n0, n1) of one row and either collides them into
// lattice b or, when obs is not nil, only stores their moments in obs from
// index o0 on. The slices are cut to the run's length so that the loop needs
// no bounds checks; the moments and the TRT collision are written out in
// the loop (the Go compiler does not inline them), and are the same
// arithmetic as macro and collideTRT, which the tests compare.
func (s *Solver) sweep(n0, n1 int, rc *rowConst, obs *Fields, o0 int) {
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
	invR, nuInvR2 := rc.invR, rc.nuInvR2
	hoop := 1 / (1 + nuInvR2) // implicit hoop term, METHODS.md eq. 3.5
	c1 := 1 - 0.5*wp
	cp, cm := 1-0.5*wp, 1-0.5*wm
	const w0, w1, w5 = 4.0 / 9, 1.0 / 9, 1.0 / 36
	mrt := s.mrt
	for x := range a0 {
		d0, d1, d2, d3, d4 := a0[x], a1[x], a2[x], a3[x], a4[x]
		d5, d6, d7, d8 := a5[x], a6[x], a7[x], a8[x]

		// Moments with half-step sources: see macro for the derivation.
		drho0 := d0 + d1 + d2 + d3 + d4 + d5 + d6 + d7 + d8
		jz := d1 - d3 + d5 - d6 - d7 + d8
		jr := d2 - d4 + d5 + d6 - d7 - d8
		rho := 1 + drho0
		drho := drho0
		inv := 1 / rho
		uz := (jz + 0.5*gz) * inv
		ur := (jr + 0.5*gr) * inv
		fz, fr, theta := gz, gr, 0.0
		if invR != 0 {
			pzr := d5 - d6 + d7 - d8
			prr := d2 + d4 + d5 + d6 + d7 + d8
			for it := 0; it < nIter; it++ {
				th := -rho * ur * invR
				szr := -c1 * (pzr - rho*uz*ur + 0.5*(fz*ur+uz*fr))
				srr := -c1 * (prr - drho*Cs2 - rho*ur*ur + fr*ur + 0.5*Cs2*th)
				nfz := gz + th*uz + szr*invR
				frE := gr + th*ur + srr*invR
				theta = th
				drho = drho0 + 0.5*th
				rho = 1 + drho
				inv = 1 / rho
				uz = (jz + 0.5*nfz) * inv
				ur = (jr + 0.5*frE) * inv * hoop
				fz = nfz
				fr = frE - 2*rho*nuInvR2*ur
			}
		}
		if obs != nil {
			obs.Rho[o0+x], obs.Uz[o0+x], obs.Ur[o0+x] = rho, uz, ur
			continue
		}
		if mrt != nil {
			d := [Q]float64{d0, d1, d2, d3, d4, d5, d6, d7, d8}
			m := moments{drho: drho, rho: rho, uz: uz, ur: ur, fz: fz, fr: fr, theta: theta}
			collideMRT(&d, &m, mrt)
			b0[x], b1[x], b2[x], b3[x], b4[x] = d[0], d[1], d[2], d[3], d[4]
			b5[x], b6[x], b7[x], b8[x] = d[5], d[6], d[7], d[8]
			continue
		}

		// TRT collision (collideTRT written out).
		usq := uz*uz + ur*ur
		base := drho - 1.5*rho*usq
		sbase := theta - 3*(uz*fz+ur*fr)
		b0[x] = d0 - wp*(d0-w0*base) + cp*w0*sbase

		// pair (1,3): e = (1,0)
		eu, ef := uz, fz
		fp, fm := 0.5*(d1+d3), 0.5*(d1-d3)
		relS := -wp*(fp-w1*(base+4.5*rho*eu*eu)) + cp*w1*(sbase+9*eu*ef)
		relA := -wm*(fm-w1*3*rho*eu) + cm*w1*3*ef
		b1[x], b3[x] = d1+relS+relA, d3+relS-relA
		// pair (2,4): e = (0,1)
		eu, ef = ur, fr
		fp, fm = 0.5*(d2+d4), 0.5*(d2-d4)
		relS = -wp*(fp-w1*(base+4.5*rho*eu*eu)) + cp*w1*(sbase+9*eu*ef)
		relA = -wm*(fm-w1*3*rho*eu) + cm*w1*3*ef
		b2[x], b4[x] = d2+relS+relA, d4+relS-relA
		// pair (5,7): e = (1,1)
		eu, ef = uz+ur, fz+fr
		fp, fm = 0.5*(d5+d7), 0.5*(d5-d7)
		relS = -wp*(fp-w5*(base+4.5*rho*eu*eu)) + cp*w5*(sbase+9*eu*ef)
		relA = -wm*(fm-w5*3*rho*eu) + cm*w5*3*ef
		b5[x], b7[x] = d5+relS+relA, d7+relS-relA
		// pair (6,8): e = (-1,1)
		eu, ef = ur-uz, fr-fz
		fp, fm = 0.5*(d6+d8), 0.5*(d6-d8)
		relS = -wp*(fp-w5*(base+4.5*rho*eu*eu)) + cp*w5*(sbase+9*eu*ef)
		relA = -wm*(fm-w5*3*rho*eu) + cm*w5*3*ef
		b6[x], b8[x] = d6+relS+relA, d8+relS-relA
	}
}
