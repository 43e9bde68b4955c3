// The body of gatherSIMD and gatherSIMD32 (simd_amd64.s): gather followed by the passes. Populations are
// loaded with LD and stored with ST, which simd_amd64.s defines for
// float64 and then for float32 before including this file again.

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
	MOMENTS
	VMOVAPD Z0, Z11
	VBROADCASTSD K(consts_gz), Z7
	VBROADCASTSD K(consts_gr), Z8
	VPXORQ Z10, Z10, Z10
	MOVQ passes+16(FP), R13
	TESTQ R13, R13
	JZ gstore
	// The parts that do not change from pass to pass.
	VSUBPD Z3, Z21, Z12 // s57 - s68
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
