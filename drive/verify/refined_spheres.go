package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/drive"
	"axiswim/geometry"
	"axiswim/lbm"
)

// The sphere checks on levels (issue 17): the sphere on the finest level,
// the outer liquid on coarser ones.

// nestedTube makes a closed axisymmetric tube of nz x nr finest cells on n
// levels: the finest covers [zlo, zhi) x [0, rhi) finest cells (rounded
// out to its parent's cells), and each coarser level l >= 1 covers the
// next finer one with a margin of grow of its parent's cells, a side within two parent cells of the wall made to
// touch it. nz and nr must be multiples of 2^(n-1). It returns the levels
// and the finest level's first cell in finest cells along z.
func nestedTube(nz, nr, n int, zlo, zhi, rhi, grow int, tau float64, o Options) (*lbm.Levels, int, error) {
	f := 1 << (n - 1)
	if nz%f != 0 || nr%f != 0 {
		return nil, 0, fmt.Errorf("tube %d x %d is not a whole number of level-0 cells (%d finest)", nz, nr, f)
	}
	// regions[l]: level l's region in finest cells (z0, z1, r1); level 0 is
	// the tube.
	type region struct{ z0, z1, r1 int }
	regions := make([]region, n)
	regions[0] = region{0, nz, nr}
	cur := region{zlo, zhi, rhi}
	for l := n - 1; l >= 1; l-- {
		c := 1 << (n - l) // level l-1's cell in finest cells
		cur = region{c * floorDiv(cur.z0, c), c * ceilDiv(cur.z1, c), c * ceilDiv(cur.r1, c)}
		regions[l] = cur
		cur = region{cur.z0 - grow*c, cur.z1 + grow*c, cur.r1 + grow*c}
	}
	blocks := make([]lbm.Block, n-1)
	origin := 0
	for l := 1; l < n; l++ {
		c := 1 << (n - l)
		p, r := regions[l-1], regions[l]
		if p.r1-r.r1 < 2*c {
			r.r1 = p.r1
		}
		if r.z0-p.z0 < 2*c || p.z1-r.z1 < 2*c || r.z0 < 0 {
			return nil, 0, fmt.Errorf("level %d's region z [%d, %d) is within two parent cells of its parent's [%d, %d): lengthen the tube", l, r.z0, r.z1, p.z0, p.z1)
		}
		regions[l] = r
		blocks[l-1] = lbm.Block{Z0: (r.z0 - p.z0) / c, R0: 0, Nz: (r.z1 - r.z0) / c, Nr: r.r1 / c}
		origin = r.z0
	}
	tau0 := 0.5 + (tau-0.5)/float64(f)
	h, err := lbm.NewLevels(lbm.Config{Nz: nz / f, Nr: nr / f, Tau: tau0, Axisymmetric: true,
		Threads: o.Threads, Single: o.Single}, blocks)
	return h, origin, err
}

func floorDiv(a, b int) int { return int(math.Floor(float64(a) / float64(b))) }
func ceilDiv(a, b int) int  { return int(math.Ceil(float64(a) / float64(b))) }

// oscillateLevels is oscillate with the tube on n levels: the finest, of
// oscillate's spacing, around the sphere with a margin of two radii beyond
// its surface (3a from its centre along z and from the axis), each coarser
// one 4 of its parent's cells beyond. The margin is issue 17's "about two
// small-sphere radii": at one radius the phase is 2.5 degrees off at
// a/delta = 2 and 3.9 at a/delta = 1 (worse than the uniform lattice at
// the coarse spacing, 0.8 degrees), at two it is the uniform fine
// lattice's to 0.3 degrees, at three to 0.03 (measured when written).
func oscillateLevels(a, aOverDelta, lambda float64, n int, o Options) (z, ref complex128, err error) {
	return oscillateLevelsW(a, aOverDelta, lambda, n, 3, o)
}

