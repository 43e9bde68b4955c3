package model

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"axiswim/cases"
)

// ModelResult is the steady periodic response of a case in the reduced
// linear model of [Model], at the fundamental frequency. Amplitudes are in
// metres; phases are in degrees against the drive displacement
// A sin(Omega t) (positive: ahead of it). Without shaking the reference is
// sin(Omega t) at the stroke frequency.
type Result struct {
	Omega          float64  `json:"omega"`           // rad/s
	DriveAmplitude float64  `json:"drive_amplitude"` // A, m (0 without shaking)
	Spheres        []Sphere `json:"spheres"`
	Springs        []Spring `json:"springs"`
	Arms           []Arm    `json:"arms"`
	// Stokes is how each swimmer of a case driven by arms alone swims in
	// steady Stokes flow (StokesChain); absent for other cases.
	Stokes []StokesSwimmer `json:"stokes_swimming,omitempty"`
	// Notes say what the model leaves out, and what it could not do
	// (static extensions that springs cannot hold, for instance).
	Notes []string `json:"notes"`
}

// ModelSphere is the response of one sphere.
type Sphere struct {
	Sphere int `json:"sphere"` // 1-based
	// Amplitude and Phase are those of the sphere's displacement relative
	// to the container.
	Amplitude float64 `json:"amplitude"`
	Phase     float64 `json:"phase"`
	// RadiusOverDelta is a/δ, δ = √(2ν/ω): the parameter of the
	// Landau–Lifshitz force.
	RadiusOverDelta float64 `json:"radius_over_delta"`
}

// ModelSpring is the response of one spring.
type Spring struct {
	Spring int `json:"spring"` // 1-based
	// Amplitude and Phase are those of the oscillating extension (the
	// change of the centre-to-centre distance; positive is longer).
	Amplitude float64 `json:"amplitude"`
	Phase     float64 `json:"phase"`
	// Static is the extension beyond the rest length in static
	// equilibrium under gravity and buoyancy, m. It is meaningful only
	// when Balanced is true: false means that the springs cannot hold the
	// spheres (their group is not neutrally buoyant, so it settles or
	// rises), and Static is then 0.
	Static   float64 `json:"static"`
	Balanced bool    `json:"balanced"`
}

// ModelArm is the force an arm must exert to impose its stroke.
type Arm struct {
	Arm int `json:"arm"` // 1-based
	// Force and ForcePhase are those of the force pushing the two spheres
	// apart (N; the arm pulls them together when it is negative).
	Force      float64 `json:"force"`
	ForcePhase float64 `json:"force_phase"`
	// Power is the mean power the arm delivers to the spheres, W.
	Power float64 `json:"power"`
}

// The model's tolerances.
const (
	// modelNeutralTolerance is the largest net weight of a group of joined
	// spheres, relative to the sum of the magnitudes of the members' net
	// weights, that still counts as neutrally buoyant (round-off of
	// densities chosen to balance exactly, like the demo's).
	modelNeutralTolerance = 1e-9
	// modelSameFrequency is the relative difference within which an arm
	// strokes at the model's frequency.
	modelSameFrequency = 1e-12
	// modelRoundOff is the size, relative to the largest imposed
	// displacement, below which a computed displacement is round-off of
	// the elimination (whose relative error is of order n ε ~ 1e-15) and
	// reported as zero.
	modelRoundOff = 1e-12
)

