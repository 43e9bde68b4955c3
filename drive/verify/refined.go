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
	if kind == "across" {
		nz, b = 8, lbm.Block{Z0: 2, R0: 0, Nz: 4, Nr: R}
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
	nu := h.Level(0).Viscosity()
	omega := alpha * alpha * nu / float64(R*R)
	period := int(math.Round(2 * math.Pi / omega))
	omega = 2 * math.Pi / float64(period) // whole number of level-0 steps per period
	w := Womersley{R: float64(R), Nu: nu, Omega: omega, G0: 1e-5, Rho: 1}
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
	return errMax / refMax, nil
}

// reasonRefinedWom is why the refined Womersley rows are known
// disagreements for now. Measured when written (level-0 radius 10 and 20,
// alpha 3 and 8): the error is 5 to 12 times the bound, spread over the
// whole pipe rather than at the interface, and falls at order about 2
// (1.6 across the flow at alpha = 3), so the interface's error is of
// second order with a large constant. Exchanging the force's half in the
// stored momentum (lbm forceAt), which made Poiseuille exact, doubled it
// (3 to 7 times before): the time-dependent part of the transfer is the
// suspect.
const reasonRefinedWom = "the level interface adds an error 5-12 times the bound, of order 2 (issue 17: the transfer of time-dependent flow is being studied); the bound is 1.5 x the uniform lattice's error at the finest spacing"

// refinedWomersleyRow compares the two-level Womersley error at level-0
// radius R with 1.5 times the uniform lattice's at radius 2R.
func refinedWomersleyRow(cs string, R int, alpha float64, kind string, o Options) (Row, float64, error) {
	n, err := refinedWomersleyNorm(R, alpha, kind, o)
	if err != nil {
		return Row{}, 0, err
	}
	_, _, uniform, _, err := womersleyRun(2*R, alpha, o)
	if err != nil {
		return Row{}, 0, err
	}
	return disagreement(cs, fmt.Sprintf("Womersley alpha=%g L2 error vs 1.5 x uniform R=%d, R=%d+%d", alpha, 2*R, R, 2*R),
		n, 1.5*uniform, "abs", reasonRefinedWom, srcWom), n, nil
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
		r, _, err := refinedWomersleyRow(cs, 10, 8, kind, o)
		if err != nil {
			return nil, err
		}
		rows = append(rows, r)
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
				r, n, err := refinedWomersleyRow(cs, R, alpha, kind, o)
				if err != nil {
					return nil, err
				}
				norms[i] = n
				rows = append(rows, r)
			}
			rows = append(rows, disagreement(cs, fmt.Sprintf("Womersley alpha=%g observed order, R=10..20", alpha),
				math.Log2(norms[0]/norms[1]), 2, "abs", reasonRefinedWom, srcOrder))
		}
	}
	return rows, nil
}
