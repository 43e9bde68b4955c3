package main

import (
	"runtime"
)

// threadCounts are the goroutine counts measured: 1 and all cores
// (runtime.NumCPU), once if the machine has a single core.
func threadCounts() []int {
	if n := runtime.NumCPU(); n > 1 {
		return []int{1, n}
	}
	return []int{1}
}
