package drive

import (
	"fmt"
	"math"

	"axiswim/cases"
	"axiswim/geometry"
)

// swimmer holds the free bodies of a simulation: their shapes on the
// lattice, their dynamics and the mass keeper.
type swimmer struct {
	bodies *Bodies
	dyn    *Dynamics
	mass   *MassKeeper
	fh     []float64       // scratch: hydrodynamic forces
	ext    []float64       // scratch: frame, gravity and buoyancy forces
	local  []float64       // scratch: centres in the bodies' lattice's cells (Simulation.zoff)
	nodes  []geometry.Node // scratch: the nodes of a body (bodyVelocity)
}

// massCadence is the step cadence of the global mass correction: one
// measurement and one correction pass per 200 steps cost about 1% of the
// run.
const massCadence = 200

// setupBodies places the spheres of the case on the lattice and prepares
// their dynamics (lattice units: cell size, step and liquid density 1).
func (s *Simulation) setupBodies() error {
	c, l := s.Case, s.Lattice
	if len(c.Spheres) == 0 {
		return nil
	}
	n := len(c.Spheres)
	shapes := make([]geometry.Sphere, n)
	d := &Dynamics{
		Mass: make([]float64, n), Volume: make([]float64, n), Radius: make([]float64, n),
		Virtual: make([]float64, n), Z: make([]float64, n), V: make([]float64, n),
	}
	off := float64(s.zoff())
	cv := c.Bodies.VirtualMass
	if c.Bodies.Coupling == cases.CouplingExplicit {
		cv = 0
	}
	for k, sp := range c.Spheres {
		a := l.Distance(sp.Radius)
		vol := 4.0 / 3 * math.Pi * a * a * a
		d.Z[k] = l.Z(sp.Z)
		shapes[k] = geometry.Sphere{Z: d.Z[k] - off, Radius: a}
		d.Radius[k], d.Volume[k] = a, vol
		d.Mass[k] = sp.Density / c.Fluid.Density * vol
		d.Virtual[k] = cv * vol
	}
	for _, sp := range c.Springs {
		d.Springs = append(d.Springs, SpringLink{I: sp.Spheres[0] - 1, J: sp.Spheres[1] - 1,
			K: l.Stiffness(sp.Stiffness), L0: l.Distance(sp.RestLength), C: l.Damping(sp.Damping)})
	}
	for _, arm := range c.Arms {
		i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
		sign := math.Copysign(1, c.Spheres[j].Z-c.Spheres[i].Z)
		length := s.armLength(arm)
		d.Arms = append(d.Arms, ArmLink{I: i, J: j, Sign: sign, Length: length})
	}
	// Start on the prescribed arm lengths, at rest otherwise.
	if err := d.Init(); err != nil {
		return err
	}
	for _, g := range d.groups {
		for x, k := range g.members {
			d.Z[k] = d.Z[g.root] + g.offset[x](0)
			shapes[k].Z = d.Z[k] - off
			d.V[k] = g.offset[x](1) - g.offset[x](0)
		}
	}
	copy(d.VPrev, d.V)
	d.Ends = [2]float64{math.NaN(), math.NaN()}
	if !s.FrameOnLiquid {
		d.Ends = [2]float64{0, float64(l.Nz)}
	}
	d.RepulsionRange = c.Bodies.RepulsionRange
	d.RepulsionScale = s.repulsionScale(d)
	bs, err := NewBodies(s.Fluid, shapes, d.V)
	if err != nil {
		return fmt.Errorf("place the spheres: %w", err)
	}
	var keeper *MassKeeper
	if s.lv != nil {
		// kept at level 0's steps (onLevels.advance), at the same cadence
		// in time
		keeper = NewMassKeeper(s.lv.h, max(1, massCadence/s.lv.stride))
	} else {
		keeper = NewMassKeeper(s.Fluid, massCadence)
	}
	s.sw = &swimmer{bodies: bs, dyn: d, mass: keeper,
		fh: make([]float64, n), ext: make([]float64, n), local: make([]float64, n)}
	return nil
}

// armLength returns the prescribed arm length in cells as a function of
// lattice time: length + s(t) amplitude sin(2 pi f t + phase), with the
// drive's ramp s.
func (s *Simulation) armLength(arm cases.Arm) func(float64) float64 {
	l := s.Lattice
	w := 2 * math.Pi * arm.Frequency
	ph := arm.Phase * math.Pi / 180
	ramp := Shaker{Amplitude: 1, Ramp: s.Case.Shaking.RampPeriods / arm.Frequency}
	return func(t float64) float64 {
		ts := l.TimeSI(t)
		r, _, _ := ramp.ramp(ts)
		return l.Distance(arm.Length + r*arm.Amplitude*math.Sin(w*ts+ph))
	}
}

// repulsionScale is the strength of the short-range repulsion: ten times
// the largest force that can push a sphere toward another or a wall, the
// frame and gravity force on its mass plus the liquid it displaces, so that
// a gap closes to at most about a third of the range before it holds.
func (s *Simulation) repulsionScale(d *Dynamics) float64 {
	l := s.Lattice
	acc := l.Acceleration(s.Shaker.Amplitude*s.Shaker.Omega*s.Shaker.Omega + math.Abs(s.Case.Shaking.Gravity))
	var f float64
	for k := range d.Mass {
		f = math.Max(f, (d.Mass[k]+d.Volume[k])*acc)
	}
	for _, sp := range d.Springs {
		f = math.Max(f, sp.K*d.Radius[sp.I])
	}
	if f == 0 {
		f = 6 * math.Pi * l.NuL * d.Radius[0] * l.Velocity(l.RefVelocity)
	}
	return 10 * f
}

