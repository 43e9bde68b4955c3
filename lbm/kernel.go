package lbm

import "unsafe"

// streamCollideRows is the fused pull stream-and-collide for rows [lo, hi):
// every fluid node gathers f*_i(x - e_i) from lattice a (its halo already
// filled by fillHalo), computes its moments, collides, and writes lattice b.
// Only fluid runs are visited; solid nodes are left alone.
func (s *Solver) streamCollideRows(lo, hi, w int) {
	t := s.blocks[w]
	for j := lo; j < hi; j++ {
		base := s.idx(0, j)
		for _, seg := range s.segs[j] {
			s.sweepBlocks(base+seg[0], base+seg[1], &s.rows[j], nil, 0, t)
		}
		if s.single {
			endGhosts(s, &s.b32, j)
		} else {
			endGhosts(s, &s.b, j)
		}
	}
}

// sweep streams nodes [n0, n1) of one row and either collides them into
// lattice b or, when obs is not nil, only stores their moments in obs from
// index o0 on.
func (s *Solver) sweep(n0, n1 int, rc *rowConst, obs *Fields, o0 int) {
	var t block
	s.sweepBlocks(n0, n1, rc, obs, o0, &t)
}

// blk is the number of nodes a sweep handles per loop (see sweepBlocks).
// 32 to 128 run equally fast.
const blk = 64

// block holds the per-node values of one block of nodes between the loops
// of sweepBlocks (18 arrays of blk values, 9 KiB, on the goroutine's stack
// and in L1), and the constants of the loops. The loops read the constants
// as memory operands, which costs the Go compiler neither an extra
// instruction nor a register (in registers, they would push the loop's
// own values out to the stack).
type block struct {
	drho0, jz, jr, gzs, grs     [blk]float64 // moments of the streamed populations; G_z, G_r (see pass)
	drho, mz, mr, fz, fr, theta [blk]float64 // the half-step moments, with momenta m = rho u
	inv                         [blk]float64 // 1/rho
	uz, ur, rho, r45, base, sb  [blk]float64 // velocities; rho, 9/2 rho and the collision's common terms
	k                           consts
	axis, diag                  pairRates // of the axis and the diagonal directions

	// For the SIMD loops (simd_amd64.s): the addresses of the first
	// streamed population a_q[n0 - off_q] and the first post-collision one
	// b_q[n0] of the block, set by pointers. They are uintptrs so that a
	// block holds no pointers and can be cut from a []float64 at a 64-byte
	// boundary (newBlock); the lattices they point into are kept alive by
	// the Solver.
	src, dst [Q]uintptr
	// tail is the lane mask of the SIMD loops' last vector when the block
	// does not fill it: bit x for the block's node nb&^7 + x.
	tail uint16

	// For the AVX2 loops (simd_avx2_amd64.s), which have no broadcast
	// operands: k, axis and diag with each value repeated in four lanes,
	// read as 256-bit memory operands (spread).
	k4           [unsafe.Sizeof(consts{}) / 8][4]float64
	axis4, diag4 [unsafe.Sizeof(pairRates{}) / 8][4]float64
}

// spread copies k, axis and diag into k4, axis4 and diag4, four lanes each.
func (t *block) spread() {
	k := (*[len(t.k4)]float64)(unsafe.Pointer(&t.k))
	for i, v := range k {
		t.k4[i] = [4]float64{v, v, v, v}
	}
	a := (*[len(t.axis4)]float64)(unsafe.Pointer(&t.axis))
	d := (*[len(t.diag4)]float64)(unsafe.Pointer(&t.diag))
	for i := range a {
		t.axis4[i] = [4]float64{a[i], a[i], a[i], a[i]}
		t.diag4[i] = [4]float64{d[i], d[i], d[i], d[i]}
	}
}

// newBlock returns a block whose arrays start on a 64-byte boundary, so
// that each SIMD load and store of eight float64 stays within one cache
// line.
func newBlock() *block {
	const words = (int(unsafe.Sizeof(block{})) + 7) / 8
	buf := make([]float64, words+8)
	p := unsafe.Pointer(&buf[0])
	skip := (64 - int(uintptr(p)%64)) % 64 / 8
	return (*block)(unsafe.Pointer(&buf[skip]))
}

