package cases_test

import (
	"errors"
	"fmt"

	"axiswim/cases"
)

func ExampleParse() {
	src := []byte(`
[fluid]
density = 1150.0   # kg/m^3
viscosity = 0.0115 # Pa s

[container]
radius = 0.015
length = 0.060

[shaking]
frequency = 40.0
amplitude = 0.0005

[[sphere]]
radius = 0.0015
density = 1150.0
z = 0.0

[grid]
cells_per_radius = 24

[run]
periods = 10
`)
	c, err := cases.Parse("example.toml", src)
	if err != nil {
		fmt.Println(err)
		return
	}
	l, err := cases.Resolve(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("grid %d x %d, dx = %.4g m, dt = %.4g s\n", l.Nz, l.Nr, l.Dx, l.Dt)
	fmt.Printf("tau = %.4f (bound: %s), %d steps per period, %d steps\n", l.Tau, l.Bound, l.StepsPerPeriod, l.Steps)
	fmt.Printf("Ma = %.4f, He = %.5f, delta/dx = %.2f\n", l.Mach, l.He, l.StokesCells)

	// A misspelt key is reported with its line and the closest valid key.
	_, err = cases.Parse("typo.toml", []byte("[fluid]\ndensity = 1150.0\nviscocity = 0.0115\n"))
	var ke cases.KeyErrors
	if errors.As(err, &ke) {
		fmt.Println(ke[0])
	}
	// Output:
	// grid 960 x 240, dx = 6.25e-05 m, dt = 2.393e-06 s
	// tau = 0.5184 (bound: acoustic), 10448 steps per period, 104480 steps
	// Ma = 0.0083, He = 0.99995, delta/dx = 4.51
	// typo.toml: unknown key "fluid.viscocity" at line 3: did you mean "viscosity"?
}
