package output

import (
	"image/color"
	"math"
	"testing"
)

// TestLabKnownColours checks the sRGB to CIELAB conversion against the
// values of the sRGB primaries and white under D65 (from memory of B.
// Lindbloom's colour calculator, to two decimals, hence the tolerance of
// 0.01 plus the rounding) and that every colour of a 17^3 grid converts
// back to itself.
func TestLabKnownColours(t *testing.T) {
	for _, c := range []struct {
		rgb     color.RGBA
		l, a, b float64
	}{
		{color.RGBA{255, 255, 255, 255}, 100, 0, 0},
		{color.RGBA{255, 0, 0, 255}, 53.24, 80.09, 67.20},
		{color.RGBA{0, 255, 0, 255}, 87.73, -86.18, 83.18},
		{color.RGBA{0, 0, 255, 255}, 32.30, 79.19, -107.86},
	} {
		got := rgbToLab(c.rgb)
		if math.Abs(got.l-c.l) > 0.015 || math.Abs(got.a-c.a) > 0.015 || math.Abs(got.b-c.b) > 0.015 {
			t.Errorf("Lab of %v = (%.3f, %.3f, %.3f), want (%.2f, %.2f, %.2f)", c.rgb, got.l, got.a, got.b, c.l, c.a, c.b)
		}
	}
	for r := 0; r <= 255; r += 255 / 15 {
		for g := 0; g <= 255; g += 255 / 15 {
			for b := 0; b <= 255; b += 255 / 15 {
				c := color.RGBA{uint8(r), uint8(g), uint8(b), 255}
				if back := labToRGB(rgbToLab(c)); back != c {
					t.Fatalf("%v -> Lab -> %v", c, back)
				}
				if back := mshToRGB(rgbToMsh(c)); back != c {
					t.Fatalf("%v -> Msh -> %v", c, back)
				}
			}
		}
	}
}

// TestCoolWarmEnds: the map runs between Moreland's published end points
// and passes through his white midpoint RGB (221, 221, 221), which is
// neutral (a* = b* = 0) with M = L* = 88.
func TestCoolWarmEnds(t *testing.T) {
	m := CoolWarm()
	for _, c := range []struct {
		t    float64
		want color.RGBA
	}{
		{0, color.RGBA{59, 76, 192, 255}},
		{0.5, color.RGBA{221, 221, 221, 255}},
		{1, color.RGBA{180, 4, 38, 255}},
	} {
		if got := m.At(c.t); got != c.want {
			t.Errorf("At(%g) = %v, want %v", c.t, got, c.want)
		}
	}
	mid := mshToLab(m.interpolate(0.5))
	if math.Abs(mid.l-88) > 1e-9 || math.Hypot(mid.a, mid.b) > 1e-9 {
		t.Errorf("midpoint L*a*b* = (%g, %g, %g), want (88, 0, 0)", mid.l, mid.a, mid.b)
	}
}

// TestCoolWarmTable compares with three rows of the table of 33 samples of
// the cool-to-warm map in Moreland 2009 (values from memory, so a
// tolerance of one 8-bit level, which also covers rounding and the
// conversion constants).
func TestCoolWarmTable(t *testing.T) {
	m := CoolWarm()
	for _, c := range []struct {
		t       float64
		r, g, b int
	}{
		{1.0 / 32, 68, 90, 204},
		{2.0 / 32, 77, 104, 215},
		{4.0 / 32, 98, 130, 234},
	} {
		got := m.At(c.t)
		if absInt(int(got.R)-c.r) > 1 || absInt(int(got.G)-c.g) > 1 || absInt(int(got.B)-c.b) > 1 {
			t.Errorf("At(%g) = %v, want (%d, %d, %d) within one level", c.t, got, c.r, c.g, c.b)
		}
	}
}

