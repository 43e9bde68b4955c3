package drive

import "math"

// Swimmers returns the swimmers of the case (cases.Swimmers): the groups
// of spheres joined by springs or arms, lowest first, 0-based indices.
func (s *Simulation) Swimmers() [][]int { return s.swimmers }

// SwimmerCentroid returns the mean centre (m, container frame) of the
// spheres of g.
func (s *Simulation) SwimmerCentroid(g []int) float64 {
	var z float64
	for _, k := range g {
		z += s.sw.dyn.Z[k]
	}
	return s.Lattice.ZSI(z / float64(len(g)))
}

// SphereZ returns sphere k's centre (m, container frame): SphereState's
// z without the velocity and force, for the per-step gap tracking.
func (s *Simulation) SphereZ(k int) float64 { return s.Lattice.ZSI(s.sw.dyn.Z[k]) }

// SwimmerGap returns the surface-to-surface gap (m) between swimmers a
// (below) and b (above): the lowest surface of b less the highest surface
// of a.
func (s *Simulation) SwimmerGap(a, b []int) float64 {
	top, bottom := math.Inf(-1), math.Inf(1)
	for _, k := range a {
		top = math.Max(top, s.SphereZ(k)+s.Case.Spheres[k].Radius)
	}
	for _, k := range b {
		bottom = math.Min(bottom, s.SphereZ(k)-s.Case.Spheres[k].Radius)
	}
	return bottom - top
}

// MinSurfaceGap returns the smallest surface-to-surface distance between
// any two spheres (m; negative if two overlap), and the pair.
func (s *Simulation) MinSurfaceGap() (gap float64, i, j int) {
	gap = math.Inf(1)
	n := s.Spheres()
	for a := range n {
		za := s.SphereZ(a)
		for b := a + 1; b < n; b++ {
			zb := s.SphereZ(b)
			if g := math.Abs(zb-za) - s.Case.Spheres[a].Radius - s.Case.Spheres[b].Radius; g < gap {
				gap, i, j = g, a, b
			}
		}
	}
	return gap, i, j
}
