package verify

import (
	"fmt"
	"math"

	"axiswim/drive"
	"axiswim/geometry"
	"axiswim/lbm"
)

// streamingRun oscillates a sphere of radius a = 21 cells as
// X0 sin(omega t) (ramped over the first period) at M^2 = omega a^2/nu =
// 100, so delta = a sqrt(2/M^2) = 3 cells, along the axis of a closed tube
// of radius 4a and length 8a (the acoustic limit sets omega), for 12
// periods, and returns the Eulerian mean velocity over the last 4 at two
// points two radii from the centre: on the axis (mean u_z, positive away
// from the sphere, averaged over the points ahead and behind) and in the
// equatorial plane (mean u_r, positive away).
func streamingRun(eps float64, o Options) (axial, equatorial float64, err error) {
	const a, m2, periods, avg = 21.0, 100.0, 12, 4
	R := int(4 * a)
	L := int(8 * a)
	omega := math.Sqrt(lbm.Cs2) / float64(L)
	T := int(math.Ceil(2 * math.Pi / omega))
	omega = 2 * math.Pi / float64(T)
	nu := omega * a * a / m2
	z0 := float64(L)/2 + 0.27
	fl, err := lbm.New(lbm.Config{Nz: L, Nr: R, Tau: 3*nu + 0.5, Axisymmetric: true, Threads: o.Threads, Single: o.Single})
	if err != nil {
		return 0, 0, err
	}
	defer fl.Close()
	sh := drive.Shaker{Amplitude: eps * a, Omega: omega, Ramp: float64(T)}
	bs, err := drive.NewBodies(fl, []geometry.Sphere{{Z: z0, Radius: a}}, []float64{sh.Velocity(0.5)})
	if err != nil {
		return 0, 0, err
	}
	mv := []drive.Prescribed{{Body: 0, Velocity: sh.Velocity}}
	var f *lbm.Fields
	var sAx, sEq float64
	var n int
	zc := int(math.Floor(z0))
	for step := 0; step < periods*T; step++ {
		if err := drive.StepPrescribed(fl, bs, mv); err != nil {
			return 0, 0, err
		}
		if step >= (periods-avg)*T && (step%T)%(T/32) == 0 {
			f = fl.Fields(f)
			ahead := f.Uz[f.At(zc+int(2*a), 0)]
			behind := f.Uz[f.At(zc-int(2*a), 0)]
			sAx += 0.5 * (ahead - behind)
			sEq += f.Ur[f.At(zc, int(2*a))]
			n++
		}
	}
	return sAx / float64(n), sEq / float64(n), nil
}

// checkStreaming: steady streaming around a sphere oscillating in liquid at
// rest, at M^2 = 100 (thin Stokes layer): the mean flow on the axis points
// away from the sphere and in the equatorial plane toward it (Riley 1966,
// Q. J. Mech. Appl. Math. 19, 461; Riley 2001, Annu. Rev. Fluid Mech. 33,
// 43 [M for details]; CHECKS.md 6), and it scales as epsilon^2: the ratio
// for epsilon = 0.1 and 0.05 is 4 within 5% (issue 5).
func checkStreaming(o Options) ([]Row, error) {
	ax1, eq1, err := streamingRun(0.05, o)
	if err != nil {
		return nil, err
	}
	ax2, eq2, err := streamingRun(0.1, o)
	if err != nil {
		return nil, err
	}
	src := "steady streaming, thin Stokes layer (Riley 1966; CHECKS.md 6)"
	const tolSign, tolRatio = "CHECKS.md 9: the sign exactly", "CHECKS.md 9, eps^2 ratio +-5%"
	return []Row{
		within("streaming M^2=100 eps=0.1", fmt.Sprintf("axis flow away (1 = yes; u = %.3g)", ax2),
			yes(ax2 > 0), 1, 0, "yes", src, tolSign),
		within("streaming M^2=100 eps=0.1", fmt.Sprintf("equator flow toward (1 = yes; u = %.3g)", eq2),
			yes(eq2 < 0), 1, 0, "yes", src, tolSign),
		withinRel("streaming M^2=100", "axis mean speed ratio eps 0.1/0.05", ax2/ax1, 4, 0.05, src+"; eps^2 scaling", tolRatio),
		withinRel("streaming M^2=100", "equator mean speed ratio eps 0.1/0.05", eq2/eq1, 4, 0.05, src+"; eps^2 scaling", tolRatio),
	}, nil
}
