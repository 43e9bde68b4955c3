package output

import (
	"bytes"
	"fmt"
	"path/filepath"
)

// BlockEntry is one data set of a multiblock file: its name (shown by
// VTK's readers as the block's name) and its file, named relative to the
// directory of the .vtm file.
type BlockEntry struct {
	Name string
	File string
}

// WriteVTM writes a VTK XML multiblock file (.vtm, "vtkMultiBlockDataSet"
// in the VTK project's "VTK File Formats" document) at path: one DataSet
// element per entry, in the order given, which VTK's
// vtkXMLMultiBlockDataReader (and ParaView) open as one data set of
// blocks. The refined levels of a lattice are such blocks, each an
// ImageData file of its own spacing (WriteVTI). File names must be
// relative to the directory of path; they are written with forward
// slashes. The file is written atomically.
func WriteVTM(path string, entries []BlockEntry) error {
	if len(entries) == 0 {
		return fmt.Errorf("multiblock %s: no data sets to list", path)
	}
	var b bytes.Buffer
	b.WriteString("<?xml version=\"1.0\"?>\n")
	b.WriteString(`<VTKFile type="vtkMultiBlockDataSet" version="1.0" byte_order="LittleEndian">` + "\n")
	b.WriteString("  <vtkMultiBlockDataSet>\n")
	for i, e := range entries {
		if err := checkName(e.Name); err != nil {
			return fmt.Errorf("multiblock %s: entry %d: name: %w", path, i+1, err)
		}
		if err := checkListedFile(e.File, "multiblock file"); err != nil {
			return fmt.Errorf("multiblock %s: entry %d: %w", path, i+1, err)
		}
		fmt.Fprintf(&b, "    <DataSet index=\"%d\" name=\"%s\" file=\"%s\"/>\n",
			i, escapeAttr(e.Name), escapeAttr(filepath.ToSlash(e.File)))
	}
	b.WriteString("  </vtkMultiBlockDataSet>\n</VTKFile>\n")
	return WriteFileAtomic(path, b.Bytes())
}