// consts are the constants of the loops, for a row and a force.
type consts struct {
	one, half, third, c15, c3 float64 // 1, 1/2, 1/3, 3/2, 3
	gz, gr, hgz, hgr          float64 // external force density G and G/2
	nr, k1, k2, k3, k4        float64 // -1/r, (w+/2)/r, c/(2r), c/r, c/(6r); c = 1 - w+/2
	k5, hoop                  float64 // 2 nu/r^2, 1/(1 + nu/r^2)
	wp, w0, cpw0, c45         float64 // w+, w_0, (1 - w+/2) w_0, 9/2
}

// pairRates are the factors of one pair of opposite directions of the TRT
// collision (see pairs).
type pairRates struct {
	nhp, nhm, w2, w6, cpw, cmw, c9 float64 // -w+/2, -w-/2, 2 w_i, 6 w_i, (1 - w+/2) w_i, (1 - w-/2) 3 w_i, 9
}

// sweepBlocks is sweep with a given block of scratch space.
//
// The moments (macro) and the TRT collision (collideTRT) are written out
// (the Go compiler does not inline them). The collision is collideTRT's
// arithmetic; the moments are macro's passes rearranged to take fewer
// operations, equal to round-off (TestKernelMatchesReference). Every node
// does the same operations in the same order whatever the row, run, block
// or goroutine it is in, so the results do not depend on the number of
// goroutines.
//
// The run is cut into blocks of blk nodes and each block is done in short
// loops over all its nodes: gather the moments, then each fixed-point pass
// of the half-step moments, then the collision in three loops. Within one
// node these are a long chain of dependent operations (four divisions
// among them). In one fused loop over the nodes the processor can keep
// only about one node in flight and waits on that chain, and the Go
// compiler spills most values of the large loop body to the stack; short
// loops over many independent nodes keep the pipelines full and their
// values in registers. The mode (moments only, MRT or TRT) is chosen once
// per block.
func (s *Solver) sweepBlocks(n0, n1 int, rc *rowConst, obs *Fields, o0 int, t *block) {
	wp, wm := s.wp, s.wm
	cp, cm := 1-0.5*wp, 1-0.5*wm
	c := cp // the factor 1 - w+/2 of the stresses (3.4) and of the even source
	R := rc.invR
	t.k = consts{
		one: 1, half: 0.5, third: Cs2, c15: 1.5, c3: 3,
		gz: s.gz, gr: s.gr, hgz: 0.5 * s.gz, hgr: 0.5 * s.gr,
		nr: -R, k1: 0.5 * wp * R, k2: 0.5 * c * R, k3: c * R, k4: c * R / 6,
		k5: 2 * rc.nuInvR2, hoop: 1 / (1 + rc.nuInvR2),
		wp: wp, w0: W[0], cpw0: cp * W[0], c45: 4.5,
	}
	const w1, w5 = 1.0 / 9, 1.0 / 36 // W[1], W[5]; w*3 is then folded exactly as in collideTRT
	t.axis = pairRates{nhp: -0.5 * wp, nhm: -0.5 * wm, w2: 2 * w1, w6: 2 * (w1 * 3), cpw: cp * w1, cmw: cm * w1 * 3, c9: 9}
	t.diag = pairRates{nhp: -0.5 * wp, nhm: -0.5 * wm, w2: 2 * w5, w6: 2 * (w5 * 3), cpw: cp * w5, cmw: cm * w5 * 3, c9: 9}
	if s.path == KernelAVX2 {
		t.spread()
	}
	axi := R != 0 && s.nIter > 0
	if s.single {
		sweepRun(s, &s.a32, &s.b32, n0, n1, axi, obs, o0, t)
	} else {
		sweepRun(s, &s.a, &s.b, n0, n1, axi, obs, o0, t)
	}
}

// real is the storage type of the populations: float64, or float32 with
// Config.Single. All arithmetic is in float64.
type real interface{ ~float32 | ~float64 }

