package cases

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
)

// A Sweep is a base case and one or two of its keys varied over lists of
// values: the points of the sweep are every combination, first key
// slowest. It is read from a sweep file:
//
//	title = "onset in amplitude"
//	base = "demo.toml"          # a case file, relative to the sweep file, or an embedded case name
//
//	[[vary]]
//	key = "shaking.amplitude"   # any case key: section.key, or table[N].key (sphere[2].density, N from 1)
//	values = [2e-4, 5e-4, 1e-3] # a list, or a range:
//	# from = 2e-4, to = 1e-3, points = 5, scale = "log" (or "linear", the default)
type Sweep struct {
	Title  string
	Name   string // the sweep file's name without extension
	Base   string // where the base case came from
	Params []Param

	base map[string]any // the base case as TOML data
}

// Param is one varied key and its values.
type Param struct {
	Key    string
	Values []float64
	Log    bool // scale = "log": values spaced logarithmically, drawn on a log axis
}

// Point is one combination of the varied values, in Params order.
type Point []float64

// Scales of a range in a sweep file.
const (
	ScaleLinear = "linear"
	ScaleLog    = "log"
)

// maxSweepPoints bounds the number of points of a sweep file (a typo in
// points would otherwise start a week of runs).
const maxSweepPoints = 1000

type rawSweep struct {
	Title string     `toml:"title"`
	Base  string     `toml:"base"`
	Vary  []rawParam `toml:"vary"`
}

type rawParam struct {
	Key    string    `toml:"key"`
	Values []float64 `toml:"values"`
	From   *float64  `toml:"from"`
	To     *float64  `toml:"to"`
	Points int       `toml:"points"`
	Scale  string    `toml:"scale"`
}

// LoadSweep reads a sweep file; base case paths are relative to it.
func LoadSweep(path string) (*Sweep, error) {
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("read sweep: %w", err)
	}
	name := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	return ParseSweep(name, src, filepath.Dir(path))
}

// ParseSweep reads a sweep file's content; dir is where base case paths
// start from.
func ParseSweep(name string, src []byte, dir string) (*Sweep, error) {
	var raw rawSweep
	md, err := toml.Decode(string(src), &raw)
	if err != nil {
		return nil, fmt.Errorf("sweep %s: %w", name, err)
	}
	if un := md.Undecoded(); len(un) > 0 {
		return nil, fmt.Errorf("sweep %s: unknown key %q: the keys are title, base and [[vary]] with key, values or from/to/points/scale", name, un[0].String())
	}
	if raw.Base == "" {
		return nil, fmt.Errorf("sweep %s: base is missing: give the case file to vary (base = \"case.toml\") or an embedded case name (base = \"demo\")", name)
	}
	caseSrc, _, err := Open(raw.Base, dir) // a file relative to dir first, then an embedded case
	if err != nil {
		return nil, fmt.Errorf("sweep %s: base = %q: %w", name, raw.Base, err)
	}
	s, err := newSweep(name, raw.Base, caseSrc)
	if err != nil {
		return nil, err
	}
	s.Title = raw.Title
	if len(raw.Vary) == 0 || len(raw.Vary) > 2 {
		return nil, fmt.Errorf("sweep %s: %d [[vary]] tables: give one or two", name, len(raw.Vary))
	}
	total := 1
	for n, p := range raw.Vary {
		values, err := p.values()
		if err != nil {
			return nil, fmt.Errorf("sweep %s: vary %d (key %q): %w", name, n+1, p.Key, err)
		}
		if err := s.add(Param{Key: p.Key, Values: values, Log: p.Scale == ScaleLog}); err != nil {
			return nil, fmt.Errorf("sweep %s: vary %d: %w", name, n+1, err)
		}
		total *= len(values)
	}
	if len(s.Params) == 2 && s.Params[0].Key == s.Params[1].Key {
		return nil, fmt.Errorf("sweep %s: key %q is varied twice: vary two different keys", name, s.Params[0].Key)
	}
	if total > maxSweepPoints {
		return nil, fmt.Errorf("sweep %s: %d points, more than %d: use fewer values", name, total, maxSweepPoints)
	}
	return s, nil
}

// NewSweep makes a sweep of the case caseSrc (TOML; base names where it
// came from) with one or two keys varied, as a sweep file would: each key
// is checked against the case, each value list must be non-empty.
func NewSweep(name, base string, caseSrc []byte, params ...Param) (*Sweep, error) {
	s, err := newSweep(name, base, caseSrc)
	if err != nil {
		return nil, err
	}
	if len(params) == 0 || len(params) > 2 {
		return nil, fmt.Errorf("sweep %s: %d keys varied: give one or two", name, len(params))
	}
	for _, p := range params {
		if len(p.Values) == 0 {
			return nil, fmt.Errorf("sweep %s: key %q has no values", name, p.Key)
		}
		if err := s.add(Param{Key: p.Key, Values: slices.Clone(p.Values), Log: p.Log}); err != nil {
			return nil, fmt.Errorf("sweep %s: %w", name, err)
		}
	}
	return s, nil
}

