package verify

import "fmt"

// Check is one verification case. Run returns its rows; threads is the
// number of goroutines the solver may use (0: all).
type Check struct {
	Name string
	Full bool // only run by `axiswim verify -full`
	Run  func(threads int) ([]Row, error)
}

// Checks returns every verification case, quick ones first.
func Checks() []Check {
	return []Check{
		{Name: "kelvin-functions", Run: checkKelvin},
		{Name: "hagen-poiseuille", Run: checkPoiseuille},
		{Name: "pipe-startup", Run: checkStartup},
		{Name: "womersley", Run: checkWomersley},
		{Name: "mass-planar", Run: checkMassPlanar},
		{Name: "mass-axisymmetric", Run: checkMass3D},
		{Name: "determinism", Run: checkDeterminism},
		{Name: "shaken-closed-cell", Run: checkShakenClosed},
		{Name: "shaken-periodic-tube", Run: checkShakenPeriodic},
		{Name: "sphere-uniform-pressure", Run: checkUniformPressure},
		{Name: "sphere-translating", Run: checkTranslating},
		{Name: "sphere-oscillating", Run: checkOscillating},
		{Name: "sphere-wake", Run: checkWake},
		{Name: "determinism-moving-sphere", Run: checkDeterminismBodies},
		{Name: "free-sphere", Run: checkFreeSphere},
		{Name: "light-sphere", Run: checkLightSphere},
		{Name: "model-vs-simulation", Run: checkModel},
		{Name: "spring-energy", Run: checkEnergy},
		{Name: "steady-streaming", Run: checkStreaming},
		{Name: "scallop", Run: checkScallop},
		{Name: "symmetric-pair", Run: checkSymmetric},
		{Name: "womersley-fine", Full: true, Run: checkWomersleyFine},
		{Name: "sphere-translating-fine", Full: true, Run: checkTranslatingFine},
		{Name: "demo-resolution", Full: true, Run: checkDemoResolution},
	}
}

// Run runs the quick checks, and with full the long ones too, calling each
// (when not nil) after every check with its rows.
func Run(full bool, threads int, each func(c Check, rows []Row)) ([]Row, error) {
	var all []Row
	for _, c := range Checks() {
		if c.Full && !full {
			continue
		}
		rows, err := c.Run(threads)
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
