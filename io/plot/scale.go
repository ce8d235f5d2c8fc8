package plot

import (
	"math"
	"strconv"
	"strings"
)

// niceMantissas are the step mantissas used for levels and ticks: steps
// are 1, 2, 2.5 or 5 times a power of ten.
var niceMantissas = []float64{1, 2, 2.5, 5}

// niceSteps returns the nice steps around raw: for each power of ten
// from one below to one above raw's, every nice mantissa.
func niceSteps(raw float64) []float64 {
	e := math.Floor(math.Log10(raw))
	var out []float64
	for d := -1.0; d <= 1; d++ {
		p := math.Pow(10, e+d)
		for _, m := range niceMantissas {
			out = append(out, m*p)
		}
	}
	return out
}

// levelsWithStep returns the multiples of step strictly inside (lo, hi),
// leaving out those within a millionth of the range of either end.
func levelsWithStep(lo, hi, step float64) []float64 {
	tol := 1e-6 * (hi - lo)
	k0 := math.Ceil((lo + tol) / step)
	k1 := math.Floor((hi - tol) / step)
	var out []float64
	for k := k0; k <= k1; k++ {
		v := k * step
		if v == 0 {
			v = 0 // no negative zero
		}
		out = append(out, v)
	}
	return out
}

// chooseLevels returns contour levels at round values strictly inside
// (lo, hi): the multiples of the nice step (1, 2, 2.5 or 5 × 10ᵏ) whose
// count is closest to n, the larger step winning a tie. It returns nil
// when the range is empty or not finite, or n < 1.
func chooseLevels(lo, hi float64, n int) (levels []float64, step float64) {
	if n < 1 || !(hi > lo) || math.IsInf(hi-lo, 0) {
		return nil, 0
	}
	best, bestCount := 0.0, -1
	for _, s := range niceSteps((hi - lo) / float64(n)) {
		c := len(levelsWithStep(lo, hi, s))
		if c == 0 {
			continue
		}
		d, bd := abs(c-n), abs(bestCount-n)
		if bestCount < 0 || d < bd || (d == bd && s > best) {
			best, bestCount = s, c
		}
	}
	if bestCount < 0 {
		return nil, 0
	}
	return levelsWithStep(lo, hi, best), best
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// tick is one labelled mark on a scale.
type tick struct {
	v     float64
	label string
}

// linearTicks returns about n labelled ticks at nice values in [lo, hi],
// the ends included when they fall on the step.
func linearTicks(lo, hi float64, n int) []tick {
	if !(hi > lo) {
		return []tick{{lo, formatNumber(lo, math.Abs(lo))}}
	}
	_, step := chooseLevels(lo, hi, n)
	if step == 0 {
		return nil
	}
	tol := 1e-9 * (hi - lo)
	var out []tick
	for k := math.Ceil((lo - tol) / step); k*step <= hi+tol; k++ {
		v := k * step
		if v == 0 {
			v = 0
		}
		out = append(out, tick{v, formatNumber(v, step)})
	}
	return out
}

// logTicks returns ticks for a logarithmic scale over [lo, hi] (lo > 0):
// every decade; also 2 and 5 times each decade when the range spans at
// most three decades, and 1.5, 2, 3, 4, 5, 6 and 8 times it within one.
func logTicks(lo, hi float64) []tick {
	if !(lo > 0) || !(hi > lo) {
		return nil
	}
	mult := []float64{1}
	switch d := math.Log10(hi / lo); {
	case d <= 1+1e-9:
		mult = []float64{1, 1.5, 2, 3, 4, 5, 6, 8}
	case d <= 3+1e-9:
		mult = []float64{1, 2, 5}
	}
	var out []tick
	for e := math.Floor(math.Log10(lo)); e <= math.Ceil(math.Log10(hi)); e++ {
		p := math.Pow(10, e)
		for _, m := range mult {
			v := m * p
			if v >= lo*(1-1e-9) && v <= hi*(1+1e-9) {
				out = append(out, tick{v, formatNumber(v, v)})
			}
		}
	}
	return out
}

// formatNumber formats v with as many decimals as a step of size step
// needs: formatNumber(0.25, 0.05) = "0.25", formatNumber(200, 50) = "200".
// Values beyond 10⁶ or below 10⁻⁴ in magnitude use exponent notation.
func formatNumber(v, step float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		if v == 0 {
			return "0"
		}
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	if a := math.Abs(v); a >= 1e6 || a < 1e-4 {
		s := strconv.FormatFloat(v, 'g', 3, 64)
		return strings.Replace(s, "e+0", "e", 1)
	}
	step = math.Abs(step)
	if step == 0 {
		step = math.Abs(v)
	}
	dec := 0
	for dec < 8 {
		scaled := step * math.Pow(10, float64(dec))
		if math.Abs(scaled-math.Round(scaled)) < 1e-6*scaled {
			break
		}
		dec++
	}
	return strings.Replace(strconv.FormatFloat(v, 'f', dec, 64), "-", "−", 1)
}

// formatSig formats v to three significant digits without trailing
// zeros: 4.76, 20, 0.0347.
func formatSig(v float64) string {
	a := math.Abs(v)
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) || a >= 1e6 || a < 1e-4 {
		return formatNumber(v, v)
	}
	dec := max(0, 2-int(math.Floor(math.Log10(a))))
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return strings.Replace(s, "-", "−", 1)
}

// Unit is a length unit for the axes: its Name as printed ("mm") and its
// Scale in metres (1e-3). The zero value asks for a unit chosen from the
// size of the domain.
type Unit struct {
	Name  string
	Scale float64
}

// Common length units.
var (
	Metre      = Unit{"m", 1}
	Millimetre = Unit{"mm", 1e-3}
	Micrometre = Unit{"µm", 1e-6}
	Inch       = Unit{"in", 0.0254}
	Mil        = Unit{"mil", 25.4e-6}
)

// autoLength returns the length unit for a domain whose larger side is
// extent metres: m from 1 m, mm from 1 mm, µm below.
func autoLength(extent float64) Unit {
	switch {
	case extent >= 1:
		return Metre
	case extent >= 1e-3:
		return Millimetre
	}
	return Micrometre
}

// quantity is a physical unit for a colour bar or a label: values in SI
// divided by Factor read in Name.
type quantity struct {
	Name   string
	Factor float64
}

// potentialUnit returns the unit for potentials up to peak volts in
// magnitude: MV, kV, V, mV or µV, so that the largest value reads between
// 1 and 1000.
func potentialUnit(peak float64) quantity {
	peak = math.Abs(peak)
	switch {
	case peak >= 1e6:
		return quantity{"MV", 1e6}
	case peak >= 1e3:
		return quantity{"kV", 1e3}
	case peak >= 1 || peak == 0 || math.IsNaN(peak):
		return quantity{"V", 1}
	case peak >= 1e-3:
		return quantity{"mV", 1e-3}
	}
	return quantity{"µV", 1e-6}
}

// fieldUnit returns the unit for field strengths up to peak V/m: V/m
// below 1 kV/m, kV/m below 1 MV/m, and above that kV/mm for models drawn
// in millimetres or smaller (the high-voltage habit) or MV/m for models
// drawn in metres.
func fieldUnit(peak float64, length Unit) quantity {
	peak = math.Abs(peak)
	switch {
	case peak < 1e3 || math.IsNaN(peak):
		return quantity{"V/m", 1}
	case peak < 1e6:
		return quantity{"kV/m", 1e3}
	case length.Scale < 0.1:
		return quantity{"kV/mm", 1e6}
	}
	return quantity{"MV/m", 1e6}
}
