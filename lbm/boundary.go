package lbm

import (
	"fmt"
	"math"
	"slices"
)

// Link is a boundary link handed to the lattice: the fluid node (K, J), the
// direction Dir pointing from it into a body, and the fraction Q in (0, 1]
// of the link from the node to the wall. The node (K, J) + e_Dir may lie in
// the ghost row below the axis (J + Er[Dir] = -1): that link crosses the
// axis into the body's mirror image.
type Link struct {
	K, J, Dir int
	Q         float64
}

// Boundary is the set of links of one moving body with the velocity of its
// wall. Bodies translate along z only.
type Boundary struct {
	links []preparedLink
	vz    float64 // wall velocity for the next step

	// touchesEnd: a link writes into the first or last column, whose
	// values the end ghosts copy (see fillHalo)
	touchesEnd bool

	// results of the last Step
	force    float64 // ring-weighted momentum exchange, z
	fallback int     // links that fell back from quadratic interpolation
}

// preparedLink is a Link resolved against the lattice: where to read, where
// to write, with which weights. The incoming population of the fluid node
// is
//
//	f_opp(x_f, t+1) = cA f*_i(x_f) + cB f*_opp(x_f) + c1 N1 + c2 N2 + cw Delta,
//
// Delta = -6 w_i e_i . u_w (Ladd 1994's moving-wall term), with N1 and N2
// the neighbour values of the interpolation (Bouzidi, Firdaouss &
// Lallemand 2001, Phys. Fluids 13, 3452; METHODS.md 5.3):
//
//	q < 1/2, quadratic: cA = q(1+2q), N1 = f*_i(x_f - e_i), c1 = 1-4q^2,
//	                    N2 = f*_i(x_f - 2e_i), c2 = -q(1-2q), cw = 1
//	q < 1/2, linear:    cA = 2q, N1 = f*_i(x_f - e_i), c1 = 1-2q, cw = 1
//	q >= 1/2, quadratic: cA = 1/(q(2q+1)), cB = (2q-1)/q,
//	                    N1 = f*_opp(x_f - e_i), c1 = -(2q-1)/(2q+1), cw = 1/(q(2q+1))
//	q >= 1/2, linear:   cA = 1/(2q), cB = (2q-1)/(2q), cw = 1/(2q)
//	otherwise (no fluid neighbour behind x_f): halfway, cA = 1, cw = 1.
//
// The moving-wall term carries the weight of the reflected value, the
// consistent form of the construction (METHODS.md 5.3). The coefficients
// of the populations sum to one, so deviations f - w may be used as they
// are.
type preparedLink struct {
	dst      int // index of x_f + e_i (the slot pulled in direction opp)
	src      int // index of x_f
	dir, opp int
	n1, n2   int // indices of the neighbour values (-1: unused)
	d1, d2   int // their directions (mirrored across the axis if needed)
	cA, cB   float64
	c1, c2   float64
	cw       float64
	wallTerm float64 // -6 w_i e_iz: Delta = wallTerm * u_wz
	ez       float64
	ring     float64 // 2 pi r at the link midpoint (METHODS.md 7.4)
	q        float64 // the wall fraction the weights are for
	quad     bool
}

// SetBoundary hands the lattice the links of body id and its wall velocity
// (lattice units, along z) for the next Step. Bodies are numbered from 0;
// a body's previous links are replaced. The solid nodes must already be
// marked with SetSolid.
func (s *Solver) SetBoundary(id int, links []Link, vz float64) error {
	if id < 0 {
		return fmt.Errorf("lbm: body %d: ids start at 0", id)
	}
	for len(s.bodies) <= id {
		s.bodies = append(s.bodies, &Boundary{})
	}
	b := s.bodies[id]
	b.vz = vz
	b.fallback = 0
	b.touchesEnd = false
	// Prepared in place: a preparedLink is some 130 bytes, and building
	// each one elsewhere and copying it in was a good part of the cost of
	// moving a body.
	b.links = slices.Grow(b.links[:0], len(links))[:len(links)]
	for x, l := range links {
		p := &b.links[x]
		if err := s.prepare(p, l); err != nil {
			b.links = b.links[:0]
			return fmt.Errorf("lbm: body %d: %w", id, err)
		}
		if !p.quad {
			b.fallback++
		}
		if k := p.dst % s.w; k == 1 || k == s.nz { // stored column of k = 0, Nz-1
			b.touchesEnd = true
		}
	}
	return nil
}

// BoundaryForce returns the axial force the fluid exerted on body id
// during the last Step, by Galilean-invariant momentum exchange with every
// link weighted by its ring 2 pi r_mid (lattice units: multiply by
// rho_f dx^4/dt^2 for newtons), and the number of its links that fell back
// from quadratic interpolation.
func (s *Solver) BoundaryForce(id int) (fz float64, fallback int) {
	if id >= len(s.bodies) {
		return 0, 0
	}
	return s.bodies[id].force, s.bodies[id].fallback
}

