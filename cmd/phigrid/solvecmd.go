package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"github.com/phigrid/phigrid/field"
	"github.com/phigrid/phigrid/io/archive"
	"github.com/phigrid/phigrid/io/export"
	"github.com/phigrid/phigrid/io/model"
	"github.com/phigrid/phigrid/io/report"
	"github.com/phigrid/phigrid/solve"
)

type solveOptions struct {
	out     string
	json    bool
	quiet   bool
	method  string
	workers int
	noFiles bool
	errors  int
}

func init() {
	register(&command{
		name:    "solve",
		args:    "MODEL [-o DIR] [--json] [-q]",
		summary: "solve a model, print its report and write the requested outputs",
		help: `solve solves the model for its potentials, computes the capacitance matrix of
its conductors (one solve per conductor, sharing one solver set-up), prints the
report to stdout, and writes the outputs the model's [output] table asks for
into DIR: report.json, CSV tables, NPY arrays, a VTK file, the result archive
(result.pga, which 'phigrid plot' redraws from) and pictures.

DIR defaults to the model's output.directory (relative to the model file) or,
without one, to NAME-results in the current directory. Files are written
under temporary names and renamed when complete, so a failed or cancelled run
(Ctrl-C) leaves no partial file. Progress goes to stderr.

--errors N adds an error estimate to every integral quantity and peak field:
the model is also solved on N−1 coarser grids (each with twice the cell size
of the next), and the report gives the observed order of convergence, the
Richardson-extrapolated value and an error band (grid convergence index) per
quantity. N = 3 gives an observed order; N = 2 assumes second order with a
larger safety factor. The coarser grids cost about a third more time.

Exit status: 0 on success, 1 when the solve fails, 2 on bad usage or input.`,
		flags: func(fs *flag.FlagSet) any {
			o := &solveOptions{}
			fs.StringVar(&o.out, "o", "", "write output files into `DIR`")
			fs.BoolVar(&o.json, "json", false, "print the report as JSON instead of text")
			fs.BoolVar(&o.quiet, "q", false, "no progress on stderr")
			fs.StringVar(&o.method, "method", "", "override the model's solver: mg-pcg, mg, cg or sor")
			fs.IntVar(&o.workers, "workers", 0, "limit the solver to `N` goroutines (0: all cores)")
			fs.BoolVar(&o.noFiles, "no-files", false, "print the report only; write no files")
			fs.IntVar(&o.errors, "errors", 0, "estimate errors from a study on `N` nested grids (2 or 3; 0: none)")
			return o
		},
		run: runSolve,
	})
}

func runSolve(ctx context.Context, e *env, fs *flag.FlagSet, opts any) error {
	o := opts.(*solveOptions)
	if fs.NArg() != 1 {
		return &usageError{"solve needs exactly one model file"}
	}
	if o.workers < 0 {
		return &usageError{"--workers must be ≥ 0"}
	}
	if o.errors != 0 && (o.errors < 2 || o.errors > 3) {
		return &usageError{"--errors takes 2 or 3 grids"}
	}
	p, err := prepare(fs.Arg(0))
	if err != nil {
		return err
	}
	set, err := p.settings(o.method, o.workers)
	if err != nil {
		return err
	}
	tol := set.Tol
	if tol == 0 {
		tol = solve.DefaultTol
	}
	prog := newProgress(e.stderr, e.tty, o.quiet, tol)
	set.Progress = prog.update
	prog.note("%s: %d × %d nodes, %d unknowns", p.model.Name, p.grid.Nx(), p.grid.Ny(), p.bcmap.FreeNodes())

	res, err := solveModel(ctx, p, set, prog, o.errors)
	if err != nil {
		return err
	}
	var out bytes.Buffer
	if o.json {
		err = res.report.WriteJSON(&out)
	} else {
		err = res.report.WriteText(&out)
	}
	if err != nil {
		return err
	}
	if !o.noFiles {
		dir := outputDir(p.model, o.out)
		files, err := writeOutputs(ctx, dir, p, res)
		if err != nil {
			return err
		}
		if len(files) > 0 {
			prog.note("wrote %d files to %s: %s", len(files), dir, strings.Join(files, ", "))
		}
	}
	_, err = e.stdout.Write(out.Bytes())
	return err
}

// solved is a model's solution with its report.
type solved struct {
	sol    *field.Solution
	c      [][]float64
	report *report.Report
}

