package output

import (
	"bytes"
	"errors"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"math"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/vgimg"
)

// Circle is the section of a sphere on the axis, in node units: Z is the
// centre in lattice coordinates along the axis (the left end at 0, node k
// at k + 1/2) and Radius is in cells.
type Circle struct {
	Z, Radius float64
}

// Box is a region from the axis, Z0 <= z <= Z1, r <= R, in cells: the
// outline of a refined level, drawn dashed and mirrored about the axis.
type Box struct {
	Z0, Z1, R float64
}

// FieldPicture describes a picture of a node field of the (z, r) lattice.
// The picture shows the whole section of the container, -R..R: z runs to
// the right, r upwards, and the half below the axis is the mirror image of
// the field, with the sign flipped for a field that is odd in r.
//
// Frames of an animation are pictures at successive phases written with the
// same Range (and PsiStep), so that their colours compare; take them from
// ColorRange and ContourStep of the frame with the largest field.
type FieldPicture struct {
	// Nz and Nr are the lattice size; Field holds the Nz*Nr node values,
	// node (k, j) at index j*Nz+k. NaN marks a node without a value (drawn
	// light grey).
	Nz, Nr int
	Field  []float64

	// Odd says that the field changes sign across the axis (the azimuthal
	// vorticity, the radial velocity); otherwise it is even (the axial
	// velocity, the pressure, a speed).
	Odd bool

	// Diverging selects the symmetric scaling for signed fields: the map
	// spans -Range..Range with zero at its middle. Otherwise the map spans
	// 0..Range (a magnitude).
	Diverging bool

	// Map is the colour map; nil means CoolWarm for a diverging picture
	// and BlueYellow otherwise.
	Map ColorMap

	// Range is the colour range, > 0; 0 chooses it from the field (see
	// ColorRange). Values beyond it take the colour of the end.
	Range float64

	// Psi, when not nil, is the Stokes streamfunction on the same nodes
	// (even in r); its contours are drawn as streamlines.
	Psi []float64

	// Contours is the number of contour spacings across the range of Psi
	// (0 means 12, negative means no streamlines); PsiStep, when > 0, fixes
	// the spacing instead. The levels are the whole multiples of the
	// spacing, so the zero level is among them and drawn thicker.
	Contours int
	PsiStep  float64

	// Spheres are drawn as grey disks with a black outline.
	Spheres []Circle

	// Boxes are outlined with dashed black lines (the refined levels).
	Boxes []Box

	// PixelsPerCell is the size of a cell in pixels; 0 chooses the largest
	// that keeps the field within 1600 pixels in width and height (at least
	// 1), which makes the usual elongated lattices 1000-1600 pixels wide.
	PixelsPerCell int

	// Title is the line above the picture; Label names the field and its
	// unit beside the colour bar.
	Title, Label string
}

// The figure layout, in pixels.
const (
	maxFieldPixels = 1600
	minFieldWidth  = 640 // narrower fields leave room for the colour bar and text
	figMargin      = 16
	titleSize      = 20 // font size in pixels (points at 72 dpi)
	textSize       = 15
	lineSpacing    = 20
	barHeight      = 18
	barMaxWidth    = 480
	tableSize      = 4096
	defaultLevels  = 12
	maxLevels      = 400
	percentile     = 0.99
)

var (
	noDataColor  = color.RGBA{230, 230, 230, 255}
	sphereColor  = color.RGBA{150, 150, 150, 255}
	contourColor = color.NRGBA{0, 0, 0, 200}
	axisColor    = color.NRGBA{128, 128, 128, 220}
	sansFont     = font.Font{Typeface: "Liberation", Variant: "Sans"}
)

// WriteFieldPNG writes the picture p to path as a PNG: a title line, the
// field in colour with the streamlines and the spheres on top, the axis as
// a dashed line, and the colour bar with its range below. The field between
// node centres is bilinearly interpolated. The file is written atomically.
func WriteFieldPNG(path string, p FieldPicture) error {
	img, err := p.render()
	if err != nil {
		return fmt.Errorf("picture %s: %w", path, err)
	}
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		return fmt.Errorf("picture %s: %w", path, err)
	}
	return WriteFileAtomic(path, buf.Bytes())
}

