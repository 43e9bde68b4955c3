package cases_test

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"

	"axiswim/cases"
)

// FuzzParse feeds arbitrary case files to Parse, Validate and Resolve. None
// of them may panic; errors are the expected answer to most inputs. Every
// input that gets through all three must survive a round trip through
// WriteTOML and Parse unchanged, as WriteTOML promises.
//
// Seeds: the embedded examples, broken variants of the demo (made here),
// and the files in testdata/fuzz/FuzzParse.
func FuzzParse(f *testing.F) {
	for _, name := range cases.List() {
		src, err := cases.Get(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(src)
	}
	demo, err := cases.Get("demo")
	if err != nil {
		f.Fatal(err)
	}
	d := string(demo)
	for _, s := range []string{
		d[:len(d)/2], // cut in the middle
		strings.Replace(d, "viscosity", "viscocity", 1),                        // unknown key
		strings.Replace(d, "viscosity = 0.012", `viscosity = "0.012"`, 1),      // wrong type
		strings.Replace(d, "z = 0.0018", "z = -0.0018", 1),                     // overlapping spheres
		strings.Replace(d, "cells_per_radius = 12", "cells_per_radius = 4", 1), // too coarse
		strings.Replace(d, "cells_per_radius = 12", "cells_per_radius = 12\ntau = 0.5", 1),
		strings.Replace(d, "spheres = [1, 2]", "spheres = [1, 9]", 1),          // missing sphere
		strings.Replace(d, "density = 1180.0", "density = nan", 1),             // NaN
		strings.Replace(d, "length = 0.024", "length = inf", 1),                // infinite
		strings.Replace(d, "periods = 20", "periods = 9223372036854775807", 1), // huge count
		strings.Replace(d, `title = "demo`, `title = "demo\t\"\u00e9\\`, 1),    // escapes
		strings.Replace(d, "[[spring]]", "[spring]", 1),                        // table, not array
		"",
		"[fluid\n",
		"sphere = [{radius = 0.001, density = 1000.0, z = 0.0}]\n",
	} {
		f.Add([]byte(s))
	}

	f.Fuzz(func(t *testing.T, src []byte) {
		c, err := cases.Parse("fuzz.toml", src)
		if err != nil {
			// With unknown or missing keys Parse also returns the case as
			// far as it was read, for listing its other problems (as
			// axiswim check does); nothing it holds may make Validate or
			// Resolve panic.
			var ke cases.KeyErrors
			if c != nil {
				if !errors.As(err, &ke) {
					t.Fatalf("Parse returned a case with an error that is not KeyErrors: %v", err)
				}
				_ = c.Validate()
				_, _ = cases.Resolve(c)
			}
			return
		}
		if c == nil {
			t.Fatal("Parse returned neither a case nor an error")
		}
		if err := c.Validate(); err != nil {
			// Resolve validates first: it must refuse the case too.
			if l, rerr := cases.Resolve(c); rerr == nil || l != nil {
				t.Fatalf("Validate: %v\nbut Resolve gave %+v, %v", err, l, rerr)
			}
			return
		}
		l, err := cases.Resolve(c)
		if err != nil {
			if l != nil {
				t.Fatalf("Resolve returned a lattice and the error %v", err)
			}
			return
		}
		if l == nil {
			t.Fatal("Resolve returned neither a lattice nor an error")
		}
		var buf bytes.Buffer
		if err := c.WriteTOML(&buf); err != nil {
			t.Fatalf("WriteTOML: %v", err)
		}
		back, err := cases.Parse("written.toml", buf.Bytes())
		if err != nil {
			t.Fatalf("Parse(WriteTOML()): %v\n%s", err, buf.String())
		}
		if !reflect.DeepEqual(back, c) {
			t.Fatalf("round trip through WriteTOML changed the case\n got %+v\nwant %+v\n%s", back, c, buf.String())
		}
	})
}
