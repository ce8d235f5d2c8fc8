package export

import (
	"bytes"
	"errors"
	"flag"
	"io"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

var update = flag.Bool("update", false, "rewrite golden files in testdata")

// sameBits compares float64 slices bit for bit, so NaN, −0 and subnormals
// count.
var sameBits = cmp.Comparer(func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) })

func TestNPYHeaderBytes(t *testing.T) {
	// source: NumPy Enhancement Proposal 1 ("A simple file format for NumPy
	// arrays") and the numpy.lib.format documentation: magic "\x93NUMPY",
	// version 1.0, little-endian uint16 header length, header dict with
	// sorted keys, padded with spaces and ended by '\n' so that magic +
	// length + header is a multiple of 64; numpy's writer also reserves
	// GROWTH_AXIS_MAX_DIGITS = 21 characters for the first dimension
	// (numpy/lib/format.py, _write_array_header and _wrap_header). The
	// length 0x76 = 118 ("v\x00") is what np.save writes for small 1-D and
	// 2-D float64 arrays (common practice).
	tests := []struct {
		reason string
		data   []float64
		shape  []int
		dict   string
		hlen   byte
	}{
		{"1-D, three elements", []float64{1, 2, 3}, nil, "{'descr': '<f8', 'fortran_order': False, 'shape': (3,), }", 118},
		{"2-D (2, 3)", make([]float64, 6), []int{2, 3}, "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 3), }", 118},
		{"empty 1-D", nil, nil, "{'descr': '<f8', 'fortran_order': False, 'shape': (0,), }", 118},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteNPY(&buf, tt.data, tt.shape...); err != nil {
				t.Fatal(err)
			}
			got := buf.Bytes()[:128]
			want := "\x93NUMPY\x01\x00" + string([]byte{tt.hlen, 0}) + tt.dict +
				strings.Repeat(" ", 128-10-len(tt.dict)-1) + "\n"
			if diff := cmp.Diff(want, string(got)); diff != "" {
				t.Errorf("header (-want +got):\n%s", diff)
			}
			if buf.Len() != 128+8*len(tt.data) {
				t.Errorf("file length %d, want %d", buf.Len(), 128+8*len(tt.data))
			}
		})
	}
}

func TestNPYHeaderAlignment(t *testing.T) {
	// source: numpy.lib.format, _wrap_header: the padding is
	// 64 − (prefix + len + 1) mod 64 spaces, so a header that would end
	// exactly on a boundary gets a full 64.
	tests := []struct {
		reason string
		shape  []int
		total  int
		major  byte
	}{
		// 10 + 57 − 4 + len("(0, 1000000000000000000, 100000000000000000)")
		// + (21 − 1) + 1 = 128, so 64 more spaces follow.
		{"exactly aligned", []int{0, 1e18, 1e17}, 192, 1},
		// 10 + 245 + 20 + 1 = 276 bytes, padded to 320.
		{"64 dimensions", append([]int{0}, make([]int, 63)...), 320, 1},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			h := npyHeader("<f8", tt.shape)
			if len(h) != tt.total || h[len(h)-1] != '\n' {
				t.Errorf("header is %d bytes ending in %q, want %d ending in newline", len(h), h[len(h)-1], tt.total)
			}
			if h[6] != tt.major || h[7] != 0 {
				t.Errorf("version %d.%d, want %d.0", h[6], h[7], tt.major)
			}
			if got := int(h[8]) | int(h[9])<<8; got != len(h)-10 {
				t.Errorf("declared header length %d, want %d", got, len(h)-10)
			}
			_, _, shape, err := parseNPYHeader(h[10:], 10)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(tt.shape, shape); diff != "" {
				t.Errorf("shape read back (-want +got):\n%s", diff)
			}
		})
	}
}

func TestNPYGolden(t *testing.T) {
	// testdata/npy/f8_2x3.npy was built by hand from the format
	// description (independently of this package) for
	// np.arange(6.).reshape(2, 3) / 4.
	path := filepath.Join("testdata", "npy", "f8_2x3.npy")
	var buf bytes.Buffer
	if err := WriteNPY(&buf, []float64{0, 0.25, 0.5, 0.75, 1, 1.25}, 2, 3); err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(buf.Bytes(), want) {
		t.Errorf("WriteNPY output differs from %s:\n got %q\nwant %q", path, buf.Bytes(), want)
	}
}