func (p *FieldPicture) check() error {
	n := p.Nz * p.Nr
	var errs []error
	if p.Nz < 1 || p.Nr < 1 {
		errs = append(errs, fmt.Errorf("lattice %d x %d: both sizes must be at least 1", p.Nz, p.Nr))
	}
	if len(p.Field) != n {
		errs = append(errs, fmt.Errorf("field has %d values, the %d x %d lattice has %d nodes", len(p.Field), p.Nz, p.Nr, n))
	}
	if p.Psi != nil && len(p.Psi) != n {
		errs = append(errs, fmt.Errorf("streamfunction has %d values, the %d x %d lattice has %d nodes", len(p.Psi), p.Nz, p.Nr, n))
	}
	if !(p.Range >= 0) || math.IsInf(p.Range, 0) {
		errs = append(errs, fmt.Errorf("colour range %g: must be finite and > 0, or 0 for automatic", p.Range))
	}
	if !(p.PsiStep >= 0) || math.IsInf(p.PsiStep, 0) {
		errs = append(errs, fmt.Errorf("contour step %g: must be finite and > 0, or 0 for automatic", p.PsiStep))
	}
	if p.PixelsPerCell < 0 {
		errs = append(errs, fmt.Errorf("pixels per cell %d: must be > 0, or 0 for automatic", p.PixelsPerCell))
	}
	for i, s := range p.Spheres {
		if !(s.Radius > 0) || math.IsInf(s.Radius, 0) || math.IsNaN(s.Z) || math.IsInf(s.Z, 0) {
			errs = append(errs, fmt.Errorf("sphere %d at z = %g with radius %g: needs a finite centre and radius > 0", i+1, s.Z, s.Radius))
		}
	}
	return errors.Join(errs...)
}

// ColorRange returns the colour range of the picture: Range when it is set,
// otherwise the 99th percentile (nearest rank) of |value| over the nodes
// outside the spheres, so that a few extreme nodes (the vorticity at a
// sphere's rim) do not wash out the rest; if that is 0, the largest |value|;
// if the field is zero everywhere, 1.
func (p *FieldPicture) ColorRange() float64 {
	if p.Range > 0 {
		return p.Range
	}
	var abs []float64
	p.eachLiquid(p.Field, func(v float64) { abs = append(abs, math.Abs(v)) })
	if len(abs) == 0 {
		return 1
	}
	slices.Sort(abs)
	r := abs[int(math.Ceil(percentile*float64(len(abs))))-1]
	if r == 0 {
		r = abs[len(abs)-1]
	}
	if r == 0 {
		return 1
	}
	return r
}

