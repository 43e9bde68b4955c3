// Command axiswim simulates a two-sphere swimmer in a shaken, liquid-filled
// cylinder with an axisymmetric lattice-Boltzmann method: it runs cases
// (TOML files in SI units, or the embedded examples), checks them, solves
// their reduced linear model, runs sweeps and onset searches, and verifies
// the solver against analytic and published values.
//
// 'axiswim help' lists the commands, their synopses and the fluid kernel
// paths; 'axiswim COMMAND -h' gives a command's options. Both are printed
// from the command table in this file.
package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"axiswim/lbm"
)

// command is an entry of the command table: the source of the help
// output and of each command's usage (-h).
type command struct {
	name     string
	synopsis []string // the forms of the command line, after "axiswim NAME"
	short    string   // one line for the help output
	details  []string // more lines for the usage, after the synopsis
	run      func(args []string, stdout, stderr io.Writer) error
}

// commands returns the command table, in the order of the help output.
func commands() []command {
	return []command{
		{"run", []string{
			"[-out DIR] [-threads N] [-quiet] [-force] [-checkpoint-minutes M] [-checkpoint-periods N] [CASE.toml]",
			"-resume DIR [-threads N] [-quiet]",
		}, "run a case (with no case, the embedded demo); -resume DIR continues one", []string{
			"With no case file, runs the embedded demo ('axiswim cases demo' prints it).",
		}, cmdRun},
		{"check", []string{"[-threads N] [-quiet] CASE.toml"},
			"validate a case and show its groups, lattice, memory and run-time estimate", []string{
				"Validates the case, prints its groups and lattice, and times a short sample.",
			}, cmdCheck},
		{"verify", []string{"[-full] [-only NAME,...] [-list] [-float32] [-threads N] [-quiet]"},
			"run the verification cases against analytic and published values", nil, cmdVerify},
		{"cases", []string{"[NAME]"}, "list the embedded example cases, or print one", nil, cmdCases},
		{"model", []string{"[-json] CASE.toml"},
			"solve the reduced linear model: sphere and spring amplitudes and phases", []string{
				"Solves the reduced linear model of the case: each sphere alone in unsteady Stokes flow",
				"(Landau-Lifshitz force), joined by its springs and arms. No lattice is run.",
			}, cmdModel},
		{"sweep", []string{
			"[-out DIR] [-jobs N] [-threads N] [-warm] [-quiet] SWEEP.toml",
			"-resume DIR [-jobs N] [-threads N] [-warm] [-quiet]",
			"-plan [-out DIR] [-threads N] SWEEP.toml",
			"-point N [-threads N] [-quiet] DIR",
		}, "run every point of a sweep (one or two case keys varied) and write results.csv; -plan: a Slurm array job instead", []string{
			"Runs every point of a sweep file (a base case and one or two keys varied) and writes results.csv.",
			"On a cluster: -plan writes DIR/slurm.sh, whose array tasks run -point; then 'axiswim collect DIR'.",
		}, cmdSweep},
		{"collect", []string{"DIR"},
			"gather a planned sweep's points into results.csv and list those not done", []string{
				"Gathers the points of the sweep in DIR (run by 'axiswim sweep -point N DIR', one Slurm array task each)",
				"into results.csv and the speed pictures, and lists the points not done. Runs nothing.",
			}, cmdCollect},
		{"onset", []string{
			"[-param KEY] [-between LO,HI] [-tol F] [-floor M/S] [-jobs N] [-warm] [-out DIR] CASE.toml",
			"-resume DIR [-threads N]",
		}, "find the onset of swimming in one key by bisection; fit a power law and a threshold law", []string{
			"Finds where the swimmer starts to swim as KEY grows (or falls): a scan across the bracket, then",
			"bisection of the change from not swimming to swimming, then a power law and a threshold law",
			"fitted to the speeds, and which one the data support. CASE may be an embedded case name.",
		}, cmdOnset},
		{"help", []string{""}, "show this help", nil, nil},
	}
}

// lookup returns the command of the table called name.
func lookup(name string) (command, bool) {
	for _, c := range commands() {
		if c.name == name {
			return c, true
		}
	}
	return command{}, false
}

// usage writes the help: every command's synopsis and description, and
// the fluid kernel paths.
func usage(w io.Writer) {
	fmt.Fprintln(w, "axiswim - swimming of shaken sphere pairs, axisymmetric lattice Boltzmann")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "commands:")
	for _, c := range commands() {
		for _, form := range c.synopsis {
			fmt.Fprintln(w, strings.TrimRight("  axiswim "+c.name+" "+form, " "))
		}
		fmt.Fprintf(w, "      %s\n", c.short)
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

// dispatch runs the command args[0] with the rest of args, prints its
// error, if any, and returns the exit status.
func dispatch(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" || args[0] == "-help" {
		usage(stdout)
		return exitOK
	}
	c, ok := lookup(args[0])
	if !ok || c.run == nil {
		fmt.Fprintf(stderr, "axiswim: unknown command %q\n\n", args[0])
		usage(stderr)
		return exitUsage
	}
	// A kernel path the machine cannot run is refused before any command
	// writes a file (lbm.New would refuse it later).
	if _, err := lbm.ResolveKernel(lbm.KernelAuto); err != nil {
		fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
		return exitUsage
	}
	err := c.run(args[1:], stdout, stderr)
	if code := exitStatus(err); code != exitOK {
		fmt.Fprintf(stderr, "axiswim %s: %v\n", c.name, err)
		return code
	}
	return exitOK
}
