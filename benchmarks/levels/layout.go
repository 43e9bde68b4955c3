package main

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/lbm"
)

// The speed case of issue 17: the demo at fineCells cells per radius of
// its small sphere in a container containerScale times its radius and
// length, on numLevels levels refined by 2.
const (
	numLevels      = 4
	containerScale = 4
	fineCells      = 24
	// magic is lbm's default TRT magic parameter (Config.Magic = 0), from
	// which tau- follows: (tau+ - 1/2)(tau- - 1/2) = magic.
	magic = 3.0 / 16
)

// params are the choices of a layout: the spheres' excursion along the
// axis, the finest level's margin around the spheres and their excursion,
// and each coarser level's margin around the next finer one.
type params struct {
	excursion    float64 // m, either way along the axis
	fineMargin   float64 // in small-sphere radii
	coarseMargin int     // in cells of the coarser level
}

// layout is the refined lattice of the speed case and the uniform demo it
// is measured against.
type layout struct {
	p params

	demoCase *cases.Case
	demo     *cases.Lattice // the uniform demo (12 cells per radius, 360 x 90)

	dxF        float64 // finest spacing, m
	nzF, nrF   int     // the container in cells of the finest spacing
	stepsFine  int     // the finest level's steps per period
	aSmall     float64 // small-sphere radius, m
	halfLength float64 // half the container's length, m

	// Per level (0 the coarsest): the region it covers in cells of the
	// finest spacing, [z0, z1) x [0, r1), counted from the container's
	// z-min end and from the axis; its configuration and its block in its
	// parent (blocks[l-1] places level l).
	z0, z1, r1 []int
	cfgs       []lbm.Config
	blocks     []lbm.Block
}

// demoSetup resolves the embedded demo, the uniform lattice of the
// comparison.
func demoSetup() (*cases.Case, *cases.Lattice, error) {
	c, err := cases.ParseExample("demo")
	if err != nil {
		return nil, nil, err
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return nil, nil, err
	}
	return c, l, nil
}

// perCell returns the number of cells of the finest spacing per cell of
// level l.
func perCell(l int) int { return 1 << (numLevels - 1 - l) }

// floorTo and ceilTo round x down and up to a multiple of m.
func floorTo(x, m int) int { return int(math.Floor(float64(x)/float64(m))) * m }
func ceilTo(x, m int) int  { return int(math.Ceil(float64(x)/float64(m))) * m }

