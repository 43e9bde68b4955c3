package output

import (
	"fmt"
	"io"
	"os"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// Progress reports how far a long task has got: a progress bar when w is a
// terminal, a plain line every tenth of the way (and at least every minute)
// otherwise, nothing when quiet.
type Progress struct {
	bar   *progressbar.ProgressBar
	w     io.Writer
	total int64
	unit  string
	start time.Time
	last  time.Time
	next  int64
	quiet bool
}

// NewProgress starts reporting a task of total units (e.g. periods).
func NewProgress(w io.Writer, quiet bool, total int64, unit, what string) *Progress {
	p := &Progress{w: w, total: total, unit: unit, start: time.Now(), quiet: quiet}
	p.last = p.start
	if quiet {
		return p
	}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		p.bar = progressbar.NewOptions64(total,
			progressbar.OptionSetWriter(w),
			progressbar.OptionSetDescription(what),
			progressbar.OptionShowCount(),
			progressbar.OptionSetItsString(unit),
			progressbar.OptionShowIts(),
			progressbar.OptionSetPredictTime(true),
			progressbar.OptionThrottle(200*time.Millisecond),
			progressbar.OptionOnCompletion(func() { fmt.Fprintln(w) }),
		)
		return p
	}
	fmt.Fprintf(w, "%s: %d %s\n", what, total, unit)
	return p
}

// Set reports done units and a short status (e.g. the current mean speed).
func (p *Progress) Set(done int64, status string) {
	if p.quiet {
		return
	}
	if p.bar != nil {
		p.bar.Describe(status)
		p.bar.Set64(done)
		return
	}
	now := time.Now()
	if done < p.next && now.Sub(p.last) < time.Minute && done < p.total {
		return
	}
	p.last = now
	p.next = done + max(1, p.total/10)
	el := now.Sub(p.start)
	eta := "?"
	if done > 0 {
		eta = (time.Duration(float64(el) * float64(p.total-done) / float64(done))).Round(time.Second).String()
	}
	fmt.Fprintf(p.w, "  %d/%d %s  elapsed %s  eta %s  %s\n", done, p.total, p.unit,
		el.Round(time.Second), eta, status)
}

// Done finishes the report.
func (p *Progress) Done() {
	if p.bar != nil {
		p.bar.Finish()
	}
}
