package drive

// BodyVelocity returns, for every node, the axial velocity (lattice units)
// of the body that covers it, 0 for fluid nodes, in v (allocated unless it
// has the size of the lattice).
func (s *Simulation) BodyVelocity(v []float64, solid []bool) []float64 {
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

// SolidMask reports the nodes inside a body now, in m (allocated unless
// it has the size of the lattice).
func (s *Simulation) SolidMask(m []bool) []bool {
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
