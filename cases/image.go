package cases

import "math"

// ImageCells is the spacing, in finest cells, of the uniform image that
// shows the fields of refined levels (lbm.Levels.Sample): the case's
// output.image_spacing (m) rounded to the nearest power of 2 between 1 and
// 2^(levels-1) (level 0's cell), or when it is 0 the finest spacing whose
// image has at most ImageNodesPerCell times as many nodes as the levels
// have cells together. It is 1 on one level.
func (l *Lattice) ImageCells(spacing float64) int {
	f := int(refinement(l.Levels))
	if f == 1 {
		return 1
	}
	if spacing > 0 {
		p := math.Round(math.Log2(spacing / l.Dx))
		return int(math.Ldexp(1, int(math.Max(0, math.Min(p, float64(l.Levels-1))))))
	}
	var cells float64
	for _, lev := range l.layout.Levels {
		cells += float64(lev.Nz) * float64(lev.Nr)
	}
	s := 1
	for s < f && float64(l.Nz/s)*float64(l.Nr/s) > ImageNodesPerCell*cells {
		s *= 2
	}
	return s
}

// ImageNodesPerCell bounds the default image (ImageCells): at most 4 nodes
// per cell of the levels, so that its files stay within a few times the
// data the levels hold while the spacing stays as fine as that allows (the
// flow metrics of a run are measured on the image). Our choice: on issue
// 17's speed case (the finest level about 3/4 of the cells) it gives 4
// finest cells, twice level 2's spacing.
const ImageNodesPerCell = 4

// Image returns the lattice of the uniform image at a spacing of s finest
// cells (ImageCells): the same container and time, its cells s times as
// large, so that the conversions to SI (Lattice's methods) hold for the
// image's fields. Velocities and densities in lattice units are the same
// on every level under acoustic scaling (dx/dt is), and so on the image
// with Dt scaled as Dx; its time step is a level's, not a step of the run.
// Image(1) is l itself.
func (l *Lattice) Image(s int) *Lattice {
	if s == 1 {
		return l
	}
	im := *l
	im.Dx, im.Dt = l.Dx*float64(s), l.Dt*float64(s)
	im.Nz, im.Nr = l.Nz/s, l.Nr/s
	im.NuL = l.NuL / float64(s)
	im.StokesCells = l.StokesCells / float64(s)
	im.StepsPerPeriod, im.Steps = l.StepsPerPeriod/s, l.Steps/s
	im.OmegaL = l.OmegaL * float64(s)
	im.Warnings = nil
	return &im
}
