//go:build !purego

package lbm

// cpuRelax tells the processor that the caller is spinning (pause_amd64.s).
func cpuRelax()
