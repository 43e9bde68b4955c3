package lbm

import (
	"fmt"
	"math"
	"testing"
)

// TestSIMDMatchesPortable runs the same lattices with each SIMD kernel
// path this processor can run (AVX-512, AVX2) and with the portable Go
// kernel and asks for the same bits: every population after 25 steps and
// the moments of Fields. The grid is not a multiple of either SIMD width
// and a solid block cuts rows into runs of odd lengths, so full vectors,
// tails and runs shorter than one vector all occur; the cases cover the
// axisymmetric passes (TRT, MRT) and the planar kernel (BGK, TRT), closed
// and periodic ends, with a body force. TestSIMDMatchesPortable32 does the
// same with float32 storage.
func TestSIMDMatchesPortable(t *testing.T) {
	testSIMDMatchesPortable(t, false)
}

// TestSIMDMatchesPortable32 is TestSIMDMatchesPortable with float32
// storage of the populations (Config.Single).
func TestSIMDMatchesPortable32(t *testing.T) {
	testSIMDMatchesPortable(t, true)
}

func testSIMDMatchesPortable(t *testing.T, single bool) {
	paths := Kernels()
	if len(paths) == 1 {
		t.Skip("SKIPPED: this processor or build has no SIMD kernel (AVX-512 or AVX2 on amd64, without the purego tag); only the portable kernel is tested")
	}
	if goFusesMultiplyAdd {
		t.Skip("SKIPPED: built with GOAMD64=v3 or later, Go fuses multiply-adds in the portable kernel, which then rounds differently from the SIMD ones; build with the default GOAMD64 to compare them")
	}
	type variant struct {
		col      Collision
		axi, per bool
	}
	variants := []variant{
		{TRT, true, false}, {TRT, true, true}, {MRT, true, false},
		{BGK, false, true}, {TRT, false, false}, {MRT, true, true},
	}
	run := func(t *testing.T, v variant, path KernelPath) (*Solver, *Fields) {
		s, err := New(Config{Nz: 83, Nr: 21, Tau: 0.62, Collision: v.col,
			Axisymmetric: v.axi, PeriodicZ: v.per, Threads: 2, Kernel: path, Single: single})
		if err != nil {
			t.Fatal(err)
		}
		if got := s.Kernel(); got != path {
			t.Fatalf("kernel %q, want %q", got, path)
		}
		for j := 3; j < 9; j++ { // runs of 30-j and 83-37-j nodes beside it
			for k := 30 - j; k < 37; k++ {
				s.SetSolid(k, j, true)
			}
		}
		for k := 60; k < 83; k += 4 { // and runs of 3, 2 and 1 nodes
			s.SetSolid(k, 12, true)
			s.SetSolid(k+1, 13, true)
			s.SetSolid(k+2, 13, true)
		}
		randomState(s, 11)
		s.SetForce(2e-5, -1e-5)
		for range 25 {
			s.Step()
		}
		return s, s.Fields(nil)
	}
	for _, path := range paths[:len(paths)-1] {
		for _, v := range variants {
			name := fmt.Sprintf("%s/%v/axisymmetric=%v/periodic=%v", path, v.col, v.axi, v.per)
			t.Run(name, func(t *testing.T) {
				sv, fv := run(t, v, path)
				sp, fp := run(t, v, KernelPortable)
				defer sv.Close()
				defer sp.Close()
				diff := 0
				for i := range Q {
					for n := range sv.planeLen() {
						if math.Float64bits(sv.pop(i, n)) != math.Float64bits(sp.pop(i, n)) {
							diff++
						}
					}
				}
				if diff > 0 {
					t.Errorf("%d populations differ between the %s and the portable kernel", diff, path)
				}
				for n := range fv.Rho {
					if fv.Rho[n] != fp.Rho[n] || fv.Uz[n] != fp.Uz[n] || fv.Ur[n] != fp.Ur[n] {
						t.Errorf("moments at node %d differ: %v %v %v vs %v %v %v",
							n, fv.Rho[n], fv.Uz[n], fv.Ur[n], fp.Rho[n], fp.Uz[n], fp.Ur[n])
						break
					}
				}
			})
		}
	}
}

// TestEndGhosts: the end ghost values the kernel writes row by row
// (endGhosts) are the ones a full fillHalo writes from the same lattice,
// bit for bit, for closed and periodic ends and both storage types.
func TestEndGhosts(t *testing.T) {
	for _, per := range []bool{false, true} {
		for _, single := range []bool{false, true} {
			s, err := New(Config{Nz: 19, Nr: 7, Tau: 0.7, Axisymmetric: true, PeriodicZ: per, Threads: 2, Single: single})
			if err != nil {
				t.Fatal(err)
			}
			randomState(s, 5)
			for step := range 3 {
				s.Step() // the kernel wrote the new lattice's end ghosts
				var kernel []float64
				ends := func() []float64 {
					var v []float64
					for i := range Q {
						for j := -1; j <= s.nr; j++ {
							if per && (j < 0 || j == s.nr) {
								continue // corners: fillHalo's in both cases
							}
							v = append(v, s.pop(i, s.idx(-1, j)), s.pop(i, s.idx(s.nz, j)))
						}
					}
					return v
				}
				kernel = ends()
				s.haloStale = true
				s.fillHalo()
				full := ends()
				for x := range full {
					if math.Float64bits(full[x]) != math.Float64bits(kernel[x]) {
						t.Errorf("periodic=%v float32=%v step %d: end ghost %d is %v from the kernel, %v from fillHalo",
							per, single, step, x, kernel[x], full[x])
						break
					}
				}
			}
			s.Close()
		}
	}
}
