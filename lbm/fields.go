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
	dst, _ = s.fields(dst, false)
	return dst
}

// FieldsDensity is Fields that also returns FluidDensity, measured in the
// same parallel pass: each row's post-collision populations are summed
// right after the row's moments, while they are in cache. The density is
// the same number, bit for bit, as FluidDensity's (the rows are summed in
// the same order; the halo and the slots inside bodies that the pass
// writes are not fluid nodes).
func (s *Solver) FieldsDensity(dst *Fields) (*Fields, float64) {
	return s.fields(dst, true)
}

func (s *Solver) fields(dst *Fields, density bool) (*Fields, float64) {
	if dst == nil || dst.Nz != s.nz || dst.Nr != s.nr {
		dst = NewFields(s.nz, s.nr)
	}
	s.fillHalo()
	s.boundaryPass(false)
	m := s.sumRows(task{f: dst, on: density, fn: fieldsRows})
	if !density {
		return dst, 0
	}
	return dst, m / s.fluidVolume()
}

// fieldsRows computes the moments of rows [lo, hi) into t.f and, when
// t.on, stores each row's ring-weighted fluid mass in rowSum.
func fieldsRows(t *task, lo, hi, _ int) {
	s, dst := t.s, t.f
	for j := lo; j < hi; j++ {
		row := dst.At(0, j)
		clear(dst.Rho[row : row+s.nz])
		clear(dst.Uz[row : row+s.nz])
		clear(dst.Ur[row : row+s.nz])
		base := s.idx(0, j)
		for _, seg := range s.segs[j] {
			s.sweep(base+seg[0], base+seg[1], &s.rows[j], dst, row+seg[0])
		}
		if t.on {
			s.rowSum[j] = s.fluidMassRow(j)
		}
	}
}

// Mass returns the lattice mass: the sum over fluid nodes of sum_i f_i.
// The planar scheme conserves it to round-off. It is summed row by row in a
// fixed order, so it does not depend on the number of goroutines.
func (s *Solver) Mass() float64 {
	return s.sumRows(task{fn: massRows})
}

func massRows(t *task, lo, hi, _ int) {
	s := t.s
	for j := lo; j < hi; j++ {
		var m float64
		for k := 0; k < s.nz; k++ {
			n := s.idx(k, j)
			if s.solid[n] {
				continue
			}
			var dm float64
			for i := 0; i < Q; i++ {
				dm += s.pop(i, n)
			}
			m += 1 + dm
		}
		s.rowSum[j] = m
	}
}

// Mass3D returns the mass of the axisymmetric body of fluid,
// sum over fluid nodes of 2 pi r rho (lattice units), with rho the
// half-step shifted density of the scheme. The axisymmetric scheme
// conserves it only to truncation error (METHODS.md 3.5.2).
func (s *Solver) Mass3D(f *Fields) float64 {
	return s.sumRows(task{f: f, fn: mass3DRows})
}

func mass3DRows(t *task, lo, hi, _ int) {
	s, f := t.s, t.f
	for j := lo; j < hi; j++ {
		var m float64
		r := s.rows[j].r
		for k := 0; k < s.nz; k++ {
			if s.solid[s.idx(k, j)] {
				continue
			}
			m += 2 * math.Pi * r * f.Rho[f.At(k, j)]
		}
		s.rowSum[j] = m
	}
}

// runRows runs t on all rows in parallel; it allocates nothing.
func (s *Solver) runRows(t task) {
	t.s = s
	s.pool.runTask(t)
}

// sumRows runs t on all rows in parallel and returns the sum of the row
// values it stored in rowSum, added in row order (0 for a task that
// stores none). It allocates nothing.
func (s *Solver) sumRows(t task) float64 {
	clear(s.rowSum)
	s.runRows(t)
	var sum float64
	for _, v := range s.rowSum {
		sum += v
	}
	return sum
}

// SetEquilibrium sets every fluid node to the equilibrium of the density and
// velocity that fn returns for it (lattice units).
func (s *Solver) SetEquilibrium(fn func(k, j int) (rho, uz, ur float64)) {
	s.haloStale = true
	for j := 0; j < s.nr; j++ {
		for k := 0; k < s.nz; k++ {
			rho, uz, ur := fn(k, j)
			n := s.idx(k, j)
			usq := uz*uz + ur*ur
			for i := 0; i < Q; i++ {
				eu := float64(Ez[i])*uz + float64(Er[i])*ur
				s.setPop(i, n, W[i]*((rho-1)+rho*(3*eu+4.5*eu*eu-1.5*usq)))
			}
		}
	}
}

// Population returns the post-collision deviation f_i - w_i at node (k, j).
func (s *Solver) Population(i, k, j int) float64 { return s.pop(i, s.idx(k, j)) }

// pop returns population i at storage index n of the current
// (post-collision) lattice.
func (s *Solver) pop(i, n int) float64 {
	if s.single {
		return float64(s.a32[i][n])
	}
	return s.a[i][n]
}

// setPop sets population i at storage index n of the current lattice (with
// float32 storage, rounded to float32).
func (s *Solver) setPop(i, n int, v float64) {
	if s.single {
		s.a32[i][n] = float32(v)
	} else {
		s.a[i][n] = v
	}
}

// plane returns a float64 copy of plane i of the current lattice.
func (s *Solver) plane(i int) []float64 {
	if s.single {
		c := make([]float64, len(s.a32[i]))
		for n, v := range s.a32[i] {
			c[n] = float64(v)
		}
		return c
	}
	return append([]float64(nil), s.a[i]...)
}

// planeLen is the number of values of each plane, halo included.
func (s *Solver) planeLen() int {
	if s.single {
		return len(s.a32[0])
	}
	return len(s.a[0])
}

// State returns a copy of all post-collision deviations, plane by plane, for
// comparisons and checkpoints.
func (s *Solver) State() [Q][]float64 {
	var c [Q][]float64
	for i := range c {
		c[i] = s.plane(i)
	}
	return c
}