func absInt(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// TestCoolWarmSymmetric: At(t) is cool (blue above red) and At(1-t) warm
// for t < 1/2, and the two are equally light. The end points' L* differ by
// 0.055 and both have the same saturation angle s, so along the halves the
// difference can only shrink; the tolerance is 0.06.
func TestCoolWarmSymmetric(t *testing.T) {
	m := CoolWarm()
	for i := 0; i < 500; i++ {
		x := float64(i) / 1000
		cool, warm := m.At(x), m.At(1-x)
		if i < 495 && !(cool.B > cool.R && warm.R > warm.B) {
			t.Fatalf("At(%g) = %v should be cool and At(%g) = %v warm", x, cool, 1-x, warm)
		}
		lc, lw := mshToLab(m.interpolate(x)).l, mshToLab(m.interpolate(1-x)).l
		if math.Abs(lc-lw) > 0.06 {
			t.Fatalf("L*(%g) = %.4f, L*(%g) = %.4f: differ by more than 0.06", x, lc, 1-x, lw)
		}
	}
}

// TestCoolWarmLightness: the property the map is designed for, L* rising
// strictly from each end to the middle, checked on 2001 samples of the
// unrounded colours.
func TestCoolWarmLightness(t *testing.T) {
	m := CoolWarm()
	const n = 2000
	prev := math.Inf(-1)
	for i := 0; i <= n/2; i++ {
		l := mshToLab(m.interpolate(float64(i) / n)).l
		if !(l > prev) {
			t.Fatalf("L* at t = %g is %.6f, not above %.6f", float64(i)/n, l, prev)
		}
		prev = l
	}
	for i := n/2 + 1; i <= n; i++ {
		l := mshToLab(m.interpolate(float64(i) / n)).l
		if !(l < prev) {
			t.Fatalf("L* at t = %g is %.6f, not below %.6f", float64(i)/n, l, prev)
		}
		prev = l
	}
}

// TestBlueYellowInGamut: the sequential map's L* rises linearly from 13.8
// to 90.9 and every sample lies inside the sRGB gamut (linear components
// within [0, 1] before any clamping, to 1e-9 for the round-off of the end
// colours, which are sRGB colours themselves).
func TestBlueYellowInGamut(t *testing.T) {
	m := BlueYellow()
	const n = 1000
	for i := 0; i <= n; i++ {
		x := float64(i) / n
		c := lab{(1-x)*m.lo.l + x*m.hi.l, (1-x)*m.lo.a + x*m.hi.a, (1-x)*m.lo.b + x*m.hi.b}
		r, g, b := labToLinear(c)
		for _, v := range []float64{r, g, b} {
			if v < -1e-9 || v > 1+1e-9 {
				t.Fatalf("t = %g: linear RGB (%g, %g, %g) is outside the gamut", x, r, g, b)
			}
		}
		got := rgbToLab(m.At(x)).l
		if want := 13.79 + x*(90.86-13.79); math.Abs(got-want) > 0.5 {
			t.Fatalf("t = %g: L* = %.2f, want %.2f within the 0.5 that 8-bit rounding can move it", x, got, want)
		}
	}
}

// TestColorTable: the sampled table has the map's ends and neighbouring
// entries differ by at most one 8-bit level, so looking colours up in it
// instead of evaluating the map changes them by at most one level.
func TestColorTable(t *testing.T) {
	for _, m := range []ColorMap{CoolWarm(), BlueYellow()} {
		tab := newColorTable(m, tableSize)
		if tab.at(0) != m.At(0) || tab.at(1) != m.At(1) || tab.at(-3) != m.At(0) || tab.at(math.NaN()) != m.At(0) {
			t.Errorf("%T: table ends differ from the map's", m)
		}
		for i := 1; i < len(tab); i++ {
			a, b := tab[i-1], tab[i]
			if absInt(int(a.R)-int(b.R)) > 1 || absInt(int(a.G)-int(b.G)) > 1 || absInt(int(a.B)-int(b.B)) > 1 {
				t.Fatalf("%T: entries %d and %d differ by more than one level: %v, %v", m, i-1, i, a, b)
			}
		}
	}
}
