package study

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"axiswim/cases"
	"axiswim/drive/run"
	"axiswim/output"
)

// PointState is what the run directory of a sweep point shows.
type PointState int

// The states of a point's directory, as found by InspectPoint.
const (
	PointNotRun     PointState = iota // no directory, or an empty one
	PointPartial                      // files but neither a summary nor a checkpoint: running, or stopped before its first checkpoint
	PointUnfinished                   // a checkpoint and no completed summary: running, or stopped at a checkpoint
	PointDone                         // summary.json says the run completed
	PointFailed                       // summary.json records a failure, or cannot be read
)

func (p PointState) String() string {
	switch p {
	case PointNotRun:
		return "not run"
	case PointPartial:
		return "no summary"
	case PointUnfinished:
		return "unfinished"
	case PointDone:
		return "done"
	case PointFailed:
		return "failed"
	}
	return "PointState(" + strconv.Itoa(int(p)) + ")"
}

// InspectPoint reads the run directory of a sweep point and says what it
// holds: its summary, when it has one that can be read, and for a failed
// point why it failed. Running, resuming or skipping a point (RunSweep,
// RunSweepPoint) and collecting a sweep (CollectSweep) all decide by it.
func InspectPoint(dir string) (PointState, *run.Summary, error) {
	sum, err := ReadSummary(dir)
	_, ckErr := os.Stat(filepath.Join(dir, run.CheckpointFile))
	checkpoint := ckErr == nil
	switch {
	case err == nil && sum.Completed:
		return PointDone, sum, nil
	case err == nil && sum.Failure != "":
		// the run's error, as its summary wrote it
		return PointFailed, sum, errors.New(sum.Failure)
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return PointFailed, nil, fmt.Errorf("summary.json cannot be read (%w)", err)
	case checkpoint:
		return PointUnfinished, sum, nil
	}
	// No summary (or one of an interrupted run whose checkpoint is gone)
	// and no checkpoint.
	if entries, err := os.ReadDir(dir); err == nil && len(entries) > 0 {
		return PointPartial, sum, nil
	}
	return PointNotRun, nil, nil
}

// What stands in the way of collecting a point that is not done.
var (
	errUnfinished = errors.New("unfinished (stopped at a checkpoint, or still running)")
	errNoSummary  = errors.New("no summary (still running, or stopped before its first checkpoint)")
	errNotRunYet  = errors.New("not run")
)

// CollectSweep gathers the points of the sweep s in out from their run
// directories, as they are now, without running anything: the result of
// each point has its summary when it has one, and Err set to what stands
// in the way when the point is not done. A point whose case cannot be
// made (a varied value the case rejects) is failed with that error,
// since no run of it will ever write a summary. Each state is returned
// beside its result.
func CollectSweep(s *cases.Sweep, out string) ([]SweepResult, []PointState) {
	pts := s.Points()
	results := make([]SweepResult, len(pts))
	states := make([]PointState, len(pts))
	for i, pt := range pts {
		r := SweepResult{Index: i, Point: pt, Dir: PointDir(out, i)}
		st, sum, why := InspectPoint(r.Dir)
		r.Summary = sum
		switch st {
		case PointFailed:
			r.Err = why
		case PointUnfinished:
			r.Err = errUnfinished
		case PointPartial:
			r.Err = errNoSummary
		case PointNotRun:
			r.Err = errNotRunYet
		}
		if st == PointNotRun || st == PointPartial {
			if err := pointCase(s, pt); err != nil {
				st, r.Err = PointFailed, err
			}
		}
		results[i], states[i] = r, st
	}
	return results, states
}

// pointCase reports whether the case of point pt can be made and
// resolved, with the error a run of it would fail with.
func pointCase(s *cases.Sweep, pt cases.Point) error {
	_, c, err := s.CaseAt(pt)
	if err != nil {
		return err
	}
	_, err = cases.Resolve(c)
	return err
}

// PointsFile lists the points of a planned sweep.
const PointsFile = "points.csv"

// WritePoints writes points.csv into the sweep directory out: one row per
// point with its number (from 1, as -point takes it), the varied values
// (exactly, shortest form) and its run directory relative to out.
func WritePoints(out string, s *cases.Sweep) error {
	var b bytes.Buffer
	head := []string{"point"}
	for _, p := range s.Params {
		head = append(head, csvQuote(p.Key))
	}
	b.WriteString(strings.Join(append(head, "dir"), ",") + "\n")
	for i, pt := range s.Points() {
		row := []string{strconv.Itoa(i + 1)}
		for _, v := range pt {
			row = append(row, strconv.FormatFloat(v, 'g', -1, 64))
		}
		row = append(row, csvQuote(filepath.Base(PointDir(out, i))))
		b.WriteString(strings.Join(row, ",") + "\n")
	}
	return output.WriteFileAtomic(filepath.Join(out, PointsFile), b.Bytes())
}