func TestNPYRoundTrip(t *testing.T) {
	seq := func(n int) []float64 {
		v := make([]float64, n)
		for k := range v {
			v[k] = float64(k)*0.1 - 3
		}
		return v
	}
	tests := []struct {
		reason string
		data   []float64
		shape  []int
	}{
		{"default shape", seq(7), nil},
		{"empty", []float64{}, []int{0}},
		{"one element", []float64{42}, []int{1}},
		{"row vector", seq(5), []int{1, 5}},
		{"column vector", seq(5), []int{5, 1}},
		{"2-D (Ny, Nx)", seq(12), []int{3, 4}},
		{"2-D with a zero axis", []float64{}, []int{4, 0}},
		{"3-D", seq(24), []int{2, 3, 4}},
		{"more than one chunk", seq(3*npyChunk + 17), []int{3*npyChunk + 17}},
		{"special values", []float64{math.NaN(), math.Inf(1), math.Inf(-1), math.Copysign(0, -1), 5e-324, math.MaxFloat64}, []int{2, 3}},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteNPY(&buf, tt.data, tt.shape...); err != nil {
				t.Fatal(err)
			}
			data, shape, err := ReadNPY(&buf)
			if err != nil {
				t.Fatal(err)
			}
			wantShape := tt.shape
			if wantShape == nil {
				wantShape = []int{len(tt.data)}
			}
			if diff := cmp.Diff(wantShape, shape); diff != "" {
				t.Errorf("shape (-want +got):\n%s", diff)
			}
			if diff := cmp.Diff(tt.data, data, sameBits); diff != "" {
				t.Errorf("data (-want +got):\n%s", diff)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes left unread", buf.Len())
			}
		})
	}
}

func TestWriteNPYInvalid(t *testing.T) {
	tests := []struct {
		reason string
		n      int
		shape  []int
	}{
		{"product smaller than data", 6, []int{2, 2}},
		{"product larger than data", 6, []int{2, 4}},
		{"negative dimension", 0, []int{-1, 0}},
		{"overflowing product", 1, []int{math.MaxInt / 2, 3}},
		{"more than 64 dimensions", 0, make([]int, 65)},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			err := WriteNPY(&buf, make([]float64, tt.n), tt.shape...)
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("error %v, want ErrInvalid", err)
			}
			if buf.Len() != 0 {
				t.Errorf("%d bytes written on invalid input", buf.Len())
			}
		})
	}
}

func TestReadNPYFiles(t *testing.T) {
	// Files in testdata/npy were built by hand from the format description;
	// the values are the ones packed into them.
	tests := []struct {
		file  string
		shape []int
		data  []float64
	}{
		{"f8_2x3.npy", []int{2, 3}, []float64{0, 0.25, 0.5, 0.75, 1, 1.25}},
		{"f8_empty.npy", []int{0}, []float64{}},
		{"f8_scalar.npy", []int{}, []float64{2.5}},
		{"f4_4.npy", []int{4}, []float64{0.5, -1.25, float64(float32(3e38)), float64(math.SmallestNonzeroFloat32)}},
		{"i4_2x2.npy", []int{2, 2}, []float64{math.MinInt32, -1, 0, math.MaxInt32}},
		{"i8_3.npy", []int{3}, []float64{-(1 << 53), 7, 1 << 53}},
		{"u1_5.npy", []int{5}, []float64{0, 1, 127, 128, 255}},
		{"f8_v2.npy", []int{2}, []float64{1, -2}},
		{"f8_v3.npy", []int{1, 2}, []float64{3, 4}},
		{"f8_fortran_1d.npy", []int{1, 3}, []float64{1, 2, 3}},
	}
	for _, tt := range tests {
		t.Run(tt.file, func(t *testing.T) {
			f, err := os.Open(filepath.Join("testdata", "npy", tt.file))
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			data, shape, err := ReadNPY(f)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(tt.shape, shape); diff != "" {
				t.Errorf("shape (-want +got):\n%s", diff)
			}
			if diff := cmp.Diff(tt.data, data, sameBits); diff != "" {
				t.Errorf("data (-want +got):\n%s", diff)
			}
		})
	}
}

// rawNPY builds an NPY file from a header dict and raw data bytes, padded
// as version 1.0 needs.
func rawNPY(dict string, data []byte) []byte {
	hlen := len(dict) + 1
	pad := 64 - (10+hlen)%64
	b := []byte("\x93NUMPY\x01\x00")
	b = append(b, byte(hlen+pad), byte((hlen+pad)>>8))
	b = append(b, dict...)
	b = append(b, bytes.Repeat([]byte(" "), pad)...)
	b = append(b, '\n')
	return append(b, data...)
}