// ContourStep returns the spacing of the streamlines: PsiStep when it is
// set, otherwise the range of Psi outside the spheres over Contours (12 by
// default); 0 when there are none to draw.
func (p *FieldPicture) ContourStep() float64 {
	if p.Psi == nil || p.Contours < 0 {
		return 0
	}
	if p.PsiStep > 0 {
		return p.PsiStep
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	p.eachLiquid(p.Psi, func(v float64) { lo, hi = min(lo, v), max(hi, v) })
	if !(hi > lo) {
		return 0
	}
	n := p.Contours
	if n == 0 {
		n = defaultLevels
	}
	return (hi - lo) / float64(n)
}

// eachLiquid calls f with every finite value of v at a node outside the
// spheres.
func (p *FieldPicture) eachLiquid(v []float64, f func(float64)) {
	for j := 0; j < p.Nr; j++ {
		r := float64(j) + 0.5
		for k := 0; k < p.Nz; k++ {
			x := v[j*p.Nz+k]
			if math.IsNaN(x) || math.IsInf(x, 0) || p.insideSphere(float64(k)+0.5, r) {
				continue
			}
			f(x)
		}
	}
}

func (p *FieldPicture) insideSphere(z, r float64) bool {
	for _, s := range p.Spheres {
		if (z-s.Z)*(z-s.Z)+r*r < s.Radius*s.Radius {
			return true
		}
	}
	return false
}

// pixelsPerCell returns the automatic cell size in pixels.
func pixelsPerCell(nz, nr int) int {
	return max(1, min(maxFieldPixels/nz, maxFieldPixels/(2*nr)))
}

// layout places the parts of a figure; y is measured down from the top.
type layout struct {
	ppc            int
	width, height  int
	fieldX, fieldY int // top left corner of the field
	fieldW, fieldH int
	titleBase      int      // baseline of the title
	barY, barW     int      // top of the colour bar and its width (it starts at fieldX)
	tickBase       int      // baseline of the tick labels under the bar
	infoBase       int      // baseline of the first line under the ticks
	info           []string // those lines
}

func (p *FieldPicture) layout() layout {
	l := layout{ppc: p.PixelsPerCell}
	if l.ppc == 0 {
		l.ppc = pixelsPerCell(p.Nz, p.Nr)
	}
	l.fieldW, l.fieldH = p.Nz*l.ppc, 2*p.Nr*l.ppc
	l.width = max(l.fieldW, minFieldWidth) + 2*figMargin
	l.fieldX = figMargin
	l.titleBase = figMargin + titleSize
	l.fieldY = l.titleBase + titleSize/2
	l.barY = l.fieldY + l.fieldH + 14
	l.barW = min(max(l.fieldW, minFieldWidth), barMaxWidth)
	l.tickBase = l.barY + barHeight + 4 + textSize
	l.infoBase = l.tickBase + textSize + 8
	l.info = wrap(p.info(p.ColorRange(), p.ContourStep()), "; ", smallFace(), float64(l.width-2*figMargin))
	l.height = l.infoBase + (len(l.info)-1)*lineSpacing + textSize/2 + figMargin
	return l
}

func smallFace() font.Face { return font.DefaultCache.Lookup(sansFont, textSize) }

// wrap splits s at sep into lines no wider than width where it can.
func wrap(s, sep string, face font.Face, width float64) []string {
	var lines []string
	line := ""
	for _, part := range strings.Split(s, sep) {
		switch {
		case line == "":
			line = part
		case float64(face.Width(line+sep+part)) <= width:
			line += sep + part
		default:
			lines = append(lines, line+strings.TrimSpace(sep))
			line = part
		}
	}
	return append(lines, line)
}

// render draws the picture.
func (p *FieldPicture) render() (*image.RGBA, error) {
	if err := p.check(); err != nil {
		return nil, err
	}
	l := p.layout()
	cm := p.Map
	if cm == nil {
		if p.Diverging {
			cm = CoolWarm()
		} else {
			cm = BlueYellow()
		}
	}
	table := newColorTable(cm, tableSize)
	scale := p.ColorRange()
	lo := 0.0
	if p.Diverging {
		lo = -scale
	}

	c := vgimg.NewWith(vgimg.UseWH(vg.Length(l.width), vg.Length(l.height)), vgimg.UseDPI(72))
	img, ok := c.Image().(*image.RGBA)
	if !ok {
		return nil, fmt.Errorf("canvas image is a %T, not *image.RGBA", c.Image())
	}
	sign := 1.0
	if p.Odd {
		sign = -1
	}
	full := mirror(p.Field, p.Nz, p.Nr, sign)
	p.paintField(img, l, full, table, lo, scale)
	for x := range l.barW {
		col := table.at((float64(x) + 0.5) / float64(l.barW))
		for y := range barHeight {
			img.SetRGBA(l.fieldX+x, l.barY+y, col)
		}
	}

	// Vector parts: the canvas has its origin at the bottom left and one
	// point per pixel.
	h := float64(l.height)
	pt := func(x, y float64) vg.Point { return vg.Point{X: vg.Length(x), Y: vg.Length(h - y)} }
	grid := func(i, m float64) vg.Point { // a node of the mirrored grid
		return pt(float64(l.fieldX)+(i+0.5)*float64(l.ppc), float64(l.fieldY)+(float64(2*p.Nr)-m-0.5)*float64(l.ppc))
	}

	step := p.ContourStep()
	if step > 0 {
		psi := mirror(p.Psi, p.Nz, p.Nr, 1)
		levels, err := p.levels(step)
		if err != nil {
			return nil, err
		}
		var lines, zero vg.Path
		for _, lv := range levels {
			path := &lines
			if lv == 0 {
				path = &zero
			}
			for _, s := range contourSegments(psi, p.Nz, 2*p.Nr, lv) {
				path.Move(grid(s[0].X, s[0].Y))
				path.Line(grid(s[1].X, s[1].Y))
			}
		}
		c.SetColor(contourColor)
		c.SetLineWidth(1.2)
		c.Stroke(lines)
		c.SetLineWidth(2.2)
		c.Stroke(zero)
	}

	axisY := float64(l.fieldY) + float64(p.Nr*l.ppc)
	var axis vg.Path
	axis.Move(pt(float64(l.fieldX), axisY))
	axis.Line(pt(float64(l.fieldX+l.fieldW), axisY))
	c.SetColor(axisColor)
	c.SetLineWidth(1)
	c.SetLineDash([]vg.Length{8, 5}, 0)
	c.Stroke(axis)
	c.SetLineDash(nil, 0)

	c.SetColor(color.Black)
	c.SetLineWidth(1)
	c.SetLineDash([]vg.Length{4, 4}, 0)
	for _, b := range p.Boxes {
		x0, x1 := float64(l.fieldX)+b.Z0*float64(l.ppc), float64(l.fieldX)+b.Z1*float64(l.ppc)
		rect(c, pt(x0, axisY+b.R*float64(l.ppc)), pt(x1, axisY-b.R*float64(l.ppc)))
	}
	c.SetLineDash(nil, 0)

	for _, s := range p.Spheres {
		centre := pt(float64(l.fieldX)+s.Z*float64(l.ppc), axisY)
		rad := vg.Length(s.Radius * float64(l.ppc))
		var disk vg.Path
		disk.Move(vg.Point{X: centre.X + rad, Y: centre.Y})
		disk.Arc(centre, rad, 0, 2*math.Pi)
		disk.Close()
		c.SetColor(sphereColor)
		c.Fill(disk)
		c.SetColor(color.Black)
		c.SetLineWidth(1.5)
		c.Stroke(disk)
	}

	c.SetColor(color.Black)
	c.SetLineWidth(1)
	rect(c, pt(float64(l.fieldX), float64(l.fieldY+l.fieldH)), pt(float64(l.fieldX+l.fieldW), float64(l.fieldY)))
	rect(c, pt(float64(l.fieldX), float64(l.barY+barHeight)), pt(float64(l.fieldX+l.barW), float64(l.barY)))

	title := font.DefaultCache.Lookup(sansFont, titleSize)
	small := smallFace()
	if title.Face == nil {
		return nil, errors.New("no font for the text (gonum.org/v1/plot's font cache is empty)")
	}
	c.FillString(title, pt(float64(l.fieldX), float64(l.titleBase)), p.Title)
	ticks := []float64{lo, (lo + scale) / 2, scale}
	for i, v := range ticks {
		s := formatValue(v)
		x := float64(l.fieldX) + float64(i)*float64(l.barW)/2 - float64(small.Width(s))*float64(i)/2
		c.FillString(small, pt(x, float64(l.tickBase)), s)
	}
	if p.Label != "" {
		c.FillString(small, pt(float64(l.fieldX+l.barW+12), float64(l.barY+barHeight/2+textSize/3)), p.Label)
	}
	for i, s := range l.info {
		c.FillString(small, pt(float64(l.fieldX), float64(l.infoBase+i*lineSpacing)), s)
	}
	return img, nil
}

// info is the line under the colour bar: how the range was set and what
// the lines are.
func (p *FieldPicture) info(scale, step float64) string {
	s := "colour range "
	if p.Diverging {
		s += "±"
	} else {
		s += "0 to "
	}
	s += formatValue(scale)
	if p.Range == 0 {
		s += " (99th percentile of |value|; beyond it the end colours)"
	}
	if step > 0 {
		s += "; streamlines: Stokes streamfunction every " + formatValue(step) + ", zero level thicker"
	}
	if p.Odd {
		s += "; lower half mirrored with the sign flipped"
	} else {
		s += "; lower half mirrored"
	}
	return s
}

func formatValue(v float64) string {
	if v == 0 {
		return "0"
	}
	return strconv.FormatFloat(v, 'g', 3, 64)
}

func rect(c *vgimg.Canvas, a, b vg.Point) {
	var r vg.Path
	r.Move(a)
	r.Line(vg.Point{X: b.X, Y: a.Y})
	r.Line(b)
	r.Line(vg.Point{X: a.X, Y: b.Y})
	r.Close()
	c.Stroke(r)
}

// levels returns the whole multiples of step strictly inside the range of
// Psi (all nodes, the mirror adds none).
func (p *FieldPicture) levels(step float64) ([]float64, error) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range p.Psi {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = min(lo, v), max(hi, v)
		}
	}
	if !(hi > lo) {
		return nil, nil
	}
	first, last := math.Floor(lo/step)+1, math.Ceil(hi/step)-1
	if last-first+1 > maxLevels {
		return nil, fmt.Errorf("contour step %g gives %g streamlines across the streamfunction's range %g..%g; at most %d are drawn",
			step, last-first+1, lo, hi, maxLevels)
	}
	var lv []float64
	for k := first; k <= last; k++ {
		lv = append(lv, k*step)
	}
	return lv, nil
}

