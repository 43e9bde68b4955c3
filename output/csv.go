package output

import (
	"bufio"
	"fmt"
	"os"
	"strconv"
)

// Column is one column of a series: its name carries its unit
// (time_s, drive_displacement_m, ...), Doc says what it is.
type Column struct {
	Name string
	Doc  string
}

// Series writes rows of numbers to a CSV file whose first row is the
// column names.
type Series struct {
	f    *os.File
	w    *bufio.Writer
	cols int
	path string
	buf  []byte
}

// CreateSeries creates (or replaces) the CSV file at path with the header.
func CreateSeries(path string, cols []Column) (*Series, error) {
	f, err := os.Create(path)
	if err != nil {
		return nil, fmt.Errorf("series: %w", err)
	}
	s := &Series{f: f, w: bufio.NewWriter(f), cols: len(cols), path: path}
	for i, c := range cols {
		if i > 0 {
			s.w.WriteByte(',')
		}
		s.w.WriteString(c.Name)
	}
	s.w.WriteByte('\n')
	return s, nil
}

// Row appends one row; it must have one value per column.
func (s *Series) Row(v ...float64) error {
	if len(v) != s.cols {
		return fmt.Errorf("series %s: row of %d values for %d columns", s.path, len(v), s.cols)
	}
	s.buf = s.buf[:0]
	for i, x := range v {
		if i > 0 {
			s.buf = append(s.buf, ',')
		}
		s.buf = strconv.AppendFloat(s.buf, x, 'g', 10, 64)
	}
	s.buf = append(s.buf, '\n')
	if _, err := s.w.Write(s.buf); err != nil {
		return fmt.Errorf("series %s: %w", s.path, err)
	}
	return nil
}

// Flush writes buffered rows to the file.
func (s *Series) Flush() error {
	if err := s.w.Flush(); err != nil {
		return fmt.Errorf("series %s: %w", s.path, err)
	}
	return nil
}

// Close flushes, syncs and closes the file.
func (s *Series) Close() error {
	if err := s.Flush(); err != nil {
		s.f.Close()
		return err
	}
	if err := s.f.Sync(); err != nil {
		s.f.Close()
		return fmt.Errorf("series %s: %w", s.path, err)
	}
	return s.f.Close()
}

// Offset flushes the series and returns its length in bytes, for a
// checkpoint.
func (s *Series) Offset() (int64, error) {
	if err := s.Flush(); err != nil {
		return 0, err
	}
	fi, err := s.f.Stat()
	if err != nil {
		return 0, fmt.Errorf("series %s: %w", s.path, err)
	}
	return fi.Size(), nil
}

// ReopenSeries opens an existing series to continue it after a
// checkpoint: rows written after offset are removed, new rows append.
func ReopenSeries(path string, cols int, offset int64) (*Series, error) {
	f, err := os.OpenFile(path, os.O_RDWR, 0o644)
	if err != nil {
		return nil, fmt.Errorf("series: %w", err)
	}
	if err := f.Truncate(offset); err != nil {
		f.Close()
		return nil, fmt.Errorf("series %s: %w", path, err)
	}
	if _, err := f.Seek(offset, 0); err != nil {
		f.Close()
		return nil, fmt.Errorf("series %s: %w", path, err)
	}
	return &Series{f: f, w: bufio.NewWriter(f), cols: cols, path: path}, nil
}
