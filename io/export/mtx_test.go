package export

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// entry is one matrix entry with zero-based indices.
type entry struct {
	i, j int
	v    float64
}

func emitAll(es []entry) func(emit func(i, j int, v float64)) {
	return func(emit func(i, j int, v float64)) {
		for _, e := range es {
			emit(e.i, e.j, e.v)
		}
	}
}

// dense sums triplets into a rows×cols matrix.
func dense(m *Triplets) [][]float64 {
	a := make([][]float64, m.Rows)
	for i := range a {
		a[i] = make([]float64, m.Cols)
	}
	for k := range m.V {
		a[m.I[k]][m.J[k]] += m.V[k]
	}
	return a
}

func TestWriteMatrixMarketGolden(t *testing.T) {
	// The 1-D Laplacian tridiag(−1, 2, −1) of order 3, emitted in full; the
	// symmetric file keeps the lower triangle.
	// source: Boisvert, Pozo and Remington, "The Matrix Market Exchange
	// Formats: Initial Design", NISTIR 5935, 1996, §2 (coordinate format,
	// 1-based indices, symmetric files store the lower triangle).
	full := []entry{{0, 0, 2}, {0, 1, -1}, {1, 0, -1}, {1, 1, 2}, {1, 2, -1}, {2, 1, -1}, {2, 2, 2}}
	tests := []struct {
		reason    string
		symmetric bool
		comment   string
		want      string
	}{
		{"symmetric", true, "1-D Laplacian", "%%MatrixMarket matrix coordinate real symmetric\n% 1-D Laplacian\n3 3 5\n1 1 2\n2 1 -1\n2 2 2\n3 2 -1\n3 3 2\n"},
		{"general", false, "", "%%MatrixMarket matrix coordinate real general\n3 3 7\n1 1 2\n1 2 -1\n2 1 -1\n2 2 2\n2 3 -1\n3 2 -1\n3 3 2\n"},
		{"comment lines", true, "a\nb\r\n", "%%MatrixMarket matrix coordinate real symmetric\n% a\n% b\n3 3 5\n1 1 2\n2 1 -1\n2 2 2\n3 2 -1\n3 3 2\n"},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteMatrixMarket(&buf, 3, emitAll(full), tt.symmetric, tt.comment); err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(tt.want, buf.String()); diff != "" {
				t.Errorf("output (-want +got):\n%s", diff)
			}
		})
	}
	golden, err := os.ReadFile(filepath.Join("testdata", "mtx", "laplace3_sym.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteMatrixMarket(&buf, 3, emitAll(full), true, "1D Laplacian, lower triangle"); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(string(golden), buf.String()); diff != "" {
		t.Errorf("differs from testdata/mtx/laplace3_sym.mtx (-want +got):\n%s", diff)
	}
}

func TestMatrixMarketRoundTrip(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{0, 1, 2, 7, 50} {
		for _, symmetric := range []bool{false, true} {
			// A random sparse matrix with awkward values, symmetric when asked.
			want := make([][]float64, n)
			for i := range want {
				want[i] = make([]float64, n)
			}
			var es []entry
			for i := 0; i < n; i++ {
				for j := 0; j < n; j++ {
					if (symmetric && j > i) || rng.Float64() > 0.3 {
						continue
					}
					v := rng.NormFloat64() * math.Pow(10, float64(rng.IntN(40)-20))
					es = append(es, entry{i, j, v})
					want[i][j] = v
					if symmetric && i != j {
						es = append(es, entry{j, i, v})
						want[j][i] = v
					}
				}
			}
			var buf bytes.Buffer
			if err := WriteMatrixMarket(&buf, n, emitAll(es), symmetric, "round trip"); err != nil {
				t.Fatal(err)
			}
			m, err := ReadMatrixMarket(&buf)
			if err != nil {
				t.Fatalf("n=%d symmetric=%v: %v", n, symmetric, err)
			}
			if m.Rows != n || m.Cols != n {
				t.Errorf("n=%d: read %d×%d", n, m.Rows, m.Cols)
			}
			if len(m.V) != len(es) {
				t.Errorf("n=%d symmetric=%v: %d entries read, want %d", n, symmetric, len(m.V), len(es))
			}
			if diff := cmp.Diff(want, dense(m)); diff != "" {
				t.Errorf("n=%d symmetric=%v (-want +got):\n%s", n, symmetric, diff)
			}
		}
	}
}