// mirror returns the field on the full section: 2*nr rows, row m at the
// signed radius m - nr + 1/2, the rows below the axis being the rows above
// it times sign.
func mirror(f []float64, nz, nr int, sign float64) []float64 {
	full := make([]float64, 2*nr*nz)
	for j := range nr {
		row := f[j*nz : (j+1)*nz]
		up := full[(nr+j)*nz : (nr+j+1)*nz]
		down := full[(nr-1-j)*nz : (nr-j)*nz]
		for k, v := range row {
			up[k] = v
			down[k] = sign * v
		}
	}
	return full
}

// paintField fills the field rectangle of img from the mirrored grid,
// interpolating bilinearly between node centres (and holding the edge
// values over the outer half cell), the map spanning lo..hi.
func (p *FieldPicture) paintField(img *image.RGBA, l layout, full []float64, table colorTable, lo, hi float64) {
	nz, ny := p.Nz, 2*p.Nr
	type tap struct {
		i0, i1 int
		w      float64
	}
	taps := func(pixels, n int, flip bool) []tap {
		t := make([]tap, pixels)
		for q := range t {
			x := (float64(q)+0.5)/float64(l.ppc) - 0.5
			if flip {
				x = float64(n) - 1 - x
			}
			x = max(0, min(x, float64(n-1)))
			i0 := min(int(x), max(n-2, 0))
			t[q] = tap{i0: i0, i1: min(i0+1, n-1), w: x - float64(i0)}
		}
		return t
	}
	cols := taps(l.fieldW, nz, false)
	rows := taps(l.fieldH, ny, true) // the top row of pixels is the top row of the grid
	for y, ry := range rows {
		r0, r1 := full[ry.i0*nz:(ry.i0+1)*nz], full[ry.i1*nz:(ry.i1+1)*nz]
		line := img.Pix[(l.fieldY+y)*img.Stride+4*l.fieldX:]
		for x, cx := range cols {
			v00, v10, v01, v11 := r0[cx.i0], r0[cx.i1], r1[cx.i0], r1[cx.i1]
			v := (1-ry.w)*((1-cx.w)*v00+cx.w*v10) + ry.w*((1-cx.w)*v01+cx.w*v11)
			if math.IsNaN(v) { // a node without a value: take the nearest node
				v = v00
				switch {
				case cx.w >= 0.5 && ry.w >= 0.5:
					v = v11
				case cx.w >= 0.5:
					v = v10
				case ry.w >= 0.5:
					v = v01
				}
			}
			col := noDataColor
			if !math.IsNaN(v) {
				col = table.at((v - lo) / (hi - lo))
			}
			px := line[4*x : 4*x+4 : 4*x+4]
			px[0], px[1], px[2], px[3] = col.R, col.G, col.B, col.A
		}
	}
}

