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
	"github.com/phigrid/phigrid/solve"
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
	fs2 := freeSystem(p.sys)
	comment := fmt.Sprintf("phigrid %s: %s, %d unknowns on a %d × %d grid", version, p.model.Name, fs2.n, p.sys.Nx, p.sys.Ny)
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
		return export.WriteMatrixMarket(w, fs2.n, fs2.entries, true, comment)
	}); err != nil {
		return err
	}
	v := make([]float64, len(p.model.Problem.Conductors))
	for k, c := range p.model.Problem.Conductors {
		v[k] = c.Potential
	}
	b := p.sys.RHS(nil, v, true, true)
	if err := write("b.mtx", func(w io.Writer) error {
		return export.WriteMatrixMarketVector(w, fs2.restrict(b), comment+"; right-hand side of the model")
	}); err != nil {
		return err
	}
	for k, c := range p.model.Problem.Conductors {
		clear(v)
		v[k] = 1
		bk := p.sys.RHS(nil, v, false, false)
		if err := write("b-"+c.Name+".mtx", func(w io.Writer) error {
			return export.WriteMatrixMarketVector(w, fs2.restrict(bk), comment+"; conductor "+c.Name+" at 1 V")
		}); err != nil {
			return err
		}
	}
	return write("unknowns.csv", func(w io.Writer) error {
		x, y := p.grid.X(), p.grid.Y()
		rows := make([][]string, 0, fs2.n)
		for k, n := range fs2.nodes {
			i, j := n%p.sys.Nx, n/p.sys.Nx
			rows = append(rows, []string{strconv.Itoa(k + 1), strconv.Itoa(i), strconv.Itoa(j), export.FormatFloat(x[i]), export.FormatFloat(y[j])})
		}
		return export.WriteCSV(w, []string{"unknown", "i", "j", "x_m", "y_m"}, rows)
	})
}

// free is the system restricted to the free nodes, numbered in grid
// index order.
type free struct {
	sys   *solve.System
	n     int
	nodes []int   // grid index of every unknown
	num   []int32 // unknown number of every grid node, −1 when fixed
}

func freeSystem(s *solve.System) *free {
	f := &free{sys: s, num: make([]int32, s.Len())}
	for i, fixed := range s.Fixed {
		f.num[i] = -1
		if !fixed {
			f.num[i] = int32(len(f.nodes))
			f.nodes = append(f.nodes, i)
		}
	}
	f.n = len(f.nodes)
	return f
}

// entries emits the lower triangle of the free-node matrix: the diagonal
// and −coupling to the −X and −Y neighbours.
func (f *free) entries(emit func(i, j int, v float64)) {
	s := f.sys
	for k, n := range f.nodes {
		emit(k, k, s.Diag[n])
		if n%s.Nx > 0 {
			if m := f.num[n-1]; m >= 0 && s.AX[n-1] != 0 {
				emit(k, int(m), -s.AX[n-1])
			}
		}
		if n >= s.Nx {
			if m := f.num[n-s.Nx]; m >= 0 && s.AY[n-s.Nx] != 0 {
				emit(k, int(m), -s.AY[n-s.Nx])
			}
		}
	}
}

// restrict returns the free rows of a full-grid vector.
func (f *free) restrict(b []float64) []float64 {
	out := make([]float64, f.n)
	for k, n := range f.nodes {
		out[k] = b[n]
	}
	return out
}

func trimExt(name string) string { return name[:len(name)-len(filepath.Ext(name))] }
