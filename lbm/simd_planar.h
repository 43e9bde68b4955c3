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
	MOMENTS
	// rest and the pairs, with F = G and theta = 0
	VMOVAPD Z9, Z1
	VMOVAPD Z24, Z10
	VMOVAPD Z23, Z11
	VPXORQ Z12, Z12, Z12
	COLLIDE
	ADDQ $8, CX
	JMP ploop

pdone:
	VZEROUPPER
	RET
