package output

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// readVTMScript reads a .vtm with VTK's vtkXMLMultiBlockDataReader and
// prints each block's name and its image as readVTKScript's dataset does.
const readVTMScript = `
import json, sys
import vtk

messages = vtk.vtkStringOutputWindow()
vtk.vtkOutputWindow.SetInstance(messages)
` + vtkDatasetFunc + `
r = vtk.vtkXMLMultiBlockDataReader()
r.SetFileName(sys.argv[1])
r.Update()
mb = r.GetOutput()
blocks = []
for i in range(mb.GetNumberOfBlocks()):
    name = mb.GetMetaData(i).Get(vtk.vtkCompositeDataSet.NAME()) if mb.HasMetaData(i) else ""
    blocks.append({"name": name or "", "data": dataset(mb.GetBlock(i))})
print(json.dumps({"class": mb.GetClassName(), "error_code": r.GetErrorCode(),
                  "blocks": blocks, "messages": messages.GetOutput()}))
`

// TestVTKReaderMultiBlock writes two levels, the second of half the
// spacing over part of the first, as ImageData files and a .vtm listing
// them, and reads the .vtm with VTK itself (vtkXMLMultiBlockDataReader):
// two blocks with their names, each the image that was written (extents,
// origin, spacing, point positions, arrays and every value), without a
// message from VTK.
func TestVTKReaderMultiBlock(t *testing.T) {
	py := vtkPython(t)
	dir := t.TempDir()
	fine := Grid{Nz: 6, Nr: 4, Z0: testGrid.Z0 + testGrid.Spacing, R0: testGrid.Spacing / 4, Spacing: testGrid.Spacing / 2}
	grids := []Grid{testGrid, fine}
	var entries []BlockEntry
	var fields [][]Field
	if err := os.Mkdir(filepath.Join(dir, "levels"), 0o755); err != nil {
		t.Fatal(err)
	}
	for l, g := range grids {
		f := sampleFields(g, float64(l))
		e := BlockEntry{Name: []string{"level 0", "level 1 & finer"}[l], File: []string{"levels/l0.vti", "levels/l1.vti"}[l]}
		if err := WriteVTI(filepath.Join(dir, e.File), g, f, false); err != nil {
			t.Fatal(err)
		}
		entries, fields = append(entries, e), append(fields, f)
	}
	vtm := filepath.Join(dir, "levels.vtm")
	if err := WriteVTM(vtm, entries); err != nil {
		t.Fatal(err)
	}
	script := filepath.Join(dir, "read_vtm.py")
	if err := os.WriteFile(script, []byte(readVTMScript), 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.CommandContext(t.Context(), py, script, vtm)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("%s: %v\n%s", py, err, stderr.String())
	}
	var r struct {
		Class     string `json:"class"`
		ErrorCode int    `json:"error_code"`
		Messages  string `json:"messages"`
		Blocks    []struct {
			Name string     `json:"name"`
			Data vtkDataset `json:"data"`
		} `json:"blocks"`
	}
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatalf("VTK report: %v\n%s\n%s", err, out, stderr.String())
	}
	if r.Messages != "" {
		t.Errorf("VTK reported:\n%s", r.Messages)
	}
	if r.Class != "vtkMultiBlockDataSet" || r.ErrorCode != 0 || len(r.Blocks) != 2 {
		t.Fatalf("VTK read a %q (error %d) of %d blocks, want a vtkMultiBlockDataSet of 2", r.Class, r.ErrorCode, len(r.Blocks))
	}
	for l, b := range r.Blocks {
		if b.Name != entries[l].Name {
			t.Errorf("block %d named %q, want %q", l, b.Name, entries[l].Name)
		}
		checkImage(t, fromVTK(t, b.Data, grids[l], false), grids[l], fields[l], false)
	}
}

// TestWriteVTMRejects: no entries, an empty name and an absolute file are
// refused, and nothing is written.
func TestWriteVTMRejects(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		entries []BlockEntry
		want    string
	}{
		{nil, "no data sets"},
		{[]BlockEntry{{Name: " ", File: "a.vti"}}, "empty name"},
		{[]BlockEntry{{Name: "level 0", File: "/tmp/a.vti"}}, "absolute"},
	} {
		path := filepath.Join(dir, "x.vtm")
		err := WriteVTM(path, c.entries)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("entries %v: error %v, want one saying %q", c.entries, err, c.want)
		}
		if _, err := os.Stat(path); err == nil {
			t.Errorf("entries %v: a refused file was written", c.entries)
		}
	}
}