// Model solves the reduced linear model of the case c: every sphere is an
// isolated sphere in unbounded liquid, coupled to the others only through
// its springs and arms.
//
// The model works in the frame of the container with the modified-pressure
// shift (see the package doc), where the liquid is at rest and each sphere
// k of mass m_k and volume Vol_k feels the buoyancy-corrected frame force
// -(m_k - ρ_f Vol_k) a_c. With complex amplitudes against the drive
// displacement X_c = A e^{iωt} (so a_c = -ω² A), the sphere velocity V_k
// relative to the container obeys
//
//	i ω m_k V_k = Z_k V_k - (m_k - ρ_f Vol_k) a_c + Σ (springs and arms),
//	Z_k = -6π μ a_k [(1 + x) + i (x + 2x²/9)],  x = a_k/δ, δ = √(2ν/ω),
//
// where Z_k V_k is the unsteady Stokes force on a sphere oscillating in
// liquid at rest (Stokes 1851, Trans. Camb. Phil. Soc. 9, 8; Landau &
// Lifshitz, Fluid Mechanics, §24 problem 5; CHECKS.md 4a, written there for
// e^{-iωt}): the steady drag, the Basset force and the added mass ρ_f Vol/2.
// A spring (i, j) of stiffness k and damping c pulls sphere i with
// (k + iωc)(X_j - X_i), X = V/(iω). An arm imposes the extension of its
// pair, amplitude and phase given (zero at this frequency if it strokes at
// another one), through an unknown internal force, equal and opposite on
// its two spheres, so the group of spheres it joins is force-free. The
// N + (arms) complex linear system is solved by Gaussian elimination with
// partial pivoting.
//
// Gravity only shifts the static equilibrium: the static extensions of the
// springs hold the net weights (m_k - ρ_f Vol_k) g of each group of joined
// spheres, when the group is neutrally buoyant; otherwise Model says, in
// the notes, that the springs cannot hold it.
//
// Only the fundamental is modelled; the harmonics of the drive, the
// hydrodynamic interaction of the spheres, the container walls, steady
// streaming and every nonlinearity are left out, and the notes say so.
func Linear(c *cases.Case) (*Result, error) {
	if err := c.Validate(); err != nil {
		return nil, fmt.Errorf("model: invalid case: %w", err)
	}
	n := len(c.Spheres)
	if n == 0 {
		return nil, errors.New("model: the case has no sphere; the model describes spheres (add a [[sphere]])")
	}
	f := c.PeriodFrequency()
	if f == 0 {
		return nil, errors.New("model: nothing oscillates: give shaking.frequency > 0 (and shaking.amplitude), or an [[arm]] with a stroke")
	}
	omega := 2 * math.Pi * f
	rho, mu := c.Fluid.Density, c.Fluid.Viscosity
	nu := mu / rho
	delta := math.Sqrt(2 * nu / omega)
	A := 0.0
	if c.Shaking.Frequency > 0 {
		A = c.Shaking.Amplitude
	}
	ac := complex(-omega*omega*A, 0) // container acceleration amplitude
	iw := complex(0, omega)

	res := &Result{Omega: omega, DriveAmplitude: A}
	mass := make([]float64, n)
	vol := make([]float64, n)
	z := make([]complex128, n)
	for k, s := range c.Spheres {
		vol[k] = 4 * math.Pi * s.Radius * s.Radius * s.Radius / 3
		mass[k] = s.Density * vol[k]
		z[k] = modelImpedance(mu, s.Radius, delta)
	}

	// Unknowns: the displacements X_k relative to the container, then the
	// force of each arm on its second sphere, scaled by the matrix scale.
	na := len(c.Arms)
	m := newModelMatrix(n + na)
	rhs := make([]complex128, n+na)
	for k := range c.Spheres {
		m[k][k] = complex(-omega*omega*mass[k], 0) - iw*z[k]
		rhs[k] = -complex(mass[k]-rho*vol[k], 0) * ac
	}
	for _, s := range c.Springs {
		i, j := s.Spheres[0]-1, s.Spheres[1]-1
		kappa := complex(s.Stiffness, omega*s.Damping)
		m[i][i] += kappa
		m[j][j] += kappa
		m[i][j] -= kappa
		m[j][i] -= kappa
	}
	scale := 0.0
	for k := range n {
		scale = math.Max(scale, cmplx.Abs(m[k][k]))
	}
	var offFrequency []string
	for a, arm := range c.Arms {
		i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
		sg := complex(modelOrientation(c, arm.Spheres), 0)
		row := n + a
		sc := complex(scale, 0)
		// Force T on j, -T on i: moved to the left-hand side.
		m[i][row] = sc
		m[j][row] = -sc
		// Extension sg (X_j - X_i) = E.
		m[row][j] = sc * sg
		m[row][i] = -sc * sg
		if fa := c.ArmFrequency(arm); math.Abs(fa-f) <= modelSameFrequency*f {
			rhs[row] = sc * cmplx.Rect(arm.Amplitude, arm.Phase*math.Pi/180)
		} else {
			offFrequency = append(offFrequency, fmt.Sprintf("arm[%d] (%g Hz)", a+1, fa))
		}
	}
	x, err := modelSolve(m, rhs)
	if err != nil {
		return nil, fmt.Errorf("model: %w", err)
	}
	// Displacements below the round-off of the solve, relative to the
	// largest imposed displacement, are zero (with phase 0), not results.
	ref := A
	for _, arm := range c.Arms {
		ref = math.Max(ref, arm.Amplitude)
	}
	for k := range n {
		if cmplx.Abs(x[k]) <= modelRoundOff*ref {
			x[k] = 0
		}
	}

	for k, s := range c.Spheres {
		res.Spheres = append(res.Spheres, Sphere{
			Sphere: k + 1, Amplitude: cmplx.Abs(x[k]), Phase: modelPhase(x[k]),
			RadiusOverDelta: s.Radius / delta,
		})
	}
	static, balanced, staticNotes, err := modelStatic(c, mass, vol)
	if err != nil {
		return nil, fmt.Errorf("model: static equilibrium: %w", err)
	}
	for si, s := range c.Springs {
		e := complex(modelOrientation(c, s.Spheres), 0) * (x[s.Spheres[1]-1] - x[s.Spheres[0]-1])
		ms := Spring{Spring: si + 1, Amplitude: cmplx.Abs(e), Phase: modelPhase(e), Balanced: balanced[si]}
		if balanced[si] {
			ms.Static = static[si]
		}
		res.Springs = append(res.Springs, ms)
	}
	for a, arm := range c.Arms {
		sg := complex(modelOrientation(c, arm.Spheres), 0)
		push := sg * x[n+a] * complex(scale, 0) // force pushing the pair apart
		ext := sg * (x[arm.Spheres[1]-1] - x[arm.Spheres[0]-1])
		power := 0.5 * real(push*cmplx.Conj(iw*ext))
		if cmplx.Abs(ext) <= modelRoundOff*ref {
			power = 0 // held rigid at this frequency: no work
		}
		res.Arms = append(res.Arms, Arm{Arm: a + 1, Force: cmplx.Abs(push), ForcePhase: modelPhase(push), Power: power})
	}
	res.Notes = modelNotes(c, f, res, offFrequency, staticNotes)
	if len(c.Arms) > 0 {
		st, err := StokesChain(c)
		if err != nil {
			res.Notes = append(res.Notes, "no steady-Stokes swimming speed: "+err.Error())
		} else {
			res.Stokes = st
			res.Notes = append(res.Notes, stokesNotes(c))
		}
	}
	return res, nil
}

