package drive

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/drive/flow"
	"axiswim/lbm"
)

// onLevels is the part of a simulation on refined levels (grid.levels > 1,
// issue 17): lbm.Levels over the container, the spheres on the finest
// level. The bodies' centres (Dynamics.Z) stay in the container's cells
// of the finest spacing (cases.Lattice.Z); on the finest level they lie
// zoff cells lower, zoff moving as the refined levels follow the spheres.
type onLevels struct {
	h      *lbm.Levels
	stride int     // finest steps per step of level 0, 2^(levels-1)
	zoff   int     // the finest level's first cell, in its cells from the container's lower end
	margin float64 // the fine margin around the spheres (cases.Layout.FineMargin), finest cells

	// The uniform image of the fields (Simulation.View): its lattice and
	// spacing in finest cells; each level's fields of the last Observe and
	// the image sampled from them (imgOK: since that Observe).
	view      *cases.Lattice
	viewCells int
	fs        []*lbm.Fields
	img       *lbm.Fields
	imgOK     bool

	// moves counts the moves of the refined levels and shift their sum, in
	// level 0's cells (signed, toward +z).
	moves, shift int
}

// newOnLevels sets up the levels of lattice l (Lattice.Layout).
func newOnLevels(c *cases.Case, l *cases.Lattice, threads int) (*onLevels, error) {
	ly := l.Layout()
	base := ly.Base
	base.Threads = threads
	h, err := lbm.NewLevels(base, ly.Blocks)
	if err != nil {
		return nil, fmt.Errorf("set up the levels: %w", err)
	}
	lv := &onLevels{h: h, stride: 1 << (h.Len() - 1), margin: ly.FineMargin / l.Dx,
		fs: make([]*lbm.Fields, h.Len())}
	lv.viewCells = l.ImageCells(c.Output.ImageSpacing)
	lv.view = l.Image(lv.viewCells)
	lv.moved()
	if want := ly.Levels[len(ly.Levels)-1].Z0; lv.zoff != want {
		h.Close()
		return nil, fmt.Errorf("set up the levels: the finest level starts at cell %d, the layout says %d", lv.zoff, want)
	}
	return lv, nil
}

// finest is the finest level, where the bodies live.
func (lv *onLevels) finest() *lbm.Solver { return lv.h.Level(lv.h.Len() - 1) }

// moved finds where the finest level lies after the levels moved or were
// restored.
func (lv *onLevels) moved() {
	z, _ := lv.h.Origin(lv.h.Len() - 1)
	lv.zoff = int(math.Round(z * float64(lv.stride)))
}

// zoff is the finest level's first cell in the container's cells (0 on
// one lattice): a sphere at Dynamics.Z lies at Z - zoff on its lattice.
func (s *Simulation) zoff() int {
	if s.lv == nil {
		return 0
	}
	return s.lv.zoff
}

// Levels returns the refined levels, nil on one lattice.
func (s *Simulation) Levels() *lbm.Levels {
	if s.lv == nil {
		return nil
	}
	return s.lv.h
}

// LevelMoves returns how often the refined levels moved with the spheres
// and by how many of level 0's cells in all (signed, toward +z).
func (s *Simulation) LevelMoves() (moves, cells int) {
	if s.lv == nil {
		return 0, 0
	}
	return s.lv.moves, s.lv.shift
}

// hook joins the simulation to its levels: the bodies move after each
// step of the finest level (then AfterStep's function runs), and with
// periodic ends the frame force acts on the liquid of every level at
// each level step's own time (lbm.Levels.SetForceFunc, level 0's units:
// a force density scales as dt^2/dx, stride times the finest level's).
func (lv *onLevels) hook(s *Simulation) {
	lv.h.AfterFinest(s.afterLatticeStep)
	if s.FrameOnLiquid {
		st := float64(lv.stride)
		lv.h.SetForceFunc(func(t float64) (float64, float64) {
			return st * s.liquidForce(t*st*s.Lattice.Dt), 0
		})
	}
}

// advance takes n finest steps, n/stride steps of level 0; after each the
// mass keeper counts and the refined levels follow the spheres.
func (lv *onLevels) advance(s *Simulation, n int) error {
	if n%lv.stride != 0 {
		return fmt.Errorf("drive: %d steps on %d levels: must be a multiple of %d, the finest level's steps per step of level 0",
			n, lv.h.Len(), lv.stride)
	}
	for i := 0; i < n/lv.stride; i++ {
		if err := lv.h.Step(); err != nil {
			return err
		}
		if s.sw != nil {
			s.sw.mass.Step(lv.h)
			if err := lv.follow(s); err != nil {
				return err
			}
		}
	}
	return nil
}

