package output

import (
	"image/color"
	"math"
)

// ColorMap maps t in [0, 1] to a colour; t outside is clamped.
type ColorMap interface {
	At(t float64) color.RGBA
}

// Diverging is a diverging colour map built by Moreland's interpolation in
// Msh space between two saturated end colours, with an unsaturated midpoint
// between them (K. Moreland, "Diverging Color Maps for Scientific
// Visualization", Advances in Visual Computing, ISVC 2009, LNCS 5876,
// pp. 92-103). Msh is CIELAB in spherical coordinates: M the distance from
// the origin, s the angle from the L* axis (saturation), h the hue angle.
// Along each half the lightness L* = M cos s rises monotonically from the end
// to the neutral middle, so the order of the values reads the same way on
// both sides, and equally light end colours make the map symmetric.
type Diverging struct {
	lo, hi msh
}

// NewDiverging returns the diverging map from lo (t = 0) to hi (t = 1).
func NewDiverging(lo, hi color.RGBA) Diverging {
	return Diverging{lo: rgbToMsh(lo), hi: rgbToMsh(hi)}
}

// CoolWarm is Moreland's cool-to-warm map: the published end points
// RGB (59, 76, 192) and (180, 4, 38), which have nearly equal L*, and a
// white midpoint of M = 88, RGB (221, 221, 221), as in the paper.
// It is meant for signed fields such as vorticity, scaled symmetrically
// about zero so that zero falls on the neutral midpoint.
func CoolWarm() Diverging {
	return NewDiverging(color.RGBA{59, 76, 192, 255}, color.RGBA{180, 4, 38, 255})
}

// At returns the colour at t by the paper's InterpolateColor.
// When both ends are saturated (s > 0.05) and their hues differ by more
// than pi/3, an unsaturated midpoint of M = max(M1, M2, 88) is put at
// t = 1/2 and each half is interpolated separately; the hue of an
// unsaturated end is adjusted (AdjustHue) so that the hue spins towards the
// saturated end instead of jumping.
func (d Diverging) At(t float64) color.RGBA {
	return mshToRGB(d.interpolate(clamp01(t)))
}

func (d Diverging) interpolate(t float64) msh {
	c1, c2 := d.lo, d.hi
	const unsaturated = 0.05
	if c1.s > unsaturated && c2.s > unsaturated && hueDifference(c1.h, c2.h) > math.Pi/3 {
		mid := math.Max(math.Max(c1.m, c2.m), 88)
		if t < 0.5 {
			c2 = msh{m: mid}
			t = 2 * t
		} else {
			c1 = msh{m: mid}
			t = 2*t - 1
		}
	}
	switch {
	case c1.s < unsaturated && c2.s > unsaturated:
		c1.h = adjustHue(c2, c1.m)
	case c2.s < unsaturated && c1.s > unsaturated:
		c2.h = adjustHue(c1, c2.m)
	}
	return msh{
		m: (1-t)*c1.m + t*c2.m,
		s: (1-t)*c1.s + t*c2.s,
		h: (1-t)*c1.h + t*c2.h,
	}
}

// adjustHue is Moreland's AdjustHue: the hue to give an unsaturated colour
// of magnitude m next to the saturated colour sat, so that the
// interpolation spins the hue rather than passing through an abrupt one.
func adjustHue(sat msh, m float64) float64 {
	if sat.m >= m {
		return sat.h
	}
	spin := sat.s * math.Sqrt(m*m-sat.m*sat.m) / (sat.m * math.Sin(sat.s))
	if sat.h > -math.Pi/3 {
		return sat.h + spin
	}
	return sat.h - spin
}

// hueDifference is the absolute difference of two hue angles, in [0, pi].
func hueDifference(a, b float64) float64 {
	d := math.Abs(a - b)
	if d > math.Pi {
		d = 2*math.Pi - d
	}
	return d
}

// Sequential is a sequential colour map for magnitudes: a straight line in
// CIELAB between a dark and a light end colour, so that the lightness L*,
// which carries the order of the values to the eye, rises linearly with t
// (the rule Moreland 2009 keeps on each half of a diverging map, and the
// design rule for sequential maps of P. Kovesi, "Good Colour Maps: How to
// Design Them", arXiv:1509.03700, 2015).
type Sequential struct {
	lo, hi lab
}

// NewSequential returns the sequential map from lo (t = 0) to hi (t = 1).
func NewSequential(lo, hi color.RGBA) Sequential {
	return Sequential{lo: rgbToLab(lo), hi: rgbToLab(hi)}
}

// BlueYellow is our sequential map from a dark blue, RGB (0, 34, 78),
// L* = 13.8, to a light yellow, RGB (253, 231, 37), L* = 90.9. Its straight
// line in CIELAB passes close to grey (a quarter of the way along) and
// through an olive middle, in the manner of the blue-grey-yellow cividis map
// of Nuñez, Anderton and Renslow (PLoS ONE 13(7), e0199239, 2018); it stays
// inside the sRGB gamut (TestBlueYellowInGamut).
func BlueYellow() Sequential {
	return NewSequential(color.RGBA{0, 34, 78, 255}, color.RGBA{253, 231, 37, 255})
}

