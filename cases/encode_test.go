package cases

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

func TestWriteTOMLRoundTrip(t *testing.T) {
	cs := resolveCases(t)
	full := mustParse(t, "worked", workedExample)
	full.Spheres = append(full.Spheres, Sphere{Radius: 0.001, Density: 268.75, Z: 0.004})
	full.Springs = []Spring{{Spheres: [2]int{1, 2}, Stiffness: 0.05, RestLength: 0.0036, Damping: 1e-7}}
	full.Grid.Tau = 0.55
	full.Solver = Solver{Collision: CollisionMRT, Magic: 0.25}
	full.Shaking.Gravity = 0
	full.Shaking.RampPeriods = 0
	full.Run.Title = "quotes \" and \\ backslash\nnew line, tab\t and ünïcode"
	full.Run.SamplesPerPeriod = 7
	cs["full"] = full

	for name, c := range cs {
		var buf bytes.Buffer
		if err := c.WriteTOML(&buf); err != nil {
			t.Fatalf("%s: WriteTOML: %v", name, err)
		}
		back, err := Parse(name, buf.Bytes())
		if err != nil {
			t.Errorf("%s: Parse(WriteTOML()): %v\n%s", name, err, buf.String())
			continue
		}
		want := c.clone()
		want.FillDefaults()
		if !reflect.DeepEqual(back, want) {
			t.Errorf("%s: round trip\n got %+v\nwant %+v\n%s", name, back, want, buf.String())
		}
		// Writing is idempotent.
		var again bytes.Buffer
		if err := back.WriteTOML(&again); err != nil || again.String() != buf.String() {
			t.Errorf("%s: second WriteTOML differs (err %v)", name, err)
		}
	}
}

func TestWriteTOMLFillsDefaults(t *testing.T) {
	src, err := Get("demo")
	if err != nil {
		t.Fatal(err)
	}
	c := mustParse(t, "demo", string(src))
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{"rest_length = 0.0036", "magic = 0.1875", "damping = 0.0", "ramp_periods = 2.0", "samples_per_period = 20"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
}

// TestWriteTOMLControlCharacters: a title with control characters (which
// TOML forbids even in comments) still gives a case file that reads back,
// with the same title (found by a fuzz seed).
func TestWriteTOMLControlCharacters(t *testing.T) {
	src, _ := Get("pipe-poiseuille")
	c, err := Parse("p", src)
	if err != nil {
		t.Fatal(err)
	}
	c.Run.Title = "a\u0001b\u0000c\rd\u007f"
	var buf bytes.Buffer
	if err := c.WriteTOML(&buf); err != nil {
		t.Fatal(err)
	}
	back, err := Parse("written", buf.Bytes())
	if err != nil {
		t.Fatalf("the written case does not read back: %v", err)
	}
	if back.Run.Title != c.Run.Title {
		t.Errorf("title %q came back as %q", c.Run.Title, back.Run.Title)
	}
}

// TestWriteTOMLGolden: the case file WriteTOML writes for each embedded
// example, and for testdata/written/every-key.in (harmonics, a spring, an
// arm without frequency, given tau and cell_size, levels and margins, an
// unshaken run), is the
// one in testdata/written, byte for byte.
func TestWriteTOMLGolden(t *testing.T) {
	srcs := make(map[string][]byte)
	for _, name := range List() {
		src, err := Get(name)
		if err != nil {
			t.Fatal(err)
		}
		srcs[name] = src
	}
	src, err := os.ReadFile(filepath.Join("testdata", "written", "every-key.in"))
	if err != nil {
		t.Fatal(err)
	}
	srcs["every-key"] = src
	for name, src := range srcs {
		c, err := Parse(name, src)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		var buf bytes.Buffer
		if err := c.WriteTOML(&buf); err != nil {
			t.Fatalf("%s: WriteTOML: %v", name, err)
		}
		want, err := os.ReadFile(filepath.Join("testdata", "written", name+".toml"))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(buf.Bytes(), want) {
			t.Errorf("%s: WriteTOML wrote\n%s\nwant\n%s", name, buf.Bytes(), want)
		}
	}
}