// sweepRun is the loop over the blocks of sweepBlocks, from lattice a into
// lattice b.
func sweepRun[T real](s *Solver, a, b *[Q][]T, n0, n1 int, axi bool, obs *Fields, o0 int, t *block) {
	simd := s.path != KernelPortable
	var src, dst [Q]uintptr // the run's first populations, for the SIMD loops
	if simd && n1 > n0 {
		pointers(a, b, &s.off, n0, n1-n0, t) // checks the bounds of the whole run
		src, dst = t.src, t.dst
	}
	size := unsafe.Sizeof(T(0))
	f32 := s.single
	for k0 := n0; k0 < n1; k0 += blk {
		k1 := min(k0+blk, n1)
		nb := k1 - k0
		nv := 0 // nodes [0, nv) of the block go through the SIMD loops, the rest through Go
		if simd {
			shift := uintptr(k0-n0) * size
			for q := range Q {
				t.src[q], t.dst[q] = src[q]+shift, dst[q]+shift
			}
		}
		switch s.path {
		case KernelAVX512:
			nv = nb // the last vector is masked
			t.tail = uint16(1)<<(nb%simdWidth) - 1
		case KernelAVX2:
			nv = nb &^ (avx2Width - 1) // the Go loops do the last nb%4 nodes
		}
		whole := !axi && obs == nil && s.mrt == nil // planarSIMD does all of it
		passes := 0
		if axi {
			passes = s.nIter
		}
		switch {
		case nv == 0:
		case s.path == KernelAVX2 && whole && f32:
			planarAVX2_32(t, nv)
		case s.path == KernelAVX2 && whole:
			planarAVX2(t, nv)
		case s.path == KernelAVX2 && f32:
			gatherAVX2_32(t, nv, passes)
		case s.path == KernelAVX2:
			gatherAVX2(t, nv, passes)
		case whole && f32:
			planarSIMD32(t, nv)
		case whole:
			planarSIMD(t, nv)
		case f32:
			gatherSIMD32(t, nv, passes)
		default:
			gatherSIMD(t, nv, passes)
		}
		if nv < nb { // the Go loops, for what SIMD did not do
			gather(a, &s.off, k0, k1, nv, axi, t)
			if axi {
				for it := 0; it < s.nIter; it++ {
					t.pass(nv, nb)
				}
			}
		}
		switch {
		case obs != nil:
			t.velocities(nb)
			o := o0 + k0 - n0
			rho, uz, ur := obs.Rho[o:o+nb], obs.Uz[o:o+nb], obs.Ur[o:o+nb]
			for x := range rho {
				rho[x], uz[x], ur[x] = 1+t.drho[x], t.uz[x], t.ur[x]
			}
		case s.mrt != nil:
			t.velocities(nb)
			collideBlockMRT(a, b, &s.off, s.mrt, k0, k1, t)
		default:
			switch {
			case nv == 0 || whole:
			case s.path == KernelAVX2 && f32:
				collideAVX2_32(t, nv)
			case s.path == KernelAVX2:
				collideAVX2(t, nv)
			case f32:
				collideSIMD32(t, nv)
			default:
				collideSIMD(t, nv)
			}
			if nv < nb {
				rest(a, b, &s.off, k0, k1, nv, t)
				pairs(a, b, &s.off, k0, k1, nv, t)
			}
		}
	}
}

// The moments of the streamed populations d_i: the sums are taken over
// pairs of opposite directions, which shortens the chain of additions and
// shares terms:
//
//	drho0 = d0 + (s13 + s24) + (s57 + s68),  s_ij = d_i + d_j
//	j_z = m13 + (m57 - m68),  j_r = m24 + (m57 + m68),  m_ij = d_i - d_j
//	sum e_z e_r d_i = s57 - s68,  sum e_r^2 d_i = s24 + (s57 + s68)

