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

// func gatherSIMD(t *block, n int, passes int)
//
// gather, then passes times pass (the axisymmetric terms when passes > 0);
// stores drho, 1/rho, m, F and theta.
TEXT ·gatherSIMD(SB), NOSPLIT, $0-24
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_nr), Z30
	VBROADCASTSD K(consts_k1), Z29
	VBROADCASTSD K(consts_k2), Z28
	VBROADCASTSD K(consts_k3), Z27
	VBROADCASTSD K(consts_k4), Z26
	VBROADCASTSD K(consts_k5), Z25
	VBROADCASTSD K(consts_hoop), Z24
	VBROADCASTSD K(consts_half), Z23
	XORQ CX, CX

gloop:
	CMPQ CX, DX
	JGE gdone
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R13
	SUBQ CX, R13
	CMPQ R13, $8
	JLT gloop_tail
	KXNORW K1, K1, K1
	JMP gloop_go

gloop_tail:
	KMOVW block_tail(DI), K1

gloop_go:
	SRC(0, AX)
	SRC(1, BX)
	SRC(2, SI)
	SRC(3, R8)
	SRC(4, R9)
	SRC(5, R10)
	SRC(6, R11)
	SRC(7, R12)
	SRC(8, R13)
	VMOVUPD.Z (BX)(CX*8), K1, Z12 // d1
	VMOVUPD.Z (R8)(CX*8), K1, Z13 // d3
	VMOVUPD.Z (SI)(CX*8), K1, Z14 // d2
	VMOVUPD.Z (R9)(CX*8), K1, Z15 // d4
	VMOVUPD.Z (R10)(CX*8), K1, Z16 // d5
	VMOVUPD.Z (R12)(CX*8), K1, Z17 // d7
	VMOVUPD.Z (R11)(CX*8), K1, Z18 // d6
	VMOVUPD.Z (R13)(CX*8), K1, Z19 // d8
	VADDPD Z15, Z14, Z20 // s24
	VADDPD Z17, Z16, Z21 // s57
	VADDPD Z19, Z18, Z22 // s68
	VSUBPD Z17, Z16, Z16 // m57
	VSUBPD Z19, Z18, Z18 // m68
	VADDPD Z22, Z21, Z17 // s5678
	VADDPD Z13, Z12, Z19 // d1 + d3
	VADDPD Z20, Z19, Z19 // + s24
	VMOVUPD.Z (AX)(CX*8), K1, Z3 // d0
	VADDPD Z3, Z19, Z19 // d0 + (...)
	VADDPD Z17, Z19, Z0 // drho0 = (...) + s5678
	VSUBPD Z13, Z12, Z12 // d1 - d3
	VSUBPD Z18, Z16, Z13 // m57 - m68
	VADDPD Z13, Z12, Z1 // j_z
	VSUBPD Z15, Z14, Z14 // d2 - d4
	VADDPD Z18, Z16, Z15 // m57 + m68
	VADDPD Z15, Z14, Z2 // j_r
	// First guess: rho = 1 + drho0, m = j + G/2, F = G, theta = 0.
	VADDPD Z0, Z31, Z9
	VDIVPD Z9, Z31, Z9
	VMOVAPD Z0, Z11
	VADDPD.BCST K(consts_hgz), Z1, Z5
	VADDPD.BCST K(consts_hgr), Z2, Z6
	VBROADCASTSD K(consts_gz), Z7
	VBROADCASTSD K(consts_gr), Z8
	VPXORQ Z10, Z10, Z10
	MOVQ passes+16(FP), R13
	TESTQ R13, R13
	JZ gstore
	// The parts that do not change from pass to pass.
	VSUBPD Z22, Z21, Z12 // s57 - s68
	VMULPD Z27, Z12, Z12
	VSUBPD Z12, Z7, Z3 // G_z = g_z - c R Pi_zr
	VADDPD Z17, Z20, Z12 // s24 + s5678
	VMULPD.BCST K(consts_third), Z0, Z13
	VSUBPD Z13, Z12, Z12
	VMULPD Z27, Z12, Z12
	VSUBPD Z12, Z8, Z4 // G_r

