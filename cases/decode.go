package cases

import (
	"fmt"
	"os"
	"reflect"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"
)

// The raw* types are what a case file decodes into. Pointer fields tell a
// key that is absent from one given as zero. Their toml tags are the one
// list of valid keys: the strict-key check walks them by reflection.
type rawCase struct {
	Fluid     *rawFluid     `toml:"fluid"`
	Container *rawContainer `toml:"container"`
	Shaking   *rawShaking   `toml:"shaking"`
	Sphere    []rawSphere   `toml:"sphere"`
	Spring    []rawSpring   `toml:"spring"`
	Arm       []rawArm      `toml:"arm"`
	Bodies    *rawBodies    `toml:"bodies"`
	Output    *rawOutput    `toml:"output"`
	Grid      *rawGrid      `toml:"grid"`
	Solver    *rawSolver    `toml:"solver"`
	Run       *rawRun       `toml:"run"`
}

type rawFluid struct {
	Density   *float64 `toml:"density"`
	Viscosity *float64 `toml:"viscosity"`
}

type rawContainer struct {
	Radius *float64 `toml:"radius"`
	Length *float64 `toml:"length"`
	Ends   *string  `toml:"ends"`
}

type rawShaking struct {
	Frequency   *float64      `toml:"frequency"`
	Amplitude   *float64      `toml:"amplitude"`
	RampPeriods *float64      `toml:"ramp_periods"`
	Gravity     *float64      `toml:"gravity"`
	Harmonic    []rawHarmonic `toml:"harmonic"`
}

type rawHarmonic struct {
	Order     *int     `toml:"order"`
	Amplitude *float64 `toml:"amplitude"`
	Phase     *float64 `toml:"phase"`
}

type rawSphere struct {
	Radius  *float64 `toml:"radius"`
	Density *float64 `toml:"density"`
	Z       *float64 `toml:"z"`
}

type rawSpring struct {
	Spheres    *[2]int  `toml:"spheres"`
	Stiffness  *float64 `toml:"stiffness"`
	RestLength *float64 `toml:"rest_length"`
	Damping    *float64 `toml:"damping"`
}

type rawArm struct {
	Spheres   *[2]int  `toml:"spheres"`
	Length    *float64 `toml:"length"`
	Amplitude *float64 `toml:"amplitude"`
	Phase     *float64 `toml:"phase"`
	Frequency *float64 `toml:"frequency"`
}

type rawBodies struct {
	VirtualMass    *float64 `toml:"virtual_mass"`
	Coupling       *string  `toml:"coupling"`
	RepulsionRange *float64 `toml:"repulsion_range"`
}

type rawOutput struct {
	SnapshotsPerPeriod *int  `toml:"snapshots_per_period"`
	SnapshotPeriods    *int  `toml:"snapshot_periods"`
	AveragePeriods     *int  `toml:"average_periods"`
	Mirror             *bool `toml:"mirror"`
	VTK                *bool `toml:"vtk"`
	Pictures           *bool `toml:"pictures"`
}

type rawGrid struct {
	CellsPerRadius *int     `toml:"cells_per_radius"`
	CellSize       *float64 `toml:"cell_size"`
	Tau            *float64 `toml:"tau"`
}

type rawSolver struct {
	Collision *string  `toml:"collision"`
	Magic     *float64 `toml:"magic"`
	Precision *string  `toml:"precision"`
}

type rawRun struct {
	Periods          *int     `toml:"periods"`
	Duration         *float64 `toml:"duration"`
	SamplesPerPeriod *int     `toml:"samples_per_period"`
	SampleInterval   *float64 `toml:"sample_interval"`
	Title            *string  `toml:"title"`
}

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
// Decoding is strict. Syntax and type errors are returned as the toml
// library reports them, with their line, wrapped with name. Unknown keys
// (including keys that differ from a valid one only in case) and missing
// required keys are all returned at once as [KeyErrors], each with its line
// (the case as far as it was read is returned with them, for listing its
// other problems too)
// and, for an unknown key, the closest valid key.
func Parse(name string, src []byte) (*Case, error) {
	var raw rawCase
	md, err := toml.Decode(string(src), &raw)
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
	locs := scanKeys(string(src))
	errs := unknownKeys(name, md, locs)
	// A missing key that an unknown key was probably meant to be is not
	// worth a line of its own.
	meant := make(map[string]bool)
	for _, e := range errs {
		meant[e.suggested] = true
	}
	for _, e := range missingKeys(name, &raw, locs) {
		if !meant[e.Key] {
			errs = append(errs, e)
		}
	}
	c := raw.toCase()
	c.FillDefaults()
	if len(errs) > 0 {
		// The case as far as it could be read comes back too, so that a
		// caller can list the other problems at the same time.
		return c, errs
	}
	return c, nil
}

