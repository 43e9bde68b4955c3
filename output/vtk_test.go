package output

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"encoding/xml"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// The layout these tests expect is the one the "VTK File Formats" document
// of the VTK project gives for serial XML ImageData with appended raw data
// (header_type UInt64: each array's block is its byte count as a UInt64,
// then its values; offsets count from the byte after the "_"), and the one
// ParaView documents for its .pvd collections. TestVTKReader then checks
// the files with VTK's own reader, independently of our reading of them.

// testGrid is small enough to compare every value and uneven in z and r, so
// that a transposed layout shows. The spacing 1e-4 m is not a binary
// fraction, so the origin and spacing round-trip through decimal text.
var testGrid = Grid{Nz: 5, Nr: 3, Z0: -0.012 + 0.5e-4, R0: 0.5e-4, Spacing: 1e-4}

// sampleFields gives a pressure, a velocity (u_z, u_r, 0) and an azimuthal
// vorticity on g whose values are all different and use the whole
// mantissa, so that a misplaced, rounded or sign-flipped value shows. phase
// makes the frames of a series differ.
func sampleFields(g Grid, phase float64) []Field {
	n := g.Nz * g.Nr
	p := make([]float64, n)
	u := make([]float64, 3*n)
	w := make([]float64, n)
	for i := range n {
		x := float64(i) + phase
		p[i] = 101325 + math.Sin(x+0.5)
		u[3*i] = 1e-3 * math.Sin(x+1.0/3)
		u[3*i+1] = -1e-4 * math.Cos(x/3+0.1)
		u[3*i+2] = 0
		w[i] = math.Cos(3*x+0.25) / 7
	}
	return []Field{
		{Name: "pressure", Components: 1, Data: p, RParity: 1},
		{Name: "velocity", Components: 3, Data: u, RParity: -1},
		{Name: "vorticity", Components: 1, Data: w, RParity: -1},
	}
}

// vtiArray and vtiImage are what a reader makes of a .vti file.
type vtiArray struct {
	Name       string
	Components int
	Values     []float64
}

type vtiImage struct {
	Extent           [6]int
	Origin, Spacing  [3]float64
	Scalars, Vectors string
	Arrays           []vtiArray
}

// vtiXML is the header of a .vti file as encoding/xml sees it.
type vtiXML struct {
	XMLName    xml.Name `xml:"VTKFile"`
	Type       string   `xml:"type,attr"`
	Version    string   `xml:"version,attr"`
	ByteOrder  string   `xml:"byte_order,attr"`
	HeaderType string   `xml:"header_type,attr"`
	Images     []struct {
		WholeExtent string `xml:"WholeExtent,attr"`
		Origin      string `xml:"Origin,attr"`
		Spacing     string `xml:"Spacing,attr"`
		Pieces      []struct {
			Extent    string `xml:"Extent,attr"`
			PointData struct {
				Scalars string `xml:"Scalars,attr"`
				Vectors string `xml:"Vectors,attr"`
				Arrays  []struct {
					Type       string `xml:"type,attr"`
					Name       string `xml:"Name,attr"`
					Components int    `xml:"NumberOfComponents,attr"`
					Format     string `xml:"format,attr"`
					Offset     int    `xml:"offset,attr"`
				} `xml:"DataArray"`
			}
		} `xml:"Piece"`
	} `xml:"ImageData"`
	Appended []struct {
		Encoding string `xml:"encoding,attr"`
	} `xml:"AppendedData"`
}

