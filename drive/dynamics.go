package drive

import (
	"fmt"
	"math"
)

// SpringLink is a spring with a dashpot between bodies I and J (lattice
// units): force K (d - L0) + C d', d = |Z_J - Z_I|, pulling them together
// when stretched.
type SpringLink struct {
	I, J     int
	K, L0, C float64
}

// Dynamics advances rigid spheres along the axis (lattice units, dt = 1).
// Velocities live at half steps and positions at whole steps (kick-drift
// leapfrog, METHODS.md 9.2); dashpots are trapezoidal and implicit
// (METHODS.md 9.3); the hydrodynamic force is stabilised for light spheres
// by the virtual-mass scheme of Schwarz, Kempe & Froehlich 2015
// (J. Comput. Phys. 281, 591; METHODS.md 8.2): a virtual mass m_V = C_V
// rho_f Vol is added to both sides, implicitly on the left and with the
// previous acceleration on the right,
//
//	(m + m_V)(V^{n+3/2} - V^{n+1/2}) = F^{n+1} + m_V (V^{n+1/2} - V^{n-1/2}),
//
// which turns the explicit scheme's amplification m_A/m of the added-mass
// response (unstable for density ratios below C_A = 1/2, METHODS.md 8.1)
// into (m_V - m_A)/(m + m_V), stable for C_V > (C_A - rho_p/rho_f)/2.
type Dynamics struct {
	Mass   []float64 // m_k
	Volume []float64 // Vol_k (liquid density 1, so rho_f Vol_k in mass units)
	Radius []float64
	// Virtual is m_V of each body (0 for plain explicit coupling).
	Virtual []float64
	Springs []SpringLink
	Arms    []ArmLink

	// Repulsion keeps spheres apart and off closed ends: a force
	// RepulsionScale ((range - g)/range)^2 for a gap g below
	// RepulsionRange (Glowinski, Pan, Hesla & Joseph 1999, Int. J.
	// Multiphase Flow 25, 755, and Glowinski et al. 2001, J. Comput. Phys.
	// 169, 363: their short-range repulsive force between particles and
	// with walls).
	RepulsionRange, RepulsionScale float64
	// Ends are the closed end walls (z = Ends[0] and z = Ends[1]); NaN
	// for periodic ends.
	Ends [2]float64

	Z     []float64 // positions at t_n
	V     []float64 // velocities V^{n+1/2}
	VPrev []float64 // V^{n-1/2}

	groups []armGroup // bodies joined by arms
	free   []int      // bodies not in an arm group
	work   dynWork    // scratch of Step
}

// dynWork is the scratch space of Dynamics.Step, kept so that a step
// allocates nothing: per body the forces, right-hand side, masses, new
// velocities and membership of the free set; the n x n dashpot matrix;
// the system restricted to the m free bodies and its solution.
type dynWork struct {
	spring, rhs, mhat, next []float64
	inFree                  []bool
	mat                     [][]float64
	a                       [][]float64
	b, sol                  []float64
}

// size makes the scratch fit n bodies, m of them free.
func (w *dynWork) size(n, m int) {
	if len(w.rhs) == n && len(w.b) == m {
		return
	}
	w.spring, w.rhs, w.mhat, w.next = make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	w.inFree = make([]bool, n)
	w.mat = square(n)
	w.a = square(m)
	w.b, w.sol = make([]float64, m), make([]float64, m)
}

// square returns an n x n matrix whose rows share one allocation.
func square(n int) [][]float64 {
	back := make([]float64, n*n)
	m := make([][]float64, n)
	for k := range m {
		m[k] = back[k*n : (k+1)*n : (k+1)*n]
	}
	return m
}

// ArmLink prescribes the distance of bodies I and J: Z_J - Z_I =
// Sign * Length(t), t in lattice steps.
type ArmLink struct {
	I, J   int
	Sign   float64
	Length func(t float64) float64
}

