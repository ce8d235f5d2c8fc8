package report

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"
)

// textWidth is the width WriteText wraps prose to.
const textWidth = 78

// WriteText writes the report as readable fixed-width text, for a terminal
// or a log: a header with the model, grid and solver run; a conductor table
// with potentials, charges and peak surface fields; the capacitance matrix;
// the stored energy; the peak field per material; error estimates, probes
// and line cuts when present. Numbers carry engineering prefixes, field
// strengths read in V/m, V/mm or kV/mm, positions are in the model's unit,
// and the Caution follows every table that shows a field strength. Line
// cuts are summarised; their samples are in the JSON and CSV forms.
func (r *Report) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	r.writeHeader(ew)
	r.writeConductors(ew)
	r.writeMatrix(ew)
	fmt.Fprintf(ew, "\nStored energy: %s\n", eng(r.Energy, r.Units.Energy))
	r.writeRegions(ew)
	r.writeEstimates(ew)
	r.writeProbes(ew)
	r.writeCuts(ew)
	return ew.err
}

// errWriter keeps the first write error and drops later writes.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	if err != nil {
		e.err = fmt.Errorf("report: writing the text report: %w", err)
	}
	return n, e.err
}

// table returns a tab writer for an indented table on w.
func table(w io.Writer) *tabwriter.Writer {
	return tabwriter.NewWriter(&trimWriter{w: w}, 0, 0, 2, ' ', 0)
}

// trimWriter drops the spaces that padding leaves at the end of a line.
// It holds back a partial line until its newline arrives; every line of a
// table ends with one.
type trimWriter struct {
	w    io.Writer
	line []byte
}

func (t *trimWriter) Write(p []byte) (int, error) {
	n := len(p)
	var out []byte
	for {
		i := bytes.IndexByte(p, '\n')
		if i < 0 {
			t.line = append(t.line, p...)
			break
		}
		t.line = append(t.line, p[:i]...)
		out = append(out, bytes.TrimRight(t.line, " ")...)
		out = append(out, '\n')
		t.line = t.line[:0]
		p = p[i+1:]
	}
	if len(out) > 0 {
		if _, err := t.w.Write(out); err != nil {
			return 0, err
		}
	}
	return n, nil
}

func (r *Report) writeHeader(w io.Writer) {
	title := "phigrid solve report"
	if r.Title != "" {
		title += ": " + r.Title
	}
	fmt.Fprintf(w, "%s\n%s\n", title, strings.Repeat("=", min(len([]rune(title)), textWidth)))
	tw := table(w)
	if r.Model != "" {
		fmt.Fprintf(tw, "Model:\t%s\n", r.Model)
	}
	kind := "axisymmetric (r–z) body of revolution; charges, capacitances and energy are totals"
	if r.Kind.PerMetre {
		kind = "planar cross-section; charges, capacitances and energy are per metre of depth"
	} else if r.Kind.Metric != "axisymmetric" {
		kind = r.Kind.Metric
	}
	fmt.Fprintf(tw, "Problem:\t%s\n", kind)
	gr := r.Grid
	fmt.Fprintf(tw, "Grid:\t%d × %d = %d nodes, %d free; spacing %s to %s %s", gr.Nx, gr.Ny, gr.Nodes, gr.Free,
		r.length(gr.MinCell), r.length(gr.MaxCell), r.Units.Length)
	if gr.Snapped > 0 {
		fmt.Fprintf(tw, "; %d snapped onto conductors", gr.Snapped)
	}
	fmt.Fprintln(tw)
	s := r.Solver
	if s.Solves == 0 {
		fmt.Fprintf(tw, "Solver:\tno statistics (the solution was not solved in this run)\n")
		tw.Flush()
		return
	}
	solves := "solves"
	if s.Solves == 1 {
		solves = "solve"
	}
	fmt.Fprintf(tw, "Solver:\t%s, %d %s, %d iterations, largest residual %.2e, %s\n", s.Method, s.Solves, solves, s.Iterations, s.Residual, s.Status)
	fmt.Fprintf(tw, "Time:\tsetup %s, solve %s\n", eng(s.SetupSeconds, "s"), eng(s.SolveSeconds, "s"))
	tw.Flush()
}

