package run

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/drive/flow"
	"axiswim/drive/model"
	"axiswim/drive/record"
)

// Summary is what summary.json records about a run.
type Summary struct {
	Title       string `json:"title,omitempty"`
	Completed   bool   `json:"completed"`
	Interrupted bool   `json:"interrupted,omitempty"`
	Failure     string `json:"failure,omitempty"`

	// The swimmer (absent without spheres).
	MeanVelocity            *float64 `json:"mean_velocity_m_s,omitempty"`
	MeanVelocityUncertainty *float64 `json:"mean_velocity_uncertainty_m_s,omitempty"`
	Swimming                *bool    `json:"swimming,omitempty"`
	Direction               string   `json:"direction,omitempty"`
	LeadingSphere           *int     `json:"leading_sphere,omitempty"`
	Converged               *bool    `json:"converged,omitempty"`
	ConvergenceCriterion    string   `json:"convergence_criterion,omitempty"`
	PeriodsAnalysed         int      `json:"periods_analysed,omitempty"`
	NetDisplacement         *float64 `json:"net_displacement_m,omitempty"`

	Streaming *flow.Streaming `json:"streaming,omitempty"`
	// InterfaceImprint is, on refined levels, how much the interfaces show
	// in the mean vorticity (flow.Imprint: a fraction of its peak).
	InterfaceImprint *float64             `json:"interface_imprint,omitempty"`
	Groups           []cases.SphereGroups `json:"groups,omitempty"`
	Arms             []cases.ArmGroups    `json:"arm_groups,omitempty"` // the groups of each arm's stroke
	Model            *model.Result        `json:"model,omitempty"`
	Comparison       []Comparison         `json:"model_comparison,omitempty"`

	Steps         int64          `json:"steps"`
	SimulatedTime float64        `json:"simulated_time_s"`
	WallTime      float64        `json:"wall_time_s"`
	MLUPS         float64        `json:"mlups"`
	Lattice       LatticeSummary `json:"lattice"`
	MaxMach       float64        `json:"max_mach"`
	FinalMaxSpeed float64        `json:"final_max_speed_m_s"`
	WarmStart     *WarmStart     `json:"warm_start,omitempty"`
	// With several swimmers (spheres joined by springs or arms): each
	// one's speed and the gaps between neighbours.
	Swimmers []SwimmerSummary `json:"swimmers,omitempty"`
	Gaps     []GapSummary     `json:"gaps,omitempty"`
	// MinSurfaceGap is the smallest surface distance between two spheres
	// at any step (negative: they overlapped).
	MinSurfaceGap *float64 `json:"min_surface_gap_m,omitempty"`
	MaxMassDrift  float64  `json:"max_mass_drift"`
	MassCorrected float64  `json:"mass_correction_applied,omitempty"`
	Warnings      []string `json:"warnings"`
}

// Comparison is one quantity from the simulation beside the reduced
// linear model's value.
type Comparison struct {
	Quantity  string   `json:"quantity"`
	Simulated float64  `json:"simulated"`
	Model     float64  `json:"model"`
	Ratio     *float64 `json:"ratio,omitempty"` // simulated/model for amplitudes
	// Source names the model when it is not the reduced linear model
	// (the steady-Stokes chain model, for instance).
	Source string `json:"source,omitempty"`
}

// LatticeSummary records the lattice parameters of a run.
type LatticeSummary struct {
	Nz             int     `json:"nz"`
	Nr             int     `json:"nr"`
	CellSize       float64 `json:"cell_size_m"`
	TimeStep       float64 `json:"time_step_s"`
	Tau            float64 `json:"tau"`
	StepsPerPeriod int     `json:"steps_per_period,omitempty"`
	Bound          string  `json:"time_step_bound"`
	Threads        int     `json:"threads"`
	Kernel         string  `json:"kernel"` // the kernel path: avx512, avx2 or portable
	// On refined levels (grid.levels > 1): Nz x Nr, CellSize, TimeStep and
	// Tau above are the finest level's (Nz x Nr the uniform lattice of that
	// spacing over the container); each level's cells, node updates and
	// time; the interface transfers' time; how often the refined levels
	// moved with the spheres and by how many of level 0's cells in all;
	// and the spacing of the uniform image of the fields (m).
	Levels       []LevelSummary `json:"levels,omitempty"`
	TransferTime float64        `json:"transfer_time_s,omitempty"`
	LevelMoves   int            `json:"level_moves,omitempty"`
	LevelShift   int            `json:"level_shift_cells,omitempty"`
	ImageSpacing float64        `json:"image_spacing_m,omitempty"`
}

