package drive

import (
	"math"

	"axiswim/geometry"
	"axiswim/lbm"
)

// Window is part of the container on a uniform image at the finest
// spacing: node (k, j) lies at Z0 + k + 1/2 finest cells from the
// container's first along the axis and j + 1/2 from the axis. On refined
// levels it shows the swimmer's region at the resolution its flow was
// computed with (the pictures' close-up), where View may be coarser.
type Window struct{ Z0, Nz, Nr int }

// FineWindow returns the finest level's region where it is now, as a
// Window; false on one lattice (View is the finest spacing there).
func (s *Simulation) FineWindow() (Window, bool) {
	if s.lv == nil {
		return Window{}, false
	}
	h, st := s.lv.h, s.lv.stride
	z0, _ := h.Origin(h.Len() - 1) // level 0's cells; the finest level starts at the axis
	nz, nr := h.Level(h.Len() - 1).Size()
	return Window{Z0: int(math.Round(z0 * float64(st))), Nz: nz, Nr: nr}, true
}

// WindowFields returns the fields of the last Observe on the nodes of w
// (lattice units of the finest level), interpolated from the finest level
// that holds each node (lbm.Levels.SampleWindow), in dst (allocated unless
// it has w's size). It panics on one lattice.
func (s *Simulation) WindowFields(w Window, dst *lbm.Fields) *lbm.Fields {
	lv := s.lv
	if lv.fs[0] == nil {
		s.Observe()
	}
	st := float64(lv.stride)
	return lv.h.SampleWindow(lv.fs, float64(w.Z0)/st, w.Nz, w.Nr, 1/st, dst, nil)
}

// WindowSolid reports the nodes of w inside a body now, in m (allocated
// unless it has w's size), by the rule SolidMask uses on refined levels.
func (s *Simulation) WindowSolid(w Window, m []bool) []bool {
	return s.solidOn(m, w.domain(), s.windowSphere(w))
}

// WindowBodyVelocity is BodyVelocity on the nodes of w, solid those of
// WindowSolid.
func (s *Simulation) WindowBodyVelocity(w Window, v []float64, solid []bool) []float64 {
	return s.bodyVelocityOn(v, solid, w.domain(), s.windowSphere(w))
}

// WindowSpheres returns the spheres' centres along the axis and radii in
// w's cells (from its first node's lower edge).
func (s *Simulation) WindowSpheres(w Window) []geometry.Sphere {
	var out []geometry.Sphere
	if s.sw == nil {
		return out
	}
	for k := range s.sw.bodies.List {
		out = append(out, s.windowSphere(w)(k))
	}
	return out
}

func (w Window) domain() geometry.Domain { return geometry.Domain{Nz: w.Nz, Nr: w.Nr} }

// windowSphere returns body k in w's cells (Dynamics.Z is in the
// container's finest cells).
func (s *Simulation) windowSphere(w Window) func(int) geometry.Sphere {
	return func(k int) geometry.Sphere {
		return geometry.Sphere{Z: s.sw.dyn.Z[k] - float64(w.Z0), Radius: s.sw.dyn.Radius[k]}
	}
}
