package geometry

import (
	"math"
	"math/rand/v2"
	"testing"

	"axiswim/lbm"
)

// TestFractionOnSurface: the wall point x_f + q e_i of every link lies on
// the sphere to round-off (the exact circle intersection of METHODS.md
// 5.1), q is in (0, 1], and links from row 0 reach the mirror image.
func TestFractionOnSurface(t *testing.T) {
	d := Domain{Nz: 60, Nr: 20}
	s := Sphere{Z: 27.31, Radius: 6.7}
	solid := func(k, j int) bool { return d.NodeInside(s, k, j) }
	links := d.Links(s, solid)
	if len(links) == 0 {
		t.Fatal("no links")
	}
	mirror := 0
	for _, l := range links {
		if !(l.Q > 0 && l.Q <= 1) {
			t.Fatalf("link %+v: q out of (0,1]", l)
		}
		z := float64(l.K) + 0.5 + l.Q*float64(lbm.Ez[l.Dir])
		r := float64(l.J) + 0.5 + l.Q*float64(lbm.Er[l.Dir])
		if e := math.Abs(math.Hypot(z-s.Z, r) - s.Radius); e > 1e-12 {
			t.Errorf("link %+v: wall point off the surface by %g", l, e)
		}
		if l.J+lbm.Er[l.Dir] < 0 {
			mirror++
		}
	}
	if mirror == 0 {
		t.Error("no link crosses the axis into the mirror image")
	}
}

// TestLinksComplete: every fluid node next to a solid node has exactly one
// link per solid neighbour, including neighbours below the axis.
func TestLinksComplete(t *testing.T) {
	d := Domain{Nz: 40, Nr: 16}
	s := Sphere{Z: 19.77, Radius: 5.2}
	inside := func(k, j int) bool { return d.NodeInside(s, k, j) }
	want := 0
	for j := 0; j < d.Nr; j++ {
		for k := 0; k < d.Nz; k++ {
			if inside(k, j) {
				continue
			}
			for i := 1; i < lbm.Q; i++ {
				if inside(k+lbm.Ez[i], j+lbm.Er[i]) {
					want++
				}
			}
		}
	}
	if got := len(d.Links(s, inside)); got != want {
		t.Errorf("%d links, want %d", got, want)
	}
}

// TestMoveBookkeeping: the nodes covered and uncovered by a move are
// exactly the difference of the two node sets.
func TestMoveBookkeeping(t *testing.T) {
	d := Domain{Nz: 50, Nr: 15}
	a := Sphere{Z: 20.2, Radius: 7.1}
	for _, dz := range []float64{0.37, -0.91, 1.0, 0.004} {
		b := Sphere{Z: a.Z + dz, Radius: a.Radius}
		cov, unc := d.Move(a, b)
		na, nb := set(d.Nodes(a)), set(d.Nodes(b))
		for _, n := range cov {
			if na[n] || !nb[n] {
				t.Errorf("dz=%g: %v covered but was inside or is outside", dz, n)
			}
		}
		for _, n := range unc {
			if !na[n] || nb[n] {
				t.Errorf("dz=%g: %v uncovered but was outside or is inside", dz, n)
			}
		}
		if len(nb)-len(na) != len(cov)-len(unc) {
			t.Errorf("dz=%g: node count changed by %d, covered-uncovered %d", dz, len(nb)-len(na), len(cov)-len(unc))
		}
	}
}

// TestPeriodicImage: with periodic ends a sphere across the end has nodes
// at both ends.
func TestPeriodicImage(t *testing.T) {
	d := Domain{Nz: 30, Nr: 10, Periodic: true}
	nodes := d.Nodes(Sphere{Z: 1.0, Radius: 3})
	var lo, hi bool
	for _, n := range nodes {
		lo = lo || n.K < 5
		hi = hi || n.K > 25
		if n.K < 0 || n.K >= d.Nz {
			t.Fatalf("node %v outside the domain", n)
		}
	}
	if !lo || !hi {
		t.Error("the periodic image is missing")
	}
}

