package model

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"

	"axiswim/cases"
)

// StokesSwimmer is the steady-Stokes estimate of how one swimmer of an
// arm-driven case swims (see [StokesChain]).
type StokesSwimmer struct {
	Swimmer int   `json:"swimmer"` // 1-based, in the order of the run summary
	Spheres []int `json:"spheres"` // 1-based
	// Speed is the mean velocity along z of the swimmer's centroid over a
	// period, m/s, in the point-force model with the Rotne–Prager
	// interaction.
	Speed float64 `json:"speed_m_s"`
	// LeadingOrder is the leading-order formula in a/L for three equal
	// spheres, V = K d1 d2 ω sin(φ1 − φ2) (see [ThreeSphereSpeed]); absent
	// for other swimmers.
	LeadingOrder *float64 `json:"leading_order_m_s,omitempty"`
	// InRange is true when the case is within the model's range: stroke
	// Reynolds number at most StokesMaxReynolds and unsteady number at
	// most StokesMaxUnsteady (see [Model]'s notes for the values).
	InRange bool `json:"in_range"`
}

const (
	// StokesMaxReynolds is the largest stroke Reynolds number ρ a d ω/μ
	// at which the chain model is compared without a caveat (common
	// practice for "much below 1").
	StokesMaxReynolds = 0.1
	// StokesMaxUnsteady is the largest ω L²/ν (L the longest arm) at which
	// it is: measured on the lattice for the three-sphere swimmer at
	// a/L = d/L = 0.1 (the study in the comment of verify's
	// threeSphereCase), ω L²/ν = 1 swims 0.8% slower than the quasi-steady
	// limit (0.25) and 4 swims 11% slower.
	StokesMaxUnsteady = 1.0
)

// stokesStepsPerPeriod is the number of fourth-order Runge–Kutta steps of
// the chain model per period: the stroke is a sinusoid, so the error
// (2π/N)⁴ is far below the model's own error, O((a/L)³).
const stokesStepsPerPeriod = 2000

// StokesChain estimates how the swimmers of c swim when the liquid's
// inertia plays no part: every sphere is a point force in unbounded liquid
// in steady Stokes flow, moved by its own drag and by the flow of the
// others, arms impose the distances of their pairs, and each swimmer is
// force-free. The velocity of sphere i is
//
//	u_i = F_i/(6π μ a_i) + Σ_j F_j/(4π μ r_ij) [1 − (a_i² + a_j²)/(3 r_ij²)],
//
// the axial component of the Rotne–Prager tensor for spheres of unequal
// radii on a line (Rotne & Prager 1969, J. Chem. Phys. 50, 4831; the
// Oseen tensor with its first finite-size correction, correct to
// O((a/r)³)),
// so for a swimmer of three spheres it reduces, to first order in a/L, to
// the result of [ThreeSphereSpeed]. The arm constraints and the force-free
// conditions give the forces at each instant; the positions are integrated
// over one period (fourth-order Runge–Kutta) from the configuration of the
// arms at t = 0, and each swimmer's speed is the displacement of its
// centroid over the period divided by the period.
//
// It applies only to cases driven by arms alone: not shaken, without
// springs, every arm stroking at one frequency; otherwise it returns an
// error saying why. Everything else (inertia, the unsteady Stokes layer,
// the container, lubrication) is left out; [Model]'s notes say what that
// means for a given case.
func StokesChain(c *cases.Case) ([]StokesSwimmer, error) {
	if len(c.Arms) == 0 {
		return nil, errors.New("no arm strokes")
	}
	if c.Shaken() {
		return nil, errors.New("the container is shaken: the swimmer swims by the liquid's inertia, outside steady Stokes flow")
	}
	if len(c.Springs) > 0 {
		return nil, errors.New("the case has springs: their spheres respond dynamically, which the chain model does not follow")
	}
	f := c.ArmFrequency(c.Arms[0])
	for _, a := range c.Arms[1:] {
		if fa := c.ArmFrequency(a); math.Abs(fa-f) > modelSameFrequency*f {
			return nil, fmt.Errorf("the arms stroke at different frequencies (%g and %g Hz): the stroke has no common period", f, fa)
		}
	}
	groups := cases.Swimmers(c)
	z, err := stokesStart(c, groups)
	if err != nil {
		return nil, err
	}
	m := stokesChain{c: c, omega: 2 * math.Pi * f, groups: groups}
	T := 1 / f
	start := make([]float64, len(groups))
	for g, gr := range groups {
		start[g] = meanOf(z, gr)
	}
	z, err = m.integrate(z, T, stokesStepsPerPeriod)
	if err != nil {
		return nil, err
	}
	re, un := stokesNumbers(c)
	zero := 0.0 // speeds below the integration's round-off are zero
	for _, a := range c.Arms {
		zero = math.Max(zero, 1e-12*a.Amplitude*m.omega)
	}
	out := make([]StokesSwimmer, len(groups))
	for g, gr := range groups {
		s := StokesSwimmer{Swimmer: g + 1, Speed: (meanOf(z, gr) - start[g]) / T,
			InRange: re <= StokesMaxReynolds && un <= StokesMaxUnsteady}
		if math.Abs(s.Speed) < zero {
			s.Speed = 0
		}
		for _, k := range gr {
			s.Spheres = append(s.Spheres, k+1)
		}
		if v, ok := threeSphereCase(c, gr, f); ok {
			s.LeadingOrder = &v
		}
		out[g] = s
	}
	return out, nil
}

