package plot

import (
	"bytes"
	"errors"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
)

func TestDrawRejects(t *testing.T) {
	sol, p := solvedCoax(t)
	other := coaxQuarter(1e-3, 2e-3, 1)
	nan := *sol
	nan.Phi = append([]float64(nil), sol.Phi...)
	nan.Phi[7] = math.NaN()
	for _, c := range []struct {
		reason string
		format string
		sol    *field.Solution
		p      *bc.Problem
		o      Options
	}{
		{"unknown format", "jpeg", sol, p, Options{}},
		{"no solution", "png", nil, p, Options{}},
		{"no problem", "png", sol, nil, Options{}},
		{"problem of another domain", "png", sol, other, Options{}},
		{"potential not finite", "png", &nan, p, Options{}},
		{"unknown kind", "png", sol, p, Options{Kind: 9}},
		{"unknown arrow mode", "png", sol, p, Options{Kind: Arrows, ArrowMode: -1}},
		{"negative width", "png", sol, p, Options{Width: -5}},
		{"huge picture", "png", sol, p, Options{Width: MaxSize + 1}},
		{"too small to label", "png", sol, p, Options{Width: 100, Height: 100}},
		{"too many levels", "png", sol, p, Options{Levels: 1000}},
		{"unit without a scale", "png", sol, p, Options{Unit: Unit{Name: "mm"}}},
		{"unit without a name", "png", sol, p, Options{Unit: Unit{Scale: 1e-3}}},
		{"view outside the domain", "png", sol, p, Options{View: bc.Rect{X0: 1, Y0: 1, X1: 2, Y1: 2}}},
		{"view touching the domain at a corner", "png", sol, p, Options{View: bc.Rect{X0: -1, Y0: -1, X1: 0, Y1: 0}}},
		{"empty view", "png", sol, p, Options{View: bc.Rect{X0: 1e-3, Y0: 0, X1: 1e-3, Y1: 1e-3}}},
		{"inverted view", "png", sol, p, Options{View: bc.Rect{X0: 2e-3, Y0: 0, X1: 1e-3, Y1: 1e-3}}},
		{"view not finite", "png", sol, p, Options{View: bc.Rect{X0: 0, Y0: 0, X1: math.Inf(1), Y1: 1e-3}}},
	} {
		var buf bytes.Buffer
		err := Draw(&buf, c.format, c.sol, c.p, c.o)
		if !errors.Is(err, ErrOptions) {
			t.Errorf("%s: got %v, want an error wrapping ErrOptions", c.reason, err)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: %d bytes written on error", c.reason, buf.Len())
		}
	}
}

// TestAutoHeight: a zero height fits the picture to the domain, taller for
// a tall domain than for a wide one.
func TestAutoHeight(t *testing.T) {
	tall, tp := solvedSphere(t) // 1 : 2
	wide := plates(20e-3, 2e-3, 100)
	wsol := mustSolve(t, wide, mustGrid(t, 0, 20e-3, 41, 0, 2e-3, 9, 0))
	size := func(sol *field.Solution, p *bc.Problem) (int, int) {
		var buf bytes.Buffer
		if err := Draw(&buf, "png", sol, p, Options{Width: 500}); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatal(err)
		}
		return img.Bounds().Dx(), img.Bounds().Dy()
	}
	w1, h1 := size(tall, tp)
	w2, h2 := size(wsol, wide)
	if w1 != 500 || w2 != 500 {
		t.Errorf("widths %d and %d, want 500", w1, w2)
	}
	if !(h1 > 500 && h2 < 300) {
		t.Errorf("heights %d (tall domain) and %d (wide domain): want above 500 and below 300", h1, h2)
	}
}

func TestSave(t *testing.T) {
	sol, p := solvedCoax(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "coax.svg")
	if err := Save(path, sol, p, Options{Kind: FieldLines}); err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	checkSVG(t, data)
	if err := Save(filepath.Join(dir, "coax.gif"), sol, p, Options{}); !errors.Is(err, ErrOptions) {
		t.Errorf("a .gif name: got %v, want ErrOptions", err)
	}
	if err := Save(filepath.Join(dir, "missing", "coax.png"), sol, p, Options{}); err == nil {
		t.Error("a missing directory must fail")
	}
	if err := Save(filepath.Join(dir, "bad.png"), sol, p, Options{Kind: 42}); err == nil {
		t.Error("a bad request must fail")
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 || entries[0].Name() != "coax.svg" {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("directory holds %v, want only coax.svg (no temporary or partial files)", names)
	}
}

// TestCoarse draws every picture of a 3 × 3-node problem: nothing to
// label and almost no field lines, but a valid picture every time.
func TestCoarse(t *testing.T) {
	p := plates(1e-3, 1e-3, 10)
	sol := mustSolve(t, p, mustGrid(t, 0, 1e-3, 3, 0, 1e-3, 3, 0))
	for _, pc := range pictureCases {
		var buf bytes.Buffer
		if err := Draw(&buf, "png", sol, p, pc.o); err != nil {
			t.Errorf("%s: %v", pc.name, err)
			continue
		}
		if _, err := png.Decode(&buf); err != nil {
			t.Errorf("%s: %v", pc.name, err)
		}
	}
}
