package cases

import (
	"fmt"
	"math"

	"axiswim/lbm"
)

// Refined lattices (grid.levels > 1; issue 17, METHODS.md 15): nested
// levels refined by 2 with acoustic scaling (lbm.Levels), level 0 over the
// whole container and the finest around the spheres.

// Defaults and bounds of the grid's refinement keys.
const (
	// DefaultLevels is one uniform lattice, the lattice of every case
	// before refinement.
	DefaultLevels = 1
	// MaxLevels is the most levels a case may have. Each coarser level
	// halves tau+ - 1/2 (acoustic scaling), so with tau+ <= MaxTau = 1 on
	// the finest level the coarsest of L levels has tau+ - 1/2 <=
	// (1/2)/2^(L-1), which stays at or above the measured floor
	// MinLevelTau - 1/2 = 0.0025 only for 2^(L-1) <= 200, L <= 8.6
	// (TestMaxLevels recomputes it).
	MaxLevels = 8
	// DefaultFineMargin is the margin of the finest level around each
	// sphere and its excursion, in radii of the smallest sphere: issue
	// 17's "a margin of about two small-sphere radii".
	DefaultFineMargin = 2.0
	// AccurateFineMargin is the fine margin, in radii of the smallest
	// sphere, at which the demo on 2 levels swims as fast as on the uniform
	// lattice of the finest spacing (+0.005%; 5.2% slow at the default 2
	// radii: verify -full refined-demo, session 9). A smaller margin gets a
	// warning; the default stays issue 17's two radii, since at four its
	// speed case needs 15.8 times the demo's node updates (bound 10).
	AccurateFineMargin = 4.0
	// MinFineMarginCells is the smallest fine margin, in cells of the
	// finest level. lbm.Levels restricts a coarse cell from the cubic
	// interpolation of 4 x 4 fine cells; the second coarse row inside a
	// fine block (the first is left to the coarse level's own step, which
	// streams from the second) reads fine cells up to the fifth from the
	// block's edge (0-based 1 to 4). A sphere's solid nodes must stay
	// beyond them, or they would enter the coarse level: 5 cells, and one
	// more for the staircase of the sphere's surface.
	MinFineMarginCells = 6
	// DefaultLevelMargin is the margin of each coarser level around the
	// next finer one, in the coarser level's cells: twice MinLevelMargin.
	// The finer level's ghosts interpolate from the coarser level's cells
	// m-2 to m from its own edge (a 3 x 3 quadratic stencil reaching 2
	// cells outside the finer block, lbm.Levels), m the margin. At m = 2
	// that stencil takes the coarser level's first cell, which streams
	// straight from its own ghosts, themselves interpolated from the level
	// above: interpolation would feed interpolation. At 4 the stencil is
	// two cells clear of it. (A choice from the stencils, not measured.)
	// It costs little: on issue 17's speed case (the demo
	// at 24 cells per radius in a container 4 times as wide and long, 4
	// levels) the node updates per period are 1.58% of the uniform
	// lattice of the finest spacing at 2 cells, 1.60% at 4 and 1.64% at 8
	// (8.1, 8.2 and 8.4 times the uniform demo's; the finest level is 3/4
	// of them), computed with Layout while writing this; TestSpeedCase
	// keeps the default within the 10 times.
	DefaultLevelMargin = 4
	// MinLevelMargin is the coupling's rule (lbm.Block): a side of a finer
	// level that does not touch its parent's side of the same kind lies
	// at least 2 parent cells inside.
	MinLevelMargin = 2
)

// Per-level stability limits of a refined lattice, measured for TRT
// (Lambda = 3/16) with the axisymmetric terms near tau = 1/2 in
// benchmarks/taustability (README.md, "The rule proposed for levels").
// They replace the single floor MinTau when grid.levels > 1.
const (
	// MinLevelTau is the floor of tau+ on every level: the smallest tau+
	// measured; below it nothing is known.
	MinLevelTau = 0.5025
	// MaxLevelGridRe bounds the grid Reynolds number u dx_l/nu of every
	// level: a third of the lowest onset measured (about 60, steady flow
	// along the axis). As a floor on tau+: tau+ >= 1/2 + 3 u_L/20, u_L the
	// lattice speed, the same on every level under acoustic scaling.
	MaxLevelGridRe = 20.0
)

