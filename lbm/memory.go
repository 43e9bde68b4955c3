package lbm

// nodeExtras is the memory per node beside the populations, an estimate:
// about ten float64 values (the solid flag, the density and velocity of
// Fields, and the node arrays the bodies, the field averages and the
// outputs keep).
const nodeExtras = 10 * 8

// BytesPerNode is the memory a lattice node takes: the two lattices of Q
// populations, float64 or with single float32 (Config.Single), and
// nodeExtras.
func BytesPerNode(single bool) int {
	pop := 8
	if single {
		pop = 4
	}
	return 2*Q*pop + nodeExtras
}
