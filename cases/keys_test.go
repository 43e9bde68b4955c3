package cases

import (
	"reflect"
	"strings"
	"testing"
)

// TestSchemaTags: the struct tags of the schema types are well formed.
// Every field has a key, distinct in its table even ignoring case (the toml
// library matches keys case-insensitively); case is "required" or absent;
// omitzero and unset are on values only, unset only with omitzero; the
// note of an array of tables has one %d.
func TestSchemaTags(t *testing.T) {
	var check func(tbl *key, typ reflect.Type, path string)
	check = func(tbl *key, typ reflect.Type, path string) {
		seen := make(map[string]bool)
		for _, k := range tbl.keys {
			f := typ.Field(k.field)
			name := path + k.name
			if seen[strings.ToLower(k.name)] {
				t.Errorf("%s: key given twice", name)
			}
			seen[strings.ToLower(k.name)] = true
			if c := f.Tag.Get("case"); c != "" && c != "required" {
				t.Errorf("%s: case:%q, want \"required\" or nothing", name, c)
			}
			if k.kind != valueKey && (k.omitzero || k.unset != "" || k.required) {
				t.Errorf("%s: omitzero, unset or required on a table", name)
			}
			if k.unset != "" && !k.omitzero {
				t.Errorf("%s: unset without omitzero", name)
			}
			switch k.kind {
			case tableKey:
				check(k, f.Type, name+".")
			case arrayKey:
				if k.note != "" && (strings.Count(k.note, "%") != 1 || !strings.Contains(k.note, "%d")) {
					t.Errorf("%s: note %q of an array of tables needs one %%d", name, k.note)
				}
				check(k, f.Type.Elem(), name+".")
			}
		}
	}
	check(caseSchema, reflect.TypeFor[Case](), "")
}

// TestSchemaKeys: the schema read from the types has the keys of a case
// file where they belong, and whole() picks the integer keys.
func TestSchemaKeys(t *testing.T) {
	for _, tc := range []struct {
		path  []string
		kind  keyKind
		whole bool
	}{
		{[]string{"fluid"}, tableKey, false},
		{[]string{"fluid", "viscosity"}, valueKey, false},
		{[]string{"sphere"}, arrayKey, false},
		{[]string{"sphere", "z"}, valueKey, false},
		{[]string{"shaking", "harmonic"}, arrayKey, false},
		{[]string{"shaking", "harmonic", "order"}, valueKey, true},
		{[]string{"spring", "spheres"}, valueKey, false},
		{[]string{"grid", "cells_per_radius"}, valueKey, true},
		{[]string{"run", "periods"}, valueKey, true},
		{[]string{"output", "average_periods"}, valueKey, true},
	} {
		k := caseSchema.at(tc.path...)
		if k == nil {
			t.Errorf("%v: not in the schema", tc.path)
			continue
		}
		if k.kind != tc.kind || k.whole() != tc.whole {
			t.Errorf("%v: kind %d, whole %t; want %d, %t", tc.path, k.kind, k.whole(), tc.kind, tc.whole)
		}
	}
	if lvl := caseSchema.badLevel([]string{"run", "grid", "tau"}); lvl != 1 {
		t.Errorf("badLevel(run.grid.tau) = %d, want 1", lvl)
	}
	if caseSchema.at("Fluid") != nil {
		t.Error("keys match case-insensitively")
	}
}
