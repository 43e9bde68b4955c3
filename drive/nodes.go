package drive

import "axiswim/geometry"

// BodyVelocity returns, for every node of View, the axial velocity
// (lattice units) of the body that covers it, 0 for fluid nodes, in v
// (allocated unless it has the size of View).
func (s *Simulation) BodyVelocity(v []float64, solid []bool) []float64 {
	l := s.View()
	if len(v) != l.Nz*l.Nr {
		v = make([]float64, l.Nz*l.Nr)
	} else {
		clear(v)
	}
	if s.sw == nil {
		return v
	}
	d := s.sw.dyn
	dom := s.viewDomain()
	for k := range s.sw.bodies.List {
		vk := 0.5 * (d.V[k] + d.VPrev[k])
		s.sw.nodes = dom.AppendNodes(s.sw.nodes[:0], s.viewSphere(k))
		for _, n := range s.sw.nodes {
			if i := n.J*l.Nz + n.K; solid[i] {
				v[i] = vk
			}
		}
	}
	return v
}

// SolidMask reports the nodes of View inside a body now, in m (allocated
// unless it has the size of View): the lattice's solid nodes on one level;
// on refined levels the image's nodes inside a sphere (geometry.Domain's
// rule, as the finest level's solid nodes are found).
func (s *Simulation) SolidMask(m []bool) []bool {
	l := s.View()
	if len(m) != l.Nz*l.Nr {
		m = make([]bool, l.Nz*l.Nr)
	}
	if s.lv != nil {
		clear(m)
		if s.sw == nil {
			return m
		}
		dom := s.viewDomain()
		for k := range s.sw.bodies.List {
			s.sw.nodes = dom.AppendNodes(s.sw.nodes[:0], s.viewSphere(k))
			for _, n := range s.sw.nodes {
				m[n.J*l.Nz+n.K] = true
			}
		}
		return m
	}
	for j := 0; j < l.Nr; j++ {
		for k := 0; k < l.Nz; k++ {
			m[j*l.Nz+k] = s.Fluid.Solid(k, j)
		}
	}
	return m
}

// viewDomain is the domain of View's nodes: the bodies' own on one level.
func (s *Simulation) viewDomain() geometry.Domain {
	if s.lv == nil {
		return s.sw.bodies.Domain
	}
	v := s.View()
	return geometry.Domain{Nz: v.Nz, Nr: v.Nr, Periodic: s.FrameOnLiquid}
}

// viewSphere is sphere k in View's cells: its shape on one level.
func (s *Simulation) viewSphere(k int) geometry.Sphere {
	if s.lv == nil {
		return s.sw.bodies.List[k].Shape
	}
	c := float64(s.ViewCells())
	return geometry.Sphere{Z: s.sw.dyn.Z[k] / c, Radius: s.sw.dyn.Radius[k] / c}
}
