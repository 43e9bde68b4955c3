// Command axiswim simulates a two-sphere swimmer in a shaken, liquid-filled
// cylinder with an axisymmetric lattice-Boltzmann method.
//
// Usage:
//
//	axiswim run [-out DIR] [-threads N] [-quiet] [-force] [CASE.toml]
//	axiswim run -resume DIR
//	axiswim check CASE.toml
//	axiswim verify [-full]
//	axiswim cases [NAME]
//	axiswim model [-json] CASE.toml
//	axiswim sweep [-out DIR] [-jobs N] [-threads N] [-warm] [-quiet] SWEEP.toml
//	axiswim sweep -resume DIR
//	axiswim sweep -plan [-out DIR] [-threads N] SWEEP.toml
//	axiswim sweep -point N [-threads N] DIR
//	axiswim collect DIR
//	axiswim onset [-param KEY] [-between LO,HI] [-tol F] [-floor M/S] [-jobs N] [-warm] CASE.toml
//	axiswim onset -resume DIR
//	axiswim help
//
// The environment variable AXISWIM_KERNEL (portable, avx2 or avx512)
// chooses the path of the fluid kernel; unset, the fastest the processor
// has runs. All paths give the same bits.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"axiswim/lbm"
)

// Exit statuses.
const (
	exitOK      = 0
	exitError   = 1 // the command failed
	exitUsage   = 2 // the command line was wrong
	exitVerify  = 3 // a verification row failed
	exitStopped = 4 // the run was interrupted by a signal
)

// errUsage marks a command-line error; the message says how to fix it.
var errUsage = errors.New("usage")

type command struct {
	name, args, short string
	run               func(args []string, stdout, stderr io.Writer) error
}

func commands() []command {
	return []command{
		{"run", "[-out DIR] [-threads N] [-quiet] [-force] [CASE.toml]",
			"run a case (with no case, the embedded demo); -resume DIR continues one", cmdRun},
		{"check", "[-threads N] [-quiet] CASE.toml", "validate a case and show its groups, lattice, memory and run-time estimate", cmdCheck},
		{"verify", "[-full] [-only NAME,...] [-quiet]", "run the verification cases against analytic and published values", cmdVerify},
		{"cases", "[NAME]", "list the embedded example cases, or print one", cmdCases},
		{"model", "[-json] CASE.toml", "solve the reduced linear model: sphere and spring amplitudes and phases", cmdModel},
		{"sweep", "[-out DIR] [-jobs N] SWEEP.toml | -resume DIR", "run every point of a sweep (one or two case keys varied) and write results.csv; -plan: a Slurm array job instead", cmdSweep},
		{"collect", "DIR", "gather a planned sweep's points into results.csv and list those not done", cmdCollect},
		{"onset", "[-param KEY] [-between LO,HI] CASE.toml", "find the onset of swimming in one key by bisection; fit a power law and a threshold law", cmdOnset},
		{"help", "", "show this help", nil},
	}
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "axiswim - swimming of shaken sphere pairs, axisymmetric lattice Boltzmann")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "commands:")
	for _, c := range commands() {
		fmt.Fprintf(w, "  axiswim %-7s %-44s %s\n", c.name, c.args, c.short)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Run 'axiswim COMMAND -h' for a command's options. Case files are TOML in SI units;")
	fmt.Fprintln(w, "'axiswim cases demo' prints a complete example.")
	if k, err := lbm.ResolveKernel(lbm.KernelAuto); err == nil {
		fmt.Fprintf(w, "Fluid kernel: %s, %s; %s=%s chooses (all give the same bits).\n",
			k, lbm.KernelOrigin(), lbm.KernelEnv, strings.ReplaceAll(lbm.KernelNames(lbm.Kernels()), ", ", "|"))
	}
}

func main() {
	os.Exit(dispatch(os.Args[1:], os.Stdout, os.Stderr))
}

func dispatch(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" || args[0] == "-help" {
		usage(stdout)
		return exitOK
	}
	for _, c := range commands() {
		if c.name != args[0] || c.run == nil {
			continue
		}
		// A kernel path the machine cannot run is refused before any
		// command writes a file (lbm.New would refuse it later).
		if _, err := lbm.ResolveKernel(lbm.KernelAuto); err != nil {
			fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
			return exitUsage
		}
		err := c.run(args[1:], stdout, stderr)
		switch {
		case err == nil, errors.Is(err, errHelp):
			return exitOK
		case errors.Is(err, errUsage):
			fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
			return exitUsage
		case errors.Is(err, errVerifyFailed):
			fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
			return exitVerify
		case errors.Is(err, errStopped):
			fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
			return exitStopped
		default:
			fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
			return exitError
		}
	}
	fmt.Fprintf(stderr, "axiswim: unknown command %q\n\n", args[0])
	usage(stderr)
	return exitUsage
}
