package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"

	"axiswim/drive/model"
)

// cmdModel prints the reduced linear model of a case (model.Linear): the
// amplitude and phase of every sphere and spring, the forces of the arms,
// and what the model leaves out.
func cmdModel(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("model", stderr)
	asJSON := fs.Bool("json", false, "print the result as JSON")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usageErrorf("give one case file (see 'axiswim cases' for examples)")
	}
	c, _, name, err := loadCase(fs.Arg(0))
	if err != nil {
		return err
	}
	r, err := model.Linear(c)
	if err != nil {
		return err
	}
	if *asJSON {
		b, err := json.MarshalIndent(r, "", "  ")
		if err != nil {
			return fmt.Errorf("model: encode the result: %w", err)
		}
		_, err = fmt.Fprintf(stdout, "%s\n", b)
		return err
	}

	fmt.Fprintf(stdout, "%s: reduced linear model at %.6g Hz (omega = %.6g rad/s), drive amplitude %.4g m\n",
		name, r.Omega/(2*math.Pi), r.Omega, r.DriveAmplitude)
	if r.DriveAmplitude > 0 {
		fmt.Fprintln(stdout, "amplitudes of the motion relative to the container; phases in degrees against the drive displacement A sin(omega t)")
	} else {
		fmt.Fprintln(stdout, "amplitudes of the motion relative to the container; phases in degrees against sin(omega t), from which the arms' phases count")
	}

	fmt.Fprintf(stdout, "\n  %-7s %10s %14s %12s\n", "sphere", "a/delta", "amplitude (m)", "phase (deg)")
	for _, s := range r.Spheres {
		fmt.Fprintf(stdout, "  %-7d %10.4g %14.4g %12.1f\n", s.Sphere, s.RadiusOverDelta, s.Amplitude, s.Phase)
	}
	if len(r.Springs) > 0 {
		fmt.Fprintf(stdout, "\n  %-7s %14s %12s %22s\n", "spring", "extension (m)", "phase (deg)", "static extension (m)")
		for _, s := range r.Springs {
			static := "not held (see notes)"
			if s.Balanced {
				static = fmt.Sprintf("%.4g", s.Static)
			}
			fmt.Fprintf(stdout, "  %-7d %14.4g %12.1f %22s\n", s.Spring, s.Amplitude, s.Phase, static)
		}
	}
	if len(r.Arms) > 0 {
		fmt.Fprintf(stdout, "\n  %-7s %14s %12s %16s\n", "arm", "push (N)", "phase (deg)", "mean power (W)")
		for _, a := range r.Arms {
			fmt.Fprintf(stdout, "  %-7d %14.4g %12.1f %16.4g\n", a.Arm, a.Force, a.ForcePhase, a.Power)
		}
	}
	if len(r.Stokes) > 0 {
		fmt.Fprintf(stdout, "\n  %-8s %-12s %22s %22s\n", "swimmer", "spheres", "Stokes speed (m/s)", "leading order (m/s)")
		for _, s := range r.Stokes {
			lo := "-"
			if s.LeadingOrder != nil {
				lo = fmt.Sprintf("%.4g", *s.LeadingOrder)
			}
			fmt.Fprintf(stdout, "  %-8d %-12s %22.4g %22s\n", s.Swimmer, fmt.Sprint(s.Spheres), s.Speed, lo)
		}
	}
	fmt.Fprintln(stdout, "\nnotes:")
	for _, n := range r.Notes {
		fmt.Fprintf(stdout, "  - %s\n", n)
	}
	return nil
}
