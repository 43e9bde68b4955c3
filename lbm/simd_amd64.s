//go:build !purego

// AVX-512 versions of the block loops of kernel.go, eight nodes per
// iteration: gatherSIMD is gather followed by the fixed-point passes
// (pass), with the node's values kept in registers from one pass to the
// next; collideSIMD is rest followed by axisPairs and diagonalPairs. Each
// does the Go loops' operations in the Go loops' order: same association,
// no fused multiply-add, IEEE division, so every lane rounds exactly as the
// Go code does. Go's operand order: VSUBPD B, A, D is D = A - B; VDIVPD B,
// A, D is D = A / B; a .BCST operand is a float64 in memory broadcast to
// all lanes.
//
// The loop bodies are in simd_gather.h, simd_collide.h and simd_planar.h,
// included twice: once with LD and ST defined for float64 populations and
// once for float32 (planes of Config.Single), so the two cannot drift apart.
//
// Block arrays are addressed as block_<field>(DI)(CX*8): DI is the block,
// CX the node index (a multiple of 8), DX the number of nodes. The
// populations are at the addresses block_src and block_dst (uintptrs set
// by pointers), loaded into general registers where needed. Every load and
// store of a population is masked by K1: all lanes, or in the last vector
// of a block that does not fill it the lanes of block_tail, so that no
// population beyond the block is read or written (masked-off lanes of a
// load are zero and do not fault). The block arrays are blk long, so
// whole vectors of them are always inside.

#include "textflag.h"
#include "go_asm.h"

#define K(f) (block_k+f)(DI)

#define SRC(q, r) MOVQ (block_src+q*8)(DI), r
#define DST(q, r) MOVQ (block_dst+q*8)(DI), r

// PASS is one fixed-point pass of the half-step moments (pass). State:
// drho0 Z0, j_z Z1, j_r Z2, G_z Z3, G_r Z4 (fixed); m_z Z5, m_r Z6, F_z Z7,
// F_r Z8, 1/rho Z9, theta Z10, drho Z11 (updated). Constants: 1 Z31, -R
// Z30, k1 Z29, k2 Z28, k3 Z27, k4 Z26, k5 Z25, hoop Z24, 1/2 Z23.
// Scratch Z12-Z16.
#define PASS \
	VMULPD Z30, Z6, Z12; \
	VMULPD Z29, Z5, Z13; \
	VMULPD Z28, Z7, Z14; \
	VADDPD Z14, Z13, Z13; \
	VMULPD Z13, Z6, Z13; \
	VMULPD Z8, Z5, Z14; \
	VMULPD Z28, Z14, Z14; \
	VADDPD Z14, Z13, Z13; \
	VMULPD Z13, Z9, Z13; \
	VSUBPD Z13, Z3, Z15; \
	VMULPD Z29, Z6, Z13; \
	VMULPD Z27, Z8, Z14; \
	VADDPD Z14, Z13, Z13; \
	VMULPD Z13, Z6, Z13; \
	VMULPD Z13, Z9, Z13; \
	VSUBPD Z13, Z4, Z16; \
	VSUBPD Z12, Z10, Z14; \
	VMULPD Z26, Z14, Z14; \
	VADDPD Z14, Z16, Z16; \
	VMULPD Z23, Z16, Z13; \
	VADDPD Z13, Z2, Z13; \
	VMULPD Z24, Z13, Z6; \
	VMULPD Z23, Z12, Z13; \
	VADDPD Z13, Z0, Z11; \
	VADDPD Z11, Z31, Z9; \
	VDIVPD Z9, Z31, Z9; \
	VMOVAPD Z12, Z10; \
	VMOVAPD Z15, Z7; \
	VMULPD Z23, Z15, Z13; \
	VADDPD Z13, Z1, Z5; \
	VMULPD Z25, Z6, Z13; \
	VSUBPD Z13, Z16, Z8

