//go:build !amd64 || purego

package lbm

// simdWidth is the number of nodes a SIMD loop would handle at once.
const simdWidth = 8

// simdAvailable is false: this build has only the portable Go kernel.
const simdAvailable = false

func gatherSIMD(t *block, n, passes int)   { panic("lbm: no SIMD kernel in this build") }
func collideSIMD(t *block, n int)          { panic("lbm: no SIMD kernel in this build") }
func gatherSIMD32(t *block, n, passes int) { panic("lbm: no SIMD kernel in this build") }
func collideSIMD32(t *block, n int)        { panic("lbm: no SIMD kernel in this build") }
func planarSIMD(t *block, n int)           { panic("lbm: no SIMD kernel in this build") }
func planarSIMD32(t *block, n int)         { panic("lbm: no SIMD kernel in this build") }
