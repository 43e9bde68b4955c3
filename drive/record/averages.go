package record

import "axiswim/lbm"

// fieldAverage accumulates the mean of the fields over samples taken on
// the fly (the Eulerian mean at fixed points of the container frame),
// never storing the samples. A node that a body covers in any sample is
// marked covered: the liquid has no Eulerian mean there, and pictures and
// metrics leave it out.
type fieldAverage struct {
	nz, nr         int
	uz, ur, rho    []float64
	count, samples int
	covered        []bool
}

func newFieldAverage(nz, nr int) *fieldAverage {
	n := nz * nr
	return &fieldAverage{nz: nz, nr: nr, uz: make([]float64, n), ur: make([]float64, n),
		rho: make([]float64, n), covered: make([]bool, n)}
}

// add accumulates one sample; solid reports the nodes inside a body and
// body their axial velocity (the body's): the mean then is that of the
// liquid and the bodies together, so that its streamfunction, integrated
// across the region the bodies sweep, stays right beyond it.
func (a *fieldAverage) add(f *lbm.Fields, solid []bool, body []float64) {
	for i := range a.uz {
		if solid[i] {
			a.covered[i] = true
			a.uz[i] += body[i]
			a.rho[i]++
			continue
		}
		a.uz[i] += f.Uz[i]
		a.ur[i] += f.Ur[i]
		a.rho[i] += f.Rho[i]
	}
	a.samples++
}

// mean returns the averaged fields and their mask.
func (a *fieldAverage) mean() (*lbm.Fields, []bool) {
	n := a.nz * a.nr
	f := &lbm.Fields{Nz: a.nz, Nr: a.nr, Uz: make([]float64, n), Ur: make([]float64, n), Rho: make([]float64, n)}
	if a.samples == 0 {
		return f, a.covered
	}
	s := 1 / float64(a.samples)
	for i := 0; i < n; i++ {
		f.Uz[i], f.Ur[i], f.Rho[i] = a.uz[i]*s, a.ur[i]*s, a.rho[i]*s
	}
	return f, a.covered
}

// meanSamplesPerPeriod is the number of evenly spaced samples per period
// from which the mean fields are accumulated: the trapezoidal rule over a
// period is exact for every harmonic below half of it, and 32 samples cost
// 32 field passes per period, about 1% of a period of a few thousand
// steps.
const meanSamplesPerPeriod = 32