// newLayout computes the levels of the speed case.
//
// Level 0 has 4 times the demo's spacing over the container 4 times the
// demo's, so as many cells as the demo (360 x 90), and the demo's time
// step: the acoustic limit He = omega dt max(Nz, Nr)/cs <= 1 that sets the
// demo's step (cases.Resolve) sets it for 360 cells along the axis on
// level 0 too. Under acoustic scaling (dt halving with dx) level l then
// takes 2^l steps per demo step, and the lattice viscosity nu dt/dx^2 is
// the demo's divided by 16 on level 0 and doubles per finer level:
// tau+ - 1/2 = (tau_demo - 1/2)/16 x 2^l.
//
// The finest level covers, in the axial direction, the spheres (from the
// lowest sphere bottom to the highest top) moved by the excursion either
// way, plus fineMargin small-sphere radii; radially, from the axis to the
// largest sphere's radius plus the margin. Each coarser level covers the
// next finer one with coarseMargin of its own cells on the three sides
// away from the axis. Every region is rounded outwards to whole cells of
// its parent level, and all of them touch the axis.
func newLayout(p params) (*layout, error) {
	c, demo, err := demoSetup()
	if err != nil {
		return nil, err
	}
	if p.coarseMargin < 2 {
		return nil, fmt.Errorf("coarse margin %d: at least 2 cells (lbm keeps a block 0 or at least 2 parent cells from its parent's sides)", p.coarseMargin)
	}
	if p.excursion < 0 || p.fineMargin < 0 {
		return nil, fmt.Errorf("excursion %g m and margin %g radii must not be negative", p.excursion, p.fineMargin)
	}
	lo := &layout{p: p, demoCase: c, demo: demo}
	// The demo's spacing is exactly R/Nr; the finest spacing halves it
	// (24 instead of 12 cells per radius) and the container grows 4 times,
	// so the container has demo.N x containerScale x fineCells/CellsPerRadius
	// cells of the finest spacing.
	ref := fineCells / c.Grid.CellsPerRadius
	if ref*c.Grid.CellsPerRadius != fineCells {
		return nil, fmt.Errorf("the demo's %d cells per radius do not divide %d", c.Grid.CellsPerRadius, fineCells)
	}
	lo.dxF = demo.Dx / float64(ref)
	lo.nzF = demo.Nz * containerScale * ref
	lo.nrF = demo.Nr * containerScale * ref
	top := perCell(0)
	if lo.nzF%top != 0 || lo.nrF%top != 0 || lo.nzF/top != demo.Nz || lo.nrF/top != demo.Nr {
		return nil, fmt.Errorf("level 0 is not the demo's %dx%d cells", demo.Nz, demo.Nr)
	}
	lo.stepsFine = demo.StepsPerPeriod * perCell(0)
	lo.halfLength = float64(lo.nzF) * lo.dxF / 2

	// The finest level's region.
	zlo, zhi, rhi := math.Inf(1), math.Inf(-1), 0.0
	lo.aSmall = math.Inf(1)
	for _, s := range c.Spheres {
		zlo = math.Min(zlo, s.Z-s.Radius)
		zhi = math.Max(zhi, s.Z+s.Radius)
		rhi = math.Max(rhi, s.Radius)
		lo.aSmall = math.Min(lo.aSmall, s.Radius)
	}
	m := p.fineMargin * lo.aSmall
	zlo -= p.excursion + m
	zhi += p.excursion + m
	rhi += m
	// In cells of the finest spacing from the z-min end; the 1e-9 keeps a
	// boundary that falls on a cell face (to round-off) on it.
	cell := func(x float64) float64 { return x / lo.dxF }
	f0 := int(math.Floor(cell(zlo+lo.halfLength) + 1e-9))
	f1 := int(math.Ceil(cell(zhi+lo.halfLength) - 1e-9))
	fr := int(math.Ceil(cell(rhi) - 1e-9))

	L := numLevels
	lo.z0, lo.z1, lo.r1 = make([]int, L), make([]int, L), make([]int, L)
	lo.z0[0], lo.z1[0], lo.r1[0] = 0, lo.nzF, lo.nrF
	par := perCell(L - 2) // the finest level's parent cell
	lo.z0[L-1], lo.z1[L-1], lo.r1[L-1] = floorTo(f0, par), ceilTo(f1, par), ceilTo(fr, par)
	for l := L - 2; l >= 1; l-- {
		s := perCell(l)
		g := p.coarseMargin * s
		lo.z0[l] = floorTo(lo.z0[l+1]-g, 2*s)
		lo.z1[l] = ceilTo(lo.z1[l+1]+g, 2*s)
		lo.r1[l] = ceilTo(lo.r1[l+1]+g, 2*s)
	}
	for l := 1; l < L; l++ {
		if lo.z0[l] < 0 || lo.z1[l] > lo.nzF || lo.r1[l] > lo.nrF {
			return nil, fmt.Errorf("level %d (z %.4g..%.4g m, r to %.4g m) does not fit in the container", l,
				lo.zSI(lo.z0[l]), lo.zSI(lo.z1[l]), lo.rSI(lo.r1[l]))
		}
	}

	// Configurations: level 0 the demo's lattice with tau+ - 1/2 divided
	// by 16; the finer ones as NewLevels derives them (tau+ - 1/2 doubling
	// per level), kept here for the tables.
	// dt_0 = dt_demo (see above) and dx_0 = top/ref dx_demo: the lattice
	// viscosity is nu_demo / (top/ref)^2.
	d := float64(top / ref)
	base := lbm.Config{
		Nz: demo.Nz, Nr: demo.Nr,
		Tau:          0.5 + (demo.Tau-0.5)/(d*d),
		Collision:    lbm.TRT,
		Axisymmetric: true,
	}
	lo.cfgs = []lbm.Config{base}
	for l := 1; l < L; l++ {
		s := perCell(l - 1) // cells of the finest spacing per parent cell
		b := lbm.Block{
			Z0: (lo.z0[l] - lo.z0[l-1]) / s,
			R0: 0,
			Nz: (lo.z1[l] - lo.z0[l]) / s,
			Nr: lo.r1[l] / s,
		}
		lo.blocks = append(lo.blocks, b)
		cfg := lo.cfgs[l-1]
		cfg.Nz, cfg.Nr = 2*b.Nz, 2*b.Nr
		cfg.Tau = 0.5 + 2*(cfg.Tau-0.5)
		lo.cfgs = append(lo.cfgs, cfg)
	}
	return lo, nil
}

