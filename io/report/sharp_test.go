package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/phigrid/phigrid/bc"
)

// stripProblem is a 2 mm zero-thickness strip at 1 V in the middle of a
// grounded 4 mm box: its field peaks at the strip's knife edges.
func stripProblem() *bc.Problem {
	const mm = 1e-3
	p := &bc.Problem{
		Domain:     bc.Rect{X0: -2 * mm, Y0: -2 * mm, X1: 2 * mm, Y1: 2 * mm},
		Conductors: []bc.Conductor{{Name: "strip", Potential: 1}, {Name: "box"}},
		Regions:    []bc.Region{{Kind: bc.ConductorRegion, Conductor: "strip", Shape: bc.Strip{X0: -1 * mm, Y0: 0, X1: 1 * mm, Y1: 0}}},
	}
	for s := range p.Sides {
		p.Sides[s] = bc.Side{Kind: bc.Fixed, Conductor: "box"}
	}
	return p
}

// TestSharpEdgeNote: a peak at a knife edge is flagged in the report,
// printed with a note beside its position and kept in the JSON; a peak on
// the smooth walls is not.
func TestSharpEdgeNote(t *testing.T) {
	sol, c := solveCase(t, stripProblem(), 41, 41)
	r, err := Build(sol, c, BuildOptions{Title: "Strip in a box", Unit: Unit{"mm", 1e-3}})
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]bool{"strip": true, "box": false}
	for _, cd := range r.Conductors {
		if cd.PeakField == nil {
			t.Fatalf("%s: no peak field", cd.Name)
		}
		if cd.PeakField.SharpEdge != want[cd.Name] {
			t.Errorf("%s: peak at %+v has SharpEdge %v, want %v", cd.Name, cd.PeakField.At, cd.PeakField.SharpEdge, want[cd.Name])
		}
	}
	if len(r.Regions) != 1 || !r.Regions[0].SharpEdge {
		t.Errorf("material peaks %+v, want the background's at the strip's edge, flagged", r.Regions)
	}
	var txt bytes.Buffer
	if err := r.WriteText(&txt); err != nil {
		t.Fatal(err)
	}
	notes := 0
	for _, line := range strings.Split(txt.String(), "\n") {
		if !strings.Contains(line, sharpText) {
			continue
		}
		notes++
		if f := strings.Fields(line); f[0] != "strip" && f[0] != "background" {
			t.Errorf("note on the line %q, want it only beside the strip's and the background's peaks", line)
		}
	}
	if notes != 2 {
		t.Errorf("the note %q appears %d times, want 2:\n%s", sharpText, notes, txt.String())
	}
	var js bytes.Buffer
	if err := r.WriteJSON(&js); err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(js.String(), `"sharp_edge": true`); n != 2 {
		t.Errorf(`the JSON report has "sharp_edge": true %d times, want 2`, n)
	}
	back, err := ReadJSON(&js)
	if err != nil {
		t.Fatal(err)
	}
	if !back.Conductors[0].PeakField.SharpEdge || back.Conductors[1].PeakField.SharpEdge || !back.Regions[0].SharpEdge {
		t.Error("SharpEdge does not survive the JSON round trip")
	}
}
