package run

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"

	"axiswim/cases"
	"axiswim/drive"
)

// FinalStateFile holds the state at the end of a completed run, kept when
// Options.SaveFinal is set so that another run can start from it.
const FinalStateFile = "final.bin"

// WarmStart records whether a run started from another run's final state
// (continuation: the streaming flow and the swimmer's drift are already
// there, so the transient is shorter) and, if not, why.
type WarmStart struct {
	From   string `json:"from"` // the run directory asked for
	Used   bool   `json:"used"`
	Reason string `json:"reason,omitempty"` // why it started from rest instead
	// Skipped is the number of periods the speed estimate and the mean
	// fields skip: the ramp for a warm start, twice the ramp from rest.
	Skipped int `json:"periods_skipped"`
}

// warmStart starts the simulation s (fresh from its case) from the final
// state of the run in dir when their lattices agree (drive.Simulation's
// StartWarm says what is taken over). When the lattices differ (another
// resolution, time step, container or sphere size) or dir has no final
// state, the run starts from rest and the record says why; only a damaged
// final state is an error.
func warmStart(s *drive.Simulation, dir string) (*WarmStart, error) {
	ws := &WarmStart{From: dir}
	cold := func(format string, args ...any) (*WarmStart, error) {
		ws.Reason = fmt.Sprintf(format, args...)
		ws.Skipped = s.SkipPeriods()
		return ws, nil
	}
	src, err := os.ReadFile(filepath.Join(dir, "case.toml"))
	if err != nil {
		return cold("no case.toml in %s: %v", dir, err)
	}
	c, err := cases.Parse(filepath.Join(dir, "case.toml"), src)
	if err != nil {
		return cold("its case does not read: %v", err)
	}
	l, err := cases.Resolve(c)
	if err != nil {
		return cold("its case does not resolve: %v", err)
	}
	if why := s.SameLattice(c, l); why != "" {
		return cold("the lattices differ (%s)", why)
	}
	st, err := readCheckpoint(filepath.Join(dir, FinalStateFile), HashCase(src))
	if errors.Is(err, fs.ErrNotExist) {
		return cold("%s has no %s (the run did not finish, or was not asked to keep it)", dir, FinalStateFile)
	}
	if err != nil {
		return nil, fmt.Errorf("warm start from %s: %w", dir, err)
	}
	if err := s.StartWarm(c, st.simulation()); err != nil {
		return nil, fmt.Errorf("warm start from %s: %w", dir, err)
	}
	ws.Used = true
	ws.Skipped = s.SkipPeriods()
	return ws, nil
}