gpass:
	PASS
	DECQ R13
	JNZ gpass

gstore:
	VMOVUPD Z11, block_drho(DI)(CX*8)
	VMOVUPD Z9, block_inv(DI)(CX*8)
	VMOVUPD Z5, block_mz(DI)(CX*8)
	VMOVUPD Z6, block_mr(DI)(CX*8)
	VMOVUPD Z7, block_fz(DI)(CX*8)
	VMOVUPD Z8, block_fr(DI)(CX*8)
	VMOVUPD Z10, block_theta(DI)(CX*8)
	ADDQ $8, CX
	JMP gloop

gdone:
	VZEROUPPER
	RET

// PAIR relaxes one pair of opposite directions (axisPairs): rates at R
// (block_axis or block_diag), e.u in eu, e.F in ef, 2 (3 w_i) rho in rw6;
// the node's base in Z6, sbase in Z7, 9/2 rho in Z9; populations from
// (pi)(CX*8), (pj)(CX*8) to (qi)(CX*8), (qj)(CX*8). Scratch Z16-Z22.
#define PAIR(R, eu, ef, rw6, pi, pj, qi, qj) \
	VMULPD eu, Z9, Z16; \
	VMULPD eu, Z16, Z16; \
	VADDPD Z16, Z6, Z16; \
	VMULPD.BCST (R+pairRates_w2)(DI), Z16, Z16; \
	VMOVUPD.Z (pi)(CX*8), K1, Z17; \
	VMOVUPD.Z (pj)(CX*8), K1, Z18; \
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
	VMOVUPD Z17, K1, (qi)(CX*8); \
	VADDPD Z19, Z18, Z18; \
	VSUBPD Z21, Z18, Z18; \
	VMOVUPD Z18, K1, (qj)(CX*8)

// func collideSIMD(t *block, n int)
//
// rest, then axisPairs and diagonalPairs, from the moments in the block
// and the streamed populations at block_src into block_dst.
TEXT ·collideSIMD(SB), NOSPLIT, $0-16
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_c15), Z30
	VBROADCASTSD K(consts_c3), Z29
	VBROADCASTSD K(consts_c45), Z28
	VBROADCASTSD K(consts_wp), Z27
	VBROADCASTSD K(consts_w0), Z26
	VBROADCASTSD K(consts_cpw0), Z25
	XORQ CX, CX

cloop:
	CMPQ CX, DX
	JGE cdone
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R9
	SUBQ CX, R9
	CMPQ R9, $8
	JLT cloop_tail
	KXNORW K1, K1, K1
	JMP cloop_go

cloop_tail:
	KMOVW block_tail(DI), K1