// solveModel solves the potentials and the capacitance matrix with one
// solver set-up and builds the report.
func solveModel(ctx context.Context, p *prepared, set solve.Settings, prog *progress, levels int) (*solved, error) {
	s, err := solve.NewSolver(p.sys, &set)
	if err != nil {
		return nil, &usageError{err.Error()}
	}
	defer s.Close()
	counting := &countingSolver{Solver: s, prog: prog, total: 1 + len(p.model.Problem.Conductors)}
	sol, err := field.SolveSystem(ctx, p.sys, counting)
	if err != nil {
		return nil, err
	}
	c := sol.Capacitance
	if c == nil && len(p.model.Problem.Conductors) > 0 {
		var rs []*solve.Result
		c, rs, err = field.CapacitanceMatrixWith(ctx, p.sys, counting)
		if err != nil {
			return nil, err
		}
		sol.Results = append(sol.Results, rs...)
	}
	// Surface fields from the Shortley–Weller-corrected potential converge
	// at second order; the correction is one more solve.
	if err := sol.RefineSurface(ctx, &set); err != nil {
		return nil, err
	}
	m := p.model
	opts := report.BuildOptions{
		Title:      m.Title,
		Source:     m.Name,
		Unit:       report.Unit{Name: m.Unit.Name, Scale: m.Unit.Scale},
		Background: m.Background,
	}
	if levels > 0 {
		prog.note("error estimate: solving on %d coarser grids", levels-1)
		coarse := m.Mesh
		f := math.Pow(2, float64(levels-1))
		coarse.Cell *= f
		ratio := coarse.Ratio
		if ratio == 0 {
			ratio = 1.2
		}
		coarse.Ratio = math.Min(3, math.Pow(ratio, f))
		fset := &field.Settings{Solver: set}
		fset.Solver.Progress = nil
		conv, err := field.Converge(ctx, m.Problem, coarse, levels, fset)
		if err != nil {
			return nil, err
		}
		opts.Convergence = conv
	}
	for _, pr := range m.Outputs.Probes {
		opts.Probes = append(opts.Probes, report.Point{Name: pr.Name, X: pr.X, Y: pr.Y})
	}
	for _, cut := range m.Outputs.Cuts {
		opts.Cuts = append(opts.Cuts, report.Line{Name: cut.Name, X0: cut.X0, Y0: cut.Y0, X1: cut.X1, Y1: cut.Y1, Samples: cut.Samples})
	}
	r, err := report.Build(sol, c, opts)
	if err != nil {
		return nil, err
	}
	return &solved{sol: sol, c: c, report: r}, nil
}

// countingSolver labels each solve for the progress display.
type countingSolver struct {
	solve.Solver
	prog  *progress
	n     int
	total int
}

func (c *countingSolver) Solve(ctx context.Context, b, x []float64) (*solve.Result, error) {
	c.n++
	c.prog.begin(fmt.Sprintf("solve %d/%d", c.n, max(c.total, c.n)))
	r, err := c.Solver.Solve(ctx, b, x)
	c.prog.end(r)
	return r, err
}

// outputDir is the -o flag, else the model's output directory relative to
// the model file, else NAME-results in the working directory.
func outputDir(m *model.Model, flagDir string) string {
	if flagDir != "" {
		return flagDir
	}
	if m.Outputs.Dir != "" {
		if filepath.IsAbs(m.Outputs.Dir) {
			return m.Outputs.Dir
		}
		return filepath.Join(filepath.Dir(m.Name), m.Outputs.Dir)
	}
	base := strings.TrimSuffix(filepath.Base(m.Name), filepath.Ext(m.Name))
	return base + "-results"
}

// writeOutputs writes every output the model asks for into dir and
// returns the file names written. Each file is written atomically; a
// cancelled context stops before the next file.
func writeOutputs(ctx context.Context, dir string, p *prepared, res *solved) ([]string, error) {
	o := p.model.Outputs
	type job struct {
		name  string
		write func(path string) error
	}
	var jobs []job
	add := func(name string, w func(io.Writer) error) {
		jobs = append(jobs, job{name, func(path string) error { return export.AtomicWriteFile(path, w) }})
	}
	if o.Report {
		add("report.json", res.report.WriteJSON)
	}
	if o.CSV {
		add("conductors.csv", res.report.WriteConductorsCSV)
		if len(res.report.Probes) > 0 {
			add("probes.csv", res.report.WriteProbesCSV)
		}
		if len(res.report.Cuts) > 0 {
			add("cuts.csv", res.report.WriteCutsCSV)
		}
	}
	fields := func() export.Fields {
		sol := res.sol
		ex, ey := sol.NodeFieldTo(nil, nil)
		return export.Fields{
			Point:        map[string][]float64{"phi": sol.Phi, "emag": field.Magnitude(nil, ex, ey)},
			PointVectors: map[string][2][]float64{"e": {ex, ey}},
			Cell:         map[string][]float64{"eps_r": sol.Map.Eps},
		}
	}
	if o.NPY {
		jobs = append(jobs, job{"npy/", func(path string) error {
			_, err := export.WriteNPYSet(path, p.grid, fields())
			return err
		}})
	}
	if o.VTK {
		add("solution.vtr", func(w io.Writer) error { return export.WriteVTR(w, p.grid, fields()) })
	}
	if o.Archive || len(o.Pictures) > 0 {
		a := archive.FromSolution(res.sol)
		a.ModelName = p.model.Name
		a.ModelSource = p.model.Source
		a.Problem = p.model.Problem
		a.Unit = archive.Unit{Name: p.model.Unit.Name, Scale: p.model.Unit.Scale}
		var rep bytes.Buffer
		if err := res.report.WriteJSON(&rep); err != nil {
			return nil, err
		}
		a.Report = rep.Bytes()
		jobs = append(jobs, job{"result.pga", func(path string) error { return archive.Save(path, a) }})
	}
	for _, pic := range o.Pictures {
		pic := pic
		jobs = append(jobs, job{pic.File, func(path string) error {
			return drawPicture(path, res.sol, p.model.Problem, pic, p.model.Title, p.model.Unit, pictureView(p.model.Domain, p.model.Problem))
		}})
	}
	if len(jobs) == 0 {
		return nil, nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("creating the output directory: %w", err)
	}
	var names []string
	for _, j := range jobs {
		if err := ctx.Err(); err != nil {
			return names, err
		}
		if err := j.write(filepath.Join(dir, strings.TrimSuffix(j.name, "/"))); err != nil {
			return names, fmt.Errorf("writing %s: %w", filepath.Join(dir, j.name), err)
		}
		names = append(names, j.name)
	}
	return names, nil
}