// follow keeps the spheres inside the finest level (issue 17): when the
// surfaces come within half the fine margin (followAt) of an edge of the
// finest level that is an interface (not the container's end), the refined
// levels move by whole cells of level 0 (lbm.Levels.MoveAll) so that the
// margin on that side is whole again, as far as the other side keeps half
// of its own and level 1 keeps clear of the container's ends (lbm.Block's
// rule).
// The oscillation of the spheres is inside the layout's region
// (cases.Case.Excursions), so only drift (swimming, settling) moves the
// levels. A sphere within cases.MinFineMarginCells of such an edge stops
// the run with a GuardError.
func (lv *onLevels) follow(s *Simulation) error {
	if err := lv.move(s, lv.shiftFor(s)); err != nil {
		return err
	}
	lo, hi, openLo, openHi := lv.gaps(s)
	if (openLo && lo < cases.MinFineMarginCells) || (openHi && hi < cases.MinFineMarginCells) {
		t := s.Time()
		return &GuardError{Time: t, Diagnosis: fmt.Sprintf("at t = %.6g s a sphere came within %.3g finest cells of the edge of the finest level, "+
			"which could not follow it (the spheres move further than the fine region allows, or level 1 is held by the container's ends): "+
			"raise grid.fine_margin, or use fewer levels", t, math.Min(lo, hi))}
	}
	return nil
}

// gaps returns the distances in finest cells from the spheres' lowest and
// highest surface points to the ends of the finest level, and whether
// each end is an interface (not the container's end).
func (lv *onLevels) gaps(s *Simulation) (lo, hi float64, openLo, openHi bool) {
	d := s.sw.dyn
	zlo, zhi := math.Inf(1), math.Inf(-1)
	for k, z := range d.Z {
		zlo, zhi = math.Min(zlo, z-d.Radius[k]), math.Max(zhi, z+d.Radius[k])
	}
	fine := lv.finest()
	nz, _ := fine.Size()
	open := fine.Config().Open
	return zlo - float64(lv.zoff), float64(lv.zoff+nz) - zhi, open&lbm.SideZMin != 0, open&lbm.SideZMax != 0
}

// shiftFor is the move of the refined levels that follow asks for, in
// level 0's cells (0: none).
func (lv *onLevels) shiftFor(s *Simulation) int {
	lo, hi, openLo, openHi := lv.gaps(s)
	half, full, st := lv.followAt()
	var dz int
	switch {
	case openLo && lo < half && hi > lo:
		dz = max(-int(math.Ceil((full-lo)/st)), -int(math.Floor((hi-half)/st)))
	case openHi && hi < half && lo > hi:
		dz = min(int(math.Ceil((full-hi)/st)), int(math.Floor((lo-half)/st)))
	}
	if dz == 0 {
		return 0
	}
	// Level 1 keeps the kind of its sides: a side at an end stays there
	// (no move), an inner side stays cases.MinLevelMargin cells inside.
	one := lv.h.Level(1).Config()
	if one.PeriodicZ || one.Open&lbm.SideZMin == 0 || one.Open&lbm.SideZMax == 0 {
		return 0
	}
	b := lv.h.Block(1)
	nz0, _ := lv.h.Level(0).Size()
	return min(max(dz, cases.MinLevelMargin-b.Z0), nz0-cases.MinLevelMargin-b.Nz-b.Z0)
}

// followAt returns follow's thresholds in finest cells: a gap below at
// moves the levels, so that the gap is full again; and level 0's cell.
// at is half the fine margin, but at least one step of level 0 (the most a
// sphere can move in one, at the wall CFL limit of half a finest cell per
// finest step, is less) above the guard's cases.MinFineMarginCells.
func (lv *onLevels) followAt() (at, full, cell float64) {
	cell = float64(lv.stride)
	at = math.Max(lv.margin/2, cases.MinFineMarginCells+cell)
	return at, math.Max(lv.margin, at+cell), cell
}

// move moves the refined levels by dz cells of level 0, the bodies with
// them.
func (lv *onLevels) move(s *Simulation, dz int) error {
	if dz == 0 {
		return nil
	}
	if err := lv.h.MoveAll(dz); err != nil {
		return fmt.Errorf("t = %.6g s: follow the spheres: %w", s.Time(), err)
	}
	s.sw.bodies.ShiftZ(dz * lv.stride)
	lv.moved()
	lv.moves++
	lv.shift += dz
	return nil
}

