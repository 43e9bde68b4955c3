package cases

import (
	"embed"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strings"
)

// examples holds the example cases, one TOML file each.
//
//go:embed examples/*.toml
var examples embed.FS

// List returns the names of the embedded example cases, sorted.
func List() []string {
	entries, err := fs.ReadDir(examples, "examples")
	if err != nil {
		return nil // cannot happen: the directory is embedded
	}
	var names []string
	for _, e := range entries {
		if name, ok := strings.CutSuffix(e.Name(), ".toml"); ok {
			names = append(names, name)
		}
	}
	sort.Strings(names)
	return names
}

// Get returns the source of the embedded example case with the given name
// (as listed by List, with or without the .toml suffix).
func Get(name string) ([]byte, error) {
	base := strings.TrimSuffix(name, ".toml")
	if base == "" || strings.ContainsAny(base, `/\`) {
		return nil, fmt.Errorf("example case %q: no such example (have %s)", name, strings.Join(List(), ", "))
	}
	src, err := examples.ReadFile(path.Join("examples", base+".toml"))
	if err != nil {
		return nil, fmt.Errorf("example case %q: no such example (have %s)", name, strings.Join(List(), ", "))
	}
	return src, nil
}