// oscillateLevelsW is oscillateLevels with the finest level reaching wid
// radii from the sphere's centre.
func oscillateLevelsW(a, aOverDelta, lambda float64, n int, wid float64, o Options) (z, ref complex128, err error) {
	f := 1 << (n - 1)
	R := f * int(math.Round(a/lambda/float64(f)))
	L := 6 * R
	delta := a / aOverDelta
	omega := math.Sqrt(lbm.Cs2) / float64(L)                   // the acoustic limit, as oscillate
	period := int(math.Ceil(2 * math.Pi / omega / float64(f))) // level-0 steps
	omega = 2 * math.Pi / float64(period*f)                    // per finest step
	nu := omega * delta * delta / 2
	tau := 3*nu + 0.5
	const eps = 0.02
	U := eps * a * omega
	zc := float64(L)/2 + 0.217
	h, origin, err := nestedTube(L, R, n, int(zc-wid*a), int(math.Ceil(zc+wid*a)), int(math.Ceil(wid*a)), 4, tau, o)
	if err != nil {
		return 0, 0, err
	}
	defer h.Close()
	fine := h.Level(n - 1)
	vel := func(t float64) float64 { return U * math.Cos(omega*t) }
	bs, err := drive.NewBodies(fine, []geometry.Sphere{{Z: zc - float64(origin), Radius: a}}, []float64{vel(0.5)})
	if err != nil {
		return 0, 0, err
	}
	mv := []drive.Prescribed{{Body: 0, Velocity: vel}}
	var fz complex128
	var count int
	h.AfterFinest(func() error {
		bs.Collect()
		t := float64(fine.Steps())
		if t > float64(3*period*f) {
			fz += complex(bs.List[0].Force(), 0) * cmplx.Exp(complex(0, -omega*(t-0.5)))
			count++
		}
		return drive.MovePrescribed(fine, bs, mv)
	})
	for s := 0; s < 4*period; s++ {
		if err := h.Step(); err != nil {
			return 0, 0, err
		}
	}
	fz *= complex(2/float64(count), 0)
	return fz / complex(U, 0), StokesOscillatingForce(a, nu, 1, omega), nil
}

// checkRefinedOscillating: the oscillating sphere of sphere-oscillating
// with the liquid beyond two radii from its surface on a coarser level,
// against the same reference and tolerances (a/delta = 1).
func checkRefinedOscillating(o Options) ([]Row, error) {
	return refinedOscillatingRows(o, []refinedOscillation{
		{oscillation{8, 1, 0.125}, 2},
	})
}

// checkRefinedOscillatingFull: the rest of issue 17's a/delta = 1, 2, 5,
// and three levels (kept out of go test for its time budget).
func checkRefinedOscillatingFull(o Options) ([]Row, error) {
	return refinedOscillatingRows(o, []refinedOscillation{
		{oscillation{8, 2, 0.2}, 2},
		{oscillation{8, 2, 0.2}, 3},
		{oscillation{15, 5, 0.2}, 2},
	})
}

// refinedOscillation is an oscillation on a number of levels.
type refinedOscillation struct {
	osc    oscillation
	levels int
}

func refinedOscillatingRows(o Options, cs []refinedOscillation) ([]Row, error) {
	var rows []Row
	for _, c := range cs {
		z, ref, err := oscillateLevels(c.osc.a, c.osc.aod, c.osc.lambda, c.levels, o)
		if err != nil {
			return nil, err
		}
		cs := fmt.Sprintf("oscillating a/delta=%g a=%g, %d levels", c.osc.aod, c.osc.a, c.levels)
		rows = append(rows,
			withinRel(cs, fmt.Sprintf("|F|/|U| (delta=%.3g cells)", c.osc.a/c.osc.aod), cmplx.Abs(z), cmplx.Abs(ref), 0.03, srcStokesO, tolStokesO),
			within(cs, "phase of F vs U (deg)", phaseDeg(z, 1), phaseDeg(ref, 1), 2, "deg", srcStokesO, tolStokesO))
	}
	return rows, nil
}

