package main

import (
	"bytes"
	"strconv"
	"strings"
	"testing"
)

// TestRun checks that every printed relative error is small: the closed
// forms are those of a coaxial line (Ramo, Whinnery & Van Duzer; values in
// Fields and Waves in Communication Electronics, 1994).
func TestRun(t *testing.T) {
	var buf bytes.Buffer
	if err := run(&buf, 81); err != nil {
		t.Fatal(err)
	}
	rows := 0
	for _, line := range strings.Split(buf.String(), "\n") {
		f := strings.Fields(line)
		if len(f) < 4 || !strings.Contains(line, "(") {
			continue
		}
		e, err := strconv.ParseFloat(f[len(f)-1], 64)
		if err != nil {
			continue
		}
		rows++
		if e > 2e-3 || e < -2e-3 {
			t.Errorf("%s: relative error %g above 2e-3", line, e)
		}
	}
	if rows != 5 {
		t.Errorf("found %d comparison rows, want 5:\n%s", rows, buf.String())
	}
}
