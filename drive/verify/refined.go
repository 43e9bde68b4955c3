package verify

import (
	"fmt"
	"math"
	"math/cmplx"

	"axiswim/lbm"
)

// The pipe checks on two levels (issue 17): the fine level of half the
// spacing either across the flow (a block spanning the radius over part of
// the length) or along it (the whole length, from half the radius to the
// wall, where the Womersley layer is).
const (
	tolRefinedHP  = "issue 17: within 0.1% of u_max (Poiseuille is exact on a uniform lattice)"
	tolRefinedWom = "issue 17: at most 1.5 times the uniform lattice's error at the finest spacing"
)

// refinedPipe makes a periodic pipe of radius R level-0 cells on two
// levels, the finer one placed as kind says ("across" or "along"), with
// tau0 on level 0.
func refinedPipe(R int, tau0 float64, kind string, o Options) (*lbm.Levels, error) {
	nz, b := 2, lbm.Block{Z0: 0, R0: R / 2, Nz: 2, Nr: R - R/2}
	if kind == "across" { // a pipe R long, its middle half fine
		nz, b = R, lbm.Block{Z0: R / 4, R0: 0, Nz: R / 2, Nr: R}
	}
	return lbm.NewLevels(lbm.Config{Nz: nz, Nr: R, Tau: tau0, Axisymmetric: true, PeriodicZ: true,
		Threads: o.Threads, Single: o.Single}, []lbm.Block{b})
}

// eachNode calls fn for every fluid node of h counted once, on the finest
// level that covers it, with its velocity u_z, its radius r and its area
// dA, both in level 0's units.
func eachNode(h *lbm.Levels, fields []*lbm.Fields, fn func(uz, r, dA float64)) {
	for l := 0; l < h.Len(); l++ {
		f := h.Fields(l, fields[l])
		fields[l] = f
		dx := math.Ldexp(1, -l)
		row0 := h.Level(l).Config().RowOffset
		for j := 0; j < f.Nr; j++ {
			for k := 0; k < f.Nz; k++ {
				if h.Covered(l, k, j) {
					continue
				}
				fn(f.Uz[f.At(k, j)], (float64(row0+j)+0.5)*dx, dx*dx)
			}
		}
	}
}

// refinedPoiseuilleError returns the largest error of u_z against the
// Hagen-Poiseuille profile over every node, relative to u_max, and the
// relative change of the mass (Levels.Mass) over the run.
func refinedPoiseuilleError(R int, kind string, o Options) (worst, drift float64, err error) {
	h, err := refinedPipe(R, 0.65, kind, o)
	if err != nil {
		return 0, 0, err
	}
	defer h.Close()
	const g = 1e-6
	h.SetForce(g, 0)
	nu := h.Level(0).Viscosity()
	m0 := h.Mass()
	// 12 viscous times: the slowest mode has decayed by exp(-69).
	for n := int(12 * float64(R*R) / nu); n > 0; n-- {
		h.Step()
	}
	umax := g / (4 * nu) * float64(R*R)
	eachNode(h, make([]*lbm.Fields, h.Len()), func(uz, r, _ float64) {
		worst = math.Max(worst, math.Abs(uz-g/(4*nu)*(float64(R*R)-r*r))/umax)
	})
	return worst, h.Mass()/m0 - 1, nil
}

// refinedWomersleyNorm is womersleyRun on two levels: level 0 of radius R,
// the finest of tau 0.8 as womersleyRun's, driven by G0 cos(omega t) at
// Womersley number alpha; it returns the maximum over the last period of
// the r-weighted L2 error norm over every node, normalised by the maximum
// norm of the exact solution.
func refinedWomersleyNorm(R int, alpha float64, kind string, o Options) (float64, error) {
	h, err := refinedPipe(R, 0.65, kind, o)
	if err != nil {
		return 0, err
	}
	defer h.Close()
	return womersleyLevelsNorm(h, R, alpha), nil
}

// womersleyLevelsNorm drives the pipe h of level-0 radius R at Womersley
// number alpha and returns refinedWomersleyNorm's error.
func womersleyLevelsNorm(h *lbm.Levels, R int, alpha float64) float64 {
	nu := h.Level(0).Viscosity()
	omega := alpha * alpha * nu / float64(R*R)
	period := int(math.Round(2 * math.Pi / omega))
	omega = 2 * math.Pi / float64(period) // whole number of level-0 steps per period
	// Diffusive scaling of the drive: the lattice velocity falls as 1/R, so
	// the Mach number's errors fall at second order too (a fixed drive
	// makes u grow as R^2: Ma = 0.14 at R = 40, alpha 3, and across an
	// interface, where the flow varies along z, compressibility then
	// spoils the order; measured 1.36 from R = 10 to 20).
	g0 := 1e-5 * math.Pow(10/float64(R), 3)
	w := Womersley{R: float64(R), Nu: nu, Omega: omega, G0: g0, Rho: 1}
	h.SetForceFunc(func(t float64) (float64, float64) { return w.G0 * math.Cos(omega*t), 0 })
	settle := int(12*float64(R*R)/nu/float64(period)+1) * period
	for n := 0; n < settle; n++ {
		h.Step()
	}
	fields := make([]*lbm.Fields, h.Len())
	var errMax, refMax float64
	for n := settle; n < settle+period; n++ {
		ph := cmplx.Exp(complex(0, -omega*float64(n)))
		var e2, r2 float64
		eachNode(h, fields, func(uz, r, dA float64) {
			ue := real(w.Velocity(r) * cmplx.Conj(ph))
			e2 += r * dA * (uz - ue) * (uz - ue)
			r2 += r * dA * ue * ue
		})
		errMax = math.Max(errMax, math.Sqrt(e2))
		refMax = math.Max(refMax, math.Sqrt(r2))
		h.Step()
	}
	return errMax / refMax
}

