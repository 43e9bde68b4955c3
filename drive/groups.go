package drive

import (
	"fmt"
	"math"
	"slices"

	"axiswim/cases"
)

// Swimmers returns the swimmers of case c: the spheres joined, directly
// or through others, by springs or arms form one swimmer; a sphere joined
// to none is a swimmer of its own. Sphere indices are 0-based, in order
// within a swimmer, and the swimmers are ordered by their mean initial
// position along z (the first is the lowest).
func Swimmers(c *cases.Case) [][]int {
	n := len(c.Spheres)
	parent := make([]int, n)
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		if parent[i] != i {
			parent[i] = find(parent[i])
		}
		return parent[i]
	}
	join := func(a, b int) {
		if a >= 1 && b >= 1 && a <= n && b <= n {
			ra, rb := find(a-1), find(b-1)
			parent[max(ra, rb)] = min(ra, rb)
		}
	}
	for _, s := range c.Springs {
		join(s.Spheres[0], s.Spheres[1])
	}
	for _, a := range c.Arms {
		join(a.Spheres[0], a.Spheres[1])
	}
	byRoot := map[int][]int{}
	var roots []int
	for i := range n {
		r := find(i)
		if _, ok := byRoot[r]; !ok {
			roots = append(roots, r)
		}
		byRoot[r] = append(byRoot[r], i)
	}
	out := make([][]int, 0, len(roots))
	for _, r := range roots {
		out = append(out, byRoot[r])
	}
	mean := func(g []int) float64 {
		var z float64
		for _, k := range g {
			z += c.Spheres[k].Z
		}
		return z / float64(len(g))
	}
	slices.SortStableFunc(out, func(a, b []int) int {
		switch ma, mb := mean(a), mean(b); {
		case ma < mb:
			return -1
		case ma > mb:
			return 1
		}
		return 0
	})
	return out
}

// swimmerCentroid returns the mean centre (m, container frame) of the
// spheres of g.
func (s *Simulation) swimmerCentroid(g []int) float64 {
	var z float64
	for _, k := range g {
		z += s.sw.dyn.Z[k]
	}
	return s.physicalZ(z / float64(len(g)))
}

// sphereZ returns sphere k's centre (m, container frame): SphereState's
// z without the velocity and force, for the per-step gap tracking.
func (s *Simulation) sphereZ(k int) float64 { return s.physicalZ(s.sw.dyn.Z[k]) }

// swimmerGap returns the surface-to-surface gap (m) between swimmers a
// (below) and b (above): the lowest surface of b less the highest surface
// of a.
func (s *Simulation) swimmerGap(a, b []int) float64 {
	top, bottom := math.Inf(-1), math.Inf(1)
	for _, k := range a {
		top = math.Max(top, s.sphereZ(k)+s.Case.Spheres[k].Radius)
	}
	for _, k := range b {
		bottom = math.Min(bottom, s.sphereZ(k)-s.Case.Spheres[k].Radius)
	}
	return bottom - top
}

// minSurfaceGap returns the smallest surface-to-surface distance between
// any two spheres (m; negative if two overlap), and the pair.
func (s *Simulation) minSurfaceGap() (gap float64, i, j int) {
	gap = math.Inf(1)
	n := s.Spheres()
	for a := range n {
		za := s.sphereZ(a)
		for b := a + 1; b < n; b++ {
			zb := s.sphereZ(b)
			if g := math.Abs(zb-za) - s.Case.Spheres[a].Radius - s.Case.Spheres[b].Radius; g < gap {
				gap, i, j = g, a, b
			}
		}
	}
	return gap, i, j
}

// SwimmerSummary is one swimmer of a case with several.
type SwimmerSummary struct {
	Spheres                 []int    `json:"spheres"` // 1-based
	MeanVelocity            *float64 `json:"mean_velocity_m_s,omitempty"`
	MeanVelocityUncertainty *float64 `json:"mean_velocity_uncertainty_m_s,omitempty"`
	Swimming                bool     `json:"swimming"`
	Converged               bool     `json:"converged"`
	LeadingSphere           int      `json:"leading_sphere,omitempty"` // 1-based; 0 when not swimming
	NetDisplacement         float64  `json:"net_displacement_m"`
}

