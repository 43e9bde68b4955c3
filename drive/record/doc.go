// Package record holds what a run records while it steps: the rows of
// series.csv and periods.csv (the per-period Fourier amplitudes and phases,
// the stroboscopic centroids, the gaps of a train), the statistics of the
// swimming speed, the mean and phase-averaged fields and the snapshots
// (VTK files in SI units), the pictures and charts, metrics.csv, and the
// parts of a checkpoint that are its own. It observes a drive.Simulation
// and never steps it.
package record
