package output

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"syscall"
)

// RunDir prepares dir to receive a run's files. A missing directory is
// created; an existing empty one is used; an existing non-empty one is
// refused unless force is set, in which case files of the same name are
// replaced and any others left alone.
func RunDir(dir string, force bool) error {
	entries, err := os.ReadDir(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("output directory %s: %w", dir, err)
		}
		return nil
	case err != nil:
		return fmt.Errorf("output directory %s: %w", dir, err)
	}
	if len(entries) > 0 && !force {
		return fmt.Errorf("output directory %s is not empty (it holds %s%s); "+
			"choose another with -out DIR, or add -force to replace files of the same name",
			dir, entries[0].Name(), more(len(entries)))
	}
	// Check that we can write there.
	probe, err := os.CreateTemp(dir, ".axiswim-probe-*")
	if err != nil {
		return fmt.Errorf("output directory %s is not writable: %w", dir, err)
	}
	name := probe.Name()
	probe.Close()
	return os.Remove(name)
}

func more(n int) string {
	if n <= 1 {
		return ""
	}
	return fmt.Sprintf(" and %d more", n-1)
}

// WriteFileAtomic writes data to path through a temporary file in the same
// directory, synced and then renamed, so that a reader never sees a
// half-written file and an interruption leaves the old file intact.
func WriteFileAtomic(path string, data []byte) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("write %s: %w", path, err)
	}
	name := tmp.Name()
	_, werr := tmp.Write(data)
	// CreateTemp makes the file private (0600); results are for reading.
	perr := tmp.Chmod(0o644)
	serr := tmp.Sync()
	cerr := tmp.Close()
	if err := errors.Join(werr, perr, serr, cerr); err != nil {
		os.Remove(name)
		return fmt.Errorf("write %s: %w", path, err)
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("write %s: %w", path, err)
	}
	// Make the rename itself durable: sync the directory.
	if d, err := os.Open(filepath.Dir(path)); err == nil {
		d.Sync()
		d.Close()
	}
	return nil
}

// FreeBytes returns the space available to an unprivileged writer on the
// file system holding dir.
func FreeBytes(dir string) (int64, error) {
	var st syscall.Statfs_t
	if err := syscall.Statfs(dir, &st); err != nil {
		return 0, fmt.Errorf("free space of %s: %w", dir, err)
	}
	return int64(st.Bavail) * int64(st.Bsize), nil
}