// ThreeSphereSpeed is the mean speed of three equal spheres of radius a in
// steady Stokes flow whose arms have mean lengths L1, L2 and strokes
// d_k sin(ωt + φ_k), to leading order in a/L and in d/L:
//
//	V = K d1 d2 ω sin(φ1 − φ2),  K = (a/6) [1/L1² + 1/L2² − 1/(L1 + L2)²],
//
// positive along the chain from the first arm to the second. This is the
// three-sphere swimmer of Najafi & Golestanian (2004, Phys. Rev. E 69,
// 062901: citation from memory) in the form of Golestanian & Ajdari
// (2008, Phys. Rev. E 77, 036308). The coefficient is derived here, not copied: to zeroth order in
// a/L the spheres move with u_i = F_i/(6πμa), so u1 = −(2L1' + L2')/3,
// u2 = (L1' − L2')/3, u3 = (L1' + 2L2')/3; to first order the centroid
// moves with (a/2) Σ_j u_j S_j, S_j = Σ_{i≠j} 1/r_ij (the Oseen
// interaction 1/(4πμ r) relative to the drag 1/(6πμa) is 3a/(2r)), and the
// period average of its first-order part in d gives K. For equal arms
// K = 7a/(24 L²), the value we recall for these papers (from memory, not
// checked against them); TestThreeSphereSpeed checks that the chain model
// tends to it as a/L → 0.
func ThreeSphereSpeed(a, L1, L2, d1, d2, omega, phi1, phi2 float64) float64 {
	K := a / 6 * (1/(L1*L1) + 1/(L2*L2) - 1/((L1+L2)*(L1+L2)))
	return K * d1 * d2 * omega * math.Sin(phi1-phi2)
}

