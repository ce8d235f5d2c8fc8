package main

import (
	"context"
	"flag"
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/phigrid/phigrid/perf"
	"github.com/phigrid/phigrid/solve"
)

type benchOptions struct {
	maxNodes int
	json     bool
	solvers  string
	sizes    string
	examples string
	workers  int
	tol      float64
	quiet    bool
	repeat   int
}

func init() {
	register(&command{
		name:    "bench",
		args:    "[--max-nodes N] [--json] [MODEL ...]",
		summary: "run the solver benchmark ladder and print timings per case",
		help: `bench solves a fixed ladder of problems with each solver and prints, per case:
nodes, set-up and solve time, iterations, final relative residual, peak memory
per node and work units (solve time over the time of one residual evaluation
on the same grid, measured in the same run). The ladder is the unit-square
Poisson problem (every side at 0 V, uniform charge) at 257² … 4097² nodes and
the shipped examples (or the MODEL files given) on their own grids and on
refined ones, every case bounded by --max-nodes. SOR and CG run only up to
1025² nodes, beyond which they need thousands of iterations.

Timings on a shared machine are noisy: compare ratios measured in one run.`,
		flags: func(fs *flag.FlagSet) any {
			o := &benchOptions{}
			fs.IntVar(&o.maxNodes, "max-nodes", 1025*1025, "skip cases with more than `N` nodes (4097² runs the full ladder)")
			fs.BoolVar(&o.json, "json", false, "print the results as JSON")
			fs.StringVar(&o.solvers, "solvers", "", "comma-separated `LIST` of solvers (default sor,cg,mg-pcg)")
			fs.StringVar(&o.sizes, "sizes", "", "comma-separated unit-square `SIZES` in nodes per side (default 257,513,1025,2049,4097)")
			fs.StringVar(&o.examples, "examples", "examples", "`DIR` holding the example models (each DIR/NAME/NAME.toml); empty for none")
			fs.IntVar(&o.workers, "workers", 0, "limit every solve to `N` goroutines (0: all cores)")
			fs.Float64Var(&o.tol, "tol", 1e-8, "relative-residual `TOLERANCE`")
			fs.BoolVar(&o.quiet, "q", false, "no progress lines on stderr")
			fs.IntVar(&o.repeat, "repeat", 1, "run every set-up and solve `N` times and report the median times")
			return o
		},
		run: runBench,
	})
}

func runBench(ctx context.Context, e *env, fs *flag.FlagSet, opts any) error {
	o := opts.(*benchOptions)
	if o.maxNodes <= 0 || o.workers < 0 || !(o.tol > 0 && o.tol < 1) || o.repeat < 1 {
		return &usageError{"--max-nodes must be positive, --workers ≥ 0, --tol in (0, 1) and --repeat ≥ 1"}
	}
	po := perf.Options{MaxNodes: o.maxNodes, Workers: o.workers, Tol: o.tol, Repeat: o.repeat}
	if !o.quiet {
		po.Progress = e.stderr
	}
	if o.solvers != "" {
		for _, s := range strings.Split(o.solvers, ",") {
			m, err := solve.ParseMethod(strings.TrimSpace(s))
			if err != nil {
				return &usageError{err.Error()}
			}
			po.Solvers = append(po.Solvers, m)
		}
	}
	if o.sizes != "" {
		po.Sizes = []int{}
		for _, s := range strings.Split(o.sizes, ",") {
			n, err := strconv.Atoi(strings.TrimSpace(s))
			if err != nil || n < 3 {
				return &usageError{fmt.Sprintf("bad size %q: give nodes per side, at least 3", s)}
			}
			po.Sizes = append(po.Sizes, n)
		}
	}
	models := fs.Args()
	if len(models) == 0 && o.examples != "" {
		found, err := filepath.Glob(filepath.Join(o.examples, "*", "*.toml"))
		if err != nil {
			return &usageError{err.Error()}
		}
		models = found
	}
	po.Examples = models
	r, err := perf.Run(ctx, po)
	if err != nil {
		return &inputError{err}
	}
	if o.json {
		return r.WriteJSON(e.stdout)
	}
	return r.WriteText(e.stdout)
}
