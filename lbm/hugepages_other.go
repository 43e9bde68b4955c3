//go:build !linux

package lbm

// adviseHuge does nothing outside Linux.
func adviseHuge[T real](back []T) {}
