package flow

import (
	"math"
	"testing"

	"axiswim/lbm"
)

// TestImprint: a smooth mean flow (Poiseuille's u_z = 1 - (r/R)^2, whose
// vorticity is linear in r: its second differences vanish) shows no
// imprint; the same flow 2% faster beyond a box's edge at z = 20 (a jump
// of the vorticity there) shows half the jump, 1% of the vorticity at the
// edge's outermost row, over the peak (the nodes beside the edge see the
// jump at one of their two neighbours). Both by hand from Imprint's
// definition.
func TestImprint(t *testing.T) {
	const nz, nr = 60, 20
	box := []Box{{Z0: 20, Z1: 40, R: 10}}
	flow := func(jump float64) *lbm.Fields {
		f := lbm.NewFields(nz, nr)
		for j := range nr {
			r := (float64(j) + 0.5) / nr
			for k := range nz {
				u := 1 - r*r
				if k >= 20 {
					u *= 1 + jump
				}
				f.Uz[f.At(k, j)], f.Rho[f.At(k, j)] = u, 1
			}
		}
		return f
	}
	mask := make([]bool, nz*nr)
	if got := Imprint(flow(0), mask, false, box); got > 1e-12 {
		t.Errorf("smooth flow: imprint %g, want 0 (to rounding)", got)
	}
	// The peak |w| is at the wall (w ~ r, beyond the jump); the edge's
	// lines reach the row j = 9 below R = 10 cells, where the nodes beside
	// the edge give |w - (w + 1.02 w)/2| = 0.01 w, w the vorticity there
	// before the jump (k = 10).
	got := Imprint(flow(0.02), mask, false, box)
	w := lbm.Vorticity(flow(0.02), false)
	var peak float64
	for _, v := range w {
		peak = math.Max(peak, math.Abs(v))
	}
	want := 0.01 * math.Abs(w[9*nz+10]) / peak
	if math.Abs(got-want) > 1e-9*want {
		t.Errorf("2%% jump: imprint %.4g, want %.4g (half the jump at the edge's largest radius, over the peak)", got, want)
	}
}
