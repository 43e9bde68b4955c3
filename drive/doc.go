// Package drive is the coupled time step of a case: the shaken frame of
// the container, the bodies and springs in it (leapfrog dynamics with
// dashpots, virtual mass, arms and repulsion), the mass keeper, prescribed
// motion, and Simulation, which steps the lattice and the bodies together,
// observes the liquid and guards the run. Running a case to its files is
// package drive/run's; what a run records, drive/record's.
//
// The solver works in the frame of the container, which the shaker moves
// as X(t) = A s(t) sin(omega t) along the axis (s ramps the amplitude up
// smoothly). In a closed container the frame's acceleration and gravity are
// absorbed into a modified pressure p + rho_f (a(t) + g) z (Batchelor 1967,
// An Introduction to Fluid Dynamics, §4.1): the liquid is left unforced, so
// the shaking pumps no lattice acoustic mode (METHODS.md 4.3 and 10.3), and
// each body gets the buoyancy-corrected frame force instead. That shift
// needs rigid end walls; with periodic ends the frame force and gravity act
// on the liquid as a uniform body force (Guo forcing), and a shaken periodic
// tube is Womersley flow in the container frame.
package drive
