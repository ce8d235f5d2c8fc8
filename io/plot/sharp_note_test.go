package plot

import (
	"bytes"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/field"
)

// TestFieldNoteNamesSharpEdge: when the largest field sits at a conductor
// feature that field marks as sharp, the footnote says the value is not a
// converged one; at a smooth body it keeps the general caution.
func TestFieldNoteNamesSharpEdge(t *testing.T) {
	for _, c := range []struct {
		reason string
		solved func(testing.TB) (*field.Solution, *bc.Problem)
		sharp  bool
	}{
		{"rectangle corner of a board trace", trace, true},
		{"smooth coax conductor", solvedCoax, false},
	} {
		sol, p := c.solved(t)
		var buf bytes.Buffer
		if err := Draw(&buf, "svg", sol, p, Options{Kind: FieldMagnitude, Width: 400}); err != nil {
			t.Fatalf("%s: %v", c.reason, err)
		}
		got := strings.Contains(buf.String(), "not a converged value")
		if got != c.sharp {
			t.Errorf("%s: footnote says not converged = %v, want %v", c.reason, got, c.sharp)
		}
	}
}
