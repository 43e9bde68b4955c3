// Package lbm is the fluid core of axiswim: a D2Q9 lattice-Boltzmann solver
// for incompressible axisymmetric flow without swirl on the meridian
// half-plane (z, r), r >= 0.
//
// The lattice "x" direction is the axis z and the lattice "y" direction is
// the radius r. Nodes sit at z = (k + 1/2) and r = (j + 1/2) in lattice units
// (k = 0..Nz-1, j = 0..Nr-1), so no node lies on the axis; the axis is a
// mirror line halfway between row 0 and a ghost row. The container's side
// wall lies halfway between row Nr-1 and a ghost row (r = Nr), its ends
// halfway beyond columns 0 and Nz-1, with halfway bounce-back; the ends may be
// periodic instead.
//
// Populations are float64 deviations f_i - w_i from the rest state (rho0 = 1),
// stored as nine planes (structure of arrays) with a one-node halo. One step
// is a fused pull stream-and-collide from lattice A into lattice B, run by a
// persistent pool of goroutines on slabs of rows; every node's arithmetic is
// independent of the slab it falls in and reductions are summed row by row in
// a fixed order, so results are bit-for-bit the same for any number of
// goroutines.
//
// Collision is TRT by default (Ginzburg, Verhaeghe & d'Humieres 2008, Commun.
// Comput. Phys. 3, 427) with the magic parameter Lambda = 3/16, MRT
// (Lallemand & Luo 2000, Phys. Rev. E 61, 6546) as an option, and BGK for
// tests. The axisymmetric terms are those of Zhou 2008 (Phys. Rev. E 78,
// 036701), a mass source and a force density, but with the viscous terms
// taken from the local non-equilibrium stress instead of finite differences,
// so the scheme needs no velocity gradients and no neighbour data (the
// property Zhou 2011, Phys. Rev. E 84, 036704, and Guo, Han, Shi & Zheng
// 2009, Phys. Rev. E 79, 046708, also have); the stiff hoop term is treated
// implicitly. Body forces enter by Guo, Zheng & Shi 2002 (Phys. Rev. E 65,
// 046308) with half-step shifted moments.
//
// The package knows nothing of spheres: moving curved boundaries are handed
// to it as boundary links (see Links).
package lbm
