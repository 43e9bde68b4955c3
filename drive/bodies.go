package drive

import (
	"fmt"

	"axiswim/geometry"
	"axiswim/lbm"
)

// Body is a rigid sphere moving along the axis, in lattice units.
type Body struct {
	Shape geometry.Sphere // where it is now (time t_n)
	// V is the velocity over the next step, t_n to t_{n+1}: the wall
	// velocity of its boundary links in the next Step.
	V float64

	// LinkForce is the momentum-exchange force of the last Step (centred at
	// t_{n-1/2}). NodeImpulse is the momentum of the nodes the last move
	// covered minus that of the nodes it uncovered (Aidun, Lu & Ding 1998,
	// J. Fluid Mech. 373, 287), and NodeForce the share of such impulses
	// applied in this step: each impulse is spread evenly over the next
	// SpreadSteps steps. All are ring-weighted 3D forces in lattice units.
	LinkForce, NodeForce, NodeImpulse float64
	Covered, Uncovered                int // nodes in the last move
	Fallback                          int // links without quadratic interpolation

	spread []float64 // node impulses still to be applied, by step mod SpreadSteps
	tick   int

	// links are the boundary links last handed to the lattice; stale is
	// set when a node near the body changed between fluid and solid, so
	// that the links must be found again (otherwise only their fractions
	// move with the body: MoveAll)
	links []lbm.Link
	stale bool
}

// SpreadSteps is the number of steps over which the momentum of each
// covered or uncovered node is handed to its body. An impulse applied in
// one step is a spike of about a quarter of the drag in the verification
// cases; spread over 16 steps, the total is still exact (momentum is
// conserved) and the force noise of a translating sphere falls from 3% to
// under 1% of the drag, for a delay of 8 steps against the thousands of a
// drive period. METHODS.md Recommendation 7 suggests this spreading; it is
// our choice, not a published scheme, and the verification rows measure it.
const SpreadSteps = 16

// addImpulse records a node impulse and returns the node force of this
// step.
func (b *Body) addImpulse(p float64) float64 {
	if b.spread == nil {
		b.spread = make([]float64, SpreadSteps)
	}
	for i := range b.spread {
		b.spread[i] += p / SpreadSteps
	}
	f := b.spread[b.tick]
	b.spread[b.tick] = 0
	b.tick = (b.tick + 1) % SpreadSteps
	return f
}

// Force returns the hydrodynamic force of the last step: links plus nodes.
func (b *Body) Force() float64 { return b.LinkForce + b.NodeForce }

// Bodies are the spheres on a lattice: they keep its solid nodes and its
// boundary links in step with their positions.
type Bodies struct {
	Domain geometry.Domain
	List   []*Body
	fl     *lbm.Solver

	// scratch reused from move to move, so that a step allocates nothing
	covered, uncovered []geometry.Node
	fresh              []lbm.Fresh

	// MoveAll relinks the bodies on the solver's workers: an error per
	// body and the worker function, made once.
	relinkErr []error
	relinkFn  func(w, workers int)

	alwaysRelink bool // tests: find the links again at every move
}

// NewBodies places spheres with wall velocities v on the lattice fl.
func NewBodies(fl *lbm.Solver, spheres []geometry.Sphere, v []float64) (*Bodies, error) {
	nz, nr := fl.Size()
	bs := &Bodies{Domain: geometry.Domain{Nz: nz, Nr: nr, Periodic: fl.Config().PeriodicZ}, fl: fl,
		// a move of less than a cell covers and uncovers at most one node
		// a row
		covered: make([]geometry.Node, 0, nr), uncovered: make([]geometry.Node, 0, nr),
		fresh: make([]lbm.Fresh, 0, nr)}
	for i, s := range spheres {
		for _, n := range bs.Domain.Nodes(s) {
			if fl.Solid(n.K, n.J) {
				return nil, fmt.Errorf("sphere %d overlaps another body at node (%d,%d)", i+1, n.K, n.J)
			}
			fl.SetSolid(n.K, n.J, true)
		}
		bs.List = append(bs.List, &Body{Shape: s, V: v[i]})
	}
	for i := range bs.List {
		if err := bs.relink(i); err != nil {
			return nil, err
		}
	}
	return bs, nil
}

// relink finds the boundary links of body i and hands them to the lattice.
func (bs *Bodies) relink(i int) error {
	b := bs.List[i]
	b.links = bs.Domain.AppendLinks(b.links[:0], b.Shape, bs.fl.Solid)
	if err := bs.fl.SetBoundary(i, b.links, b.V); err != nil {
		return err
	}
	_, b.Fallback = bs.fl.BoundaryForce(i)
	b.stale = false
	return nil
}

// refresh is relink when body i's links are stale or the ends periodic;
// otherwise the same links with their fractions recomputed for where the
// body is now (geometry.Domain.UpdateFractions, lbm.Solver.UpdateBoundary),
// which gives the same bits for a fraction of the cost. In the demo no
// node changes in about nine steps out of ten.
func (bs *Bodies) refresh(i int) error {
	b := bs.List[i]
	if b.stale || bs.Domain.Periodic || bs.alwaysRelink {
		return bs.relink(i)
	}
	bs.Domain.UpdateFractions(b.links, b.Shape)
	if err := bs.fl.UpdateBoundary(i, b.links, b.V); err != nil {
		return err
	}
	_, b.Fallback = bs.fl.BoundaryForce(i)
	return nil
}