func TestMatrixMarketVectorRoundTrip(t *testing.T) {
	tests := [][]float64{
		{},
		{1},
		{0.1, -1e-300, 5e-324, math.MaxFloat64, math.Copysign(0, -1), 1.0 / 3},
		{math.Inf(1), math.Inf(-1)},
	}
	for _, b := range tests {
		var buf bytes.Buffer
		if err := WriteMatrixMarketVector(&buf, b, "rhs"); err != nil {
			t.Fatal(err)
		}
		got, err := ReadMatrixMarketVector(&buf)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(b, got, sameBits, cmpopts.EquateEmpty()); diff != "" {
			t.Errorf("(-want +got):\n%s", diff)
		}
	}
	var buf bytes.Buffer
	if err := WriteMatrixMarketVector(&buf, []float64{0.5, -2}, ""); err != nil {
		t.Fatal(err)
	}
	// source: NISTIR 5935 §2 (array format, column-major, one value a line).
	if want := "%%MatrixMarket matrix array real general\n2 1\n0.5\n-2\n"; buf.String() != want {
		t.Errorf("output %q, want %q", buf.String(), want)
	}
}

func TestWriteMatrixMarketInvalid(t *testing.T) {
	calls := 0
	changing := func(emit func(i, j int, v float64)) {
		calls++
		for k := 0; k < calls; k++ {
			emit(0, 0, 1)
		}
	}
	tests := []struct {
		reason  string
		n       int
		entries func(emit func(i, j int, v float64))
	}{
		{"negative size", -1, emitAll(nil)},
		{"row out of range", 2, emitAll([]entry{{2, 0, 1}})},
		{"negative column", 2, emitAll([]entry{{0, -1, 1}})},
		{"entries change between passes", 2, changing},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			err := WriteMatrixMarket(io.Discard, tt.n, tt.entries, false, "")
			if !errors.Is(err, ErrInvalid) {
				t.Errorf("error %v, want ErrInvalid", err)
			}
		})
	}
}

