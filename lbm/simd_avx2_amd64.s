//go:build !purego

// AVX2 versions of the block loops of kernel.go, four nodes per iteration:
// the same three loops as the AVX-512 ones of simd_amd64.s (gatherAVX2 =
// gather + the fixed-point passes, collideAVX2 = rest + the pairs,
// planarAVX2 = both for planar lattices), each doing the Go loops'
// operations in the Go loops' order: same association, no fused
// multiply-add, IEEE division, so every lane rounds exactly as the Go code
// does. The steps follow those of simd_amd64.s one for one, with the same
// comments; what differs is what the instruction sets allow:
//
//   - 16 YMM registers instead of 32 ZMM: the constants are 256-bit memory
//     operands (the block's k4, axis4 and diag4, each value in four lanes,
//     filled by block.spread) instead of registers and broadcasts, and the
//     registers of the values are allocated anew (named in each macro).
//   - No mask registers: the loops run over n nodes, a multiple of four,
//     and the Go loops do the block's last n%4 nodes, so no population
//     outside the run is read or written.
//   - VEX arithmetic takes a memory operand only as its second source (Go's
//     first operand): a constant that is the minuend of a subtraction or
//     the dividend of a division is loaded into a register first. Addition
//     and multiplication commute exactly in IEEE arithmetic, so the operand
//     order of those does not change a bit.
//
// Go's operand order: VSUBPD B, A, D is D = A - B; VDIVPD B, A, D is
// D = A / B. Block arrays are addressed as block_<field>(DI)(CX*8): DI is
// the block, CX the node index (a multiple of 4), DX the number of nodes.
//
// The loop bodies are in simd_avx2_gather.h, simd_avx2_collide.h and
// simd_avx2_planar.h, included twice: once with LD and ST defined for
// float64 populations and once for float32, so the two cannot drift apart.

#include "textflag.h"
#include "go_asm.h"

// C(consts_f) is the constant f of consts (see kernel.go) in four lanes;
// PR(R, pairRates_f) the pair rate f of block_axis4 or block_diag4.
#define C(f) (block_k4+4*f)(DI)
#define PR(R, f) (R+4*f)(DI)

#define SRC(q, r) MOVQ (block_src+q*8)(DI), r
#define DST(q, r) MOVQ (block_dst+q*8)(DI), r

// MOMENTS streams the nine populations in (pointers from block_src) and
// forms the moments and the first guess of gather: drho0 Y0, j_z Y1, j_r
// Y2, 1/(1 + drho0) Y9, m_z Y5, m_r Y6, and keeps s24 Y10, s57 Y11, s68 Y3
// and s5678 Y8 for the axisymmetric terms. Scratch Y4, Y6, Y7, Y12-Y15.
// Used by gatherAVX2 and planarAVX2.
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
	LD(BX, Y12); \
	LD(R8, Y13); \
	LD(SI, Y14); \
	LD(R9, Y15); \
	LD(R10, Y7); \
	LD(R12, Y8); \
	LD(R11, Y9); \
	LD(R13, Y6); \
	VADDPD Y15, Y14, Y10; \
	VADDPD Y8, Y7, Y11; \
	VADDPD Y6, Y9, Y3; \
	VSUBPD Y8, Y7, Y7; \
	VSUBPD Y6, Y9, Y9; \
	VADDPD Y3, Y11, Y8; \
	VADDPD Y13, Y12, Y6; \
	VADDPD Y10, Y6, Y6; \
	LD(AX, Y4); \
	VADDPD Y4, Y6, Y6; \
	VADDPD Y8, Y6, Y0; \
	VSUBPD Y13, Y12, Y12; \
	VSUBPD Y9, Y7, Y13; \
	VADDPD Y13, Y12, Y1; \
	VSUBPD Y15, Y14, Y14; \
	VADDPD Y9, Y7, Y15; \
	VADDPD Y15, Y14, Y2; \
	VADDPD C(consts_one), Y0, Y9; \
	VMOVUPD C(consts_one), Y4; \
	VDIVPD Y9, Y4, Y9; \
	VADDPD C(consts_hgz), Y1, Y5; \
	VADDPD C(consts_hgr), Y2, Y6