// armGroup is a tree of bodies joined by arms: Root moves with the group's
// momentum, every other member at a prescribed offset from it.
type armGroup struct {
	root    int
	members []int
	offset  []func(t float64) float64 // Z_member - Z_root
}

// Init prepares the groups of arms; call it once the fields are set.
func (d *Dynamics) Init() error {
	n := len(d.Mass)
	for _, s := range [][]float64{d.Volume, d.Radius, d.Virtual, d.Z, d.V} {
		if len(s) != n {
			return fmt.Errorf("dynamics: %d bodies but a field of length %d", n, len(s))
		}
	}
	if d.VPrev == nil {
		d.VPrev = append([]float64(nil), d.V...)
	}
	adj := make([][]int, n)
	for a, arm := range d.Arms {
		adj[arm.I] = append(adj[arm.I], a)
		adj[arm.J] = append(adj[arm.J], a)
	}
	seen := make([]bool, n)
	for k := 0; k < n; k++ {
		if seen[k] {
			continue
		}
		if len(adj[k]) == 0 {
			seen[k] = true
			d.free = append(d.free, k)
			continue
		}
		g := armGroup{root: k}
		type item struct {
			body int
			off  func(float64) float64
		}
		queue := []item{{k, func(float64) float64 { return 0 }}}
		seen[k] = true
		for len(queue) > 0 {
			it := queue[0]
			queue = queue[1:]
			g.members = append(g.members, it.body)
			g.offset = append(g.offset, it.off)
			for _, a := range adj[it.body] {
				arm := d.Arms[a]
				other, sign := arm.J, arm.Sign
				if other == it.body {
					other, sign = arm.I, -arm.Sign
				}
				if seen[other] {
					continue
				}
				seen[other] = true
				base, length := it.off, arm.Length
				queue = append(queue, item{other, func(t float64) float64 { return base(t) + sign*length(t) }})
			}
		}
		d.groups = append(d.groups, g)
	}
	return nil
}

// forces stores in f (len(z) values) the spring and repulsion forces on
// every body at the positions z, without the dashpots.
func (d *Dynamics) forces(f, z []float64) {
	clear(f)
	for _, s := range d.Springs {
		dz := z[s.J] - z[s.I]
		dist := math.Abs(dz)
		dir := math.Copysign(1, dz)
		t := s.K * (dist - s.L0) * dir // pulls I toward J when stretched
		f[s.I] += t
		f[s.J] -= t
	}
	if d.RepulsionScale > 0 && d.RepulsionRange > 0 {
		rr := d.RepulsionRange
		push := func(g float64) float64 {
			if g >= rr {
				return 0
			}
			x := (rr - g) / rr
			return d.RepulsionScale * x * x
		}
		for i := range z {
			for j := i + 1; j < len(z); j++ {
				dz := z[j] - z[i]
				g := math.Abs(dz) - d.Radius[i] - d.Radius[j]
				p := push(g) * math.Copysign(1, dz)
				f[i] -= p
				f[j] += p
			}
			if !math.IsNaN(d.Ends[0]) {
				f[i] += push(z[i] - d.Radius[i] - d.Ends[0])
				f[i] -= push(d.Ends[1] - z[i] - d.Radius[i])
			}
		}
	}
}

