package plot

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
)

// Kind is the kind of picture.
type Kind int

const (
	// Potential is a filled colour map of φ with labelled equipotentials.
	Potential Kind = iota
	// FieldMagnitude is a colour map of |E| with the grid's peak marked.
	FieldMagnitude
	// Arrows draws field vectors from their tail points on a regular
	// lattice over faint equipotentials.
	Arrows
	// FieldLines draws field lines started on conductor surfaces, spaced
	// by the surface charge so that their density shows the field.
	FieldLines
)

var kindNames = [...]string{"potential", "field", "arrows", "lines"}

// String returns "potential", "field", "arrows" or "lines".
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// ArrowMode sets how the length of a field arrow follows |E|.
type ArrowMode int

const (
	// TrueLength arrows are proportional to |E|; the longest spans about
	// one lattice spacing. Faithful, but near an electrode edge the
	// strongest arrows leave the rest as dots.
	TrueLength ArrowMode = iota
	// LogLength arrows grow with log |E| over three decades below the
	// largest, so weak and strong regions both stay visible.
	LogLength
	// EqualLength arrows all have one length and show |E| by colour.
	EqualLength
)

var arrowNames = [...]string{"true", "log", "equal"}

// String returns "true", "log" or "equal".
func (m ArrowMode) String() string {
	if m >= 0 && int(m) < len(arrowNames) {
		return arrowNames[m]
	}
	return fmt.Sprintf("ArrowMode(%d)", int(m))
}

// Options describes one picture. The zero value draws a potential map
// 900 units wide in a unit chosen from the size of the domain.
type Options struct {
	Kind Kind
	// Width and Height are the size of the picture: pixels in a PNG,
	// points (1/72 inch) in an SVG. Zero Width means 900; zero Height
	// fits the picture to the domain's aspect ratio. Both are at most
	// MaxSize.
	Width, Height int
	// LogScale draws |E| on a logarithmic colour scale (FieldMagnitude,
	// and the colours of EqualLength arrows) from the smallest field,
	// rounded down to 1, 2 or 5 × 10ᵏ, but at most three decades below
	// the peak.
	LogScale bool
	// ArrowMode sets the arrow lengths of an Arrows picture.
	ArrowMode ArrowMode
	// Levels is the approximate number of equipotentials; zero means 10.
	// Levels fall on round values.
	Levels int
	// Lines is the approximate number of field lines of a FieldLines
	// picture; zero means 24.
	Lines int
	// Title heads the picture, typically the problem's name.
	Title string
	// Unit is the length unit of the axes; the zero value picks m, mm or
	// µm from the size of the domain.
	Unit Unit
	// View is the part of the domain the picture shows, in metres; the
	// zero Rect shows the whole domain. Axes, aspect ratio, colour maps
	// and their scales, the arrow lattice and the equipotential levels
	// all follow the view, which lets a problem whose open sides were
	// extended far out be drawn at the size of its geometry. Field lines
	// are still traced through the whole domain, but drawn only inside
	// the view. A view reaching past the domain is cut to it.
	View bc.Rect
}

// MaxSize is the largest accepted picture width or height.
const MaxSize = 10000

// ErrOptions is wrapped by every error about unusable arguments to Draw
// and Save.
var ErrOptions = errors.New("plot: invalid picture request")

// Caution is the note printed under every picture that shows a field
// strength.
const Caution = "Electrostatic estimate: not a substitute for testing, the applicable standards and qualified review."

// Draw draws the picture o describes of the solution sol of problem p and
// writes it to w in format "png" or "svg". The problem supplies the shapes
// drawn over the maps; it must be the one sol solves.
func Draw(w io.Writer, format string, sol *field.Solution, p *bc.Problem, o Options) error {
	format = strings.ToLower(format)
	if format != "png" && format != "svg" {
		return fmt.Errorf("%w: format %q; use \"png\" or \"svg\"", ErrOptions, format)
	}
	f, err := newFigure(sol, p, o, format)
	if err != nil {
		return err
	}
	wl, hl := vg.Length(f.w), vg.Length(f.h)
	var out io.WriterTo
	var c vg.CanvasSizer
	if format == "png" {
		ic := vgimg.NewWith(vgimg.UseWH(wl, hl), vgimg.UseDPI(72))
		c, out = ic, vgimg.PngCanvas{Canvas: ic}
	} else {
		sc := vgsvg.New(wl, hl)
		c, out = sc, sc
	}
	if err := f.render(draw.New(c)); err != nil {
		return err
	}
	var buf bytes.Buffer
	if _, err := out.WriteTo(&buf); err != nil {
		return fmt.Errorf("plot: encoding the %s picture: %w", format, err)
	}
	data := buf.Bytes()
	if format == "svg" {
		// Liberation Sans has the metrics of Arial and Helvetica: name
		// them as fallbacks so that the text keeps its layout where the
		// viewer lacks the font.
		data = bytes.ReplaceAll(data, []byte("font-family:Liberation Sans;"), []byte("font-family:'Liberation Sans',Arial,Helvetica,sans-serif;"))
	}
	if _, err := w.Write(data); err != nil {
		return fmt.Errorf("plot: writing the %s picture: %w", format, err)
	}
	return nil
}