// A LevelRule is a stability rule that sets a level's floor of tau+
// (Level.Binding).
type LevelRule int

// The rules.
const (
	RuleMinTau LevelRule = iota // tau >= MinTau: one uniform lattice (METHODS.md 10.1)
	RuleTau                     // tau+ >= MinLevelTau (benchmarks/taustability)
	RuleGridRe                  // Re_g <= MaxLevelGridRe (benchmarks/taustability)
)

// String writes the rule as an inequality.
func (r LevelRule) String() string {
	switch r {
	case RuleTau:
		return fmt.Sprintf("tau+ >= %g", MinLevelTau)
	case RuleGridRe:
		return fmt.Sprintf("Re_g <= %g", MaxLevelGridRe)
	}
	return fmt.Sprintf("tau >= %g", MinTau)
}

// bindingSource is where the per-level rules were measured.
const bindingSource = "benchmarks/taustability/README.md"

// A Layout is how the levels of a lattice cover the container: level 0's
// configuration, the blocks that place each finer level in its parent,
// and what each level costs. With one level (grid.levels = 1) it is the
// uniform lattice of today, without blocks.
//
// There is one fine region around all the spheres, also for trains of
// swimmers (for now): from the lowest sphere's lower surface to the
// highest's upper one along z, each widened by its excursion, and out to
// the largest radius, all with the fine margin; it touches the axis.
// Each coarser level covers the next finer one with its margin
// (grid.level_margin cells of its own), and a side that would come within
// 2 parent cells of the container's side of the same kind touches it
// instead (the rule of lbm.Block). The layout is the one a run starts
// from: drift (swimming, settling) is left to the moving blocks of the
// drive (issue 17).
type Layout struct {
	// Base is level 0's lattice: the whole container at the coarsest
	// spacing, with the case's collision, magic parameter, ends and
	// storage. Threads and Kernel are left to the caller.
	Base lbm.Config
	// Blocks[l] places level l+1 in level l, in level l's cells (the
	// argument of lbm.NewLevels); none with one level.
	Blocks []lbm.Block
	// Levels describes each level, 0 the coarsest.
	Levels []Level
	// Region is the fine region in SI before it is rounded to cells (zero
	// with one level), with the fine margin FineMargin (m) around each
	// sphere and its excursion; LevelMargin is the margin of each coarser
	// level around the next finer one, in its cells (grid.level_margin).
	Region      Region
	FineMargin  float64
	LevelMargin int
	// Excursions[i] bounds the displacement of sphere i (0-based) from its
	// initial centre over the run, m (see [Case.Excursions]); nil with
	// one level.
	Excursions []float64
	// StepsPerPeriod and Steps are level 0's steps per period (0 when
	// nothing is periodic) and in the run; the finest level takes
	// 2^(levels-1) times as many (Lattice.StepsPerPeriod, Lattice.Steps).
	StepsPerPeriod, Steps int
	// UpdatesPerStep is the node updates of one step of level 0: each
	// level's cells times its steps per level-0 step, summed.
	UpdatesPerStep float64
	// UniformUpdatesPerStep is the same for the uniform lattice of the
	// finest spacing over the container (Lattice.Nz x Lattice.Nr cells) in
	// the same time.
	UniformUpdatesPerStep float64
	// MemoryBytes is the estimated memory of all levels (lbm.BytesPerNode
	// per node with one ghost layer around each level; the couplings'
	// buffers, a ring of cells per interface, are not counted), and
	// UniformMemoryBytes that of the uniform lattice of the finest spacing.
	MemoryBytes, UniformMemoryBytes int64
}