// readVTI reads the files WriteVTI writes: one ImageData piece whose
// Float64 point arrays are appended raw, little-endian, with UInt64 byte
// counts. The raw block cannot go through an XML parser, so the header is
// parsed with the block cut out, and the block is decoded by the offsets,
// which must follow one another without gap or overlap up to the block's
// end.
func readVTI(b []byte) (vtiImage, error) {
	var img vtiImage
	start := bytes.Index(b, []byte("<AppendedData"))
	if start < 0 {
		return img, errors.New("no AppendedData element")
	}
	gt := bytes.IndexByte(b[start:], '>')
	if gt < 0 {
		return img, errors.New("unterminated AppendedData tag")
	}
	us := start + gt + 1
	for us < len(b) && isSpace(b[us]) {
		us++
	}
	if us == len(b) || b[us] != '_' {
		return img, errors.New(`appended data does not start with "_"`)
	}
	end := bytes.LastIndex(b, []byte("</AppendedData>"))
	if end < us {
		return img, errors.New("no </AppendedData> after the raw block")
	}
	block := b[us+1 : end]
	head := append(append([]byte(nil), b[:us]...), b[end:]...)

	var x vtiXML
	if err := xml.Unmarshal(head, &x); err != nil {
		return img, fmt.Errorf("header: %w", err)
	}
	switch {
	case x.Type != "ImageData" || x.Version != "1.0" || x.ByteOrder != "LittleEndian" || x.HeaderType != "UInt64":
		return img, fmt.Errorf("VTKFile type %q version %q byte_order %q header_type %q", x.Type, x.Version, x.ByteOrder, x.HeaderType)
	case len(x.Images) != 1 || len(x.Images[0].Pieces) != 1:
		return img, errors.New("want one ImageData with one Piece")
	case len(x.Appended) != 1 || x.Appended[0].Encoding != "raw":
		return img, errors.New(`want one AppendedData with encoding="raw"`)
	}
	im, piece := x.Images[0], x.Images[0].Pieces[0]
	if piece.Extent != im.WholeExtent {
		return img, fmt.Errorf("piece extent %q, whole extent %q", piece.Extent, im.WholeExtent)
	}
	ext, err := parseInts(im.WholeExtent, 6)
	if err != nil {
		return img, fmt.Errorf("WholeExtent: %w", err)
	}
	copy(img.Extent[:], ext)
	o, err := parseFloats(im.Origin, 3)
	if err != nil {
		return img, fmt.Errorf("Origin: %w", err)
	}
	copy(img.Origin[:], o)
	s, err := parseFloats(im.Spacing, 3)
	if err != nil {
		return img, fmt.Errorf("Spacing: %w", err)
	}
	copy(img.Spacing[:], s)
	img.Scalars, img.Vectors = piece.PointData.Scalars, piece.PointData.Vectors

	points := (ext[1] - ext[0] + 1) * (ext[3] - ext[2] + 1) * (ext[5] - ext[4] + 1)
	next := 0
	for _, a := range piece.PointData.Arrays {
		if a.Type != "Float64" || a.Format != "appended" {
			return img, fmt.Errorf("array %q: type %q format %q", a.Name, a.Type, a.Format)
		}
		if a.Offset != next {
			return img, fmt.Errorf("array %q at offset %d, want %d (right after the previous array)", a.Name, a.Offset, next)
		}
		if a.Offset+8 > len(block) {
			return img, fmt.Errorf("array %q: offset %d beyond the %d-byte block", a.Name, a.Offset, len(block))
		}
		n := binary.LittleEndian.Uint64(block[a.Offset:])
		if want := uint64(8 * a.Components * points); n != want {
			return img, fmt.Errorf("array %q: byte count %d, want %d (%d components x %d points x 8)", a.Name, n, want, a.Components, points)
		}
		data := block[a.Offset+8:]
		if uint64(len(data)) < n {
			return img, fmt.Errorf("array %q: %d bytes, block has %d left", a.Name, n, len(data))
		}
		vals := make([]float64, n/8)
		for i := range vals {
			vals[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[8*i:]))
		}
		img.Arrays = append(img.Arrays, vtiArray{Name: a.Name, Components: a.Components, Values: vals})
		next = a.Offset + 8 + int(n)
	}
	for _, c := range block[next:] {
		if !isSpace(c) {
			return img, fmt.Errorf("%d bytes after the last array that are not white space", len(block)-next)
		}
	}
	return img, nil
}

func isSpace(c byte) bool { return c == ' ' || c == '\n' || c == '\t' || c == '\r' }

func parseInts(s string, n int) ([]int, error) {
	f := strings.Fields(s)
	if len(f) != n {
		return nil, fmt.Errorf("%q: %d numbers, want %d", s, len(f), n)
	}
	v := make([]int, n)
	for i, w := range f {
		var err error
		if v[i], err = strconv.Atoi(w); err != nil {
			return nil, err
		}
	}
	return v, nil
}