// LevelSummary is one level of a run on refined levels, 0 the coarsest.
type LevelSummary struct {
	Nz          int     `json:"nz"`
	Nr          int     `json:"nr"`
	CellSize    float64 `json:"cell_size_m"`
	TimeStep    float64 `json:"time_step_s"`
	Tau         float64 `json:"tau"`
	NodeUpdates float64 `json:"node_updates"`  // cells x the level's steps so far
	KernelTime  float64 `json:"kernel_time_s"` // this process's time in the level's fused step
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

// summarizeSwimmer fills in the swimming speed, the leading sphere and the
// comparison with the reduced model.
func summarizeSwimmer(sum *Summary, sim *drive.Simulation, tr *record.Periods) {
	c := sim.Case
	T := tr.Period()
	cs := tr.Centroids()
	sp := record.SwimmingSpeed(cs, T, sim.SkipPeriods())
	net := cs[len(cs)-1] - cs[0]
	sum.NetDisplacement = &net
	if sp.Periods == 0 {
		sum.ConvergenceCriterion = sp.Criterion
		sum.Warnings = append(sum.Warnings, "too few periods for a swimming speed: "+sp.Criterion)
		return
	}
	sum.MeanVelocity, sum.MeanVelocityUncertainty = &sp.Mean, &sp.Uncertainty
	sum.Swimming, sum.Converged = &sp.Swimming, &sp.Converged
	sum.ConvergenceCriterion, sum.PeriodsAnalysed = sp.Criterion, sp.Periods
	lead := 0
	switch {
	case sp.Swimming && sp.Mean > 0:
		sum.Direction = "+z"
		lead = argExtreme(sim, +1)
	case sp.Swimming:
		sum.Direction = "-z"
		lead = argExtreme(sim, -1)
	default:
		sum.Direction = "none (not distinguishable from zero)"
	}
	sum.LeadingSphere = &lead
	if !sp.Converged {
		sum.Warnings = append(sum.Warnings, "the swimming speed has not converged: run more periods ("+sp.Criterion+")")
	}
	if w := settlingWarning(c, sp.Mean); w != "" {
		sum.Warnings = append(sum.Warnings, w)
	}
	m, err := model.Linear(c)
	if err != nil {
		sum.Warnings = append(sum.Warnings, "reduced model: "+err.Error())
		return
	}
	sum.Model = m
	last := tr.Rows()[len(tr.Rows())-1]
	for _, ms := range m.Springs {
		k := ms.Spring - 1
		sum.Comparison = append(sum.Comparison, compare(springAmplitude(ms.Spring), last.ExtAmp[k], ms.Amplitude))
		sum.Comparison = append(sum.Comparison, Comparison{Quantity: springPhase(ms.Spring),
			Simulated: finiteOr0(last.ExtPhase[k]), Model: ms.Phase})
	}
	for _, ms := range m.Spheres {
		k := ms.Sphere - 1
		sum.Comparison = append(sum.Comparison, compare(fmt.Sprintf("sphere %d amplitude relative to the container (m)", ms.Sphere), last.BodyAmp[k], ms.Amplitude))
	}
}

// The quantities of the spring comparisons (spring is 1-based).
func springAmplitude(spring int) string {
	return fmt.Sprintf("spring %d extension amplitude (m)", spring)
}
func springPhase(spring int) string { return fmt.Sprintf("spring %d extension phase (deg)", spring) }

// Spring returns the simulated extension amplitude (m) and phase (deg)
// of spring (1-based) over the last period, as compared with the linear
// model; ok is false when the summary has no such comparison.
func (s *Summary) Spring(spring int) (amplitude, phase float64, ok bool) {
	var hasAmp, hasPhase bool
	for _, c := range s.Comparison {
		switch c.Quantity {
		case springAmplitude(spring):
			amplitude, hasAmp = c.Simulated, true
		case springPhase(spring):
			phase, hasPhase = c.Simulated, true
		}
	}
	return amplitude, phase, hasAmp && hasPhase
}

// finiteOr0 maps NaN (not valid JSON) to 0.
func finiteOr0(x float64) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	return x
}

func compare(q string, sim, model float64) Comparison {
	c := Comparison{Quantity: q, Simulated: finiteOr0(sim), Model: model}
	if model != 0 {
		r := sim / model
		c.Ratio = &r
	}
	return c
}

// argExtreme returns the 1-based index of the sphere furthest along
// sign * z.
func argExtreme(sim *drive.Simulation, sign float64) int {
	best, arg := math.Inf(-1), 0
	for k := 0; k < sim.Spheres(); k++ {
		z, _, _ := sim.SphereState(k)
		if sign*z > best {
			best, arg = sign*z, k+1
		}
	}
	return arg
}

