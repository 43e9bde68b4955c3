package record

import (
	"axiswim/cases"
	"axiswim/drive"
	"axiswim/lbm"
	"axiswim/output"
)

// vtkGrid is the node grid of the lattice l in the container frame, metres.
func vtkGrid(l *cases.Lattice) output.Grid {
	return output.Grid{Nz: l.Nz, Nr: l.Nr, Z0: l.ZSI(0.5), R0: l.DistanceSI(0.5), Spacing: l.Dx}
}

// vtkFields converts lattice fields (with the nodes of solid marked) to
// the SI fields of a VTK file: velocity (u_z, u_r, 0) in m/s, pressure
// relative to the rest state in Pa (in a closed container the modified
// pressure, without the hydrostatic and frame parts), azimuthal vorticity
// in 1/s, Stokes streamfunction in m^3/s, and the solid mask (1 inside a
// body, whose velocity there is the body's).
func vtkFields(s *drive.Simulation, f *lbm.Fields, solid []bool) []output.Field {
	return vtkFieldsOn(s.View(), s.FrameOnLiquid, f, solid, s.BodyVelocity(nil, solid))
}

// vtkFieldsOn is vtkFields for fields on the nodes of lattice l (a level
// of refined levels, or the simulation's View), body the velocity of the
// bodies at the solid nodes (nil: at rest in the container frame).
func vtkFieldsOn(l *cases.Lattice, frameOnLiquid bool, f *lbm.Fields, solid []bool, body []float64) []output.Field {
	n := f.Nz * f.Nr
	clean := &lbm.Fields{Nz: f.Nz, Nr: f.Nr, Uz: make([]float64, n), Ur: make([]float64, n), Rho: make([]float64, n)}
	for i := 0; i < n; i++ {
		if solid[i] {
			clean.Rho[i] = 1 // rigid motion inside a body
			if body != nil {
				clean.Uz[i] = body[i]
			}
			continue
		}
		clean.Uz[i], clean.Ur[i], clean.Rho[i] = f.Uz[i], f.Ur[i], f.Rho[i]
	}
	vel := make([]float64, 3*n)
	p := make([]float64, n)
	mask := make([]float64, n)
	for i := 0; i < n; i++ {
		vel[3*i], vel[3*i+1] = l.VelocitySI(clean.Uz[i]), l.VelocitySI(clean.Ur[i])
		p[i] = l.PressureSI(clean.Rho[i])
		if solid[i] {
			mask[i] = 1
		}
	}
	om := lbm.Vorticity(clean, frameOnLiquid)
	psi := lbm.Streamfunction(clean)
	for i := range om {
		om[i] = l.RateSI(om[i])
		psi[i] = l.StreamfunctionSI(psi[i])
	}
	return []output.Field{
		{Name: "velocity", Components: 3, Data: vel, RParity: -1},
		{Name: "pressure", Components: 1, Data: p, RParity: 1},
		{Name: "vorticity", Components: 1, Data: om, RParity: -1},
		{Name: "streamfunction", Components: 1, Data: psi, RParity: 1},
		{Name: "solid", Components: 1, Data: mask, RParity: 1},
	}
}
