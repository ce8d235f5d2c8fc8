package plot

import (
	"image/color"
	"math"
	"sync"
)

// The colour scale of every map is a sequential scale built here rather
// than copied: a path through CIELAB (CIE 15:2004) from a dark blue-violet
// to a light yellow, passing through blue, teal and green. Along the path
//
//   - the lightness L* rises linearly from 16 to 93, so the scale reads
//     correctly in greyscale and for viewers with a colour-vision
//     deficiency (it avoids a red–green contrast);
//   - the hue angle falls piecewise linearly through 305°, 262°, 192°, 136°
//     and 100°;
//   - the chroma is 38 + 42·t, limited to 92 % of the largest chroma that
//     sRGB can show at that lightness and hue, then smoothed so that the
//     limit leaves no visible kink.
//
// The path is finally resampled at equal CIELAB distance ΔE*ab, so equal
// steps of the plotted value look like equal steps of colour: the scale is
// perceptually uniform in the CIE 1976 sense. Colours are converted to sRGB
// with the D65 white point and the matrices and transfer function of
// IEC 61966-2-1:1999.

// scaleSize is the number of entries of the sampled colour scale.
const scaleSize = 256

var (
	scaleOnce  sync.Once
	scaleTable [scaleSize]color.NRGBA
	scaleLight [scaleSize]float64 // L* of every entry
)

// scaleColor returns the colour of the sequential scale at t ∈ [0, 1];
// t outside is clamped and NaN gives the lowest colour.
func scaleColor(t float64) color.NRGBA {
	scaleOnce.Do(buildScale)
	return scaleTable[scaleIndex(t)]
}

// scaleLightness returns the CIELAB lightness L* of the scale at t.
func scaleLightness(t float64) float64 {
	scaleOnce.Do(buildScale)
	return scaleLight[scaleIndex(t)]
}

func scaleIndex(t float64) int {
	if !(t > 0) {
		return 0
	}
	if t >= 1 {
		return scaleSize - 1
	}
	return int(t*(scaleSize-1) + 0.5)
}

// lch is a colour in CIELAB polar form: lightness, chroma, hue in degrees.
type lch struct{ l, c, h float64 }

func (p lch) lab() (l, a, b float64) {
	s, c := math.Sincos(p.h * math.Pi / 180)
	return p.l, p.c * c, p.c * s
}

// scalePath returns the unsmoothed path at t ∈ [0, 1].
func scalePath(t float64) lch {
	l := 16 + 77*t
	h := piecewise(t, []float64{0, 0.3, 0.55, 0.8, 1}, []float64{305, 262, 192, 136, 100})
	c := math.Min(38+42*t, 0.92*maxChroma(l, h))
	return lch{l, c, h}
}

// buildScale samples the path densely, smooths its chroma, and resamples
// it at equal ΔE*ab.
func buildScale() {
	const n = 1001
	const half = 40 // smoothing half-window in samples
	raw := make([]lch, n)
	for i := range raw {
		raw[i] = scalePath(float64(i) / (n - 1))
	}
	path := make([]lch, n)
	for i := range raw {
		var s float64
		var k int
		for j := max(0, i-half); j <= min(n-1, i+half); j++ {
			s += raw[j].c
			k++
		}
		p := raw[i]
		p.c = math.Min(s/float64(k), 0.98*maxChroma(p.l, p.h))
		path[i] = p
	}
	cum := make([]float64, n)
	for i := 1; i < n; i++ {
		cum[i] = cum[i-1] + deltaE(path[i-1], path[i])
	}
	total := cum[n-1]
	j := 0
	for k := 0; k < scaleSize; k++ {
		d := total * float64(k) / (scaleSize - 1)
		for j < n-2 && cum[j+1] < d {
			j++
		}
		u := 0.0
		if cum[j+1] > cum[j] {
			u = math.Min(1, math.Max(0, (d-cum[j])/(cum[j+1]-cum[j])))
		}
		a, b := path[j], path[j+1]
		p := lch{a.l + u*(b.l-a.l), a.c + u*(b.c-a.c), a.h + u*(b.h-a.h)}
		r, g, bl := labToSRGB(p.lab())
		scaleTable[k] = color.NRGBA{R: to8(r), G: to8(g), B: to8(bl), A: 255}
		scaleLight[k] = p.l
	}
}

func deltaE(p, q lch) float64 {
	l0, a0, b0 := p.lab()
	l1, a1, b1 := q.lab()
	return math.Sqrt((l1-l0)*(l1-l0) + (a1-a0)*(a1-a0) + (b1-b0)*(b1-b0))
}

func piecewise(t float64, xs, ys []float64) float64 {
	for i := 1; i < len(xs); i++ {
		if t <= xs[i] {
			u := (t - xs[i-1]) / (xs[i] - xs[i-1])
			return ys[i-1] + u*(ys[i]-ys[i-1])
		}
	}
	return ys[len(ys)-1]
}

// maxChroma returns the largest chroma that sRGB can show at lightness l
// and hue h, by bisection.
func maxChroma(l, h float64) float64 {
	lo, hi := 0.0, 160.0
	for range 40 {
		m := 0.5 * (lo + hi)
		if inGamut(labToSRGB(lch{l, m, h}.lab())) {
			lo = m
		} else {
			hi = m
		}
	}
	return lo
}

func inGamut(r, g, b float64) bool {
	const e = 1e-9
	return r >= -e && r <= 1+e && g >= -e && g <= 1+e && b >= -e && b <= 1+e
}

// labToSRGB converts CIELAB (D65) to gamma-encoded sRGB components in
// [0, 1] (outside when the colour is out of gamut).
func labToSRGB(l, a, b float64) (r, g, bl float64) {
	// Reference white D65.
	const xn, yn, zn = 0.95047, 1.0, 1.08883
	fy := (l + 16) / 116
	x := xn * labInv(fy+a/500)
	y := yn * labInv(fy)
	z := zn * labInv(fy-b/200)
	r = 3.2404542*x - 1.5371385*y - 0.4985314*z
	g = -0.9692660*x + 1.8760108*y + 0.0415560*z
	bl = 0.0556434*x - 0.2040259*y + 1.0572252*z
	return srgbEncode(r), srgbEncode(g), srgbEncode(bl)
}

func labInv(t float64) float64 {
	const d = 6.0 / 29
	if t > d {
		return t * t * t
	}
	return 3 * d * d * (t - 4.0/29)
}

func srgbEncode(c float64) float64 {
	if c <= 0.0031308 {
		return 12.92 * c
	}
	return 1.055*math.Pow(c, 1/2.4) - 0.055
}

func to8(c float64) uint8 {
	return uint8(math.Round(255 * math.Min(1, math.Max(0, c))))
}