// The half-step moments (macro, METHODS.md 3.4 Step A) are computed with
// the momenta m = rho u as unknowns. In terms of m, the fixed-point pass of
// macro from (rho, m, F, theta) to (rho', m', F', theta') reads, with
// c = 1 - w+/2 and R = 1/r,
//
//	theta' = -R m_r
//	F'_z   = G_z - [m_r ((w+/2) R m_z + (c/2) R F_z) + (c/2) R m_z F_r] / rho
//	F^E_r  = G_r - m_r ((w+/2) R m_r + c R F_r) / rho + (c/6) R (theta - theta')
//	rho'   = 1 + drho0 + theta'/2
//	m'_z   = j_z + F'_z/2
//	m'_r   = (j_r + F^E_r/2) / (1 + nu R^2)
//	F'_r   = F^E_r - 2 nu R^2 m'_r
//
// with the parts that do not change from pass to pass taken out once,
//
//	G_z = g_z - c R Pi_zr,  G_r = g_r - c R (sum e_r^2 d_i - drho0/3),
//
// (Pi_zr = sum e_z e_r d_i). This is macro's pass term by term: theta u,
// rho u_z u_r and the force terms of the stresses become the products of
// momenta over rho, theta u_z + c R rho u_z u_r = -(w+/2) R m_z m_r / rho,
// and the density in the stress s_rr, drho = drho0 + theta/2 of the
// previous pass, leaves (c/6) R (theta - theta'). The first guess is
// macro's: rho = 1 + drho0, m = j + G/2, F = G, theta = 0. The passes are
// the same, so are the iterates (to round-off), but a pass takes 29
// operations instead of 48 and the division 1/rho is no longer on the
// critical path. u = m / rho at the end.

// pointers sets the SIMD loops' pointers to the first of the n nodes that
// start at node n0. Slicing checks the bounds that the loops, in assembly,
// do not.
func pointers[T real](a, b *[Q][]T, off *[Q]int, n0, n int, t *block) {
	for q := range Q {
		t.src[q] = uintptr(unsafe.Pointer(&a[q][n0-off[q]:][:n][0]))
		t.dst[q] = uintptr(unsafe.Pointer(&b[q][n0:][:n][0]))
	}
}

// gather computes the moments of nodes [n0, n1), at most blk of them, and
// the first guess of the half-step moments: rho = 1 + drho0, m = j + G/2,
// F = G, theta = 0; with axi, also what the passes need. The first nv
// nodes of the block are left to the SIMD loop (gatherSIMD), which does
// the same arithmetic and the passes too.
func gather[T real](a *[Q][]T, o *[Q]int, n0, n1, nv int, axi bool, t *block) {
	n := min(n1-n0, blk)
	a0 := a[0][n0-o[0]:][:n]
	a1 := a[1][n0-o[1]:][:n]
	a2 := a[2][n0-o[2]:][:n]
	a3 := a[3][n0-o[3]:][:n]
	a4 := a[4][n0-o[4]:][:n]
	a5 := a[5][n0-o[5]:][:n]
	a6 := a[6][n0-o[6]:][:n]
	a7 := a[7][n0-o[7]:][:n]
	a8 := a[8][n0-o[8]:][:n]
	k := &t.k
	for x := nv; x < n; x++ {
		d1, d3 := float64(a1[x]), float64(a3[x])
		d2, d4 := float64(a2[x]), float64(a4[x])
		d5, d7 := float64(a5[x]), float64(a7[x])
		d6, d8 := float64(a6[x]), float64(a8[x])
		s24, s57, s68 := d2+d4, d5+d7, d6+d8
		m57, m68 := d5-d7, d6-d8
		s5678 := s57 + s68
		drho0 := float64(a0[x]) + ((d1 + d3) + s24) + s5678
		jz := (d1 - d3) + (m57 - m68)
		jr := (d2 - d4) + (m57 + m68)
		t.drho[x], t.inv[x] = drho0, k.one/(k.one+drho0)
		t.mz[x], t.mr[x] = jz+k.hgz, jr+k.hgr
		t.fz[x], t.fr[x], t.theta[x] = k.gz, k.gr, 0
		if axi {
			t.drho0[x], t.jz[x], t.jr[x] = drho0, jz, jr
			t.gzs[x] = k.gz - k.k3*(s57-s68)
			t.grs[x] = k.gr - k.k3*((s24+s5678)-k.third*drho0)
		}
	}
}

