package cases

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"
)

// WriteTOML writes c as a case file with every default filled in (it calls
// FillDefaults on a copy first), so that the output documents exactly what
// was run. Parse reads the output back into an equal Case. Values that are
// zero because they were not given (cell_size, tau, periods, duration, ...)
// are left out, or written as a comment. The keys, their order and their
// comments are those of the schema types (see [Case]).
func (c *Case) WriteTOML(w io.Writer) error {
	cc := c.clone()
	cc.FillDefaults()
	e := &encoder{w: bufio.NewWriter(w)}

	if cc.Run.Title != "" {
		e.comment(cc.Run.Title)
	}
	e.comment("axiswim case; every default is filled in. SI units.")
	e.table(caseSchema, reflect.ValueOf(cc).Elem(), "")

	if e.err != nil {
		return fmt.Errorf("write case: %w", e.err)
	}
	if err := e.w.Flush(); err != nil {
		return fmt.Errorf("write case: %w", err)
	}
	return nil
}

// clone returns a deep copy of c; its empty arrays of tables are nil.
func (c *Case) clone() *Case {
	cc := *c
	ownArrays(caseSchema, reflect.ValueOf(&cc).Elem())
	return &cc
}

type encoder struct {
	w   *bufio.Writer
	err error
}

func (e *encoder) line(format string, args ...any) {
	if e.err == nil {
		_, e.err = fmt.Fprintf(e.w, format+"\n", args...)
	}
}

// comment writes text as comment lines; control characters, which TOML
// forbids even in comments, are written as \uXXXX escapes.
func (e *encoder) comment(text string) {
	for _, l := range strings.Split(text, "\n") {
		q := quoteString(l)
		e.line("# %s", strings.ReplaceAll(q[1:len(q)-1], `\"`, `"`))
	}
}

// table writes v, a value of the table t whose full key is path: its
// values first, then its tables and arrays of tables, each under its
// header.
func (e *encoder) table(t *key, v reflect.Value, path string) {
	for _, k := range t.keys {
		if k.kind == valueKey {
			e.value(k, v.Field(k.field))
		}
	}
	for _, k := range t.keys {
		name := k.name
		if path != "" {
			name = path + "." + k.name
		}
		f := v.Field(k.field)
		switch k.kind {
		case tableKey:
			e.line("\n[%s]", name)
			e.table(k, f, name)
		case arrayKey:
			for i := range f.Len() {
				if k.note != "" {
					e.line("\n[[%s]] # %s", name, fmt.Sprintf(k.note, i+1))
				} else {
					e.line("\n[[%s]]", name)
				}
				e.table(k, f.Index(i), name)
			}
		}
	}
}

// value writes the value v of the key k, or, when it is an omitted zero,
// the key's unset comment if it has one.
func (e *encoder) value(k *key, v reflect.Value) {
	if k.omitzero && isZero(v) {
		if k.unset != "" {
			e.comment(k.unset)
		}
		return
	}
	if k.note != "" {
		e.line("%s = %s # %s", k.name, tomlValue(v), k.note)
	} else {
		e.line("%s = %s", k.name, tomlValue(v))
	}
}

// isZero reports whether v is zero; for a float, whether it equals 0 (as
// -0 does).
func isZero(v reflect.Value) bool {
	if v.CanFloat() {
		return v.Float() == 0
	}
	return v.IsZero()
}

// tomlValue writes a value of the schema types as TOML.
func tomlValue(v reflect.Value) string {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		return formatFloat(v.Float())
	case reflect.String:
		return quoteString(v.String())
	case reflect.Array, reflect.Slice:
		elems := make([]string, v.Len())
		for i := range elems {
			elems[i] = tomlValue(v.Index(i))
		}
		return "[" + strings.Join(elems, ", ") + "]"
	}
	return fmt.Sprint(v.Interface()) // integers and booleans
}

// formatFloat writes v as a TOML float that parses back to exactly v.
func formatFloat(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan"
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	s := strconv.FormatFloat(v, 'g', -1, 64)
	if !strings.ContainsAny(s, ".e") {
		s += ".0"
	}
	return s
}

// quoteString writes s as a TOML basic string.
func quoteString(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"' || r == '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
