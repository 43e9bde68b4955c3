// The body of collideAVX2 and collideAVX2_32 (simd_avx2_amd64.s): the collision. Populations are
// loaded with LD and stored with ST, which simd_avx2_amd64.s defines for
// float64 and then for float32 before including this file again.

	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	XORQ CX, CX

cloop:
	CMPQ CX, DX
	JGE cdone
	// rest: u = m/rho and the common terms.
	VMOVUPD block_drho(DI)(CX*8), Y0
	VMOVUPD block_inv(DI)(CX*8), Y1
	VMOVUPD block_mz(DI)(CX*8), Y5
	VMOVUPD block_mr(DI)(CX*8), Y6
	VMOVUPD block_fz(DI)(CX*8), Y10
	VMOVUPD block_fr(DI)(CX*8), Y11
	VMOVUPD block_theta(DI)(CX*8), Y12
	COLLIDE
	ADDQ $4, CX
	JMP cloop

cdone:
	VZEROUPPER
	RET