// pass is one fixed-point pass of the half-step moments over nodes
// [x0, n) of the block. It ends with 1/rho for the next pass, so that the
// division is done alongside the rest of the pass, not before it.
func (t *block) pass(x0, n int) {
	n = min(n, blk)
	k := &t.k
	for x := max(x0, 0); x < n; x++ {
		mz, mr, fz, fr, inv := t.mz[x], t.mr[x], t.fz[x], t.fr[x], t.inv[x]
		th := k.nr * mr
		fz = t.gzs[x] - inv*(mr*(k.k1*mz+k.k2*fz)+k.k2*(mz*fr))
		frE := t.grs[x] - inv*(mr*(k.k1*mr+k.k3*fr)) + k.k4*(t.theta[x]-th)
		mr = (t.jr[x] + k.half*frE) * k.hoop
		drho := t.drho0[x] + k.half*th
		t.drho[x], t.inv[x] = drho, k.one/(k.one+drho)
		t.theta[x] = th
		t.mz[x], t.mr[x] = t.jz[x]+k.half*fz, mr
		t.fz[x], t.fr[x] = fz, frE-k.k5*mr
	}
}

// velocities computes u = m / rho of the first n nodes of the block.
func (t *block) velocities(n int) {
	n = min(n, blk)
	for x := range n {
		inv := t.inv[x]
		t.uz[x], t.ur[x] = t.mz[x]*inv, t.mr[x]*inv
	}
}

// The TRT collision is collideTRT's arithmetic: with base = drho - 3/2 rho
// u^2 and sbase = theta - 3 u.F, the common parts of the even equilibrium
// and source,
//
//	f*_0 = d_0 - w+ (d_0 - w_0 base) + (1 - w+/2) w_0 sbase
//	f*_i = d_i + relS + relA,  f*_opp(i) = d_opp(i) + relS - relA,
//	relS = -w+ (f+ - w_i (base + 9/2 rho (e_i.u)^2)) + (1 - w+/2) w_i (sbase + 9 e_i.u e_i.F)
//	relA = -w- (f- - 3 w_i rho e_i.u) + (1 - w-/2) 3 w_i e_i.F
//
// with f+/- = (d_i +/- d_opp(i))/2. The halves are taken out of f+/- into
// the rates, -w+ (f+ - x) = -(w+/2) (d_i + d_opp(i) - 2x): scaling by 2 is
// exact, so this is collideTRT's rounding with two multiplications fewer
// per pair. The non-equilibrium part f - f_eq is formed before it is
// scaled, which keeps the round-off small. The collision is done in three
// loops: the common terms and the rest population (rest, fused with the
// last loop of the moments), then the axis and the diagonal pairs (pairs).

// rest is the last loop of the moments of nodes [n0, n1), u = m / rho,
// fused with the first loop of the collision, from the block's node x0 on.
func rest[T real](a, b *[Q][]T, o *[Q]int, n0, n1, x0 int, t *block) {
	n := min(n1-n0, blk)
	a0 := a[0][n0-o[0]:][:n]
	b0 := b[0][n0:][:n]
	k := &t.k
	for x := max(x0, 0); x < n; x++ {
		drho, inv := t.drho[x], t.inv[x]
		rho := k.one + drho
		uz, ur := t.mz[x]*inv, t.mr[x]*inv
		usq := uz*uz + ur*ur
		base := drho - k.c15*rho*usq
		sbase := t.theta[x] - k.c3*(uz*t.fz[x]+ur*t.fr[x])
		t.uz[x], t.ur[x] = uz, ur
		t.rho[x], t.r45[x], t.base[x], t.sb[x] = rho, k.c45*rho, base, sbase
		d0 := float64(a0[x])
		b0[x] = T(d0 - k.wp*(d0-k.w0*base) + k.cpw0*sbase)
	}
}

// pairs relaxes the pairs of opposite directions of nodes [n0, n1) with
// the moments and common terms in t, from the block's node x0 on.
func pairs[T real](a, b *[Q][]T, o *[Q]int, n0, n1, x0 int, t *block) {
	n := min(n1-n0, blk)
	if x0 >= n {
		return
	}
	axisPairs(t, x0, n, a[1][n0-o[1]:], a[3][n0-o[3]:], a[2][n0-o[2]:], a[4][n0-o[4]:],
		b[1][n0:], b[3][n0:], b[2][n0:], b[4][n0:])
	diagonalPairs(t, x0, n, a[5][n0-o[5]:], a[7][n0-o[7]:], a[6][n0-o[6]:], a[8][n0-o[8]:],
		b[5][n0:], b[7][n0:], b[6][n0:], b[8][n0:])
}