// Save draws the picture like Draw and writes it to path, in the format
// its extension names (.png or .svg). It writes a temporary file in the
// same directory and renames it when complete, so a failed call never
// leaves a partial picture behind.
func Save(path string, sol *field.Solution, p *bc.Problem, o Options) (err error) {
	format := strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), ".")
	if format != "png" && format != "svg" {
		return fmt.Errorf("%w: %s: name the file .png or .svg", ErrOptions, path)
	}
	var buf bytes.Buffer
	if err := Draw(&buf, format, sol, p, o); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return fmt.Errorf("plot: %w; check that the directory exists and is writable", err)
	}
	defer func() {
		if err != nil {
			_ = os.Remove(tmp.Name())
		}
	}()
	if _, err = tmp.Write(buf.Bytes()); err != nil {
		_ = tmp.Close()
		return fmt.Errorf("plot: writing %s: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("plot: writing %s: %w", path, err)
	}
	if err = os.Chmod(tmp.Name(), 0o644); err != nil {
		return fmt.Errorf("plot: %w", err)
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("plot: %w", err)
	}
	return nil
}

// check validates the arguments of Draw.
func check(sol *field.Solution, p *bc.Problem, o *Options) error {
	if sol == nil || sol.Grid == nil || sol.Map == nil {
		return fmt.Errorf("%w: no solution; solve the problem first", ErrOptions)
	}
	g := sol.Grid
	if len(sol.Phi) != g.Len() {
		return fmt.Errorf("%w: the solution has %d potentials for %d grid nodes; it was not solved completely", ErrOptions, len(sol.Phi), g.Len())
	}
	if p == nil {
		return fmt.Errorf("%w: no problem; pass the problem the solution solves, for its shapes", ErrOptions)
	}
	if err := p.Validate(); err != nil {
		return fmt.Errorf("%w: %w", ErrOptions, err)
	}
	x0, y0, x1, y1 := g.Bounds()
	d := p.Domain
	tol := 1e-6 * math.Max(d.X1-d.X0, d.Y1-d.Y0)
	if math.Abs(x0-d.X0) > tol || math.Abs(x1-d.X1) > tol || math.Abs(y0-d.Y0) > tol || math.Abs(y1-d.Y1) > tol || g.Metric() != p.Metric {
		return fmt.Errorf("%w: the solution's grid does not match the problem's domain and metric; pass the problem that was solved", ErrOptions)
	}
	if len(sol.Map.Conductors) != len(p.Conductors) || len(sol.V) != len(p.Conductors) {
		return fmt.Errorf("%w: the solution has %d conductors but the problem %d; pass the problem that was solved", ErrOptions, len(sol.V), len(p.Conductors))
	}
	for _, v := range sol.Phi {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: the potential is not finite everywhere; the solve did not converge", ErrOptions)
		}
	}
	if o.Kind < Potential || o.Kind > FieldLines {
		return fmt.Errorf("%w: unknown picture kind %d", ErrOptions, int(o.Kind))
	}
	if o.ArrowMode < TrueLength || o.ArrowMode > EqualLength {
		return fmt.Errorf("%w: unknown arrow mode %d", ErrOptions, int(o.ArrowMode))
	}
	if o.Width < 0 || o.Height < 0 || o.Width > MaxSize || o.Height > MaxSize {
		return fmt.Errorf("%w: picture size %d×%d; give sizes from 1 to %d, or 0 for the default", ErrOptions, o.Width, o.Height, MaxSize)
	}
	if o.Width != 0 && o.Width < 200 || o.Height != 0 && o.Height < 150 {
		return fmt.Errorf("%w: picture size %d×%d is too small to label; give at least 200×150", ErrOptions, o.Width, o.Height)
	}
	if o.Levels < 0 || o.Levels > 200 || o.Lines < 0 || o.Lines > 2000 {
		return fmt.Errorf("%w: %d levels and %d field lines; give 0 for the default, at most 200 levels and 2000 lines", ErrOptions, o.Levels, o.Lines)
	}
	if o.View != (bc.Rect{}) {
		v := o.View
		for _, c := range []float64{v.X0, v.Y0, v.X1, v.Y1} {
			if math.IsNaN(c) || math.IsInf(c, 0) {
				return fmt.Errorf("%w: view %g, %g to %g, %g is not finite; give finite corners, or the zero Rect for the whole domain", ErrOptions, v.X0, v.Y0, v.X1, v.Y1)
			}
		}
		if !(v.X1 > v.X0) || !(v.Y1 > v.Y0) {
			return fmt.Errorf("%w: view %g, %g to %g, %g is empty; give X0 < X1 and Y0 < Y1, or the zero Rect for the whole domain", ErrOptions, v.X0, v.Y0, v.X1, v.Y1)
		}
		c := clipRect(v, d)
		if !(c.X1-c.X0 > tol) || !(c.Y1-c.Y0 > tol) {
			return fmt.Errorf("%w: view %g, %g to %g, %g lies outside the domain %g, %g to %g, %g; give a view that overlaps it", ErrOptions, v.X0, v.Y0, v.X1, v.Y1, d.X0, d.Y0, d.X1, d.Y1)
		}
	}
	if o.Unit != (Unit{}) && (o.Unit.Name == "" || !(o.Unit.Scale > 0) || math.IsInf(o.Unit.Scale, 0)) {
		return fmt.Errorf("%w: length unit %q with scale %g; give a name and a positive scale in metres, or the zero Unit", ErrOptions, o.Unit.Name, o.Unit.Scale)
	}
	return nil
}

// clipRect returns the intersection of the rectangles a and b, which may
// be empty (X1 ≤ X0 or Y1 ≤ Y0).
func clipRect(a, b bc.Rect) bc.Rect {
	return bc.Rect{X0: math.Max(a.X0, b.X0), Y0: math.Max(a.Y0, b.Y0), X1: math.Min(a.X1, b.X1), Y1: math.Min(a.Y1, b.Y1)}
}
