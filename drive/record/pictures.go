package record

import (
	"fmt"
	"math"
	"os"
	"path/filepath"

	"axiswim/cases"
	"axiswim/drive"
	"axiswim/lbm"
	"axiswim/output"
)

// History keeps the few numbers per sample that the charts need (a
// checkpoint keeps it too).
type History struct {
	T, Drive, Centroid, Ext []float64
}

// Add records one sample: time, drive displacement, centroid and the
// first spring's extension.
func (h *History) Add(t, drive, centroid, ext float64) {
	h.T = append(h.T, t)
	h.Drive = append(h.Drive, drive)
	h.Centroid = append(h.Centroid, centroid)
	h.Ext = append(h.Ext, ext)
}

// picturesDir makes DIR/pictures.
func picturesDir(dir string) (string, error) {
	d := filepath.Join(dir, "pictures")
	if err := os.MkdirAll(d, 0o755); err != nil {
		return "", fmt.Errorf("pictures: %w", err)
	}
	return d, nil
}

// spheresNow returns the sphere outlines in the cells of the simulation's
// View.
func spheresNow(s *drive.Simulation) []output.Circle {
	var c []output.Circle
	v := float64(s.ViewCells())
	for k := range s.Spheres() {
		z, a := s.SphereCells(k)
		c = append(c, output.Circle{Z: z / v, Radius: a / v})
	}
	return c
}

// levelBoxes returns the outlines of the refined levels in the cells of
// the simulation's View (drive.Simulation.LevelOutlines).
func levelBoxes(s *drive.Simulation) []output.Box {
	var out []output.Box
	for _, b := range s.LevelOutlines() {
		out = append(out, output.Box{Z0: b.Z0, Z1: b.Z1, R: b.R})
	}
	return out
}

// vorticityPicture returns the picture of a field's vorticity (1/s) with
// its streamlines, NaN where mask is set. body, when not nil, gives the
// axial velocity of the masked nodes (the bodies'), so that the
// streamfunction integrates across them.
func vorticityPicture(s *drive.Simulation, f *lbm.Fields, mask []bool, body []float64, title string) output.FieldPicture {
	return picture(s.View(), s.FrameOnLiquid, f, mask, body, spheresNow(s), levelBoxes(s), title)
}

// finePicture is the picture of a mean field on the fine window w
// (drive.Window, finest spacing): the spheres and the refined levels'
// outlines in w's cells, clipped to it.
func finePicture(s *drive.Simulation, w drive.Window, f *lbm.Fields, mask []bool, title string) output.FieldPicture {
	var circles []output.Circle
	for _, sp := range s.WindowSpheres(w) {
		circles = append(circles, output.Circle{Z: sp.Z, Radius: sp.Radius})
	}
	v := float64(s.ViewCells()) // finest cells per View cell
	clip := func(x, hi float64) float64 { return math.Max(0, math.Min(hi, x)) }
	var boxes []output.Box
	for _, b := range s.LevelOutlines() {
		z0, z1 := clip(b.Z0*v-float64(w.Z0), float64(w.Nz)), clip(b.Z1*v-float64(w.Z0), float64(w.Nz))
		if z1 > z0 {
			boxes = append(boxes, output.Box{Z0: z0, Z1: z1, R: clip(b.R*v, float64(w.Nr))})
		}
	}
	return picture(s.Lattice, s.FrameOnLiquid, f, mask, nil, circles, boxes, title)
}

