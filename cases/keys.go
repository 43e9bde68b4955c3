package cases

import (
	"fmt"
	"reflect"
	"sort"
	"strings"
)

// A key is one key of the case schema, read by reflection from a field of
// the schema types and its struct tags (see [Case]): a value, a table or an
// array of tables.
type key struct {
	name     string // the TOML key; "" for the root table
	field    int    // index of the struct field in its parent
	kind     keyKind
	typ      reflect.Type // of the struct field
	keys     []*key       // of a table or of each element of an array of tables, in field order
	required bool         // case:"required"
	omitzero bool         // toml:",omitzero"
	note     string       // note:"..."
	unset    string       // unset:"..."
}

type keyKind int

const (
	valueKey keyKind = iota
	tableKey
	arrayKey // an array of tables
)

// caseSchema is the root table of a case file. It is built once and never
// changed.
var caseSchema = &key{kind: tableKey, keys: keysOf(reflect.TypeFor[Case]())}

// keysOf returns the keys of the struct type t.
func keysOf(t reflect.Type) []*key {
	keys := make([]*key, t.NumField())
	for i := range keys {
		f := t.Field(i)
		name, opts, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if name == "" {
			panic(fmt.Sprintf("cases: field %s.%s has no toml key", t.Name(), f.Name))
		}
		k := &key{
			name:     name,
			field:    i,
			typ:      f.Type,
			required: f.Tag.Get("case") == "required",
			omitzero: opts == "omitzero",
			note:     f.Tag.Get("note"),
			unset:    f.Tag.Get("unset"),
		}
		switch {
		case f.Type.Kind() == reflect.Struct:
			k.kind, k.keys = tableKey, keysOf(f.Type)
		case f.Type.Kind() == reflect.Slice && f.Type.Elem().Kind() == reflect.Struct:
			k.kind, k.keys = arrayKey, keysOf(f.Type.Elem())
		}
		keys[i] = k
	}
	return keys
}

// child returns the key called name in the table (or array of tables) k,
// or nil. Matching is case-sensitive, unlike the toml library's.
func (k *key) child(name string) *key {
	for _, c := range k.keys {
		if c.name == name {
			return c
		}
	}
	return nil
}

// badLevel returns the index of the first piece of the index-free key path
// that is not in the schema below k, or -1 if the whole path is valid.
func (k *key) badLevel(path []string) int {
	for i, p := range path {
		if k = k.child(p); k == nil {
			return i
		}
	}
	return -1
}

// at returns the key reached from k by path, or nil if path is not valid.
func (k *key) at(path ...string) *key {
	for _, p := range path {
		if k = k.child(p); k == nil {
			return nil
		}
	}
	return k
}

// names returns the keys of the table k, sorted.
func (k *key) names() []string {
	names := make([]string, len(k.keys))
	for i, c := range k.keys {
		names[i] = c.name
	}
	sort.Strings(names)
	return names
}

// whole reports whether the value k takes whole numbers only.
func (k *key) whole() bool {
	return k.kind == valueKey && k.typ.Kind() >= reflect.Int && k.typ.Kind() <= reflect.Int64
}

// ownArrays gives every array of tables in v, a value of the table t, an
// element array of its own, or nil when it is empty.
func ownArrays(t *key, v reflect.Value) {
	for _, k := range t.keys {
		f := v.Field(k.field)
		switch k.kind {
		case tableKey:
			ownArrays(k, f)
		case arrayKey:
			if f.Len() == 0 {
				f.SetZero()
				continue
			}
			elems := reflect.MakeSlice(f.Type(), f.Len(), f.Len())
			reflect.Copy(elems, f)
			f.Set(elems)
			for i := range elems.Len() {
				ownArrays(k, elems.Index(i))
			}
		}
	}
}