// Step advances the bodies from t_n to t_{n+1}: fh[k] is the hydrodynamic
// force of the step just taken (centred at t_{n+1/2}), ext[k] the frame,
// gravity and buoyancy force at t_{n+1}, t the time t_{n+1} in steps (for
// the arms). On return Z holds Z^{n+1} and V holds V^{n+3/2}.
func (d *Dynamics) Step(fh, ext []float64, t float64) {
	n := len(d.Z)
	for k := 0; k < n; k++ {
		d.Z[k] += d.V[k]
	}
	w := &d.work
	w.size(n, len(d.free))
	spring, rhs, mhat, next := w.spring, w.rhs, w.mhat, w.next
	d.forces(spring, d.Z)
	for k := 0; k < n; k++ {
		mhat[k] = d.Mass[k] + d.Virtual[k]
		acc := d.V[k] - d.VPrev[k]
		rhs[k] = mhat[k]*d.V[k] + fh[k] + ext[k] + spring[k] + d.Virtual[k]*acc
	}
	clear(next)
	// Dashpots: trapezoidal, implicit among free bodies; explicit (old
	// relative velocity) where an arm group is involved.
	inFree := w.inFree
	clear(inFree)
	for _, k := range d.free {
		inFree[k] = true
	}
	mat := w.mat
	for k := range mat {
		clear(mat[k])
		mat[k][k] = mhat[k]
	}
	for _, s := range d.Springs {
		if s.C == 0 {
			continue
		}
		dv := d.V[s.J] - d.V[s.I]
		if inFree[s.I] && inFree[s.J] {
			g := s.C / 2
			mat[s.I][s.I] += g
			mat[s.J][s.J] += g
			mat[s.I][s.J] -= g
			mat[s.J][s.I] -= g
			rhs[s.I] += g * dv
			rhs[s.J] -= g * dv
		} else {
			rhs[s.I] += s.C * dv
			rhs[s.J] -= s.C * dv
		}
	}
	// Free bodies: solve the (small) linear system restricted to them.
	if len(d.free) > 0 {
		a, b := w.a, w.b
		for x, k := range d.free {
			for y, l := range d.free {
				a[x][y] = mat[k][l]
			}
			b[x] = rhs[k]
		}
		sol := solveDense(w.sol, a, b)
		for x, k := range d.free {
			next[k] = sol[x]
		}
	}
	// Arm groups: the root takes the group's momentum balance, the others
	// follow their prescribed offsets; velocities over the next step are
	// the exact differences of the offsets, so the distances hold exactly.
	for _, g := range d.groups {
		var ptot, mtot float64
		for x, k := range g.members {
			w := g.offset[x](t+1) - g.offset[x](t)
			ptot += rhs[k] - mhat[k]*w
			mtot += mhat[k]
		}
		vr := ptot / mtot
		for x, k := range g.members {
			next[k] = vr + g.offset[x](t+1) - g.offset[x](t)
		}
	}
	copy(d.VPrev, d.V)
	copy(d.V, next)
}

// Energy returns the kinetic energy (velocities averaged to t_n) and the
// spring energy at t_n.
func (d *Dynamics) Energy() (kinetic, spring float64) {
	for k := range d.Z {
		v := 0.5 * (d.V[k] + d.VPrev[k])
		kinetic += 0.5 * d.Mass[k] * v * v
	}
	for _, s := range d.Springs {
		e := math.Abs(d.Z[s.J]-d.Z[s.I]) - s.L0
		spring += 0.5 * s.K * e * e
	}
	return
}

// solveDense solves a x = b by Gaussian elimination with partial pivoting
// into x (len(b) values) and returns it; a and b are overwritten (the rows
// of a swapped).
func solveDense(x []float64, a [][]float64, b []float64) []float64 {
	n := len(b)
	for c := 0; c < n; c++ {
		p := c
		for r := c + 1; r < n; r++ {
			if math.Abs(a[r][c]) > math.Abs(a[p][c]) {
				p = r
			}
		}
		a[c], a[p] = a[p], a[c]
		b[c], b[p] = b[p], b[c]
		for r := c + 1; r < n; r++ {
			f := a[r][c] / a[c][c]
			for k := c; k < n; k++ {
				a[r][k] -= f * a[c][k]
			}
			b[r] -= f * b[c]
		}
	}
	for r := n - 1; r >= 0; r-- {
		s := b[r]
		for k := r + 1; k < n; k++ {
			s -= a[r][k] * x[k]
		}
		x[r] = s / a[r][r]
	}
	return x
}
