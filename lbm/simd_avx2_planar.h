// The body of planarAVX2 and planarAVX2_32 (simd_avx2_amd64.s): the planar step. Populations are
// loaded with LD and stored with ST, which simd_avx2_amd64.s defines for
// float64 and then for float32 before including this file again.

	MOVQ t+0(FP), DI
	MOVQ n+8(FP), DX
	XORQ CX, CX

ploop:
	CMPQ CX, DX
	JGE pdone
	MOMENTS
	// rest and the pairs, with F = G and theta = 0
	VMOVAPD Y9, Y1
	VMOVUPD C(consts_gz), Y10
	VMOVUPD C(consts_gr), Y11
	VXORPD Y12, Y12, Y12
	COLLIDE
	ADDQ $4, CX
	JMP ploop

pdone:
	VZEROUPPER
	RET
