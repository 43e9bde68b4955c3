package cases

import (
	"fmt"
	"os"
	"reflect"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
)

// A KeyError is an unknown or a missing key in a case file.
type KeyError struct {
	File    string // name given to Parse; may be empty
	Key     string // full key, arrays of tables 1-based: "sphere[2].radius"
	Line    int    // 1-based line of the key (of its table when missing); 0 if not known
	Missing bool   // a required key is absent; otherwise the key is unknown
	// Hint is the closest valid key at the level where Key went wrong,
	// or, when no key is close, a list of the valid keys there.
	Hint string
	// Close reports whether Hint is a single close match ("did you mean")
	// rather than a list of the valid keys.
	Close bool

	suggested string // the full key Hint stands for, when Close
}

func (e *KeyError) Error() string {
	var b strings.Builder
	if e.File != "" {
		b.WriteString(e.File)
		b.WriteString(": ")
	}
	if e.Missing {
		fmt.Fprintf(&b, "missing required key %q", e.Key)
		if e.Line > 0 {
			fmt.Fprintf(&b, " in the table at line %d", e.Line)
		}
		return b.String()
	}
	fmt.Fprintf(&b, "unknown key %q", e.Key)
	if e.Line > 0 {
		fmt.Fprintf(&b, " at line %d", e.Line)
	}
	switch {
	case e.Close:
		fmt.Fprintf(&b, ": did you mean %q?", e.Hint)
	case e.Hint != "":
		fmt.Fprintf(&b, ": valid keys here are %s", e.Hint)
	}
	return b.String()
}

// KeyErrors lists every unknown key of one case file, in the order they
// appear in the file, followed by every missing required key. Its Error
// method gives one line per key.
type KeyErrors []*KeyError

func (ke KeyErrors) Error() string {
	lines := make([]string, len(ke))
	for i, e := range ke {
		lines[i] = e.Error()
	}
	return strings.Join(lines, "\n")
}

// Load reads and parses the case file at path. See [Parse].
func Load(path string) (*Case, error) {
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("load case: %w", err)
	}
	return Parse(path, src)
}