// modelImpedance is Z = -6π μ a [(1 + x) + i (x + 2x²/9)], x = a/δ: the
// fluid force on a sphere of radius a moving with velocity Re{V e^{iωt}}
// through liquid at rest is Re{Z V e^{iωt}} (Stokes 1851; Landau &
// Lifshitz §24 problem 5; CHECKS.md 4a, conjugated for e^{+iωt}).
func modelImpedance(mu, a, delta float64) complex128 {
	x := a / delta
	return complex(-6*math.Pi*mu*a, 0) * complex(1+x, x+2*x*x/9)
}

// modelOrientation is +1 if the second sphere of the pair starts above the
// first (larger z), -1 otherwise: the extension of the pair is then
// orientation x (X_j - X_i).
func modelOrientation(c *cases.Case, p [2]int) float64 {
	if c.Spheres[p[1]-1].Z >= c.Spheres[p[0]-1].Z {
		return 1
	}
	return -1
}

// modelPhase is the argument of v in degrees, in (-180, 180].
func modelPhase(v complex128) float64 { return cmplx.Phase(v) * 180 / math.Pi }

// modelStatic solves the static equilibrium under gravity: each
// sphere k carries its net weight -(m_k - ρ_f Vol_k) g along z, springs
// pull with k (extension), arms hold their mean length. It returns the
// extension of each spring beyond its rest length and whether the springs
// hold it (the group of spheres joined to it by springs of positive
// stiffness and by arms is neutrally buoyant), with a note for each group
// that is not.
func modelStatic(c *cases.Case, mass, vol []float64) (ext []float64, ok []bool, notes []string, err error) {
	n, na := len(c.Spheres), len(c.Arms)
	g, rho := c.Shaking.Gravity, c.Fluid.Density
	w := make([]float64, n) // net force along +z
	for k := range n {
		w[k] = -(mass[k] - rho*vol[k]) * g
	}
	// Groups held together statically.
	groups := cases.NewUnionFind(n)
	find := groups.Find
	join := func(p [2]int) { groups.Union(p[0]-1, p[1]-1) }
	for _, s := range c.Springs {
		if s.Stiffness > 0 {
			join(s.Spheres)
		}
	}
	for _, a := range c.Arms {
		join(a.Spheres)
	}

	m := newModelMatrix(n + na)
	rhs := make([]complex128, n+na)
	for k := range n {
		rhs[k] = complex(w[k], 0)
	}
	for _, s := range c.Springs {
		i, j := s.Spheres[0]-1, s.Spheres[1]-1
		sg := modelOrientation(c, s.Spheres)
		k := complex(s.Stiffness, 0)
		m[i][i] += k
		m[j][j] += k
		m[i][j] -= k
		m[j][i] -= k
		rhs[i] -= complex(s.Stiffness*sg*s.RestLength, 0)
		rhs[j] += complex(s.Stiffness*sg*s.RestLength, 0)
	}
	scale := 1.0
	for k := range n {
		scale = math.Max(scale, real(m[k][k]))
	}
	for a, arm := range c.Arms {
		i, j := arm.Spheres[0]-1, arm.Spheres[1]-1
		sg := complex(modelOrientation(c, arm.Spheres)*scale, 0)
		row := n + a
		m[i][row] = complex(scale, 0)
		m[j][row] = complex(-scale, 0)
		m[row][j] = sg
		m[row][i] = -sg
		rhs[row] = complex(scale*arm.Length, 0)
	}
	// Pin the first sphere of each group at its initial position: the
	// equilibrium of a group is fixed only up to a translation, and for a
	// neutrally buoyant group the equation replaced is the sum of the
	// others.
	pinned := make(map[int]bool)
	for k := range n {
		r := find(k)
		if pinned[r] {
			continue
		}
		pinned[r] = true
		for col := range m[k] {
			m[k][col] = 0
		}
		m[k][k] = complex(scale, 0)
		rhs[k] = complex(scale*c.Spheres[k].Z, 0)
	}
	u, err := modelSolve(m, rhs)
	if err != nil {
		return nil, nil, nil, err
	}

	// Which groups are neutrally buoyant.
	net := make(map[int]float64)
	gross := make(map[int]float64)
	members := make(map[int][]int)
	for k := range n {
		r := find(k)
		net[r] += w[k]
		gross[r] += math.Abs(w[k])
		members[r] = append(members[r], k+1)
	}
	neutral := func(r int) bool { return math.Abs(net[r]) <= modelNeutralTolerance*gross[r] }
	roots := make([]int, 0, len(members))
	for r := range members {
		roots = append(roots, r)
	}
	sort.Slice(roots, func(a, b int) bool { return members[roots[a]][0] < members[roots[b]][0] })
	for _, r := range roots {
		if neutral(r) {
			continue
		}
		drag := 0.0
		for _, k := range members[r] {
			drag += 6 * math.Pi * c.Fluid.Viscosity * c.Spheres[k-1].Radius
		}
		dir := "sinks"
		if net[r] > 0 {
			dir = "rises"
		}
		what := "sphere " + modelJoin(members[r])
		if len(members[r]) > 1 {
			what = "the group of spheres " + modelJoin(members[r])
		}
		tail := ""
		for _, s := range c.Springs {
			if find(s.Spheres[0]-1) == r {
				tail = "; no static extension for its springs"
				break
			}
		}
		notes = append(notes, fmt.Sprintf("static: %s has a net weight (gravity minus buoyancy) of %.3g N that no spring can hold: it %s at about %.3g m/s (Stokes drag of each sphere alone)%s",
			what, math.Abs(net[r]), dir, math.Abs(net[r])/drag, tail))
	}

	ext = make([]float64, len(c.Springs))
	ok = make([]bool, len(c.Springs))
	for si, s := range c.Springs {
		i, j := s.Spheres[0]-1, s.Spheres[1]-1
		if find(i) != find(j) {
			notes = append(notes, fmt.Sprintf("static: spring[%d] has no stiffness and joins spheres that nothing else holds together: its static length is not fixed", si+1))
			continue
		}
		if !neutral(find(i)) {
			continue
		}
		ext[si] = modelOrientation(c, s.Spheres)*real(u[j]-u[i]) - s.RestLength
		ok[si] = true
	}
	return ext, ok, notes, nil
}