// PAIR relaxes one pair of opposite directions (axisPairs): rates at R
// (block_axis or block_diag), e.u in eu, e.F in ef, 2 (3 w_i) rho in rw6;
// the node's base in Z6, sbase in Z7, 9/2 rho in Z9; populations from
// (pi)(CX*8), (pj)(CX*8) to (qi)(CX*8), (qj)(CX*8). Scratch Z16-Z22.
#define PAIR(R, eu, ef, rw6, pi, pj, qi, qj) \
	VMULPD eu, Z9, Z16; \
	VMULPD eu, Z16, Z16; \
	VADDPD Z16, Z6, Z16; \
	VMULPD.BCST (R+pairRates_w2)(DI), Z16, Z16; \
	LD(pi, Z17); \
	LD(pj, Z18); \
	VADDPD Z18, Z17, Z19; \
	VSUBPD Z16, Z19, Z19; \
	VMULPD.BCST (R+pairRates_nhp)(DI), Z19, Z19; \
	VMULPD.BCST (R+pairRates_c9)(DI), eu, Z20; \
	VMULPD ef, Z20, Z20; \
	VADDPD Z20, Z7, Z20; \
	VMULPD.BCST (R+pairRates_cpw)(DI), Z20, Z20; \
	VADDPD Z20, Z19, Z19; \
	VSUBPD Z18, Z17, Z21; \
	VMULPD eu, rw6, Z22; \
	VSUBPD Z22, Z21, Z21; \
	VMULPD.BCST (R+pairRates_nhm)(DI), Z21, Z21; \
	VMULPD.BCST (R+pairRates_cmw)(DI), ef, Z22; \
	VADDPD Z22, Z21, Z21; \
	VADDPD Z19, Z17, Z17; \
	VADDPD Z21, Z17, Z17; \
	ST(Z17, Y17, qi); \
	VADDPD Z19, Z18, Z18; \
	VSUBPD Z21, Z18, Z18; \
	ST(Z18, Y18, qj)

// MOMENTS streams the nine populations in (pointers from block_src, LD
// masked by K1) and forms the moments and the first guess of gather:
// drho0 Z0, j_z Z1, j_r Z2, 1/(1 + drho0) Z9, m_z Z5, m_r Z6, and keeps
// s24 Z20, s57 Z21, s68 Z3 and s5678 Z17 for the axisymmetric terms. Needs
// 1 in Z31; scratch Z4, Z12-Z19. Used by gatherSIMD and planarSIMD.
#define MOMENTS \
	SRC(0, AX); \
	SRC(1, BX); \
	SRC(2, SI); \
	SRC(3, R8); \
	SRC(4, R9); \
	SRC(5, R10); \
	SRC(6, R11); \
	SRC(7, R12); \
	SRC(8, R13); \
	LD(BX, Z12); \
	LD(R8, Z13); \
	LD(SI, Z14); \
	LD(R9, Z15); \
	LD(R10, Z16); \
	LD(R12, Z17); \
	LD(R11, Z18); \
	LD(R13, Z19); \
	VADDPD Z15, Z14, Z20; \
	VADDPD Z17, Z16, Z21; \
	VADDPD Z19, Z18, Z3; \
	VSUBPD Z17, Z16, Z16; \
	VSUBPD Z19, Z18, Z18; \
	VADDPD Z3, Z21, Z17; \
	VADDPD Z13, Z12, Z19; \
	VADDPD Z20, Z19, Z19; \
	LD(AX, Z4); \
	VADDPD Z4, Z19, Z19; \
	VADDPD Z17, Z19, Z0; \
	VSUBPD Z13, Z12, Z12; \
	VSUBPD Z18, Z16, Z13; \
	VADDPD Z13, Z12, Z1; \
	VSUBPD Z15, Z14, Z14; \
	VADDPD Z18, Z16, Z15; \
	VADDPD Z15, Z14, Z2; \
	VADDPD Z0, Z31, Z9; \
	VDIVPD Z9, Z31, Z9; \
	VADDPD.BCST K(consts_hgz), Z1, Z5; \
	VADDPD.BCST K(consts_hgr), Z2, Z6

