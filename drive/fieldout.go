package drive

import (
	"axiswim/lbm"
	"axiswim/output"
)

// vtkGrid is the node grid of the lattice in the container frame, metres.
func (s *Simulation) vtkGrid() output.Grid {
	l := s.Lattice
	return output.Grid{Nz: l.Nz, Nr: l.Nr, Z0: -0.5*l.Length + 0.5*l.Dx, R0: 0.5 * l.Dx, Spacing: l.Dx}
}

// bodyVelocity returns, for every node, the axial velocity (lattice units)
// of the body that covers it, 0 for fluid nodes, in v (allocated unless it
// has the size of the lattice).
func (s *Simulation) bodyVelocity(v []float64, solid []bool) []float64 {
	l := s.Lattice
	if len(v) != l.Nz*l.Nr {
		v = make([]float64, l.Nz*l.Nr)
	} else {
		clear(v)
	}
	if s.sw == nil {
		return v
	}
	d := s.sw.dyn
	dom := s.sw.bodies.Domain
	for k, b := range s.sw.bodies.List {
		vk := 0.5 * (d.V[k] + d.VPrev[k])
		s.sw.nodes = dom.AppendNodes(s.sw.nodes[:0], b.Shape)
		for _, n := range s.sw.nodes {
			if i := n.J*l.Nz + n.K; solid[i] {
				v[i] = vk
			}
		}
	}
	return v
}

// solidMask reports the nodes inside a body now, in m (allocated unless
// it has the size of the lattice).
func (s *Simulation) solidMask(m []bool) []bool {
	l := s.Lattice
	if len(m) != l.Nz*l.Nr {
		m = make([]bool, l.Nz*l.Nr)
	}
	for j := 0; j < l.Nr; j++ {
		for k := 0; k < l.Nz; k++ {
			m[j*l.Nz+k] = s.Fluid.Solid(k, j)
		}
	}
	return m
}

// vtkFields converts lattice fields (with the nodes of solid marked) to
// the SI fields of a VTK file: velocity (u_z, u_r, 0) in m/s, pressure
// relative to the rest state in Pa (in a closed container the modified
// pressure, without the hydrostatic and frame parts), azimuthal vorticity
// in 1/s, Stokes streamfunction in m^3/s, and the solid mask (1 inside a
// body, whose velocity there is the body's).
func (s *Simulation) vtkFields(f *lbm.Fields, solid []bool) []output.Field {
	l := s.Lattice
	n := f.Nz * f.Nr
	clean := &lbm.Fields{Nz: f.Nz, Nr: f.Nr, Uz: make([]float64, n), Ur: make([]float64, n), Rho: make([]float64, n)}
	body := s.bodyVelocity(nil, solid)
	for i := 0; i < n; i++ {
		if solid[i] {
			clean.Uz[i], clean.Rho[i] = body[i], 1 // rigid motion inside a body
			continue
		}
		clean.Uz[i], clean.Ur[i], clean.Rho[i] = f.Uz[i], f.Ur[i], f.Rho[i]
	}
	vel := make([]float64, 3*n)
	p := make([]float64, n)
	mask := make([]float64, n)
	c := l.Dx / l.Dt
	for i := 0; i < n; i++ {
		vel[3*i], vel[3*i+1] = clean.Uz[i]*c, clean.Ur[i]*c
		p[i] = l.PressureSI(clean.Rho[i])
		if solid[i] {
			mask[i] = 1
		}
	}
	om := lbm.Vorticity(clean, s.FrameOnLiquid)
	psi := lbm.Streamfunction(clean)
	for i := range om {
		om[i] /= l.Dt
		psi[i] *= l.Dx * l.Dx * l.Dx / l.Dt
	}
	return []output.Field{
		{Name: "velocity", Components: 3, Data: vel, RParity: -1},
		{Name: "pressure", Components: 1, Data: p, RParity: 1},
		{Name: "vorticity", Components: 1, Data: om, RParity: -1},
		{Name: "streamfunction", Components: 1, Data: psi, RParity: 1},
		{Name: "solid", Components: 1, Data: mask, RParity: 1},
	}
}
