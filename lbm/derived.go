package lbm

// Vorticity returns the azimuthal vorticity omega = du_r/dz - du_z/dr of f
// by central differences (lattice units), with the axis mirror (u_z even,
// u_r odd in r) and no-slip walls halfway beyond the last nodes (a wall
// ghost value is minus the node value). Periodic ends wrap.
func Vorticity(f *Fields, periodic bool) []float64 {
	nz, nr := f.Nz, f.Nr
	om := make([]float64, nz*nr)
	uz := func(k, j int) float64 {
		switch {
		case j < 0:
			return f.Uz[f.At(k, -1-j)]
		case j >= nr:
			return -f.Uz[f.At(k, 2*nr-1-j)]
		}
		return f.Uz[f.At(k, j)]
	}
	ur := func(k, j int) float64 {
		switch {
		case k < 0 && periodic:
			k += nz
		case k >= nz && periodic:
			k -= nz
		case k < 0:
			return -f.Ur[f.At(-1-k, j)]
		case k >= nz:
			return -f.Ur[f.At(2*nz-1-k, j)]
		}
		return f.Ur[f.At(k, j)]
	}
	for j := 0; j < nr; j++ {
		for k := 0; k < nz; k++ {
			om[f.At(k, j)] = 0.5*(ur(k+1, j)-ur(k-1, j)) - 0.5*(uz(k, j+1)-uz(k, j-1))
		}
	}
	return om
}

// Streamfunction returns the Stokes streamfunction psi of f (lattice
// units), u_z = (1/r) dpsi/dr, u_r = -(1/r) dpsi/dz, integrated outward from
// psi = 0 on the axis by the trapezoidal rule in r: psi(r_0) = u_z r_0^2/2,
// psi(r_j) = psi(r_{j-1}) + (u_z r |_{j-1} + u_z r |_j)/2.
func Streamfunction(f *Fields) []float64 {
	nz, nr := f.Nz, f.Nr
	psi := make([]float64, nz*nr)
	for k := 0; k < nz; k++ {
		p := f.Uz[f.At(k, 0)] * 0.125 // r0 = 1/2
		psi[f.At(k, 0)] = p
		for j := 1; j < nr; j++ {
			r0, r1 := float64(j)-0.5, float64(j)+0.5
			p += 0.5 * (f.Uz[f.At(k, j-1)]*r0 + f.Uz[f.At(k, j)]*r1)
			psi[f.At(k, j)] = p
		}
	}
	return psi
}