// A Level is one level of a Layout.
type Level struct {
	Dx, Dt float64 // cell size (m) and time step (s)
	Nz, Nr int     // cells along z and r
	// Z0, R0 are the level's first cell from the container's lower end
	// and from the axis, in the level's own cells.
	Z0, R0 int
	// Steps is the number of the level's steps per step of level 0, 2^l.
	Steps int
	// Tau and TauMinus are the level's relaxation times tau+ and tau-
	// (tau- from the magic parameter, 1/2 + Lambda/(tau+ - 1/2); tau+ for
	// BGK), each computed from level 0's tau as lbm.NewLevels does.
	Tau, TauMinus float64
	// ReGrid is the grid Reynolds number RefVelocity Dx/nu of the level.
	ReGrid float64
	// StokesCells is the Stokes layer sqrt(2 nu/Omega) in the level's
	// cells (0 when nothing is periodic).
	StokesCells float64
	// TauFloor is the lowest tau+ the level's stability rules allow and
	// Binding the rule that sets it (RuleTau or RuleGridRe; RuleMinTau
	// with one level). With more levels the floor is the same on every
	// level (the lattice speed is), and the coarsest level, with the least
	// tau+, comes closest to it.
	TauFloor float64
	Binding  LevelRule
	// Wall and Ends report whether the level reaches the side wall and
	// an end of the container (both ends of a periodic one).
	Wall, Ends bool
}

// Region is a region of the meridian plane in SI: ZMin <= z <= ZMax in the
// container frame, 0 <= r <= RMax.
type Region struct {
	ZMin, ZMax, RMax float64
}

// NodeUpdates is the node updates of n steps of level 0.
func (ly Layout) NodeUpdates(n int) float64 { return ly.UpdatesPerStep * float64(n) }

// Ratio is the node updates of the layout over those of the uniform
// lattice of the finest spacing in the same time.
func (ly Layout) Ratio() float64 { return ly.UpdatesPerStep / ly.UniformUpdatesPerStep }

// Layout returns the layout of the lattice that Resolve made: level 0's
// configuration, the blocks and the levels (see [Layout]). Its slices are
// copies.
func (l *Lattice) Layout() Layout {
	ly := l.layout
	ly.Blocks = append([]lbm.Block(nil), ly.Blocks...)
	ly.Levels = append([]Level(nil), ly.Levels...)
	ly.Excursions = append([]float64(nil), ly.Excursions...)
	return ly
}

// levels is grid.levels, DefaultLevels when not given (zero); so are
// fineMargin and levelMargin for the margins. Validate and Resolve read
// the grid through them, since a case need not have been through
// FillDefaults.
func (c *Case) levels() int {
	if c.Grid.Levels == 0 {
		return DefaultLevels
	}
	return c.Grid.Levels
}

func (c *Case) fineMargin() float64 {
	if c.Grid.FineMargin == 0 {
		return DefaultFineMargin
	}
	return c.Grid.FineMargin
}

func (c *Case) levelMargin() int {
	if c.Grid.LevelMargin == 0 {
		return DefaultLevelMargin
	}
	return c.Grid.LevelMargin
}

// refinement returns the number of finest cells per level-0 cell,
// 2^(levels-1), of a valid grid.levels.
func refinement(levels int) float64 { return math.Ldexp(1, levels-1) }

// driveDisplacement is a bound on the container's displacement,
// A + Σ A_n (the harmonics in phase); 0 without shaking.
func (c *Case) driveDisplacement() float64 {
	s := c.Shaking
	if !(s.Frequency > 0) {
		return 0
	}
	d := s.Amplitude
	for _, h := range s.Harmonics {
		d += h.Amplitude
	}
	return d
}

// freeRatio is the inviscid amplitude of a free sphere of density rho_s
// relative to a liquid of density rho_f that oscillates with unit
// amplitude, |rho_s - rho_f|/(rho_s + rho_f/2) (potential flow, added mass
// C_A = 1/2: METHODS.md 11.1). It bounds the amplitude at every frequency
// for a sphere alone: with the unsteady Stokes force (Landau & Lifshitz,
// Fluid Mechanics, §24 problem 5; drive/model) the relative velocity is
// V = (m - rho_f Vol) a_c/(i omega m - Z), and |i omega m - Z| >= omega
// (m + rho_f Vol/2), since the drag and Basset terms of Z add to its real
// part and to the added mass in its imaginary part, while the driving
// force stays the same.
func freeRatio(rhoS, rhoF float64) float64 {
	return math.Abs(rhoS-rhoF) / (rhoS + rhoF/2)
}