// resolve maps node (k, j), which may lie below the axis or beyond a
// periodic end, to a stored node and the direction that carries direction
// dir there; ok is false outside the domain.
func (s *Solver) resolve(k, j, dir int) (n, d int, ok bool) {
	if s.cfg.PeriodicZ {
		k = ((k % s.nz) + s.nz) % s.nz
	}
	if k < 0 || k >= s.nz || j >= s.nr {
		return 0, 0, false
	}
	if j < 0 { // mirror image across the axis (METHODS.md 3.5.1)
		j, dir = -1-j, Mirror[dir]
	}
	return s.idx(k, j), dir, true
}

// fluidAt reports whether the value of direction dir at node (k, j) can be
// read as a fluid value, and where.
func (s *Solver) fluidAt(k, j, dir int) (n, d int, ok bool) {
	n, d, ok = s.resolve(k, j, dir)
	if !ok || s.solid[n] {
		return 0, 0, false
	}
	return n, d, true
}

// prepare fills p for link l.
func (s *Solver) prepare(p *preparedLink, l Link) error {
	if l.Dir < 1 || l.Dir >= Q || !(l.Q > 0 && l.Q <= 1) {
		return fmt.Errorf("link (%d,%d) dir %d q %g: need dir 1..8 and 0 < q <= 1", l.K, l.J, l.Dir, l.Q)
	}
	src, _, ok := s.fluidAt(l.K, l.J, 0)
	if !ok || l.J < 0 {
		return fmt.Errorf("link (%d,%d): not a fluid node", l.K, l.J)
	}
	i, o := l.Dir, Opp[l.Dir]
	kd, jd := l.K+Ez[i], l.J+Er[i]
	if s.cfg.PeriodicZ {
		kd = ((kd % s.nz) + s.nz) % s.nz
	}
	if kd < 0 || kd >= s.nz || jd >= s.nr || jd < -1 {
		return fmt.Errorf("link (%d,%d) dir %d leaves the domain", l.K, l.J, i)
	}
	*p = preparedLink{dst: s.idx(kd, jd), src: src, dir: i, opp: o, n1: -1, n2: -1,
		wallTerm: -6 * W[i] * float64(Ez[i]), ez: float64(Ez[i]),
		ring: 2 * math.Pi * (s.rows[l.J].r + 0.5*float64(Er[i]))}
	s.neighbours(p, l)
	p.weights(l.Q)
	return nil
}

// neighbours looks up the fluid values the interpolation of link l reads:
// for q < 1/2 two nodes behind the fluid node along -e_i, for q >= 1/2 the
// one behind it in direction opp(i) (Bouzidi, Firdaouss & Lallemand 2001).
func (s *Solver) neighbours(p *preparedLink, l Link) {
	i, o := l.Dir, Opp[l.Dir]
	k1, j1 := l.K-Ez[i], l.J-Er[i]
	k2, j2 := l.K-2*Ez[i], l.J-2*Er[i]
	p.n1, p.n2 = -1, -1
	if l.Q < 0.5 {
		n1, d1, ok1 := s.fluidAt(k1, j1, i)
		n2, d2, ok2 := s.fluidAt(k2, j2, i)
		switch {
		case ok1 && ok2:
			p.n1, p.d1, p.n2, p.d2 = n1, d1, n2, d2
		case ok1:
			p.n1, p.d1 = n1, d1
		}
		return
	}
	if n1, d1, ok1 := s.fluidAt(k1, j1, o); ok1 {
		p.n1, p.d1 = n1, d1
	}
}

// weights sets the interpolation weights of the link for wall fraction q,
// with the neighbours that neighbours found for a q on the same side of
// 1/2: quadratic where both (q < 1/2) or the one (q >= 1/2) exist, else
// linear (Bouzidi, Firdaouss & Lallemand 2001, Phys. Fluids 13, 3452).
func (p *preparedLink) weights(q float64) {
	p.q = q
	p.cA, p.cB, p.c1, p.c2, p.cw, p.quad = 0, 0, 0, 0, 0, false
	if q < 0.5 {
		switch {
		case p.n2 >= 0:
			p.cA, p.c1, p.c2, p.cw = q*(1+2*q), 1-4*q*q, -q*(1-2*q), 1
			p.quad = true
		case p.n1 >= 0:
			p.cA, p.c1, p.cw = 2*q, 1-2*q, 1
		default:
			p.cA, p.cw = 1, 1
		}
		return
	}
	if p.n1 >= 0 {
		p.cA, p.cB, p.c1, p.cw = 1/(q*(2*q+1)), (2*q-1)/q, -(2*q-1)/(2*q+1), 1/(q*(2*q+1))
		p.quad = true
	} else {
		p.cA, p.cB, p.cw = 1/(2*q), (2*q-1)/(2*q), 1/(2*q)
	}
}

