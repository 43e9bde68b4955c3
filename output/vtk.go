package output

// VTK XML output of the (z, r) lattice fields, written after the VTK
// project's "VTK File Formats" document: a serial ImageData file (.vti)
// whose arrays sit in one appended raw block, and ParaView's collection
// file (.pvd) that lists such files over time.

import (
	"bytes"
	"encoding/binary"
	"encoding/xml"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Field is one node-centred array of a Grid, in SI units.
//
// A scalar (Components 1) holds node (k, j) at Data[j*Nz+k], z fastest. A
// vector (Components 3) holds its x, y, z components at Data[3*(j*Nz+k)+c]
// in the axes of the VTK file, where x is the axis z, y is the radius r
// and z is the azimuthal direction: the velocity is given as (u_z, u_r, 0).
type Field struct {
	Name       string
	Components int
	Data       []float64
	// RParity is the sign the field takes under the mirror r -> -r: +1 for
	// the pressure, -1 for the azimuthal vorticity; for a vector it applies
	// to the y (r) component only, so the velocity has -1. It is used only
	// when mirroring, and must then be +1 or -1.
	RParity float64
}

// Grid places the nodes: node (k, j) is at z = Z0 + k*Spacing,
// r = R0 + j*Spacing, for k < Nz and j < Nr. On the solver's lattice R0 is
// Spacing/2: the axis lies halfway below row 0 and holds no node.
type Grid struct {
	Nz, Nr  int
	Z0, R0  float64
	Spacing float64
}

// WriteVTI writes the fields as a VTK ImageData file at path. The image
// spans 0..Nz-1 in x (the axis z) and 0..Nr-1 in y (the radius r) in a
// single plane z = 0, with origin (Z0, R0, 0) and spacing Spacing in all
// three directions; the fields are its point data, Float64 arrays appended
// raw and little-endian after UInt64 byte counts. The first scalar and the
// first vector are marked as the active ones.
//
// With mirror set, the image is the whole meridian plane from -R to R:
// 2*Nr rows, the lower Nr being the mirror images of the upper ones (the
// row at -r_j is row j), each field multiplied there by its RParity (a
// vector's y component only). The origin is then
// (Z0, -R0 - (Nr-1)*Spacing, 0); mirroring needs R0 = Spacing/2, so that
// the rows on both sides of the axis stay evenly spaced.
//
// The file is written atomically (see WriteFileAtomic); on an error nothing
// is written.
func WriteVTI(path string, g Grid, fields []Field, mirror bool) error {
	if err := checkVTI(g, fields, mirror); err != nil {
		return fmt.Errorf("vtk file %s: %w", path, err)
	}
	return WriteFileAtomic(path, encodeVTI(g, fields, mirror))
}

// maxExtent is the largest index VTK's extents hold (they are C ints).
const maxExtent = math.MaxInt32

func checkVTI(g Grid, fields []Field, mirror bool) error {
	rows := g.Nr
	if mirror {
		rows = 2 * g.Nr
	}
	switch {
	case g.Nz < 1 || g.Nr < 1:
		return fmt.Errorf("grid of %d x %d nodes: need at least one node in z and r", g.Nz, g.Nr)
	case g.Nz > maxExtent || rows > maxExtent:
		return fmt.Errorf("grid of %d x %d nodes: VTK extents hold at most %d nodes a side", g.Nz, rows, maxExtent)
	case !(g.Spacing > 0) || math.IsInf(g.Spacing, 0):
		return fmt.Errorf("grid spacing %v: want a positive finite length", g.Spacing)
	case math.IsNaN(g.Z0) || math.IsInf(g.Z0, 0) || math.IsNaN(g.R0) || math.IsInf(g.R0, 0):
		return fmt.Errorf("grid origin (%v, %v): want finite coordinates", g.Z0, g.R0)
	}
	if mirror && math.Abs(2*g.R0-g.Spacing) > 1e-12*g.Spacing {
		return fmt.Errorf("mirror needs the first row at r = Spacing/2 = %v, not %v: "+
			"otherwise the rows across the axis are not evenly spaced", g.Spacing/2, g.R0)
	}
	if len(fields) == 0 {
		return errors.New("no fields to write")
	}
	nodes := g.Nz * g.Nr
	seen := make(map[string]bool, len(fields))
	for i, f := range fields {
		if err := checkName(f.Name); err != nil {
			return fmt.Errorf("field %d: %w", i+1, err)
		}
		if seen[f.Name] {
			return fmt.Errorf("field %q appears twice: VTK tells arrays apart by name", f.Name)
		}
		seen[f.Name] = true
		if f.Components != 1 && f.Components != 3 {
			return fmt.Errorf("field %q has %d components: want 1 (scalar) or 3 (vector)", f.Name, f.Components)
		}
		if want := f.Components * nodes; len(f.Data) != want {
			return fmt.Errorf("field %q has %d values, want %d (%d per node on %d x %d nodes)",
				f.Name, len(f.Data), want, f.Components, g.Nz, g.Nr)
		}
		if mirror && f.RParity != 1 && f.RParity != -1 {
			return fmt.Errorf("field %q has RParity %v: mirroring needs +1 or -1", f.Name, f.RParity)
		}
	}
	return nil
}

// checkName accepts a name that XML can carry unchanged.
func checkName(name string) error {
	if strings.TrimSpace(name) == "" {
		return errors.New("empty name")
	}
	if !utf8.ValidString(name) {
		return fmt.Errorf("name %q is not valid UTF-8", name)
	}
	if strings.IndexFunc(name, unicode.IsControl) >= 0 {
		return fmt.Errorf("name %q holds a control character", name)
	}
	return nil
}

// encodeVTI lays out the file: the XML header, then the appended block,
// "_" followed by, for each array in turn, its UInt64 byte count and its
// values. Each DataArray's offset counts bytes from just after the "_".
func encodeVTI(g Grid, fields []Field, mirror bool) []byte {
	rows, oy := g.Nr, g.R0
	if mirror {
		rows, oy = 2*g.Nr, -g.R0-float64(g.Nr-1)*g.Spacing
	}
	points := g.Nz * rows
	extent := fmt.Sprintf("0 %d 0 %d 0 0", g.Nz-1, rows-1)
	h := formatFloat(g.Spacing)

	var scalars, vectors string
	for _, f := range fields {
		if f.Components == 1 && scalars == "" {
			scalars = f.Name
		}
		if f.Components == 3 && vectors == "" {
			vectors = f.Name
		}
	}

	var b bytes.Buffer
	size := 1024 + 128*len(fields)
	for _, f := range fields {
		size += 8 + 8*f.Components*points
	}
	b.Grow(size)
	b.WriteString("<?xml version=\"1.0\"?>\n")
	b.WriteString(`<VTKFile type="ImageData" version="1.0" byte_order="LittleEndian" header_type="UInt64">` + "\n")
	fmt.Fprintf(&b, "  <ImageData WholeExtent=\"%s\" Origin=\"%s %s 0\" Spacing=\"%s %s %s\">\n",
		extent, formatFloat(g.Z0), formatFloat(oy), h, h, h)
	fmt.Fprintf(&b, "    <Piece Extent=\"%s\">\n", extent)
	b.WriteString("      <PointData")
	if scalars != "" {
		fmt.Fprintf(&b, " Scalars=\"%s\"", escapeAttr(scalars))
	}
	if vectors != "" {
		fmt.Fprintf(&b, " Vectors=\"%s\"", escapeAttr(vectors))
	}
	b.WriteString(">\n")
	offset := 0
	for _, f := range fields {
		fmt.Fprintf(&b, "        <DataArray type=\"Float64\" Name=\"%s\" NumberOfComponents=\"%d\" format=\"appended\" offset=\"%d\"/>\n",
			escapeAttr(f.Name), f.Components, offset)
		offset += 8 + 8*f.Components*points
	}
	b.WriteString("      </PointData>\n    </Piece>\n  </ImageData>\n")
	b.WriteString("  <AppendedData encoding=\"raw\">\n   _")

	var word [8]byte
	put := func(v float64) {
		binary.LittleEndian.PutUint64(word[:], math.Float64bits(v))
		b.Write(word[:])
	}
	for _, f := range fields {
		binary.LittleEndian.PutUint64(word[:], uint64(8*f.Components*points))
		b.Write(word[:])
		for i := range rows {
			j, sign := i, 1.0
			if mirror {
				if i < g.Nr {
					j, sign = g.Nr-1-i, f.RParity
				} else {
					j = i - g.Nr
				}
			}
			row := f.Data[f.Components*j*g.Nz : f.Components*(j+1)*g.Nz]
			switch {
			case sign == 1:
				for _, v := range row {
					put(v)
				}
			case f.Components == 1:
				for _, v := range row {
					put(sign * v)
				}
			default:
				for k := 0; k < len(row); k += 3 {
					put(row[k])
					put(sign * row[k+1])
					put(row[k+2])
				}
			}
		}
	}
	b.WriteString("\n  </AppendedData>\n</VTKFile>\n")
	return b.Bytes()
}

// CollectionEntry is one data set of a time series: the file, named
// relative to the directory of the .pvd file, and its time in seconds.
type CollectionEntry struct {
	Time float64
	File string
}

// WritePVD writes ParaView's collection file at path: a VTKFile of type
// "Collection" with one DataSet element per entry, in the order given,
// which ParaView opens as a time series. File names must be relative to
// the directory of path; they are written with forward slashes. The file is
// written atomically.
func WritePVD(path string, entries []CollectionEntry) error {
	if len(entries) == 0 {
		return fmt.Errorf("collection %s: no data sets to list", path)
	}
	var b bytes.Buffer
	b.WriteString("<?xml version=\"1.0\"?>\n")
	b.WriteString(`<VTKFile type="Collection" version="0.1" byte_order="LittleEndian">` + "\n")
	b.WriteString("  <Collection>\n")
	for i, e := range entries {
		if math.IsNaN(e.Time) || math.IsInf(e.Time, 0) {
			return fmt.Errorf("collection %s: entry %d (%s) has time %v: want a finite time", path, i+1, e.File, e.Time)
		}
		if err := checkListedFile(e.File, "collection"); err != nil {
			return fmt.Errorf("collection %s: entry %d: %w", path, i+1, err)
		}
		fmt.Fprintf(&b, "    <DataSet timestep=\"%s\" group=\"\" part=\"0\" file=\"%s\"/>\n",
			formatFloat(e.Time), escapeAttr(filepath.ToSlash(e.File)))
	}
	b.WriteString("  </Collection>\n</VTKFile>\n")
	return WriteFileAtomic(path, b.Bytes())
}

// checkListedFile accepts the name of a file that a collection or
// multiblock file (kind) lists: XML-safe and relative to its directory.
func checkListedFile(file, kind string) error {
	if err := checkName(file); err != nil {
		return fmt.Errorf("file name: %w", err)
	}
	if filepath.IsAbs(file) || strings.HasPrefix(file, "/") {
		return fmt.Errorf("file %s is absolute; name it relative to the %s's directory so that the run directory can move", file, kind)
	}
	return nil
}

// formatFloat gives the shortest decimal that reads back as v exactly.
func formatFloat(v float64) string {
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// escapeAttr escapes s for a double-quoted XML attribute.
func escapeAttr(s string) string {
	var b strings.Builder
	xml.EscapeText(&b, []byte(s)) // writes to a strings.Builder never fail
	return b.String()
}
