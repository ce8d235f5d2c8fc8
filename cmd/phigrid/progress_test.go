package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/phigrid/phigrid/solve"
)

func TestProgressTerminalBar(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(&buf, true, false, 1e-10)
	p.minGap = 0
	p.begin("solve 1/2")
	p.update(solve.Progress{Iteration: 1, Residual: 1e-2, Elapsed: 10 * time.Millisecond})
	p.update(solve.Progress{Iteration: 5, Residual: 1e-6, Elapsed: 50 * time.Millisecond})
	p.end(&solve.Result{Status: solve.Converged, Iterations: 9, Residual: 5e-11, Elapsed: 90 * time.Millisecond})
	out := buf.String()
	// Half-way on a log scale from 1e-2 to 1e-10: 12 of 24 cells filled,
	// and 50 ms elapsed predicts 100 ms in all.
	if !strings.Contains(out, strings.Repeat("█", 12)+strings.Repeat("·", 12)) || !strings.Contains(out, "/ ~100 ms") {
		t.Errorf("bar not drawn as expected:\n%q", out)
	}
	if !strings.Contains(out, "\r\x1b[K") || !strings.Contains(out, "converged after 9 iterations") {
		t.Errorf("bar not cleared before the summary:\n%q", out)
	}
}

func TestProgressPlainAndQuiet(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(&buf, false, false, 1e-8)
	p.begin("solve 1/1")
	p.update(solve.Progress{Iteration: 1, Residual: 1e-3})
	if out := buf.String(); strings.ContainsAny(out, "\r\x1b") || !strings.Contains(out, "iteration 1") {
		t.Errorf("plain progress should be lines without control characters: %q", out)
	}
	buf.Reset()
	q := newProgress(&buf, true, true, 1e-8)
	q.begin("x")
	q.update(solve.Progress{Iteration: 1, Residual: 1})
	q.note("hello")
	if buf.Len() != 0 {
		t.Errorf("quiet progress printed %q", buf.String())
	}
}

// TestCancelledSolveWritesNothing: an interrupted solve (Ctrl-C cancels
// the context) exits with status 1 and leaves no output behind.
func TestCancelledSolveWritesNothing(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	var out, errw bytes.Buffer
	code := run(ctx, []string{"solve", "-q", "-o", dir, example("coax")}, &env{stdout: &out, stderr: &errw})
	if code != exitSolve || !strings.Contains(errw.String(), "cancelled") {
		t.Errorf("exit %d, stderr %q; want exit 1 and a cancellation message", code, errw.String())
	}
	if _, err := os.Stat(dir); !os.IsNotExist(err) {
		t.Errorf("a cancelled solve created %s", dir)
	}
	if out.Len() != 0 {
		t.Errorf("a cancelled solve printed a report")
	}
}
