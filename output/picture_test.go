package output

import (
	"flag"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"
)

var sampleDir = flag.String("samples", "", "keep the sample pictures and charts of the tests in this directory")

// outDir is where a test writes its pictures: -samples DIR when given.
func outDir(t *testing.T) string {
	if *sampleDir != "" {
		if err := os.MkdirAll(*sampleDir, 0o755); err != nil {
			t.Fatal(err)
		}
		return *sampleDir
	}
	return t.TempDir()
}

func decodePNG(t *testing.T, path string) image.Image {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("decode %s: %v", path, err)
	}
	return img
}

// notBlank fails unless the variance of the 8-bit R, G and B values over
// the whole image exceeds 1% of the largest variance 8-bit values can have
// (127.5^2, half of them 0 and half 255). A blank image has none; the
// floor corresponds to a spread of about 13 levels.
func notBlank(t *testing.T, img image.Image) {
	t.Helper()
	var n, sum, sum2 float64
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			c := color.RGBAModel.Convert(img.At(x, y)).(color.RGBA)
			for _, v := range []uint8{c.R, c.G, c.B} {
				n++
				sum += float64(v)
				sum2 += float64(v) * float64(v)
			}
		}
	}
	mean := sum / n
	variance := sum2/n - mean*mean
	if floor := 0.01 * 127.5 * 127.5; variance <= floor {
		t.Errorf("pixel variance %.1f is not above %.1f: the image is blank or nearly so", variance, floor)
	}
}

func rgbaAt(img image.Image, x, y int) color.RGBA {
	return color.RGBAModel.Convert(img.At(x, y)).(color.RGBA)
}

func near(a, b color.RGBA, levels int) bool {
	return absInt(int(a.R)-int(b.R)) <= levels && absInt(int(a.G)-int(b.G)) <= levels &&
		absInt(int(a.B)-int(b.B)) <= levels
}

// TestPixelsPerCell: the automatic cell size keeps the field within 1600
// pixels each way.
func TestPixelsPerCell(t *testing.T) {
	for _, c := range []struct{ nz, nr, want int }{
		{360, 90, 4},   // the demo: 1440 x 720
		{100, 25, 16},  // 1600 x 800
		{540, 135, 2},  // 1080 x 540
		{40, 200, 4},   // tall: 160 x 1600
		{5000, 10, 1},  // wider than 1600 at one pixel per cell
		{1601, 900, 1}, // never below 1
	} {
		if got := pixelsPerCell(c.nz, c.nr); got != c.want {
			t.Errorf("pixelsPerCell(%d, %d) = %d, want %d", c.nz, c.nr, got, c.want)
		}
	}
}

// demoPicture is a vorticity-like picture on the demo's 360 x 90 lattice:
// two spheres, an odd field concentrated round them and a streamfunction
// with two recirculating regions.
func demoPicture() FieldPicture {
	const nz, nr = 360, 90
	p := FieldPicture{
		Nz: nz, Nr: nr, Odd: true, Diverging: true,
		Spheres: []Circle{{Z: 150, Radius: 18}, {Z: 222, Radius: 12}},
		Title:   "test: vorticity-like field, two spheres",
		Label:   "vorticity (1/s)",
		Field:   make([]float64, nz*nr),
		Psi:     make([]float64, nz*nr),
	}
	for j := range nr {
		r := float64(j) + 0.5
		for k := range nz {
			z := float64(k) + 0.5
			var w float64
			for _, s := range p.Spheres {
				d := math.Hypot(z-s.Z, r)
				w += r / d * math.Exp(-(d-s.Radius)/6) * (z - s.Z) / d
			}
			p.Field[j*nz+k] = 300 * w
			// psi = r^2 (1 - r^2/R^2) sin(2 pi z/L): zero on the axis and
			// the side wall, cells of opposite circulation.
			p.Psi[j*nz+k] = r * r * (1 - r*r/(nr*nr)) * math.Sin(2*math.Pi*z/nz)
		}
	}
	return p
}