// axisPairs relaxes the pairs (1,3), e = (1,0), and (2,4), e = (0,1), of
// nodes [x0, n) of the block, from the streamed populations d into b.
func axisPairs[T real](t *block, x0, n int, d1, d3, d2, d4, b1, b3, b2, b4 []T) {
	n = min(n, blk)
	d1, d3, d2, d4 = d1[:n], d3[:n], d2[:n], d4[:n]
	b1, b3, b2, b4 = b1[:n], b3[:n], b2[:n], b4[:n]
	r := &t.axis
	for x := max(x0, 0); x < n; x++ {
		r45, base, sbase := t.r45[x], t.base[x], t.sb[x]
		rw6 := r.w6 * t.rho[x] // 2 (3 w_i rho)

		eu, ef := t.uz[x], t.fz[x]
		di, dj := float64(d1[x]), float64(d3[x])
		relS := r.nhp*((di+dj)-r.w2*(base+r45*eu*eu)) + r.cpw*(sbase+r.c9*eu*ef)
		relA := r.nhm*((di-dj)-rw6*eu) + r.cmw*ef
		b1[x], b3[x] = T(di+relS+relA), T(dj+relS-relA)

		eu, ef = t.ur[x], t.fr[x]
		di, dj = float64(d2[x]), float64(d4[x])
		relS = r.nhp*((di+dj)-r.w2*(base+r45*eu*eu)) + r.cpw*(sbase+r.c9*eu*ef)
		relA = r.nhm*((di-dj)-rw6*eu) + r.cmw*ef
		b2[x], b4[x] = T(di+relS+relA), T(dj+relS-relA)
	}
}

// diagonalPairs relaxes the pairs (5,7), e = (1,1), and (6,8), e = (-1,1).
func diagonalPairs[T real](t *block, x0, n int, d5, d7, d6, d8, b5, b7, b6, b8 []T) {
	n = min(n, blk)
	d5, d7, d6, d8 = d5[:n], d7[:n], d6[:n], d8[:n]
	b5, b7, b6, b8 = b5[:n], b7[:n], b6[:n], b8[:n]
	r := &t.diag
	for x := max(x0, 0); x < n; x++ {
		r45, base, sbase := t.r45[x], t.base[x], t.sb[x]
		rw6 := r.w6 * t.rho[x]
		uz, ur, fz, fr := t.uz[x], t.ur[x], t.fz[x], t.fr[x]

		eu, ef := uz+ur, fz+fr
		di, dj := float64(d5[x]), float64(d7[x])
		relS := r.nhp*((di+dj)-r.w2*(base+r45*eu*eu)) + r.cpw*(sbase+r.c9*eu*ef)
		relA := r.nhm*((di-dj)-rw6*eu) + r.cmw*ef
		b5[x], b7[x] = T(di+relS+relA), T(dj+relS-relA)

		eu, ef = ur-uz, fr-fz
		di, dj = float64(d6[x]), float64(d8[x])
		relS = r.nhp*((di+dj)-r.w2*(base+r45*eu*eu)) + r.cpw*(sbase+r.c9*eu*ef)
		relA = r.nhm*((di-dj)-rw6*eu) + r.cmw*ef
		b6[x], b8[x] = T(di+relS+relA), T(dj+relS-relA)
	}
}

// collideBlockMRT is collideMRT on nodes [n0, n1), at most blk of them,
// with the moments in t.
func collideBlockMRT[T real](a, b *[Q][]T, o *[Q]int, r *mrtRates, n0, n1 int, t *block) {
	n1 = min(n1, n0+blk)
	for n := n0; n < n1; n++ {
		x := n - n0
		var d [Q]float64
		for q := range d {
			d[q] = float64(a[q][n-o[q]])
		}
		drho := t.drho[x]
		m := moments{drho: drho, rho: 1 + drho, uz: t.uz[x], ur: t.ur[x], fz: t.fz[x], fr: t.fr[x], theta: t.theta[x]}
		collideMRT(&d, &m, r)
		for q := range d {
			b[q][n] = T(d[q])
		}
	}
}
