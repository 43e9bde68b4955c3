package output

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// Line is one curve of a chart: Y against X, labelled in the legend (no
// entry when Label is empty), with a marker at each point when Points is
// set.
type Line struct {
	Label  string
	X, Y   []float64
	Points bool
	NoLine bool // markers only (measured points, say)
	// YErr, when given, draws error bars of +- YErr[k] at each point.
	YErr []float64
}

// ChartOptions are the less common choices of a chart.
type ChartOptions struct {
	LogX bool // logarithmic x axis (every x must be positive)
	LogY bool // logarithmic y axis (every y must be positive)
	// LegendLeft puts the legend top left (for curves that rise to the
	// right), not top right.
	LegendLeft bool
	// LegendBottom puts it at the bottom (above a model's line drawn
	// along the top, say).
	LegendBottom bool
}

// WriteChartPNGWith is WriteChartPNG with options.
func WriteChartPNGWith(path, title, xlabel, ylabel string, lines []Line, o ChartOptions) error {
	p, err := chart(title, xlabel, ylabel, lines, o.LogY)
	if err != nil {
		return fmt.Errorf("chart %s: %w", path, err)
	}
	p.Legend.Left = o.LegendLeft
	p.Legend.Top = !o.LegendBottom
	if o.LogX {
		if err := logAxis(&p.X, "x", lines, func(l Line) []float64 { return l.X }); err != nil {
			return fmt.Errorf("chart %s: %w", path, err)
		}
	}
	if o.LogY {
		if err := logAxis(&p.Y, "y", lines, func(l Line) []float64 { return l.Y }); err != nil {
			return fmt.Errorf("chart %s: %w", path, err)
		}
	}
	return writeChart(path, p)
}

// plainTicks are gonum's default ticks labelled with the shortest form of
// their value to six digits: the default labels keep only the digits of
// the tick spacing's magnitude, so ticks 0.05 apart near 2.5 read "2.5"
// twice.
type plainTicks struct{}

func (plainTicks) Ticks(lo, hi float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(lo, hi)
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = strconv.FormatFloat(ts[i].Value, 'g', 6, 64)
		}
	}
	return ts
}

// logAxis makes ax logarithmic, with ticks at the decades when the values
// (of every line) span one or more; every value must be positive.
func logAxis(ax *plot.Axis, name string, lines []Line, values func(Line) []float64) error {
	lo, hi := math.Inf(1), 0.0
	for _, l := range lines {
		for _, v := range values(l) {
			if !(v > 0) {
				return fmt.Errorf("%s = %g on a logarithmic axis", name, v)
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	ax.Scale = plot.LogScale{}
	if hi >= 10*lo { // within one decade, the default ticks
		ax.Tick.Marker = plot.LogTicks{Prec: 1}
	}
	return nil
}

// errPoints are the points and error bars of a Line.
type errPoints struct {
	plotter.XYs
	plotter.YErrors
}

// The size of a chart: 16 x 10 cm at 100 dots per inch, 630 x 394 pixels.
const (
	ChartWidth  = 16 * vg.Centimeter
	ChartHeight = 10 * vg.Centimeter
	ChartDPI    = 100
)

// WriteChartPNG writes a line chart of lines to path as a PNG, with a
// title, axis labels (give the units in them: "time (s)") and a legend.
// Each line gets its own colour (and marker shape). The file is written
// atomically.
func WriteChartPNG(path, title, xlabel, ylabel string, lines []Line) error {
	return WriteChartPNGWith(path, title, xlabel, ylabel, lines, ChartOptions{})
}

func writeChart(path string, p *plot.Plot) error {
	c := vgimg.NewWith(vgimg.UseWH(ChartWidth, ChartHeight), vgimg.UseDPI(ChartDPI))
	p.Draw(draw.New(c))
	var buf bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(&buf); err != nil {
		return fmt.Errorf("chart %s: %w", path, err)
	}
	return WriteFileAtomic(path, buf.Bytes())
}

func chart(title, xlabel, ylabel string, lines []Line, logY bool) (*plot.Plot, error) {
	if len(lines) == 0 {
		return nil, errors.New("no lines to draw")
	}
	p := plot.New()
	p.X.Tick.Marker, p.Y.Tick.Marker = plainTicks{}, plainTicks{}
	p.Title.Text = title
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	p.Add(plotter.NewGrid())
	p.Legend.Top = true
	for i, l := range lines {
		name := l.Label
		if name == "" {
			name = fmt.Sprintf("line %d", i+1)
		}
		if len(l.X) != len(l.Y) {
			return nil, fmt.Errorf("%s has %d x values and %d y values", name, len(l.X), len(l.Y))
		}
		if len(l.X) == 0 {
			return nil, fmt.Errorf("%s has no points", name)
		}
		xy := make(plotter.XYs, len(l.X))
		for k := range xy {
			x, y := l.X[k], l.Y[k]
			if math.IsNaN(x) || math.IsInf(x, 0) || math.IsNaN(y) || math.IsInf(y, 0) {
				return nil, fmt.Errorf("%s: point %d (%g, %g) is not finite", name, k+1, x, y)
			}
			xy[k] = plotter.XY{X: x, Y: y}
		}
		line, err := plotter.NewLine(xy)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		line.Color = plotutil.Color(i)
		line.Width = vg.Points(1.5)
		var thumbs []plot.Thumbnailer
		if !l.NoLine {
			p.Add(line)
			thumbs = append(thumbs, line)
		}
		if l.Points || l.NoLine {
			marks, err := plotter.NewScatter(xy)
			if err != nil {
				return nil, fmt.Errorf("%s: %w", name, err)
			}
			marks.Color = line.Color
			marks.Shape = plotutil.Shape(i)
			marks.Radius = vg.Points(2.5)
			p.Add(marks)
			thumbs = append(thumbs, marks)
		}
		if l.YErr != nil {
			if len(l.YErr) != len(xy) {
				return nil, fmt.Errorf("%s has %d points and %d error bars", name, len(xy), len(l.YErr))
			}
			errs := make(plotter.YErrors, len(xy))
			for k, e := range l.YErr {
				if math.IsNaN(e) || math.IsInf(e, 0) || e < 0 {
					return nil, fmt.Errorf("%s: error bar %d (%g) is not a finite size", name, k+1, e)
				}
				errs[k].Low, errs[k].High = e, e
				if logY { // a bar reaching zero stops short of it on a log axis
					errs[k].Low = math.Min(e, 0.999*xy[k].Y)
				}
			}
			bars, err := plotter.NewYErrorBars(errPoints{xy, errs})
			if err != nil {
				return nil, fmt.Errorf("%s: %w", name, err)
			}
			bars.Color = line.Color
			p.Add(bars)
		}
		if l.Label != "" {
			p.Legend.Add(l.Label, thumbs...)
		}
	}
	if !logY {
		// A margin of 5% of the span above and below, so that a line at
		// the largest or smallest value (a model's constant, say) is not
		// drawn on the frame.
		if span := p.Y.Max - p.Y.Min; span > 0 {
			p.Y.Min -= 0.05 * span
			p.Y.Max += 0.05 * span
		}
	}
	return p, nil
}