func TestReadNPYErrors(t *testing.T) {
	file := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join("testdata", "npy", name))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	eight := make([]byte, 8)
	tests := []struct {
		reason      string
		in          []byte
		unsupported bool
		eof         bool
		msg         string
	}{
		{"empty input", nil, false, true, "too short"},
		{"bad magic", file("bad_magic.npy"), false, false, "magic"},
		{"version 4.0", []byte("\x93NUMPY\x04\x00\x00\x00"), true, false, "version 4.0"},
		{"version 1.1", []byte("\x93NUMPY\x01\x01\x00\x00"), true, false, "version 1.1"},
		{"header cut short", []byte("\x93NUMPY\x01\x00\x40\x00{'descr'"), false, true, "header is cut short"},
		{"version 2 header over the cap", []byte("\x93NUMPY\x02\x00\x00\x00\x00\x01"), false, false, "more than"},
		{"big-endian", file("f8_bigendian.npy"), true, false, ">f8"},
		{"structured", file("structured.npy"), true, false, "structured"},
		{"Fortran order", file("f8_fortran_2d.npy"), true, false, "Fortran"},
		{"truncated data", file("f8_truncated.npy"), false, true, "3 of 4"},
		{"declared size far beyond the input", file("f8_huge_shape.npy"), false, true, "data ends"},
		{"overflowing shape", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (10000000000, 10000000000), }", eight), false, false, "too large"},
		{"dimension beyond int", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (99999999999999999999,), }", eight), false, false, "too large"},
		{"negative dimension", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (-1,), }", eight), false, false, "non-negative"},
		{"missing key", rawNPY("{'descr': '<f8', 'shape': (1,), }", eight), false, false, "fortran_order"},
		{"extra key", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (1,), 'x': 1}", eight), false, false, "unexpected header key"},
		{"not a dict", rawNPY("descr", eight), false, false, "not a dict"},
		{"shape without comma", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (1), }", eight), false, false, "trailing comma"},
		{"bad bool", rawNPY("{'descr': '<f8', 'fortran_order': 0, 'shape': (1,), }", eight), false, false, "True or False"},
		{"unterminated string", rawNPY("{'descr: <f8", nil), false, false, "header string"},
		{"text after dict", rawNPY("{'descr': '<f8', 'fortran_order': False, 'shape': (1,), } x", eight), false, false, "after the header"},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			_, _, err := ReadNPY(bytes.NewReader(tt.in))
			var fe *FormatError
			if !errors.As(err, &fe) || !errors.Is(err, ErrFormat) {
				t.Fatalf("error %v, want a *FormatError matching ErrFormat", err)
			}
			if got := errors.Is(err, ErrUnsupported); got != tt.unsupported {
				t.Errorf("errors.Is(err, ErrUnsupported) = %v, want %v (%v)", got, tt.unsupported, err)
			}
			if got := errors.Is(err, io.ErrUnexpectedEOF); got != tt.eof {
				t.Errorf("errors.Is(err, io.ErrUnexpectedEOF) = %v, want %v (%v)", got, tt.eof, err)
			}
			if !strings.Contains(err.Error(), tt.msg) {
				t.Errorf("error %q does not mention %q", err, tt.msg)
			}
		})
	}
}

func TestReadNPYBoundedMemory(t *testing.T) {
	// A header declaring 10¹⁸ float64 values followed by one value must
	// fail without reserving memory for the declared size.
	in, err := os.ReadFile(filepath.Join("testdata", "npy", "f8_huge_shape.npy"))
	if err != nil {
		t.Fatal(err)
	}
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	for k := 0; k < 10; k++ {
		if _, _, err := ReadNPY(bytes.NewReader(in)); err == nil {
			t.Fatal("no error for a truncated file")
		}
	}
	runtime.ReadMemStats(&after)
	if got := after.TotalAlloc - before.TotalAlloc; got > 10<<20 {
		t.Errorf("10 reads allocated %d bytes, want under 10 MiB", got)
	}
}

func TestReadNPYStopsAtEnd(t *testing.T) {
	// ReadNPY must not consume bytes after the array, so arrays can be
	// concatenated in one stream.
	var buf bytes.Buffer
	for k := 0; k < 3; k++ {
		if err := WriteNPY(&buf, []float64{float64(k), float64(k) + 0.5}); err != nil {
			t.Fatal(err)
		}
	}
	for k := 0; k < 3; k++ {
		data, _, err := ReadNPY(&buf)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff([]float64{float64(k), float64(k) + 0.5}, data); diff != "" {
			t.Errorf("array %d (-want +got):\n%s", k, diff)
		}
	}
}
