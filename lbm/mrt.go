package lbm

// The MRT moment basis of Lallemand & Luo 2000 (Phys. Rev. E 61, 6546) for
// our velocity ordering: rho, e, eps, j_z, q_z, j_r, q_r, p_zz, p_zr. The
// rows are orthogonal with squared norms mrtNorm, so M^-1 = M^T diag(1/norm).
var mrtM = [Q][Q]float64{
	{1, 1, 1, 1, 1, 1, 1, 1, 1},
	{-4, -1, -1, -1, -1, 2, 2, 2, 2},
	{4, -2, -2, -2, -2, 1, 1, 1, 1},
	{0, 1, 0, -1, 0, 1, -1, -1, 1},
	{0, -2, 0, 2, 0, 1, -1, -1, 1},
	{0, 0, 1, 0, -1, 1, 1, -1, -1},
	{0, 0, -2, 0, 2, 1, 1, -1, -1},
	{0, 1, -1, 1, -1, 0, 0, 0, 0},
	{0, 0, 0, 0, 0, 1, -1, 1, -1},
}

var mrtNorm = [Q]float64{9, 36, 36, 6, 12, 6, 12, 4, 4}

// mrtRates are the diagonal relaxation rates in moment space.
type mrtRates struct {
	s [Q]float64
}

// newMRTRates chooses the rates: s_nu = 1/tau for the stresses; s_e = s_nu,
// so the bulk viscosity equals the shear viscosity, which the axisymmetric
// source terms assume (METHODS.md 2.3, axisymmetric caveat); s_q from the
// magic parameter, s_q = 1/(1/2 + Lambda/(tau - 1/2)), which gives the same
// viscosity-independent bounce-back walls as TRT (Pan, Luo & Miller 2006,
// Comput. Fluids 35, 898); s_eps from the configuration. The conserved
// moments get rate 0: their change is the source alone.
func newMRTRates(c Config) *mrtRates {
	snu, sq := c.rates()
	seps := c.EpsilonRate
	if seps == 0 {
		seps = 1.2
	}
	return &mrtRates{s: [Q]float64{0, snu, seps, 0, sq, 0, sq, snu, snu}}
}

// collideMRT relaxes d in moment space with the same equilibrium and source
// as collideTRT: m* = m - S(m - m_eq) + (I - S/2) M s.
func collideMRT(d *[Q]float64, m *moments, r *mrtRates) {
	var feq, src [Q]float64
	usq := m.uz*m.uz + m.ur*m.ur
	uf := m.uz*m.fz + m.ur*m.fr
	for i := 0; i < Q; i++ {
		ez, er := float64(Ez[i]), float64(Er[i])
		eu := ez*m.uz + er*m.ur
		ef := ez*m.fz + er*m.fr
		feq[i] = W[i] * (m.drho + m.rho*(3*eu+4.5*eu*eu-1.5*usq))
		src[i] = W[i] * (m.theta + 3*(ef-uf) + 9*eu*ef)
	}
	var mm [Q]float64
	for k := 0; k < Q; k++ {
		var a, b, c float64
		row := &mrtM[k]
		for i := 0; i < Q; i++ {
			a += row[i] * d[i]
			b += row[i] * feq[i]
			c += row[i] * src[i]
		}
		s := r.s[k]
		mm[k] = (a - s*(a-b) + (1-0.5*s)*c) / mrtNorm[k]
	}
	for i := 0; i < Q; i++ {
		var v float64
		for k := 0; k < Q; k++ {
			v += mrtM[k][i] * mm[k]
		}
		d[i] = v
	}
}