// TestWriteFieldPNG writes the demo-sized picture and checks that it
// decodes, has the size of its layout (1440 x 720 field pixels) and is not
// blank; and that a magnitude picture (sequential map, even field) does too.
func TestWriteFieldPNG(t *testing.T) {
	dir := outDir(t)
	p := demoPicture()
	path := filepath.Join(dir, "vorticity.png")
	if err := WriteFieldPNG(path, p); err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, path)
	l := p.layout()
	if l.fieldW != 1440 || l.fieldH != 720 {
		t.Errorf("field is %d x %d pixels, want 1440 x 720", l.fieldW, l.fieldH)
	}
	if b := img.Bounds(); b.Dx() != l.width || b.Dy() != l.height || l.width != 1440+2*figMargin {
		t.Errorf("image is %d x %d, want %d x %d", b.Dx(), b.Dy(), 1440+2*figMargin, l.height)
	}
	notBlank(t, img)

	q := demoPicture()
	q.Odd, q.Diverging, q.Psi = false, false, nil
	for i, v := range q.Field {
		q.Field[i] = math.Abs(v)
	}
	q.Title, q.Label = "test: magnitude of the same field", "|vorticity| (1/s)"
	path = filepath.Join(dir, "magnitude.png")
	if err := WriteFieldPNG(path, q); err != nil {
		t.Fatal(err)
	}
	notBlank(t, decodePNG(t, path))

	// A tall lattice: a 160 x 1600 field in a figure kept 640 pixels wide
	// for the colour bar, the line under it wrapped.
	const nz, nr = 40, 200
	n := FieldPicture{Nz: nz, Nr: nr, Odd: true, Diverging: true, Field: make([]float64, nz*nr),
		Psi: make([]float64, nz*nr), Spheres: []Circle{{Z: 20, Radius: 6}}, Title: "test: tall lattice", Label: "w (1/s)"}
	for j := range nr {
		for k := range nz {
			r, z := float64(j)+0.5, float64(k)+0.5
			n.Field[j*nz+k] = r * math.Sin(math.Pi*z/nz) * math.Cos(math.Pi*r/nr)
			n.Psi[j*nz+k] = r * r * math.Sin(2*math.Pi*z/nz) * math.Sin(math.Pi*r/nr)
		}
	}
	path = filepath.Join(dir, "tall.png")
	if err := WriteFieldPNG(path, n); err != nil {
		t.Fatal(err)
	}
	img = decodePNG(t, path)
	l = n.layout()
	if b := img.Bounds(); l.fieldW != 160 || l.fieldH != 1600 || b.Dx() != 640+2*figMargin || b.Dy() != l.height || len(l.info) < 2 {
		t.Errorf("tall picture: field %d x %d, image %d x %d, %d lines of text; want 160 x 1600, %d x %d, at least 2",
			l.fieldW, l.fieldH, b.Dx(), b.Dy(), len(l.info), 640+2*figMargin, l.height)
	}
	notBlank(t, img)
}

// TestFieldPixels: with the odd field f = r (linear, so bilinear
// interpolation reproduces it exactly) and a fixed range, every field pixel
// away from the drawn lines has the map's colour at its signed radius,
// within the one level of the colour table; the mirrored pixel has the
// colour of the opposite value; the sphere's disk is grey and NaN nodes are
// drawn in the no-data colour.
func TestFieldPixels(t *testing.T) {
	const nz, nr = 40, 10
	p := FieldPicture{Nz: nz, Nr: nr, Odd: true, Diverging: true, Range: nr,
		Field: make([]float64, nz*nr), Spheres: []Circle{{Z: 30, Radius: 4}}}
	for j := range nr {
		for k := range nz {
			p.Field[j*nz+k] = float64(j) + 0.5
		}
	}
	for k := 0; k < 5; k++ { // a patch without values at the top left
		p.Field[(nr-1)*nz+k] = math.NaN()
	}
	img, err := p.render()
	if err != nil {
		t.Fatal(err)
	}
	l := p.layout()
	if l.ppc != 40 {
		t.Fatalf("%d pixels per cell, want 40", l.ppc)
	}
	m := CoolWarm()
	checked := 0
	for x := l.ppc / 2; x < 20*l.ppc; x += 7 { // left of the sphere
		for y := l.ppc / 2; y < l.fieldH/2-3; y += 5 { // above the axis line
			if y < 2*l.ppc && x < 6*l.ppc {
				continue // the NaN patch and the cells next to it
			}
			r := float64(nr) - (float64(y)+0.5)/float64(l.ppc)
			want := m.At((r + nr) / (2 * nr))
			if got := rgbaAt(img, l.fieldX+x, l.fieldY+y); !near(got, want, 1) {
				t.Fatalf("pixel (%d, %d) at r = %g is %v, want %v", x, y, r, got, want)
			}
			mirror := m.At((nr - r) / (2 * nr))
			if got := rgbaAt(img, l.fieldX+x, l.fieldY+l.fieldH-1-y); !near(got, mirror, 1) {
				t.Fatalf("mirrored pixel (%d, %d) at r = %g is %v, want %v", x, l.fieldH-1-y, -r, got, mirror)
			}
			checked++
		}
	}
	if checked < 1000 {
		t.Fatalf("only %d pixels checked", checked)
	}
	axis := l.fieldY + l.fieldH/2
	if got := rgbaAt(img, l.fieldX+30*l.ppc, axis-2*l.ppc); got != sphereColor {
		t.Errorf("inside the sphere: %v, want %v", got, sphereColor)
	}
	if got := rgbaAt(img, l.fieldX+l.ppc, l.fieldY+l.ppc/4); got != noDataColor {
		t.Errorf("at a NaN node: %v, want %v", got, noDataColor)
	}
}