// Excursions bounds how far each sphere (0-based) moves from its initial
// centre over a run, in metres: the drive's displacement bound A + Σ A_n
// times the largest free-sphere ratio |rho_s - rho_f|/(rho_s + rho_f/2)
// among the spheres of its swimmer (Swimmers), plus, for each arm of the
// swimmer, its stroke amplitude and the change of distance it imposes at
// the start (when the spheres are not placed at the arm's distance). A
// sphere of a swimmer moves relative to the swimmer's centre by at most
// the sum of the strokes between them, and a swimmer held together by
// arms oscillates with the liquid by at most its members' largest ratio
// (its ratio is a weighted mean of theirs).
//
// For spheres joined by springs it is an estimate, not a bound: near the
// pair's resonance a lightly damped spring can make the relative motion
// larger than the free one ('axiswim check' compares it with the linear
// model, drive/model, which has the springs and the unsteady Stokes
// force). Drift (swimming, settling) is not in it.
func (c *Case) Excursions() []float64 {
	rf := c.Fluid.Density
	D := c.driveDisplacement()
	out := make([]float64, len(c.Spheres))
	for _, g := range Swimmers(c) {
		ratio := 0.0
		for _, k := range g {
			ratio = math.Max(ratio, freeRatio(c.Spheres[k].Density, rf))
		}
		in := make(map[int]bool, len(g))
		for _, k := range g {
			in[k+1] = true
		}
		strokes := 0.0
		for _, a := range c.Arms {
			if !in[a.Spheres[0]] || !in[a.Spheres[1]] {
				continue
			}
			strokes += a.Amplitude
			if si, sj, ok := c.pairSpheres(a.Spheres); ok {
				strokes += math.Abs(math.Abs(sj.Z-si.Z) - c.armStart(a))
			}
		}
		for _, k := range g {
			out[k] = ratio*D + strokes
		}
	}
	return out
}

// fineRegion is the region the finest level must cover: every sphere
// with its excursion and the margin m (metres), clipped to the container
// (closed ends) or, for periodic ends, allowed past them (the layout then
// takes the whole length).
func (c *Case) fineRegion(exc []float64, m float64) Region {
	var r Region
	for i, s := range c.Spheres {
		lo, hi := s.Z-s.Radius-exc[i]-m, s.Z+s.Radius+exc[i]+m
		if i == 0 || lo < r.ZMin {
			r.ZMin = lo
		}
		if i == 0 || hi > r.ZMax {
			r.ZMax = hi
		}
		r.RMax = math.Max(r.RMax, s.Radius+m)
	}
	R, L := c.Container.Radius, c.Container.Length
	r.RMax = math.Min(r.RMax, R)
	if c.Container.Ends != EndsPeriodic {
		r.ZMin, r.ZMax = math.Max(r.ZMin, -L/2), math.Min(r.ZMax, L/2)
	}
	return r
}