func parseFloats(s string, n int) ([]float64, error) {
	f := strings.Fields(s)
	if len(f) != n {
		return nil, fmt.Errorf("%q: %d numbers, want %d", s, len(f), n)
	}
	v := make([]float64, n)
	for i, w := range f {
		var err error
		if v[i], err = strconv.ParseFloat(w, 64); err != nil {
			return nil, err
		}
	}
	return v, nil
}

func readVTIFile(t *testing.T, path string) vtiImage {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	img, err := readVTI(b)
	if err != nil {
		t.Fatalf("read %s: %v", path, err)
	}
	return img
}

// imageOrigin is the y origin the brief of WriteVTI gives: R0, or with the
// mirror the image of the outermost row, -R0 - (Nr-1)*Spacing.
func imageOrigin(g Grid, mirror bool) (rows int, oy float64) {
	if mirror {
		return 2 * g.Nr, -g.R0 - float64(g.Nr-1)*g.Spacing
	}
	return g.Nr, g.R0
}

// sourceRow finds, from its position alone, which row j of the half plane
// image row i shows: the row at y shows the node at r = |y|, mirrored when
// y < 0. It fails the test if |y| is not a node radius.
func sourceRow(t *testing.T, g Grid, oy float64, i int) (j int, mirrored bool) {
	t.Helper()
	y := oy + float64(i)*g.Spacing
	rf := (math.Abs(y) - g.R0) / g.Spacing
	j = int(math.Round(rf))
	if j < 0 || j >= g.Nr || math.Abs(rf-float64(j)) > 1e-9 {
		t.Fatalf("image row %d at y = %v is not at a node radius (index %v)", i, y, rf)
	}
	return j, y < 0
}

// checkImage compares what a reader made of a file with what was written:
// extent, origin and spacing exactly (they went through shortest
// round-trip decimals), the active arrays, and every value bit for bit,
// the mirrored rows with their parities.
func checkImage(t *testing.T, img vtiImage, g Grid, fields []Field, mirror bool) {
	t.Helper()
	rows, oy := imageOrigin(g, mirror)
	if want := [6]int{0, g.Nz - 1, 0, rows - 1, 0, 0}; img.Extent != want {
		t.Errorf("extent %v, want %v", img.Extent, want)
	}
	if want := [3]float64{g.Z0, oy, 0}; img.Origin != want {
		t.Errorf("origin %v, want %v", img.Origin, want)
	}
	if want := [3]float64{g.Spacing, g.Spacing, g.Spacing}; img.Spacing != want {
		t.Errorf("spacing %v, want %v", img.Spacing, want)
	}
	if img.Scalars != "pressure" || img.Vectors != "velocity" {
		t.Errorf("active scalars %q and vectors %q, want pressure and velocity", img.Scalars, img.Vectors)
	}
	if len(img.Arrays) != len(fields) {
		t.Fatalf("%d arrays, want %d", len(img.Arrays), len(fields))
	}
	for n, f := range fields {
		a := img.Arrays[n]
		if a.Name != f.Name || a.Components != f.Components {
			t.Errorf("array %d is %q with %d components, want %q with %d", n, a.Name, a.Components, f.Name, f.Components)
			continue
		}
		if want := f.Components * g.Nz * rows; len(a.Values) != want {
			t.Errorf("%s: %d values, want %d", f.Name, len(a.Values), want)
			continue
		}
		bad := 0
		for i := range rows {
			j, mirrored := sourceRow(t, g, oy, i)
			for k := range g.Nz {
				for c := range f.Components {
					want := f.Data[f.Components*(j*g.Nz+k)+c]
					if mirrored && (f.Components == 1 || c == 1) {
						want *= f.RParity
					}
					got := a.Values[f.Components*(i*g.Nz+k)+c]
					if math.Float64bits(got) != math.Float64bits(want) {
						if bad++; bad <= 5 {
							t.Errorf("%s at image row %d (node row %d, mirrored %v), column %d, component %d: %v, want %v",
								f.Name, i, j, mirrored, k, c, got, want)
						}
					}
				}
			}
		}
		if bad > 5 {
			t.Errorf("%s: %d values differ in all", f.Name, bad)
		}
	}
}

