package geometry

import (
	"math"

	"axiswim/lbm"
)

// Sphere is a sphere centred on the axis at z = Z with radius Radius
// (lattice units).
type Sphere struct {
	Z, Radius float64
}

// Domain is the lattice the bodies live in.
type Domain struct {
	Nz, Nr   int
	Periodic bool // periodic in z with period Nz
}

// dz returns z - s.Z, with the nearest periodic image when periodic.
func (d Domain) dz(z, zc float64) float64 {
	x := z - zc
	if d.Periodic {
		L := float64(d.Nz)
		x -= L * math.Round(x/L)
	}
	return x
}

// Inside reports whether the point (z, r) lies inside or on the sphere
// (r may be negative: the mirror image).
func (d Domain) Inside(s Sphere, z, r float64) bool {
	x := d.dz(z, s.Z)
	return x*x+r*r <= s.Radius*s.Radius
}

// NodeInside reports whether node (k, j) lies inside or on the sphere;
// j = -1 is the ghost row below the axis.
func (d Domain) NodeInside(s Sphere, k, j int) bool {
	return d.Inside(s, float64(k)+0.5, float64(j)+0.5)
}

// Fraction returns the fraction q in (0, 1] of the link from the point
// (z, r) outside the sphere along (ez, er) at which it meets the surface:
// the smaller root of |x + q e - c|^2 = a^2 (METHODS.md 5.1), exact for the
// circle. ok is false if the link does not reach the surface.
func (d Domain) Fraction(s Sphere, z, r float64, ez, er int) (q float64, ok bool) {
	x := d.dz(z, s.Z)
	fz, fr := float64(ez), float64(er)
	A := fz*fz + fr*fr
	B := 2 * (x*fz + r*fr)
	C := x*x + r*r - s.Radius*s.Radius
	disc := B*B - 4*A*C
	if C <= 0 || disc < 0 {
		return 0, false
	}
	// Stable form of the smaller root for B < 0 (the link points inward):
	// q = 2C / (-B + sqrt(disc)).
	q = 2 * C / (-B + math.Sqrt(disc))
	if !(q > 0) || q > 1 {
		return 0, false
	}
	return q, true
}

// box returns the node range [k0, k1] x [0, j1] that can hold nodes within
// one cell of the sphere; with periodic ends k may wrap and is returned
// unreduced.
func (d Domain) box(s Sphere) (k0, k1, j1 int) {
	k0 = int(math.Floor(s.Z-s.Radius-0.5)) - 2
	k1 = int(math.Ceil(s.Z+s.Radius-0.5)) + 2
	j1 = min(int(math.Ceil(s.Radius-0.5))+2, d.Nr-1)
	if !d.Periodic {
		k0, k1 = max(k0, 0), min(k1, d.Nz-1)
	}
	return
}

// wrap reduces k into [0, Nz) when periodic.
func (d Domain) wrap(k int) int {
	if d.Periodic {
		return ((k % d.Nz) + d.Nz) % d.Nz
	}
	return k
}

// Node is a lattice node.
type Node struct{ K, J int }

// Nodes returns the nodes inside or on the sphere.
func (d Domain) Nodes(s Sphere) []Node {
	return d.AppendNodes(nil, s)
}

// AppendNodes is Nodes appending to out.
func (d Domain) AppendNodes(out []Node, s Sphere) []Node {
	k0, k1, j1 := d.box(s)
	for j := 0; j <= j1; j++ {
		for k := k0; k <= k1; k++ {
			if d.NodeInside(s, k, j) {
				out = append(out, Node{d.wrap(k), j})
			}
		}
	}
	return out
}

// Links returns the boundary links of the sphere: every fluid node outside
// it (not inside any body, as solid reports) and every direction whose
// neighbour is inside this sphere, with the exact fraction q. Links from
// row 0 that cross the axis into the mirror image are included. The order
// is by row, then column, then direction, so it is reproducible.
func (d Domain) Links(s Sphere, solid func(k, j int) bool) []lbm.Link {
	return d.AppendLinks(nil, s, solid)
}