// layoutGeometry places the levels of lattice l (its Dx the finest, its
// Nz x Nr the uniform lattice of that spacing, its Levels set) in the
// container: the blocks, and each level's cells and position. Level taus
// and costs are left to newLayout.
func (c *Case) layoutGeometry(l *Lattice) (blocks []lbm.Block, levels []Level, region Region, exc []float64) {
	n := l.Levels
	f := int(refinement(n))
	nz0, nr0 := l.Nz/f, l.Nr/f
	levels = make([]Level, n)
	if n == 1 {
		levels[0] = Level{Nz: l.Nz, Nr: l.Nr, Wall: true, Ends: true, Steps: 1}
		return nil, levels, region, nil
	}
	periodic := c.Container.Ends == EndsPeriodic
	exc = c.Excursions()
	region = c.fineRegion(exc, c.fineMargin()*c.smallestSphere())

	// Extents in each level's own cells from the container's lower end
	// and the axis, as floats until they are rounded to parent cells.
	z0, z1, r1 := l.Z(region.ZMin), l.Z(region.ZMax), l.Distance(region.RMax)
	glob := make([][4]int, n) // z0, z1, r0 (always 0), r1 of each level, own cells
	glob[0] = [4]int{0, nz0, 0, nr0}
	full := make([]bool, n) // the level spans a periodic container's whole length
	full[0] = periodic
	m := float64(c.levelMargin())
	for lev := n - 1; lev >= 1; lev-- {
		// The block of level lev in its parent's cells, from the
		// container's lower end.
		pz, pr := float64(nz0<<(lev-1)), float64(nr0<<(lev-1))
		bz0, bz1 := math.Floor(z0/2), math.Ceil(z1/2)
		br1 := math.Ceil(r1 / 2)
		if periodic {
			if bz0 < 0 || bz1 > pz || pz-(bz1-bz0) < MinLevelMargin {
				bz0, bz1 = 0, pz // across the ends, or nearly all: the whole length
			}
		} else {
			if bz0 < MinLevelMargin {
				bz0 = 0
			}
			if bz1 > pz-MinLevelMargin {
				bz1 = pz
			}
		}
		if br1 > pr-MinLevelMargin {
			br1 = pr
		}
		bz0, bz1 = math.Max(bz0, 0), math.Min(bz1, pz)
		br1 = math.Min(math.Max(br1, 1), pr)
		if bz1 <= bz0 { // a region thinner than a cell still gets one
			bz1 = bz0 + 1
		}
		glob[lev] = [4]int{2 * int(bz0), 2 * int(bz1), 0, 2 * int(br1)}
		full[lev] = periodic && bz0 == 0 && bz1 == pz
		// The parent's extent: the block grown by the parent's margin.
		z0, z1, r1 = bz0-m, bz1+m, br1+m
	}
	for lev := range levels {
		g := glob[lev]
		pz, pr := nz0<<lev, nr0<<lev
		levels[lev] = Level{
			Nz: g[1] - g[0], Nr: g[3] - g[2], Z0: g[0], R0: g[2], Steps: 1 << lev,
			Wall: g[3] == pr,
			Ends: g[0] == 0 && g[1] == pz,
		}
		if !periodic {
			levels[lev].Ends = g[0] == 0 || g[1] == pz
		} else {
			levels[lev].Ends = full[lev]
		}
		if lev > 0 {
			p := glob[lev-1]
			blocks = append(blocks, lbm.Block{
				Z0: g[0]/2 - p[0], R0: g[2]/2 - p[2],
				Nz: (g[1] - g[0]) / 2, Nr: (g[3] - g[2]) / 2,
			})
		}
	}
	return blocks, levels, region, exc
}

// layoutMemory is the memory of the levels' cells, as memoryBytes counts
// it per level.
func layoutMemory(levels []Level, single bool) float64 {
	var b float64
	for _, lv := range levels {
		b += memoryBytes(float64(lv.Nz), float64(lv.Nr), single)
	}
	return b
}

