package verify

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

// TestRowHelpers: each check helper computes its verdict from the value,
// the reference and the tolerance, and each can fail (NaN included);
// information rows and known disagreements never pass and never fail.
func TestRowHelpers(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		name string
		r    Row
		pass bool
	}{
		{"withinRel inside", withinRel("c", "q", 1.009, 1, 0.01, "s", "t"), true},
		{"withinRel outside", withinRel("c", "q", 1.02, 1, 0.01, "s", "t"), false},
		{"withinRel negative reference", withinRel("c", "q", -1.02, -1, 0.01, "s", "t"), false},
		{"withinRel NaN", withinRel("c", "q", nan, 1, 0.01, "s", "t"), false},
		{"within inside", within("c", "q", 2.1, 2, 0.2, "order", "s", "t"), true},
		{"within outside", within("c", "q", 1.7, 2, 0.2, "order", "s", "t"), false},
		{"within yes", within("c", "q", yes(true), 1, 0, "yes", "s", "t"), true},
		{"within no", within("c", "q", yes(false), 1, 0, "yes", "s", "t"), false},
		{"within NaN", within("c", "q", nan, 2, 0.2, "abs", "s", "t"), false},
		{"atMost below", atMost("c", "q", 0.5, 1, "s", "t"), true},
		{"atMost equal", atMost("c", "q", 1, 1, "s", "t"), true},
		{"atMost above", atMost("c", "q", 1.5, 1, "s", "t"), false},
		{"atMost NaN", atMost("c", "q", nan, 1, "s", "t"), false},
		{"atLeast above", atLeast("c", "q", 1.9, 0.5, "s", "t"), true},
		{"atLeast below", atLeast("c", "q", 0.4, 0.5, "s", "t"), false},
		{"atLeast NaN", atLeast("c", "q", nan, 0.5, "s", "t"), false},
	} {
		if c.r.Kind != KindCheck || c.r.Pass != c.pass || c.r.Failed() == c.pass {
			t.Errorf("%s: kind %v, pass %v, failed %v; want a check with pass %v", c.name, c.r.Kind, c.r.Pass, c.r.Failed(), c.pass)
		}
	}
	if r := withinRel("c", "q", 1.02, 1, 0.01, "s", "t"); math.Abs(r.Error-0.02) > 1e-15 {
		t.Errorf("withinRel error %g, want 0.02", r.Error)
	}
	for _, r := range []Row{info("c", "q", 1, nan, "s"), disagreement("c", "q", 0.54, 0, "abs", "why", "paper")} {
		if r.Pass || r.Failed() {
			t.Errorf("%v row: pass %v, failed %v; want neither", r.Kind, r.Pass, r.Failed())
		}
	}
	if d := disagreement("c", "q", 0.54, 0, "abs", "why", "paper"); d.Error != 0.54 {
		t.Errorf("disagreement error %g, want 0.54", d.Error)
	}
}

// TestWriteTableKinds: the table prints each row's kind (PASS, FAIL, INFO,
// KNOWN), bounds with their direction, the tolerance's origin for checks
// and the reason for disagreements, and Tally counts the kinds apart.
func TestWriteTableKinds(t *testing.T) {
	rows := []Row{
		withinRel("case-pass", "q", 1, 1, 0.01, "src-pass", "tol-pass"),
		atMost("case-fail", "q", 2, 1, "src-fail", "tol-fail"),
		atLeast("case-min", "q", 2, 1, "src-min", "tol-min"),
		info("case-info", "q", 3, math.NaN(), "src-info"),
		disagreement("case-known", "q", 0.5, 0, "abs", "reason-known", "src-known"),
	}
	var b bytes.Buffer
	if err := WriteTable(&b, rows); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(b.String()), "\n")
	if len(lines) != len(rows)+1 {
		t.Fatalf("%d lines, want a header and %d rows:\n%s", len(lines), len(rows), b.String())
	}
	for i, want := range [][]string{
		{"case-pass", " PASS ", "src-pass [tol: tol-pass]"},
		{"case-fail", " FAIL ", "<= 1", "[tol: tol-fail]"},
		{"case-min", " PASS ", ">= 1", "[tol: tol-min]"},
		{"case-info", " INFO ", "src-info"},
		{"case-known", " KNOWN ", "reason-known; src-known"},
	} {
		for _, w := range want {
			if !strings.Contains(lines[i+1], w) {
				t.Errorf("row %d lacks %q:\n%s", i, w, lines[i+1])
			}
		}
	}
	if strings.Contains(lines[4], "[tol:") || strings.Contains(lines[5], "[tol:") {
		t.Errorf("information or disagreement row with a tolerance:\n%s\n%s", lines[4], lines[5])
	}
	var tally Tally
	tally.Add(rows)
	if want := (Tally{Passed: 2, Failed: 1, Info: 1, Known: 1}); tally != want {
		t.Errorf("tally %+v, want %+v", tally, want)
	}
	if s := tally.String(); !strings.Contains(s, "2 passed, 1 failed") || !strings.Contains(s, "1 information") || !strings.Contains(s, "1 known disagreement") {
		t.Errorf("tally string %q", s)
	}
}
