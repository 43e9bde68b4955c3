package lbm

// moments are the macroscopic quantities of one node at the collision time:
// the half-step shifted density and velocity, the mass source and the total
// force density (external plus axisymmetric).
type moments struct {
	drho   float64 // rho - 1, with rho = sum f + theta/2
	rho    float64
	uz, ur float64
	fz, fr float64 // force density entering the Guo source
	theta  float64 // axisymmetric mass source -rho u_r / r
}

// macro computes the moments of the post-streaming deviations d for a row
// with constants rc, an external force density (gz, gr), the even rate wp
// and nIter fixed-point passes.
//
// Axisymmetric scheme (METHODS.md 3.4, Step A). The pseudo-Cartesian source
// terms are those of Zhou 2008 (Phys. Rev. E 78, 036701):
//
//	theta = -rho u_r / r
//	F_z = G_z + theta u_z + sigma'_zr / r
//	F_r = G_r + theta u_r + sigma'_rr / r - 2 rho nu u_r / r^2
//
// with the viscous stress sigma' taken from the local non-equilibrium second
// moment instead of finite differences,
//
//	sigma'_ab = -(1 - w+/2) [Pi_ab - rho cs2 d_ab - rho u_a u_b
//	            + (F_a u_b + u_a F_b)/2 + cs2 theta d_ab / 2],
//
// the force-corrected non-equilibrium stress of Krueger et al. 2017 (The
// Lattice Boltzmann Method, Springer, ch. 6) extended by the mass-source
// term; the hoop term -2 rho nu u_r/r^2 is implicit in u_r (eq. 3.5 of
// METHODS.md) so that it stays stable at r = 1/2. For a planar lattice
// rc.invR = rc.nuInvR2 = 0 and this reduces to Guo forcing: rho = sum f,
// u = (j + G/2)/rho.
func macro(d *[Q]float64, rc *rowConst, gz, gr, wp float64, nIter int) moments {
	drho0 := d[0] + d[1] + d[2] + d[3] + d[4] + d[5] + d[6] + d[7] + d[8]
	jz := d[1] - d[3] + d[5] - d[6] - d[7] + d[8]
	jr := d[2] - d[4] + d[5] + d[6] - d[7] - d[8]
	rho0 := 1 + drho0
	m := moments{drho: drho0, rho: rho0, fz: gz, fr: gr}
	m.uz = (jz + 0.5*gz) / rho0
	m.ur = (jr + 0.5*gr) / rho0
	if rc.invR == 0 {
		return m
	}
	pzr := d[5] - d[6] + d[7] - d[8]
	prr := d[2] + d[4] + d[5] + d[6] + d[7] + d[8] // sum e_r^2 d_i = Pi_rr - 1/3
	c1 := 1 - 0.5*wp
	for it := 0; it < nIter; it++ {
		theta := -m.rho * m.ur * rc.invR
		szr := -c1 * (pzr - m.rho*m.uz*m.ur + 0.5*(m.fz*m.ur+m.uz*m.fr))
		srr := -c1 * (prr - m.drho*Cs2 - m.rho*m.ur*m.ur + m.fr*m.ur + 0.5*Cs2*theta)
		fz := gz + theta*m.uz + szr*rc.invR
		frE := gr + theta*m.ur + srr*rc.invR
		m.theta = theta
		m.drho = drho0 + 0.5*theta
		m.rho = 1 + m.drho
		m.uz = (jz + 0.5*fz) / m.rho
		m.ur = (jr + 0.5*frE) / (m.rho * (1 + rc.nuInvR2))
		m.fz = fz
		m.fr = frE - 2*m.rho*rc.nuInvR2*m.ur
	}
	return m
}
