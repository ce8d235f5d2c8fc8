package export

import (
	"bytes"
	"encoding/csv"
	"errors"
	"math"
	"strconv"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestWriteCSV(t *testing.T) {
	tests := []struct {
		reason string
		header []string
		rows   [][]string
		want   string
	}{
		{"header and rows", []string{"x", "phi"}, [][]string{{"0", "1"}, {"0.5", "0.25"}}, "x,phi\n0,1\n0.5,0.25\n"},
		{"no header", nil, [][]string{{"a", "b"}}, "a,b\n"},
		{"header only", []string{"name", "C (F/m)"}, nil, "name,C (F/m)\n"},
		// source: RFC 4180 §2 (common practice): fields with commas, quotes
		// or line breaks are quoted, quotes doubled.
		{"quoting", []string{"name", "note"}, [][]string{{"a,b", `say "hi"`}, {"line\nbreak", " lead"}}, "name,note\n\"a,b\",\"say \"\"hi\"\"\"\n\"line\nbreak\",\" lead\"\n"},
		{"empty", nil, nil, ""},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteCSV(&buf, tt.header, tt.rows); err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(tt.want, buf.String()); diff != "" {
				t.Errorf("output (-want +got):\n%s", diff)
			}
			recs, err := csv.NewReader(&buf).ReadAll()
			if err != nil {
				t.Fatal(err)
			}
			want := tt.rows
			if tt.header != nil {
				want = append([][]string{tt.header}, tt.rows...)
			}
			if diff := cmp.Diff(want, recs, cmpopts.EquateEmpty()); diff != "" {
				t.Errorf("read back (-want +got):\n%s", diff)
			}
		})
	}
}

func TestWriteCSVRagged(t *testing.T) {
	tests := []struct {
		reason string
		header []string
		rows   [][]string
	}{
		{"row shorter than header", []string{"a", "b"}, [][]string{{"1", "2"}, {"3"}}},
		{"row longer than first row", nil, [][]string{{"1"}, {"2", "3"}}},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteCSV(&buf, tt.header, tt.rows); !errors.Is(err, ErrInvalid) {
				t.Errorf("error %v, want ErrInvalid", err)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes written for a ragged table", buf.Len())
			}
		})
	}
}

func TestFormatFloat(t *testing.T) {
	tests := []struct {
		v    float64
		want string
	}{
		{0, "0"},
		{0.1, "0.1"},
		{-2.5, "-2.5"},
		{1e-12, "1e-12"},
		{8.8541878128e-12, "8.8541878128e-12"}, // source: CODATA 2018 ε0 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021)
		{1.0 / 3, "0.3333333333333333"},
		{123456789012, "1.23456789012e+11"},
		{math.NaN(), "NaN"},
		{math.Inf(-1), "-Inf"},
	}
	for _, tt := range tests {
		got := FormatFloat(tt.v)
		if got != tt.want {
			t.Errorf("FormatFloat(%v) = %q, want %q", tt.v, got, tt.want)
		}
		back, err := strconv.ParseFloat(got, 64)
		if err != nil || (math.Float64bits(back) != math.Float64bits(tt.v) && !math.IsNaN(tt.v)) {
			t.Errorf("FormatFloat(%v) = %q reads back as %v (%v)", tt.v, got, back, err)
		}
	}
}
