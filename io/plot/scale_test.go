package plot

import (
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestChooseLevels(t *testing.T) {
	approx := cmpopts.EquateApprox(1e-12, 1e-12)
	for _, c := range []struct {
		reason   string
		lo, hi   float64
		n        int
		want     []float64
		wantStep float64
	}{
		{"unit range, ten levels: ends left out", 0, 1, 10, []float64{0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9}, 0.1},
		{"kilovolts", 0, 1000, 10, []float64{100, 200, 300, 400, 500, 600, 700, 800, 900}, 100},
		{"symmetric about zero, zero kept", -5, 5, 10, []float64{-4, -3, -2, -1, 0, 1, 2, 3, 4}, 1},
		{"2.5 steps count closest to 8", 0, 230e3, 8, []float64{25e3, 50e3, 75e3, 100e3, 125e3, 150e3, 175e3, 200e3, 225e3}, 25e3},
		{"offset range", 3.3, 4.1, 4, []float64{3.4, 3.6, 3.8, 4.0}, 0.2},
		{"few levels", 0, 5, 2, []float64{2, 4}, 2},
		{"one level", 0, 10, 1, []float64{5}, 5},
		{"small values", 0, 3e-3, 6, []float64{0.5e-3, 1e-3, 1.5e-3, 2e-3, 2.5e-3}, 0.5e-3},
		{"negative range, a tie in count goes to the larger step", -100, -20, 4, []float64{-75, -50, -25}, 25},
		{"empty range", 1, 1, 10, nil, 0},
		{"reversed range", 2, 1, 10, nil, 0},
		{"no levels asked", 0, 1, 0, nil, 0},
	} {
		got, step := chooseLevels(c.lo, c.hi, c.n)
		if diff := cmp.Diff(c.want, got, approx, cmpopts.EquateEmpty()); diff != "" {
			t.Errorf("%s: chooseLevels(%g, %g, %d) levels (-want +got):\n%s", c.reason, c.lo, c.hi, c.n, diff)
		}
		if !cmp.Equal(c.wantStep, step, approx) {
			t.Errorf("%s: step %g, want %g", c.reason, step, c.wantStep)
		}
	}
}

func TestTicks(t *testing.T) {
	for _, c := range []struct {
		reason string
		got    []tick
		want   []string
	}{
		{"linear, ends included", linearTicks(0, 3, 6), []string{"0", "0.5", "1.0", "1.5", "2.0", "2.5", "3.0"}},
		{"linear, negative", linearTicks(-5, 5, 5), []string{"−4", "−2", "0", "2", "4"}},
		{"linear, axis in mm", linearTicks(-5, 5, 10), []string{"−5", "−4", "−3", "−2", "−1", "0", "1", "2", "3", "4", "5"}},
		{"log, three decades with 1-2-5", logTicks(0.00476, 4.76), []string{"0.005", "0.01", "0.02", "0.05", "0.1", "0.2", "0.5", "1", "2"}},
		{"log, wide range decades only", logTicks(1, 1e5), []string{"1", "10", "100", "1000", "10000", "100000"}},
		{"log, within a decade", logTicks(200, 914), []string{"200", "300", "400", "500", "600", "800"}},
		{"log, empty", logTicks(0, 1), nil},
	} {
		var got []string
		for _, tk := range c.got {
			got = append(got, tk.label)
		}
		if diff := cmp.Diff(c.want, got, cmpopts.EquateEmpty()); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.reason, diff)
		}
	}
}

func TestFormat(t *testing.T) {
	for _, c := range []struct {
		reason string
		got    string
		want   string
	}{
		{"decimals of the step", formatNumber(0.25, 0.05), "0.25"},
		{"integer step", formatNumber(200, 50), "200"},
		{"2.5 step", formatNumber(7.5, 2.5), "7.5"},
		{"one decimal", formatNumber(1, 0.5), "1.0"},
		{"zero", formatNumber(0, 0.1), "0"},
		{"typographic minus", formatNumber(-0.3, 0.1), "−0.3"},
		{"large uses exponent", formatNumber(2.5e7, 1e6), "2.5e7"},
		{"three significant", formatSig(4.7613), "4.76"},
		{"trailing zeros trimmed", formatSig(20.0004), "20"},
		{"small value", formatSig(0.034712), "0.0347"},
		{"rounds up a decade", formatSig(99.96), "100"},
	} {
		if c.got != c.want {
			t.Errorf("%s: got %q, want %q", c.reason, c.got, c.want)
		}
	}
}

func TestUnits(t *testing.T) {
	for _, c := range []struct {
		reason string
		got    quantity
		want   quantity
	}{
		{"volts", potentialUnit(5), quantity{"V", 1}},
		{"kilovolts from 1 kV", potentialUnit(1000), quantity{"kV", 1e3}},
		{"negative kilovolts", potentialUnit(-250e3), quantity{"kV", 1e3}},
		{"megavolts", potentialUnit(1.2e6), quantity{"MV", 1e6}},
		{"millivolts", potentialUnit(0.05), quantity{"mV", 1e-3}},
		{"microvolts", potentialUnit(3e-5), quantity{"µV", 1e-6}},
		{"no potential", potentialUnit(0), quantity{"V", 1}},
		{"weak field", fieldUnit(500, Millimetre), quantity{"V/m", 1}},
		{"board field", fieldUnit(17e3, Millimetre), quantity{"kV/m", 1e3}},
		{"HV field in a mm model", fieldUnit(3.2e6, Millimetre), quantity{"kV/mm", 1e6}},
		{"HV field in a µm model", fieldUnit(3.2e6, Micrometre), quantity{"kV/mm", 1e6}},
		{"HV field in a metre model", fieldUnit(3.2e6, Metre), quantity{"MV/m", 1e6}},
		{"no field", fieldUnit(0, Metre), quantity{"V/m", 1}},
	} {
		if c.got != c.want {
			t.Errorf("%s: got %v, want %v", c.reason, c.got, c.want)
		}
	}
	for _, c := range []struct {
		extent float64
		want   Unit
	}{{2, Metre}, {1, Metre}, {0.25, Millimetre}, {1e-3, Millimetre}, {5e-4, Micrometre}} {
		if got := autoLength(c.extent); got != c.want {
			t.Errorf("autoLength(%g) = %v, want %v", c.extent, got, c.want)
		}
	}
}
