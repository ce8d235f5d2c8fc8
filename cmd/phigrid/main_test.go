package main

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/io/export"
	"github.com/phigrid/phigrid/io/report"
	"github.com/phigrid/phigrid/solve"
)

// runCLI runs the command line and returns its exit status and outputs.
func runCLI(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errw bytes.Buffer
	code := run(context.Background(), args, &env{stdout: &out, stderr: &errw})
	return code, out.String(), errw.String()
}

func example(name string) string {
	return filepath.Join("..", "..", "examples", name, name+".toml")
}

func TestHelpAndVersion(t *testing.T) {
	for _, c := range []struct {
		args  []string
		code  int
		want  string
		onErr bool
	}{
		{nil, exitUsage, "usage: phigrid COMMAND", true},
		{[]string{"help"}, exitOK, "export-matrix", false},
		{[]string{"help", "solve"}, exitOK, "usage: phigrid solve MODEL", false},
		{[]string{"solve", "-h"}, exitOK, "-json", false},
		{[]string{"version"}, exitOK, "phigrid " + version, false},
		{[]string{"frobnicate"}, exitUsage, `unknown command "frobnicate"`, true},
		{[]string{"help", "frobnicate"}, exitUsage, `unknown command "frobnicate"`, true},
		{[]string{"solve"}, exitUsage, "needs exactly one model file", true},
		{[]string{"solve", "--bogus", "x.toml"}, exitUsage, "flag provided but not defined", true},
		{[]string{"check", "does-not-exist.toml"}, exitUsage, "does-not-exist.toml", true},
	} {
		code, out, errs := runCLI(t, c.args...)
		got := out
		if c.onErr {
			got = errs
		}
		if code != c.code || !strings.Contains(got, c.want) {
			t.Errorf("phigrid %v: exit %d, output %q; want exit %d and %q", c.args, code, got, c.code, c.want)
		}
	}
}

var exampleNames = []string{"coax", "twinax", "microstrip", "bushing", "touchpad", "sphere"}

func TestCheckExamples(t *testing.T) {
	for _, name := range exampleNames {
		code, out, errs := runCLI(t, "check", example(name))
		if code != exitOK || !strings.Contains(out, "model is valid") || !strings.Contains(out, "memory") {
			t.Errorf("check %s: exit %d\n%s%s", name, code, out, errs)
		}
	}
}

// TestSolveExamples solves every shipped example through the command and
// checks the JSON report: converged, one capacitance row per conductor,
// symmetric within the tolerance, with the safety caution present.
func TestSolveExamples(t *testing.T) {
	for _, name := range exampleNames {
		code, out, errs := runCLI(t, "solve", "-q", "--json", "--no-files", example(name))
		if code != exitOK {
			t.Errorf("%s: exit %d: %s", name, code, errs)
			continue
		}
		r, err := report.ReadJSON(strings.NewReader(out))
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if r.Solver.Status != "converged" || r.Caution == "" {
			t.Errorf("%s: status %q, caution %q", name, r.Solver.Status, r.Caution)
		}
		for i, ci := range r.Conductors {
			if len(ci.Capacitance) != len(r.Conductors) || !(ci.Capacitance[i] > 0) {
				t.Errorf("%s: conductor %s has capacitance row %v", name, ci.Name, ci.Capacitance)
				continue
			}
			for j, cj := range r.Conductors {
				if d := math.Abs(ci.Capacitance[j] - cj.Capacitance[i]); d > 1e-6*ci.Capacitance[i] {
					t.Errorf("%s: C[%d][%d] = %g but C[%d][%d] = %g", name, i, j, ci.Capacitance[j], j, i, cj.Capacitance[i])
				}
			}
		}
	}
}

