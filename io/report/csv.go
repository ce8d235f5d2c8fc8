package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// The CSV tables hold data only, for spreadsheets and scripts: one header
// row naming each column with its unit, then one row per item. Numbers are
// the shortest decimals that read back to the same float64. Positions are
// given in the model's unit and in metres. The tables carry no prose, so
// the Caution stays with the text and JSON report they belong to.

// WriteConductorsCSV writes the conductor table: name, potential, whether
// it floats, charge, the row of the capacitance matrix (one column per
// conductor, when the report has the matrix), the peak surface field and
// its position, and whether the peak lies at a sharp edge (where it grows
// with refinement and is no converged value). Missing peaks are empty
// fields.
func (r *Report) WriteConductorsCSV(w io.Writer) error {
	xs, ys := r.axisNames()
	lu := unitID(r.Units.Length)
	hdr := []string{"name", "potential_V", "floating", "charge_" + unitID(r.Units.Charge)}
	withC := len(r.Conductors) > 0 && len(r.Conductors[0].Capacitance) == len(r.Conductors)
	if withC {
		for _, c := range r.Conductors {
			hdr = append(hdr, "C_"+c.Name+"_"+unitID(r.Units.Capacitance))
		}
	}
	hdr = append(hdr, "peak_field_V_per_m", xs+"_"+lu, ys+"_"+lu, xs+"_m", ys+"_m", "sharp_edge")
	rows := [][]string{hdr}
	for _, c := range r.Conductors {
		row := []string{c.Name, ff(c.Potential), strconv.FormatBool(c.Floating), ff(c.Charge)}
		if withC {
			for k := range r.Conductors {
				v := ""
				if k < len(c.Capacitance) {
					v = ff(c.Capacitance[k])
				}
				row = append(row, v)
			}
		}
		if p := c.PeakField; p != nil {
			row = append(row, ff(p.Field), ff(p.At.X), ff(p.At.Y), ff(p.At.XM), ff(p.At.YM), strconv.FormatBool(p.SharpEdge))
		} else {
			row = append(row, "", "", "", "", "", "")
		}
		rows = append(rows, row)
	}
	return writeCSV(w, "conductor", rows)
}

// WriteProbesCSV writes the probe table: name, position, potential and the
// field components and magnitude.
func (r *Report) WriteProbesCSV(w io.Writer) error {
	xs, ys := r.axisNames()
	lu := unitID(r.Units.Length)
	rows := [][]string{{"name", xs + "_" + lu, ys + "_" + lu, xs + "_m", ys + "_m", "potential_V", "e" + xs + "_V_per_m", "e" + ys + "_V_per_m", "e_V_per_m"}}
	for _, p := range r.Probes {
		rows = append(rows, []string{p.Name, ff(p.At.X), ff(p.At.Y), ff(p.At.XM), ff(p.At.YM), ff(p.Potential), ff(p.Ex), ff(p.Ey), ff(p.E)})
	}
	return writeCSV(w, "probe", rows)
}

// WriteCutsCSV writes every line cut as one long table: cut name, sample
// index, distance along the cut, position, potential and field.
func (r *Report) WriteCutsCSV(w io.Writer) error {
	xs, ys := r.axisNames()
	lu := unitID(r.Units.Length)
	rows := [][]string{{"cut", "index", "s_m", xs + "_" + lu, ys + "_" + lu, xs + "_m", ys + "_m", "potential_V", "e" + xs + "_V_per_m", "e" + ys + "_V_per_m", "e_V_per_m"}}
	for _, c := range r.Cuts {
		for i, s := range c.Samples {
			rows = append(rows, []string{c.Name, strconv.Itoa(i), ff(s.S), ff(s.At.X), ff(s.At.Y), ff(s.At.XM), ff(s.At.YM), ff(s.Potential), ff(s.Ex), ff(s.Ey), ff(s.E)})
		}
	}
	return writeCSV(w, "line-cut", rows)
}

func writeCSV(w io.Writer, what string, rows [][]string) error {
	cw := csv.NewWriter(w)
	if err := cw.WriteAll(rows); err != nil {
		return fmt.Errorf("report: writing the %s table: %w", what, err)
	}
	return nil
}

// axisNames returns the coordinate names: x and y, or r and z.
func (r *Report) axisNames() (string, string) {
	if r.Kind.Metric == "axisymmetric" {
		return "r", "z"
	}
	return "x", "y"
}

// unitID turns a unit into a column-name part: "C/m" → "C_per_m",
// "µm" → "um".
func unitID(u string) string {
	u = strings.ReplaceAll(u, "/", "_per_")
	u = strings.ReplaceAll(u, "µ", "u")
	return strings.ReplaceAll(u, "μ", "u")
}

func ff(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
