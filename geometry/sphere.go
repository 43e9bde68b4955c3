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
	var out []Node
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
	var out []lbm.Link
	k0, k1, j1 := d.box(s)
	for j := 0; j <= j1; j++ {
		for kk := k0; kk <= k1; kk++ {
			k := d.wrap(kk)
			if k < 0 || k >= d.Nz || solid(k, j) {
				continue
			}
			z, r := float64(kk)+0.5, float64(j)+0.5
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
	lo, hi := a, b
	if b.Z < a.Z {
		lo, hi = b, a
	}
	span := Sphere{Z: 0.5 * (lo.Z + hi.Z), Radius: 0.5*(hi.Z-lo.Z) + math.Max(a.Radius, b.Radius)}
	k0, k1, j1 := d.box(span)
	for j := 0; j <= j1; j++ {
		for k := k0; k <= k1; k++ {
			ina, inb := d.NodeInside(a, k, j), d.NodeInside(b, k, j)
			switch {
			case inb && !ina:
				covered = append(covered, Node{d.wrap(k), j})
			case ina && !inb:
				uncovered = append(uncovered, Node{d.wrap(k), j})
			}
		}
	}
	return covered, uncovered
}