// length formats a length in metres in the model's unit.
func (r *Report) length(m float64) string {
	s := r.Units.LengthScale
	if s == 0 {
		s = 1
	}
	return num(m / s)
}

// at formats a position in the model's unit. A coordinate within
// round-off of zero (below 1e-9 of the largest cell) prints as 0.
func (r *Report) at(p Position) string {
	eps := 1e-9 * r.Grid.MaxCell
	x, y := p.X, p.Y
	if math.Abs(p.XM) < eps {
		x = 0
	}
	if math.Abs(p.YM) < eps {
		y = 0
	}
	return "(" + num(x) + ", " + num(y) + ")"
}

// axes is the heading of a position column.
func (r *Report) axes() string {
	if r.Kind.Metric == "axisymmetric" {
		return "(r, z) " + r.Units.Length
	}
	return "(x, y) " + r.Units.Length
}

// noise is the relative size below which a figure printed beside larger
// ones of its kind is round-off and shows as 0.
const noise = 1e-12

// clean returns v, or 0 when |v| is below noise·ref.
func clean(v, ref float64) float64 {
	if math.Abs(v) < noise*math.Abs(ref) {
		return 0
	}
	return v
}

// potentialScale returns the largest conductor potential magnitude, or 1.
func (r *Report) potentialScale() float64 {
	s := 0.0
	for _, c := range r.Conductors {
		s = math.Max(s, math.Abs(c.Potential))
	}
	if s == 0 {
		return 1
	}
	return s
}

