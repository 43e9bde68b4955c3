package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"axiswim/drive/study"
)

func cmdCollect(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("collect", stderr)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		fs.Usage()
		return usageErrorf("give one sweep directory, got %q", fs.Args())
	}
	dir := fs.Arg(0)
	s, err := loadSweepDir(dir)
	if err != nil {
		return fmt.Errorf("collect %s: %w", dir, err)
	}
	results, states := study.CollectSweep(s, dir)
	if err := study.WriteSweepResults(filepath.Join(dir, study.ResultsFile), s, results); err != nil {
		return err
	}
	if err := study.WriteSweepPictures(dir, s, results); err != nil {
		return err
	}
	byState := map[study.PointState][]int{}
	for i, r := range results {
		fmt.Fprintln(stdout, pointLine(s, r))
		byState[states[i]] = append(byState[states[i]], i+1)
	}
	done := len(byState[study.PointDone])
	fmt.Fprintf(stdout, "%s written: %d of %d points done\n", filepath.Join(dir, study.ResultsFile), done, len(results))
	var again []int // points a run would continue
	for _, c := range []struct {
		state study.PointState
		what  string
	}{
		{study.PointNotRun, "not run"},
		{study.PointPartial, "no summary (still running, or stopped before its first checkpoint: runs again from the start)"},
		{study.PointUnfinished, "unfinished (still running, or stopped at a checkpoint: continues from it)"},
		{study.PointFailed, "failed (see results.csv and the point's summary.json)"},
	} {
		pts := byState[c.state]
		if len(pts) == 0 {
			continue
		}
		fmt.Fprintf(stderr, "%s: point(s) %s\n", c.what, strings.ReplaceAll(arrayRanges(pts), ",", ", "))
		if c.state != study.PointFailed {
			again = append(again, pts...)
		}
	}
	slices.Sort(again)
	if len(again) > 0 {
		if _, err := os.Stat(filepath.Join(dir, slurmScript)); err == nil {
			fmt.Fprintf(stderr, "once no task of the array is running, run them with: sbatch --array=%s %s\n",
				arrayRanges(again), filepath.Join(dir, slurmScript))
		} else {
			fmt.Fprintf(stderr, "run them with: axiswim sweep -resume %s\n", dir)
		}
	}
	if n := len(results) - done; n > 0 {
		return fmt.Errorf("%d of %d points are not done", n, len(results))
	}
	return nil
}

// arrayRanges writes increasing point numbers as Slurm's --array takes
// them: comma-separated, runs of consecutive numbers as FIRST-LAST.
func arrayRanges(pts []int) string {
	var out []string
	for i := 0; i < len(pts); {
		j := i
		for j+1 < len(pts) && pts[j+1] == pts[j]+1 {
			j++
		}
		r := strconv.Itoa(pts[i])
		if j > i {
			r += "-" + strconv.Itoa(pts[j])
		}
		out = append(out, r)
		i = j + 1
	}
	return strings.Join(out, ",")
}