func TestReadMatrixMarketFiles(t *testing.T) {
	tests := []struct {
		file     string
		symmetry string
		want     [][]float64
	}{
		{"laplace3_sym.mtx", "symmetric", [][]float64{{2, -1, 0}, {-1, 2, -1}, {0, -1, 2}}},
		{"general_2x3.mtx", "general", [][]float64{{1.5, 0, 1e300}, {0, 0, -2.25e-3}}},
		{"skew_int.mtx", "skew-symmetric", [][]float64{{0, -4, 5}, {4, 0, 0}, {-5, 0, 0}}},
		{"pattern.mtx", "general", [][]float64{{0, 1}, {1, 0}}},
	}
	for _, tt := range tests {
		t.Run(tt.file, func(t *testing.T) {
			f, err := os.Open(filepath.Join("testdata", "mtx", tt.file))
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			m, err := ReadMatrixMarket(f)
			if err != nil {
				t.Fatal(err)
			}
			if m.Symmetry != tt.symmetry {
				t.Errorf("symmetry %q, want %q", m.Symmetry, tt.symmetry)
			}
			if diff := cmp.Diff(tt.want, dense(m)); diff != "" {
				t.Errorf("(-want +got):\n%s", diff)
			}
		})
	}
	f, err := os.Open(filepath.Join("testdata", "mtx", "vector3.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	b, err := ReadMatrixMarketVector(f)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([]float64{0.5, -1e-12, 3}, b); diff != "" {
		t.Errorf("vector3.mtx (-want +got):\n%s", diff)
	}
}

func TestReadMatrixMarketErrors(t *testing.T) {
	file := func(name string) string {
		b, err := os.ReadFile(filepath.Join("testdata", "mtx", name))
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	const co = "%%MatrixMarket matrix coordinate real general\n"
	tests := []struct {
		reason      string
		in          string
		vector      bool
		line        int
		unsupported bool
		msg         string
	}{
		{"empty", "", false, 0, false, "empty"},
		{"no banner", "3 3 1\n1 1 1\n", false, 1, false, "banner"},
		{"short banner", "%%MatrixMarket matrix coordinate real\n", false, 1, false, "4 keywords"},
		{"vector object", "%%MatrixMarket vector coordinate real general\n", false, 1, true, "object"},
		{"complex", file("complex.mtx"), false, 1, true, "complex"},
		{"hermitian", "%%MatrixMarket matrix coordinate real hermitian\n", false, 1, true, "hermitian"},
		{"unknown field", "%%MatrixMarket matrix coordinate float general\n", false, 1, false, "field"},
		{"array given to the matrix reader", file("vector3.mtx"), false, 1, true, "ReadMatrixMarketVector"},
		{"coordinate given to the vector reader", file("laplace3_sym.mtx"), true, 1, true, "dense array"},
		{"missing size line", co + "% only a comment\n", false, 2, false, "size line"},
		{"size line with two numbers", co + "2 2\n", false, 2, false, "expected 3"},
		{"negative size", co + "-2 2 1\n", false, 2, false, "non-negative"},
		{"fewer entries than declared", file("short.mtx"), false, 4, false, "entry 3 of 3"},
		{"more entries than declared", co + "2 2 1\n1 1 1\n2 2 1\n", false, 4, false, "more entries"},
		{"index out of range", co + "2 2 1\n3 1 1\n", false, 3, false, "outside"},
		{"zero index", co + "2 2 1\n0 1 1\n", false, 3, false, "1-based"},
		{"bad value", co + "2 2 1\n1 1 x\n", false, 3, false, "not a number"},
		{"missing value", co + "2 2 1\n1 1\n", false, 3, false, "2 fields"},
		{"extra value", co + "2 2 1\n1 1 1 1\n", false, 3, false, "4 fields"},
		{"non-integer in an integer file", "%%MatrixMarket matrix coordinate integer general\n1 1 1\n1 1 1.5\n", false, 3, false, "not an integer"},
		{"upper triangle in a symmetric file", file("upper_sym.mtx"), false, 3, false, "not below the diagonal"},
		{"diagonal in a skew-symmetric file", "%%MatrixMarket matrix coordinate real skew-symmetric\n2 2 1\n1 1 1\n", false, 3, false, "not below"},
		{"non-square symmetric", "%%MatrixMarket matrix coordinate real symmetric\n2 3 0\n", false, 2, false, "square"},
		{"more entries than the matrix holds", co + "2 2 5\n", false, 2, false, "more than"},
		{"symmetric count over the triangle", "%%MatrixMarket matrix coordinate real symmetric\n2 2 4\n", false, 2, false, "more than"},
		{"huge declared count, short input", file("huge_decl.mtx"), false, 3, false, "entry 2 of"},
		{"line too long", co + "1 1 1\n1 1 " + strings.Repeat("1", mmMaxLine) + "\n", false, 3, false, "longer than"},
		{"vector with two columns", "%%MatrixMarket matrix array real general\n2 2\n1\n2\n3\n4\n", true, 2, false, "2 columns"},
		{"symmetric vector", "%%MatrixMarket matrix array real symmetric\n1 1\n1\n", true, 1, true, "symmetric"},
		{"pattern vector", "%%MatrixMarket matrix array pattern general\n1 1\n", true, 1, false, "pattern"},
		{"short vector", "%%MatrixMarket matrix array real general\n3 1\n1\n2\n", true, 4, false, "value 3 of 3"},
		{"two values on a vector line", "%%MatrixMarket matrix array real general\n2 1\n1 2\n", true, 3, false, "2 fields"},
	}
	for _, tt := range tests {
		t.Run(tt.reason, func(t *testing.T) {
			var err error
			if tt.vector {
				_, err = ReadMatrixMarketVector(strings.NewReader(tt.in))
			} else {
				_, err = ReadMatrixMarket(strings.NewReader(tt.in))
			}
			var fe *FormatError
			if !errors.As(err, &fe) || !errors.Is(err, ErrFormat) {
				t.Fatalf("error %v, want a *FormatError", err)
			}
			if fe.Line != tt.line {
				t.Errorf("error at line %d, want %d (%v)", fe.Line, tt.line, err)
			}
			if got := errors.Is(err, ErrUnsupported); got != tt.unsupported {
				t.Errorf("errors.Is(err, ErrUnsupported) = %v, want %v (%v)", got, tt.unsupported, err)
			}
			if !strings.Contains(err.Error(), tt.msg) {
				t.Errorf("error %q does not mention %q", err, tt.msg)
			}
		})
	}
}

func TestMaxEntries(t *testing.T) {
	tests := []struct {
		rows, cols int
		symmetry   string
		want       int
	}{
		{3, 4, "general", 12},
		{0, 4, "general", 0},
		{4, 4, "symmetric", 10},
		{5, 5, "symmetric", 15},
		{4, 4, "skew-symmetric", 6},
		{1, 1, "skew-symmetric", 0},
		{math.MaxInt, 2, "general", math.MaxInt},
		{math.MaxInt, math.MaxInt, "symmetric", math.MaxInt},
		{math.MaxInt - 1, math.MaxInt - 1, "symmetric", math.MaxInt},
	}
	for _, tt := range tests {
		if got := maxEntries(tt.rows, tt.cols, tt.symmetry); got != tt.want {
			t.Errorf("maxEntries(%d, %d, %s) = %d, want %d", tt.rows, tt.cols, tt.symmetry, got, tt.want)
		}
	}
}
