package drive

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"axiswim/cases"
	"axiswim/lbm"
)

// SkipPeriods is the number of periods the swimming-speed estimate and the
// mean fields skip: after a start from rest, the ramp and as many periods
// again for the transient it leaves (RampPeriods); after a warm start,
// whose flow is already close to its own, the ramp alone (at least one
// period).
func (s *Simulation) SkipPeriods() int {
	if s.warm {
		return max(1, int(math.Ceil(s.Case.Shaking.RampPeriods)))
	}
	return RampPeriods(s.Case)
}

// RampPeriods is the number of periods the swimming-speed estimate of a
// run from rest skips: the ramp and as many periods again for the
// transient it leaves.
func RampPeriods(c *cases.Case) int {
	return int(math.Ceil(2 * c.Shaking.RampPeriods))
}

// StartWarm starts the simulation (fresh from its case) from st, the
// final state of a run of case c whose lattice agrees (SameLattice): the
// populations, the spheres' positions, velocities and node bookkeeping,
// and the mass keeper are taken over, the step count starts again at 0,
// and the drive ramps from c's drive to this one over the case's ramp (a
// sudden change of amplitude would jolt the spheres' mean positions, a
// transient that outlasts the ramp). The source run ended on a whole
// number of periods, so the drive's phase carries on.
func (s *Simulation) StartWarm(c *cases.Case, st State) error {
	st.Lattice.Steps = 0
	if st.Levels != nil {
		ls := *st.Levels
		ls.Levels = append([]lbm.LatticeState(nil), ls.Levels...)
		for l := range ls.Levels {
			ls.Levels[l].Steps = 0
		}
		st.Levels = &ls
		st.LevelMoves, st.LevelShift = 0, 0
	}
	if err := s.Restore(st); err != nil {
		return err
	}
	from := shakerOf(c)
	s.warm, s.Shaker.From = true, &from
	return nil
}

// ResumeWarm marks a simulation restored from a checkpoint of a warm
// started run as warm, its drive ramping from from.
func (s *Simulation) ResumeWarm(from *Shaker) { s.warm, s.Shaker.From = true, from }

// SameLattice says how the lattice of case c (resolved to l) differs from
// the simulation's in a way a state cannot cross, or "" when it does not.
func (s *Simulation) SameLattice(c *cases.Case, l *cases.Lattice) string {
	a, b := s.Lattice, l
	var diff []string
	add := func(ok bool, format string, args ...any) {
		if !ok {
			diff = append(diff, fmt.Sprintf(format, args...))
		}
	}
	add(a.Nz == b.Nz && a.Nr == b.Nr, "%dx%d and %dx%d cells", a.Nz, a.Nr, b.Nz, b.Nr)
	add(a.Dx == b.Dx, "cell %.4g and %.4g m", a.Dx, b.Dx)
	add(a.Dt == b.Dt, "time step %.5g and %.5g s", a.Dt, b.Dt)
	add(a.Tau == b.Tau, "tau %.5g and %.5g", a.Tau, b.Tau)
	add(a.Levels == b.Levels, "%d and %d levels", a.Levels, b.Levels)
	if a.Levels == b.Levels && a.Levels > 1 {
		// the refined levels may have moved along z (lbm.Levels.Restore)
		x, y := a.Layout().Blocks, b.Layout().Blocks
		x[0].Z0, y[0].Z0 = 0, 0
		add(slices.Equal(x, y), "refined levels of other sizes")
	}
	x, y := s.Case, c
	add(x.Solver.Collision == y.Solver.Collision && x.Solver.Precision == y.Solver.Precision &&
		x.Solver.Magic == y.Solver.Magic, "solver settings")
	add(x.Container.Ends == y.Container.Ends, "container ends %s and %s", x.Container.Ends, y.Container.Ends)
	add(len(x.Spheres) == len(y.Spheres), "%d and %d spheres", len(x.Spheres), len(y.Spheres))
	if len(x.Spheres) == len(y.Spheres) {
		for k := range x.Spheres {
			add(x.Spheres[k].Radius == y.Spheres[k].Radius, "sphere %d radius %.4g and %.4g m", k+1, x.Spheres[k].Radius, y.Spheres[k].Radius)
		}
	}
	add(math.Abs(x.Shaking.Frequency-y.Shaking.Frequency) == 0, "frequency %.5g and %.5g Hz", x.Shaking.Frequency, y.Shaking.Frequency)
	return strings.Join(diff, "; ")
}
