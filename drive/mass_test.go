package drive

import (
	"math"
	"testing"

	"axiswim/lbm"
)

// TestMassKeeper: a density offset is removed at the next correction, the
// momentum is untouched, and the drift is reported.
func TestMassKeeper(t *testing.T) {
	fl, err := lbm.New(lbm.Config{Nz: 16, Nr: 8, Tau: 0.8, Axisymmetric: true})
	if err != nil {
		t.Fatal(err)
	}
	defer fl.Close()
	fl.SetEquilibrium(func(k, j int) (float64, float64, float64) { return 1, 0.01, 0 })
	m := NewMassKeeper(fl, 1)
	f0 := fl.Fields(nil)
	fl.ShiftDensity(3e-4) // an artificial gain of mass
	m.Step(fl)
	if d := math.Abs(fl.FluidDensity()/m.Rho0 - 1); d > 1e-14 {
		t.Errorf("mean density off by %g after the correction", d)
	}
	if math.Abs(m.Drift-3e-4) > 1e-12 {
		t.Errorf("drift %g, want 3e-4", m.Drift)
	}
	f1 := fl.Fields(nil)
	for i := range f0.Uz {
		// rho u is unchanged, so u changes by the factor 1/(1 + 0): exactly back
		if math.Abs(f1.Uz[i]*f1.Rho[i]-f0.Uz[i]*f0.Rho[i]) > 1e-15 {
			t.Fatalf("momentum changed at %d", i)
		}
	}
}
