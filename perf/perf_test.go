package perf

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/phigrid/phigrid/solve"
)

func TestRunLadder(t *testing.T) {
	var progress bytes.Buffer
	rep, err := Run(context.Background(), Options{
		Sizes:    []int{33, 65, 129},
		MaxNodes: 100 * 100,
		Progress: &progress,
	})
	if err != nil {
		t.Fatal(err)
	}
	// 33² and 65² with three solvers each; 129² is over the cap.
	if len(rep.Rows) != 6 || len(rep.Skipped) != 1 {
		t.Fatalf("%d rows and %d skipped, want 6 and 1: %v", len(rep.Rows), len(rep.Skipped), rep.Skipped)
	}
	for _, r := range rep.Rows {
		if r.Error != "" || r.Residual > rep.Tol || r.Iterations < 1 {
			t.Errorf("%s %s: residual %g after %d iterations, error %q", r.Case, r.Solver, r.Residual, r.Iterations, r.Error)
		}
		// Operator, two vectors and at least the solver's own vectors.
		if r.PeakBytesPerNode < 41 || r.PeakBytesPerNode > 400 {
			t.Errorf("%s %s: %g bytes per node", r.Case, r.Solver, r.PeakBytesPerNode)
		}
		if !(r.WorkUnits > 0) || !(r.ResidualS > 0) {
			t.Errorf("%s %s: work units %g, residual time %g", r.Case, r.Solver, r.WorkUnits, r.ResidualS)
		}
		if r.Unknowns >= r.Nodes || r.Unknowns <= 0 {
			t.Errorf("%s: %d unknowns of %d nodes", r.Case, r.Unknowns, r.Nodes)
		}
	}
	if got := strings.Count(progress.String(), "\n"); got != 6 {
		t.Errorf("%d progress lines, want 6", got)
	}
	var text bytes.Buffer
	if err := rep.WriteText(&text); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"unit-square 65²", "mg-pcg", "work units", "skipped: unit-square 129²"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("text report lacks %q:\n%s", want, text.String())
		}
	}
	var js bytes.Buffer
	if err := rep.WriteJSON(&js); err != nil {
		t.Fatal(err)
	}
	var back Report
	if err := json.Unmarshal(js.Bytes(), &back); err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(*rep, back, cmpopts.EquateApprox(1e-12, 0)); d != "" {
		t.Errorf("JSON round trip differs:\n%s", d)
	}
}

func TestSlowSolversCapped(t *testing.T) {
	rep, err := Run(context.Background(), Options{Sizes: []int{65}, SlowNodes: 1000})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Rows) != 1 || rep.Rows[0].Solver != solve.MGCG.String() || len(rep.Skipped) != 2 {
		t.Errorf("rows %v, skipped %v; want only mg-pcg", rep.Rows, rep.Skipped)
	}
}

func TestModelCases(t *testing.T) {
	const path = "../examples/coax/coax.toml"
	if _, err := os.Stat(path); err != nil {
		t.Skip("example model not found:", err)
	}
	cases, err := ModelCases(path, []int{129, 257}, 300*300)
	if err != nil {
		t.Fatal(err)
	}
	if len(cases) < 2 {
		t.Fatalf("%d cases from the coax model", len(cases))
	}
	for _, c := range cases {
		if !strings.HasPrefix(c.Name, "coax ") || c.Grid.Len() > 300*300 {
			t.Errorf("case %q with %d nodes", c.Name, c.Grid.Len())
		}
	}
	rep, err := Run(context.Background(), Options{Sizes: []int{}, Cases: cases[:1], Solvers: []solve.Method{solve.MGCG, solve.CG}})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rep.Rows {
		if r.Error != "" {
			t.Errorf("%s %s: %s", r.Case, r.Solver, r.Error)
		}
	}
}

func TestErrors(t *testing.T) {
	if _, err := ModelCases("no/such/model.toml", nil, 0); err == nil {
		t.Error("missing model file accepted")
	}
	if _, err := Run(context.Background(), Options{Tol: 2}); err == nil {
		t.Error("tolerance 2 accepted")
	}
	if _, err := UnitSquare(1); err == nil {
		t.Error("one-node unit square accepted")
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, Options{Sizes: []int{33}}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled run returned %v", err)
	}
}

func TestMedian(t *testing.T) {
	for _, c := range []struct {
		v    []float64
		want float64
	}{
		{nil, 0}, {[]float64{3}, 3}, {[]float64{3, 1, 2}, 2}, {[]float64{4, 1, 3, 2}, 2.5},
	} {
		if got := median(append([]float64(nil), c.v...)); got != c.want {
			t.Errorf("median(%v) = %g, want %g", c.v, got, c.want)
		}
	}
}