// add checks that p's key is one the base case takes (with its first
// value) and adds p.
func (s *Sweep) add(p Param) error {
	if _, err := s.apply(cloneTOML(s.base).(map[string]any), p.Key, p.Values[0]); err != nil {
		return err
	}
	s.Params = append(s.Params, p)
	return nil
}

// newSweep checks the base case and keeps it as TOML data.
func newSweep(name, base string, caseSrc []byte) (*Sweep, error) {
	s := &Sweep{Name: name, Base: base}
	if _, err := Parse(base, caseSrc); err != nil {
		return nil, fmt.Errorf("sweep %s: base case: %w", name, err)
	}
	if _, err := toml.Decode(string(caseSrc), &s.base); err != nil {
		return nil, fmt.Errorf("sweep %s: base case: %w", name, err)
	}
	return s, nil
}

// values expands a [[vary]] table.
func (p rawParam) values() ([]float64, error) {
	if p.Key == "" {
		return nil, fmt.Errorf("key is missing: name the case key to vary, e.g. key = \"shaking.amplitude\"")
	}
	rng := p.From != nil || p.To != nil || p.Points != 0 // scale alone with values: the axis of the pictures
	switch {
	case len(p.Values) > 0 && rng:
		return nil, fmt.Errorf("both values and a range: give one of them")
	case len(p.Values) > 0:
		if p.Scale != "" && p.Scale != ScaleLinear && p.Scale != ScaleLog {
			return nil, fmt.Errorf("scale = %q: use %q or %q", p.Scale, ScaleLinear, ScaleLog)
		}
		for _, v := range p.Values {
			if p.Scale == ScaleLog && !(v > 0) {
				return nil, fmt.Errorf("value %g with scale = \"log\": values must be positive", v)
			}
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("value %g: must be finite", v)
			}
		}
		return p.Values, nil
	case !rng:
		return nil, fmt.Errorf("no values: give values = [...] or from, to and points")
	case p.From == nil || p.To == nil:
		return nil, fmt.Errorf("a range needs from and to")
	case p.Points < 2:
		return nil, fmt.Errorf("points = %d: a range needs at least 2 points", p.Points)
	}
	lo, hi := *p.From, *p.To
	scale := p.Scale
	if scale == "" {
		scale = ScaleLinear
	}
	out := make([]float64, p.Points)
	switch scale {
	case ScaleLinear:
		for i := range out {
			out[i] = lo + (hi-lo)*float64(i)/float64(p.Points-1)
		}
	case ScaleLog:
		if !(lo > 0 && hi > 0) {
			return nil, fmt.Errorf("scale = \"log\" with from = %g, to = %g: both must be positive", lo, hi)
		}
		for i := range out {
			out[i] = lo * math.Pow(hi/lo, float64(i)/float64(p.Points-1))
		}
	default:
		return nil, fmt.Errorf("scale = %q: use %q or %q", scale, ScaleLinear, ScaleLog)
	}
	out[0], out[len(out)-1] = lo, hi // exactly the ends asked for
	return out, nil
}

// Points returns every combination of the varied values, the first key
// slowest.
func (s *Sweep) Points() []Point {
	pts := []Point{{}}
	for _, p := range s.Params {
		var next []Point
		for _, pt := range pts {
			for _, v := range p.Values {
				next = append(next, append(append(Point{}, pt...), v))
			}
		}
		pts = next
	}
	return pts
}

// CaseAt returns the case of point pt as TOML (the base case with the
// varied keys set) and parsed.
func (s *Sweep) CaseAt(pt Point) ([]byte, *Case, error) {
	if len(pt) != len(s.Params) {
		return nil, nil, fmt.Errorf("point of %d values for %d varied keys", len(pt), len(s.Params))
	}
	data := cloneTOML(s.base).(map[string]any)
	for i, p := range s.Params {
		var err error
		if data, err = s.apply(data, p.Key, pt[i]); err != nil {
			return nil, nil, err
		}
	}
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(data); err != nil {
		return nil, nil, fmt.Errorf("write the case of point %v: %w", pt, err)
	}
	c, err := Parse(s.Name, buf.Bytes())
	if err != nil {
		return nil, nil, fmt.Errorf("point %s: %w", s.Label(pt), err)
	}
	return buf.Bytes(), c, nil
}

// Label describes a point: key=value for each varied key.
func (s *Sweep) Label(pt Point) string {
	var parts []string
	for i, p := range s.Params {
		if i < len(pt) {
			parts = append(parts, fmt.Sprintf("%s=%.4g", p.Key, pt[i]))
		}
	}
	return strings.Join(parts, ", ")
}

