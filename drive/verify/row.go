package verify

import (
	"fmt"
	"io"
	"math"
	"strings"
)

// Row is one verified quantity: what was computed, what it is compared with,
// the error, the tolerance it must meet and the source of the reference.
type Row struct {
	Case      string
	Quantity  string
	Computed  float64
	Reference float64
	Error     float64 // in the unit of Tolerance
	Tolerance float64
	Unit      string // how Error is measured: "rel", "abs", "deg", "order"
	Source    string
	Pass      bool
}

// relRow compares computed with reference by relative error.
func relRow(cs, qty string, computed, reference, tol float64, src string) Row {
	e := math.Abs(computed-reference) / math.Abs(reference)
	return Row{Case: cs, Quantity: qty, Computed: computed, Reference: reference,
		Error: e, Tolerance: tol, Unit: "rel", Source: src, Pass: e <= tol}
}

// absRow compares by absolute difference (unit names what it is measured in).
func absRow(cs, qty string, computed, reference, tol float64, unit, src string) Row {
	e := math.Abs(computed - reference)
	return Row{Case: cs, Quantity: qty, Computed: computed, Reference: reference,
		Error: e, Tolerance: tol, Unit: unit, Source: src, Pass: e <= tol}
}

// boundRow passes when computed is at most the bound.
func boundRow(cs, qty string, computed, bound float64, src string) Row {
	return Row{Case: cs, Quantity: qty, Computed: computed, Reference: 0,
		Error: computed, Tolerance: bound, Unit: "bound", Source: src, Pass: computed <= bound}
}

// Status is "PASS" or "FAIL".
func (r Row) Status() string {
	if r.Pass {
		return "PASS"
	}
	return "FAIL"
}

// WriteTable prints rows as an aligned table with a header.
func WriteTable(w io.Writer, rows []Row) error {
	h := fmt.Sprintf("%-26s %-36s %13s %13s %10s %10s %-5s %-4s  %s\n",
		"case", "quantity", "computed", "reference", "error", "tolerance", "unit", "", "source")
	if _, err := io.WriteString(w, h); err != nil {
		return err
	}
	return WriteRows(w, rows)
}

// WriteRows prints rows aligned as by WriteTable, without the header.
func WriteRows(w io.Writer, rows []Row) error {
	var b strings.Builder
	for _, r := range rows {
		ref := fmt.Sprintf("%13.6g", r.Reference)
		if r.Unit == "bound" {
			ref = fmt.Sprintf("%13s", "-")
		}
		fmt.Fprintf(&b, "%-26s %-36s %13.6g %s %10.3g %10.3g %-5s %-4s  %s\n",
			r.Case, r.Quantity, r.Computed, ref, r.Error, r.Tolerance, r.Unit, r.Status(), r.Source)
	}
	_, err := io.WriteString(w, b.String())
	return err
}