// toCase copies the given values over the defaults.
func (r *rawCase) toCase() *Case {
	c := Default()
	if f := r.Fluid; f != nil {
		set(&c.Fluid.Density, f.Density)
		set(&c.Fluid.Viscosity, f.Viscosity)
	}
	if k := r.Container; k != nil {
		set(&c.Container.Radius, k.Radius)
		set(&c.Container.Length, k.Length)
		set(&c.Container.Ends, k.Ends)
	}
	if s := r.Shaking; s != nil {
		set(&c.Shaking.Frequency, s.Frequency)
		set(&c.Shaking.Amplitude, s.Amplitude)
		set(&c.Shaking.RampPeriods, s.RampPeriods)
		set(&c.Shaking.Gravity, s.Gravity)
		for _, rh := range s.Harmonic {
			var h Harmonic
			set(&h.Order, rh.Order)
			set(&h.Amplitude, rh.Amplitude)
			set(&h.Phase, rh.Phase)
			c.Shaking.Harmonics = append(c.Shaking.Harmonics, h)
		}
	}
	for _, rs := range r.Sphere {
		var s Sphere
		set(&s.Radius, rs.Radius)
		set(&s.Density, rs.Density)
		set(&s.Z, rs.Z)
		c.Spheres = append(c.Spheres, s)
	}
	for _, rs := range r.Spring {
		var s Spring
		set(&s.Spheres, rs.Spheres)
		set(&s.Stiffness, rs.Stiffness)
		set(&s.RestLength, rs.RestLength)
		set(&s.Damping, rs.Damping)
		c.Springs = append(c.Springs, s)
	}
	for _, ra := range r.Arm {
		var a Arm
		set(&a.Spheres, ra.Spheres)
		set(&a.Length, ra.Length)
		set(&a.Amplitude, ra.Amplitude)
		set(&a.Phase, ra.Phase)
		set(&a.Frequency, ra.Frequency)
		c.Arms = append(c.Arms, a)
	}
	if o := r.Output; o != nil {
		set(&c.Output.SnapshotsPerPeriod, o.SnapshotsPerPeriod)
		set(&c.Output.SnapshotPeriods, o.SnapshotPeriods)
		set(&c.Output.AveragePeriods, o.AveragePeriods)
		set(&c.Output.Mirror, o.Mirror)
		set(&c.Output.VTK, o.VTK)
		set(&c.Output.Pictures, o.Pictures)
	}
	if b := r.Bodies; b != nil {
		set(&c.Bodies.VirtualMass, b.VirtualMass)
		set(&c.Bodies.Coupling, b.Coupling)
		set(&c.Bodies.RepulsionRange, b.RepulsionRange)
	}
	if g := r.Grid; g != nil {
		set(&c.Grid.CellsPerRadius, g.CellsPerRadius)
		set(&c.Grid.CellSize, g.CellSize)
		set(&c.Grid.Tau, g.Tau)
	}
	if s := r.Solver; s != nil {
		set(&c.Solver.Collision, s.Collision)
		set(&c.Solver.Magic, s.Magic)
		set(&c.Solver.Precision, s.Precision)
	}
	if u := r.Run; u != nil {
		set(&c.Run.Periods, u.Periods)
		set(&c.Run.Duration, u.Duration)
		set(&c.Run.SamplesPerPeriod, u.SamplesPerPeriod)
		set(&c.Run.SampleInterval, u.SampleInterval)
		set(&c.Run.Title, u.Title)
	}
	return c
}

func set[T any](dst *T, src *T) {
	if src != nil {
		*dst = *src
	}
}