// TestWriteVTIReadBack: a 5 x 3 grid with two scalars and a vector comes
// back with its names, extents, origin, spacing and every value exact.
func TestWriteVTIReadBack(t *testing.T) {
	fields := sampleFields(testGrid, 0)
	path := filepath.Join(t.TempDir(), "fields.vti")
	if err := WriteVTI(path, testGrid, fields, false); err != nil {
		t.Fatal(err)
	}
	checkImage(t, readVTIFile(t, path), testGrid, fields, false)
}

// TestWriteVTIMirror: the mirrored file has 2*Nr rows, evenly spaced across
// the axis, the lower ones the images of the upper ones with the
// pressure and u_z unchanged and the vorticity and u_r flipped.
func TestWriteVTIMirror(t *testing.T) {
	fields := sampleFields(testGrid, 0)
	path := filepath.Join(t.TempDir(), "mirror.vti")
	if err := WriteVTI(path, testGrid, fields, true); err != nil {
		t.Fatal(err)
	}
	img := readVTIFile(t, path)
	checkImage(t, img, testGrid, fields, true)
	// The rows straddling the axis are the same node seen from both sides.
	nz := testGrid.Nz
	p, u := img.Arrays[0].Values, img.Arrays[1].Values
	below, above := testGrid.Nr-1, testGrid.Nr
	for k := range nz {
		if p[below*nz+k] != p[above*nz+k] || u[3*(below*nz+k)+1] != -u[3*(above*nz+k)+1] {
			t.Errorf("column %d: the rows next to the axis are not mirror images", k)
		}
	}
}

// TestWriteVTIRejects: bad grids and fields are errors that say what is
// wrong, and a failed write leaves an existing file as it was.
func TestWriteVTIRejects(t *testing.T) {
	good := sampleFields(testGrid, 0)
	with := func(change func(f []Field)) []Field {
		f := sampleFields(testGrid, 0)
		change(f)
		return f
	}
	cases := []struct {
		name   string
		g      Grid
		fields []Field
		mirror bool
		want   string
	}{
		{"no nodes", Grid{Nz: 0, Nr: 3, Spacing: 1}, good, false, "at least one node"},
		{"zero spacing", Grid{Nz: 5, Nr: 3}, good, false, "spacing"},
		{"NaN spacing", Grid{Nz: 5, Nr: 3, Spacing: math.NaN()}, good, false, "spacing"},
		{"infinite origin", Grid{Nz: 5, Nr: 3, Z0: math.Inf(1), Spacing: 1}, good, false, "origin"},
		{"mirror off the half cell", Grid{Nz: 5, Nr: 3, R0: 0, Spacing: 1e-4}, good, true, "Spacing/2"},
		{"no fields", testGrid, nil, false, "no fields"},
		{"short data", testGrid, with(func(f []Field) { f[0].Data = f[0].Data[1:] }), false, `"pressure" has 14 values, want 15`},
		{"two components", testGrid, with(func(f []Field) { f[1].Components = 2 }), false, "2 components"},
		{"same name twice", testGrid, with(func(f []Field) { f[2].Name = "pressure" }), false, "twice"},
		{"empty name", testGrid, with(func(f []Field) { f[0].Name = " " }), false, "empty name"},
		{"control character", testGrid, with(func(f []Field) { f[0].Name = "p\n" }), false, "control character"},
		{"parity unset", testGrid, with(func(f []Field) { f[2].RParity = 0 }), true, `"vorticity" has RParity 0`},
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "kept.vti")
	if err := WriteVTI(path, testGrid, good, false); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(path)
	for _, c := range cases {
		err := WriteVTI(path, c.g, c.fields, c.mirror)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
	if after, _ := os.ReadFile(path); !bytes.Equal(after, before) {
		t.Error("a refused write changed the existing file")
	}
	fresh := filepath.Join(dir, "fresh.vti")
	if err := WriteVTI(fresh, testGrid, nil, false); err == nil {
		t.Error("no fields: no error")
	}
	if _, err := os.Stat(fresh); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("a refused write created %s (stat: %v)", fresh, err)
	}
	if es, _ := os.ReadDir(dir); len(es) != 1 {
		t.Errorf("%d entries in the directory, want only the first file", len(es))
	}
	// Without the mirror the parity is not looked at.
	if err := WriteVTI(path, testGrid, with(func(f []Field) { f[2].RParity = 0 }), false); err != nil {
		t.Errorf("RParity 0 without mirror: %v", err)
	}
}

