package plot

import (
	"image/color"
	"math"
	"testing"
)

// srgbToLab inverts labToSRGB for the checks below.
func srgbToLab(c color.NRGBA) (l, a, b float64) {
	dec := func(v uint8) float64 {
		x := float64(v) / 255
		if x <= 0.04045 {
			return x / 12.92
		}
		return math.Pow((x+0.055)/1.055, 2.4)
	}
	r, g, bl := dec(c.R), dec(c.G), dec(c.B)
	x := 0.4124564*r + 0.3575761*g + 0.1804375*bl
	y := 0.2126729*r + 0.7151522*g + 0.0721750*bl
	z := 0.0193339*r + 0.1191920*g + 0.9503041*bl
	f := func(t float64) float64 {
		const d = 6.0 / 29
		if t > d*d*d {
			return math.Cbrt(t)
		}
		return t/(3*d*d) + 4.0/29
	}
	fx, fy, fz := f(x/0.95047), f(y), f(z/1.08883)
	return 116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)
}

func TestLabToSRGB(t *testing.T) {
	for _, c := range []struct {
		reason  string
		l, a, b float64
		want    [3]float64
	}{
		// source: IEC 61966-2-1 white point D65 maps to L* = 100.
		{"white", 100, 0, 0, [3]float64{1, 1, 1}},
		{"black", 0, 0, 0, [3]float64{0, 0, 0}},
		// from memory: sRGB red is L*a*b* (53.24, 80.09, 67.20) under D65.
		{"red primary", 53.2408, 80.0925, 67.2032, [3]float64{1, 0, 0}},
		// from memory: sRGB blue is L*a*b* (32.30, 79.19, −107.86).
		{"blue primary", 32.2970, 79.1875, -107.8602, [3]float64{0, 0, 1}},
	} {
		r, g, b := labToSRGB(c.l, c.a, c.b)
		got := [3]float64{r, g, b}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 2e-3 {
				t.Errorf("%s: got %.4f, want %.4f", c.reason, got, c.want)
				break
			}
		}
	}
}

// TestScaleUniform checks that the colour scale is perceptually ordered
// and uniform: lightness rises strictly, and equal steps along the scale
// are equal colour differences ΔE*ab within 8 % (the rest is the 8-bit
// rounding of the colours).
func TestScaleUniform(t *testing.T) {
	scaleColor(0)
	prev := -1.0
	for k := range scaleSize {
		l := scaleLight[k]
		if !(l > prev) {
			t.Fatalf("lightness falls at entry %d: %.3f after %.3f", k, l, prev)
		}
		prev = l
		// The stored colour has the stored lightness (in gamut, not clipped).
		gl, _, _ := srgbToLab(scaleTable[k])
		if math.Abs(gl-l) > 0.6 {
			t.Errorf("entry %d: stored colour has L* = %.2f, path says %.2f (clipped out of gamut?)", k, gl, l)
		}
	}
	if l0, l1 := scaleLight[0], scaleLight[scaleSize-1]; math.Abs(l0-16) > 0.01 || math.Abs(l1-93) > 0.01 {
		t.Errorf("lightness runs %.2f to %.2f, want 16 to 93", l0, l1)
	}
	const block = 15
	var steps []float64
	for k := 0; k+block < scaleSize; k += block {
		l0, a0, b0 := srgbToLab(scaleTable[k])
		l1, a1, b1 := srgbToLab(scaleTable[k+block])
		steps = append(steps, math.Sqrt((l1-l0)*(l1-l0)+(a1-a0)*(a1-a0)+(b1-b0)*(b1-b0)))
	}
	var mean float64
	for _, s := range steps {
		mean += s
	}
	mean /= float64(len(steps))
	for i, s := range steps {
		if math.Abs(s/mean-1) > 0.08 {
			t.Errorf("block %d: ΔE %.2f, mean %.2f: not uniform", i, s, mean)
		}
	}
}

func TestScaleClamps(t *testing.T) {
	if scaleColor(-1) != scaleColor(0) || scaleColor(2) != scaleColor(1) || scaleColor(math.NaN()) != scaleColor(0) {
		t.Error("values outside [0, 1] must take the end colours")
	}
}
