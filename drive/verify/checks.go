package verify

import (
	"fmt"
	"strings"

	"axiswim/cases"
	"axiswim/drive"
)

// Check is one verification case. Run returns its rows.
type Check struct {
	Name string
	Full bool // only run by `axiswim verify -full`
	Run  func(o Options) ([]Row, error)
}

// Options are how the checks run the solver.
type Options struct {
	Threads int  // goroutines the solver may use (0: all)
	Single  bool // float32 storage of the populations (lbm.Config.Single)
}

// setup is drive.Setup with the options: Single sets the case's
// solver.precision to float32.
func setup(c *cases.Case, o Options) (*drive.Simulation, error) {
	if o.Single {
		c.Solver.Precision = cases.PrecisionSingle
	}
	return drive.Setup(c, o.Threads)
}

// Checks returns every verification case, quick ones first.
func Checks() []Check {
	return []Check{
		{Name: "kelvin-functions", Run: checkKelvin},
		{Name: "hagen-poiseuille", Run: checkPoiseuille},
		{Name: "pipe-startup", Run: checkStartup},
		{Name: "womersley", Run: checkWomersley},
		{Name: "refined-pipe", Run: checkRefinedPipe},
		{Name: "mass-planar", Run: checkMassPlanar},
		{Name: "mass-axisymmetric", Run: checkMass3D},
		{Name: "determinism", Run: checkDeterminism},
		{Name: "shaken-closed-cell", Run: checkShakenClosed},
		{Name: "shaken-periodic-tube", Run: checkShakenPeriodic},
		{Name: "sphere-uniform-pressure", Run: checkUniformPressure},
		{Name: "sphere-translating", Run: checkTranslating},
		{Name: "sphere-oscillating", Run: checkOscillating},
		{Name: "refined-sphere-oscillating", Run: checkRefinedOscillating},
		{Name: "refined-sphere-wake", Run: checkRefinedWake},

		{Name: "sphere-wake", Run: checkWake},
		{Name: "determinism-moving-sphere", Run: checkDeterminismBodies},
		{Name: "free-sphere", Run: checkFreeSphere},
		{Name: "light-sphere", Run: checkLightSphere},
		{Name: "model-vs-simulation", Run: checkModel},
		{Name: "spring-energy", Run: checkEnergy},
		{Name: "steady-streaming", Run: checkStreaming},
		{Name: "scallop", Run: checkScallop},
		{Name: "symmetric-pair", Run: checkSymmetric},
		{Name: "contact-restitution", Run: checkContact},
		{Name: "womersley-fine", Full: true, Run: checkWomersleyFine},
		{Name: "refined-womersley", Full: true, Run: checkRefinedWomersley},
		{Name: "sphere-translating-fine", Full: true, Run: checkTranslatingFine},
		{Name: "demo-resolution", Full: true, Run: checkDemoResolution},
		{Name: "demo-float32", Full: true, Run: checkDemoPrecision},
		{Name: "refined-demo", Full: true, Run: checkRefinedDemo},
		{Name: "three-sphere-stokes", Full: true, Run: checkThreeSphere},
		{Name: "three-sphere-container", Full: true, Run: checkThreeSphereContainer},
		{Name: "three-sphere-resolution", Full: true, Run: checkThreeSphereResolution},
		{Name: "sphere-oscillating-thin", Full: true, Run: checkOscillatingThin},
		{Name: "refined-sphere-oscillating-full", Full: true, Run: checkRefinedOscillatingFull},
		{Name: "refined-sphere-translating", Full: true, Run: checkRefinedTranslating},
		{Name: "refined-sphere-wake-100", Full: true, Run: checkRefinedWake100},
		{Name: "sphere-wake-100", Full: true, Run: checkWake100},
	}
}

// RunChecks runs the given checks in order, calling each (when not nil)
// after every check with its rows.
func RunChecks(list []Check, o Options, each func(c Check, rows []Row)) ([]Row, error) {
	var all []Row
	for _, c := range list {
		rows, err := c.Run(o)
		if err != nil {
			return all, fmt.Errorf("verify %s: %w", c.Name, err)
		}
		if each != nil {
			each(c, rows)
		}
		all = append(all, rows...)
	}
	return all, nil
}

// Select returns the checks named in names, in the order of Checks, quick
// or full; an unknown name is an error listing the known ones.
func Select(names []string) ([]Check, error) {
	all := Checks()
	want := map[string]bool{}
	for _, n := range names {
		found := false
		for _, c := range all {
			if c.Name == n {
				found = true
			}
		}
		if !found {
			known := make([]string, len(all))
			for i, c := range all {
				known[i] = c.Name
			}
			return nil, fmt.Errorf("no verification check %q; the checks are: %s", n, strings.Join(known, ", "))
		}
		want[n] = true
	}
	var out []Check
	for _, c := range all {
		if want[c.Name] {
			out = append(out, c)
		}
	}
	return out, nil
}
