// Package flow analyses a mean (period-averaged) flow field: its vortex
// rings (extrema of the Stokes streamfunction with their circulation), the
// stagnation points and the jet on the axis, and the direction of the mean
// flow beyond the swimmer, in lattice units (FindRings, AxisMetrics) and as
// an SI summary (Measure). It needs only fields.
package flow
