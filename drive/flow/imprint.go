package flow

import (
	"math"

	"axiswim/lbm"
)

// Box is the outline of a refined level in the cells of a field from the
// axis: Z0 <= z <= Z1, r <= R.
type Box struct{ Z0, Z1, R float64 }

// ImprintBound is the largest imprint of the level interfaces on the mean
// vorticity that a run accepts without a warning: issue 17's 1% of the
// peak.
const ImprintBound = 0.01

// Imprint measures how much the interfaces of refined levels show in the
// mean flow mf (lattice units on a uniform image, mask the nodes a body
// covered): on the two node lines on either side of each box edge that is
// an interface (not the container's side), the largest second difference
// across the edge, |w - (w_-2 + w_+2)/2| over nodes two apart, of the
// azimuthal vorticity w (lbm.Vorticity with frameOnLiquid), over the peak
// |w| of the liquid. A smooth field gives the curvature of w over four
// cells, far below the peak where the interfaces lie (beyond the fine
// margin: 0.006% on the demo on two levels, where the uniform run's own
// field differs from it by at most 0.05% along those lines); a jump or a
// kink at an interface shows at its full size. Nodes whose stencil
// touches a body or the container's side are skipped. 0 without boxes.
func Imprint(mf *lbm.Fields, mask []bool, frameOnLiquid bool, boxes []Box) float64 {
	if len(boxes) == 0 {
		return 0
	}
	w := lbm.Vorticity(mf, frameOnLiquid)
	nz, nr := mf.Nz, mf.Nr
	peak := peakAbs(w, mask)
	if peak == 0 {
		return 0
	}
	ok := func(k, j int) bool { return k >= 0 && k < nz && j >= 0 && j < nr && !mask[j*nz+k] }
	var worst float64
	interfaceLines(boxes, nz, nr, func(k, j, dk, dj int) {
		if ok(k, j) && ok(k-2*dk, j-2*dj) && ok(k+2*dk, j+2*dj) {
			d := math.Abs(w[j*nz+k] - 0.5*(w[(j-2*dj)*nz+k-2*dk]+w[(j+2*dj)*nz+k+2*dk]))
			worst = math.Max(worst, d)
		}
	})
	return worst / peak
}

// Departure measures how far the mean flow mf of a run on refined levels
// departs from a reference mean flow ref (a uniform run's, on the same
// image) along the interfaces: on the node lines of Imprint (the two on
// either side of each box edge that is an interface), the largest
// |w - w_ref| of the azimuthal vorticity over the peak |w_ref| of the
// liquid. Nodes a body covers in either run (mask, refMask) are skipped.
// Issue 17 asks it below 1% (ImprintBound) for the demo. It panics when
// the two images differ in size.
func Departure(mf *lbm.Fields, mask []bool, ref *lbm.Fields, refMask []bool, frameOnLiquid bool, boxes []Box) float64 {
	if mf.Nz != ref.Nz || mf.Nr != ref.Nr {
		panic("flow.Departure: the fields' images differ in size")
	}
	w, wr := lbm.Vorticity(mf, frameOnLiquid), lbm.Vorticity(ref, frameOnLiquid)
	nz, nr := mf.Nz, mf.Nr
	peak := peakAbs(wr, refMask)
	if peak == 0 {
		return 0
	}
	var worst float64
	interfaceLines(boxes, nz, nr, func(k, j, _, _ int) {
		if i := j*nz + k; k >= 0 && k < nz && j >= 0 && j < nr && !mask[i] && !refMask[i] {
			worst = math.Max(worst, math.Abs(w[i]-wr[i]))
		}
	})
	return worst / peak
}

// interfaceLines calls visit for every node on the two node lines on
// either side of each edge of the boxes that is an interface (the ends
// and the outer radius; the axis is not one), with the direction (dk, dj)
// across that edge. The nodes may lie outside the nz x nr image.
func interfaceLines(boxes []Box, nz, nr int, visit func(k, j, dk, dj int)) {
	for _, b := range boxes {
		z0, z1, r := int(math.Round(b.Z0)), int(math.Round(b.Z1)), int(math.Round(b.R))
		for j := 0; j < min(r, nr); j++ {
			for _, k := range []int{z0 - 1, z0, z1 - 1, z1} {
				visit(k, j, 1, 0)
			}
		}
		for k := max(z0, 0); k < min(z1, nz); k++ {
			visit(k, r-1, 0, 1)
			visit(k, r, 0, 1)
		}
	}
}

// peakAbs is the largest |w| over the nodes mask leaves out.
func peakAbs(w []float64, mask []bool) float64 {
	var peak float64
	for i, v := range w {
		if !mask[i] {
			peak = math.Max(peak, math.Abs(v))
		}
	}
	return peak
}