// summarizeSwimmers fills in, for a case with several swimmers, each
// swimmer's speed and leading sphere and the gaps between neighbours.
func summarizeSwimmers(sum *Summary, sim *drive.Simulation, tr *record.Periods) {
	groups := sim.Swimmers()
	if len(groups) < 2 {
		return
	}
	T := tr.Period()
	skip := sim.SkipPeriods()
	for g, members := range groups {
		c := tr.SwimmerCentroids(g)
		sp := record.SwimmingSpeed(c, T, skip)
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
				z := sim.SphereZ(k)
				if v := math.Copysign(1, sp.Mean) * z; v > best {
					best, ss.LeadingSphere = v, k+1
				}
			}
		}
		sum.Swimmers = append(sum.Swimmers, ss)
	}
	for g := range len(groups) - 1 {
		gs, least := tr.Gaps(g)
		gap := GapSummary{Swimmers: [2]int{g + 1, g + 2}, Initial: gs[0], Final: gs[len(gs)-1], Min: least}
		var speed float64
		for _, k := range []int{g, g + 1} {
			if v := sum.Swimmers[k].MeanVelocity; v != nil {
				speed += math.Abs(*v) / 2
			}
		}
		gap.Rate, gap.Uncertainty, gap.Trend = record.GapTrend(gs, T, skip, speed)
		sum.Gaps = append(sum.Gaps, gap)
		if rr := sim.Lattice.DistanceSI(sim.Case.Bodies.RepulsionRange); gap.Min < rr {
			sum.Warnings = append(sum.Warnings, fmt.Sprintf("swimmers %d and %d touched (gap %.3g m, within the repulsion range %.3g m): "+
				"contacts here are more elastic than real ones at moderate Stokes number (README, Contacts)", g+1, g+2, gap.Min, rr))
		}
	}
}

// overlapWarning says when two spheres overlapped during the run.
func overlapWarning(tr *record.Periods) string {
	gap, pair := tr.MinSurfaceGap()
	if gap >= 0 || math.IsInf(gap, 0) {
		return ""
	}
	return fmt.Sprintf("spheres %d and %d overlapped by %.3g m at their closest: the repulsion ([bodies]) is too weak for these motions",
		pair[0]+1, pair[1]+1, -gap)
}

// compareStokes sets the measured swimming speeds beside the steady-Stokes
// estimates of the summary's model, when it has them.
func compareStokes(sum *Summary) {
	if sum.Model == nil || len(sum.Model.Stokes) == 0 {
		return
	}
	for k, st := range sum.Model.Stokes {
		q, u := "mean speed (m/s)", sum.MeanVelocity
		if len(sum.Swimmers) > 1 {
			if k >= len(sum.Swimmers) {
				return
			}
			q, u = fmt.Sprintf("swimmer %d mean speed (m/s)", k+1), sum.Swimmers[k].MeanVelocity
		}
		if u == nil {
			continue
		}
		c := compare(q, *u, st.Speed)
		c.Source = "Stokes chain model"
		if !st.InRange {
			c.Source = "Stokes chain model (outside its range, see the model notes)"
		}
		sum.Comparison = append(sum.Comparison, c)
		if st.LeadingOrder != nil {
			c := compare(q, *u, *st.LeadingOrder)
			c.Source = "three-sphere leading order"
			sum.Comparison = append(sum.Comparison, c)
		}
	}
}

// settlingWarning says when the spheres are not neutrally buoyant as a
// whole and gravity alone would move them at a speed comparable with the
// swimming speed u: the estimate is the net weight over the sum of the
// spheres' Stokes drags 6 pi mu a (isolated spheres; walls slow it down).
func settlingWarning(c *cases.Case, u float64) string {
	g := c.Shaking.Gravity
	if g == 0 || len(c.Springs)+len(c.Arms) == 0 {
		return ""
	}
	var w, drag float64
	for _, s := range c.Spheres {
		vol := 4.0 / 3 * math.Pi * s.Radius * s.Radius * s.Radius
		w += (s.Density - c.Fluid.Density) * vol * g
		drag += 6 * math.Pi * c.Fluid.Viscosity * s.Radius
	}
	v := w / drag
	if math.Abs(v) < 0.1*math.Abs(u) {
		return ""
	}
	return fmt.Sprintf("the spheres are not neutrally buoyant as a whole: their net weight %.3g N alone would move them "+
		"at about %.2g m/s (Stokes estimate), %.0f%% of the swimming speed; the measured speed includes that settling",
		w, v, 100*math.Abs(v/u))
}