// TestColorRange: the automatic range is the 99th percentile (nearest
// rank) of |value| over the nodes outside the spheres.
func TestColorRange(t *testing.T) {
	const nz, nr = 100, 10
	p := FieldPicture{Nz: nz, Nr: nr, Field: make([]float64, nz*nr)}
	for i := range p.Field {
		p.Field[i] = -float64(i + 1) // |values| 1..1000
	}
	if got := p.ColorRange(); got != 990 {
		t.Errorf("range %g, want 990 (the 990th of 1000 sorted values)", got)
	}
	// The percentile is 0 for a field that is zero but at one node, and
	// the largest |value| is taken: 7, not the 1e12 of the node (99, 0)
	// that a small sphere centred on it covers.
	clear(p.Field)
	p.Field[5*nz+40] = -7
	p.Field[99] = 1e12
	p.Spheres = []Circle{{Z: 99.5, Radius: 0.6}}
	if got := p.ColorRange(); got != 7 {
		t.Errorf("with a sphere: range %g, want 7 (the covered node left out)", got)
	}
	p.Range = 5
	if got := p.ColorRange(); got != 5 {
		t.Errorf("fixed range: %g, want 5", got)
	}
	z := FieldPicture{Nz: 4, Nr: 2, Field: make([]float64, 8)}
	if got := z.ColorRange(); got != 1 {
		t.Errorf("zero field: range %g, want 1", got)
	}
}

// TestContourLevels: 12 spacings across psi in -1..2 give steps of 0.25 and
// the 11 multiples strictly inside, zero among them.
func TestContourLevels(t *testing.T) {
	p := FieldPicture{Nz: 2, Nr: 2, Field: make([]float64, 4), Psi: []float64{-1, 0.3, 2, 1}}
	step := p.ContourStep()
	if step != 0.25 {
		t.Fatalf("step %g, want 0.25", step)
	}
	lv, err := p.levels(step)
	if err != nil {
		t.Fatal(err)
	}
	if len(lv) != 11 || lv[0] != -0.75 || lv[3] != 0 || lv[10] != 1.75 {
		t.Errorf("levels %v, want -0.75, -0.5, ..., 1.75", lv)
	}
	p.PsiStep = 1e-6
	if _, err := p.levels(p.ContourStep()); err == nil {
		t.Error("3e6 levels accepted")
	}
}

// TestMarchingSquaresCircle: on f = x^2 + y^2 the level line f = R^2 is a
// circle. Along a grid edge f is x^2 (or y^2) plus a constant, and linear
// interpolation of a parabola over an edge of length h = 1 overestimates it
// by at most h^2/4, so each contour point has R^2 - 1/4 <= x^2 + y^2 <= R^2:
// within R - sqrt(R^2 - 1/4) (0.0124 cell at R = 10.05) inside the circle.
// The segments must also close up into one curve. (The radii are chosen so
// that no node lies exactly on the level: such a node would add a segment
// of zero length.)
func TestMarchingSquaresCircle(t *testing.T) {
	const n = 61
	const c = 30.0 // node (i, j) at x = i - c, y = j - c
	f := make([]float64, n*n)
	for j := range n {
		for i := range n {
			x, y := float64(i)-c, float64(j)-c
			f[j*n+i] = x*x + y*y
		}
	}
	for _, radius := range []float64{2.3, 10.05, 17.71, 29.5} {
		segs := contourSegments(f, n, n, radius*radius)
		if len(segs) < int(4*radius) {
			t.Fatalf("R = %g: only %d segments", radius, len(segs))
		}
		bound := radius - math.Sqrt(radius*radius-0.25)
		worst := 0.0
		ends := map[[2]int64]int{}
		for _, s := range segs {
			for _, q := range s {
				d := radius - math.Hypot(q.X-c, q.Y-c)
				if d < -1e-12 || d > bound+1e-12 {
					t.Fatalf("R = %g: point (%g, %g) is %g inside the circle, bound [0, %g]", radius, q.X-c, q.Y-c, d, bound)
				}
				worst = max(worst, d)
				ends[[2]int64{int64(math.Round(q.X * 1e9)), int64(math.Round(q.Y * 1e9))}]++
			}
		}
		for e, k := range ends {
			if k != 2 {
				t.Fatalf("R = %g: end point %v is shared by %d segment ends, want 2 (a closed curve)", radius, e, k)
			}
		}
		t.Logf("R = %5.2f: %3d segments, largest distance %.5f cell (bound %.5f)", radius, len(segs), worst, bound)
	}
}