// AppendLinks is Links appending to out, so that a caller can reuse one
// slice from step to step.
func (d Domain) AppendLinks(out []lbm.Link, s Sphere, solid func(k, j int) bool) []lbm.Link {
	k0, k1, j1 := d.box(s)
	// A node further than a + sqrt(2) from the centre has no neighbour
	// inside (triangle inequality, also for the mirror image and the
	// nearest periodic image) and is skipped before the eight tests; the
	// margin 1.5 > sqrt(2) covers the round-off of Inside.
	far := (s.Radius + 1.5) * (s.Radius + 1.5)
	// A node nearer than a - 1.5 to the centre is inside with all its
	// neighbours, hence solid, and has no links either. Each row is
	// scanned only over the chords between the two circles (a cell wider
	// on each side for round-off); the exact tests below decide.
	deep := -1.0
	if s.Radius > 1.5 {
		deep = (s.Radius - 1.5) * (s.Radius - 1.5)
	}
	for j := 0; j <= j1; j++ {
		r := float64(j) + 0.5
		if r*r > far {
			break
		}
		xo := math.Sqrt(far - r*r)
		xi := math.Sqrt(max(deep-r*r, 0))
		// x = kk + 0.5 - Z within [-xo, -xi] or [xi, xo]
		l0 := max(k0, int(math.Floor(s.Z-xo-0.5))-1)
		l1 := min(k1, int(math.Ceil(s.Z-xi-0.5))+1)
		r0 := max(k0, int(math.Floor(s.Z+xi-0.5))-1)
		r1 := min(k1, int(math.Ceil(s.Z+xo-0.5))+1)
		if r0 <= l1 {
			l1, r0 = r1, r1+1 // the windows overlap: one range
		}
		for kk := l0; kk <= r1; kk++ {
			if kk == l1+1 && r0 > kk {
				kk = r0
			}
			k := d.wrap(kk)
			z := float64(kk) + 0.5
			if x := d.dz(z, s.Z); x*x+r*r > far || x*x+r*r < deep {
				continue
			}
			if k < 0 || k >= d.Nz || solid(k, j) {
				continue
			}
			for i := 1; i < lbm.Q; i++ {
				if !d.Inside(s, z+float64(lbm.Ez[i]), r+float64(lbm.Er[i])) {
					continue
				}
				q, ok := d.Fraction(s, z, r, lbm.Ez[i], lbm.Er[i])
				if !ok {
					// the neighbour is inside but the node is on the
					// surface within round-off: treat the wall as at the node
					q = 1e-12
				}
				out = append(out, lbm.Link{K: k, J: j, Dir: i, Q: q})
			}
		}
	}
	return out
}

// UpdateFractions recomputes the wall fractions Q of links that
// AppendLinks found for a sphere, for the sphere s it has moved to, as
// AppendLinks would: valid while no node changed between inside and
// outside (the same links exist) and the ends are not periodic (a link's
// K is then the node AppendLinks measured from, not a periodic image).
func (d Domain) UpdateFractions(links []lbm.Link, s Sphere) {
	for x := range links {
		l := &links[x]
		q, ok := d.Fraction(s, float64(l.K)+0.5, float64(l.J)+0.5, lbm.Ez[l.Dir], lbm.Er[l.Dir])
		if !ok {
			q = 1e-12 // as AppendLinks: the wall at the node within round-off
		}
		l.Q = q
	}
}

// Within reports whether node (k, j) lies within dist along z of the
// sphere's centre (nearest periodic image), whatever its row.
func (d Domain) Within(s Sphere, k int, dist float64) bool {
	return math.Abs(d.dz(float64(k)+0.5, s.Z)) <= dist
}

// Normal returns the outward unit normal of the sphere at node (k, j).
func (d Domain) Normal(s Sphere, k, j int) (nz, nr float64) {
	x := d.dz(float64(k)+0.5, s.Z)
	r := float64(j) + 0.5
	h := math.Hypot(x, r)
	return x / h, r / h
}

