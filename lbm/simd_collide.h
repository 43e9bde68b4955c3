// The body of collideSIMD and collideSIMD32 (simd_amd64.s): the collision. Populations are
// loaded with LD and stored with ST, which simd_amd64.s defines for
// float64 and then for float32 before including this file again.

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
	LD(AX, Z12)
	VMULPD Z26, Z6, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z27, Z13, Z13
	VSUBPD Z13, Z12, Z13
	VMULPD Z25, Z7, Z14
	VADDPD Z14, Z13, Z13
	ST(Z13, Y13, BX)
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