// newLayout makes the layout of the resolved lattice l of case c.
func (c *Case) newLayout(l *Lattice) (Layout, error) {
	col, ok := lbm.ParseCollision(c.Solver.Collision)
	if !ok {
		return Layout{}, fmt.Errorf("solver.collision = %q: unknown operator", c.Solver.Collision)
	}
	n := l.Levels
	f := refinement(n)
	blocks, levels, region, exc := c.layoutGeometry(l)
	ly := Layout{
		Blocks: blocks, Levels: levels, Region: region, Excursions: exc,
		FineMargin: c.fineMargin() * c.smallestSphere(), LevelMargin: c.levelMargin(),
		StepsPerPeriod: int(float64(l.StepsPerPeriod) / f), Steps: int(float64(l.Steps) / f),
	}
	// Level 0's tau and the finer ones' as lbm.NewLevels derives them
	// (childConfig: 1/2 + 2 (tau - 1/2) per level).
	tau := l.Tau
	if n > 1 {
		tau = 0.5 + (l.Tau-0.5)/f
	}
	ly.Base = lbm.Config{
		Nz: levels[0].Nz, Nr: levels[0].Nr, Tau: tau, Collision: col, Magic: c.Solver.Magic,
		Axisymmetric: true, PeriodicZ: c.Container.Ends == EndsPeriodic, Single: l.Single,
	}
	uL := l.Velocity(l.RefVelocity) // the same on every level
	for lev := range ly.Levels {
		lv := &ly.Levels[lev]
		if lev > 0 {
			tau = 0.5 + 2*(tau-0.5)
		}
		scale := math.Ldexp(f, -lev) // finest cells (and steps) per cell (step) of the level
		lv.Dx, lv.Dt = l.DistanceSI(scale), l.TimeSI(scale)
		lv.Tau, lv.TauMinus = tau, tauMinus(tau, col, c.Solver.Magic)
		lv.ReGrid = l.ReGrid * scale
		lv.StokesCells = l.StokesCells / scale
		ly.UpdatesPerStep += float64(lv.Nz) * float64(lv.Nr) * float64(lv.Steps)
		switch {
		case n == 1:
			lv.TauFloor, lv.Binding = MinTau, RuleMinTau
		case 0.5+3*uL/MaxLevelGridRe > MinLevelTau:
			lv.TauFloor, lv.Binding = 0.5+3*uL/MaxLevelGridRe, RuleGridRe
		default:
			lv.TauFloor, lv.Binding = MinLevelTau, RuleTau
		}
	}
	ly.UniformUpdatesPerStep = float64(l.Nz) * float64(l.Nr) * f
	ly.MemoryBytes = int64(layoutMemory(ly.Levels, l.Single))
	ly.UniformMemoryBytes = int64(memoryBytes(float64(l.Nz), float64(l.Nr), l.Single))
	return ly, nil
}

// tauMinus is tau- of a level with tau+ = tau: from the magic parameter
// Lambda = (tau+ - 1/2)(tau- - 1/2) for TRT and MRT (lbm.Config.Magic), tau
// itself for BGK.
func tauMinus(tau float64, col lbm.Collision, magic float64) float64 {
	if col == lbm.BGK {
		return tau
	}
	return 0.5 + magic/(tau-0.5)
}

// A nearOne is an open interval of the finest level's lattice viscosity
// in which some level's tau+ or tau- lies within lbm.TauCloseToOne of 1,
// which the coupling of lbm.Levels cannot rescale.
type nearOne struct {
	lo, hi float64 // nu_L of the finest level
	level  int
	minus  bool // tau- rather than tau+
}

// nearOneBands lists the intervals of the finest level's nu_L that put
// one of n levels' tau+ or tau- (from the magic parameter) within
// lbm.TauCloseToOne of 1. Level l has tau+ - 1/2 = 3 nu_L/2^(n-1-l).
func nearOneBands(n int, magic float64) []nearOne {
	if n < 2 {
		return nil
	}
	d := lbm.TauCloseToOne
	var out []nearOne
	for lev := range n {
		k := math.Ldexp(1, n-1-lev) / 3
		out = append(out, nearOne{k * (0.5 - d), k * (0.5 + d), lev, false})
		out = append(out, nearOne{k * magic / (0.5 + d), k * magic / (0.5 - d), lev, true})
	}
	return out
}

// inBand returns the band that contains nuL, if any.
func inBand(bands []nearOne, nuL float64) (nearOne, bool) {
	for _, b := range bands {
		if nuL > b.lo && nuL < b.hi {
			return b, true
		}
	}
	return nearOne{}, false
}

// levelTaus returns tau+ and tau- of level lev of n levels whose finest
// level has tau+ = tau.
func levelTaus(tau float64, n, lev int, magic float64) (plus, minus float64) {
	plus = 0.5 + (tau-0.5)/math.Ldexp(1, n-1-lev)
	return plus, 0.5 + magic/(plus-0.5)
}

