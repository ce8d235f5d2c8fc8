package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"

	"github.com/phigrid/phigrid/io/export"
)

func init() {
	register(&command{
		name:    "export-matrix",
		args:    "MODEL [-o DIR]",
		summary: "write the assembled linear system in Matrix Market format",
		help: `export-matrix assembles the model exactly as solve does and writes the
symmetric positive-definite system over the unknown (free) node potentials,
so that any linear-algebra tool can solve the same system:

  A.mtx        the matrix, coordinate real symmetric (lower triangle), F/m or F
  b.mtx        the right-hand side for the model's potentials and charges, C/m or C
  b-NAME.mtx   the right-hand side for conductor NAME at 1 V, all else 0 V
  unknowns.csv the grid node (i, j) and position (x, y in metres) of every unknown

Row k of A and b is unknown k of unknowns.csv. DIR defaults to NAME-matrix.`,
		flags: func(fs *flag.FlagSet) any {
			var out string
			fs.StringVar(&out, "o", "", "write the files into `DIR`")
			return &out
		},
		run: runExportMatrix,
	})
}

func runExportMatrix(ctx context.Context, e *env, fs *flag.FlagSet, opts any) error {
	if fs.NArg() != 1 {
		return &usageError{"export-matrix needs exactly one model file"}
	}
	p, err := prepare(fs.Arg(0))
	if err != nil {
		return err
	}
	dir := *opts.(*string)
	if dir == "" {
		dir = trimExt(filepath.Base(p.model.Name)) + "-matrix"
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("creating the output directory: %w", err)
	}
	index, n := p.sys.FreeIndex()
	comment := fmt.Sprintf("phigrid %s: %s, %d unknowns on a %d × %d grid", version, p.model.Name, n, p.sys.Nx, p.sys.Ny)
	write := func(name string, w func(io.Writer) error) error {
		if err := ctx.Err(); err != nil {
			return err
		}
		if err := export.AtomicWriteFile(filepath.Join(dir, name), w); err != nil {
			return fmt.Errorf("writing %s: %w", filepath.Join(dir, name), err)
		}
		fmt.Fprintf(e.stdout, "wrote %s\n", filepath.Join(dir, name))
		return nil
	}
	if err := write("A.mtx", func(w io.Writer) error {
		return export.WriteMatrixMarket(w, n, p.sys.Entries, true, comment)
	}); err != nil {
		return err
	}
	v := make([]float64, len(p.model.Problem.Conductors))
	for k, c := range p.model.Problem.Conductors {
		v[k] = c.Potential
	}
	b := p.sys.RHS(nil, v, true, true)
	if err := write("b.mtx", func(w io.Writer) error {
		return export.WriteMatrixMarketVector(w, p.sys.FreeVector(nil, b), comment+"; right-hand side of the model")
	}); err != nil {
		return err
	}
	for k, c := range p.model.Problem.Conductors {
		clear(v)
		v[k] = 1
		bk := p.sys.RHS(nil, v, false, false)
		if err := write("b-"+c.Name+".mtx", func(w io.Writer) error {
			return export.WriteMatrixMarketVector(w, p.sys.FreeVector(nil, bk), comment+"; conductor "+c.Name+" at 1 V")
		}); err != nil {
			return err
		}
	}
	return write("unknowns.csv", func(w io.Writer) error {
		x, y := p.grid.X(), p.grid.Y()
		rows := make([][]string, 0, n)
		for node, k := range index {
			if k < 0 {
				continue
			}
			i, j := node%p.sys.Nx, node/p.sys.Nx
			rows = append(rows, []string{strconv.Itoa(int(k) + 1), strconv.Itoa(i), strconv.Itoa(j), export.FormatFloat(x[i]), export.FormatFloat(y[j])})
		}
		return export.WriteCSV(w, []string{"unknown", "i", "j", "x_m", "y_m"}, rows)
	})
}

func trimExt(name string) string { return name[:len(name)-len(filepath.Ext(name))] }
