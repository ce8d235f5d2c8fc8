package report

import (
	"encoding/json"
	"fmt"
	"io"
)

// WriteJSON writes the report as indented JSON, fields in the fixed order
// of the Go types, followed by a newline.
func (r *Report) WriteJSON(w io.Writer) error {
	b, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return fmt.Errorf("report: encoding the JSON report (a number is not finite?): %w", err)
	}
	b = append(b, '\n')
	if _, err := w.Write(b); err != nil {
		return fmt.Errorf("report: writing the JSON report: %w", err)
	}
	return nil
}

// ReadJSON reads a report written by WriteJSON. It accepts any report of
// major version Version and ignores fields it does not know. Errors wrap
// ErrFormat.
func ReadJSON(rd io.Reader) (*Report, error) {
	var r Report
	dec := json.NewDecoder(rd)
	if err := dec.Decode(&r); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	if r.Format != Format {
		return nil, fmt.Errorf("%w: the document's format is %q, not %q; give a report written by phigrid", ErrFormat, r.Format, Format)
	}
	if r.Version != Version {
		return nil, fmt.Errorf("%w: report version %d; this phigrid reads version %d, so use a matching phigrid release", ErrFormat, r.Version, Version)
	}
	if dec.More() {
		return nil, fmt.Errorf("%w: data follows the report; give one report per file", ErrFormat)
	}
	return &r, nil
}
