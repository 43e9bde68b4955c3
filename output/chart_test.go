package output

import (
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/plot/plotutil"
)

// TestWriteChartPNG: the chart decodes, is 16 x 10 cm at 100 dpi
// (630 x 394 pixels), is not blank, and shows the first line's colour
// along its length: the line crosses most of the plot's width, some 500
// pixels, at 2 pixels wide (1.5 points at 100 dpi), so at least 300 pixels
// of exactly that colour is a low bar that a missing line cannot pass.
func TestWriteChartPNG(t *testing.T) {
	dir := outDir(t)
	var x, a, b []float64
	for i := range 41 {
		tm := float64(i) * 0.025
		x = append(x, tm)
		a = append(a, 1e-4*math.Sin(2*math.Pi*tm))
		b = append(b, 0.6e-4*math.Sin(2*math.Pi*tm-0.7))
	}
	path := filepath.Join(dir, "chart.png")
	err := WriteChartPNG(path, "test: two sine waves", "time (s)", "displacement (m)", []Line{
		{Label: "sphere 1", X: x, Y: a},
		{Label: "sphere 2", X: x, Y: b, Points: true},
	})
	if err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, path)
	if w, h := img.Bounds().Dx(), img.Bounds().Dy(); w != 630 || h != 394 {
		t.Errorf("chart is %d x %d pixels, want 630 x 394", w, h)
	}
	notBlank(t, img)
	first := color.RGBAModel.Convert(plotutil.Color(0)).(color.RGBA)
	n := 0
	for y := range img.Bounds().Dy() {
		for x := range img.Bounds().Dx() {
			if rgbaAt(img, x, y) == first {
				n++
			}
		}
	}
	if n < 300 {
		t.Errorf("%d pixels of the first line's colour %v, want at least 300", n, first)
	}
}

// TestWriteChartPNGRejects: lines that cannot be drawn are refused with
// the reason and nothing is written.
func TestWriteChartPNGRejects(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.png")
	for _, lines := range [][]Line{
		nil,
		{{Label: "short", X: []float64{1, 2}, Y: []float64{1}}},
		{{Label: "empty"}},
		{{Label: "nan", X: []float64{1, 2}, Y: []float64{1, math.NaN()}}},
	} {
		if err := WriteChartPNG(path, "t", "x", "y", lines); err == nil {
			t.Errorf("%v accepted", lines)
		}
	}
	if _, err := os.Stat(path); !os.IsNotExist(err) {
		t.Errorf("a refused chart left a file: %v", err)
	}
}

func ExampleWriteChartPNG() {
	dir, err := os.MkdirTemp("", "chart")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	periods := []float64{1, 2, 3, 4, 5, 6}
	centroid := []float64{0, 2.1e-6, 5.0e-6, 7.4e-6, 9.9e-6, 12.3e-6}
	err = WriteChartPNG(filepath.Join(dir, "centroid.png"),
		"stroboscopic centroid", "period", "centroid (m)",
		[]Line{{Label: "centroid", X: periods, Y: centroid, Points: true}})
	fmt.Println(err)
	// Output: <nil>
}