// threeSphereCase evaluates ThreeSphereSpeed for swimmer gr of c (sphere
// indices 0-based) when it is three equal spheres with an arm between the
// lower two and one between the upper two; ok is false otherwise.
func threeSphereCase(c *cases.Case, gr []int, f float64) (v float64, ok bool) {
	if len(gr) != 3 {
		return 0, false
	}
	k := slices.Clone(gr)
	slices.SortFunc(k, func(i, j int) int { return cmp.Compare(c.Spheres[i].Z, c.Spheres[j].Z) })
	a := c.Spheres[k[0]].Radius
	if c.Spheres[k[1]].Radius != a || c.Spheres[k[2]].Radius != a {
		return 0, false
	}
	find := func(p, q int) (cases.Arm, bool) {
		for _, arm := range c.Arms {
			s := [2]int{arm.Spheres[0] - 1, arm.Spheres[1] - 1}
			if s == [2]int{p, q} || s == [2]int{q, p} {
				return arm, true
			}
		}
		return cases.Arm{}, false
	}
	a1, ok1 := find(k[0], k[1])
	a2, ok2 := find(k[1], k[2])
	if !ok1 || !ok2 {
		return 0, false
	}
	deg := math.Pi / 180
	return ThreeSphereSpeed(a, a1.Length, a2.Length, a1.Amplitude, a2.Amplitude, 2*math.Pi*f,
		a1.Phase*deg, a2.Phase*deg), true
}

// stokesStart places the spheres as the arms have them at t = 0 (length
// L + d sin φ), each swimmer keeping the centroid the case gives it.
func stokesStart(c *cases.Case, groups [][]int) ([]float64, error) {
	n := len(c.Spheres)
	z := make([]float64, n)
	placed := make([]bool, n)
	deg := math.Pi / 180
	for _, gr := range groups {
		placed[gr[0]] = true
		z[gr[0]] = c.Spheres[gr[0]].Z
		for grown := true; grown; {
			grown = false
			for _, arm := range c.Arms {
				i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
				l := modelOrientation(c, arm.Spheres) * (arm.Length + arm.Amplitude*math.Sin(arm.Phase*deg))
				switch {
				case placed[i] && !placed[j]:
					z[j], placed[j], grown = z[i]+l, true, true
				case placed[j] && !placed[i]:
					z[i], placed[i], grown = z[j]-l, true, true
				case placed[i] && placed[j] && math.Abs(z[j]-z[i]-l) > 1e-9*math.Abs(l):
					return nil, fmt.Errorf("the arms of spheres %v close a loop: a chain on the axis has one arm between neighbours", arm.Spheres)
				}
			}
		}
		var shift float64
		for _, k := range gr {
			shift += c.Spheres[k].Z - z[k]
		}
		shift /= float64(len(gr))
		for _, k := range gr {
			z[k] += shift
		}
	}
	return z, nil
}

func meanOf(z []float64, idx []int) float64 {
	var s float64
	for _, k := range idx {
		s += z[k]
	}
	return s / float64(len(idx))
}

// stokesChain is the chain model's right-hand side.
type stokesChain struct {
	c      *cases.Case
	omega  float64
	groups [][]int
}

// velocities returns the sphere velocities at positions z and time t.
// Unknowns are the forces F; the equations are one arm constraint
// sg (u_j − u_i) = L'(t) per arm and one force-free condition per swimmer
// (as many as spheres: a tree of arms per swimmer), with u = M F.
func (m *stokesChain) velocities(z []float64, t float64) ([]float64, error) {
	c := m.c
	n := len(z)
	mu := c.Fluid.Viscosity
	M := mat.NewDense(n, n, nil)
	for i := range n {
		ai := c.Spheres[i].Radius
		for j := range n {
			if i == j {
				M.Set(i, i, 1/(6*math.Pi*mu*ai))
				continue
			}
			aj := c.Spheres[j].Radius
			r := math.Abs(z[i] - z[j])
			if r <= ai+aj {
				return nil, fmt.Errorf("spheres %d and %d overlap in the chain model at t = %.3g s", i+1, j+1, t)
			}
			M.Set(i, j, (1-(ai*ai+aj*aj)/(3*r*r))/(4*math.Pi*mu*r))
		}
	}
	A := mat.NewDense(n, n, nil)
	b := mat.NewVecDense(n, nil)
	row := 0
	deg := math.Pi / 180
	for _, arm := range c.Arms {
		i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
		sg := modelOrientation(c, arm.Spheres)
		for k := range n {
			A.Set(row, k, sg*(M.At(j, k)-M.At(i, k)))
		}
		b.SetVec(row, arm.Amplitude*m.omega*math.Cos(m.omega*t+arm.Phase*deg))
		row++
	}
	for _, gr := range m.groups {
		for _, k := range gr {
			A.Set(row, k, 1)
		}
		row++
	}
	if row != n {
		return nil, fmt.Errorf("%d arms and %d swimmers for %d spheres: a chain on the axis has one arm between neighbours", len(c.Arms), len(m.groups), n)
	}
	var F, u mat.VecDense
	if err := F.SolveVec(A, b); err != nil {
		return nil, fmt.Errorf("chain forces: %w", err)
	}
	u.MulVec(M, &F)
	return u.RawVector().Data, nil
}

