//go:build !purego

#include "textflag.h"

// func cpuRelax()
//
// Four PAUSE instructions: a spinning worker yields the core's execution
// resources (its SMT sibling may be the goroutine it waits for) and saves
// power, as the Go runtime's own spin loops do.
TEXT ·cpuRelax(SB), NOSPLIT, $0-0
	PAUSE
	PAUSE
	PAUSE
	PAUSE
	RET
