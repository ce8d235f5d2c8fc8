package main

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/bc"
)

// svgAxisRanges returns the smallest and largest numeric label of each
// axis of an SVG picture whose only numeric text is its axis labels: the
// horizontal axis's share one baseline.
func svgAxisRanges(t *testing.T, path string) (x, y [2]float64) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	type label struct {
		base string
		v    float64
	}
	var labels []label
	d := xml.NewDecoder(bytes.NewReader(data))
	var cur *label
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			cur = nil
			if tok.Name.Local == "text" {
				cur = &label{}
				for _, a := range tok.Attr {
					if a.Name.Local == "y" {
						cur.base = a.Value
					}
				}
			}
		case xml.CharData:
			if cur != nil {
				s := strings.ReplaceAll(strings.TrimSpace(string(tok)), "−", "-")
				if v, err := strconv.ParseFloat(s, 64); err == nil {
					cur.v = v
					labels = append(labels, *cur)
				}
			}
			cur = nil
		}
	}
	count := map[string]int{}
	for _, l := range labels {
		count[l.base]++
	}
	x = [2]float64{math.Inf(1), math.Inf(-1)}
	y = x
	for _, l := range labels {
		r := &y
		if count[l.base] > 1 {
			r = &x
		}
		r[0], r[1] = math.Min(r[0], l.v), math.Max(r[1], l.v)
	}
	return x, y
}

// TestPicturesShowWrittenDomain: the sphere's open sides are moved ten
// times as far out, but its pictures, solved or redrawn, show the domain
// the file gives: r from 0 to 30 mm, z from −30 to 30 mm.
func TestPicturesShowWrittenDomain(t *testing.T) {
	dir := t.TempDir()
	code, _, errs := runCLI(t, "solve", "-q", "-o", dir, example("sphere"))
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	pd := t.TempDir()
	code, _, errs = runCLI(t, "plot", "-o", pd, "--kind", "lines", "--file", "lines.svg", filepath.Join(dir, "result.pga"))
	if code != exitOK {
		t.Fatalf("plot: exit %d: %s", code, errs)
	}
	for _, path := range []string{filepath.Join(dir, "lines.svg"), filepath.Join(pd, "lines.svg")} {
		x, y := svgAxisRanges(t, path)
		// Round tick labels: within one 5 mm step of each end.
		if !(x[0] == 0 && x[1] <= 30 && x[1] > 25) || !(y[0] >= -30 && y[0] < -25 && y[1] <= 30 && y[1] > 25) {
			t.Errorf("%s: axes labelled r %v, z %v mm; want them to span r 0 to 30 mm, z −30 to 30 mm", path, x, y)
		}
	}
}

// TestPictureView: pictures are limited to the written domain only when
// the solved one was extended.
func TestPictureView(t *testing.T) {
	d := bc.Rect{X0: 0, Y0: -1, X1: 1, Y1: 1}
	far := bc.Rect{X0: 0, Y0: -10, X1: 10, Y1: 10}
	for _, c := range []struct {
		name    string
		written bc.Rect
		p       *bc.Problem
		want    bc.Rect
	}{
		{"extended", d, &bc.Problem{Domain: far}, d},
		{"not extended", d, &bc.Problem{Domain: d}, bc.Rect{}},
		{"no written domain", bc.Rect{}, &bc.Problem{Domain: far}, bc.Rect{}},
		{"no problem", d, nil, bc.Rect{}},
	} {
		if got := pictureView(c.written, c.p); got != c.want {
			t.Errorf("%s: view %v, want %v", c.name, got, c.want)
		}
	}
}
