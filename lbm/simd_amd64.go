//go:build !purego

package lbm

import "golang.org/x/sys/cpu"

// simdWidth is the number of nodes the AVX-512 loops handle at once: eight
// float64 lanes of a 512-bit register.
const simdWidth = 8

// avx2Width is the number of nodes the AVX2 loops handle at once: four
// float64 lanes of a 256-bit register.
const avx2Width = 4

// simdBuilt: this build has the assembly loops.
const simdBuilt = true

// hasAVX512 reports whether the processor and the operating system support
// the AVX-512 loops of simd_amd64.s (AVX-512 F, and VL for the masked
// 256-bit stores of float32; x/sys/cpu also checks that the OS saves the
// ZMM registers). hasAVX2 is the same for the AVX2 loops of
// simd_avx2_amd64.s (x/sys/cpu checks that the OS saves the YMM
// registers). Both are read once at start-up.
var (
	hasAVX512 = cpu.X86.HasAVX512F && cpu.X86.HasAVX512VL
	hasAVX2   = cpu.X86.HasAVX && cpu.X86.HasAVX2
)

// The SIMD loops: each does, for the first n nodes of the block, exactly
// the arithmetic of the Go loops it stands for in kernel.go, operation by
// operation and in the same order, several nodes per instruction. Without
// fused multiply-adds and with IEEE division, each lane rounds as the Go
// code does, so all give the same bits (TestSIMDMatchesPortable).
//
// The AVX-512 loops mask the last vector by t.tail when n is not a
// multiple of simdWidth (masked loads do not touch memory beyond the
// block). The AVX2 loops take n a multiple of avx2Width; the Go loops do
// the block's last nodes.

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

// gatherAVX2 is gatherSIMD with AVX2 (simd_avx2_amd64.s), n a multiple of
// avx2Width.
//
//go:noescape
func gatherAVX2(t *block, n, passes int)

// collideAVX2 is collideSIMD with AVX2, n a multiple of avx2Width.
//
//go:noescape
func collideAVX2(t *block, n int)

// planarAVX2 is planarSIMD with AVX2, n a multiple of avx2Width.
//
//go:noescape
func planarAVX2(t *block, n int)

// gatherAVX2_32 is gatherAVX2 on float32 populations.
//
//go:noescape
func gatherAVX2_32(t *block, n, passes int)

// collideAVX2_32 is collideAVX2 on float32 populations.
//
//go:noescape
func collideAVX2_32(t *block, n int)

// planarAVX2_32 is planarAVX2 on float32 populations.
//
//go:noescape
func planarAVX2_32(t *block, n int)