// UpdateBoundary is SetBoundary for the links last set for body id with
// only their wall fractions changed (the body moved but no node changed
// between fluid and solid near it): the neighbours are kept unless a
// fraction crosses 1/2, and the weights recomputed, which gives the same
// prepared links as SetBoundary. links must be the same links, in the same
// order, as last set.
func (s *Solver) UpdateBoundary(id int, links []Link, vz float64) error {
	if id < 0 || id >= len(s.bodies) || len(links) != len(s.bodies[id].links) {
		return fmt.Errorf("lbm: body %d: update of %d links that were not set", id, len(links))
	}
	b := s.bodies[id]
	b.vz = vz
	b.fallback = 0
	for x, l := range links {
		p := &b.links[x]
		if p.dir != l.Dir || l.J < 0 || l.J >= s.nr || l.K < 0 || l.K >= s.nz || p.src != s.idx(l.K, l.J) {
			return fmt.Errorf("lbm: body %d: link %d (%d,%d) dir %d is not the one set before", id, x, l.K, l.J, l.Dir)
		}
		if !(l.Q > 0 && l.Q <= 1) {
			return fmt.Errorf("lbm: body %d: link (%d,%d) dir %d q %g: need 0 < q <= 1", id, l.K, l.J, l.Dir, l.Q)
		}
		if (l.Q < 0.5) != (p.q < 0.5) {
			s.neighbours(p, l)
		}
		p.weights(l.Q)
		if !p.quad {
			b.fallback++
		}
	}
	return nil
}

// boundaryPass writes, for every link of every body, the population the
// fluid node will pull from inside the body, and accumulates the force.
// It runs after fillHalo (an axis-crossing link overwrites the mirrored
// ghost value it replaces) and touches only the links. The momentum given
// to the body by a link is, in the wall's frame (Wen, Zhang, Tu, Wang &
// Fang 2014, J. Comput. Phys. 266, 161),
//
//	dP = (f*_i + f_opp) e_i - (f*_i - f_opp) u_w,
//
// weighted by the ring 2 pi r_mid of the link midpoint, the weight for
// which a uniform pressure exerts exactly no force (METHODS.md 7.4). The
// sums run over the links in order, so the force does not depend on the
// number of goroutines. Fields runs it too, with record false, so that the
// moments next to a body see the values the next Step will stream.
//
// With float32 storage the written value is rounded to float32 first and
// the force uses the rounded value, the one the fluid sees.
//
// With several bodies and goroutines, the bodies are shared out among the
// workers: a body's links write only into its own solid nodes (and the
// mirror images below the axis of those) and read only fluid nodes, so the
// bodies do not interact here, and each body's force is still summed over
// its links in order.
func (s *Solver) boundaryPass(record bool) {
	if len(s.bodies) > 1 && s.Threads() > 1 {
		s.pool.runTask(task{s: s, on: record, fn: boundaryTask})
		return
	}
	for id := range s.bodies {
		s.boundaryBody(id, record)
	}
}

// boundaryTask is the boundary pass of bodies w, w + workers, ...
func boundaryTask(t *task, _, _, w int) {
	s := t.s
	for id := w; id < len(s.bodies); id += len(s.pool.slabs) {
		s.boundaryBody(id, t.on)
	}
}

// boundaryBody is the boundary pass of body id.
func (s *Solver) boundaryBody(id int, record bool) {
	if s.single {
		boundaryLinks(s.bodies[id], &s.a32, record)
	} else {
		boundaryLinks(s.bodies[id], &s.a, record)
	}
}

func boundaryLinks[T real](b *Boundary, a *[Q][]T, record bool) {
	var fz float64
	uw := b.vz
	for x := range b.links {
		p := &b.links[x]
		fi := float64(a[p.dir][p.src])
		v := p.cA*fi + p.cw*p.wallTerm*uw
		if p.cB != 0 {
			v += p.cB * float64(a[p.opp][p.src])
		}
		if p.n1 >= 0 {
			v += p.c1 * float64(a[p.d1][p.n1])
		}
		if p.n2 >= 0 {
			v += p.c2 * float64(a[p.d2][p.n2])
		}
		vt := T(v)
		a[p.opp][p.dst] = vt
		v = float64(vt)
		fz += p.ring * ((fi+v)*p.ez - (fi-v)*uw)
	}
	if record {
		b.force = fz
	}
}

// BoundaryReaction returns zeta, the immediate reaction of body id's link
// force to its wall velocity: the force of a Step contains -zeta u_w
// through the moving-wall terms, zeta = sum over links of
// 2 pi r_mid 6 c_w w_i e_iz^2 (Ladd & Verberg 2001, J. Stat. Phys. 104,
// 1191; METHODS.md 8.4). An explicit body update of mass m is unstable when
// zeta/m > 2.
func (s *Solver) BoundaryReaction(id int) float64 {
	if id >= len(s.bodies) {
		return 0
	}
	var z float64
	for _, p := range s.bodies[id].links {
		z += p.ring * p.cw * (-p.wallTerm) * p.ez
	}
	return z
}