cloop_go:
	// rest: u = m/rho and the common terms.
	VMOVUPD block_drho(DI)(CX*8), Z0
	VMOVUPD block_inv(DI)(CX*8), Z1
	VADDPD Z0, Z31, Z2 // rho = 1 + drho
	VMULPD block_mz(DI)(CX*8), Z1, Z3 // u_z
	VMULPD block_mr(DI)(CX*8), Z1, Z4 // u_r
	VMULPD Z3, Z3, Z5
	VMULPD Z4, Z4, Z6
	VADDPD Z6, Z5, Z5 // u^2
	VMULPD Z30, Z2, Z6
	VMULPD Z5, Z6, Z6
	VSUBPD Z6, Z0, Z6 // base = drho - (3/2 rho) u^2
	VMOVUPD block_fz(DI)(CX*8), Z10
	VMOVUPD block_fr(DI)(CX*8), Z11
	VMULPD Z10, Z3, Z7
	VMULPD Z11, Z4, Z8
	VADDPD Z8, Z7, Z7
	VMULPD Z29, Z7, Z7
	VMOVUPD block_theta(DI)(CX*8), Z8
	VSUBPD Z7, Z8, Z7 // sbase = theta - 3 u.F
	VMULPD Z28, Z2, Z9 // 9/2 rho
	// f*_0 = (d0 - w+ (d0 - w0 base)) + (1 - w+/2) w0 sbase
	SRC(0, AX)
	DST(0, BX)
	VMOVUPD.Z (AX)(CX*8), K1, Z12
	VMULPD Z26, Z6, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z27, Z13, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z25, Z7, Z14
	VADDPD Z14, Z13, Z13
	VMOVUPD Z13, K1, (BX)(CX*8)
	// Pairs (1,3), e = (1,0), and (2,4), e = (0,1).
	VMULPD.BCST (block_axis+pairRates_w6)(DI), Z2, Z15
	SRC(1, AX)
	SRC(3, BX)
	DST(1, SI)
	DST(3, R8)
	PAIR(block_axis, Z3, Z10, Z15, AX, BX, SI, R8)
	SRC(2, AX)
	SRC(4, BX)
	DST(2, SI)
	DST(4, R8)
	PAIR(block_axis, Z4, Z11, Z15, AX, BX, SI, R8)
	// Pairs (5,7), e = (1,1), and (6,8), e = (-1,1).
	VMULPD.BCST (block_diag+pairRates_w6)(DI), Z2, Z15
	VADDPD Z4, Z3, Z12 // u_z + u_r
	VADDPD Z11, Z10, Z13 // F_z + F_r
	SRC(5, AX)
	SRC(7, BX)
	DST(5, SI)
	DST(7, R8)
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	VSUBPD Z3, Z4, Z12 // u_r - u_z
	VSUBPD Z10, Z11, Z13 // F_r - F_z
	SRC(6, AX)
	SRC(8, BX)
	DST(6, SI)
	DST(8, R8)
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	ADDQ $8, CX
	JMP cloop

cdone:
	VZEROUPPER
	RET

// PAIR32 is PAIR on float32 populations.
#define PAIR32(R, eu, ef, rw6, pi, pj, qi, qj) \
	VMULPD eu, Z9, Z16; \
	VMULPD eu, Z16, Z16; \
	VADDPD Z16, Z6, Z16; \
	VMULPD.BCST (R+pairRates_w2)(DI), Z16, Z16; \
	VCVTPS2PD.Z (pi)(CX*4), K1, Z17; \
	VCVTPS2PD.Z (pj)(CX*4), K1, Z18; \
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
	VCVTPD2PS Z17, Y17; \
	VMOVUPS Y17, K1, (qi)(CX*4); \
	VADDPD Z19, Z18, Z18; \
	VSUBPD Z21, Z18, Z18; \
	VCVTPD2PS Z18, Y18; \
	VMOVUPS Y18, K1, (qj)(CX*4)

// func gatherSIMD32(t *block, n int, passes int)
//
// gatherSIMD on float32 populations: each is converted to float64 as
// it is loaded (exactly). gather, then passes times pass (the axisymmetric terms when passes > 0);
// stores drho, 1/rho, m, F and theta.
TEXT ·gatherSIMD32(SB), NOSPLIT, $0-24
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_nr), Z30
	VBROADCASTSD K(consts_k1), Z29
	VBROADCASTSD K(consts_k2), Z28
	VBROADCASTSD K(consts_k3), Z27
	VBROADCASTSD K(consts_k4), Z26
	VBROADCASTSD K(consts_k5), Z25
	VBROADCASTSD K(consts_hoop), Z24
	VBROADCASTSD K(consts_half), Z23
	XORQ CX, CX

gloop32:
	CMPQ CX, DX
	JGE gdone32
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R13
	SUBQ CX, R13
	CMPQ R13, $8
	JLT gloop32_tail
	KXNORW K1, K1, K1
	JMP gloop32_go

gloop32_tail:
	KMOVW block_tail(DI), K1

