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
		return pipeFlow(nz, nr, func(k int) float64 {
			if k >= 20 {
				return 1 + jump
			}
			return 1
		})
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

// TestDeparture: the same smooth flow as the reference departs by 0; the
// flow 2% faster everywhere departs by 2% of the vorticity at the largest
// radius the interface lines reach (the row r = R, j = 10, of the box's
// outer edge) over the reference's peak: by hand from Departure's
// definition (w is linear in u).
func TestDeparture(t *testing.T) {
	const nz, nr = 60, 20
	box := []Box{{Z0: 20, Z1: 40, R: 10}}
	flow := func(scale float64) *lbm.Fields {
		return pipeFlow(nz, nr, func(int) float64 { return scale })
	}
	mask := make([]bool, nz*nr)
	ref := flow(1)
	if got := Departure(flow(1), mask, ref, mask, false, box); got != 0 {
		t.Errorf("the reference itself: departure %g, want 0", got)
	}
	w := lbm.Vorticity(ref, false)
	var peak, edge float64
	for _, v := range w {
		peak = math.Max(peak, math.Abs(v))
	}
	for k := 20; k < 40; k++ {
		edge = math.Max(edge, math.Abs(w[10*nz+k]))
	}
	want := 0.02 * edge / peak
	if got := Departure(flow(1.02), mask, ref, mask, false, box); math.Abs(got-want) > 1e-9*want {
		t.Errorf("2%% faster: departure %.4g, want %.4g", got, want)
	}
}

// pipeFlow is Poiseuille's u_z = s(k) (1 - (r/R)^2) on nz x nr nodes,
// R = nr cells, density 1.
func pipeFlow(nz, nr int, s func(k int) float64) *lbm.Fields {
	f := lbm.NewFields(nz, nr)
	for j := range nr {
		r := (float64(j) + 0.5) / float64(nr)
		for k := range nz {
			f.Uz[f.At(k, j)], f.Rho[f.At(k, j)] = s(k)*(1-r*r), 1
		}
	}
	return f
}
