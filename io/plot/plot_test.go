package plot

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"image"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/grid"
)

// pictureCases are the pictures every solution is drawn as.
var pictureCases = []struct {
	name string
	o    Options
}{
	{"potential", Options{Kind: Potential}},
	{"field-linear", Options{Kind: FieldMagnitude}},
	{"field-log", Options{Kind: FieldMagnitude, LogScale: true}},
	{"arrows-true", Options{Kind: Arrows, ArrowMode: TrueLength}},
	{"arrows-log", Options{Kind: Arrows, ArrowMode: LogLength}},
	{"arrows-equal", Options{Kind: Arrows, ArrowMode: EqualLength, LogScale: true}},
	{"lines", Options{Kind: FieldLines}},
}

// distinctColours counts the distinct colours of an image, up to limit.
func distinctColours(img image.Image, limit int) int {
	seen := map[[4]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, a := img.At(x, y).RGBA()
			seen[[4]uint32{r, g, bl, a}] = true
			if len(seen) >= limit {
				return len(seen)
			}
		}
	}
	return len(seen)
}

// checkSVG reports whether the SVG is well-formed XML with an svg root.
func checkSVG(t *testing.T, data []byte) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(data))
	root := ""
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("SVG is not well-formed XML: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok && root == "" {
			root = se.Name.Local
		}
	}
	if root != "svg" {
		t.Fatalf("SVG root element is %q, want svg", root)
	}
}

func save(t *testing.T, name string, data []byte) {
	if *pictures == "" {
		return
	}
	if err := os.WriteFile(filepath.Join(*pictures, name), data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestPictures draws every kind of picture of a planar and an
// axisymmetric solution in both formats and checks the files.
func TestPictures(t *testing.T) {
	type solved struct {
		name string
		sol  *field.Solution
		p    *bc.Problem
	}
	var cases []solved
	for _, c := range []struct {
		name string
		f    func(testing.TB) (*field.Solution, *bc.Problem)
	}{
		{"coax", solvedCoax},
		{"sphere", solvedSphere},
		{"trace", trace},
		{"electrode", electrode},
	} {
		sol, p := c.f(t)
		cases = append(cases, solved{c.name, sol, p})
	}
	for _, sc := range cases {
		for _, pc := range pictureCases {
			t.Run(sc.name+"/"+pc.name, func(t *testing.T) {
				o := pc.o
				o.Width, o.Height = 720, 540
				o.Title = "Test " + sc.name
				var buf bytes.Buffer
				if err := Draw(&buf, "png", sc.sol, sc.p, o); err != nil {
					t.Fatal(err)
				}
				save(t, fmt.Sprintf("%s-%s.png", sc.name, pc.name), buf.Bytes())
				img, err := png.Decode(bytes.NewReader(buf.Bytes()))
				if err != nil {
					t.Fatalf("PNG does not decode: %v", err)
				}
				if b := img.Bounds(); b.Dx() != o.Width || b.Dy() != o.Height {
					t.Errorf("PNG is %d×%d, want %d×%d", b.Dx(), b.Dy(), o.Width, o.Height)
				}
				if n := distinctColours(img, 64); n < 16 {
					t.Errorf("PNG has only %d distinct colours; it looks blank", n)
				}
				buf.Reset()
				if err := Draw(&buf, "svg", sc.sol, sc.p, o); err != nil {
					t.Fatal(err)
				}
				save(t, fmt.Sprintf("%s-%s.svg", sc.name, pc.name), buf.Bytes())
				checkSVG(t, buf.Bytes())
				xn, yn := "x", "y"
				if sc.p.Metric == grid.Axisymmetric {
					xn, yn = "r", "z"
				}
				for _, axis := range []string{xn, yn} {
					if !strings.Contains(buf.String(), ">"+axis+" (mm)<") {
						t.Errorf("SVG lacks the axis label %q", axis+" (mm)")
					}
				}
				if !strings.Contains(buf.String(), "'Liberation Sans',Arial") {
					t.Error("SVG text names no fallback font")
				}
				if pc.o.Kind != Potential && !strings.Contains(buf.String(), "Electrostatic estimate") {
					t.Error("a field picture lacks the caution")
				}
			})
		}
	}
}
