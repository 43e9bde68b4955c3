package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"axiswim/cases"
	"axiswim/drive/study"
	"axiswim/output"
)

// slurmScript is the batch script that sweep -plan writes.
const slurmScript = "slurm.sh"

// defaultTaskCores is the --cpus-per-task of a plan without -threads.
const defaultTaskCores = 4

// slurmPlan is what the batch script of a planned sweep needs.
type slurmPlan struct {
	Sweep  *cases.Sweep
	Dir    string // the sweep directory, absolute
	Exe    string // the axiswim to run, absolute
	Cores  int    // --cpus-per-task
	Memory int64  // the largest point's lattice, bytes (0: unknown)
}

// planSweep makes the sweep directory of s for a cluster without running
// anything: sweep.toml and base.toml (as a sweep does), points.csv, the
// Slurm array script and the directory of the tasks' logs.
func planSweep(s *cases.Sweep, out string, cores int, stdout, stderr io.Writer) error {
	out = runDir(out, "sweep-"+s.Name)
	if cores == 0 {
		cores = defaultTaskCores
	}
	dir, err := filepath.Abs(out)
	if err != nil {
		return fmt.Errorf("sweep directory %s: %w", out, err)
	}
	if bad := strings.IndexFunc(dir, unsafeInSbatch); bad >= 0 {
		return usageErrorf("the sweep directory %s holds %q, which a #SBATCH line cannot carry (Slurm splits those lines at spaces and reads %% as a pattern): choose an -out path without spaces, quotes, backslashes or %%",
			dir, dir[bad:bad+1])
	}
	exe, err := os.Executable()
	if err != nil {
		return fmt.Errorf("find this axiswim's path for the batch script: %w (build it with go build -o and run it from there)", err)
	}
	if strings.Contains(exe, string(filepath.Separator)+"go-build") {
		fmt.Fprintf(stderr, "warning: this axiswim (%s) is a temporary build of go run, gone when it exits: "+
			"build one (go build -o ~/bin/axiswim .) and plan with it, or submit with AXISWIM=/path/to/axiswim sbatch ...\n", exe)
	}
	p := slurmPlan{Sweep: s, Dir: dir, Exe: exe, Cores: cores}
	for i, pt := range s.Points() {
		_, c, err := s.CaseAt(pt)
		var l *cases.Lattice
		if err == nil {
			l, err = cases.Resolve(c)
		}
		if err != nil {
			fmt.Fprintf(stderr, "warning: point %d will fail: %v\n", i+1, err)
			continue
		}
		p.Memory = max(p.Memory, l.MemoryBytes())
	}
	if err := makeRunDir(dir, "a planned sweep's points run with: axiswim sweep -point N "+dir); err != nil {
		return err
	}
	if err := s.WriteFiles(dir, output.WriteFileAtomic); err != nil {
		return err
	}
	if err := study.WritePoints(dir, s); err != nil {
		return err
	}
	if err := os.Mkdir(filepath.Join(dir, "logs"), 0o755); err != nil {
		return fmt.Errorf("logs directory: %w", err)
	}
	script := filepath.Join(dir, slurmScript)
	if err := output.WriteFileAtomic(script, []byte(p.script())); err != nil {
		return err
	}
	n := len(s.Points())
	fmt.Fprintf(stdout, "planned %d points in %s:\n", n, dir)
	fmt.Fprintf(stdout, "  sweep.toml, base.toml  the sweep (base case copied)\n")
	fmt.Fprintf(stdout, "  %-21s  the points, their values and run directories\n", study.PointsFile)
	fmt.Fprintf(stdout, "  %-21s  the Slurm array job, one task of %d core(s) per point (set its --time first)\n", slurmScript, cores)
	fmt.Fprintf(stdout, "  %-21s  one log per task\n", "logs/")
	fmt.Fprintf(stdout, "submit with:  sbatch %s\n", script)
	fmt.Fprintf(stdout, "when done:    axiswim collect %s\n", dir)
	return nil
}

// unsafeInSbatch reports the characters a path in a #SBATCH line cannot
// hold: Slurm splits those lines at white space, takes quotes and
// backslashes as quoting, and % starts a file-name pattern.
func unsafeInSbatch(r rune) bool {
	return r <= ' ' || r == 0x7f || strings.ContainsRune(`%"'\`, r)
}

// script is the text of the batch script: one array task per point,
// each running axiswim sweep -point on the task's cores.
func (p slurmPlan) script() string {
	s := p.Sweep
	n := len(s.Points())
	var b strings.Builder
	line := func(format string, args ...any) { fmt.Fprintf(&b, format+"\n", args...) }
	title := s.Title
	if title == "" {
		title = s.Name
	}
	line("#!/bin/bash")
	line("# Slurm array job of the sweep %q: %d points, one array task each.", title, n)
	line("# Written by 'axiswim sweep -plan'. A task runs its point in %s/point_NNN,", p.Dir)
	line("# or resumes it from its checkpoint, or skips it when it is finished, so")
	line("# submitting the array again redoes no finished point.")
	line("#")
	line("#   submit:          sbatch %s", filepath.Join(p.Dir, slurmScript))
	line("#   a few points:    sbatch --array=2,5 %s", filepath.Join(p.Dir, slurmScript))
	line("#   when all ended:  axiswim collect %s", p.Dir)
	line("#")
	line("# Set --time (and what else your cluster asks) before submitting. At the time")
	line("# limit Slurm sends SIGTERM: the point writes a checkpoint, and its task")
	line("# submitted again continues from there. Lines starting ##SBATCH are off.")
	line("#SBATCH --job-name=%s", jobName(s.Name))
	line("#SBATCH --array=1-%d", n)
	line("#SBATCH --cpus-per-task=%d", p.Cores)
	line("#SBATCH --output=%s", filepath.Join(p.Dir, "logs", "point_%a.log"))
	line("##SBATCH --time=01:00:00   # the wall time of one point; 'axiswim check %s' estimates the base case's", filepath.Join(p.Dir, "base.toml"))
	if p.Memory > 0 {
		line("##SBATCH --mem=SIZE        # the largest point's lattice alone takes about %s", bytesString(p.Memory))
	}
	line("##SBATCH --partition=NAME")
	line("")
	line("set -eu")
	line("# The axiswim that planned the sweep; set AXISWIM to run another.")
	line("AXISWIM=${AXISWIM:-%s}", shellQuote(p.Exe))
	line(`exec "$AXISWIM" sweep -point "$SLURM_ARRAY_TASK_ID" -threads "${SLURM_CPUS_PER_TASK:-1}" %s`, shellQuote(p.Dir))
	return b.String()
}

// jobName is the Slurm job name of a sweep: axiswim-NAME with anything
// but letters, digits, '.', '-' and '_' replaced by '-'.
func jobName(name string) string {
	return "axiswim-" + strings.Map(func(r rune) rune {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '.', r == '-', r == '_':
			return r
		}
		return '-'
	}, name)
}

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