// Parse decodes the case file src, using name (usually the file name) in
// error messages, and fills in the defaults (see [Default] and
// [Case.FillDefaults]). It does not validate the values: call
// [Case.Validate], or [Resolve], which validates first.
//
// Decoding is strict, straight into the schema types (see [Case]). Syntax
// and type errors are returned as the toml library reports them, with
// their line, wrapped with name. Unknown keys (including keys that differ
// from a valid one only in case) and missing required keys are all
// returned at once as [KeyErrors], each with its line (the case as far as
// it was read is returned with them, for listing its other problems too)
// and, for an unknown key, the closest valid key.
func Parse(name string, src []byte) (*Case, error) {
	c := Default() // the keys given are decoded over the defaults
	md, err := toml.Decode(string(src), c)
	if err != nil {
		if strings.Contains(err.Error(), "incompatible types") {
			err = fmt.Errorf("%w; fix: write the value as the key needs it: numbers without quotes "+
				"(viscosity = 0.001), whole numbers for counts (periods = 20), text in quotes (ends = \"closed\")", err)
		}
		if name == "" {
			return nil, err
		}
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	ownArrays(caseSchema, reflect.ValueOf(c).Elem()) // "sphere = []" gives no spheres, as an absent one
	// The same document as plain data, for the keys of arrays of tables,
	// which md.IsDefined cannot index. It decodes, since it did above.
	var doc map[string]any
	if _, err := toml.Decode(string(src), &doc); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	locs := scanKeys(string(src))
	errs := unknownKeys(name, md, locs)
	// A missing key that an unknown key was probably meant to be is not
	// worth a line of its own.
	meant := make(map[string]bool)
	for _, e := range errs {
		meant[e.suggested] = true
	}
	for _, e := range missingKeys(name, md, doc, locs) {
		if !meant[e.Key] {
			errs = append(errs, e)
		}
	}
	c.FillDefaults()
	if len(errs) > 0 {
		// The case as far as it could be read comes back too, so that a
		// caller can list the other problems at the same time.
		return c, errs
	}
	return c, nil
}

// missingKeys reports the required keys (case:"required") that are absent,
// in schema order. The keys required only in some cases (periods, duration,
// cell_size, the frequency of an arm without shaking) are checked by
// Validate.
//
// md.IsDefined tells the keys given in a table; it cannot look into the
// elements of an array of tables, so their keys are looked up in doc, the
// document decoded as plain data.
func missingKeys(name string, md toml.MetaData, doc map[string]any, locs []keyLoc) KeyErrors {
	var errs KeyErrors
	// walk checks the table t with the key path and the display name
	// table. elem is the table itself when it lies in an element of an
	// array of tables, nil otherwise.
	var walk func(t *key, path []string, table string, elem map[string]any)
	walk = func(t *key, path []string, table string, elem map[string]any) {
		for _, k := range t.keys {
			p := append(path[:len(path):len(path)], k.name)
			display := k.name
			if table != "" {
				display = table + "." + k.name
			}
			switch k.kind {
			case valueKey:
				given := md.IsDefined(p...)
				if elem != nil {
					_, given = elem[k.name]
				}
				if k.required && !given {
					errs = append(errs, &KeyError{File: name, Key: display, Line: tableLine(locs, table), Missing: true})
				}
			case tableKey:
				var sub map[string]any
				if elem != nil {
					if sub, _ = elem[k.name].(map[string]any); sub == nil {
						sub = map[string]any{}
					}
				}
				walk(k, p, display, sub)
			case arrayKey:
				v := docValue(doc, p)
				if elem != nil {
					v = elem[k.name]
				}
				for i, el := range tablesOf(v) {
					walk(k, p, fmt.Sprintf("%s[%d]", display, i+1), el)
				}
			}
		}
	}
	walk(caseSchema, nil, "", nil)
	return errs
}

// docValue returns the value at the index-free key path of doc, or nil.
func docValue(doc map[string]any, path []string) any {
	var v any = doc
	for _, p := range path {
		t, ok := v.(map[string]any)
		if !ok {
			return nil
		}
		v = t[p]
	}
	return v
}

// tablesOf returns the tables of an array of tables as decoded: from
// [[name]] headers, or an array of inline tables.
func tablesOf(v any) []map[string]any {
	switch v := v.(type) {
	case []map[string]any:
		return v
	case []any:
		ts := make([]map[string]any, 0, len(v))
		for _, x := range v {
			if t, ok := x.(map[string]any); ok {
				ts = append(ts, t)
			}
		}
		return ts
	}
	return nil
}

// tableLine returns the line where the table with the given display name
// ("fluid", "sphere[2]") is opened, or 0.
func tableLine(locs []keyLoc, table string) int {
	for _, l := range locs {
		if l.displayName(len(l.pieces), true) == table {
			return l.line
		}
	}
	return 0
}

// unknownKeys reports every key of the document that is not in the
// schema, in the order of the file. The toml library lists the keys it did
// not decode (MetaData.Undecoded), but it matches field names
// case-insensitively ("Ends" decodes into ends), so every key of the
// document (MetaData.Keys) is checked against the schema here,
// case-sensitively. The key scanner gives each key its line and the
// indices of its arrays of tables: the n-th occurrence of a key in the
// document is the n-th the scanner found. A key under an unknown table is
// not reported again.
func unknownKeys(name string, md toml.MetaData, locs []keyLoc) KeyErrors {
	found := make(map[string][]keyLoc) // by index-free key
	for _, l := range locs {
		k := strings.Join(l.pieces, "\x00")
		found[k] = append(found[k], l)
	}
	var errs KeyErrors
	seen := make(map[string]int) // occurrences of each index-free key so far
	shown := make(map[string]bool)
	for _, k := range md.Keys() {
		plain := strings.Join(k, "\x00")
		n := seen[plain]
		seen[plain]++
		lvl := caseSchema.badLevel(k)
		if lvl < 0 {
			continue
		}
		display, parent, line := k[:lvl+1].String(), k[:lvl].String(), 0
		if ls := found[plain]; n < len(ls) {
			l := ls[n]
			display, parent, line = l.displayName(lvl+1, false), l.displayName(lvl, true), l.line
		}
		if shown[display] {
			continue
		}
		shown[display] = true
		hint, close := suggest(k[lvl], caseSchema.at(k[:lvl]...))
		e := &KeyError{File: name, Key: display, Line: line, Hint: hint, Close: close}
		if close {
			e.suggested = hint
			if parent != "" {
				e.suggested = parent + "." + hint
			}
		}
		errs = append(errs, e)
	}
	sort.SliceStable(errs, func(i, j int) bool {
		li, lj := errs[i].Line, errs[j].Line
		if li == 0 || lj == 0 {
			return li != 0 && lj == 0
		}
		return li < lj
	})
	return errs
}

// suggest returns the closest valid key to bad in the table t, if one is
// close enough, and otherwise the list of valid keys there.
func suggest(bad string, t *key) (hint string, close bool) {
	if t == nil || t.kind == valueKey {
		return "", false
	}
	names := t.names()
	best, bestD := "", -1
	for _, k := range names {
		d := editDistance(strings.ToLower(bad), k)
		if bestD < 0 || d < bestD {
			best, bestD = k, d
		}
	}
	// Accept up to two edits, or a third of the key's length for long keys.
	if limit := max(2, len(best)/3); bestD >= 0 && bestD <= limit && bestD < len(bad) {
		return best, true
	}
	// Or an abbreviation of exactly one key.
	var prefixed []string
	for _, k := range names {
		if len(bad) >= 3 && strings.HasPrefix(k, strings.ToLower(bad)) {
			prefixed = append(prefixed, k)
		}
	}
	if len(prefixed) == 1 {
		return prefixed[0], true
	}
	quoted := make([]string, len(names))
	for i, k := range names {
		quoted[i] = fmt.Sprintf("%q", k)
	}
	return strings.Join(quoted, ", "), false
}

// editDistance is the optimal-string-alignment distance between a and b:
// insertions, deletions, substitutions and transpositions of adjacent
// characters each cost one.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev2 := make([]int, len(rb)+1)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(rb)]
}
