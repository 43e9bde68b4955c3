package lbm

import "math"

// Fields are the macroscopic fields of the lattice at one time, in lattice
// units, on the Nz x Nr nodes (index j*Nz + k). Solid nodes hold zero.
type Fields struct {
	Nz, Nr int
	Rho    []float64 // density (rho0 = 1); pressure p - p0 = (Rho - 1)/3
	Uz, Ur []float64 // velocity
}

// NewFields allocates fields for an nz x nr lattice.
func NewFields(nz, nr int) *Fields {
	n := nz * nr
	return &Fields{Nz: nz, Nr: nr, Rho: make([]float64, n), Uz: make([]float64, n), Ur: make([]float64, n)}
}

// At returns the index of node (k, j).
func (f *Fields) At(k, j int) int { return j*f.Nz + k }

// Fields computes the density and velocity at the current time Steps(),
// with the half-step shifted moments of the scheme and the force set by
// SetForce, into dst (allocated when nil). It reads the lattice only.
func (s *Solver) Fields(dst *Fields) *Fields {
	if dst == nil || dst.Nz != s.nz || dst.Nr != s.nr {
		dst = NewFields(s.nz, s.nr)
	}
	s.fillHalo()
	s.boundaryPass(false)
	s.pool.run(func(lo, hi, _ int) {
		for j := lo; j < hi; j++ {
			row := dst.At(0, j)
			clear(dst.Rho[row : row+s.nz])
			clear(dst.Uz[row : row+s.nz])
			clear(dst.Ur[row : row+s.nz])
			base := s.idx(0, j)
			for _, seg := range s.segs[j] {
				s.sweep(base+seg[0], base+seg[1], &s.rows[j], dst, row+seg[0])
			}
		}
	})
	return dst
}

// Mass returns the lattice mass: the sum over fluid nodes of sum_i f_i.
// The planar scheme conserves it to round-off. It is summed row by row in a
// fixed order, so it does not depend on the number of goroutines.
func (s *Solver) Mass() float64 {
	return s.reduceRows(func(j int) float64 {
		var m float64
		for k := 0; k < s.nz; k++ {
			n := s.idx(k, j)
			if s.solid[n] {
				continue
			}
			var dm float64
			for i := 0; i < Q; i++ {
				dm += s.a[i][n]
			}
			m += 1 + dm
		}
		return m
	})
}

// Mass3D returns the mass of the axisymmetric body of fluid,
// sum over fluid nodes of 2 pi r rho (lattice units), with rho the
// half-step shifted density of the scheme. The axisymmetric scheme
// conserves it only to truncation error (METHODS.md 3.5.2).
func (s *Solver) Mass3D(f *Fields) float64 {
	return s.reduceRows(func(j int) float64 {
		var m float64
		r := s.rows[j].r
		for k := 0; k < s.nz; k++ {
			if s.solid[s.idx(k, j)] {
				continue
			}
			m += 2 * math.Pi * r * f.Rho[f.At(k, j)]
		}
		return m
	})
}

// reduceRows sums fn(j) over all rows, each row computed by its worker and
// the partial sums added in row order.
func (s *Solver) reduceRows(fn func(j int) float64) float64 {
	s.pool.run(func(lo, hi, _ int) {
		for j := lo; j < hi; j++ {
			s.rowSum[j] = fn(j)
		}
	})
	var t float64
	for _, v := range s.rowSum {
		t += v
	}
	return t
}

// SetEquilibrium sets every fluid node to the equilibrium of the density and
// velocity that fn returns for it (lattice units).
func (s *Solver) SetEquilibrium(fn func(k, j int) (rho, uz, ur float64)) {
	for j := 0; j < s.nr; j++ {
		for k := 0; k < s.nz; k++ {
			rho, uz, ur := fn(k, j)
			n := s.idx(k, j)
			usq := uz*uz + ur*ur
			for i := 0; i < Q; i++ {
				eu := float64(Ez[i])*uz + float64(Er[i])*ur
				s.a[i][n] = W[i] * ((rho - 1) + rho*(3*eu+4.5*eu*eu-1.5*usq))
			}
		}
	}
}

// Population returns the post-collision deviation f_i - w_i at node (k, j).
func (s *Solver) Population(i, k, j int) float64 { return s.a[i][s.idx(k, j)] }

// State returns a copy of all post-collision deviations, plane by plane, for
// comparisons and checkpoints.
func (s *Solver) State() [Q][]float64 {
	var c [Q][]float64
	for i := range c {
		c[i] = append([]float64(nil), s.a[i]...)
	}
	return c
}

// Pressure returns the lattice pressure deviation p - p0 = cs2 (rho - 1) at
// index o (multiply by rho_f (dx/dt)^2 for pascals).
func (f *Fields) Pressure(o int) float64 { return Cs2 * (f.Rho[o] - 1) }