// translateLevels is translate with the tube on n levels: the finest, of
// translate's spacing, around the sphere's path with a margin of two radii
// beyond its surface, each coarser one 4 of its parent's cells beyond. The
// finest tau is 0.8 (translate's 1 would put a coarser level's tau- near
// 1, which the rescaling cannot take: TRT at Lambda = 3/16 keeps the walls
// where they are at any tau). The mean density is not kept exactly on
// levels (the transfer interpolates), so the drift row is not repeated.
func translateLevels(a, lambda float64, n int, o Options) (translation, error) {
	const tau = 0.8
	f := 1 << (n - 1)
	R := f * int(math.Round(a/lambda/float64(f)))
	nu := (tau - 0.5) / 3
	U := 0.05 * nu / (2 * a)
	steps := f * int(1.5*float64(R*R)/nu/float64(f)) // finest steps, whole level-0 steps
	travel := U * float64(steps)
	L := f * ceilDiv(int(5*float64(R)+2*a+travel+4), f)
	z0 := float64(L)/2 - travel/2 + 0.123
	h, origin, err := nestedTube(L, R, n, int(z0-3*a), int(math.Ceil(z0+travel+3*a)), int(math.Ceil(3*a)), 4, tau, o)
	if err != nil {
		return translation{}, err
	}
	defer h.Close()
	fine := h.Level(n - 1)
	bs, err := drive.NewBodies(fine, []geometry.Sphere{{Z: z0 - float64(origin), Radius: a}}, []float64{U})
	if err != nil {
		return translation{}, err
	}
	mv := []drive.Prescribed{{Body: 0, Velocity: func(float64) float64 { return U }}}
	win := int(math.Round(2 / U))
	var s, s2, sl, sl2 float64
	h.AfterFinest(func() error {
		bs.Collect()
		if int(fine.Steps()) > steps-win {
			b := bs.List[0]
			f, l := b.Force(), b.LinkForce
			s, s2, sl, sl2 = s+f, s2+f*f, sl+l, sl2+l*l
		}
		return drive.MovePrescribed(fine, bs, mv)
	})
	for i := 0; i < steps/f; i++ {
		if err := h.Step(); err != nil {
			return translation{}, err
		}
	}
	w := float64(win)
	mean, meanL := s/w, sl/w
	return translation{
		K:          -mean / (6 * math.Pi * nu * a * U),
		rms:        math.Sqrt(math.Max(0, s2/w-mean*mean)) / math.Abs(mean),
		rmsL:       math.Sqrt(math.Max(0, sl2/w-meanL*meanL)) / math.Abs(meanL),
		steps:      steps,
		fallback:   bs.List[0].Fallback,
		cellsMoved: travel,
		lambda:     a / float64(R),
	}, nil
}

// reasonRefinedTranslating is why the translating sphere in the wider tube
// is a known disagreement on levels. Measured when written (a = 10, tube
// radius 50, 2 levels, finest tau 0.8): the drag is 2.1% below Haberman &
// Sayre with the fine level reaching 3a from the axis (the uniform lattice:
// 0.46% below), 0.94% below at 5a, 1.45% below on 3 levels at 5a; in the
// narrow tube, where the fine level reaches the wall and the interfaces
// lie across the tube only, it agrees as the uniform lattice does (0.47%).
// Steady Stokes flow reaches far (its velocity falls as a/r), so the coarse
// levels and their interfaces along the flow carry part of the drag; the
// oscillating sphere, screened by its Stokes layer, shows no such excess.
const reasonRefinedTranslating = "steady Stokes flow reaches the coarse level: 2.1% low with the fine level to 3a, 0.9% to 5a (uniform: 0.46%); issue 17 asks for the uniform lattice's 2%"

// checkRefinedTranslating: the translating sphere of sphere-translating on
// levels, the fine level 2 radii beyond the sphere's surface and path: in
// the narrow tube (lambda 0.4, the fine level to the wall, interfaces
// across the tube) against the same references and tolerances, in the
// wide one (lambda 0.2, an interface along the flow) as known
// disagreements (reasonRefinedTranslating).
func checkRefinedTranslating(o Options) ([]Row, error) {
	var rows []Row
	for _, lam := range []float64{0.4, 0.2} {
		t, err := translateLevels(10, lam, 2, o)
		if err != nil {
			return nil, err
		}
		// the tube's radius is rounded to whole level-0 cells: lambda is a/R
		cs := fmt.Sprintf("translating a=10 lam=%.4g, 2 levels", t.lambda)
		hs, bo := HabermanSayre(t.lambda), Bohlin(t.lambda)
		if lam == 0.4 {
			rows = append(rows,
				withinRel(cs, "F/(6 pi mu a U) vs Haberman-Sayre", t.K, hs, 0.02, srcHS, tolWall),
				withinRel(cs, "F/(6 pi mu a U) vs Bohlin", t.K, bo, 0.02, srcBohlin, tolWall),
				atMost(cs, "force rms / mean (links + nodes)", t.rms, 0.02, srcNoise, tolNoise))
			continue
		}
		rows = append(rows,
			disagreement(cs, "F/(6 pi mu a U) vs Haberman-Sayre", t.K, hs, "rel", reasonRefinedTranslating, srcHS),
			disagreement(cs, "F/(6 pi mu a U) vs Bohlin", t.K, bo, "rel", reasonRefinedTranslating, srcBohlin),
			info(cs, "force rms / mean (links + nodes; the uniform lattice's: 1.6%, bound 2%)", t.rms, math.NaN(), srcNoise))
	}
	return rows, nil
}

