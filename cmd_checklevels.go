package main

import (
	"fmt"
	"io"
	"math"
	"time"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/drive/model"
	"axiswim/drive/run"
	"axiswim/lbm"
	"axiswim/output"
)

// checkLevels prints the lattice part of 'axiswim check' for a case on
// refined levels (grid.levels > 1, issue 17): the container's rounding to
// level 0's cells, the levels with their blocks, relaxation times and
// binding stability rules, the fine region and the spheres' excursions,
// the node updates and memory against the uniform lattice of the finest
// spacing, the output and a run time estimated from a timed sample of the coupled run.
func checkLevels(stdout, stderr io.Writer, c *cases.Case, l *cases.Lattice, threads int, quiet bool) error {
	ly := l.Layout()
	n := l.Levels
	f := 1 << (n - 1) // finest cells (and steps) per level-0 cell (step)
	lv0 := ly.Levels[0]
	fmt.Fprintf(stdout, "\nlattice (%d levels refined by 2, level 0 the coarsest; spacing and step of the finest level unless said):\n", n)
	L, R := c.Container.Length, c.Container.Radius
	radius := "exact"
	if math.Abs(l.Radius-R) > 1e-12*R {
		radius = fmt.Sprintf("container.radius %.5g m, %+.3f%%", R, 100*(l.Radius-R)/R)
	}
	fmt.Fprintf(stdout, "  container       rounded to whole cells of level 0, %d x %d of %.5g m: %.5g m long (container.length %.5g m, %+.3f%%), %.5g m radius (%s)\n",
		lv0.Nz, lv0.Nr, lv0.Dx, l.Length, L, 100*(l.Length-L)/L, l.Radius, radius)
	fmt.Fprintf(stdout, "  cell size       %.5g m (%.4g cells per radius of the smallest sphere; the uniform lattice of this spacing would be %d x %d cells)\n",
		l.Dx, l.Distance(smallestRadius(c)), l.Nz, l.Nr)
	fmt.Fprintf(stdout, "  time step       %.5g s, set by the %s limit\n", l.Dt, l.Bound)
	fmt.Fprintf(stdout, "  tau             %.5f (lattice viscosity %.5g)\n", l.Tau, l.NuL)
	if l.StepsPerPeriod > 0 {
		fmt.Fprintf(stdout, "  steps/period    %d (%d of level 0; level l takes 2^l steps per step of level 0)\n", l.StepsPerPeriod, ly.StepsPerPeriod)
	}
	fmt.Fprintf(stdout, "  steps           %d (%d of level 0)\n", l.Steps, ly.Steps)
	fmt.Fprintf(stdout, "  expected Mach   %.3g on every level (reference speed %.3g m/s)\n", l.Mach, l.RefVelocity)
	fmt.Fprintf(stdout, "  acoustic He     %.3g (radial %.3g), the same on every level\n", l.He, l.HeRadial)
	if l.StokesCells > 0 {
		fmt.Fprintf(stdout, "  Stokes layer    %.3g cells\n", l.StokesCells)
	}

	fmt.Fprintln(stdout, "\nlevels (blocks in the parent's cells from its first cell; z in the container frame, r from the axis):")
	fmt.Fprintf(stdout, "  %-5s %11s %15s %10s  %-22s %-26s %s\n", "level", "dx (m)", "cells (z x r)", "nodes", "block in parent", "z (m)", "r (m)")
	for k, lv := range ly.Levels {
		block := "the whole container"
		if k > 0 {
			b := ly.Blocks[k-1]
			block = fmt.Sprintf("z0 %d r0 %d, %d x %d", b.Z0, b.R0, b.Nz, b.Nr)
		}
		scale := float64(int(1) << (n - 1 - k)) // finest cells per cell of the level
		z := fmt.Sprintf("%.5g .. %.5g", l.ZSI(float64(lv.Z0)*scale), l.ZSI(float64(lv.Z0+lv.Nz)*scale))
		r := fmt.Sprintf("%.5g .. %.5g", l.DistanceSI(float64(lv.R0)*scale), l.DistanceSI(float64(lv.R0+lv.Nr)*scale))
		fmt.Fprintf(stdout, "  %-5d %11.5g %15s %10d  %-22s %-26s %s\n", k, lv.Dx, fmt.Sprintf("%d x %d", lv.Nz, lv.Nr), lv.Nz*lv.Nr, block, z, r)
	}
	fmt.Fprintf(stdout, "\n  %-5s %9s %9s %9s  %-16s %8s %9s\n", "level", "tau+", "tau-", "floor", "binding rule", "Re_g", "delta/dx")
	for k, lv := range ly.Levels {
		fmt.Fprintf(stdout, "  %-5d %9.5f %9.4g %9.5f  %-16s %8.3g %9.3g\n", k, lv.Tau, lv.TauMinus, lv.TauFloor, lv.Binding.String(), lv.ReGrid, lv.StokesCells)
	}
	fmt.Fprintf(stdout, "  floor: the least tau+ of the rule measured for TRT with the axisymmetric terms (benchmarks/taustability/README.md):\n")
	fmt.Fprintf(stdout, "  tau+ >= %g, and Re_g = u dx/nu <= %g, u taken as the reference speed on every level (the far field is slower: a cautious reading);\n",
		cases.MinLevelTau, cases.MaxLevelGridRe)
	fmt.Fprintf(stdout, "  the binding rule is the one that sets the floor; the coarsest level has the least tau+. No level may have tau+ or tau- within %g of 1.\n",
		lbm.TauCloseToOne)

	rg := ly.Region
	fmt.Fprintf(stdout, "\nfine region (level %d): z %.5g .. %.5g m, r up to %.5g m: one region around all the spheres (trains too, for now),\n",
		n-1, rg.ZMin, rg.ZMax, rg.RMax)
	fmt.Fprintf(stdout, "  each with its excursion and the fine margin of %.4g m (%.4g radii of the smallest sphere, grid.fine_margin); coarser levels add %d of their cells (grid.level_margin)\n",
		ly.FineMargin, ly.FineMargin/smallestRadius(c), ly.LevelMargin)
	amps := modelAmplitudes(c)
	fmt.Fprintf(stdout, "  %-7s %14s %20s\n", "sphere", "excursion (m)", "linear model (m)")
	for i, e := range ly.Excursions {
		m := "-"
		if amps != nil {
			m = fmt.Sprintf("%.4g", amps[i])
		}
		fmt.Fprintf(stdout, "  %-7d %14.4g %20s\n", i+1, e, m)
	}
	fmt.Fprintln(stdout, "  excursion: the drive's displacement A + sum A_n times the largest inviscid free-sphere ratio |rho_s - rho_f|/(rho_s + rho_f/2)")
	fmt.Fprintln(stdout, "  of the swimmer, plus its arms' strokes (a bound for free spheres and arms; with springs an estimate, compared with the")
	fmt.Fprintln(stdout, "  linear model's amplitude at the fundamental, 'axiswim model'); drift (swimming, settling) is not in it")
	var warnings []string
	for i, a := range amps {
		if a > ly.Excursions[i] {
			warnings = append(warnings, fmt.Sprintf("sphere %d: the linear model's amplitude %.4g m exceeds the excursion %.4g m that the fine region allows for (springs): it eats into the fine margin; raise grid.fine_margin if the difference matters",
				i+1, a, ly.Excursions[i]))
		}
	}

	fmt.Fprintln(stdout, "\ncost:")
	fmt.Fprintf(stdout, "  node updates    %.3g per step of level 0", ly.UpdatesPerStep)
	if ly.StepsPerPeriod > 0 {
		fmt.Fprintf(stdout, ", %.3g per period", ly.NodeUpdates(ly.StepsPerPeriod))
	}
	fmt.Fprintf(stdout, ", %.3g in the run\n", ly.NodeUpdates(ly.Steps))
	fmt.Fprintf(stdout, "                  %.3f times the uniform lattice of the finest spacing (%d x %d cells: %.3g in the run)\n",
		ly.Ratio(), l.Nz, l.Nr, ly.UniformUpdatesPerStep*float64(ly.Steps))
	limit, src := cases.MemoryLimit()
	fmt.Fprintf(stdout, "  memory          %s (limit %s, %s); the uniform lattice of the finest spacing: %s\n",
		bytesString(l.MemoryBytes()), bytesString(limit), src, bytesString(ly.UniformMemoryBytes))
	im := l.Image(l.ImageCells(c.Output.ImageSpacing))
	fmt.Fprintf(stdout, "  output          about %s (fields on a uniform image of %d x %d nodes, %.4g m apart (output.image_spacing), pictures, series, checkpoint)\n",
		bytesString(run.EstimateOutput(c, l)), im.Nz, im.Nr, im.Dx)

	// Timed sample: the coupled run itself (bodies, transfers, moves).
	sim, err := drive.New(c, l, threads)
	if err != nil {
		return fmt.Errorf("timed sample: %w", err)
	}
	defer sim.Close()
	h := sim.Levels()
	if err := sim.Advance(sim.Stride()); err != nil { // warm up
		return fmt.Errorf("timed sample: %w", err)
	}
	steps := 0
	transfer0 := h.TransferTime()
	start := time.Now()
	prog := output.NewProgress(stderr, quiet, 5, "tenths of a second", "timed sample")
	for time.Since(start) < 500*time.Millisecond && steps*f < l.Steps {
		if err := sim.Advance(sim.Stride()); err != nil {
			return fmt.Errorf("timed sample: %w", err)
		}
		steps++
		prog.Set(int64(time.Since(start)/(100*time.Millisecond)), fmt.Sprintf("%d steps of level 0", steps))
	}
	prog.Done()
	elapsed := time.Since(start)
	per := elapsed.Seconds() / float64(steps)
	est := time.Duration(per * float64(ly.Steps) * float64(time.Second))
	share := float64(h.TransferTime()-transfer0) / float64(elapsed)
	fine := h.Level(n - 1)
	fmt.Fprintf(stdout, "  run time        about %s on %d goroutine(s), %.3g MLUPS over %d step(s) of level 0 (%d of the finest), interface transfers %.0f%% of it\n",
		roundDuration(est), fine.Threads(), ly.UpdatesPerStep/per/1e6, steps, steps*f, 100*share)
	prec := "float64"
	if l.Single {
		prec = "float32"
	}
	printKernel(stdout, fine.Kernel(), prec)
	printWarnings(stdout, append(l.Warnings, warnings...))
	return nil
}

// smallestRadius is the radius of the smallest sphere of c, m.
func smallestRadius(c *cases.Case) float64 {
	a := math.Inf(1)
	for _, s := range c.Spheres {
		a = math.Min(a, s.Radius)
	}
	return a
}

// modelAmplitudes returns each sphere's amplitude in the linear model
// (drive/model) when the case has springs, whose resonance the layout's
// excursions do not bound, and nil otherwise or when the model has no
// answer.
func modelAmplitudes(c *cases.Case) []float64 {
	if len(c.Springs) == 0 {
		return nil
	}
	res, err := model.Linear(c)
	if err != nil {
		return nil
	}
	amps := make([]float64, len(res.Spheres))
	for i, s := range res.Spheres {
		amps[i] = s.Amplitude
	}
	return amps
}
