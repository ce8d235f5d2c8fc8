package export

import (
	"encoding/csv"
	"io"
	"strconv"
)

// WriteCSV writes a table as RFC 4180 comma-separated values with
// encoding/csv: the header row first (when header is not nil), then rows.
// Fields holding commas, quotes or line breaks are quoted; lines end in
// "\n". Every row must have as many fields as the header (or as the first
// row when there is no header), so that the table reads back with
// encoding/csv, spreadsheets and pandas; a ragged table is refused with an
// error wrapping ErrInvalid before anything is written.
//
// Format numbers with FormatFloat.
func WriteCSV(w io.Writer, header []string, rows [][]string) error {
	width := len(header)
	if header == nil && len(rows) > 0 {
		width = len(rows[0])
	}
	for k, row := range rows {
		if len(row) != width {
			return invalidf("CSV row %d has %d fields but the table has %d columns", k+1, len(row), width)
		}
	}
	cw := csv.NewWriter(w)
	if header != nil {
		if err := cw.Write(header); err != nil {
			return err
		}
	}
	if err := cw.WriteAll(rows); err != nil {
		return err
	}
	return cw.Error()
}

// FormatFloat formats v for a CSV table: the shortest decimal form that
// reads back to exactly v (strconv 'g' with precision −1), such as "0.1",
// "1e-12" or "8.8541878128e-12". Tables therefore carry full float64
// precision and no digits that mean nothing; round for display in the
// tool that opens the file. NaN and infinities are written as "NaN",
// "+Inf" and "-Inf", which Go, Python and pandas read back.
func FormatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
