package drive

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"

	"axiswim/cases"
)

// FinalStateFile holds the state at the end of a completed run, kept when
// Options.SaveFinal is set so that another run can start from it.
const FinalStateFile = "final.bin"

// WarmStart records whether a run started from another run's final state
// (continuation: the streaming flow and the swimmer's drift are already
// there, so the transient is shorter) and, if not, why.
type WarmStart struct {
	From   string `json:"from"` // the run directory asked for
	Used   bool   `json:"used"`
	Reason string `json:"reason,omitempty"` // why it started from rest instead
	// Skipped is the number of periods the speed estimate and the mean
	// fields skip: the ramp for a warm start, twice the ramp from rest.
	Skipped int `json:"periods_skipped"`
}

// skipPeriods is the number of periods the swimming-speed estimate and the
// mean fields skip: after a start from rest, the ramp and as many periods
// again for the transient it leaves; after a warm start, whose flow is
// already close to its own, the ramp alone (at least one period).
func (s *Simulation) skipPeriods() int {
	if s.warm {
		return max(1, int(math.Ceil(s.Case.Shaking.RampPeriods)))
	}
	return rampPeriods(s.Case)
}

// warmStart starts the simulation (fresh from its case) from the final
// state of the run in dir when their lattices agree: the populations, the
// spheres' positions, velocities and node bookkeeping, and the mass
// keeper are taken over, the step count starts again at 0, and the drive
// ramps from the source run's drive to this one over the case's ramp (a
// sudden change of amplitude would jolt the spheres' mean positions, a
// transient that outlasts the ramp). The source run ended on a whole
// number of periods, so the drive's phase carries on. When the lattices differ (another resolution, time step,
// container or sphere size) or dir has no final state, the run starts
// from rest and the record says why; only a damaged final state is an
// error.
func (s *Simulation) warmStart(dir string) (*WarmStart, error) {
	ws := &WarmStart{From: dir}
	cold := func(format string, args ...any) (*WarmStart, error) {
		ws.Reason = fmt.Sprintf(format, args...)
		ws.Skipped = s.skipPeriods()
		return ws, nil
	}
	src, err := os.ReadFile(filepath.Join(dir, "case.toml"))
	if err != nil {
		return cold("no case.toml in %s: %v", dir, err)
	}
	c, err := cases.Parse(filepath.Join(dir, "case.toml"), src)
	if err != nil {
		return cold("its case does not read: %v", err)
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return cold("its case does not resolve: %v", err)
	}
	if why := s.sameLattice(c, l); why != "" {
		return cold("the lattices differ (%s)", why)
	}
	st, err := readCheckpoint(filepath.Join(dir, FinalStateFile), HashCase(src))
	if errors.Is(err, fs.ErrNotExist) {
		return cold("%s has no %s (the run did not finish, or was not asked to keep it)", dir, FinalStateFile)
	}
	if err != nil {
		return nil, fmt.Errorf("warm start from %s: %w", dir, err)
	}
	st.Lattice.Steps = 0
	if err := s.restore(st); err != nil {
		return nil, fmt.Errorf("warm start from %s: %w", dir, err)
	}
	s.warm, ws.Used = true, true
	s.startFrom(c)
	ws.Skipped = s.skipPeriods()
	return ws, nil
}

// startFrom makes the drive ramp from that of case c (the source of a
// warm start) to the simulation's own.
func (s *Simulation) startFrom(c *cases.Case) {
	from := shakerOf(c)
	s.Shaker.From = &from
}

// sameLattice says how the lattice of case c (resolved to l) differs from
// the simulation's in a way a state cannot cross, or "" when it does not.
func (s *Simulation) sameLattice(c *cases.Case, l *cases.Lattice) string {
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