// zSI and rSI convert a position in cells of the finest spacing to metres
// in the container frame (z = 0 at the centre).
func (lo *layout) zSI(k int) float64 { return float64(k)*lo.dxF - lo.halfLength }
func (lo *layout) rSI(j int) float64 { return float64(j) * lo.dxF }

// dx returns level l's spacing, m.
func (lo *layout) dx(l int) float64 { return float64(perCell(l)) * lo.dxF }

// cells returns level l's node count.
func (lo *layout) cells(l int) int { return lo.cfgs[l].Nz * lo.cfgs[l].Nr }

// stepsPerPeriod returns level l's steps per drive period.
func (lo *layout) stepsPerPeriod(l int) int { return lo.demo.StepsPerPeriod << l }

// updatesPerPeriod returns the node updates of every level per period.
func (lo *layout) updatesPerPeriod() float64 {
	var u float64
	for l := range lo.cfgs {
		u += float64(lo.cells(l)) * float64(lo.stepsPerPeriod(l))
	}
	return u
}

// demoUpdates returns the uniform demo's node updates per period.
func (lo *layout) demoUpdates() float64 {
	return float64(lo.demo.Nz*lo.demo.Nr) * float64(lo.demo.StepsPerPeriod)
}

// fineUpdates returns the node updates per period of the uniform lattice
// of the finest spacing over the whole container.
func (lo *layout) fineUpdates() float64 {
	return float64(lo.nzF) * float64(lo.nrF) * float64(lo.stepsFine)
}

// tauMinus returns the odd relaxation time at tau+ with lbm's default
// magic parameter.
func tauMinus(tau float64) float64 { return 0.5 + magic/(tau-0.5) }

// margins returns the margins of level l (l >= 1) around level l+1, in
// level l's cells: z-min, z-max and r-max sides (the finest level: around
// the spheres and their excursion, in its own cells).
func (lo *layout) margins(l int) (zmin, zmax, rmax float64) {
	s := float64(perCell(l))
	if l == numLevels-1 {
		zlo, zhi, rhi := math.Inf(1), math.Inf(-1), 0.0
		for _, sp := range lo.demoCase.Spheres {
			zlo = math.Min(zlo, sp.Z-sp.Radius-lo.p.excursion)
			zhi = math.Max(zhi, sp.Z+sp.Radius+lo.p.excursion)
			rhi = math.Max(rhi, sp.Radius)
		}
		return (zlo - lo.zSI(lo.z0[l])) / lo.dxF / s, (lo.zSI(lo.z1[l]) - zhi) / lo.dxF / s, (lo.rSI(lo.r1[l]) - rhi) / lo.dxF / s
	}
	return float64(lo.z0[l+1]-lo.z0[l]) / s, float64(lo.z1[l]-lo.z1[l+1]) / s, float64(lo.r1[l]-lo.r1[l+1]) / s
}