// pvdXML is a .pvd file as encoding/xml sees it.
type pvdXML struct {
	XMLName  xml.Name `xml:"VTKFile"`
	Type     string   `xml:"type,attr"`
	DataSets []struct {
		Timestep string `xml:"timestep,attr"`
		Part     string `xml:"part,attr"`
		File     string `xml:"file,attr"`
	} `xml:"Collection>DataSet"`
}

// TestWritePVD: one DataSet per entry in order, times exact, file names
// escaped and read back as given; bad entries are refused.
func TestWritePVD(t *testing.T) {
	entries := []CollectionEntry{
		{Time: 0, File: "fields/f-000000.vti"},
		{Time: 1.0 / 3, File: "fields/a&b <1>.vti"},
		{Time: 0.0125, File: "f\"2\".vti"},
	}
	path := filepath.Join(t.TempDir(), "series.pvd")
	if err := WritePVD(path, entries); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var x pvdXML
	if err := xml.Unmarshal(b, &x); err != nil {
		t.Fatalf("parse: %v\n%s", err, b)
	}
	if x.Type != "Collection" || len(x.DataSets) != len(entries) {
		t.Fatalf("type %q with %d data sets, want Collection with %d", x.Type, len(x.DataSets), len(entries))
	}
	for i, e := range entries {
		d := x.DataSets[i]
		if tm, err := strconv.ParseFloat(d.Timestep, 64); err != nil || tm != e.Time {
			t.Errorf("entry %d: timestep %q, want %v", i, d.Timestep, e.Time)
		}
		if d.File != e.File || d.Part != "0" {
			t.Errorf("entry %d: file %q part %q, want %q part 0", i, d.File, d.Part, e.File)
		}
	}

	for _, c := range []struct {
		name    string
		entries []CollectionEntry
		want    string
	}{
		{"none", nil, "no data sets"},
		{"NaN time", []CollectionEntry{{Time: math.NaN(), File: "a.vti"}}, "finite time"},
		{"absolute", []CollectionEntry{{Time: 0, File: "/tmp/a.vti"}}, "absolute"},
		{"empty file", []CollectionEntry{{Time: 0, File: ""}}, "empty name"},
	} {
		if err := WritePVD(path, c.entries); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
}

// ExampleWriteVTI shows the header of an ImageData file: the fields are
// point data, appended raw after the "_".
func ExampleWriteVTI() {
	dir, err := os.MkdirTemp("", "vtk-example")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	g := Grid{Nz: 3, Nr: 2, Z0: 0.5, R0: 0.5, Spacing: 1}
	fields := []Field{
		{Name: "pressure", Components: 1, Data: []float64{1, 2, 3, 4, 5, 6}, RParity: 1},
		{Name: "velocity", Components: 3, Data: make([]float64, 18), RParity: -1},
	}
	path := filepath.Join(dir, "fields.vti")
	if err := WriteVTI(path, g, fields, true); err != nil {
		fmt.Println(err)
		return
	}
	b, _ := os.ReadFile(path)
	head := bytes.Index(b, []byte("<AppendedData"))
	fmt.Printf("%s\n", b[:head+bytes.IndexByte(b[head:], '_')+1])
	// Output:
	// <?xml version="1.0"?>
	// <VTKFile type="ImageData" version="1.0" byte_order="LittleEndian" header_type="UInt64">
	//   <ImageData WholeExtent="0 2 0 3 0 0" Origin="0.5 -1.5 0" Spacing="1 1 1">
	//     <Piece Extent="0 2 0 3 0 0">
	//       <PointData Scalars="pressure" Vectors="velocity">
	//         <DataArray type="Float64" Name="pressure" NumberOfComponents="1" format="appended" offset="0"/>
	//         <DataArray type="Float64" Name="velocity" NumberOfComponents="3" format="appended" offset="104"/>
	//       </PointData>
	//     </Piece>
	//   </ImageData>
	//   <AppendedData encoding="raw">
	//    _
}

// readVTKScript reads .vti files and a .pvd with VTK's own classes and
// prints what VTK made of them as JSON. Python's json writes floats as
// their shortest round-trip decimals, so values come back exact. Anything
// VTK reports (errors, warnings) is caught in a string output window and
// returned as "messages".
const readVTKScript = `
import json, os, sys
import vtk

messages = vtk.vtkStringOutputWindow()
vtk.vtkOutputWindow.SetInstance(messages)

` + vtkDatasetFunc + `
def image(path):
    r = vtk.vtkXMLImageDataReader()
    r.SetFileName(path)
    r.Update()
    out = dataset(r.GetOutput())
    out["error_code"] = r.GetErrorCode()
    return out

def collection(path):
    res = {"pvd_reader": hasattr(vtk, "vtkPVDReader"), "entries": [], "frames": []}
    p = vtk.vtkXMLDataParser()
    p.SetFileName(path)
    res["parsed"] = bool(p.Parse())
    root = p.GetRootElement()
    if root is None:
        return res
    res["type"] = root.GetAttribute("type") or ""
    c = root.FindNestedElementWithName("Collection")
    for i in range(c.GetNumberOfNestedElements() if c else 0):
        e = c.GetNestedElement(i)
        f = e.GetAttribute("file") or ""
        res["entries"].append({"element": e.GetName(), "timestep": e.GetAttribute("timestep") or "",
                               "file": f, "data": image(os.path.join(os.path.dirname(path), f))})
    if res["pvd_reader"]:
        r = vtk.vtkPVDReader()
        r.SetFileName(path)
        r.UpdateInformation()
        info = r.GetOutputInformation(0)
        key = vtk.vtkStreamingDemandDrivenPipeline.TIME_STEPS()
        for t in (info.Get(key) if info.Has(key) else []):
            r.UpdateTimeStep(t)
            res["frames"].append({"time": t, "data": dataset(r.GetOutputDataObject(0))})
    return res

report = {"vtk_version": vtk.vtkVersion.GetVTKVersion(),
          "images": [image(p) for p in sys.argv[2:]],
          "collection": collection(sys.argv[1])}
report["messages"] = messages.GetOutput()
json.dump(report, sys.stdout)
`

// vtkDataset is what readVTKScript reports of one data set.
type vtkDataset struct {
	Class      string      `json:"class"`
	Dimensions []int       `json:"dimensions"`
	Extent     []int       `json:"extent"`
	Origin     []float64   `json:"origin"`
	Spacing    []float64   `json:"spacing"`
	Points     [][]float64 `json:"points"`
	Scalars    string      `json:"scalars"`
	Vectors    string      `json:"vectors"`
	ErrorCode  int         `json:"error_code"`
	Arrays     []struct {
		Name       string    `json:"name"`
		Type       string    `json:"type"`
		Components int       `json:"components"`
		Tuples     int       `json:"tuples"`
		Values     []float64 `json:"values"`
	} `json:"arrays"`
}

type vtkReport struct {
	Version    string       `json:"vtk_version"`
	Messages   string       `json:"messages"`
	Images     []vtkDataset `json:"images"`
	Collection struct {
		PVDReader bool   `json:"pvd_reader"`
		Parsed    bool   `json:"parsed"`
		Type      string `json:"type"`
		Entries   []struct {
			Element  string     `json:"element"`
			Timestep string     `json:"timestep"`
			File     string     `json:"file"`
			Data     vtkDataset `json:"data"`
		} `json:"entries"`
		Frames []struct {
			Time float64    `json:"time"`
			Data vtkDataset `json:"data"`
		} `json:"frames"`
	} `json:"collection"`
}

// vtkPython finds a Python that imports VTK: python3 on the PATH, then
// Debian's /usr/bin/python3, the interpreter python3-vtk9 installs for (a
// pyenv or virtual-environment python3 earlier on the PATH does not see
// Debian's packages).
func vtkPython(t *testing.T) string {
	t.Helper()
	var tried []string
	seen := map[string]bool{}
	for _, py := range []string{"python3", "/usr/bin/python3"} {
		exe, err := exec.LookPath(py)
		if err != nil {
			tried = append(tried, py+": not found")
			continue
		}
		if seen[exe] {
			continue
		}
		seen[exe] = true
		out, err := exec.CommandContext(t.Context(), exe, "-c", "import vtk").CombinedOutput()
		if err == nil {
			return exe
		}
		lines := strings.Split(strings.TrimSpace(string(out)), "\n")
		tried = append(tried, fmt.Sprintf("%s: %s", exe, lines[len(lines)-1]))
	}
	t.Skipf("python3-vtk9 not installed; .ci/run installs it (import vtk: %s)", strings.Join(tried, "; "))
	return ""
}

// fromVTK checks what VTK's reader says beyond the arrays (class, the
// dimensions, the type and tuple count of each array, the position of every
// point) and turns the rest into a vtiImage for checkImage.
func fromVTK(t *testing.T, d vtkDataset, g Grid, mirror bool) vtiImage {
	t.Helper()
	rows, oy := imageOrigin(g, mirror)
	if d.Class != "vtkImageData" || d.ErrorCode != 0 {
		t.Fatalf("VTK read a %q with error code %d, want a vtkImageData and 0", d.Class, d.ErrorCode)
	}
	if len(d.Dimensions) != 3 || d.Dimensions[0] != g.Nz || d.Dimensions[1] != rows || d.Dimensions[2] != 1 {
		t.Errorf("dimensions %v, want [%d %d 1]", d.Dimensions, g.Nz, rows)
	}
	if len(d.Extent) != 6 || len(d.Origin) != 3 || len(d.Spacing) != 3 {
		t.Fatalf("extent %v origin %v spacing %v: wrong lengths", d.Extent, d.Origin, d.Spacing)
	}
	// VTK places point p = k + Nz*i at origin + (k, i, 0)*spacing through its
	// index-to-physical matrix; the sums are the same as ours but allow for
	// rounding of order 1e-16 of the image's size.
	if len(d.Points) != g.Nz*rows {
		t.Fatalf("%d points, want %d", len(d.Points), g.Nz*rows)
	}
	tol := 1e-14 * (math.Abs(g.Z0) + float64(g.Nz+rows)*g.Spacing)
	for p, x := range d.Points {
		k, i := p%g.Nz, p/g.Nz
		want := []float64{g.Z0 + float64(k)*g.Spacing, oy + float64(i)*g.Spacing, 0}
		if len(x) != 3 || math.Abs(x[0]-want[0]) > tol || math.Abs(x[1]-want[1]) > tol || x[2] != 0 {
			t.Errorf("point %d at %v, want %v", p, x, want)
		}
	}
	img := vtiImage{Scalars: d.Scalars, Vectors: d.Vectors}
	copy(img.Extent[:], d.Extent)
	copy(img.Origin[:], d.Origin)
	copy(img.Spacing[:], d.Spacing)
	for _, a := range d.Arrays {
		if a.Type != "double" || a.Tuples != g.Nz*rows {
			t.Errorf("array %q: %s with %d tuples, want double with %d", a.Name, a.Type, a.Tuples, g.Nz*rows)
		}
		img.Arrays = append(img.Arrays, vtiArray{Name: a.Name, Components: a.Components, Values: a.Values})
	}
	return img
}

// TestVTKReader reads our files with VTK itself (vtkXMLImageDataReader,
// Debian's python3-vtk9): the plain and the mirrored file must give the
// extents, origin, spacing, point positions, array names, types, component
// and tuple counts and every value that were written, without a message
// from VTK. The .pvd goes through VTK's XML parser (vtkXMLDataParser) with
// every listed file read relative to it, and through vtkPVDReader where the
// VTK build has it.
func TestVTKReader(t *testing.T) {
	py := vtkPython(t)
	dir := t.TempDir()
	fields := sampleFields(testGrid, 0)
	plain, mirrored := filepath.Join(dir, "plain.vti"), filepath.Join(dir, "mirror.vti")
	if err := WriteVTI(plain, testGrid, fields, false); err != nil {
		t.Fatal(err)
	}
	if err := WriteVTI(mirrored, testGrid, fields, true); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(filepath.Join(dir, "frames"), 0o755); err != nil {
		t.Fatal(err)
	}
	entries := []CollectionEntry{{Time: 0, File: "frames/f-0.vti"}, {Time: 0.0125, File: "frames/f&1.vti"}}
	frames := [][]Field{sampleFields(testGrid, 0.5), sampleFields(testGrid, 1.5)}
	for i, e := range entries {
		if err := WriteVTI(filepath.Join(dir, e.File), testGrid, frames[i], true); err != nil {
			t.Fatal(err)
		}
	}
	pvd := filepath.Join(dir, "series.pvd")
	if err := WritePVD(pvd, entries); err != nil {
		t.Fatal(err)
	}
	script := filepath.Join(dir, "read_vtk.py")
	if err := os.WriteFile(script, []byte(readVTKScript), 0o644); err != nil {
		t.Fatal(err)
	}

	start := time.Now()
	cmd := exec.CommandContext(t.Context(), py, script, pvd, plain, mirrored)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("%s: %v\n%s", py, err, stderr.String())
	}
	var r vtkReport
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatalf("VTK report: %v\n%s\n%s", err, out, stderr.String())
	}
	t.Logf("VTK %s through %s in %v", r.Version, py, time.Since(start).Round(time.Millisecond))
	if r.Messages != "" {
		t.Errorf("VTK reported:\n%s", r.Messages)
	}
	if len(r.Images) != 2 {
		t.Fatalf("%d images read, want 2", len(r.Images))
	}
	t.Run("vtkXMLImageDataReader", func(t *testing.T) {
		checkImage(t, fromVTK(t, r.Images[0], testGrid, false), testGrid, fields, false)
	})
	t.Run("vtkXMLImageDataReader mirrored", func(t *testing.T) {
		checkImage(t, fromVTK(t, r.Images[1], testGrid, true), testGrid, fields, true)
	})

	c := r.Collection
	t.Run("pvd through vtkXMLDataParser", func(t *testing.T) {
		if !c.Parsed || c.Type != "Collection" || len(c.Entries) != len(entries) {
			t.Fatalf("parsed %v, type %q, %d entries; want a Collection of %d", c.Parsed, c.Type, len(c.Entries), len(entries))
		}
		for i, e := range entries {
			got := c.Entries[i]
			if tm, err := strconv.ParseFloat(got.Timestep, 64); got.Element != "DataSet" || err != nil || tm != e.Time || got.File != e.File {
				t.Errorf("entry %d: <%s timestep=%q file=%q>, want DataSet at %v in %q", i, got.Element, got.Timestep, got.File, e.Time, e.File)
				continue
			}
			checkImage(t, fromVTK(t, got.Data, testGrid, true), testGrid, frames[i], true)
		}
	})
	t.Run("vtkPVDReader", func(t *testing.T) {
		if !c.PVDReader {
			t.Skipf("vtkPVDReader is not in this VTK build (%s); the collection was checked through vtkXMLDataParser", r.Version)
		}
		if len(c.Frames) != len(entries) {
			t.Fatalf("vtkPVDReader found %d time steps, want %d", len(c.Frames), len(entries))
		}
		for i, e := range entries {
			if c.Frames[i].Time != e.Time {
				t.Errorf("time step %d at %v, want %v", i, c.Frames[i].Time, e.Time)
			}
			checkImage(t, fromVTK(t, c.Frames[i].Data, testGrid, true), testGrid, frames[i], true)
		}
	})
}

// vtkDatasetFunc is the Python function of the VTK reader scripts that
// turns a data set into the JSON of vtkDataset.
const vtkDatasetFunc = `
def dataset(d):
    if d is None or not d.IsA("vtkImageData"):
        return {"class": d.GetClassName() if d is not None else ""}
    pd = d.GetPointData()
    arrays = []
    for i in range(pd.GetNumberOfArrays()):
        a = pd.GetArray(i)
        n, c = a.GetNumberOfTuples(), a.GetNumberOfComponents()
        arrays.append({"name": a.GetName(), "type": a.GetDataTypeAsString(),
                       "components": c, "tuples": n,
                       "values": [a.GetComponent(t, k) for t in range(n) for k in range(c)]})
    s, v = pd.GetScalars(), pd.GetVectors()
    return {"class": d.GetClassName(), "dimensions": list(d.GetDimensions()),
            "extent": list(d.GetExtent()), "origin": list(d.GetOrigin()),
            "spacing": list(d.GetSpacing()),
            "points": [list(d.GetPoint(p)) for p in range(d.GetNumberOfPoints())],
            "scalars": s.GetName() if s else "", "vectors": v.GetName() if v else "",
            "arrays": arrays}
`