// missingKeys reports the unconditionally required keys that are absent.
// The keys required only in some cases (periods, duration, cell_size, the
// frequency of an arm without shaking) are checked by Validate.
func missingKeys(name string, r *rawCase, locs []keyLoc) KeyErrors {
	var errs KeyErrors
	miss := func(table, key string) {
		errs = append(errs, &KeyError{
			File:    name,
			Key:     table + "." + key,
			Line:    tableLine(locs, table),
			Missing: true,
		})
	}
	if r.Fluid == nil || r.Fluid.Density == nil {
		miss("fluid", "density")
	}
	if r.Fluid == nil || r.Fluid.Viscosity == nil {
		miss("fluid", "viscosity")
	}
	if r.Container == nil || r.Container.Radius == nil {
		miss("container", "radius")
	}
	if r.Container == nil || r.Container.Length == nil {
		miss("container", "length")
	}
	for i, s := range r.Sphere {
		t := fmt.Sprintf("sphere[%d]", i+1)
		if s.Radius == nil {
			miss(t, "radius")
		}
		if s.Density == nil {
			miss(t, "density")
		}
		if s.Z == nil {
			miss(t, "z")
		}
	}
	for i, s := range r.Spring {
		t := fmt.Sprintf("spring[%d]", i+1)
		if s.Spheres == nil {
			miss(t, "spheres")
		}
		if s.Stiffness == nil {
			miss(t, "stiffness")
		}
	}
	if r.Shaking != nil {
		for i, h := range r.Shaking.Harmonic {
			t := fmt.Sprintf("shaking.harmonic[%d]", i+1)
			if h.Order == nil {
				miss(t, "order")
			}
			if h.Amplitude == nil {
				miss(t, "amplitude")
			}
		}
	}
	for i, a := range r.Arm {
		t := fmt.Sprintf("arm[%d]", i+1)
		if a.Spheres == nil {
			miss(t, "spheres")
		}
		if a.Length == nil {
			miss(t, "length")
		}
		if a.Amplitude == nil {
			miss(t, "amplitude")
		}
	}
	return errs
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

// schemaNode is one level of the key schema derived from rawCase.
type schemaNode struct {
	children map[string]*schemaNode // nil for a value
}

func schemaOf(t reflect.Type) *schemaNode {
	for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
		t = t.Elem()
	}
	if t.Kind() != reflect.Struct {
		return &schemaNode{}
	}
	n := &schemaNode{children: make(map[string]*schemaNode)}
	for i := range t.NumField() {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		n.children[name] = schemaOf(f.Type)
	}
	return n
}

// badLevel returns the index of the first piece of key that is not in the
// schema, or -1 if the whole key is valid. Matching is case-sensitive,
// unlike the toml library's.
func (n *schemaNode) badLevel(key []string) int {
	for i, p := range key {
		if n.children == nil {
			return i
		}
		c, ok := n.children[p]
		if !ok {
			return i
		}
		n = c
	}
	return -1
}

// at returns the node reached by key, which must be valid.
func (n *schemaNode) at(key []string) *schemaNode {
	for _, p := range key {
		n = n.children[p]
	}
	return n
}

// unknownKeys reports every key of the document that is not in the schema.
// The toml library lists the undecoded keys (MetaData.Undecoded) but not
// their lines, and it matches field names case-insensitively, so the keys
// are checked here against the schema and located with scanKeys. A key
// under an unknown table is not reported again.
func unknownKeys(name string, md toml.MetaData, locs []keyLoc) KeyErrors {
	schema := schemaOf(reflect.TypeFor[rawCase]())
	var errs KeyErrors
	seen := make(map[string]bool) // plain (index-free) keys reported, truncated
	shown := make(map[string]bool)
	report := func(pieces []string, display, parent string, line int) {
		lvl := schema.badLevel(pieces)
		if lvl < 0 {
			return
		}
		plain := strings.Join(pieces[:lvl+1], "\x00")
		seen[plain] = true
		if shown[display] {
			return
		}
		shown[display] = true
		hint, close := suggest(pieces[lvl], schema.at(pieces[:lvl]))
		e := &KeyError{File: name, Key: display, Line: line, Hint: hint, Close: close}
		if close {
			e.suggested = hint
			if parent != "" {
				e.suggested = parent + "." + hint
			}
		}
		errs = append(errs, e)
	}
	for _, l := range locs {
		lvl := schema.badLevel(l.pieces)
		if lvl < 0 {
			continue
		}
		report(l.pieces, l.displayName(lvl+1, false), l.displayName(lvl, true), l.line)
	}
	// Anything the scanner missed: keys the library saw but left undecoded,
	// or that are not in the schema. Report them without a line.
	all := append(md.Undecoded(), md.Keys()...)
	for _, k := range all {
		lvl := schema.badLevel(k)
		if lvl < 0 {
			continue
		}
		covered := false
		for i := 1; i <= lvl+1; i++ {
			if seen[strings.Join(k[:i], "\x00")] {
				covered = true
				break
			}
		}
		if !covered {
			report(k, toml.Key(k[:lvl+1]).String(), toml.Key(k[:lvl]).String(), 0)
		}
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

// suggest returns the closest valid key to bad at schema level n, if one is
// close enough, and otherwise the list of valid keys there.
func suggest(bad string, n *schemaNode) (hint string, close bool) {
	if n == nil || n.children == nil {
		return "", false
	}
	names := make([]string, 0, len(n.children))
	for k := range n.children {
		names = append(names, k)
	}
	sort.Strings(names)
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