// reasonRefinedWom is why the refined Womersley rows against the issue's
// bound are known disagreements. Measured when written (level-0 radius 10
// and 20, alpha 3 and 8): 2.0-2.3 times the uniform error with the fine
// side at the wall at alpha 8, 9-10 at alpha 3, 3-5 across, at order about
// 2. The excess is the coarse level's own error, not the interface's: a
// uniform lattice at the coarse level's tau (0.65, which acoustic scaling
// sets) has 2.2-2.8 times the error of tau 0.8 at the same spacing, 9-11
// times the uniform error at the finest spacing, and the two-level error
// lies below it (the checks refinedCoarseRow). Coupling the fine level a
// half step late, as a first version did, had made it 5-19 times, at
// order 1-2.
const reasonRefinedWom = "the coarse level's own error: a uniform lattice at its tau (0.65) has 9-11 x the error at the finest spacing, and the coarse part carries it; the two-level error stays below it (next rows); the bound is 1.5 x the uniform lattice's error at the finest spacing"

// tolRefinedCoarse: refining part of a lattice must not make it less
// accurate than the coarse lattice alone.
const tolRefinedCoarse = "no worse than the coarse level alone (a refinement that adds error is a defect)"

// refinedWomersleyRows compares the two-level Womersley error at level-0
// radius R with 1.5 times the uniform lattice's at radius 2R (the issue's
// bound) and with the uniform lattice's at radius R and the coarse level's
// tau; it returns the two-level error too.
func refinedWomersleyRows(cs string, R int, alpha float64, kind string, o Options) ([]Row, float64, error) {
	n, err := refinedWomersleyNorm(R, alpha, kind, o)
	if err != nil {
		return nil, 0, err
	}
	_, _, uniform, _, err := womersleyRun(2*R, alpha, o)
	if err != nil {
		return nil, 0, err
	}
	coarse, err := womersleyUniformNorm(R, 0.65, alpha, o)
	if err != nil {
		return nil, 0, err
	}
	return []Row{
		disagreement(cs, fmt.Sprintf("Womersley alpha=%g L2 error vs 1.5 x uniform R=%d, R=%d+%d", alpha, 2*R, R, 2*R),
			n, 1.5*uniform, "abs", reasonRefinedWom, srcWom),
		atMost(cs, fmt.Sprintf("Womersley alpha=%g L2 error / uniform R=%d at tau 0.65, R=%d+%d", alpha, R, R, 2*R),
			n/coarse, 1, srcWom, tolRefinedCoarse),
	}, n, nil
}

// womersleyUniformNorm is refinedWomersleyNorm on one uniform lattice of
// radius R and relaxation time tau.
func womersleyUniformNorm(R int, tau, alpha float64, o Options) (float64, error) {
	h, err := lbm.NewLevels(lbm.Config{Nz: 2, Nr: R, Tau: tau, Axisymmetric: true, PeriodicZ: true,
		Threads: o.Threads, Single: o.Single}, nil)
	if err != nil {
		return 0, err
	}
	defer h.Close()
	return womersleyLevelsNorm(h, R, alpha), nil
}

func checkRefinedPipe(o Options) ([]Row, error) {
	var rows []Row
	for _, kind := range []string{"across", "along"} {
		e, drift, err := refinedPoiseuilleError(10, kind, o)
		if err != nil {
			return nil, err
		}
		cs := "refined pipe, interface " + kind
		rows = append(rows,
			atMost(cs, "Hagen-Poiseuille max error / u_max, R=10+20", e, 1e-3, srcHP, tolRefinedHP),
			info(cs, "relative mass change over 12 viscous times (the transfer does not conserve it)", drift, math.NaN(),
				"Levels.Mass, each region on its finest level"))
		r, _, err := refinedWomersleyRows(cs, 10, 8, kind, o)
		if err != nil {
			return nil, err
		}
		rows = append(rows, r...)
	}
	return rows, nil
}

// checkRefinedWomersley is the convergence study of the refined pipe.
func checkRefinedWomersley(o Options) ([]Row, error) {
	var rows []Row
	for _, kind := range []string{"across", "along"} {
		cs := "refined pipe, interface " + kind
		for _, alpha := range []float64{3, 8} {
			var norms [2]float64
			for i, R := range []int{10, 20} {
				r, n, err := refinedWomersleyRows(cs, R, alpha, kind, o)
				if err != nil {
					return nil, err
				}
				norms[i] = n
				rows = append(rows, r...)
			}
			rows = append(rows, within(cs, fmt.Sprintf("Womersley alpha=%g observed order, R=10..20", alpha),
				math.Log2(norms[0]/norms[1]), 2, 0.3, "order", srcOrder, tolOrderWom))
		}
	}
	return rows, nil
}
