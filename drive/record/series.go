package record

import (
	"fmt"

	"axiswim/drive"
	"axiswim/output"
)

// SeriesColumns returns the columns of series.csv for sim.
func SeriesColumns(sim *drive.Simulation) []output.Column {
	cols := []output.Column{
		{Name: "time_s", Doc: "physical time"},
		{Name: "drive_displacement_m", Doc: "container displacement X(t) in the laboratory"},
	}
	for k := 0; k < sim.Spheres(); k++ {
		cols = append(cols,
			output.Column{Name: fmt.Sprintf("sphere%d_z_m", k+1), Doc: "centre, container frame"},
			output.Column{Name: fmt.Sprintf("sphere%d_velocity_m_s", k+1), Doc: "velocity, container frame"},
			output.Column{Name: fmt.Sprintf("sphere%d_force_N", k+1), Doc: "hydrodynamic force (modified pressure in closed containers)"})
	}
	if sim.Spheres() > 0 {
		for k := range sim.Springs() {
			cols = append(cols, output.Column{Name: fmt.Sprintf("spring%d_extension_m", k+1), Doc: "length minus rest length"})
		}
		cols = append(cols, output.Column{Name: "centroid_m", Doc: "mean of the sphere centres, container frame"})
		if sw := sim.Swimmers(); len(sw) > 1 {
			for g := range sw {
				cols = append(cols, output.Column{Name: fmt.Sprintf("swimmer%d_centroid_m", g+1),
					Doc: fmt.Sprintf("mean centre of swimmer %d (spheres %s), container frame", g+1, sphereList(sw[g]))})
			}
		}
	}
	return append(cols,
		output.Column{Name: "max_speed_m_s", Doc: "largest liquid speed in the container frame"},
		output.Column{Name: "mach", Doc: "largest lattice speed over the lattice sound speed"},
		output.Column{Name: "mass_drift", Doc: "relative change of the liquid's mass (3D, lattice)"})
}

// SeriesRow appends to row[:0] the row of series.csv for the observation
// o of sim, in the order of SeriesColumns, and returns it.
func SeriesRow(row []float64, sim *drive.Simulation, o drive.Observation) []float64 {
	row = append(row[:0], o.Time, o.DriveDisplacement)
	for k := 0; k < sim.Spheres(); k++ {
		z, v, f := sim.SphereState(k)
		row = append(row, z, v, f)
	}
	if sim.Spheres() > 0 {
		for k := range sim.Springs() {
			row = append(row, sim.SpringExtension(k))
		}
		row = append(row, sim.Centroid())
		if sw := sim.Swimmers(); len(sw) > 1 {
			for _, g := range sw {
				row = append(row, sim.SwimmerCentroid(g))
			}
		}
	}
	return append(row, o.MaxSpeed, o.Mach, o.MassDrift)
}
