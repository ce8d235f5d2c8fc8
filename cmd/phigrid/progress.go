package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"sync"
	"time"

	"github.com/phigrid/phigrid/solve"
)

// progress shows solver progress on stderr: a redrawn bar on a terminal,
// plain lines otherwise, nothing when quiet.
type progress struct {
	w     io.Writer
	tty   bool
	quiet bool
	tol   float64

	mu      sync.Mutex
	label   string
	start   time.Time
	last    time.Time
	first   float64 // residual at the first report of the current solve
	drawn   bool
	minGap  time.Duration
	started time.Time
}

func newProgress(w io.Writer, tty, quiet bool, tol float64) *progress {
	gap := 2 * time.Second
	if tty {
		gap = 100 * time.Millisecond
	}
	return &progress{w: w, tty: tty, quiet: quiet, tol: tol, minGap: gap, started: time.Now()}
}

// begin starts a new solve with a label such as "potential" or
// "capacitance 2/3".
func (p *progress) begin(label string) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.label, p.start, p.first = label, time.Now(), 0
	p.last = time.Time{}
}

// update is the solver's progress callback.
func (p *progress) update(s solve.Progress) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.first == 0 {
		p.first = s.Residual
	}
	now := time.Now()
	if now.Sub(p.last) < p.minGap {
		return
	}
	p.last = now
	frac, eta := p.estimate(s)
	if p.tty {
		const width = 24
		n := int(math.Round(frac * width))
		bar := strings.Repeat("█", n) + strings.Repeat("·", width-n)
		line := fmt.Sprintf("\r%-16s %s it %5d  res %.2e  %s", p.label, bar, s.Iteration, s.Residual, clock(s.Elapsed))
		if eta > 0 {
			line += " / ~" + clock(s.Elapsed+eta)
		}
		fmt.Fprint(p.w, line+"\x1b[K")
		p.drawn = true
		return
	}
	fmt.Fprintf(p.w, "%s: iteration %d, relative residual %.3e, %s elapsed\n", p.label, s.Iteration, s.Residual, clock(s.Elapsed))
}

// estimate returns the fraction done (by residual reduction on a log
// scale) and the time left at the observed rate.
func (p *progress) estimate(s solve.Progress) (float64, time.Duration) {
	if p.first <= 0 || s.Residual <= 0 || p.tol <= 0 || p.first <= p.tol {
		return 0, 0
	}
	total := math.Log(p.first / p.tol)
	done := math.Log(p.first / s.Residual)
	frac := math.Max(0, math.Min(1, done/total))
	if frac <= 0 {
		return 0, 0
	}
	eta := time.Duration(float64(s.Elapsed) * (1 - frac) / frac)
	return frac, eta
}

// end finishes the current solve's line.
func (p *progress) end(r *solve.Result) {
	if p.quiet || r == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.tty && p.drawn {
		fmt.Fprint(p.w, "\r\x1b[K")
		p.drawn = false
	}
	fmt.Fprintf(p.w, "%s: %v after %d iterations, relative residual %.2e, %s\n", p.label, r.Status, r.Iterations, r.Residual, clock(r.Setup+r.Elapsed))
}

// note prints a plain progress message.
func (p *progress) note(format string, args ...any) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.tty && p.drawn {
		fmt.Fprint(p.w, "\r\x1b[K")
		p.drawn = false
	}
	fmt.Fprintf(p.w, format+"\n", args...)
}

func clock(d time.Duration) string {
	if d < time.Second {
		return fmt.Sprintf("%.0f ms", float64(d)/float64(time.Millisecond))
	}
	if d < time.Minute {
		return fmt.Sprintf("%.1f s", d.Seconds())
	}
	return fmt.Sprintf("%dm%02ds", int(d.Minutes()), int(d.Seconds())%60)
}
