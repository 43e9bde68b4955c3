package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"time"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/drive/run"
	"axiswim/lbm"
	"axiswim/output"
)

func cmdCheck(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("check", stderr)
	threads := fs.Int("threads", 0, "goroutines for the timed sample (0: all cores)")
	quiet := fs.Bool("quiet", false, "no progress on stderr")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usageErrorf("give one case file (see 'axiswim cases' for examples)")
	}
	cs, err := readCase(fs.Arg(0))
	if err != nil {
		return err
	}
	c, err := cases.Parse(cs.label, cs.src)
	var keyErrs cases.KeyErrors
	if err != nil && !(errors.As(err, &keyErrs) && c != nil) {
		return err // unreadable: syntax or type error, with its line
	}
	// Every problem at once: the keys, then the values.
	var problems []string
	named := map[string]bool{}
	for _, e := range keyErrs {
		problems = append(problems, e.Error())
		named[e.Key] = true
	}
	var ps cases.Problems
	if verr := c.Validate(); errors.As(verr, &ps) {
		for _, p := range ps {
			if !named[p.Key] {
				problems = append(problems, p.Error())
			}
		}
	} else if verr != nil {
		problems = append(problems, verr.Error())
	}
	if len(problems) > 0 {
		fmt.Fprintf(stdout, "%s: %d problem(s):\n", fs.Arg(0), len(problems))
		for _, p := range problems {
			fmt.Fprintf(stdout, "  %s\n", p)
		}
		return fmt.Errorf("%s is not a valid case", fs.Arg(0))
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "%s is valid", fs.Arg(0))
	if c.Run.Title != "" {
		fmt.Fprintf(stdout, ": %s", c.Run.Title)
	}
	fmt.Fprintln(stdout)

	gs := c.Groups(l)
	shaken := c.Shaken()
	if len(gs) > 0 && !shaken {
		fmt.Fprintln(stdout, "\nthe container is not shaken: the groups of the shaking (A/a, M^2, Re, Re_s) do not apply")
	}
	if ags := c.ArmGroups(l); len(ags) > 0 {
		fmt.Fprintln(stdout, "\narm strokes (a = larger sphere of the arm, d = stroke amplitude, L = mean length):")
		fmt.Fprintf(stdout, "  %-7s %10s %12s %12s %12s %12s\n", "arm", "d/a", "Re=a d w/nu", "w L^2/nu", "delta (m)", "delta/dx")
		for _, g := range ags {
			fmt.Fprintf(stdout, "  %-7d %10.4g %12.4g %12.4g %12.4g %12.3g\n", g.Arm, g.DOverA, g.Re, g.Unsteady, g.Delta, g.DeltaCells)
		}
	}
	if len(gs) > 0 && shaken {
		fmt.Fprintln(stdout, "\ndimensionless groups (A = container amplitude):")
		fmt.Fprintf(stdout, "  %-7s %10s %10s %10s %10s %12s %12s\n", "sphere", "eps=A/a", "M^2", "Re", "Re_s", "delta (m)", "delta/dx")
		for _, g := range gs {
			fmt.Fprintf(stdout, "  %-7d %10.4g %10.4g %10.4g %10.4g %12.4g %12.3g\n",
				g.Sphere, g.Epsilon, g.M2, g.Re, g.ReS, g.Delta, g.DeltaCells)
		}
	}

	if l.Levels > 1 {
		return checkLevels(stdout, stderr, c, l, *threads, *quiet)
	}
	fmt.Fprintln(stdout, "\nlattice:")
	fmt.Fprintf(stdout, "  grid            %d x %d cells (z x r), %d nodes\n", l.Nz, l.Nr, l.Nz*l.Nr)
	fmt.Fprintf(stdout, "  cell size       %.5g m (container %.5g m long, %.5g m radius as resolved)\n", l.Dx, l.Length, l.Radius)
	fmt.Fprintf(stdout, "  time step       %.5g s, set by the %s limit\n", l.Dt, l.Bound)
	fmt.Fprintf(stdout, "  tau             %.5f (lattice viscosity %.5g)\n", l.Tau, l.NuL)
	if l.StepsPerPeriod > 0 {
		fmt.Fprintf(stdout, "  steps/period    %d\n", l.StepsPerPeriod)
	}
	fmt.Fprintf(stdout, "  steps           %d (%.3g cell updates)\n", l.Steps, float64(l.Steps)*float64(l.Nz*l.Nr))
	fmt.Fprintf(stdout, "  expected Mach   %.3g (reference speed %.3g m/s)\n", l.Mach, l.RefVelocity)
	fmt.Fprintf(stdout, "  acoustic He     %.3g (radial %.3g); grid Reynolds %.3g\n", l.He, l.HeRadial, l.ReGrid)
	if l.StokesCells > 0 {
		fmt.Fprintf(stdout, "  Stokes layer    %.3g cells\n", l.StokesCells)
	}
	fmt.Fprintf(stdout, "  output          about %s (fields, pictures, series, checkpoint)\n", bytesString(run.EstimateOutput(c, l)))
	limit, src := cases.MemoryLimit()
	fmt.Fprintf(stdout, "  memory          %s (limit %s, %s)\n", bytesString(l.MemoryBytes()), bytesString(limit), src)

	// Timed sample: a few steps of the real solver.
	sim, err := drive.New(c, l, *threads)
	if err != nil {
		return err
	}
	defer sim.Close()
	if err := sim.Advance(3); err != nil { // warm up
		return fmt.Errorf("timed sample: %w", err)
	}
	n := 0
	start := time.Now()
	prog := output.NewProgress(stderr, *quiet, 5, "tenths of a second", "timed sample")
	for time.Since(start) < 500*time.Millisecond && n < l.Steps {
		if err := sim.Advance(10); err != nil {
			return fmt.Errorf("timed sample: %w", err)
		}
		n += 10
		prog.Set(int64(time.Since(start)/(100*time.Millisecond)), fmt.Sprintf("%d steps", n))
	}
	prog.Done()
	per := time.Since(start).Seconds() / float64(n)
	est := time.Duration(per * float64(l.Steps) * float64(time.Second))
	fmt.Fprintf(stdout, "  run time        about %s on %d goroutine(s) (%.3g MLUPS over a %d-step sample)\n",
		roundDuration(est), sim.Fluid.Threads(), float64(l.Nz*l.Nr)/per/1e6, n)
	prec := "float64"
	if l.Single {
		prec = "float32"
	}
	printKernel(stdout, sim.Fluid.Kernel(), prec)
	printWarnings(stdout, l.Warnings)
	return nil
}

