package drive

import "axiswim/lbm"

// Prescribed moves body Body along a given velocity history: Velocity(t)
// is the velocity at time t in lattice steps (evaluated at half steps).
type Prescribed struct {
	Body     int
	Velocity func(t float64) float64
}

// StepPrescribed takes one lattice step with the bodies of bs moved as
// moves prescribe (the prescribed-motion mode, used by the verification
// cases): the fluid streams and collides with the walls moving at
// V^{n+1/2}, the forces are collected, the bodies move to
// Z^{n+1} = Z^n + V^{n+1/2} and take V^{n+3/2} for the next step
// (METHODS.md 9.4).
func StepPrescribed(fl *lbm.Solver, bs *Bodies, moves []Prescribed) error {
	fl.Step()
	bs.Collect()
	return MovePrescribed(fl, bs, moves)
}

// MovePrescribed is StepPrescribed's second half: after fl's step, and the
// forces collected, it moves the bodies (on levels, the finest level's
// step is taken by lbm.Levels, which runs this after each one).
func MovePrescribed(fl *lbm.Solver, bs *Bodies, moves []Prescribed) error {
	t := float64(fl.Steps())
	for _, m := range moves {
		b := bs.List[m.Body]
		if err := bs.MoveTo(m.Body, b.Shape.Z+b.V, m.Velocity(t+0.5)); err != nil {
			return err
		}
	}
	return nil
}
