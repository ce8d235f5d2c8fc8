package main

import (
	"context"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/io/archive"
	"github.com/phigrid/phigrid/io/model"
	"github.com/phigrid/phigrid/io/plot"
)

type plotOptions struct {
	out    string
	kind   string
	file   string
	arrows string
	log    bool
	width  int
}

func init() {
	register(&command{
		name:    "plot",
		args:    "RESULT [-o DIR] [--kind KIND [--file NAME]]",
		summary: "redraw pictures from a saved result archive without solving again",
		help: `plot reads a result archive (result.pga, written by 'phigrid solve' when the
model asks for an archive or pictures) and draws pictures from it. Without
--kind it redraws every picture the archived model lists; with --kind it
draws one picture: potential (map with equipotentials), field (|E| map),
arrows (field vectors; --arrows true|log|equal sets the length mode) or lines
(field lines from the conductor surfaces, spaced by surface charge).
DIR defaults to the archive's directory.`,
		flags: func(fs *flag.FlagSet) any {
			o := &plotOptions{}
			fs.StringVar(&o.out, "o", "", "write pictures into `DIR`")
			fs.StringVar(&o.kind, "kind", "", "draw one picture of this `KIND`: potential, field, arrows or lines")
			fs.StringVar(&o.file, "file", "", "file `NAME` of the --kind picture (.png or .svg; default KIND.png)")
			fs.StringVar(&o.arrows, "arrows", "", "arrow length `MODE` for --kind arrows: true, log or equal")
			fs.BoolVar(&o.log, "log", false, "logarithmic colour scale for --kind field")
			fs.IntVar(&o.width, "width", 0, "picture width in `PIXELS` (0: automatic)")
			return o
		},
		run: runPlot,
	})
}

func runPlot(ctx context.Context, e *env, fs *flag.FlagSet, opts any) error {
	o := opts.(*plotOptions)
	if fs.NArg() != 1 {
		return &usageError{"plot needs exactly one result archive"}
	}
	path := fs.Arg(0)
	a, err := archive.Load(path)
	if err != nil {
		return &inputError{err}
	}
	sol, err := a.Solution()
	if err != nil {
		return &inputError{err}
	}
	if a.Problem == nil {
		return &inputError{fmt.Errorf("%s holds no problem description to draw shapes from; solve the model again", path)}
	}
	dir := o.out
	if dir == "" {
		dir = filepath.Dir(path)
	}
	title := ""
	var pics []model.Picture
	var unit model.Unit = model.Unit{Name: a.Unit.Name, Scale: a.Unit.Scale}
	var view bc.Rect
	if len(a.ModelSource) > 0 {
		if m, err := model.Parse(a.ModelName, a.ModelSource); err == nil {
			title = m.Title
			pics = m.Outputs.Pictures
			view = pictureView(m.Domain, a.Problem)
		}
	}
	if o.kind != "" {
		k := o.kind
		if k == "lines" {
			k = model.FieldLines
		}
		pic := model.Picture{Kind: k, File: o.file, Width: o.width, ArrowLength: o.arrows}
		if pic.File == "" {
			pic.File = o.kind + ".png"
		}
		pics = []model.Picture{pic}
	} else if o.file != "" || o.arrows != "" {
		return &usageError{"--file and --arrows go with --kind"}
	}
	if len(pics) == 0 {
		return &usageError{"the archived model lists no pictures; choose one with --kind"}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("creating the output directory: %w", err)
	}
	var names []string
	for _, pic := range pics {
		if err := ctx.Err(); err != nil {
			return err
		}
		if o.log {
			pic.LogScale = true
		}
		out := filepath.Join(dir, pic.File)
		if err := drawPicture(out, sol, a.Problem, pic, title, unit, view); err != nil {
			return err
		}
		names = append(names, pic.File)
	}
	fmt.Fprintf(e.stdout, "wrote %s to %s\n", strings.Join(names, ", "), dir)
	return nil
}

// pictureView returns the part of the solved problem p a picture shows:
// the domain as the model file gives it when open sides were extended
// beyond it, or the zero Rect (the whole domain) otherwise.
func pictureView(written bc.Rect, p *bc.Problem) bc.Rect {
	if p == nil || written == (bc.Rect{}) || written == p.Domain {
		return bc.Rect{}
	}
	return written
}

// drawPicture draws one model picture request to path, showing the part
// view of the domain (the zero Rect for all of it).
func drawPicture(path string, sol *field.Solution, p *bc.Problem, pic model.Picture, title string, u model.Unit, view bc.Rect) error {
	o := plot.Options{Width: pic.Width, Height: pic.Height, Levels: pic.Contours, Lines: pic.Lines, Title: title,
		Unit: plot.Unit{Name: u.Name, Scale: u.Scale}, LogScale: pic.LogScale, View: view}
	switch pic.Kind {
	case model.PotentialMap:
		o.Kind = plot.Potential
	case model.FieldMap:
		o.Kind = plot.FieldMagnitude
	case model.FieldArrows:
		o.Kind = plot.Arrows
		switch pic.ArrowLength {
		case "", model.ArrowsScaled, "true":
			o.ArrowMode = plot.TrueLength
		case model.ArrowsLog:
			o.ArrowMode = plot.LogLength
		case model.ArrowsUniform, "equal":
			o.ArrowMode = plot.EqualLength
		default:
			return &usageError{fmt.Sprintf("unknown arrow length mode %q; use true, log or equal", pic.ArrowLength)}
		}
	case model.FieldLines:
		o.Kind = plot.FieldLines
	default:
		return &usageError{fmt.Sprintf("unknown picture kind %q; use potential, field, arrows or lines", pic.Kind)}
	}
	if err := plot.Save(path, sol, p, o); err != nil {
		return fmt.Errorf("drawing %s: %w", path, err)
	}
	return nil
}
