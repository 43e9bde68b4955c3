package lbm

import (
	"math"
	"testing"
)

// TestLevelsSample: pipe Poiseuille flow on three levels (exact on every
// level to 1e-5 of u_max, TestLevelsPoiseuille) sampled onto uniform images
// at the finest spacing and at level 0's: every node within the bilinear
// interpolation's error of the parabola u = c (R^2 - r^2), at most
// |u”| h^2/8 = c h^2/4 for the spacing h of the level it came from
// (analytic), plus the levels' 1e-5; and each node taken from the finest
// level that holds its stencil (the finest level's own nodes come from it).
func TestLevelsSample(t *testing.T) {
	const nr, g = 8, 1e-6
	h, err := NewLevels(Config{Nz: 16, Nr: nr, Tau: 0.8, PeriodicZ: true, Axisymmetric: true, Threads: 1},
		[]Block{{Z0: 4, R0: 0, Nz: 8, Nr: nr}, {Z0: 4, R0: 0, Nz: 8, Nr: 2 * nr}})
	if err != nil {
		t.Fatal(err)
	}
	defer h.Close()
	h.SetForce(g, 0)
	nu := h.Level(0).Viscosity()
	for n := int(10 * float64(nr*nr) / nu); n > 0; n-- {
		h.Step()
	}
	c := g / (4 * nu)
	umax := c * nr * nr
	for _, sp := range []float64{0.25, 1} {
		nz, nrr := int(16/sp), int(nr/sp)
		lev := make([]int8, nz*nrr)
		f := h.Sample(nz, nrr, sp, nil, lev)
		for j := 0; j < nrr; j++ {
			r := (float64(j) + 0.5) * sp
			for k := 0; k < nz; k++ {
				o := f.At(k, j)
				hl := math.Ldexp(1, -int(lev[o]))
				// beyond the last row, by d < h/2, the linear extrapolation's
				// error c d (d + h)
				d := math.Max(0, r-(nr-hl/2))
				tol := c*math.Max(hl*hl/4, d*(d+hl))/umax + 1e-5
				if e := math.Abs(f.Uz[o]-c*(nr*nr-r*r)) / umax; e > tol {
					t.Errorf("spacing %g node (%d, %d) from level %d: error %.3g of u_max, want <= %.3g", sp, k, j, lev[o], e, tol)
				}
			}
		}
		// A window from z = 6 level-0 cells, 8 of them long, holds the
		// image's nodes from k = 6/sp on, bit for bit (the same positions:
		// dyadic spacings add exactly).
		fs := make([]*Fields, h.Len())
		for l := range fs {
			fs[l] = h.Fields(l, nil)
		}
		wlev := make([]int8, int(8/sp)*nrr)
		w := h.SampleWindow(fs, 6, int(8/sp), nrr, sp, nil, wlev)
		for j := 0; j < nrr; j++ {
			for k := 0; k < w.Nz; k++ {
				o, i := w.At(k, j), f.At(k+int(6/sp), j)
				if w.Uz[o] != f.Uz[i] || w.Ur[o] != f.Ur[i] || w.Rho[o] != f.Rho[i] || wlev[o] != lev[i] {
					t.Errorf("spacing %g: window node (%d, %d) differs from the image's (%d, %d)", sp, k, j, k+int(6/sp), j)
				}
			}
		}
		// z in [4+2, 4+2+4) level-0 cells is level 2's: at the finest spacing
		// its interior nodes come from it
		k := int(7.5 / sp)
		if got := lev[f.At(k, 1)]; got != 2 {
			t.Errorf("spacing %g: node (%d, 1) taken from level %d, want 2", sp, k, got)
		}
	}
}