// MoveAll moves every body i to centre z[i] with velocity v[i], as MoveTo
// body by body does, and gives the same bits: first the nodes each body
// covers and uncovers, in body order, then the links of all bodies, on the
// solver's worker goroutines (links depend only on the final solid nodes,
// the shape and the velocity of their body, so the order does not matter).
func (bs *Bodies) MoveAll(z, v []float64) error {
	for i := range bs.List {
		if err := bs.move(i, z[i], v[i]); err != nil {
			return err
		}
	}
	if bs.relinkFn == nil {
		bs.relinkErr = make([]error, len(bs.List))
		bs.relinkFn = bs.relinkShare
	}
	bs.fl.Parallel(bs.relinkFn)
	for _, err := range bs.relinkErr {
		if err != nil {
			return err
		}
	}
	return nil
}

// relinkShare refreshes the links of bodies w, w + workers, ... (see
// MoveAll).
func (bs *Bodies) relinkShare(w, workers int) {
	for i := w; i < len(bs.List); i += workers {
		bs.relinkErr[i] = bs.refresh(i)
	}
}

// Collect reads the link forces of the Step just taken.
func (bs *Bodies) Collect() {
	for i, b := range bs.List {
		b.LinkForce, _ = bs.fl.BoundaryForce(i)
	}
}

// MoveTo moves body i to centre z with velocity v for the next step: the
// nodes it covers become solid (their momentum goes to the body), the nodes
// it uncovers are refilled at the wall velocity (their momentum comes from
// the body), and its links are rebuilt. Only nodes near the body are
// touched.
func (bs *Bodies) MoveTo(i int, z, v float64) error {
	if err := bs.move(i, z, v); err != nil {
		return err
	}
	// Links of this body, and of any other body near the nodes that changed.
	if err := bs.relink(i); err != nil {
		return err
	}
	for k := range bs.List {
		if k != i && bs.near(k, bs.covered, bs.uncovered) {
			if err := bs.relink(k); err != nil {
				return err
			}
		}
	}
	return nil
}

// move is MoveTo without the links: the nodes body i covers and uncovers
// (left in bs.covered and bs.uncovered), their momentum and the refill.
func (bs *Bodies) move(i int, z, v float64) error {
	b := bs.List[i]
	next := geometry.Sphere{Z: z, Radius: b.Shape.Radius}
	bs.covered, bs.uncovered = bs.Domain.AppendMove(bs.covered[:0], bs.uncovered[:0], b.Shape, next)
	covered, uncovered := bs.covered, bs.uncovered
	var pn float64
	for _, n := range covered {
		if bs.fl.Solid(n.K, n.J) {
			return fmt.Errorf("sphere %d runs into another body at node (%d,%d)", i+1, n.K, n.J)
		}
		pn += bs.fl.NodeMomentum(n.K, n.J)
		bs.fl.SetSolid(n.K, n.J, true)
	}
	bs.fresh = bs.fresh[:0]
	for _, n := range uncovered {
		bs.fl.SetSolid(n.K, n.J, false)
		nz, nr := bs.Domain.Normal(next, n.K, n.J)
		bs.fresh = append(bs.fresh, lbm.Fresh{K: n.K, J: n.J, Nz: nz, Nr: nr, Uz: v})
	}
	pn -= bs.fl.Refill(bs.fresh)
	b.Shape, b.V = next, v
	b.NodeImpulse = pn
	b.NodeForce = b.addImpulse(pn)
	b.Covered, b.Uncovered = len(covered), len(uncovered)
	if len(covered)+len(uncovered) > 0 {
		for k, o := range bs.List {
			if k == i || bs.near(k, covered, uncovered) {
				o.stale = true
			}
		}
	}
	return nil
}

// linkReach is how far along z from a body's centre, beyond its radius, the
// solid flags that its links depend on can lie: the link nodes lie within
// the radius plus 3 cells (geometry.Domain.Links's box) and the
// interpolation reads up to 2 cells further (lbm.Solver.SetBoundary). One
// more cell covers the rounding.
const linkReach = 6

// near reports whether any of the nodes that changed lies where it can
// change body k's links; otherwise rebuilding them would give the same
// links, bit for bit.
func (bs *Bodies) near(k int, changed ...[]geometry.Node) bool {
	s := bs.List[k].Shape
	for _, ns := range changed {
		for _, n := range ns {
			if bs.Domain.Within(s, n.K, s.Radius+linkReach) {
				return true
			}
		}
	}
	return false
}

// ShiftZ follows a move of the lattice's window by d cells along z (a
// refined level moved by lbm.Levels.MoveAll, which carries the solid nodes
// and boundary links along): every body's centre and links move by -d
// cells in the lattice's coordinates, the place in the container staying
// the same.
func (bs *Bodies) ShiftZ(d int) {
	for _, b := range bs.List {
		b.Shape.Z -= float64(d)
		for x := range b.links {
			b.links[x].K -= d
		}
	}
}
