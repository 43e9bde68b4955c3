package flow

import (
	"fmt"

	"axiswim/cases"
	"axiswim/lbm"
)

// Streaming describes the mean (period-averaged) flow: its vortex rings,
// the stagnation points and the jet on the axis, and the direction of the
// mean flow on the axis on each side of the swimmer. SI units, container
// frame.
type Streaming struct {
	Periods          [2]int        `json:"periods"` // averaged over periods first..last (1-based)
	Rings            []RingSummary `json:"vortex_rings"`
	StagnationPoints []float64     `json:"axis_stagnation_points_m"`
	JetPeakSpeed     float64       `json:"jet_peak_mean_speed_m_s"` // signed, along +z
	JetPeakZ         float64       `json:"jet_peak_z_m"`
	Below            AxisFlow      `json:"axis_flow_below"`
	Above            AxisFlow      `json:"axis_flow_above"`
}

// RingSummary is one vortex ring of the mean flow, SI units.
type RingSummary struct {
	Z           float64 `json:"z_m"`
	Rm          float64 `json:"r_m"`
	Circulation float64 `json:"circulation_m2_s"`
	Psi         float64 `json:"streamfunction_m3_s"`
	Sense       string  `json:"sense"`
}

// AxisFlow is the mean axial flow on the axis just beyond the swimmer,
// averaged over one largest-sphere diameter.
type AxisFlow struct {
	Velocity  float64 `json:"mean_velocity_m_s"`
	Direction string  `json:"direction"` // "away from the swimmer" or "toward the swimmer"
}

// Span is where the swimmer lies on the axis, lattice coordinates: its
// lowest and highest surface points and its largest sphere radius.
type Span struct{ Lo, Hi, MaxRadius float64 }

// Measure finds the vortex rings and the axis metrics of the mean field
// mf (lattice units, mask marking the nodes a body covered) around a
// swimmer spanning sp, and converts them to SI units with l. The
// vorticity is that of the container frame (frameOnLiquid as in
// lbm.Vorticity); first and last are the averaged periods (0-based first,
// 1-based last).
func Measure(mf *lbm.Fields, mask []bool, frameOnLiquid bool, sp Span, l *cases.Lattice, first, last int) *Streaming {
	m := &MeanField{Nz: mf.Nz, Nr: mf.Nr, Uz: mf.Uz, Ur: mf.Ur, Rho: mf.Rho, Solid: mask}
	psi := lbm.Streamfunction(mf)
	om := lbm.Vorticity(mf, frameOnLiquid)
	rings := FindRings(m, psi, om, 0.05)
	ax := AxisMetrics(m, sp.Lo-1, sp.Hi+1, 2*sp.MaxRadius)
	out := &Streaming{Periods: [2]int{first + 1, last}, JetPeakSpeed: l.VelocitySI(ax.JetPeak),
		JetPeakZ: l.ZSI(ax.JetPeakZ)}
	for _, z := range ax.Stagnation {
		out.StagnationPoints = append(out.StagnationPoints, l.ZSI(z))
	}
	out.Below = AxisFlow{Velocity: l.VelocitySI(ax.AxisFlowLow), Direction: direction(-ax.AxisFlowLow)}
	out.Above = AxisFlow{Velocity: l.VelocitySI(ax.AxisFlowUp), Direction: direction(ax.AxisFlowUp)}
	for _, r := range rings {
		out.Rings = append(out.Rings, RingSummary{Z: l.ZSI(r.Z), Rm: l.DistanceSI(r.R),
			Circulation: l.CirculationSI(r.Circulation), Psi: l.StreamfunctionSI(r.Psi), Sense: r.Sense})
	}
	return out
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

// String is a one-line description of a ring, for the terminal.
func (r RingSummary) String() string {
	return fmt.Sprintf("ring at z = %.3g mm, r = %.3g mm, circulation %.3g m^2/s (%s)", r.Z*1e3, r.Rm*1e3, r.Circulation, r.Sense)
}

// SenseSign is +1 for a counter-clockwise ring (positive vorticity), -1
// for a clockwise one.
func (r RingSummary) SenseSign() float64 {
	if r.Sense == "clockwise" {
		return -1
	}
	return 1
}
