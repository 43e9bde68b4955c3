package record

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/drive"
	"axiswim/output"
)

// Periods accumulates, over each drive period, the fundamental
// Fourier component of the drive displacement, of every spring's extension
// and of every sphere's displacement relative to the container, and the
// stroboscopic centroid at each period's end.
type Periods struct {
	sim       *drive.Simulation
	omega     float64 // rad/s
	steps     int     // per period
	n         int     // steps accumulated in the current period
	drive     complex128
	ramp      complex128 // sum of (n/steps) e^{-i w t}: removes a steady drift
	ext, body []complex128
	lo, hi    []float64 // extension range over the period
	z0        []float64 // sphere centres at the start
	centroids []float64 // at the end of each period (index 0: start)
	rows      []Row

	// With several swimmers: each one's stroboscopic centroid and the gap
	// between neighbours at each period's end (index 0: start), and the
	// smallest gap seen at any step.
	swim, gaps [][]float64
	gapMin     []float64
	// The smallest surface distance between any two spheres at any step.
	minGap  float64
	minPair [2]int
}

// Row is one drive period of periods.csv.
type Row struct {
	Period             int
	Time, Centroid     float64 // s; m, at the period's end
	Displacement       float64 // m, of the centroid over the period
	ExtAmp, ExtPhase   []float64
	BodyAmp, BodyPhase []float64
	Swim, Gaps         []float64 // several swimmers: centroids, gaps
}

// NewPeriods starts the period record of a shaken simulation with spheres.
func NewPeriods(sim *drive.Simulation) *Periods {
	ns, nk := sim.Spheres(), sim.Springs()
	l := sim.Lattice
	p := &Periods{sim: sim, omega: 2 * math.Pi / l.TimeSI(float64(l.StepsPerPeriod)), steps: l.StepsPerPeriod,
		ext: make([]complex128, nk), body: make([]complex128, ns),
		lo: make([]float64, nk), hi: make([]float64, nk), z0: make([]float64, ns)}
	for k := range p.z0 {
		p.z0[k], _, _ = sim.SphereState(k)
	}
	p.centroids = []float64{sim.Centroid()}
	p.minGap = math.Inf(1)
	if sw := sim.Swimmers(); len(sw) > 1 {
		for g := range sw {
			p.swim = append(p.swim, []float64{sim.SwimmerCentroid(sw[g])})
		}
		for g := range len(sw) - 1 {
			gap := sim.SwimmerGap(sw[g], sw[g+1])
			p.gaps = append(p.gaps, []float64{gap})
			p.gapMin = append(p.gapMin, gap)
		}
	}
	p.reset()
	return p
}

func (p *Periods) reset() {
	p.n, p.drive, p.ramp = 0, 0, 0
	for k := range p.ext {
		p.ext[k] = 0
		p.lo[k], p.hi[k] = math.Inf(1), math.Inf(-1)
	}
	for k := range p.body {
		p.body[k] = 0
	}
}

// Step records the state after a lattice step; at the end of a period it
// closes the period's row and reports so.
func (p *Periods) Step() bool {
	s := p.sim
	t := s.Time()
	ph := cmplx.Exp(complex(0, -p.omega*t))
	p.drive += complex(s.Shaker.Displacement(t), 0) * ph
	for k := range p.ext {
		e := s.SpringExtension(k)
		p.ext[k] += complex(e, 0) * ph
		p.lo[k], p.hi[k] = math.Min(p.lo[k], e), math.Max(p.hi[k], e)
	}
	for k := range p.body {
		z, _, _ := s.SphereState(k)
		p.body[k] += complex(z-p.z0[k], 0) * ph
	}
	if s.Spheres() > 1 {
		if g, i, j := s.MinSurfaceGap(); g < p.minGap {
			p.minGap, p.minPair = g, [2]int{i, j}
		}
		for g := range p.gapMin {
			p.gapMin[g] = math.Min(p.gapMin[g], s.SwimmerGap(s.Swimmers()[g], s.Swimmers()[g+1]))
		}
	}
	p.n++
	p.ramp += complex(float64(p.n)/float64(p.steps), 0) * ph
	if p.n < p.steps {
		return false
	}
	c := s.Centroid()
	r := Row{Period: len(p.centroids), Time: t, Centroid: c, Displacement: c - p.centroids[len(p.centroids)-1]}
	for g := range p.swim {
		p.swim[g] = append(p.swim[g], s.SwimmerCentroid(s.Swimmers()[g]))
		r.Swim = append(r.Swim, p.swim[g][len(p.swim[g])-1])
	}
	for g := range p.gaps {
		p.gaps[g] = append(p.gaps[g], s.SwimmerGap(s.Swimmers()[g], s.Swimmers()[g+1]))
		r.Gaps = append(r.Gaps, p.gaps[g][len(p.gaps[g])-1])
	}
	for k := range p.ext {
		r.ExtAmp = append(r.ExtAmp, 0.5*(p.hi[k]-p.lo[k]))
		r.ExtPhase = append(r.ExtPhase, phaseAgainst(p.ext[k], p.drive))
	}
	for k := range p.body {
		// remove the drift over the period, a linear ramp, from the
		// fundamental, and restart the reference at the period's end
		z, _, _ := s.SphereState(k)
		f := p.body[k] - complex(z-p.z0[k], 0)*p.ramp
		r.BodyAmp = append(r.BodyAmp, 2*cmplx.Abs(f)/float64(p.n))
		r.BodyPhase = append(r.BodyPhase, phaseAgainst(f, p.drive))
		p.z0[k] = z
	}
	p.centroids = append(p.centroids, c)
	p.rows = append(p.rows, r)
	p.reset()
	return true
}

