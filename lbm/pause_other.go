//go:build !amd64 || purego

package lbm

// cpuRelax would tell the processor that the caller is spinning; portable
// builds just poll.
func cpuRelax() {}
