package geometry

import (
	"math"
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
