package lbm

// collideTRT relaxes the deviations d in place with the two-relaxation-time
// operator (Ginzburg, Verhaeghe & d'Humieres 2008) and the source
//
//	S_i = w_i theta + w_i [3 (e_i - u) + 9 (e_i.u) e_i] . F
//
// split into even and odd parts with factors (1 - w+/2) and (1 - w-/2)
// (Guo, Zheng & Shi 2002 forcing; METHODS.md eqs. 2.1 and 3.6). BGK is the
// case wm = wp.
func collideTRT(d *[Q]float64, m *moments, wp, wm float64) {
	cp := 1 - 0.5*wp
	cm := 1 - 0.5*wm
	uz, ur, fz, fr := m.uz, m.ur, m.fz, m.fr
	rho, dre, th := m.rho, m.drho, m.theta
	usq := uz*uz + ur*ur
	uf := uz*fz + ur*fr
	base := dre - 1.5*rho*usq // common part of the even equilibrium
	sbase := th - 3*uf        // common part of the even source

	d[0] += -wp*(d[0]-W[0]*base) + cp*W[0]*sbase

	// pair (1,3): e = (1,0)
	pair(&d[1], &d[3], W[1], uz, fz, rho, base, sbase, wp, wm, cp, cm)
	// pair (2,4): e = (0,1)
	pair(&d[2], &d[4], W[2], ur, fr, rho, base, sbase, wp, wm, cp, cm)
	// pair (5,7): e = (1,1)
	pair(&d[5], &d[7], W[5], uz+ur, fz+fr, rho, base, sbase, wp, wm, cp, cm)
	// pair (6,8): e = (-1,1)
	pair(&d[6], &d[8], W[6], ur-uz, fr-fz, rho, base, sbase, wp, wm, cp, cm)
}

// pair relaxes one pair of opposite directions (i, opp i) with e_i.u = eu
// and e_i.F = ef.
func pair(di, dj *float64, w, eu, ef, rho, base, sbase, wp, wm, cp, cm float64) {
	eqS := w * (base + 4.5*rho*eu*eu)
	eqA := w * 3 * rho * eu
	sS := w * (sbase + 9*eu*ef)
	sA := w * 3 * ef
	fp := 0.5 * (*di + *dj)
	fm := 0.5 * (*di - *dj)
	relS := -wp*(fp-eqS) + cp*sS
	relA := -wm*(fm-eqA) + cm*sA
	*di += relS + relA
	*dj += relS - relA
}
