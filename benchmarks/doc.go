// Command benchmarks measures how fast the lattice-Boltzmann kernel of
// package axiswim/lbm and the coupled drive step run on this machine, and
// how that compares with what the memory system allows.
//
// It times one fused stream-and-collide step (lbm.Solver.Step) of three
// kernels, planar BGK, axisymmetric TRT and axisymmetric TRT with float32
// storage, on a few grids with one goroutine and with all cores, in
// million lattice-node updates per second (MLUPS). In the same run it
// measures the memory bandwidth with a STREAM-style triad, a[i] = b[i] +
// s*c[i], and turns it into the bandwidth-bound limit of the kernel: a node
// update reads and writes nine float64 populations, 144 bytes (72 with
// float32), so no kernel can exceed triad_bytes_per_second / 144 node
// updates per second once the lattice no longer fits in the caches. It
// prints one table with the rates, the limit, the fraction of it reached
// and the scaling efficiency from one goroutine to all, then a table of the
// demo's coupled step (drive.Simulation.Advance) at 12 and 24 cells per
// radius: wall time per drive period, the share of a step spent outside the
// fluid kernel, and allocations per step.
//
// Usage:
//
//	go run ./benchmarks [-grids 256x128,960x240,4096x1024] [-portable] [-seconds 2] [-reps 10] [-triad-mib 512]
//
// The same measurements are available as Go benchmarks
// (BenchmarkPlanarBGK, BenchmarkAxisymmetricTRT, BenchmarkTriad,
// BenchmarkDemoStep):
//
//	go test -run '^$' -bench . ./benchmarks/
//	go test -run '^$' -bench . ./benchmarks/ -args -grids all
//
// See README.md in this directory for the latest measured table.
package main