// point is a position on a grid, in node indices (node (i, j) at (i, j)).
type point struct{ X, Y float64 }

// segment is a piece of a contour line inside one grid cell.
type segment [2]point

// contourSegments returns the level line f = level of a field on an
// nx x ny grid (node (i, j) at index j*nx+i) as segments, by marching
// squares: the two-dimensional form of the marching cubes of Lorensen and
// Cline ("Marching Cubes: A High Resolution 3D Surface Construction
// Algorithm", SIGGRAPH 1987). A node is above the level when f >= level; on
// each cell edge whose ends differ the crossing is placed by linear
// interpolation. A cell with two opposite corners above and two below (a
// saddle) is resolved by the mean of its four corners, the value of the
// bilinear interpolant at the cell centre. Cells with a NaN corner are
// skipped.
func contourSegments(f []float64, nx, ny int, level float64) []segment {
	var segs []segment
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			// Corners counter-clockwise from the bottom left, edges e0..e3
			// between corners 0-1, 1-2, 2-3, 3-0.
			c := [4]point{{float64(i), float64(j)}, {float64(i + 1), float64(j)},
				{float64(i + 1), float64(j + 1)}, {float64(i), float64(j + 1)}}
			v := [4]float64{f[j*nx+i], f[j*nx+i+1], f[(j+1)*nx+i+1], f[(j+1)*nx+i]}
			if math.IsNaN(v[0]) || math.IsNaN(v[1]) || math.IsNaN(v[2]) || math.IsNaN(v[3]) {
				continue
			}
			var above [4]bool
			var crossing [4]point
			var edges []int
			for e := range 4 {
				above[e] = v[e] >= level
			}
			for e := range 4 {
				a, b := e, (e+1)%4
				if above[a] != above[b] {
					t := (level - v[a]) / (v[b] - v[a])
					crossing[e] = point{c[a].X + t*(c[b].X-c[a].X), c[a].Y + t*(c[b].Y-c[a].Y)}
					edges = append(edges, e)
				}
			}
			switch len(edges) {
			case 2:
				segs = append(segs, segment{crossing[edges[0]], crossing[edges[1]]})
			case 4:
				centreAbove := (v[0]+v[1]+v[2]+v[3])/4 >= level
				if above[0] != centreAbove { // corners 0 and 2 are cut off
					segs = append(segs, segment{crossing[3], crossing[0]}, segment{crossing[1], crossing[2]})
				} else { // corners 1 and 3 are cut off
					segs = append(segs, segment{crossing[0], crossing[1]}, segment{crossing[2], crossing[3]})
				}
			}
		}
	}
	return segs
}