// picture is the vorticity picture of a field on lattice l's nodes (for
// the units), the spheres and boxes in its cells.
func picture(l *cases.Lattice, frameOnLiquid bool, f *lbm.Fields, mask []bool, body []float64, spheres []output.Circle, boxes []output.Box, title string) output.FieldPicture {
	n := f.Nz * f.Nr
	clean := &lbm.Fields{Nz: f.Nz, Nr: f.Nr, Uz: make([]float64, n), Ur: make([]float64, n), Rho: make([]float64, n)}
	copy(clean.Uz, f.Uz)
	copy(clean.Ur, f.Ur)
	for i := range body {
		if mask[i] {
			clean.Uz[i], clean.Ur[i] = body[i], 0
		}
	}
	om := lbm.Vorticity(clean, frameOnLiquid)
	psi := lbm.Streamfunction(clean)
	for i := range om {
		om[i] = l.RateSI(om[i])
		psi[i] = l.StreamfunctionSI(psi[i])
		if mask[i] {
			om[i] = math.NaN()
		}
	}
	return output.FieldPicture{Nz: f.Nz, Nr: f.Nr, Field: om, Odd: true, Diverging: true,
		Psi: psi, Spheres: spheres, Boxes: boxes, Title: title, Label: "vorticity (1/s)"}
}

// WriteCharts draws the swimmer's charts into dir/pictures: the centroid
// against time with the stroboscopic points, the running mean speed
// against period, the spring extension against the drive over the last
// periods, and with several swimmers the gaps between them.
func WriteCharts(dir string, sim *drive.Simulation, h *History, tr *Periods) error {
	d, err := picturesDir(dir)
	if err != nil {
		return err
	}
	T := tr.Period()
	mm := func(x []float64) []float64 {
		y := make([]float64, len(x))
		for i, v := range x {
			y[i] = v * 1e3
		}
		return y
	}
	var st, sc []float64
	for p, c := range tr.centroids {
		st = append(st, float64(p)*T)
		sc = append(sc, c*1e3)
	}
	if err := output.WriteChartPNG(filepath.Join(d, "centroid.png"), "centroid of the spheres (container frame)",
		"time (s)", "centroid (mm)", []output.Line{
			{Label: "centroid", X: h.T, Y: mm(h.Centroid)},
			{Label: "once per period (stroboscopic)", X: st, Y: sc, Points: true},
		}); err != nil {
		return err
	}
	var pp, run, per []float64
	skip := sim.SkipPeriods()
	for p := 3; p < len(tr.centroids); p++ {
		sp := SwimmingSpeed(tr.centroids[:p+1], T, skip)
		pp = append(pp, float64(p))
		run = append(run, sp.Mean*1e6)
		per = append(per, (tr.centroids[p]-tr.centroids[p-1])/T*1e6)
	}
	if len(pp) > 0 {
		if err := output.WriteChartPNG(filepath.Join(d, "speed.png"), "mean swimming speed as the run goes on",
			"period", "speed (um/s)", []output.Line{
				{Label: "estimate from the periods so far", X: pp, Y: run},
				{Label: "displacement of each period / T", X: pp, Y: per, Points: true},
			}); err != nil {
			return err
		}
	}
	if sim.Springs() > 0 && len(h.T) > 0 {
		from := 0
		for from < len(h.T) && h.T[from] < h.T[len(h.T)-1]-3*T {
			from++
		}
		if err := output.WriteChartPNG(filepath.Join(d, "spring.png"), "spring 1 extension and the drive, last periods",
			"time (s)", "displacement (mm)", []output.Line{
				{Label: "drive displacement X(t)", X: h.T[from:], Y: mm(h.Drive[from:])},
				{Label: "spring 1 extension", X: h.T[from:], Y: mm(h.Ext[from:])},
			}); err != nil {
			return err
		}
	}
	if len(tr.gaps) > 0 {
		var lines []output.Line
		for g, gs := range tr.gaps {
			l := output.Line{Label: fmt.Sprintf("swimmers %d and %d", g+1, g+2), Points: true}
			for p, v := range gs {
				l.X, l.Y = append(l.X, float64(p)*T), append(l.Y, v*1e3)
			}
			lines = append(lines, l)
		}
		if err := output.WriteChartPNG(filepath.Join(d, "gaps.png"), "surface gaps between neighbouring swimmers, once per period",
			"time (s)", "gap (mm)", lines); err != nil {
			return err
		}
	}
	return nil
}
