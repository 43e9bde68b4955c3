//go:build !purego

package lbm

import "golang.org/x/sys/cpu"

// simdWidth is the number of nodes the SIMD loops handle at once: eight
// float64 lanes of an AVX-512 register.
const simdWidth = 8

// simdAvailable reports whether the processor and the operating system
// support the AVX-512 loops of simd_amd64.s (AVX-512 F, and VL for the
// masked 256-bit stores of float32; x/sys/cpu also checks that the OS
// saves the ZMM registers). Read once at start-up.
var simdAvailable = cpu.X86.HasAVX512F && cpu.X86.HasAVX512VL

// The SIMD loops: each does, for the first n nodes of the block (the last
// vector masked by t.tail when n is not a multiple of simdWidth; masked
// loads do not touch memory beyond the block), exactly the arithmetic of the Go loops it stands
// for in kernel.go, operation by operation and in the same order, eight
// nodes per instruction. Without fused multiply-adds and with IEEE
// division, each lane rounds as the Go code does, so both give the same
// bits (TestSIMDMatchesPortable).

// gatherSIMD is gather followed by passes times pass (0 for a planar
// lattice), the node's values staying in registers from pass to pass. It
// leaves drho, inv, mz, mr, fz, fr and theta in the block.
//
//go:noescape
func gatherSIMD(t *block, n, passes int)

// collideSIMD is rest followed by axisPairs and diagonalPairs: the
// collision from the moments in the block and the streamed populations at
// t.src into t.dst.
//
//go:noescape
func collideSIMD(t *block, n int)

// gatherSIMD32 is gatherSIMD on float32 populations (Config.Single).
//
//go:noescape
func gatherSIMD32(t *block, n, passes int)

// collideSIMD32 is collideSIMD on float32 populations (Config.Single).
//
//go:noescape
func collideSIMD32(t *block, n int)

// planarSIMD is gather and the TRT collision of a planar lattice (no
// passes) in one loop, the moments kept in registers.
//
//go:noescape
func planarSIMD(t *block, n int)

// planarSIMD32 is planarSIMD on float32 populations (Config.Single).
//
//go:noescape
func planarSIMD32(t *block, n int)