// observe is Simulation.Observe on levels: every level's fields (each
// region counted on the finest level that holds it, volumes weighted by r
// and the level's cell area), at the end of the last step.
func (lv *onLevels) observe(s *Simulation) Observation {
	t := s.Time()
	var umax2, flux, vol float64
	finite := true
	minRho, maxRho := math.Inf(1), math.Inf(-1)
	var atZ, atR float64 // level 0's cells
	for l := range lv.fs {
		lv.fs[l] = lv.h.Fields(l, lv.fs[l])
		f, sol := lv.fs[l], lv.h.Level(l)
		z0, r0 := lv.h.Origin(l)
		sc := math.Ldexp(1, -l) // level l's cell in level 0's
		for j := 0; j < f.Nr; j++ {
			r := r0 + (float64(j)+0.5)*sc
			for k := 0; k < f.Nz; k++ {
				if lv.h.Covered(l, k, j) || sol.Solid(k, j) {
					continue
				}
				o := f.At(k, j)
				uz, ur := f.Uz[o], f.Ur[o]
				u2 := uz*uz + ur*ur
				if math.IsNaN(u2) || math.IsInf(u2, 0) || math.IsNaN(f.Rho[o]) {
					finite = false
				}
				if u2 > umax2 {
					umax2, atZ, atR = u2, z0+(float64(k)+0.5)*sc, r
				}
				minRho, maxRho = math.Min(minRho, f.Rho[o]), math.Max(maxRho, f.Rho[o])
				flux += sc * sc * r * uz
				vol += sc * sc * r
			}
		}
	}
	lv.imgOK = false
	drift := lv.h.Mass()/s.mass0 - 1
	if s.sw != nil {
		drift = lv.h.FluidDensity()/s.sw.mass.Rho0 - 1
	}
	l, st := s.Lattice, float64(lv.stride)
	umax := math.Sqrt(umax2)
	return Observation{
		Time:              t,
		DriveDisplacement: s.Shaker.Displacement(t),
		DriveVelocity:     s.Shaker.Velocity(t),
		DriveAcceleration: s.Shaker.Acceleration(t),
		MaxSpeed:          l.VelocitySI(umax),
		Mach:              umax / math.Sqrt(lbm.Cs2),
		MeanAxialVelocity: l.VelocitySI(flux / vol),
		MassDrift:         drift,
		Finite:            finite,
		MinRho:            minRho,
		MaxRho:            maxRho,
		MaxAt:             [2]float64{l.ZSI(atZ * st), l.DistanceSI(atR * st)},
	}
}

// LevelOutlines returns the outlines of the refined levels (1 and finer)
// where they are now, in the cells of View; none on one lattice.
func (s *Simulation) LevelOutlines() []flow.Box {
	if s.lv == nil {
		return nil
	}
	h := s.lv.h
	c0 := float64(s.lv.stride) / float64(s.lv.viewCells) // level 0's cell in View's
	var out []flow.Box
	for l := 1; l < h.Len(); l++ {
		z0, r0 := h.Origin(l)
		nz, nr := h.Level(l).Size()
		sc := math.Ldexp(1, -l) // level l's cell in level 0's
		out = append(out, flow.Box{Z0: z0 * c0, Z1: (z0 + float64(nz)*sc) * c0, R: (r0 + float64(nr)*sc) * c0})
	}
	return out
}

// LevelFields returns refined level l's fields of the last Observe, in
// the level's own cells and lattice units (nil on one lattice).
func (s *Simulation) LevelFields(l int) *lbm.Fields {
	if s.lv == nil {
		return nil
	}
	if s.lv.fs[l] == nil {
		s.Observe()
	}
	return s.lv.fs[l]
}

// image is Simulation.Fields on levels: the uniform image of the last
// Observe's fields (lbm.Levels.SampleFrom), at View's nodes.
func (lv *onLevels) image(s *Simulation) *lbm.Fields {
	if !lv.imgOK {
		if lv.fs[0] == nil {
			s.Observe()
		}
		lv.img = lv.h.SampleFrom(lv.fs, lv.view.Nz, lv.view.Nr, float64(lv.viewCells)/float64(lv.stride), lv.img, nil)
		lv.imgOK = true
	}
	return lv.img
}
