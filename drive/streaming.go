package drive

import (
	"fmt"
	"math"
	"path/filepath"

	"axiswim/lbm"
	"axiswim/output"
)

// StreamingSummary describes the mean (period-averaged) flow: its vortex
// rings, the stagnation points and the jet on the axis, and the direction
// of the mean flow on the axis on each side of the swimmer. SI units,
// container frame.
type StreamingSummary struct {
	Periods          [2]int         `json:"periods"` // averaged over periods first..last (1-based)
	Rings            []RingSummary  `json:"vortex_rings"`
	StagnationPoints []float64      `json:"axis_stagnation_points_m"`
	JetPeakSpeed     float64        `json:"jet_peak_mean_speed_m_s"` // signed, along +z
	JetPeakZ         float64        `json:"jet_peak_z_m"`
	Below            AxisFlowReport `json:"axis_flow_below"`
	Above            AxisFlowReport `json:"axis_flow_above"`
}

// RingSummary is one vortex ring of the mean flow.
type RingSummary struct {
	Z           float64 `json:"z_m"`
	Rm          float64 `json:"r_m"`
	Circulation float64 `json:"circulation_m2_s"`
	Psi         float64 `json:"streamfunction_m3_s"`
	Sense       string  `json:"sense"`
}

// AxisFlowReport is the mean axial flow on the axis just beyond the
// swimmer, averaged over one largest-sphere diameter.
type AxisFlowReport struct {
	Velocity  float64 `json:"mean_velocity_m_s"`
	Direction string  `json:"direction"` // "away from the swimmer" or "toward the swimmer"
}

// streamingMetrics measures the mean field and writes metrics.csv.
func (s *Simulation) streamingMetrics(dir string, mf *lbm.Fields, mask []bool, first, last int) (*StreamingSummary, error) {
	l := s.Lattice
	m := &MeanField{Nz: mf.Nz, Nr: mf.Nr, Uz: mf.Uz, Ur: mf.Ur, Rho: mf.Rho, Solid: mask}
	psi := lbm.Streamfunction(mf)
	om := lbm.Vorticity(mf, s.FrameOnLiquid)
	rings := FindRings(m, psi, om, 0.05)
	d := s.sw.dyn
	lo, hi, amax := math.Inf(1), math.Inf(-1), 0.0
	for k := range d.Z {
		lo = math.Min(lo, d.Z[k]-d.Radius[k])
		hi = math.Max(hi, d.Z[k]+d.Radius[k])
		amax = math.Max(amax, d.Radius[k])
	}
	ax := AxisMetrics(m, lo-1, hi+1, 2*amax)
	c := l.Dx / l.Dt
	out := &StreamingSummary{Periods: [2]int{first + 1, last}, JetPeakSpeed: ax.JetPeak * c,
		JetPeakZ: s.physicalZ(ax.JetPeakZ)}
	for _, z := range ax.Stagnation {
		out.StagnationPoints = append(out.StagnationPoints, s.physicalZ(z))
	}
	out.Below = AxisFlowReport{Velocity: ax.AxisFlowLow * c, Direction: direction(-ax.AxisFlowLow)}
	out.Above = AxisFlowReport{Velocity: ax.AxisFlowUp * c, Direction: direction(ax.AxisFlowUp)}
	series, err := output.CreateSeries(filepath.Join(dir, "metrics.csv"), []output.Column{
		{Name: "ring"}, {Name: "z_m"}, {Name: "r_m"}, {Name: "circulation_m2_s"}, {Name: "streamfunction_m3_s"}, {Name: "sense", Doc: "+1 counter-clockwise (positive vorticity), -1 clockwise"},
	})
	if err != nil {
		return nil, err
	}
	for i, r := range rings {
		rs := RingSummary{Z: s.physicalZ(r.Z), Rm: r.R * l.Dx, Circulation: r.Circulation * l.Dx * l.Dx / l.Dt,
			Psi: r.Psi * l.Dx * l.Dx * l.Dx / l.Dt, Sense: r.Sense}
		out.Rings = append(out.Rings, rs)
		sense := 1.0
		if r.Sense == "clockwise" {
			sense = -1
		}
		if err := series.Row(float64(i+1), rs.Z, rs.Rm, rs.Circulation, rs.Psi, sense); err != nil {
			series.Close()
			return nil, err
		}
	}
	if err := series.Close(); err != nil {
		return nil, err
	}
	return out, nil
}

// direction names the sense of an outward-positive velocity.
func direction(outward float64) string {
	switch {
	case outward > 0:
		return "away from the swimmer"
	case outward < 0:
		return "toward the swimmer"
	}
	return "none"
}

// ringString is a one-line description of a ring, for the terminal.
func (r RingSummary) String() string {
	return fmt.Sprintf("ring at z = %.3g mm, r = %.3g mm, circulation %.3g m^2/s (%s)", r.Z*1e3, r.Rm*1e3, r.Circulation, r.Sense)
}
