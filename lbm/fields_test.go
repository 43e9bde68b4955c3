package lbm

import (
	"math"
	"testing"
)

// blockLattice returns an axisymmetric lattice with a solid block on the
// axis, its boundary links (halfway, q = 1/2) and a flow that is not
// uniform, after a few steps.
func blockLattice(t *testing.T, threads int) *Solver {
	t.Helper()
	s, err := New(Config{Nz: 40, Nr: 12, Tau: 0.7, Axisymmetric: true, Threads: threads})
	if err != nil {
		t.Fatal(err)
	}
	s.SetEquilibrium(func(k, j int) (rho, uz, ur float64) {
		return 1 + 1e-3*math.Sin(0.3*float64(k)), 1e-3 * math.Cos(0.2*float64(j+k)), 0
	})
	solid := func(k, j int) bool { return k >= 15 && k < 22 && j < 4 }
	for j := 0; j < 4; j++ {
		for k := 15; k < 22; k++ {
			s.SetSolid(k, j, true)
		}
	}
	var links []Link
	for j := 0; j < 12; j++ {
		for k := 0; k < 40; k++ {
			if solid(k, j) {
				continue
			}
			for i := 1; i < Q; i++ {
				if kk, jj := k+Ez[i], j+Er[i]; jj >= 0 && solid(kk, jj) {
					links = append(links, Link{K: k, J: j, Dir: i, Q: 0.5})
				}
			}
		}
	}
	if err := s.SetBoundary(0, links, 1e-3); err != nil {
		t.Fatal(err)
	}
	s.SetForce(1e-6, 0)
	for n := 0; n < 5; n++ {
		s.Step()
	}
	return s
}

// TestFieldsDensityMatchesFluidDensity: the density FieldsDensity measures
// in its pass over the lattice is FluidDensity's, bit for bit (the same
// sums in the same order), and its fields are those of Fields, for 1 and 3
// goroutines.
func TestFieldsDensityMatchesFluidDensity(t *testing.T) {
	for _, threads := range []int{1, 3} {
		s := blockLattice(t, threads)
		want := s.FluidDensity()
		f, got := s.FieldsDensity(nil)
		if got != want {
			t.Errorf("threads=%d: FieldsDensity gives density %v, FluidDensity %v", threads, got, want)
		}
		g := s.Fields(nil)
		for i := range g.Rho {
			if f.Rho[i] != g.Rho[i] || f.Uz[i] != g.Uz[i] || f.Ur[i] != g.Ur[i] {
				t.Fatalf("threads=%d: node %d: FieldsDensity's fields differ from Fields'", threads, i)
			}
		}
		s.Close()
	}
}

// TestPassesAllocateNothing: the parallel passes outside the kernel (fields,
// reductions, the density shift) and a refill allocate nothing once their
// outputs exist, so that a step of a run with bodies allocates nothing.
func TestPassesAllocateNothing(t *testing.T) {
	s := blockLattice(t, 2)
	defer s.Close()
	f := s.Fields(nil)
	for name, fn := range map[string]func(){
		"Step":          s.Step,
		"Fields":        func() { s.Fields(f) },
		"FieldsDensity": func() { s.FieldsDensity(f) },
		"FluidDensity":  func() { s.FluidDensity() },
		"ShiftDensity":  func() { s.ShiftDensity(1e-9) },
		"Mass":          func() { s.Mass() },
		"Mass3D":        func() { s.Mass3D(f) },
	} {
		if a := testing.AllocsPerRun(5, fn); a != 0 {
			t.Errorf("%s allocates %g times", name, a)
		}
	}
	// uncover the block's two rightmost nodes on the axis
	s.SetSolid(21, 0, false)
	s.SetSolid(21, 1, false)
	fresh := []Fresh{{K: 21, J: 0, Nz: 1, Uz: 1e-3}, {K: 21, J: 1, Nz: 1, Uz: 1e-3}}
	if a := testing.AllocsPerRun(5, func() { s.Refill(fresh) }); a != 0 {
		t.Errorf("Refill allocates %g times", a)
	}
}
