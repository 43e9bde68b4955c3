package lbm

import (
	"math"
	"testing"
)

// poiseuilleLevels runs force-driven flow between the mirror line (or the
// axis) and the wall of a periodic channel of nr level-0 cells, refined by
// block, to steady state and returns the largest error of u_z on every
// level's nodes against the exact parabola, relative to u_max.
func poiseuilleLevels(t *testing.T, axi bool, nr int, block Block, tau0 float64) float64 {
	t.Helper()
	var blocks []Block
	if block.Nz > 0 {
		blocks = []Block{block}
	}
	h, err := NewLevels(Config{Nz: 16, Nr: nr, Tau: tau0, PeriodicZ: true, Axisymmetric: axi, Threads: 1}, blocks)
	if err != nil {
		t.Fatal(err)
	}
	defer h.Close()
	const g = 1e-6
	h.SetForce(g, 0)
	nu := h.Level(0).Viscosity()
	// 10 viscous times: the slowest start-up mode (exp(-2.47 nu t/H^2) in
	// the channel) has decayed to 2e-11.
	steps := int(10 * float64(nr*nr) / nu)
	for n := 0; n < steps; n++ {
		h.Step()
	}
	R := float64(nr)
	exact := func(r float64) float64 {
		if axi {
			return g / (4 * nu) * (R*R - r*r)
		}
		return g / (2 * nu) * (R*R - r*r)
	}
	umax := exact(0)
	var worst float64
	for l := 0; l < h.Len(); l++ {
		f := h.Fields(l, nil)
		dx := math.Ldexp(1, -l)
		for j := 0; j < f.Nr; j++ {
			r := (float64(h.Level(l).Config().RowOffset+j) + 0.5) * dx
			for k := 0; k < f.Nz; k++ {
				worst = math.Max(worst, math.Abs(f.Uz[f.At(k, j)]-exact(r))/umax)
			}
		}
	}
	return worst
}

// TestLevelsPoiseuille: force-driven Poiseuille flow in a plane channel
// and in a pipe is exact to round-off on a uniform lattice with TRT at
// Lambda = 3/16 (Ginzburg, Verhaeghe & d'Humieres 2008; the pipe with our
// axisymmetric terms too, as the uniform case here shows). With a level
// boundary across the flow (the fine block spanning the radius, half the
// length) and one along it (the fine block from half the radius to the
// wall, the whole length), every level's velocity stays within 0.1% of
// u_max of the exact profile, the tolerance issue 17 sets (measured when
// this was written: 1e-5 across, 2e-11 and 2e-14 along). For scale, the
// same channel across the flow with the non-equilibrium not rescaled was
// off by up to 40%, with a restriction by the mean of the four fine cells
// (second order instead of fourth) by 4%, and without the exchange of the
// force's half in the stored momentum (forceAt) by 3e-4 to 5e-4.
func TestLevelsPoiseuille(t *testing.T) {
	for _, axi := range []bool{false, true} {
		for _, c := range []struct {
			name  string
			block Block
		}{
			{"uniform", Block{}},
			{"across", Block{Z0: 4, R0: 0, Nz: 8, Nr: 8}},
			{"along", Block{Z0: 0, R0: 4, Nz: 16, Nr: 4}},
		} {
			e := poiseuilleLevels(t, axi, 8, c.block, 0.65)
			tol := 1e-3
			if c.name == "uniform" {
				tol = 1e-9 // the start-up's remainder, 2e-11
			}
			if e > tol {
				t.Errorf("axisymmetric=%v, interface %s: max error %.3g of u_max, want <= %g", axi, c.name, e, tol)
			} else {
				t.Logf("axisymmetric=%v, interface %s: max error %.3g of u_max", axi, c.name, e)
			}
		}
	}
}

// TestLevelsThreads: each ghost and restricted cell of the transfers
// between levels is computed from its own stencil alone, whichever worker
// does it, and each level's steps are bit-for-bit independent of the
// number of goroutines, so the levels are too (the project's rule).
func TestLevelsThreads(t *testing.T) {
	run := func(threads int) [][Q][]float64 {
		h, err := NewLevels(Config{Nz: 16, Nr: 8, Tau: 0.55, Axisymmetric: true, Threads: threads},
			[]Block{{Z0: 4, R0: 0, Nz: 8, Nr: 4}, {Z0: 2, R0: 0, Nz: 8, Nr: 4}})
		if err != nil {
			t.Fatal(err)
		}
		defer h.Close()
		h.SetForceFunc(func(t float64) (float64, float64) { return 1e-5 * math.Cos(0.05*t), 0 })
		for n := 0; n < 200; n++ {
			h.Step()
		}
		var st [][Q][]float64
		for l := 0; l < h.Len(); l++ {
			st = append(st, h.Level(l).State())
		}
		return st
	}
	a, b := run(1), run(3)
	for l := range a {
		for i := 0; i < Q; i++ {
			for n := range a[l][i] {
				if math.Float64bits(a[l][i][n]) != math.Float64bits(b[l][i][n]) {
					t.Fatalf("level %d population %d node %d: %v with 1 goroutine, %v with 3", l, i, n, a[l][i][n], b[l][i][n])
				}
			}
		}
	}
}
