// Package run carries out one run of a case: it opens a fresh run
// directory (or resumes the run in one from its checkpoint, or starts from
// another run's final state), steps the coupled simulation of package
// drive to its end with the records of package record observing it, writes
// checkpoints along the way so that an interrupted run continues bit for
// bit, and finishes with summary.json: the swimming speed and its
// uncertainty, the swimmers and gaps of a train, the mean flow's metrics
// (package flow) and the reduced models beside the simulation (package
// model).
//
// The data path reads top to bottom: cases (the case and its lattice
// units) -> drive (the coupled step) -> record and flow (what is observed)
// -> run (files and the summary) -> study (many runs).
package run
