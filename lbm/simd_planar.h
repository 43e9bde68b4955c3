// The body of planarSIMD and planarSIMD32 (simd_amd64.s): the planar step. Populations are
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
	LD(BX, Z12) // d1
	LD(R8, Z13) // d3
	LD(SI, Z14) // d2
	LD(R9, Z15) // d4
	LD(R10, Z16) // d5
	LD(R12, Z17) // d7
	LD(R11, Z18) // d6
	LD(R13, Z19) // d8
	VADDPD Z15, Z14, Z20 // s24
	VADDPD Z17, Z16, Z21 // s57
	VADDPD Z19, Z18, Z3 // s68
	VSUBPD Z17, Z16, Z16 // m57
	VSUBPD Z19, Z18, Z18 // m68
	VADDPD Z3, Z21, Z17 // s5678
	VADDPD Z13, Z12, Z19 // d1 + d3
	VADDPD Z20, Z19, Z19 // + s24
	LD(AX, Z4) // d0
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
	JMP ploop

pdone:
	VZEROUPPER
	RET