func (r *Report) writeConductors(w io.Writer) {
	fmt.Fprintf(w, "\nConductors\n")
	tw := table(w)
	fmt.Fprintf(tw, "  name\tpotential\tcharge\tpeak surface |E|\tat %s\n", r.axes())
	shown := false
	vs := r.potentialScale()
	var qs float64
	for _, c := range r.Conductors {
		qs = math.Max(qs, math.Abs(c.Charge))
	}
	for _, c := range r.Conductors {
		v := eng(clean(c.Potential, vs), "V")
		if c.Floating {
			v += " (floating)"
		}
		pk, at := "–", ""
		if c.PeakField != nil {
			pk, at = fieldStrength(c.PeakField.Field), r.at(c.PeakField.At)+sharpNote(c.PeakField)
			shown = true
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\n", c.Name, v, eng(clean(c.Charge, qs), r.Units.Charge), pk, at)
	}
	tw.Flush()
	if shown {
		writeCaution(w)
	}
}

// sharpText is printed after the position of a peak at a sharp edge or
// corner.
const sharpText = "at a sharp edge: grows with refinement, not a converged value"

// sharpNote returns the note that follows the position of p, if any: a tab
// and sharpText for a peak at a sharp edge.
func sharpNote(p *Peak) string {
	if !p.SharpEdge {
		return ""
	}
	return "\t" + sharpText
}

func (r *Report) writeMatrix(w io.Writer) {
	n := len(r.Conductors)
	if n == 0 || len(r.Conductors[0].Capacitance) != n {
		return
	}
	var big float64
	for _, c := range r.Conductors {
		for _, v := range c.Capacitance {
			big = math.Max(big, math.Abs(v))
		}
	}
	scale, prefix := prefixFor(big)
	// Five significant digits on the largest entry, the same decimals on
	// every entry.
	dec := 0
	if big > 0 {
		dec = max(0, 4-int(math.Floor(math.Log10(big/scale))))
	}
	fmt.Fprintf(w, "\nCapacitance matrix (%s%s)\n", prefix, r.Units.Capacitance)
	tw := tabwriter.NewWriter(&trimWriter{w: w}, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "\t")
	for _, c := range r.Conductors {
		fmt.Fprintf(tw, "%s\t", c.Name)
	}
	fmt.Fprintln(tw)
	for _, c := range r.Conductors {
		fmt.Fprintf(tw, "  %s\t", c.Name)
		for _, v := range c.Capacitance {
			fmt.Fprintf(tw, "%s\t", strconv.FormatFloat(v/scale, 'f', dec, 64))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
}

func (r *Report) writeRegions(w io.Writer) {
	if len(r.Regions) == 0 {
		return
	}
	fmt.Fprintf(w, "\nPeak field by material\n")
	tw := table(w)
	fmt.Fprintf(tw, "  material\tpeak |E|\tat %s\n", r.axes())
	for _, p := range r.Regions {
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", p.Where, fieldStrength(p.Field), r.at(p.At)+sharpNote(&p))
	}
	tw.Flush()
	writeCaution(w)
}

func (r *Report) writeEstimates(w io.Writer) {
	c := r.Convergence
	if c == nil || len(c.Estimates) == 0 {
		return
	}
	grids := make([]string, len(c.Levels))
	for i, l := range c.Levels {
		grids[i] = strconv.Itoa(l.Nodes)
	}
	fmt.Fprintf(w, "\nError estimates (grid-convergence study on %s nodes)\n", strings.Join(grids, ", "))
	tw := table(w)
	fmt.Fprintf(tw, "  quantity\tfinest grid\torder\textrapolated\terror band\tnote\n")
	shown := false
	for _, e := range c.Estimates {
		order := "–"
		if e.Observed != nil {
			order = strconv.FormatFloat(*e.Observed, 'f', 2, 64)
		}
		value, extra, band := eng(e.Value, e.Unit), eng(e.Extrapolated, e.Unit), eng(e.Band, e.Unit)
		if e.Unit == "V/m" {
			value, extra, band = fieldStrength(e.Value), fieldStrength(e.Extrapolated), fieldStrength(e.Band)
			shown = true
		}
		rel := ""
		if e.Value != 0 {
			rel = fmt.Sprintf(" (%.2g %%)", 100*e.Band/math.Abs(e.Value))
		}
		note := ""
		if e.Note != "" {
			note = "(" + e.Note + ")"
		}
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t± %s%s\t%s\n", e.Quantity, value, order, extra, band, rel, note)
	}
	tw.Flush()
	if shown {
		writeCaution(w)
	}
}

func (r *Report) writeProbes(w io.Writer) {
	if len(r.Probes) == 0 {
		return
	}
	fmt.Fprintf(w, "\nProbes\n")
	tw := table(w)
	xs, ys := r.axisNames()
	fmt.Fprintf(tw, "  name\tat %s\tpotential\t|E|\tE%s\tE%s\n", r.axes(), xs, ys)
	vs := r.potentialScale()
	for _, p := range r.Probes {
		fmt.Fprintf(tw, "  %s\t%s\t%s\t%s\t%s\t%s\n", p.Name, r.at(p.At), eng(clean(p.Potential, vs), "V"),
			fieldStrength(p.E), fieldStrength(clean(p.Ex, p.E)), fieldStrength(clean(p.Ey, p.E)))
	}
	tw.Flush()
	writeCaution(w)
}

func (r *Report) writeCuts(w io.Writer) {
	if len(r.Cuts) == 0 {
		return
	}
	fmt.Fprintf(w, "\nLine cuts (every sample is in the JSON and CSV outputs)\n")
	tw := table(w)
	fmt.Fprintf(tw, "  name\tfrom → to %s\tsamples\tpotential\tpeak |E|\tat %s\n", r.Units.Length, r.axes())
	for _, c := range r.Cuts {
		lo, hi := math.Inf(1), math.Inf(-1)
		emax := 0.0
		for _, s := range c.Samples {
			lo, hi = math.Min(lo, s.Potential), math.Max(hi, s.Potential)
			emax = math.Max(emax, s.E)
		}
		// The first sample within round-off of the peak, so that ties in a
		// uniform field do not move with the last digits.
		var pk Sample
		for _, s := range c.Samples {
			if s.E >= emax*(1-1e-9) {
				pk = s
				break
			}
		}
		vs := r.potentialScale()
		fmt.Fprintf(tw, "  %s\t%s → %s\t%d\t%s to %s\t%s\t%s\n", c.Name, r.at(c.From), r.at(c.To), len(c.Samples),
			eng(clean(lo, vs), "V"), eng(clean(hi, vs), "V"), fieldStrength(pk.E), r.at(pk.At))
	}
	tw.Flush()
	writeCaution(w)
}

// writeCaution writes the safety note, indented and wrapped.
func writeCaution(w io.Writer) {
	fmt.Fprintln(w)
	for _, l := range wrap(Caution, textWidth-2) {
		fmt.Fprintf(w, "  %s\n", l)
	}
}

// wrap breaks s into lines of at most width runes at spaces.
func wrap(s string, width int) []string {
	var lines []string
	var cur strings.Builder
	n := 0
	for _, word := range strings.Fields(s) {
		wl := len([]rune(word))
		if n > 0 && n+1+wl > width {
			lines = append(lines, cur.String())
			cur.Reset()
			n = 0
		}
		if n > 0 {
			cur.WriteByte(' ')
			n++
		}
		cur.WriteString(word)
		n += wl
	}
	if n > 0 {
		lines = append(lines, cur.String())
	}
	return lines
}

// SI prefixes from 10⁻¹⁸ to 10¹⁸, in steps of 10³.
var prefixes = []string{"a", "f", "p", "n", "µ", "m", "", "k", "M", "G", "T", "P", "E"}

// prefixFor returns the power of 10³ and its prefix that put v in [1, 1000).
func prefixFor(v float64) (float64, string) {
	v = math.Abs(v)
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return 1, ""
	}
	e := int(math.Floor(math.Log10(v) / 3))
	e = max(-6, min(6, e))
	return math.Pow(10, float64(3*e)), prefixes[e+6]
}

// eng formats v with five significant digits and an SI prefix on unit:
// "165.08 pF/m", "−1.0000 V", "0 J/m".
func eng(v float64, unit string) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', -1, 64) + " " + unit
	}
	if a := math.Abs(v); a < 1e-18 || a >= 1e21 {
		return strconv.FormatFloat(v, 'e', 4, 64) + " " + unit
	}
	scale, prefix := prefixFor(v)
	s := num5(v / scale)
	if m, err := strconv.ParseFloat(s, 64); err == nil && math.Abs(m) >= 1000 && prefix != prefixes[len(prefixes)-1] {
		// Rounding carried into the next prefix (999.996 → 1000.0).
		scale, prefix = prefixFor(1000 * scale)
		s = num5(v / scale)
	}
	return s + " " + prefix + unit
}