// frameForce returns the frame, gravity and buoyancy force on body k at
// time t (seconds), lattice units. In a closed container the liquid is
// unforced (modified pressure) and the body gets -(m - rho_f Vol)(a + g);
// with periodic ends the liquid carries its share as a body force and the
// body gets -m (a + g) (METHODS.md 4.2-4.3, eq. 4.1).
func (s *Simulation) frameForce(k int, t float64) float64 {
	d := s.sw.dyn
	acc := s.Lattice.Acceleration(s.Shaker.Acceleration(t) + s.Case.Shaking.Gravity)
	m := d.Mass[k]
	if !s.FrameOnLiquid {
		m -= d.Volume[k]
	}
	return -m * acc
}

// stepBodies advances the bodies after the lattice step that ended at
// step n (time t_n): collect the forces, move, rebuild the geometry, keep
// the mass.
func (s *Simulation) stepBodies(n int64) error {
	sw := s.sw
	sw.bodies.Collect()
	t := float64(n) * s.Lattice.Dt
	for k, b := range sw.bodies.List {
		sw.fh[k] = b.Force()
		sw.ext[k] = s.frameForce(k, t)
	}
	sw.dyn.Step(sw.fh, sw.ext, float64(n))
	for k := range sw.bodies.List {
		v := sw.dyn.V[k]
		if math.IsNaN(v) || math.Abs(v) >= 0.5 {
			return &GuardError{Time: t, Diagnosis: fmt.Sprintf("sphere %d moves %.3g cells per step at t = %.6g s (the wall CFL limit is 0.5): %s",
				k+1, v, t, s.instabilityRemedy())}
		}
	}
	off := float64(s.zoff())
	for k, z := range sw.dyn.Z {
		sw.local[k] = z - off
	}
	if err := sw.bodies.MoveAll(sw.local, sw.dyn.V); err != nil {
		return fmt.Errorf("t = %.6g s: %w", t, err)
	}
	if g, i, j := s.smallestGap(); g < 1 {
		what := fmt.Sprintf("spheres %d and %d", i+1, j+1)
		if j < 0 {
			what = fmt.Sprintf("sphere %d and an end wall", i+1)
		}
		return &GuardError{Time: t, Diagnosis: fmt.Sprintf("the gap between %s closed to %.2f cells at t = %.6g s: lubrication is unresolved "+
			"(raise bodies.repulsion_range, stiffen the spring, or raise grid.cells_per_radius)", what, g, t)}
	}
	if s.lv == nil {
		sw.mass.Step(s.Fluid)
	}
	return nil
}

// smallestGap returns the smallest gap in cells between two spheres (j >= 0)
// or between a sphere and a closed end (j = -1).
func (s *Simulation) smallestGap() (g float64, i, j int) {
	d := s.sw.dyn
	g, i, j = math.Inf(1), -1, -1
	for a := range d.Z {
		for b := a + 1; b < len(d.Z); b++ {
			if x := math.Abs(d.Z[b]-d.Z[a]) - d.Radius[a] - d.Radius[b]; x < g {
				g, i, j = x, a, b
			}
		}
		if !math.IsNaN(d.Ends[0]) {
			if x := math.Min(d.Z[a]-d.Radius[a]-d.Ends[0], d.Ends[1]-d.Z[a]-d.Radius[a]); x < g {
				g, i, j = x, a, -1
			}
		}
	}
	return
}

// Spheres returns the number of spheres.
func (s *Simulation) Spheres() int {
	if s.sw == nil {
		return 0
	}
	return len(s.sw.dyn.Z)
}

// SphereState returns sphere k's centre (m, container frame), its velocity
// at the current time (m/s, the mean of the half-step velocities) and the
// hydrodynamic force of the last step (N).
func (s *Simulation) SphereState(k int) (z, v, f float64) {
	d, l := s.sw.dyn, s.Lattice
	z = s.Lattice.ZSI(d.Z[k])
	v = l.VelocitySI(0.5 * (d.V[k] + d.VPrev[k]))
	f = l.Force3DSI(s.sw.bodies.List[k].Force())
	return
}

// SpringExtension returns the extension |Z_j - Z_i| - L0 of spring k (m).
func (s *Simulation) SpringExtension(k int) float64 {
	sp := s.sw.dyn.Springs[k]
	d := s.sw.dyn
	return (math.Abs(d.Z[sp.J]-d.Z[sp.I]) - sp.L0) * s.Lattice.Dx
}

// Centroid returns the mean of the sphere centres (m, container frame).
func (s *Simulation) Centroid() float64 {
	var c float64
	for _, z := range s.sw.dyn.Z {
		c += z
	}
	return s.Lattice.ZSI(c / float64(len(s.sw.dyn.Z)))
}

// MassDrift returns the largest relative drift of the liquid's mean
// density between corrections and the sum of the corrections applied.
func (s *Simulation) MassDrift() (drift, applied float64) {
	if s.sw == nil {
		return 0, 0
	}
	return s.sw.mass.Drift, s.sw.mass.Applied
}

// Springs returns the number of springs.
func (s *Simulation) Springs() int {
	if s.sw == nil {
		return 0
	}
	return len(s.sw.dyn.Springs)
}

// SphereCells returns sphere k's centre and radius in lattice units (the
// lattice coordinate of Cases.Lattice.Z, cells).
func (s *Simulation) SphereCells(k int) (z, radius float64) {
	return s.sw.dyn.Z[k], s.sw.dyn.Radius[k]
}