// PASS is one fixed-point pass of the half-step moments (pass). State:
// drho0 Y0, j_z Y1, j_r Y2, G_z Y3, G_r Y4 (fixed); m_z Y5, m_r Y6, F_z Y7,
// F_r Y8, 1/rho Y9, theta Y10, drho Y11 (updated). Scratch Y12-Y15: theta'
// Y12, F'_z Y15, F^E_r Y13.
#define PASS \
	VMULPD C(consts_nr), Y6, Y12; \
	VMULPD C(consts_k1), Y5, Y13; \
	VMULPD C(consts_k2), Y7, Y14; \
	VADDPD Y14, Y13, Y13; \
	VMULPD Y13, Y6, Y13; \
	VMULPD Y8, Y5, Y14; \
	VMULPD C(consts_k2), Y14, Y14; \
	VADDPD Y14, Y13, Y13; \
	VMULPD Y13, Y9, Y13; \
	VSUBPD Y13, Y3, Y15; \
	VMULPD C(consts_k1), Y6, Y13; \
	VMULPD C(consts_k3), Y8, Y14; \
	VADDPD Y14, Y13, Y13; \
	VMULPD Y13, Y6, Y13; \
	VMULPD Y13, Y9, Y13; \
	VSUBPD Y13, Y4, Y13; \
	VSUBPD Y12, Y10, Y14; \
	VMULPD C(consts_k4), Y14, Y14; \
	VADDPD Y14, Y13, Y13; \
	VMULPD C(consts_half), Y13, Y14; \
	VADDPD Y14, Y2, Y14; \
	VMULPD C(consts_hoop), Y14, Y6; \
	VMULPD C(consts_half), Y12, Y14; \
	VADDPD Y14, Y0, Y11; \
	VADDPD C(consts_one), Y11, Y9; \
	VMOVUPD C(consts_one), Y14; \
	VDIVPD Y9, Y14, Y9; \
	VMOVAPD Y12, Y10; \
	VMOVAPD Y15, Y7; \
	VMULPD C(consts_half), Y15, Y14; \
	VADDPD Y14, Y1, Y5; \
	VMULPD C(consts_k5), Y6, Y14; \
	VSUBPD Y14, Y13, Y8

// PAIR relaxes one pair of opposite directions (axisPairs): rates at R
// (block_axis4 or block_diag4), e.u in eu, e.F in ef, 2 (3 w_i) rho in rw6;
// the node's base in Y6, sbase in Y7, 9/2 rho in Y9; populations from
// (pi)(CX*8), (pj)(CX*8) to (qi)(CX*8), (qj)(CX*8). Scratch Y0, Y1, Y5, Y8,
// Y14: d_i Y1, d_j Y5, relS Y8, relA Y14.
#define PAIR(R, eu, ef, rw6, pi, pj, qi, qj) \
	VMULPD eu, Y9, Y0; \
	VMULPD eu, Y0, Y0; \
	VADDPD Y0, Y6, Y0; \
	VMULPD PR(R, pairRates_w2), Y0, Y0; \
	LD(pi, Y1); \
	LD(pj, Y5); \
	VADDPD Y5, Y1, Y8; \
	VSUBPD Y0, Y8, Y8; \
	VMULPD PR(R, pairRates_nhp), Y8, Y8; \
	VMULPD PR(R, pairRates_c9), eu, Y0; \
	VMULPD ef, Y0, Y0; \
	VADDPD Y0, Y7, Y0; \
	VMULPD PR(R, pairRates_cpw), Y0, Y0; \
	VADDPD Y0, Y8, Y8; \
	VSUBPD Y5, Y1, Y14; \
	VMULPD eu, rw6, Y0; \
	VSUBPD Y0, Y14, Y14; \
	VMULPD PR(R, pairRates_nhm), Y14, Y14; \
	VMULPD PR(R, pairRates_cmw), ef, Y0; \
	VADDPD Y0, Y14, Y14; \
	VADDPD Y8, Y1, Y1; \
	VADDPD Y14, Y1, Y1; \
	ST(Y1, X1, qi); \
	VADDPD Y8, Y5, Y5; \
	VSUBPD Y14, Y5, Y5; \
	ST(Y5, X5, qj)