// phaseAgainst returns the phase of z relative to ref in degrees (NaN
// without a reference).
func phaseAgainst(z, ref complex128) float64 {
	if ref == 0 {
		return math.NaN()
	}
	return cmplx.Phase(z/ref) * 180 / math.Pi
}

// Columns are the columns of periods.csv.
func (p *Periods) Columns() []output.Column {
	cols := []output.Column{
		{Name: "period", Doc: "drive period number"},
		{Name: "time_s", Doc: "time at the end of the period"},
		{Name: "centroid_m", Doc: "stroboscopic centroid (mean of the sphere centres) at the period's end"},
		{Name: "displacement_m", Doc: "centroid displacement over the period"},
	}
	for k := range p.ext {
		cols = append(cols,
			output.Column{Name: fmt.Sprintf("spring%d_amplitude_m", k+1), Doc: "half the extension's range over the period"},
			output.Column{Name: fmt.Sprintf("spring%d_phase_deg", k+1), Doc: "phase of the extension's fundamental against the drive displacement"})
	}
	for k := range p.body {
		cols = append(cols,
			output.Column{Name: fmt.Sprintf("sphere%d_amplitude_m", k+1), Doc: "fundamental amplitude of the motion relative to the container"},
			output.Column{Name: fmt.Sprintf("sphere%d_phase_deg", k+1), Doc: "its phase against the drive displacement"})
	}
	for g := range p.swim {
		cols = append(cols, output.Column{Name: fmt.Sprintf("swimmer%d_centroid_m", g+1),
			Doc: fmt.Sprintf("stroboscopic centroid of swimmer %d (spheres %s)", g+1, sphereList(p.sim.Swimmers()[g]))})
	}
	for g := range p.gaps {
		cols = append(cols, output.Column{Name: fmt.Sprintf("gap%d_%d_m", g+1, g+2),
			Doc: fmt.Sprintf("surface gap between swimmers %d and %d", g+1, g+2)})
	}
	return cols
}

// sphereList writes 0-based sphere indices 1-based: "1, 2".
func sphereList(g []int) string {
	var b []byte
	for i, k := range g {
		if i > 0 {
			b = append(b, ", "...)
		}
		b = fmt.Appendf(b, "%d", k+1)
	}
	return string(b)
}

// Values is the row of periods.csv, in the order of Columns.
func (r Row) Values() []float64 {
	v := []float64{float64(r.Period), r.Time, r.Centroid, r.Displacement}
	for k := range r.ExtAmp {
		v = append(v, r.ExtAmp[k], r.ExtPhase[k])
	}
	for k := range r.BodyAmp {
		v = append(v, r.BodyAmp[k], r.BodyPhase[k])
	}
	v = append(v, r.Swim...)
	return append(v, r.Gaps...)
}

// Rows returns the closed periods, in order.
func (p *Periods) Rows() []Row { return p.rows }

// Centroids returns the stroboscopic centroid at the end of each period
// (m, container frame; index 0: the start).
func (p *Periods) Centroids() []float64 { return p.centroids }

// Period is the drive period, s.
func (p *Periods) Period() float64 { return p.sim.Lattice.TimeSI(float64(p.steps)) }

// SwimmerCentroids returns swimmer g's stroboscopic centroids (several
// swimmers only; index 0: the start).
func (p *Periods) SwimmerCentroids(g int) []float64 { return p.swim[g] }

// Gaps returns the surface gap between swimmers g and g+1 at each
// period's end (index 0: the start) and the smallest at any step.
func (p *Periods) Gaps(g int) (each []float64, least float64) { return p.gaps[g], p.gapMin[g] }

// MinSurfaceGap returns the smallest surface distance between any two
// spheres at any step (m; +Inf with one sphere) and the pair (0-based).
func (p *Periods) MinSurfaceGap() (gap float64, pair [2]int) { return p.minGap, p.minPair }
