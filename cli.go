package main

// The plumbing the commands share: exit statuses and the errors that
// choose them, flag sets and their usage text (from the command table in
// main.go), opening a case or a sweep, run directories, and the context
// a signal cancels.

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/signal"
	"path/filepath"
	"strings"
	"syscall"

	"axiswim/cases"
	"axiswim/output"
)

// Exit statuses.
const (
	exitOK      = 0
	exitError   = 1 // the command failed
	exitUsage   = 2 // the command line was wrong
	exitVerify  = 3 // a verification row failed
	exitStopped = 4 // the run was interrupted by a signal
)

var (
	// errUsage marks a command-line error; the message says how to fix it.
	errUsage = errors.New("usage")
	// errHelp marks a command asked for its help (-h), which the flag set
	// has printed: the command ends there, successfully.
	errHelp = errors.New("help shown")
	// errStopped marks a run interrupted by a signal.
	errStopped = errors.New("stopped by a signal")
)

// exitStatus is the exit status of a command that returned err.
func exitStatus(err error) int {
	switch {
	case err == nil, errors.Is(err, errHelp):
		return exitOK
	case errors.Is(err, errUsage):
		return exitUsage
	case errors.Is(err, errVerifyFailed):
		return exitVerify
	case errors.Is(err, errStopped):
		return exitStopped
	}
	return exitError
}

// usageErrorf returns a command-line error (errUsage) with the message
// formatted as by fmt.Errorf.
func usageErrorf(format string, args ...any) error {
	return fmt.Errorf("%w: "+format, append([]any{errUsage}, args...)...)
}

// newFlags returns the flag set of the command name, which writes its
// errors and its usage to stderr. The usage is the command's synopsis and
// details from the command table, then the flags.
func newFlags(name string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet("axiswim "+name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	c, ok := lookup(name)
	if !ok {
		panic("axiswim: no command " + name + " in the command table")
	}
	fs.Usage = func() {
		commandUsage(stderr, c)
		fs.PrintDefaults()
	}
	return fs
}

// commandUsage writes the usage of c: a line per form, then its details.
func commandUsage(w io.Writer, c command) {
	for i, form := range c.synopsis {
		lead := "usage:"
		if i > 0 {
			lead = "      "
		}
		fmt.Fprintln(w, strings.TrimRight(lead+" axiswim "+c.name+" "+form, " "))
	}
	for _, line := range c.details {
		fmt.Fprintln(w, line)
	}
}

// parseFlags parses args, turning a flag error into a usage error and -h
// into errHelp.
func parseFlags(fs *flag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return errHelp
		}
		return usageErrorf("%w", err)
	}
	return nil
}

// flagsSet returns the names of the flags given on the command line.
func flagsSet(fs *flag.FlagSet) map[string]bool {
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	return set
}

// checkJobs checks the -jobs and -threads of a command that runs several
// points at once.
func checkJobs(jobs, threads int) error {
	if jobs < 1 || threads < 0 {
		return usageErrorf("-jobs must be at least 1 and -threads 0 or more")
	}
	return nil
}

// progressLog is where a command writes its line per run: stderr, or
// nowhere with -quiet.
func progressLog(stderr io.Writer, quiet bool) io.Writer {
	if quiet {
		return io.Discard
	}
	return stderr
}

// caseSource is the TOML of a case and where it came from.
type caseSource struct {
	name  string // short name: the file's base name without extension, or the embedded name
	label string // for messages: the path, or "NAME (embedded)"
	src   []byte
}

// readCase returns the case at path. A file comes first: only when no
// file is there and path is a bare name (no directory, no extension) is
// it the embedded example of that name ('axiswim run three-sphere-lag').
// An empty path is the embedded demo.
func readCase(path string) (caseSource, error) {
	if path == "" {
		src, err := cases.Get("demo")
		return caseSource{"demo", "demo (embedded)", src}, err
	}
	src, embedded, err := cases.Open(path, "")
	switch {
	case err != nil:
		return caseSource{}, fmt.Errorf("load case: %w", err)
	case embedded:
		return caseSource{path, path + " (embedded)", src}, nil
	}
	return caseSource{strings.TrimSuffix(filepath.Base(path), filepath.Ext(path)), path, src}, nil
}

// loadCase reads the case at path (see readCase) and resolves it to
// lattice units. It returns the case's short name too.
func loadCase(path string) (*cases.Case, *cases.Lattice, string, error) {
	cs, err := readCase(path)
	if err != nil {
		return nil, nil, "", err
	}
	c, err := cases.Parse(cs.label, cs.src)
	if err != nil {
		return nil, nil, "", err
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return nil, nil, "", err
	}
	return c, l, cs.name, nil
}

// loadSweepDir reads the sweep of a sweep directory (its sweep.toml).
func loadSweepDir(dir string) (*cases.Sweep, error) {
	path := filepath.Join(dir, "sweep.toml")
	if _, err := os.Stat(path); errors.Is(err, fs.ErrNotExist) {
		if _, derr := os.Stat(dir); derr != nil {
			return nil, usageErrorf("no sweep directory %s: give the directory that 'axiswim sweep' or 'axiswim sweep -plan' made", dir)
		}
		return nil, usageErrorf("%s is not a sweep directory (it has no sweep.toml): give the directory that 'axiswim sweep' or 'axiswim sweep -plan' made", dir)
	}
	return cases.LoadSweep(path)
}

// runDir is the directory a command writes to: out when given, else a
// fresh runs/NAME (see freshDir).
func runDir(out, name string) string {
	if out != "" {
		return out
	}
	return freshDir(name)
}

// freshDir returns runs/NAME, or runs/NAME-2, -3, ... if that is taken, so
// that a run without -out never touches an earlier run's files.
func freshDir(name string) string {
	base := filepath.Join("runs", name)
	dir := base
	for i := 2; ; i++ {
		entries, err := os.ReadDir(dir)
		if err != nil || len(entries) == 0 {
			return dir
		}
		dir = fmt.Sprintf("%s-%d", base, i)
	}
}

// makeRunDir makes dir, or checks that it is empty and writable; hint
// follows the error in parentheses (how to continue what is there).
func makeRunDir(dir, hint string) error {
	if err := output.RunDir(dir, false); err != nil {
		return fmt.Errorf("%w (%s)", err, hint)
	}
	return nil
}

// signalContext is cancelled by SIGINT or SIGTERM (Slurm's signal at the
// time limit), upon which the running work stops at a checkpoint. After
// the first signal the default handling is restored, so that a second one
// ends the process at once, and then onStop, if not nil, is called
// (not when the command calls the returned stop itself).
func signalContext(onStop func()) (context.Context, context.CancelFunc) {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	go func() {
		<-ctx.Done()
		stop()
		// The cause is context.Canceled itself when the command stopped
		// the context; a signal's cause only matches it under errors.Is.
		if onStop != nil && context.Cause(ctx) != context.Canceled {
			onStop()
		}
	}()
	return ctx, stop
}

// stopped returns err as a stop by a signal (errStopped) when ctx was
// cancelled, after telling on stderr how to continue (cont, a command
// line); otherwise err as it is.
func stopped(ctx context.Context, err error, stderr io.Writer, cont string) error {
	if err == nil || ctx.Err() == nil {
		return err
	}
	fmt.Fprintf(stderr, "stopped; continue with: %s\n", cont)
	return fmt.Errorf("%w: %w", errStopped, err)
}
