package drive

// MassKeeper holds the mean density of the liquid at its initial value.
// Interpolated bounce-back, refilling and covering, and the axisymmetric
// source terms each change the liquid's mass slightly (METHODS.md 6.3);
// every Every steps the keeper adds w_i (rho_0 - rho) to all fluid nodes,
// which changes the density and not the momentum (the global correction of
// METHODS.md 6.3). The corrections are recorded so that a run can report
// how much mass its scheme lost or gained.
type MassKeeper struct {
	Every int     // cadence in steps (0: never correct, only measure)
	Rho0  float64 // target mean density
	// Drift is the largest |rho - rho0|/rho0 seen before a correction, and
	// Applied the sum of the corrections (signed, relative).
	Drift, Applied float64
	n              int
}

// A Liquid is a lattice, or refined levels, whose mean density a
// MassKeeper holds: lbm.Solver and lbm.Levels.
type Liquid interface {
	FluidDensity() float64
	ShiftDensity(drho float64)
}

// NewMassKeeper starts keeping the current mean density of fl.
func NewMassKeeper(fl Liquid, every int) *MassKeeper {
	return &MassKeeper{Every: every, Rho0: fl.FluidDensity()}
}

// Step counts one lattice step and corrects at the cadence. The
// measurement and the correction each cost about one pass over the grid,
// so a cadence of 200 steps costs about 1% of the run.
func (m *MassKeeper) Step(fl Liquid) {
	m.n++
	if m.Every <= 0 || m.n%m.Every != 0 {
		return
	}
	rho := fl.FluidDensity()
	d := (rho - m.Rho0) / m.Rho0
	if d < 0 && -d > m.Drift {
		m.Drift = -d
	} else if d > m.Drift {
		m.Drift = d
	}
	fl.ShiftDensity(m.Rho0 - rho)
	m.Applied -= d
}
