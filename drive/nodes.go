package drive

import "axiswim/geometry"

// BodyVelocity returns, for every node of View, the axial velocity
// (lattice units) of the body that covers it, 0 for fluid nodes, in v
// (allocated unless it has the size of View).
func (s *Simulation) BodyVelocity(v []float64, solid []bool) []float64 {
	return s.bodyVelocityOn(v, solid, s.viewDomain(), s.viewSphere)
}

// SolidMask reports the nodes of View inside a body now, in m (allocated
// unless it has the size of View): the lattice's solid nodes on one level;
// on refined levels the image's nodes inside a sphere (geometry.Domain's
// rule, as the finest level's solid nodes are found).
func (s *Simulation) SolidMask(m []bool) []bool {
	if s.lv != nil {
		return s.solidOn(m, s.viewDomain(), s.viewSphere)
	}
	l := s.View()
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

// solidOn reports the nodes of dom inside a sphere now, sphere(k) being
// body k in dom's cells, in m (allocated unless it has dom's size).
func (s *Simulation) solidOn(m []bool, dom geometry.Domain, sphere func(int) geometry.Sphere) []bool {
	if len(m) != dom.Nz*dom.Nr {
		m = make([]bool, dom.Nz*dom.Nr)
	} else {
		clear(m)
	}
	if s.sw == nil {
		return m
	}
	for k := range s.sw.bodies.List {
		s.sw.nodes = dom.AppendNodes(s.sw.nodes[:0], sphere(k))
		for _, n := range s.sw.nodes {
			m[n.J*dom.Nz+n.K] = true
		}
	}
	return m
}

// bodyVelocityOn is BodyVelocity on the nodes of dom, sphere(k) being body
// k in dom's cells and solid the nodes inside one.
func (s *Simulation) bodyVelocityOn(v []float64, solid []bool, dom geometry.Domain, sphere func(int) geometry.Sphere) []float64 {
	if len(v) != dom.Nz*dom.Nr {
		v = make([]float64, dom.Nz*dom.Nr)
	} else {
		clear(v)
	}
	if s.sw == nil {
		return v
	}
	d := s.sw.dyn
	for k := range s.sw.bodies.List {
		vk := 0.5 * (d.V[k] + d.VPrev[k])
		s.sw.nodes = dom.AppendNodes(s.sw.nodes[:0], sphere(k))
		for _, n := range s.sw.nodes {
			if i := n.J*dom.Nz + n.K; solid[i] {
				v[i] = vk
			}
		}
	}
	return v
}

// viewDomain is the domain of View's nodes: the bodies' own on one level.
func (s *Simulation) viewDomain() geometry.Domain {
	if s.lv == nil && s.sw != nil {
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