func set(ns []Node) map[Node]bool {
	m := make(map[Node]bool, len(ns))
	for _, n := range ns {
		m[n] = true
	}
	return m
}

// linksUnfiltered is Links as first written, testing all eight neighbours
// of every node in the box: the reference of TestLinksPrefilter.
func linksUnfiltered(d Domain, s Sphere, solid func(k, j int) bool) []lbm.Link {
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
					q = 1e-12
				}
				out = append(out, lbm.Link{K: k, J: j, Dir: i, Q: q})
			}
		}
	}
	return out
}

// TestLinksPrefilter: skipping the nodes too far from the sphere to have a
// neighbour inside it changes no link, bit for bit, whatever the position
// (closed and periodic ends, a sphere across the end, radii with nodes on
// the surface) and with another body's nodes solid too.
func TestLinksPrefilter(t *testing.T) {
	for _, periodic := range []bool{false, true} {
		d := Domain{Nz: 48, Nr: 14, Periodic: periodic}
		other := Sphere{Z: 35.2, Radius: 3.3}
		for _, s := range []Sphere{{Z: 12.31, Radius: 6.7}, {Z: 1.9, Radius: 5.5}, {Z: 20, Radius: 4}, {Z: 14.5, Radius: 7.5}} {
			for _, shift := range []float64{0, 0.137, 0.5, 0.93} {
				s := Sphere{Z: s.Z + shift, Radius: s.Radius}
				if !periodic && s.Z-s.Radius < 0 {
					continue
				}
				solid := func(k, j int) bool { return d.NodeInside(s, k, j) || d.NodeInside(other, k, j) }
				got, want := d.Links(s, solid), linksUnfiltered(d, s, solid)
				if len(got) != len(want) {
					t.Errorf("periodic %v, sphere %+v: %d links, want %d", periodic, s, len(got), len(want))
					continue
				}
				for x := range got {
					if got[x] != want[x] {
						t.Errorf("periodic %v, sphere %+v: link %d is %+v, want %+v", periodic, s, x, got[x], want[x])
						break
					}
				}
			}
		}
	}
}

// moveUnwindowed is Move as first written, testing every node of the box:
// the reference of TestMoveWindows.
func moveUnwindowed(d Domain, a, b Sphere) (covered, uncovered []Node) {
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

// TestMoveWindows: scanning each row only near the ends of the chords
// finds the same covered and uncovered nodes, in the same order, as
// scanning the whole box, for small and large moves, a radius that
// changes, spheres at and across the ends, and nodes on the surface.
func TestMoveWindows(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	same := func(x, y []Node) bool {
		if len(x) != len(y) {
			return false
		}
		for i := range x {
			if x[i] != y[i] {
				return false
			}
		}
		return true
	}
	for _, d := range []Domain{{Nz: 60, Nr: 20}, {Nz: 60, Nr: 20, Periodic: true}, {Nz: 24, Nr: 12, Periodic: true}} {
		for n := 0; n < 3000; n++ {
			ra := []float64{3, 5.5, 6.7, 8.2, 9.5}[rng.IntN(5)]
			rb := ra
			if n%7 == 0 {
				rb = ra + 6*(rng.Float64()-0.5)
			}
			za := rng.Float64() * float64(d.Nz)
			if n%5 == 0 {
				za = math.Round(za) // nodes on the surface
			}
			dz := []float64{0.01, 0.3, 0.49, 0.99, 2.5, 13}[rng.IntN(6)] * (2*rng.Float64() - 1)
			a, b := Sphere{Z: za, Radius: ra}, Sphere{Z: za + dz, Radius: rb}
			c, u := d.Move(a, b)
			wc, wu := moveUnwindowed(d, a, b)
			if !same(c, wc) || !same(u, wu) {
				t.Fatalf("%+v, %+v to %+v: covered %v uncovered %v, want %v and %v", d, a, b, c, u, wc, wu)
			}
		}
	}
}