func modelJoin(v []int) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = fmt.Sprint(x)
	}
	return strings.Join(s, ", ")
}

// modelNotes lists what the model leaves out, for this case.
func modelNotes(c *cases.Case, f float64, res *Result, offFrequency, static []string) []string {
	notes := []string{
		"each sphere is alone in unbounded liquid at rest in the container frame, with the unsteady Stokes force (Stokes 1851; Landau & Lifshitz §24 problem 5: drag, Basset force, added mass); the spheres are coupled only by their springs and arms",
		"left out of the amplitudes: the hydrodynamic interaction between the spheres, which matters when they are a few radii apart (the steady-Stokes swimming speeds, where given, include it)",
	}
	R := c.Container.Radius
	worst, wk := 0.0, 0
	for k, s := range c.Spheres {
		if s.Radius/R > worst {
			worst, wk = s.Radius/R, k+1
		}
	}
	notes = append(notes, fmt.Sprintf("left out: the container walls and ends (sphere %d fills a/R = %.2f of the radius; the wall raises the drag)", wk, worst))
	eps, ek := 0.0, 0
	for k, s := range res.Spheres {
		if e := s.Amplitude / c.Spheres[k].Radius; e > eps {
			eps, ek = e, k+1
		}
	}
	notes = append(notes, fmt.Sprintf("left out: steady streaming and the swimming it drives (second order in the amplitude), and every other nonlinearity; the model needs amplitudes much smaller than the radius (largest here: %.3g a, sphere %d)", eps, ek))
	notes = append(notes, fmt.Sprintf("steady state at %g Hz only: the ramp is not modelled", f))
	if h := len(c.Shaking.Harmonics); h > 0 {
		notes = append(notes, fmt.Sprintf("only the fundamental: the %d harmonic(s) of [[shaking.harmonic]] are left out (in a linear model their responses add, each at its own frequency)", h))
	}
	switch len(offFrequency) {
	case 0:
	case 1:
		notes = append(notes, fmt.Sprintf("%s strokes at another frequency: it is held rigid at %g Hz in this table (the model is linear: solve its stroke separately; the responses add)",
			offFrequency[0], f))
	default:
		notes = append(notes, fmt.Sprintf("%s stroke at other frequencies: they are held rigid at %g Hz in this table (the model is linear: solve each stroke separately; the responses add)",
			strings.Join(offFrequency, ", "), f))
	}
	if c.Container.Ends == cases.EndsPeriodic {
		notes = append(notes, "periodic ends: the liquid does not move with the container there (it is Womersley flow in its frame), but the model assumes it does")
	}
	if c.Shaking.Gravity != 0 {
		if len(c.Springs) > 0 {
			notes = append(notes, "gravity only shifts the static equilibrium (the static extensions of the springs)")
		} else {
			notes = append(notes, "gravity only shifts the static equilibrium")
		}
	}
	return append(notes, static...)
}

