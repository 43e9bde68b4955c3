//go:build !amd64 || purego

package lbm

// simdWidth and avx2Width are the number of nodes a SIMD loop would handle
// at once.
const (
	simdWidth = 8
	avx2Width = 4
)

// This build has only the portable Go kernel.
const (
	simdBuilt = false
	hasAVX512 = false
	hasAVX2   = false
)

func gatherSIMD(t *block, n, passes int)    { panic("lbm: no SIMD kernel in this build") }
func collideSIMD(t *block, n int)           { panic("lbm: no SIMD kernel in this build") }
func gatherSIMD32(t *block, n, passes int)  { panic("lbm: no SIMD kernel in this build") }
func collideSIMD32(t *block, n int)         { panic("lbm: no SIMD kernel in this build") }
func planarSIMD(t *block, n int)            { panic("lbm: no SIMD kernel in this build") }
func planarSIMD32(t *block, n int)          { panic("lbm: no SIMD kernel in this build") }
func gatherAVX2(t *block, n, passes int)    { panic("lbm: no SIMD kernel in this build") }
func collideAVX2(t *block, n int)           { panic("lbm: no SIMD kernel in this build") }
func planarAVX2(t *block, n int)            { panic("lbm: no SIMD kernel in this build") }
func gatherAVX2_32(t *block, n, passes int) { panic("lbm: no SIMD kernel in this build") }
func collideAVX2_32(t *block, n int)        { panic("lbm: no SIMD kernel in this build") }
func planarAVX2_32(t *block, n int)         { panic("lbm: no SIMD kernel in this build") }