// TestMarchingSquaresStreamfunction: on psi = r^2 z (the lattice's
// coordinates, node (i, j) at z = i + 1, r = j + 1/2) the crossings on
// z-edges are exact (psi is linear in z there) and those on r-edges lie
// below the level by at most z h^2/4 (the parabola bound), which is a
// distance of at most 1/(8 r) cell since |grad psi| >= 2 r z.
func TestMarchingSquaresStreamfunction(t *testing.T) {
	const nz, nr = 40, 20
	f := make([]float64, nz*nr)
	for j := range nr {
		for i := range nz {
			z, r := float64(i)+1, float64(j)+0.5
			f[j*nz+i] = r * r * z
		}
	}
	for _, level := range []float64{3.3, 51.7, 401.3, 2500.9, 8999.7} {
		segs := contourSegments(f, nz, nr, level)
		if len(segs) == 0 {
			t.Fatalf("level %g: no segments", level)
		}
		worst := 0.0
		for _, s := range segs {
			for _, q := range s {
				z, r := q.X+1, q.Y+0.5
				v := r * r * z
				onZEdge := q.Y == math.Trunc(q.Y)
				switch {
				case onZEdge && math.Abs(v-level) > 1e-12*level:
					t.Fatalf("level %g: point on a z-edge (z %g, r %g) has psi %g", level, z, r, v)
				case !onZEdge && (v > level*(1+1e-12) || level-v > z/4*(1+1e-12)):
					t.Fatalf("level %g: point on an r-edge (z %g, r %g) has psi %g, want within [level - z/4, level]", level, z, r, v)
				}
				dist := math.Abs(v-level) / math.Hypot(r*r, 2*r*z)
				if dist > 1/(8*r)*(1+1e-9) {
					t.Fatalf("level %g: point (z %g, r %g) is %g cell off, above 1/(8r)", level, z, r, dist)
				}
				worst = max(worst, dist)
			}
		}
		t.Logf("level %5g: %3d segments, largest distance %.4f cell", level, len(segs), worst)
	}
}

// TestMarchingSquaresSaddle: a cell with the corners (0, 0) and (1, 1) at
// +1 and +2 and the others at -1 has mean 0.25, above the level 0, so the
// two high corners connect through the centre and the low corners are cut
// off: one segment near (1, 0) and one near (0, 1).
func TestMarchingSquaresSaddle(t *testing.T) {
	f := []float64{1, -1, -1, 2} // (0,0), (1,0), (0,1), (1,1)
	segs := contourSegments(f, 2, 2, 0)
	if len(segs) != 2 {
		t.Fatalf("%d segments, want 2", len(segs))
	}
	want := []segment{{{0.5, 0}, {1, 1.0 / 3}}, {{1.0 / 3, 1}, {0, 0.5}}}
	for i, s := range segs {
		for e := range 2 {
			if math.Abs(s[e].X-want[i][e].X) > 1e-15 || math.Abs(s[e].Y-want[i][e].Y) > 1e-15 {
				t.Errorf("segment %d is %v, want %v", i, s, want[i])
			}
		}
	}
}

// TestFieldPictureRejects: a bad picture is refused with the reason, and
// nothing is written.
func TestFieldPictureRejects(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.png")
	for _, p := range []FieldPicture{
		{Nz: 4, Nr: 2, Field: make([]float64, 7)},
		{Nz: 4, Nr: 2, Field: make([]float64, 8), Psi: make([]float64, 3)},
		{Nz: 4, Nr: 2, Field: make([]float64, 8), Range: -1},
		{Nz: 4, Nr: 2, Field: make([]float64, 8), Spheres: []Circle{{Z: 1, Radius: 0}}},
		{Nz: 0, Nr: 2},
	} {
		if err := WriteFieldPNG(path, p); err == nil {
			t.Errorf("%+v accepted", p)
		}
	}
	if _, err := os.Stat(path); !os.IsNotExist(err) {
		t.Errorf("a refused picture left a file: %v", err)
	}
}