// TestSolveCoax runs the README's command on the coax and checks the
// report against the closed form C' = 2πε0/ln(b/a) (Ramo, Whinnery & Van
// Duzer, Fields and Waves in Communication Electronics, 1994).
func TestSolveCoax(t *testing.T) {
	dir := t.TempDir()
	code, out, errs := runCLI(t, "solve", "-q", "-o", dir, example("coax"))
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.Contains(out, "Capacitance matrix") || !strings.Contains(out, "Caution") {
		t.Errorf("report lacks the capacitance matrix or the caution:\n%s", out)
	}
	if errs != "" {
		t.Errorf("-q printed progress: %q", errs)
	}
	f, err := os.Open(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r, err := report.ReadJSON(f)
	if err != nil {
		t.Fatal(err)
	}
	want := 2 * math.Pi * solve.Eps0 / math.Log(3)
	if got := r.Conductors[0].Capacitance[0]; math.Abs(got/want-1) > 1e-3 {
		t.Errorf("C' = %g, want %g within 0.1 %%", got, want)
	}
	for _, name := range []string{"report.json", "conductors.csv", "probes.csv", "cuts.csv", "result.pga", "potential.png", "field.svg"} {
		if _, err := os.Stat(filepath.Join(dir, name)); err != nil {
			t.Errorf("missing output %s: %v", name, err)
		}
	}
	assertNoTemp(t, dir)

	// The JSON report on stdout is the same report.
	code, out, _ = runCLI(t, "solve", "-q", "--json", "--no-files", example("coax"))
	if code != exitOK {
		t.Fatalf("--json: exit %d", code)
	}
	var js map[string]any
	if err := json.Unmarshal([]byte(out), &js); err != nil {
		t.Fatalf("--json output is not JSON: %v", err)
	}

	// plot redraws from the archive without solving.
	pd := t.TempDir()
	code, out, errs = runCLI(t, "plot", "-o", pd, filepath.Join(dir, "result.pga"))
	if code != exitOK {
		t.Fatalf("plot: exit %d: %s", code, errs)
	}
	for _, name := range []string{"potential.png", "field.svg"} {
		if _, err := os.Stat(filepath.Join(pd, name)); err != nil {
			t.Errorf("plot did not write %s (%s)", name, out)
		}
	}
	code, _, errs = runCLI(t, "plot", "-o", pd, "--kind", "lines", "--file", "lines.svg", filepath.Join(dir, "result.pga"))
	if code != exitOK {
		t.Errorf("plot --kind lines: exit %d: %s", code, errs)
	}
}

// TestBrokenModels runs every model of testdata/broken: each must fail
// with exit status 2, a message of its own that names the file, and no
// output written.
func TestBrokenModels(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "broken", "*.toml"))
	if err != nil || len(files) < 8 {
		t.Fatalf("found %d broken models (%v)", len(files), err)
	}
	seen := map[string]string{}
	for _, f := range files {
		dir := filepath.Join(t.TempDir(), "out")
		code, out, errs := runCLI(t, "solve", "-q", "-o", dir, f)
		if code != exitUsage {
			t.Errorf("%s: exit %d, want %d (stdout %q)", f, code, exitUsage, out)
		}
		msg := strings.TrimSpace(errs)
		if !strings.Contains(msg, filepath.Base(f)) || strings.Count(msg, "\n") > 1 {
			t.Errorf("%s: message should name the file in one or two lines, got %q", f, msg)
		}
		if prev, ok := seen[msg]; ok {
			t.Errorf("%s and %s fail with the same message", prev, f)
		}
		seen[msg] = f
		if _, err := os.Stat(dir); !os.IsNotExist(err) {
			t.Errorf("%s: output directory was created", f)
		}
		if code, _, _ := runCLI(t, "check", f); code != exitUsage {
			t.Errorf("check %s: exit %d, want %d", f, code, exitUsage)
		}
	}
}

// TestExportMatrix checks that the exported system is the one phigrid
// solves: phigrid's own solution restricted to the unknowns satisfies
// A·x = b from the files.
func TestExportMatrix(t *testing.T) {
	dir := t.TempDir()
	code, _, errs := runCLI(t, "export-matrix", "-o", dir, example("touchpad"))
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	read := func(name string) *os.File {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { f.Close() })
		return f
	}
	a, err := export.ReadMatrixMarket(read("A.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	b, err := export.ReadMatrixMarketVector(read("b.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	p, err := prepare(example("touchpad"))
	if err != nil {
		t.Fatal(err)
	}
	v := make([]float64, len(p.model.Problem.Conductors))
	for k, c := range p.model.Problem.Conductors {
		v[k] = c.Potential
	}
	full := p.sys.RHS(nil, v, true, true)
	phi := make([]float64, p.sys.Len())
	if _, err := solve.Solve(context.Background(), p.sys, full, phi, &solve.Settings{Tol: 1e-12}); err != nil {
		t.Fatal(err)
	}
	x := p.sys.FreeVector(nil, phi)
	if a.Rows != len(x) || len(b) != len(x) {
		t.Fatalf("sizes: A %d×%d, b %d, unknowns %d", a.Rows, a.Cols, len(b), len(x))
	}
	ax := make([]float64, len(x))
	for n := range a.V {
		ax[a.I[n]] += a.V[n] * x[a.J[n]]
	}
	var num, den float64
	for i := range ax {
		num += (ax[i] - b[i]) * (ax[i] - b[i])
		den += b[i] * b[i]
	}
	if rel := math.Sqrt(num / den); rel > 1e-9 {
		t.Errorf("‖A·x − b‖/‖b‖ = %g with phigrid's solution", rel)
	}
}

func assertNoTemp(t *testing.T, dir string) {
	t.Helper()
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.Contains(e.Name(), ".tmp") || strings.HasPrefix(e.Name(), ".") {
			t.Errorf("temporary file left behind: %s", e.Name())
		}
	}
}

func TestBenchSmall(t *testing.T) {
	code, out, errs := runCLI(t, "bench", "-q", "--max-nodes", "5000", "--sizes", "33,65", "--examples", "", "--json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var r struct {
		Rows []struct {
			Case       string  `json:"case"`
			Solver     string  `json:"solver"`
			Iterations int     `json:"iterations"`
			Residual   float64 `json:"relative_residual"`
		} `json:"rows"`
	}
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("bench --json: %v\n%s", err, out)
	}
	if len(r.Rows) != 6 {
		t.Fatalf("got %d rows, want 2 sizes × 3 solvers", len(r.Rows))
	}
	for _, row := range r.Rows {
		if row.Residual > 1e-8 || row.Iterations < 1 {
			t.Errorf("%s %s: residual %g after %d iterations", row.Case, row.Solver, row.Residual, row.Iterations)
		}
	}
}
