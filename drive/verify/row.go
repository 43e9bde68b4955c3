package verify

import (
	"fmt"
	"io"
	"math"
	"strings"
)

// Kind is what a Row is. Only a check has a verdict.
type Kind int

const (
	// KindCheck is a check: its verdict is computed from the value, the
	// reference and the tolerance (by within, withinRel, atMost or
	// atLeast), and the tolerance says where it comes from.
	KindCheck Kind = iota
	// KindInfo is information: a number shown, never a pass.
	KindInfo
	// KindDisagreement is a known disagreement with a published result:
	// the comparison is made and printed with its reason and source,
	// never a pass, and it does not fail `axiswim verify`.
	KindDisagreement
)

// String returns "check", "info" or "known disagreement".
func (k Kind) String() string {
	switch k {
	case KindCheck:
		return "check"
	case KindInfo:
		return "info"
	case KindDisagreement:
		return "known disagreement"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// Comparison is how a check compares its value.
type Comparison int

const (
	// Within: Error, the difference from Reference (relative when Unit is
	// "rel"), is at most Tolerance.
	Within Comparison = iota
	// AtMost: Computed is at most Tolerance (a bound).
	AtMost
	// AtLeast: Computed is at least Tolerance (a bound).
	AtLeast
)

// Row is one verified or reported quantity: what was computed, what it is
// compared with, the source of the reference and, for a check, the error,
// the tolerance and where the tolerance comes from.
type Row struct {
	Case      string
	Quantity  string
	Kind      Kind
	Compare   Comparison // how a check compares (KindCheck only)
	Computed  float64
	Reference float64 // NaN where there is none (bounds, most information rows)
	Error     float64 // in the unit of Tolerance; NaN for bounds and rows without a reference
	Tolerance float64 // the check's tolerance or bound (KindCheck only)
	Unit      string  // how Error is measured: "rel", "abs", "deg", "order", "yes"; "bound" for bounds
	Source    string  // where the reference comes from
	TolFrom   string  // where the tolerance comes from (KindCheck only)
	Reason    string  // why the code disagrees with the source (KindDisagreement only)
	Pass      bool    // set only by the check helpers; false for other kinds
}

// withinRel is a check that computed is within the relative tolerance tol
// of reference: |computed - reference| / |reference| <= tol.
func withinRel(cs, qty string, computed, reference, tol float64, src, tolFrom string) Row {
	e := math.Abs(computed-reference) / math.Abs(reference)
	return Row{Case: cs, Quantity: qty, Kind: KindCheck, Compare: Within, Computed: computed, Reference: reference,
		Error: e, Tolerance: tol, Unit: "rel", Source: src, TolFrom: tolFrom, Pass: e <= tol}
}

// within is a check that computed is within tol of reference,
// |computed - reference| <= tol, the difference measured in unit ("abs",
// "deg", "order"; "yes" for a yes/no outcome as 1 or 0 against 1 with
// tolerance 0).
func within(cs, qty string, computed, reference, tol float64, unit, src, tolFrom string) Row {
	e := math.Abs(computed - reference)
	return Row{Case: cs, Quantity: qty, Kind: KindCheck, Compare: Within, Computed: computed, Reference: reference,
		Error: e, Tolerance: tol, Unit: unit, Source: src, TolFrom: tolFrom, Pass: e <= tol}
}

// atMost is a check that computed is at most bound.
func atMost(cs, qty string, computed, bound float64, src, tolFrom string) Row {
	return Row{Case: cs, Quantity: qty, Kind: KindCheck, Compare: AtMost, Computed: computed, Reference: math.NaN(),
		Error: math.NaN(), Tolerance: bound, Unit: "bound", Source: src, TolFrom: tolFrom, Pass: computed <= bound}
}

// atLeast is a check that computed is at least bound.
func atLeast(cs, qty string, computed, bound float64, src, tolFrom string) Row {
	return Row{Case: cs, Quantity: qty, Kind: KindCheck, Compare: AtLeast, Computed: computed, Reference: math.NaN(),
		Error: math.NaN(), Tolerance: bound, Unit: "bound", Source: src, TolFrom: tolFrom, Pass: computed >= bound}
}

// yes is 1 for true and 0 for false: a yes/no outcome as the value of a
// check within(..., yes(ok), 1, 0, "yes", ...).
func yes(ok bool) float64 {
	if ok {
		return 1
	}
	return 0
}

// info is an information row: the value computed, with a reference to set
// it beside (NaN for none) and what it shows; it never passes.
func info(cs, qty string, computed, reference float64, src string) Row {
	return Row{Case: cs, Quantity: qty, Kind: KindInfo, Computed: computed, Reference: reference,
		Error: math.NaN(), Tolerance: math.NaN(), Source: src}
}

// disagreement is a known disagreement with a published result: computed
// against the published reference, the difference measured in unit ("abs"
// or "rel"), with the reason for the difference and the source. It never
// passes and does not fail a verification run.
func disagreement(cs, qty string, computed, reference float64, unit, reason, src string) Row {
	e := math.Abs(computed - reference)
	if unit == "rel" {
		e /= math.Abs(reference)
	}
	return Row{Case: cs, Quantity: qty, Kind: KindDisagreement, Computed: computed, Reference: reference,
		Error: e, Tolerance: math.NaN(), Unit: unit, Source: src, Reason: reason}
}

// Failed reports whether r is a check that did not pass.
func (r Row) Failed() bool { return r.Kind == KindCheck && !r.Pass }

// Status is "PASS" or "FAIL" for a check, "INFO" for information and
// "KNOWN" for a known disagreement.
func (r Row) Status() string {
	switch r.Kind {
	case KindInfo:
		return "INFO"
	case KindDisagreement:
		return "KNOWN"
	}
	if r.Pass {
		return "PASS"
	}
	return "FAIL"
}

// Describe returns the row's comparison in words, for test failures and
// messages: "value 0.5 > bound 0.2 [tol: ...] (source)" and the like.
func (r Row) Describe() string {
	var s string
	switch {
	case r.Kind == KindInfo:
		s = fmt.Sprintf("%s: %s = %g (information)", r.Case, r.Quantity, r.Computed)
	case r.Kind == KindDisagreement:
		s = fmt.Sprintf("%s: %s = %g against %g, error %g %s (known disagreement: %s)",
			r.Case, r.Quantity, r.Computed, r.Reference, r.Error, r.Unit, r.Reason)
	case r.Compare == AtMost:
		s = fmt.Sprintf("%s: %s = %g, at most %g asked", r.Case, r.Quantity, r.Computed, r.Tolerance)
	case r.Compare == AtLeast:
		s = fmt.Sprintf("%s: %s = %g, at least %g asked", r.Case, r.Quantity, r.Computed, r.Tolerance)
	default:
		s = fmt.Sprintf("%s: %s = %g, reference %g, error %g %s, tolerance %g",
			r.Case, r.Quantity, r.Computed, r.Reference, r.Error, r.Unit, r.Tolerance)
	}
	if r.TolFrom != "" {
		s += " [tol: " + r.TolFrom + "]"
	}
	return s + " (" + r.Source + ")"
}

// Tally counts rows by kind and verdict.
type Tally struct {
	Passed, Failed int // checks
	Info           int // information rows
	Known          int // known disagreements
}

// Add counts rows into t.
func (t *Tally) Add(rows []Row) {
	for _, r := range rows {
		switch {
		case r.Kind == KindInfo:
			t.Info++
		case r.Kind == KindDisagreement:
			t.Known++
		case r.Pass:
			t.Passed++
		default:
			t.Failed++
		}
	}
}

// String is the summary line of a verification run, checks first: only
// checks pass or fail.
func (t Tally) String() string {
	return fmt.Sprintf("checks: %d passed, %d failed; %d information rows; %d known disagreements",
		t.Passed, t.Failed, t.Info, t.Known)
}

// WriteTable prints rows as an aligned table with a header.
func WriteTable(w io.Writer, rows []Row) error {
	h := fmt.Sprintf("%-26s %-36s %13s %13s %10s %11s %-5s %-5s  %s\n",
		"case", "quantity", "computed", "reference", "error", "tolerance", "unit", "", "source")
	if _, err := io.WriteString(w, h); err != nil {
		return err
	}
	return WriteRows(w, rows)
}

// WriteRows prints rows aligned as by WriteTable, without the header. A
// check shows PASS or FAIL, its tolerance ("<=" or ">=" before a bound) and
// where the tolerance comes from; information shows INFO and no
// tolerance; a known disagreement shows KNOWN, its error, its reason and
// its source.
func WriteRows(w io.Writer, rows []Row) error {
	var b strings.Builder
	num := func(width int, v float64) string {
		if math.IsNaN(v) {
			return fmt.Sprintf("%*s", width, "-")
		}
		return fmt.Sprintf("%*.6g", width, v)
	}
	for _, r := range rows {
		errCol := "-"
		if !math.IsNaN(r.Error) {
			errCol = fmt.Sprintf("%.3g", r.Error)
		}
		tol, src := "-", r.Source
		switch r.Kind {
		case KindCheck:
			switch r.Compare {
			case AtMost:
				tol = fmt.Sprintf("<= %.3g", r.Tolerance)
			case AtLeast:
				tol = fmt.Sprintf(">= %.3g", r.Tolerance)
			default:
				tol = fmt.Sprintf("%.3g", r.Tolerance)
			}
			src += " [tol: " + r.TolFrom + "]"
		case KindDisagreement:
			src = r.Reason + "; " + r.Source
		}
		fmt.Fprintf(&b, "%-26s %-36s %s %s %10s %11s %-5s %-5s  %s\n",
			r.Case, r.Quantity, num(13, r.Computed), num(13, r.Reference), errCol, tol, r.Unit, r.Status(), src)
	}
	_, err := io.WriteString(w, b.String())
	return err
}