// num formats a coordinate with up to five significant digits, dropping
// trailing zeros ("5", "0.25", "1.8644"); very large or small values use
// exponent notation.
func num(v float64) string {
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a >= 1e-3 && a < 1e6 {
		dec := max(0, 4-int(math.Floor(math.Log10(a))))
		s := strconv.FormatFloat(v, 'f', dec, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
		return s
	}
	return strconv.FormatFloat(v, 'g', 5, 64)
}

// fieldStrength formats a field strength in V/m with the unit engineers
// read it in: V/m below 1 kV/m, V/mm up to 1 MV/m, then kV/mm and MV/mm.
func fieldStrength(v float64) string {
	a := math.Abs(v)
	switch {
	case a < 1:
		return eng(v, "V/m")
	case a < 1e3:
		return num5(v) + " V/m"
	case a < 1e6:
		return num5(v/1e3) + " V/mm"
	case a < 1e9:
		return num5(v/1e6) + " kV/mm"
	}
	return num5(v/1e9) + " MV/mm"
}

// num5 formats v with five significant digits, keeping trailing zeros so
// a column of figures reads at one precision.
func num5(v float64) string {
	a := math.Abs(v)
	if a == 0 {
		return "0"
	}
	dec := max(0, 4-int(math.Floor(math.Log10(a))))
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if len(strings.TrimLeft(strings.ReplaceAll(strings.TrimLeft(s, "-"), ".", ""), "0")) > 5 {
		// Rounding added a digit (999.996 → 1000.00); drop one decimal.
		s = strconv.FormatFloat(v, 'f', max(0, dec-1), 64)
	}
	return s
}