// COLLIDE is rest followed by the pairs (collideTRT's arithmetic, see
// kernel.go) from drho Z0, 1/rho Z1, m_z Z5, m_r Z6, F_z Z10, F_r Z11 and
// theta Z12, into the populations at block_dst (ST masked by K1). Needs the
// rest constants in Z25-Z31 (collideSIMD's). Used by collideSIMD and
// planarSIMD.
#define COLLIDE \
	VADDPD Z0, Z31, Z2; \
	VMULPD Z5, Z1, Z3; \
	VMULPD Z6, Z1, Z4; \
	VMULPD Z3, Z3, Z5; \
	VMULPD Z4, Z4, Z6; \
	VADDPD Z6, Z5, Z5; \
	VMULPD Z30, Z2, Z6; \
	VMULPD Z5, Z6, Z6; \
	VSUBPD Z6, Z0, Z6; \
	VMULPD Z10, Z3, Z7; \
	VMULPD Z11, Z4, Z8; \
	VADDPD Z8, Z7, Z7; \
	VMULPD Z29, Z7, Z7; \
	VSUBPD Z7, Z12, Z7; \
	VMULPD Z28, Z2, Z9; \
	SRC(0, AX); \
	DST(0, BX); \
	LD(AX, Z12); \
	VMULPD Z26, Z6, Z13; \
	VSUBPD Z13, Z12, Z13; \
	VMULPD Z27, Z13, Z13; \
	VSUBPD Z13, Z12, Z13; \
	VMULPD Z25, Z7, Z14; \
	VADDPD Z14, Z13, Z13; \
	ST(Z13, Y13, BX); \
	VMULPD.BCST (block_axis+pairRates_w6)(DI), Z2, Z15; \
	SRC(1, AX); \
	SRC(3, BX); \
	DST(1, SI); \
	DST(3, R8); \
	PAIR(block_axis, Z3, Z10, Z15, AX, BX, SI, R8); \
	SRC(2, AX); \
	SRC(4, BX); \
	DST(2, SI); \
	DST(4, R8); \
	PAIR(block_axis, Z4, Z11, Z15, AX, BX, SI, R8); \
	VMULPD.BCST (block_diag+pairRates_w6)(DI), Z2, Z15; \
	VADDPD Z4, Z3, Z12; \
	VADDPD Z11, Z10, Z13; \
	SRC(5, AX); \
	SRC(7, BX); \
	DST(5, SI); \
	DST(7, R8); \
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8); \
	VSUBPD Z3, Z4, Z12; \
	VSUBPD Z10, Z11, Z13; \
	SRC(6, AX); \
	SRC(8, BX); \
	DST(6, SI); \
	DST(8, R8); \
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)

// LD loads eight populations at (p)(CX*8) into z, masked by K1; ST stores
// z (whose lower half is y) there. Here for float64; for float32 below.
#define LD(p, z) VMOVUPD.Z (p)(CX*8), K1, z
#define ST(z, y, p) VMOVUPD z, K1, (p)(CX*8)

// func gatherSIMD(t *block, n int, passes int)
//
// gather, then passes times pass (the axisymmetric terms when passes > 0);
// stores drho, 1/rho, m, F and theta.
TEXT ·gatherSIMD(SB), NOSPLIT, $0-24
#include "simd_gather.h"

// func collideSIMD(t *block, n int)
//
// rest, then axisPairs and diagonalPairs, from the moments in the block
// and the streamed populations at block_src into block_dst.
TEXT ·collideSIMD(SB), NOSPLIT, $0-16
#include "simd_collide.h"

// func planarSIMD(t *block, n int)
//
// gatherSIMD without passes followed by collideSIMD, the moments kept in
// registers: the whole step of a planar lattice (no axisymmetric terms),
// F = G and theta = 0.
TEXT ·planarSIMD(SB), NOSPLIT, $0-16
#include "simd_planar.h"

#undef LD
#undef ST

// The same loops on float32 populations (Config.Single): each is
// converted to float64 as it is loaded (exactly) and rounded to float32 as
// it is stored (to nearest even, as Go's float32 conversion).
#define LD(p, z) VCVTPS2PD.Z (p)(CX*4), K1, z
#define ST(z, y, p) VCVTPD2PS z, y; VMOVUPS y, K1, (p)(CX*4)

// func gatherSIMD32(t *block, n, passes int)
TEXT ·gatherSIMD32(SB), NOSPLIT, $0-24
#include "simd_gather.h"

// func collideSIMD32(t *block, n int)
TEXT ·collideSIMD32(SB), NOSPLIT, $0-16
#include "simd_collide.h"

// func planarSIMD32(t *block, n int)
TEXT ·planarSIMD32(SB), NOSPLIT, $0-16
#include "simd_planar.h"