// COLLIDE is rest followed by the pairs (collideTRT's arithmetic, see
// kernel.go) from drho Y0, 1/rho Y1, m_z Y5, m_r Y6, F_z Y10, F_r Y11 and
// theta Y12, into the populations at block_dst. Keeps rho Y2, u_z Y3, u_r
// Y4, base Y6, sbase Y7, 9/2 rho Y9, 2 (3 w_i) rho Y15 through the pairs.
// Used by collideAVX2 and planarAVX2.
#define COLLIDE \
	VADDPD C(consts_one), Y0, Y2; \
	VMULPD Y5, Y1, Y3; \
	VMULPD Y6, Y1, Y4; \
	VMULPD Y3, Y3, Y5; \
	VMULPD Y4, Y4, Y6; \
	VADDPD Y6, Y5, Y5; \
	VMULPD C(consts_c15), Y2, Y6; \
	VMULPD Y5, Y6, Y6; \
	VSUBPD Y6, Y0, Y6; \
	VMULPD Y10, Y3, Y7; \
	VMULPD Y11, Y4, Y8; \
	VADDPD Y8, Y7, Y7; \
	VMULPD C(consts_c3), Y7, Y7; \
	VSUBPD Y7, Y12, Y7; \
	VMULPD C(consts_c45), Y2, Y9; \
	SRC(0, AX); \
	DST(0, BX); \
	LD(AX, Y12); \
	VMULPD C(consts_w0), Y6, Y13; \
	VSUBPD Y13, Y12, Y13; \
	VMULPD C(consts_wp), Y13, Y13; \
	VSUBPD Y13, Y12, Y13; \
	VMULPD C(consts_cpw0), Y7, Y14; \
	VADDPD Y14, Y13, Y13; \
	ST(Y13, X13, BX); \
	VMULPD PR(block_axis4, pairRates_w6), Y2, Y15; \
	SRC(1, AX); \
	SRC(3, BX); \
	DST(1, SI); \
	DST(3, R8); \
	PAIR(block_axis4, Y3, Y10, Y15, AX, BX, SI, R8); \
	SRC(2, AX); \
	SRC(4, BX); \
	DST(2, SI); \
	DST(4, R8); \
	PAIR(block_axis4, Y4, Y11, Y15, AX, BX, SI, R8); \
	VMULPD PR(block_diag4, pairRates_w6), Y2, Y15; \
	VADDPD Y4, Y3, Y12; \
	VADDPD Y11, Y10, Y13; \
	SRC(5, AX); \
	SRC(7, BX); \
	DST(5, SI); \
	DST(7, R8); \
	PAIR(block_diag4, Y12, Y13, Y15, AX, BX, SI, R8); \
	VSUBPD Y3, Y4, Y12; \
	VSUBPD Y10, Y11, Y13; \
	SRC(6, AX); \
	SRC(8, BX); \
	DST(6, SI); \
	DST(8, R8); \
	PAIR(block_diag4, Y12, Y13, Y15, AX, BX, SI, R8)

// LD loads four populations at (p)(CX*8) into y; ST stores y (whose lower
// half is x) there. Here for float64; for float32 below.
#define LD(p, y) VMOVUPD (p)(CX*8), y
#define ST(y, x, p) VMOVUPD y, (p)(CX*8)

// func gatherAVX2(t *block, n int, passes int)
//
// gather, then passes times pass (the axisymmetric terms when passes > 0);
// stores drho, 1/rho, m, F and theta.
TEXT ·gatherAVX2(SB), NOSPLIT, $0-24
#include "simd_avx2_gather.h"

// func collideAVX2(t *block, n int)
//
// rest, then axisPairs and diagonalPairs, from the moments in the block
// and the streamed populations at block_src into block_dst.
TEXT ·collideAVX2(SB), NOSPLIT, $0-16
#include "simd_avx2_collide.h"

// func planarAVX2(t *block, n int)
//
// gatherAVX2 without passes followed by collideAVX2, the moments kept in
// registers: the whole step of a planar lattice (no axisymmetric terms),
// F = G and theta = 0.
TEXT ·planarAVX2(SB), NOSPLIT, $0-16
#include "simd_avx2_planar.h"

#undef LD
#undef ST

// The same loops on float32 populations (Config.Single): each is
// converted to float64 as it is loaded (exactly) and rounded to float32 as
// it is stored (to nearest even, as Go's float32 conversion).
#define LD(p, y) VCVTPS2PD (p)(CX*4), y
#define ST(y, x, p) VCVTPD2PSY y, x; VMOVUPS x, (p)(CX*4)

// func gatherAVX2_32(t *block, n, passes int)
TEXT ·gatherAVX2_32(SB), NOSPLIT, $0-24
#include "simd_avx2_gather.h"

// func collideAVX2_32(t *block, n int)
TEXT ·collideAVX2_32(SB), NOSPLIT, $0-16
#include "simd_avx2_collide.h"

// func planarAVX2_32(t *block, n int)
TEXT ·planarAVX2_32(SB), NOSPLIT, $0-16
#include "simd_avx2_planar.h"