gloop32_go:
	SRC(0, AX)
	SRC(1, BX)
	SRC(2, SI)
	SRC(3, R8)
	SRC(4, R9)
	SRC(5, R10)
	SRC(6, R11)
	SRC(7, R12)
	SRC(8, R13)
	VCVTPS2PD.Z (BX)(CX*4), K1, Z12 // d1
	VCVTPS2PD.Z (R8)(CX*4), K1, Z13 // d3
	VCVTPS2PD.Z (SI)(CX*4), K1, Z14 // d2
	VCVTPS2PD.Z (R9)(CX*4), K1, Z15 // d4
	VCVTPS2PD.Z (R10)(CX*4), K1, Z16 // d5
	VCVTPS2PD.Z (R12)(CX*4), K1, Z17 // d7
	VCVTPS2PD.Z (R11)(CX*4), K1, Z18 // d6
	VCVTPS2PD.Z (R13)(CX*4), K1, Z19 // d8
	VADDPD Z15, Z14, Z20 // s24
	VADDPD Z17, Z16, Z21 // s57
	VADDPD Z19, Z18, Z22 // s68
	VSUBPD Z17, Z16, Z16 // m57
	VSUBPD Z19, Z18, Z18 // m68
	VADDPD Z22, Z21, Z17 // s5678
	VADDPD Z13, Z12, Z19 // d1 + d3
	VADDPD Z20, Z19, Z19 // + s24
	VCVTPS2PD.Z (AX)(CX*4), K1, Z3 // d0
	VADDPD Z3, Z19, Z19 // d0 + (...)
	VADDPD Z17, Z19, Z0 // drho0 = (...) + s5678
	VSUBPD Z13, Z12, Z12 // d1 - d3
	VSUBPD Z18, Z16, Z13 // m57 - m68
	VADDPD Z13, Z12, Z1 // j_z
	VSUBPD Z15, Z14, Z14 // d2 - d4
	VADDPD Z18, Z16, Z15 // m57 + m68
	VADDPD Z15, Z14, Z2 // j_r
	// First guess: rho = 1 + drho0, m = j + G/2, F = G, theta = 0.
	VADDPD Z0, Z31, Z9
	VDIVPD Z9, Z31, Z9
	VMOVAPD Z0, Z11
	VADDPD.BCST K(consts_hgz), Z1, Z5
	VADDPD.BCST K(consts_hgr), Z2, Z6
	VBROADCASTSD K(consts_gz), Z7
	VBROADCASTSD K(consts_gr), Z8
	VPXORQ Z10, Z10, Z10
	MOVQ passes+16(FP), R13
	TESTQ R13, R13
	JZ gstore32
	// The parts that do not change from pass to pass.
	VSUBPD Z22, Z21, Z12 // s57 - s68
	VMULPD Z27, Z12, Z12
	VSUBPD Z12, Z7, Z3 // G_z = g_z - c R Pi_zr
	VADDPD Z17, Z20, Z12 // s24 + s5678
	VMULPD.BCST K(consts_third), Z0, Z13
	VSUBPD Z13, Z12, Z12
	VMULPD Z27, Z12, Z12
	VSUBPD Z12, Z8, Z4 // G_r

gpass32:
	PASS
	DECQ R13
	JNZ gpass32

gstore32:
	VMOVUPD Z11, block_drho(DI)(CX*8)
	VMOVUPD Z9, block_inv(DI)(CX*8)
	VMOVUPD Z5, block_mz(DI)(CX*8)
	VMOVUPD Z6, block_mr(DI)(CX*8)
	VMOVUPD Z7, block_fz(DI)(CX*8)
	VMOVUPD Z8, block_fr(DI)(CX*8)
	VMOVUPD Z10, block_theta(DI)(CX*8)
	ADDQ $8, CX
	JMP gloop32

gdone32:
	VZEROUPPER
	RET

// func collideSIMD32(t *block, n int)
//
// collideSIMD on float32 populations: loaded with a conversion to
// float64, stored rounded to float32 (round to nearest even, as Go's
// float32 conversion). rest, then axisPairs and diagonalPairs, from the moments in the block
// and the streamed populations at block_src into block_dst.
TEXT ·collideSIMD32(SB), NOSPLIT, $0-16
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_c15), Z30
	VBROADCASTSD K(consts_c3), Z29
	VBROADCASTSD K(consts_c45), Z28
	VBROADCASTSD K(consts_wp), Z27
	VBROADCASTSD K(consts_w0), Z26
	VBROADCASTSD K(consts_cpw0), Z25
	XORQ CX, CX