// apply sets key (section.key, or table[N].key such as sphere[2].density;
// table.N.key is read the same way)
// to v in data, a copy of which it returns: as a whole number where the
// base case has one there, or where the schema takes one.
func (s *Sweep) apply(data map[string]any, key string, v float64) (map[string]any, error) {
	parts := strings.Split(key, ".")
	if len(parts) == 2 { // sphere[2].density, the notation of the case errors
		if t, n, ok := strings.Cut(parts[0], "["); ok && strings.HasSuffix(n, "]") {
			parts = []string{t, strings.TrimSuffix(n, "]"), parts[1]}
		}
	}
	full := key
	if len(parts) == 3 {
		full = fmt.Sprintf("%s[%s].%s", parts[0], parts[1], parts[2])
	}
	var table map[string]any
	switch len(parts) {
	case 2:
		t, ok := data[parts[0]].(map[string]any)
		if !ok {
			t = map[string]any{}
			data[parts[0]] = t
		}
		table = t
	case 3:
		list, ok := data[parts[0]].([]map[string]any)
		n, err := strconv.Atoi(parts[1])
		if !ok {
			return nil, fmt.Errorf("key %q: the base case has no [[%s]] tables", key, parts[0])
		}
		if err != nil || n < 1 || n > len(list) {
			return nil, fmt.Errorf("key %q: %q is not a number from 1 to %d (the [[%s]] tables of the base case)", key, parts[1], len(list), parts[0])
		}
		table = list[n-1]
	default:
		return nil, fmt.Errorf("key %q: write section.key (shaking.amplitude) or table[N].key (sphere[2].density)", key)
	}
	name := parts[len(parts)-1]
	switch old := table[name].(type) {
	case int64:
		if v != math.Trunc(v) {
			return nil, fmt.Errorf("key %q takes whole numbers, not %g", key, v)
		}
		table[name] = int64(v)
	case nil, float64:
		if k := caseSchema.at(parts[0], name); old == nil && v == math.Trunc(v) && k != nil && k.whole() {
			table[name] = int64(v)
		} else {
			table[name] = v
		}
	default:
		return nil, fmt.Errorf("key %q holds %v in the base case, not a number", key, old)
	}
	// The key must be one the case knows.
	var buf bytes.Buffer
	if err := toml.NewEncoder(&buf).Encode(data); err != nil {
		return nil, err
	}
	if _, err := Parse("", buf.Bytes()); err != nil {
		if ke, ok := err.(KeyErrors); ok {
			for _, e := range ke {
				if e.Key == full {
					e.Line, e.File = 0, "" // lines of the case as rewritten, not of a user's file
					return nil, fmt.Errorf("key %q: %w", key, e)
				}
			}
		}
	}
	return data, nil
}

// cloneTOML deep-copies decoded TOML data.
func cloneTOML(v any) any {
	switch t := v.(type) {
	case map[string]any:
		m := make(map[string]any, len(t))
		for k, x := range t {
			m[k] = cloneTOML(x)
		}
		return m
	case []map[string]any:
		l := make([]map[string]any, len(t))
		for i, x := range t {
			l[i] = cloneTOML(x).(map[string]any)
		}
		return l
	case []any:
		l := make([]any, len(t))
		for i, x := range t {
			l[i] = cloneTOML(x)
		}
		return l
	}
	return v
}

// WriteFiles writes the sweep into dir as sweep.toml with the base case
// beside it as base.toml and every varied key's values listed, so that
// LoadSweep of dir/sweep.toml gives the same points whatever happens to
// the original files.
func (s *Sweep) WriteFiles(dir string, write func(path string, data []byte) error) error {
	var base bytes.Buffer
	if err := toml.NewEncoder(&base).Encode(s.base); err != nil {
		return fmt.Errorf("write the base case: %w", err)
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, "# the sweep as run (base case copied to base.toml)\n")
	if s.Title != "" {
		fmt.Fprintf(&b, "title = %s\n", strconv.Quote(s.Title))
	}
	fmt.Fprintf(&b, "base = \"base.toml\"\n")
	for _, p := range s.Params {
		vals := make([]string, len(p.Values))
		for i, v := range p.Values {
			vals[i] = strconv.FormatFloat(v, 'g', -1, 64)
			if !strings.ContainsAny(vals[i], ".eE") {
				vals[i] += ".0" // a float in TOML
			}
		}
		fmt.Fprintf(&b, "\n[[vary]]\nkey = %s\nvalues = [%s]\n", strconv.Quote(p.Key), strings.Join(vals, ", "))
		if p.Log {
			fmt.Fprintf(&b, "scale = %q\n", ScaleLog)
		}
	}
	if err := write(filepath.Join(dir, "base.toml"), base.Bytes()); err != nil {
		return err
	}
	return write(filepath.Join(dir, "sweep.toml"), b.Bytes())
}
