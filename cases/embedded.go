package cases

import (
	"embed"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
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

// Open returns the source of the case named name: the file when there is
// one (a relative name taken from dir, when dir is not ""); otherwise,
// when name is a bare name (no directory, no extension), the embedded
// example of that name. embedded says which. A file always comes first,
// so a file beside the user shadows an example of the same name. The
// error is the file's when neither is there.
func Open(name, dir string) (src []byte, embedded bool, err error) {
	p := name
	if dir != "" && !filepath.IsAbs(p) {
		p = filepath.Join(dir, p)
	}
	src, err = os.ReadFile(p)
	if err == nil {
		return src, false, nil
	}
	if errors.Is(err, fs.ErrNotExist) && !strings.ContainsAny(name, `/\.`) {
		if s, gerr := Get(name); gerr == nil {
			return s, true, nil
		}
	}
	return nil, false, err
}

// ParseExample returns the embedded example case of the given name, parsed
// (Get, then Parse under that name).
func ParseExample(name string) (*Case, error) {
	src, err := Get(name)
	if err != nil {
		return nil, err
	}
	return Parse(name, src)
}