cloop32:
	CMPQ CX, DX
	JGE cdone32
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R9
	SUBQ CX, R9
	CMPQ R9, $8
	JLT cloop32_tail
	KXNORW K1, K1, K1
	JMP cloop32_go

cloop32_tail:
	KMOVW block_tail(DI), K1

cloop32_go:
	// rest: u = m/rho and the common terms.
	VMOVUPD block_drho(DI)(CX*8), Z0
	VMOVUPD block_inv(DI)(CX*8), Z1
	VADDPD Z0, Z31, Z2 // rho = 1 + drho
	VMULPD block_mz(DI)(CX*8), Z1, Z3 // u_z
	VMULPD block_mr(DI)(CX*8), Z1, Z4 // u_r
	VMULPD Z3, Z3, Z5
	VMULPD Z4, Z4, Z6
	VADDPD Z6, Z5, Z5 // u^2
	VMULPD Z30, Z2, Z6
	VMULPD Z5, Z6, Z6
	VSUBPD Z6, Z0, Z6 // base = drho - (3/2 rho) u^2
	VMOVUPD block_fz(DI)(CX*8), Z10
	VMOVUPD block_fr(DI)(CX*8), Z11
	VMULPD Z10, Z3, Z7
	VMULPD Z11, Z4, Z8
	VADDPD Z8, Z7, Z7
	VMULPD Z29, Z7, Z7
	VMOVUPD block_theta(DI)(CX*8), Z8
	VSUBPD Z7, Z8, Z7 // sbase = theta - 3 u.F
	VMULPD Z28, Z2, Z9 // 9/2 rho
	// f*_0 = (d0 - w+ (d0 - w0 base)) + (1 - w+/2) w0 sbase
	SRC(0, AX)
	DST(0, BX)
	VCVTPS2PD.Z (AX)(CX*4), K1, Z12
	VMULPD Z26, Z6, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z27, Z13, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z25, Z7, Z14
	VADDPD Z14, Z13, Z13
	VCVTPD2PS Z13, Y13
	VMOVUPS Y13, K1, (BX)(CX*4)
	// Pairs (1,3), e = (1,0), and (2,4), e = (0,1).
	VMULPD.BCST (block_axis+pairRates_w6)(DI), Z2, Z15
	SRC(1, AX)
	SRC(3, BX)
	DST(1, SI)
	DST(3, R8)
	PAIR32(block_axis, Z3, Z10, Z15, AX, BX, SI, R8)
	SRC(2, AX)
	SRC(4, BX)
	DST(2, SI)
	DST(4, R8)
	PAIR32(block_axis, Z4, Z11, Z15, AX, BX, SI, R8)
	// Pairs (5,7), e = (1,1), and (6,8), e = (-1,1).
	VMULPD.BCST (block_diag+pairRates_w6)(DI), Z2, Z15
	VADDPD Z4, Z3, Z12 // u_z + u_r
	VADDPD Z11, Z10, Z13 // F_z + F_r
	SRC(5, AX)
	SRC(7, BX)
	DST(5, SI)
	DST(7, R8)
	PAIR32(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	VSUBPD Z3, Z4, Z12 // u_r - u_z
	VSUBPD Z10, Z11, Z13 // F_r - F_z
	SRC(6, AX)
	SRC(8, BX)
	DST(6, SI)
	DST(8, R8)
	PAIR32(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	ADDQ $8, CX
	JMP cloop32

cdone32:
	VZEROUPPER
	RET

// func planarSIMD(t *block, n int)
//
// gatherSIMD without passes followed by collideSIMD, the moments kept in
// registers: the whole step of a planar lattice (no axisymmetric terms),
// F = G and theta = 0.
TEXT ·planarSIMD(SB), NOSPLIT, $0-16
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_c15), Z30
	VBROADCASTSD K(consts_c3), Z29
	VBROADCASTSD K(consts_c45), Z28
	VBROADCASTSD K(consts_wp), Z27
	VBROADCASTSD K(consts_w0), Z26
	VBROADCASTSD K(consts_cpw0), Z25
	VBROADCASTSD K(consts_gz), Z24
	VBROADCASTSD K(consts_gr), Z23
	XORQ CX, CX

ploop:
	CMPQ CX, DX
	JGE pdone
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R13
	SUBQ CX, R13
	CMPQ R13, $8
	JLT ploop_tail
	KXNORW K1, K1, K1
	JMP ploop_go

ploop_tail:
	KMOVW block_tail(DI), K1

ploop_go:
	SRC(0, AX)
	SRC(1, BX)
	SRC(2, SI)
	SRC(3, R8)
	SRC(4, R9)
	SRC(5, R10)
	SRC(6, R11)
	SRC(7, R12)
	SRC(8, R13)
	VMOVUPD.Z (BX)(CX*8), K1, Z12 // d1
	VMOVUPD.Z (R8)(CX*8), K1, Z13 // d3
	VMOVUPD.Z (SI)(CX*8), K1, Z14 // d2
	VMOVUPD.Z (R9)(CX*8), K1, Z15 // d4
	VMOVUPD.Z (R10)(CX*8), K1, Z16 // d5
	VMOVUPD.Z (R12)(CX*8), K1, Z17 // d7
	VMOVUPD.Z (R11)(CX*8), K1, Z18 // d6
	VMOVUPD.Z (R13)(CX*8), K1, Z19 // d8
	VADDPD Z15, Z14, Z20 // s24
	VADDPD Z17, Z16, Z21 // s57
	VADDPD Z19, Z18, Z3 // s68
	VSUBPD Z17, Z16, Z16 // m57
	VSUBPD Z19, Z18, Z18 // m68
	VADDPD Z3, Z21, Z17 // s5678
	VADDPD Z13, Z12, Z19 // d1 + d3
	VADDPD Z20, Z19, Z19 // + s24
	VMOVUPD.Z (AX)(CX*8), K1, Z4 // d0
	VADDPD Z4, Z19, Z19 // d0 + (...)
	VADDPD Z17, Z19, Z0 // drho0 = (...) + s5678
	VSUBPD Z13, Z12, Z12 // d1 - d3
	VSUBPD Z18, Z16, Z13 // m57 - m68
	VADDPD Z13, Z12, Z1 // j_z
	VSUBPD Z15, Z14, Z14 // d2 - d4
	VADDPD Z18, Z16, Z15 // m57 + m68
	VADDPD Z15, Z14, Z2 // j_r
	// First guess: rho = 1 + drho0, m = j + G/2, F = G, theta = 0.
	VADDPD Z0, Z31, Z9
	VDIVPD Z9, Z31, Z9
	VADDPD.BCST K(consts_hgz), Z1, Z5
	VADDPD.BCST K(consts_hgr), Z2, Z6
	// rest: u = m/rho and the common terms.
	VMOVAPD Z9, Z1
	VADDPD Z0, Z31, Z2 // rho = 1 + drho
	VMULPD Z5, Z1, Z3 // u_z
	VMULPD Z6, Z1, Z4 // u_r
	VMULPD Z3, Z3, Z5
	VMULPD Z4, Z4, Z6
	VADDPD Z6, Z5, Z5 // u^2
	VMULPD Z30, Z2, Z6
	VMULPD Z5, Z6, Z6
	VSUBPD Z6, Z0, Z6 // base = drho - (3/2 rho) u^2
	VMOVAPD Z24, Z10
	VMOVAPD Z23, Z11
	VMULPD Z10, Z3, Z7
	VMULPD Z11, Z4, Z8
	VADDPD Z8, Z7, Z7
	VMULPD Z29, Z7, Z7
	VPXORQ Z8, Z8, Z8
	VSUBPD Z7, Z8, Z7 // sbase = theta - 3 u.F
	VMULPD Z28, Z2, Z9 // 9/2 rho
	// f*_0 = (d0 - w+ (d0 - w0 base)) + (1 - w+/2) w0 sbase
	SRC(0, AX)
	DST(0, BX)
	VMOVUPD.Z (AX)(CX*8), K1, Z12
	VMULPD Z26, Z6, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z27, Z13, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z25, Z7, Z14
	VADDPD Z14, Z13, Z13
	VMOVUPD Z13, K1, (BX)(CX*8)
	// Pairs (1,3), e = (1,0), and (2,4), e = (0,1).
	VMULPD.BCST (block_axis+pairRates_w6)(DI), Z2, Z15
	SRC(1, AX)
	SRC(3, BX)
	DST(1, SI)
	DST(3, R8)
	PAIR(block_axis, Z3, Z10, Z15, AX, BX, SI, R8)
	SRC(2, AX)
	SRC(4, BX)
	DST(2, SI)
	DST(4, R8)
	PAIR(block_axis, Z4, Z11, Z15, AX, BX, SI, R8)
	// Pairs (5,7), e = (1,1), and (6,8), e = (-1,1).
	VMULPD.BCST (block_diag+pairRates_w6)(DI), Z2, Z15
	VADDPD Z4, Z3, Z12 // u_z + u_r
	VADDPD Z11, Z10, Z13 // F_z + F_r
	SRC(5, AX)
	SRC(7, BX)
	DST(5, SI)
	DST(7, R8)
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	VSUBPD Z3, Z4, Z12 // u_r - u_z
	VSUBPD Z10, Z11, Z13 // F_r - F_z
	SRC(6, AX)
	SRC(8, BX)
	DST(6, SI)
	DST(8, R8)
	PAIR(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	ADDQ $8, CX
	JMP ploop

pdone:
	VZEROUPPER
	RET

// func planarSIMD32(t *block, n int)
//
// planarSIMD on float32 populations. gatherSIMD without passes followed by collideSIMD, the moments kept in
// registers: the whole step of a planar lattice (no axisymmetric terms),
// F = G and theta = 0.
TEXT ·planarSIMD32(SB), NOSPLIT, $0-16
	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	VBROADCASTSD K(consts_one), Z31
	VBROADCASTSD K(consts_c15), Z30
	VBROADCASTSD K(consts_c3), Z29
	VBROADCASTSD K(consts_c45), Z28
	VBROADCASTSD K(consts_wp), Z27
	VBROADCASTSD K(consts_w0), Z26
	VBROADCASTSD K(consts_cpw0), Z25
	VBROADCASTSD K(consts_gz), Z24
	VBROADCASTSD K(consts_gr), Z23
	XORQ CX, CX

ploop32:
	CMPQ CX, DX
	JGE pdone32
	// K1: all eight lanes, or the block's last nodes (block_tail)
	MOVQ DX, R13
	SUBQ CX, R13
	CMPQ R13, $8
	JLT ploop32_tail
	KXNORW K1, K1, K1
	JMP ploop32_go

ploop32_tail:
	KMOVW block_tail(DI), K1

ploop32_go:
	SRC(0, AX)
	SRC(1, BX)
	SRC(2, SI)
	SRC(3, R8)
	SRC(4, R9)
	SRC(5, R10)
	SRC(6, R11)
	SRC(7, R12)
	SRC(8, R13)
	VCVTPS2PD.Z (BX)(CX*4), K1, Z12 // d1
	VCVTPS2PD.Z (R8)(CX*4), K1, Z13 // d3
	VCVTPS2PD.Z (SI)(CX*4), K1, Z14 // d2
	VCVTPS2PD.Z (R9)(CX*4), K1, Z15 // d4
	VCVTPS2PD.Z (R10)(CX*4), K1, Z16 // d5
	VCVTPS2PD.Z (R12)(CX*4), K1, Z17 // d7
	VCVTPS2PD.Z (R11)(CX*4), K1, Z18 // d6
	VCVTPS2PD.Z (R13)(CX*4), K1, Z19 // d8
	VADDPD Z15, Z14, Z20 // s24
	VADDPD Z17, Z16, Z21 // s57
	VADDPD Z19, Z18, Z3 // s68
	VSUBPD Z17, Z16, Z16 // m57
	VSUBPD Z19, Z18, Z18 // m68
	VADDPD Z3, Z21, Z17 // s5678
	VADDPD Z13, Z12, Z19 // d1 + d3
	VADDPD Z20, Z19, Z19 // + s24
	VCVTPS2PD.Z (AX)(CX*4), K1, Z4 // d0
	VADDPD Z4, Z19, Z19 // d0 + (...)
	VADDPD Z17, Z19, Z0 // drho0 = (...) + s5678
	VSUBPD Z13, Z12, Z12 // d1 - d3
	VSUBPD Z18, Z16, Z13 // m57 - m68
	VADDPD Z13, Z12, Z1 // j_z
	VSUBPD Z15, Z14, Z14 // d2 - d4
	VADDPD Z18, Z16, Z15 // m57 + m68
	VADDPD Z15, Z14, Z2 // j_r
	// First guess: rho = 1 + drho0, m = j + G/2, F = G, theta = 0.
	VADDPD Z0, Z31, Z9
	VDIVPD Z9, Z31, Z9
	VADDPD.BCST K(consts_hgz), Z1, Z5
	VADDPD.BCST K(consts_hgr), Z2, Z6
	// rest: u = m/rho and the common terms.
	VMOVAPD Z9, Z1
	VADDPD Z0, Z31, Z2 // rho = 1 + drho
	VMULPD Z5, Z1, Z3 // u_z
	VMULPD Z6, Z1, Z4 // u_r
	VMULPD Z3, Z3, Z5
	VMULPD Z4, Z4, Z6
	VADDPD Z6, Z5, Z5 // u^2
	VMULPD Z30, Z2, Z6
	VMULPD Z5, Z6, Z6
	VSUBPD Z6, Z0, Z6 // base = drho - (3/2 rho) u^2
	VMOVAPD Z24, Z10
	VMOVAPD Z23, Z11
	VMULPD Z10, Z3, Z7
	VMULPD Z11, Z4, Z8
	VADDPD Z8, Z7, Z7
	VMULPD Z29, Z7, Z7
	VPXORQ Z8, Z8, Z8
	VSUBPD Z7, Z8, Z7 // sbase = theta - 3 u.F
	VMULPD Z28, Z2, Z9 // 9/2 rho
	// f*_0 = (d0 - w+ (d0 - w0 base)) + (1 - w+/2) w0 sbase
	SRC(0, AX)
	DST(0, BX)
	VCVTPS2PD.Z (AX)(CX*4), K1, Z12
	VMULPD Z26, Z6, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z27, Z13, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z25, Z7, Z14
	VADDPD Z14, Z13, Z13
	VCVTPD2PS Z13, Y13
	VMOVUPS Y13, K1, (BX)(CX*4)
	// Pairs (1,3), e = (1,0), and (2,4), e = (0,1).
	VMULPD.BCST (block_axis+pairRates_w6)(DI), Z2, Z15
	SRC(1, AX)
	SRC(3, BX)
	DST(1, SI)
	DST(3, R8)
	PAIR32(block_axis, Z3, Z10, Z15, AX, BX, SI, R8)
	SRC(2, AX)
	SRC(4, BX)
	DST(2, SI)
	DST(4, R8)
	PAIR32(block_axis, Z4, Z11, Z15, AX, BX, SI, R8)
	// Pairs (5,7), e = (1,1), and (6,8), e = (-1,1).
	VMULPD.BCST (block_diag+pairRates_w6)(DI), Z2, Z15
	VADDPD Z4, Z3, Z12 // u_z + u_r
	VADDPD Z11, Z10, Z13 // F_z + F_r
	SRC(5, AX)
	SRC(7, BX)
	DST(5, SI)
	DST(7, R8)
	PAIR32(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	VSUBPD Z3, Z4, Z12 // u_r - u_z
	VSUBPD Z10, Z11, Z13 // F_r - F_z
	SRC(6, AX)
	SRC(8, BX)
	DST(6, SI)
	DST(8, R8)
	PAIR32(block_diag, Z12, Z13, Z15, AX, BX, SI, R8)
	ADDQ $8, CX
	JMP ploop32

pdone32:
	VZEROUPPER
	RET