// GapSummary is the gap between two neighbouring swimmers over the run.
type GapSummary struct {
	Swimmers    [2]int  `json:"swimmers"` // 1-based, lower first
	Initial     float64 `json:"initial_m"`
	Final       float64 `json:"final_m"`
	Min         float64 `json:"min_m"`
	Rate        float64 `json:"rate_m_s"` // mean change per unit time over the analysed periods
	Uncertainty float64 `json:"rate_uncertainty_m_s"`
	// Trend is "closing", "opening" or "locked" (the rate is within two
	// standard errors of zero, or below 1% of the two swimmers' mean
	// speed: they move as one).
	Trend string `json:"trend"`
}

// Trends of a gap.
const (
	GapClosing = "closing"
	GapOpening = "opening"
	GapLocked  = "locked"
)

// gapTrend estimates how a stroboscopic gap series g (one value per
// period end, index 0 at the start) changes, like SwimmingSpeed does a
// centroid's; speed is the swimmers' mean speed, the scale of "locked".
func gapTrend(g []float64, T float64, skip int, speed float64) (rate, se float64, trend string) {
	sp := SwimmingSpeed(g, T, skip)
	rate, se = sp.Mean, sp.Uncertainty
	if sp.Periods == 0 {
		return math.NaN(), math.NaN(), GapLocked
	}
	switch {
	case math.Abs(rate) <= 2*se || math.Abs(rate) < 0.01*math.Abs(speed):
		trend = GapLocked
	case rate < 0:
		trend = GapClosing
	default:
		trend = GapOpening
	}
	return rate, se, trend
}

// summarizeSwimmers fills in, for a case with several swimmers, each
// swimmer's speed and leading sphere and the gaps between neighbours.
func summarizeSwimmers(sum *Summary, sim *Simulation, tr *periodTracker) {
	groups := sim.swimmers
	if len(groups) < 2 {
		return
	}
	T := float64(tr.steps) * sim.Lattice.Dt
	skip := sim.skipPeriods()
	for g, members := range groups {
		c := tr.swim[g]
		sp := SwimmingSpeed(c, T, skip)
		ss := SwimmerSummary{NetDisplacement: c[len(c)-1] - c[0], Swimming: sp.Swimming, Converged: sp.Converged}
		for _, k := range members {
			ss.Spheres = append(ss.Spheres, k+1)
		}
		if sp.Periods > 0 {
			ss.MeanVelocity, ss.MeanVelocityUncertainty = &sp.Mean, &sp.Uncertainty
		}
		if sp.Swimming {
			best := math.Inf(-1)
			for _, k := range members {
				z := sim.sphereZ(k)
				if v := math.Copysign(1, sp.Mean) * z; v > best {
					best, ss.LeadingSphere = v, k+1
				}
			}
		}
		sum.Swimmers = append(sum.Swimmers, ss)
	}
	for g := range len(groups) - 1 {
		gs := tr.gaps[g]
		gap := GapSummary{Swimmers: [2]int{g + 1, g + 2}, Initial: gs[0], Final: gs[len(gs)-1], Min: tr.gapMin[g]}
		var speed float64
		for _, k := range []int{g, g + 1} {
			if v := sum.Swimmers[k].MeanVelocity; v != nil {
				speed += math.Abs(*v) / 2
			}
		}
		gap.Rate, gap.Uncertainty, gap.Trend = gapTrend(gs, T, skip, speed)
		sum.Gaps = append(sum.Gaps, gap)
		if rr := sim.Case.Bodies.RepulsionRange * sim.Lattice.Dx; gap.Min < rr {
			sum.Warnings = append(sum.Warnings, fmt.Sprintf("swimmers %d and %d touched (gap %.3g m, within the repulsion range %.3g m): "+
				"contacts here are more elastic than real ones at moderate Stokes number (README, Contacts)", g+1, g+2, gap.Min, rr))
		}
	}
}

// overlapWarning says when two spheres overlapped during the run.
func overlapWarning(tr *periodTracker) string {
	if tr.minGap >= 0 || math.IsInf(tr.minGap, 0) {
		return ""
	}
	return fmt.Sprintf("spheres %d and %d overlapped by %.3g m at their closest: the repulsion ([bodies]) is too weak for these motions",
		tr.minPair[0]+1, tr.minPair[1]+1, -tr.minGap)
}
