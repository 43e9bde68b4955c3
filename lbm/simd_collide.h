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
	VMOVUPD block_mz(DI)(CX*8), Z5
	VMOVUPD block_mr(DI)(CX*8), Z6
	VMOVUPD block_fz(DI)(CX*8), Z10
	VMOVUPD block_fr(DI)(CX*8), Z11
	VMOVUPD block_theta(DI)(CX*8), Z12
	COLLIDE
	ADDQ $8, CX
	JMP cloop

cdone:
	VZEROUPPER
	RET