// Move returns the nodes that a sphere moving from a to b covers (inside b,
// not inside a) and uncovers (inside a, not inside b).
func (d Domain) Move(a, b Sphere) (covered, uncovered []Node) {
	return d.AppendMove(nil, nil, a, b)
}

// AppendMove is Move appending to covered and uncovered, so that a caller
// can reuse the slices from step to step.
//
// In a row, a node can be inside one sphere and not the other only
// between the two back ends of the spheres' chords or between the two
// front ends (or anywhere on the chord of a sphere that the other misses),
// so each row is scanned only in windows around those, padded by a cell
// against round-off; every node the windows hold is tested exactly as
// before, in the same order. When a periodic image could fold back into
// the box (a span wider than half the domain), the whole box is scanned.
func (d Domain) AppendMove(covered, uncovered []Node, a, b Sphere) ([]Node, []Node) {
	lo, hi := a, b
	if b.Z < a.Z {
		lo, hi = b, a
	}
	span := Sphere{Z: 0.5 * (lo.Z + hi.Z), Radius: 0.5*(hi.Z-lo.Z) + math.Max(a.Radius, b.Radius)}
	k0, k1, j1 := d.box(span)
	windows := !d.Periodic || 2*(span.Radius+4) < float64(d.Nz)
	for j := 0; j <= j1; j++ {
		w := [2][2]int{{k0, k1}, {1, 0}} // the whole row, and an empty window
		if windows {
			var ok bool
			if w, ok = moveWindows(a, b, j, k0, k1); !ok {
				continue
			}
		}
		for _, kw := range w {
			for k := kw[0]; k <= kw[1]; k++ {
				ina, inb := d.NodeInside(a, k, j), d.NodeInside(b, k, j)
				switch {
				case inb && !ina:
					covered = append(covered, Node{d.wrap(k), j})
				case ina && !inb:
					uncovered = append(uncovered, Node{d.wrap(k), j})
				}
			}
		}
	}
	return covered, uncovered
}

// chord returns the half-length of the chord of sphere s along row j; ok
// is false when the row misses the sphere (then no node of the row is
// inside it: x^2 + r^2 >= r^2 > a^2 in floating point too).
func chord(s Sphere, j int) (h float64, ok bool) {
	r := float64(j) + 0.5
	h2 := s.Radius*s.Radius - r*r
	if h2 < 0 {
		return 0, false
	}
	return math.Sqrt(h2), true
}

// moveWindows returns the node ranges of row j, within [k0, k1] and in
// increasing order, that hold every node inside one of a and b and not the
// other; ok is false when the row misses both.
func moveWindows(a, b Sphere, j, k0, k1 int) (w [2][2]int, ok bool) {
	ha, oka := chord(a, j)
	hb, okb := chord(b, j)
	var z [2][2]float64 // windows in z
	switch {
	case oka && okb:
		z[0] = [2]float64{math.Min(a.Z-ha, b.Z-hb), math.Max(a.Z-ha, b.Z-hb)}
		z[1] = [2]float64{math.Min(a.Z+ha, b.Z+hb), math.Max(a.Z+ha, b.Z+hb)}
	case oka:
		z[0], z[1] = [2]float64{a.Z - ha, a.Z + ha}, [2]float64{1, 0}
	case okb:
		z[0], z[1] = [2]float64{b.Z - hb, b.Z + hb}, [2]float64{1, 0}
	default:
		return w, false
	}
	for x := range z {
		if z[x][0] > z[x][1] {
			w[x] = [2]int{1, 0}
			continue
		}
		// node k sits at z = k + 1/2; one cell of padding each side
		w[x] = [2]int{max(k0, int(math.Floor(z[x][0]-1.5))), min(k1, int(math.Ceil(z[x][1]+0.5)))}
	}
	if w[1][0] <= w[0][1]+1 && w[1][0] <= w[1][1] { // overlapping or adjacent: one window
		w[0][1], w[1] = max(w[0][1], w[1][1]), [2]int{1, 0}
	}
	return w, true
}
