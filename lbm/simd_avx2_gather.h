// The body of gatherAVX2 and gatherAVX2_32 (simd_avx2_amd64.s): gather followed by the passes. Populations are
// loaded with LD and stored with ST, which simd_avx2_amd64.s defines for
// float64 and then for float32 before including this file again.

	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	XORQ CX, CX

gloop:
	CMPQ CX, DX
	JGE gdone
	MOMENTS
	MOVQ passes+16(FP), R13
	TESTQ R13, R13
	JZ ginit
	// The parts that do not change from pass to pass.
	VSUBPD Y3, Y11, Y12 // s57 - s68
	VMULPD C(consts_k3), Y12, Y12
	VMOVUPD C(consts_gz), Y3
	VSUBPD Y12, Y3, Y3 // G_z = g_z - c R Pi_zr
	VADDPD Y8, Y10, Y12 // s24 + s5678
	VMULPD C(consts_third), Y0, Y13
	VSUBPD Y13, Y12, Y12
	VMULPD C(consts_k3), Y12, Y12
	VMOVUPD C(consts_gr), Y4
	VSUBPD Y12, Y4, Y4 // G_r

ginit:
	// The first guess: drho = drho0, F = G, theta = 0 (m and 1/rho from
	// MOMENTS).
	VMOVAPD Y0, Y11
	VMOVUPD C(consts_gz), Y7
	VMOVUPD C(consts_gr), Y8
	VXORPD Y10, Y10, Y10
	TESTQ R13, R13
	JZ gstore

gpass:
	PASS
	DECQ R13
	JNZ gpass

gstore:
	VMOVUPD Y11, block_drho(DI)(CX*8)
	VMOVUPD Y9, block_inv(DI)(CX*8)
	VMOVUPD Y5, block_mz(DI)(CX*8)
	VMOVUPD Y6, block_mr(DI)(CX*8)
	VMOVUPD Y7, block_fz(DI)(CX*8)
	VMOVUPD Y8, block_fr(DI)(CX*8)
	VMOVUPD Y10, block_theta(DI)(CX*8)
	ADDQ $4, CX
	JMP gloop

gdone:
	VZEROUPPER
	RET