// At returns the colour at t.
func (q Sequential) At(t float64) color.RGBA {
	t = clamp01(t)
	return labToRGB(lab{
		l: (1-t)*q.lo.l + t*q.hi.l,
		a: (1-t)*q.lo.a + t*q.hi.a,
		b: (1-t)*q.lo.b + t*q.hi.b,
	})
}

func clamp01(t float64) float64 {
	switch {
	case t > 1:
		return 1
	case t >= 0:
		return t
	}
	return 0 // t < 0 or NaN
}

// lab is a CIELAB colour (L* in [0, 100]) relative to the D65 white.
type lab struct{ l, a, b float64 }

// msh is a CIELAB colour in Moreland's spherical coordinates.
type msh struct{ m, s, h float64 }

// The sRGB primaries and D65 white (IEC 61966-2-1); the matrices are the
// ones of B. Lindbloom's tables (brucelindbloom.com) for sRGB/D65.
const (
	whiteX = 0.95047
	whiteY = 1.0
	whiteZ = 1.08883
)

// linear returns the linear-light value of an 8-bit sRGB component.
func linear(c uint8) float64 {
	v := float64(c) / 255
	if v <= 0.04045 {
		return v / 12.92
	}
	return math.Pow((v+0.055)/1.055, 2.4)
}

// encode returns the sRGB-encoded value in [0, 1] of a linear-light one,
// clamped to the gamut.
func encode(v float64) float64 {
	if v <= 0.0031308 {
		return math.Max(0, 12.92*v)
	}
	return math.Min(1, 1.055*math.Pow(v, 1/2.4)-0.055)
}

func rgbToLab(c color.RGBA) lab {
	r, g, b := linear(c.R), linear(c.G), linear(c.B)
	x := 0.4124564*r + 0.3575761*g + 0.1804375*b
	y := 0.2126729*r + 0.7151522*g + 0.0721750*b
	z := 0.0193339*r + 0.1191920*g + 0.9503041*b
	fx, fy, fz := labF(x/whiteX), labF(y/whiteY), labF(z/whiteZ)
	return lab{l: 116*fy - 16, a: 500 * (fx - fy), b: 200 * (fy - fz)}
}

// labToLinear returns the linear-light sRGB components of c, not clamped:
// components outside [0, 1] mean c is outside the gamut.
func labToLinear(c lab) (r, g, b float64) {
	fy := (c.l + 16) / 116
	fx := fy + c.a/500
	fz := fy - c.b/200
	x, y, z := whiteX*labFInv(fx), whiteY*labFInv(fy), whiteZ*labFInv(fz)
	r = 3.2404542*x - 1.5371385*y - 0.4985314*z
	g = -0.9692660*x + 1.8760108*y + 0.0415560*z
	b = 0.0556434*x - 0.2040259*y + 1.0572252*z
	return r, g, b
}

func labToRGB(c lab) color.RGBA {
	r, g, b := labToLinear(c)
	return color.RGBA{byte8(encode(r)), byte8(encode(g)), byte8(encode(b)), 255}
}

func byte8(v float64) uint8 { return uint8(math.Round(255 * v)) }

// labF and labFInv are the CIE 1976 companding function and its inverse.
const labEpsilon = 6.0 / 29

func labF(t float64) float64 {
	if t > labEpsilon*labEpsilon*labEpsilon {
		return math.Cbrt(t)
	}
	return t/(3*labEpsilon*labEpsilon) + 4.0/29
}

func labFInv(f float64) float64 {
	if f > labEpsilon {
		return f * f * f
	}
	return 3 * labEpsilon * labEpsilon * (f - 4.0/29)
}

func rgbToMsh(c color.RGBA) msh { return labToMsh(rgbToLab(c)) }

func labToMsh(c lab) msh {
	m := math.Sqrt(c.l*c.l + c.a*c.a + c.b*c.b)
	if m == 0 {
		return msh{}
	}
	return msh{m: m, s: math.Acos(c.l / m), h: math.Atan2(c.b, c.a)}
}

func mshToLab(c msh) lab {
	return lab{
		l: c.m * math.Cos(c.s),
		a: c.m * math.Sin(c.s) * math.Cos(c.h),
		b: c.m * math.Sin(c.s) * math.Sin(c.h),
	}
}

func mshToRGB(c msh) color.RGBA { return labToRGB(mshToLab(c)) }

// colorTable samples a map at n evenly spaced points so that a picture
// looks colours up by index instead of calling the map per pixel; with
// n = 4096 neighbouring entries of our maps differ by at most one 8-bit
// level (TestColorTable; at 1024 the red end of CoolWarm steps by two).
type colorTable []color.RGBA

func newColorTable(m ColorMap, n int) colorTable {
	t := make(colorTable, n)
	for i := range t {
		t[i] = m.At(float64(i) / float64(n-1))
	}
	return t
}

// at returns the entry nearest to t, clamped to [0, 1].
func (t colorTable) at(x float64) color.RGBA {
	return t[int(clamp01(x)*float64(len(t)-1)+0.5)]
}