// wakeLevels is wakeRun with the tube on n levels: the finest, of
// wakeRun's spacing, around the sphere from 3 radii ahead of its centre to
// 6 behind and from the axis to 3 radii, each coarser one 4 of its
// parent's cells beyond; the levels move with the sphere (Levels.MoveAll)
// whenever it has gone a level-0 cell. It returns wakeRun's drag
// coefficient and recirculation length and the number of moves.
func wakeLevels(a, lambda, re, travel float64, n int, o Options) (cd, ls float64, moves int, err error) {
	const U = 0.05
	f := 1 << (n - 1)
	nu := U * 2 * a / re
	tau := 3*nu + 0.5
	R := f * int(math.Round(a/lambda/float64(f)))
	dist := travel * 2 * a
	L := f * ceilDiv(int(dist+3*float64(R)+2*a+14*a), f)
	z0 := float64(R) + a + 0.31
	h, origin, err := nestedTube(L, R, n, int(z0-6*a), int(math.Ceil(z0+3*a)), int(math.Ceil(3*a)), 4, tau, o)
	if err != nil {
		return 0, 0, 0, err
	}
	defer h.Close()
	fine := h.Level(n - 1)
	bs, err := drive.NewBodies(fine, []geometry.Sphere{{Z: z0 - float64(origin), Radius: a}}, []float64{U})
	if err != nil {
		return 0, 0, 0, err
	}
	mv := []drive.Prescribed{{Body: 0, Velocity: func(float64) float64 { return U }}}
	steps := f * int(dist/U/float64(f))
	win := int(2 * a / U)
	var s float64
	h.AfterFinest(func() error {
		bs.Collect()
		if int(fine.Steps()) > steps-win {
			s += bs.List[0].Force()
		}
		return drive.MovePrescribed(fine, bs, mv)
	})
	home := bs.List[0].Shape.Z
	for i := 0; i < steps/f; i++ {
		if err := h.Step(); err != nil {
			return 0, 0, 0, err
		}
		if bs.List[0].Shape.Z-home >= float64(f) {
			if err := h.MoveAll(1); err != nil {
				return 0, 0, 0, err
			}
			bs.ShiftZ(f)
			moves++
		}
	}
	cd = -s / float64(win) / (0.5 * U * U * math.Pi * a * a)
	return cd, recirculation(h.Fields(n-1, nil), fine.Solid, bs.List[0].Shape.Z-a, a, U), moves, nil
}

// checkRefinedWake: sphere-wake's drag and recirculation at Re = 50 on two
// levels, the fine level moving with the sphere over its 15
// diameters of travel, against the same references and tolerances.
func checkRefinedWake(o Options) ([]Row, error) {
	return refinedWakeRows(o, []wake{{8, 50}})
}

// checkRefinedWake100 is refined-sphere-wake at Re = 20 and 100 (12 cells
// per radius, as sphere-wake-100), kept out of go test for its time budget.
func checkRefinedWake100(o Options) ([]Row, error) {
	return refinedWakeRows(o, []wake{{8, 20}, {12, 100}})
}

func refinedWakeRows(o Options, cs []wake) ([]Row, error) {
	var rows []Row
	for _, c := range cs {
		cd, ls, moves, err := wakeLevels(c.a, 0.1, c.re, 15, 2, o)
		if err != nil {
			return nil, err
		}
		cs := fmt.Sprintf("sphere wake Re=%g a=%g, 2 levels", c.re, c.a)
		rows = append(rows, withinRel(cs, "drag coefficient C_D", cd, StandardDragCurve(c.re), 0.03, srcCGW, tolWake))
		if ref, ok := RecirculationLength(c.re); ok {
			rows = append(rows, withinRel(cs, "recirculation length L_s/d", ls, ref, 0.05, srcJP, tolWake))
		}
		rows = append(rows, info(cs, "moves of the fine level with the sphere (one level-0 cell each)", float64(moves), math.NaN(), "Levels.MoveAll"))
	}
	return rows, nil
}