// integrate advances z over time T in steps Runge–Kutta steps.
func (m *stokesChain) integrate(z []float64, T float64, steps int) ([]float64, error) {
	h := T / float64(steps)
	n := len(z)
	z = append([]float64(nil), z...)
	tmp := make([]float64, n)
	stage := func(t float64, base []float64, k []float64, s float64) ([]float64, error) {
		for i := range tmp {
			tmp[i] = base[i]
			if k != nil {
				tmp[i] += s * k[i]
			}
		}
		return m.velocities(tmp, t)
	}
	for step := range steps {
		t := float64(step) * h
		k1, err := stage(t, z, nil, 0)
		if err != nil {
			return nil, err
		}
		k2, err := stage(t+h/2, z, k1, h/2)
		if err != nil {
			return nil, err
		}
		k3, err := stage(t+h/2, z, k2, h/2)
		if err != nil {
			return nil, err
		}
		k4, err := stage(t+h, z, k3, h)
		if err != nil {
			return nil, err
		}
		for i := range z {
			z[i] += h / 6 * (k1[i] + 2*k2[i] + 2*k3[i] + k4[i])
		}
	}
	return z, nil
}

// stokesNumbers returns the largest stroke Reynolds number ρ a d ω/μ and
// the largest unsteady number ω L²/ν of the arms of c (cases.ArmGroups).
func stokesNumbers(c *cases.Case) (re, unsteady float64) {
	for _, g := range c.ArmGroups(nil) {
		re, unsteady = math.Max(re, g.Re), math.Max(unsteady, g.Unsteady)
	}
	return re, unsteady
}

// stokesNotes says when the chain model's speeds apply to c: the stroke
// Reynolds number and the unsteady number ω L²/ν well below 1, and a
// container many swimmer lengths across.
func stokesNotes(c *cases.Case) string {
	re, s := stokesNumbers(c)
	span := 0.0
	for _, gr := range cases.Swimmers(c) {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, k := range gr {
			lo = math.Min(lo, c.Spheres[k].Z-c.Spheres[k].Radius)
			hi = math.Max(hi, c.Spheres[k].Z+c.Spheres[k].Radius)
		}
		span = math.Max(span, hi-lo)
	}
	verdict := "within its range"
	if re > StokesMaxReynolds || s > StokesMaxUnsteady {
		verdict = fmt.Sprintf("OUTSIDE its range (Reynolds number above %g or omega L^2/nu above %g): the liquid's inertia changes the speed", StokesMaxReynolds, StokesMaxUnsteady)
	}
	return fmt.Sprintf("swimming speeds in steady Stokes flow (stokes_swimming): point forces with the Rotne-Prager interaction in unbounded liquid (Rotne & Prager 1969), and for three equal spheres the leading order in a/L (Golestanian & Ajdari 2008); they need the stroke Reynolds number rho a d omega/mu (here %.3g) and omega L^2/nu (here %.3g) well below 1 and a container many swimmer lengths across (here %.3g m across a swimmer of %.3g m): %s",
		re, s, 2*c.Container.Radius, span, verdict)
}