// modelMatrix is a dense complex matrix, by rows.
type modelMatrix [][]complex128

func newModelMatrix(n int) modelMatrix {
	m := make(modelMatrix, n)
	for i := range m {
		m[i] = make([]complex128, n)
	}
	return m
}

// modelSolve solves a x = b by Gaussian elimination with partial
// pivoting (row exchanges to the largest modulus in the column; Golub &
// Van Loan, Matrix Computations, §3.4). It overwrites a and b.
func modelSolve(a modelMatrix, b []complex128) ([]complex128, error) {
	n := len(b)
	norm := 0.0
	for i := range a {
		for _, v := range a[i] {
			norm = math.Max(norm, cmplx.Abs(v))
		}
	}
	for col := range n {
		p := col
		for r := col + 1; r < n; r++ {
			if cmplx.Abs(a[r][col]) > cmplx.Abs(a[p][col]) {
				p = r
			}
		}
		if cmplx.Abs(a[p][col]) <= 1e-14*norm {
			return nil, fmt.Errorf("singular linear system (column %d of %d)", col+1, n)
		}
		a[col], a[p] = a[p], a[col]
		b[col], b[p] = b[p], b[col]
		for r := col + 1; r < n; r++ {
			l := a[r][col] / a[col][col]
			if l == 0 {
				continue
			}
			for k := col; k < n; k++ {
				a[r][k] -= l * a[col][k]
			}
			b[r] -= l * b[col]
		}
	}
	x := make([]complex128, n)
	for i := n - 1; i >= 0; i-- {
		s := b[i]
		for k := i + 1; k < n; k++ {
			s -= a[i][k] * x[k]
		}
		x[i] = s / a[i][i]
	}
	return x, nil
}