// nearOneProblem is the problem of a given grid.tau (tau, after the
// rounding of the steps per period) that puts a level in band b.
func (c *Case) nearOneProblem(b nearOne, tau float64) Problem {
	n := c.levels()
	plus, minus := levelTaus(tau, n, b.level, c.Solver.Magic)
	which := fmt.Sprintf("tau+ = %.4g", plus)
	if b.minus {
		which = fmt.Sprintf("tau- = %.4g (1/2 + solver.magic/(tau+ - 1/2), tau+ = %.4g)", minus, plus)
	}
	fix := fmt.Sprintf("give grid.tau at most %.4g or at least %.4g, or leave it out (the time step is then chosen clear of such bands)",
		math.Floor((3*b.lo+0.5)*1e4)/1e4, math.Ceil((3*b.hi+0.5)*1e4)/1e4)
	if b.minus {
		fix += ", or change solver.magic"
	}
	return Problem{
		Key: "grid.tau", Value: formatValue(c.Grid.Tau),
		Reason: fmt.Sprintf("level %d of %d would have %s, within %g of 1: the coupling of the levels rescales the non-equilibrium by tau - 1 and cannot there (lbm.Levels)",
			b.level, n, which, lbm.TauCloseToOne),
		Fix: fix,
	}
}

// validateLevels checks the refinement keys of [grid] and what refinement
// needs of the rest of the case.
func (c *Case) validateLevels(v *validator) {
	g := c.Grid
	n := c.levels()
	switch {
	case n < 1 || n > MaxLevels:
		v.add("grid.levels", n,
			fmt.Sprintf("must be 1 to %d: with tau+ <= %g on the finest level, the coarsest of more levels has tau+ below %g, the floor measured in %s (each coarser level halves tau+ - 1/2)",
				MaxLevels, MaxTau, MinLevelTau, bindingSource),
			fmt.Sprintf("use %d (one uniform lattice) or 2 to %d levels refined by 2 toward the spheres, or leave it out for %d", DefaultLevels, MaxLevels, DefaultLevels))
		return
	case n > 1 && len(c.Spheres) == 0:
		v.add("grid.levels", n, "the levels refine toward the spheres, and the case has none",
			fmt.Sprintf("use grid.levels = %d (one uniform lattice)", DefaultLevels))
	}
	if fm := c.fineMargin(); !(fm > 0) || math.IsInf(fm, 1) {
		v.add("grid.fine_margin", fm, "must be positive",
			fmt.Sprintf("give the margin of the finest level in radii of the smallest sphere, e.g. %g", DefaultFineMargin))
	} else if cpr := g.CellsPerRadius; n > 1 && cpr > 0 && fm*float64(cpr) < MinFineMarginCells {
		v.add("grid.fine_margin", fm,
			fmt.Sprintf("is %.3g cells of the finest level (grid.cells_per_radius = %d), fewer than %d: the coarse level's restriction would reach the spheres' solid nodes",
				fm*float64(cpr), cpr, MinFineMarginCells),
			fmt.Sprintf("give at least %.4g radii, e.g. %g", math.Ceil(MinFineMarginCells/float64(cpr)*1e3)/1e3, DefaultFineMargin))
	}
	if c.levelMargin() < MinLevelMargin {
		v.add("grid.level_margin", g.LevelMargin,
			fmt.Sprintf("must be at least %d: a side of a finer level that does not touch the container lies at least %d cells of its parent inside it (lbm.Block)", MinLevelMargin, MinLevelMargin),
			fmt.Sprintf("give the margin in cells of the coarser level, e.g. %d", DefaultLevelMargin))
	}
	if n < 2 {
		return
	}
	switch col := c.Solver.Collision; col {
	case CollisionMRT:
		v.add("solver.collision", col,
			fmt.Sprintf("grid.levels = %d needs TRT: the coupling of the levels rescales TRT's two non-equilibrium parts and is not written for MRT (lbm.NewLevels refuses it)", n),
			fmt.Sprintf("use %q, or grid.levels = %d", CollisionTRT, DefaultLevels))
	case CollisionBGK:
		v.add("solver.collision", col,
			fmt.Sprintf("grid.levels = %d needs TRT: the per-level stability rule is measured for TRT (%s; with the axisymmetric terms BGK was unstable at tau+ = %g at every speed tried, down to 1e-5)", n, bindingSource, MinLevelTau),
			fmt.Sprintf("use %q, or grid.levels = %d", CollisionTRT, DefaultLevels))
	}
	if g.Tau > 0.5 && c.Solver.Magic > 0 {
		if b, in := inBand(nearOneBands(n, c.Solver.Magic), (g.Tau-0.5)/3); in {
			v.ps = append(v.ps, c.nearOneProblem(b, g.Tau))
		}
	}
}