// printKernel prints the kernel path and the storage of the populations.
func printKernel(stdout io.Writer, k lbm.KernelPath, prec string) {
	fmt.Fprintf(stdout, "  kernel          %s, %s storage of the populations\n", k.Describe(), prec)
	fmt.Fprintf(stdout, "                  %s (%s = %s to choose; all give the same bits)\n",
		lbm.KernelOrigin(), lbm.KernelEnv, lbm.KernelNames(lbm.Kernels()))
}

// printWarnings prints the warnings of a lattice, if any.
func printWarnings(stdout io.Writer, warnings []string) {
	if len(warnings) > 0 {
		fmt.Fprintln(stdout, "\nwarnings:")
		for _, w := range warnings {
			fmt.Fprintf(stdout, "  %s\n", w)
		}
	}
}

func bytesString(b int64) string {
	switch {
	case b >= 1<<30:
		return fmt.Sprintf("%.2f GiB", float64(b)/(1<<30))
	case b >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(b)/(1<<20))
	}
	return fmt.Sprintf("%.0f KiB", math.Ceil(float64(b)/(1<<10)))
}

func roundDuration(d time.Duration) time.Duration {
	switch {
	case d > time.Hour:
		return d.Round(time.Minute)
	case d > time.Minute:
		return d.Round(time.Second)
	}
	return d.Round(100 * time.Millisecond)
}
