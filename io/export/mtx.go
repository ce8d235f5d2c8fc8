package export

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// Matrix Market exchange format (R. F. Boisvert, R. Pozo and K. A.
// Remington, "The Matrix Market Exchange Formats: Initial Design", NIST
// report NISTIR 5935, 1996): a banner line "%%MatrixMarket matrix FORMAT
// FIELD SYMMETRY", comment lines starting with '%', a size line, then the
// entries with 1-based indices.

const (
	mmBanner = "%%MatrixMarket"
	// mmMaxLine is the longest line the readers accept, in bytes.
	mmMaxLine = 1 << 16
	// mmPrealloc caps the capacity reserved from a declared entry count.
	mmPrealloc = 1 << 14
)

// WriteMatrixMarket writes an n×n sparse matrix in Matrix Market coordinate
// format, "%%MatrixMarket matrix coordinate real general" or "... real
// symmetric".
//
// entries is called twice, once to count and once to write, and must emit
// the same entries both times: emit(i, j, v) with zero-based row i and
// column j in [0, n). They are written in the order emitted, with 1-based
// indices and the shortest decimal form that reads back to the same
// float64. With symmetric set the file holds the lower triangle only, as
// the format requires: entries with i < j are skipped, so entries may emit
// the whole matrix or only its lower triangle. Duplicates are written as
// they come (readers usually add them).
//
// comment may hold several lines; each becomes a '%' comment line after the
// banner. An index out of range or a change in the entries between the two
// calls gives an error wrapping ErrInvalid, and the output must then be
// discarded.
func WriteMatrixMarket(w io.Writer, n int, entries func(emit func(i, j int, v float64)), symmetric bool, comment string) error {
	if n < 0 {
		return invalidf("matrix size %d is negative", n)
	}
	var bad error
	check := func(i, j int) bool {
		if bad != nil {
			return false
		}
		if i < 0 || i >= n || j < 0 || j >= n {
			bad = invalidf("matrix entry (%d, %d) is outside the %d×%d matrix (indices are zero-based)", i, j, n, n)
			return false
		}
		return !symmetric || i >= j
	}
	nnz := 0
	entries(func(i, j int, v float64) {
		if check(i, j) {
			nnz++
		}
	})
	if bad != nil {
		return bad
	}

	bw := bufio.NewWriterSize(w, 64<<10)
	sym := "general"
	if symmetric {
		sym = "symmetric"
	}
	bw.WriteString(mmBanner + " matrix coordinate real " + sym + "\n")
	writeComment(bw, comment)
	fmt.Fprintf(bw, "%d %d %d\n", n, n, nnz)
	written := 0
	var line []byte
	entries(func(i, j int, v float64) {
		if !check(i, j) {
			return
		}
		written++
		line = strconv.AppendInt(line[:0], int64(i)+1, 10)
		line = append(line, ' ')
		line = strconv.AppendInt(line, int64(j)+1, 10)
		line = append(line, ' ')
		line = strconv.AppendFloat(line, v, 'g', -1, 64)
		line = append(line, '\n')
		bw.Write(line)
	})
	if bad != nil {
		return bad
	}
	if written != nnz {
		return invalidf("the matrix entries changed between the counting and the writing pass (%d, then %d); emit the same entries on every call", nnz, written)
	}
	return bw.Flush()
}

// WriteMatrixMarketVector writes b as a dense n×1 Matrix Market array,
// "%%MatrixMarket matrix array real general", one value per line in the
// shortest decimal form that reads back to the same float64. comment is
// written as for WriteMatrixMarket.
func WriteMatrixMarketVector(w io.Writer, b []float64, comment string) error {
	bw := bufio.NewWriterSize(w, 64<<10)
	bw.WriteString(mmBanner + " matrix array real general\n")
	writeComment(bw, comment)
	fmt.Fprintf(bw, "%d 1\n", len(b))
	var line []byte
	for _, v := range b {
		line = strconv.AppendFloat(line[:0], v, 'g', -1, 64)
		line = append(line, '\n')
		bw.Write(line)
	}
	return bw.Flush()
}

func writeComment(bw *bufio.Writer, comment string) {
	if comment == "" {
		return
	}
	for _, l := range strings.Split(strings.TrimRight(comment, "\n"), "\n") {
		bw.WriteString("% " + strings.TrimRight(l, "\r") + "\n")
	}
}

// Triplets is a sparse matrix in coordinate form with zero-based indices:
// entry k is V[k] at row I[k], column J[k]. Duplicates may occur and mean
// their sum.
type Triplets struct {
	Rows, Cols int
	I, J       []int
	V          []float64
	// Symmetry is the symmetry declared by the file: "general",
	// "symmetric" or "skew-symmetric". The entries are already expanded to
	// the full matrix whatever it says.
	Symmetry string
}

// ReadMatrixMarket reads a real, integer or pattern matrix in Matrix Market
// coordinate format. Symmetric and skew-symmetric files are expanded: each
// off-diagonal entry (i, j) also gives (j, i) with the same or the negated
// value. Pattern entries get the value 1.
//
// Keywords are case-insensitive; comment and blank lines may appear before
// the size line and between entries. The file must hold exactly the
// declared number of entries, with indices in range, and symmetric files
// only entries on or below the diagonal (strictly below for
// skew-symmetric). Malformed input gives a *FormatError carrying the line
// number; complex and Hermitian matrices wrap ErrUnsupported. Memory grows
// with the entries actually read, not with the declared count.
func ReadMatrixMarket(r io.Reader) (*Triplets, error) {
	mr := newMMReader(r)
	format, field, symmetry, err := mr.banner()
	if err != nil {
		return nil, err
	}
	if format != "coordinate" {
		return nil, mr.unsupported(fmt.Sprintf("%s format (ReadMatrixMarket reads coordinate files; use ReadMatrixMarketVector for dense arrays)", format))
	}
	size, err := mr.sizeLine(3)
	if err != nil {
		return nil, err
	}
	m := &Triplets{Rows: size[0], Cols: size[1], Symmetry: symmetry}
	nnz := size[2]
	if symmetry != "general" && m.Rows != m.Cols {
		return nil, mr.errf(fmt.Sprintf("a %s matrix must be square, not %d×%d", symmetry, m.Rows, m.Cols), nil)
	}
	limit := maxEntries(m.Rows, m.Cols, symmetry)
	if nnz > limit {
		return nil, mr.errf(fmt.Sprintf("%d entries declared, more than a %d×%d %s matrix can hold (%d)", nnz, m.Rows, m.Cols, symmetry, limit), nil)
	}
	c := min(nnz, mmPrealloc)
	m.I, m.J, m.V = make([]int, 0, c), make([]int, 0, c), make([]float64, 0, c)
	want := 3
	if field == "pattern" {
		want = 2
	}
	for k := 0; k < nnz; k++ {
		f, err := mr.data(fmt.Sprintf("entry %d of %d", k+1, nnz))
		if err != nil {
			return nil, err
		}
		if len(f) != want {
			return nil, mr.errf(fmt.Sprintf("an entry has %d fields, expected %d", len(f), want), nil)
		}
		i, err1 := strconv.Atoi(f[0])
		j, err2 := strconv.Atoi(f[1])
		if err1 != nil || err2 != nil {
			return nil, mr.errf(fmt.Sprintf("entry indices %q %q are not integers", f[0], f[1]), nil)
		}
		if i < 1 || i > m.Rows || j < 1 || j > m.Cols {
			return nil, mr.errf(fmt.Sprintf("entry (%d, %d) is outside the %d×%d matrix (indices are 1-based)", i, j, m.Rows, m.Cols), nil)
		}
		v := 1.0
		if field != "pattern" {
			if v, err = mr.value(field, f[2]); err != nil {
				return nil, err
			}
		}
		switch {
		case symmetry == "symmetric" && i < j, symmetry == "skew-symmetric" && i <= j:
			return nil, mr.errf(fmt.Sprintf("entry (%d, %d) is not below the diagonal of a %s file", i, j, symmetry), nil)
		}
		m.I, m.J, m.V = append(m.I, i-1), append(m.J, j-1), append(m.V, v)
		if i != j && symmetry != "general" {
			if symmetry == "skew-symmetric" {
				v = -v
			}
			m.I, m.J, m.V = append(m.I, j-1), append(m.J, i-1), append(m.V, v)
		}
	}
	if err := mr.end(); err != nil {
		return nil, err
	}
	return m, nil
}

// ReadMatrixMarketVector reads a real or integer Matrix Market array with
// one column, as written by WriteMatrixMarketVector, and returns its
// values. Errors are as for ReadMatrixMarket.
func ReadMatrixMarketVector(r io.Reader) ([]float64, error) {
	mr := newMMReader(r)
	format, field, symmetry, err := mr.banner()
	if err != nil {
		return nil, err
	}
	if format != "array" {
		return nil, mr.unsupported(fmt.Sprintf("%s format (a vector is a dense array file)", format))
	}
	if field == "pattern" {
		return nil, mr.errf("an array file cannot have the pattern field", nil)
	}
	if symmetry != "general" {
		return nil, mr.unsupported(symmetry + " array (a vector is general)")
	}
	size, err := mr.sizeLine(2)
	if err != nil {
		return nil, err
	}
	if size[1] != 1 {
		return nil, mr.errf(fmt.Sprintf("the array has %d columns; a vector has 1", size[1]), nil)
	}
	n := size[0]
	b := make([]float64, 0, min(n, mmPrealloc))
	for k := 0; k < n; k++ {
		f, err := mr.data(fmt.Sprintf("value %d of %d", k+1, n))
		if err != nil {
			return nil, err
		}
		if len(f) != 1 {
			return nil, mr.errf(fmt.Sprintf("a value line has %d fields, expected 1", len(f)), nil)
		}
		v, err := mr.value(field, f[0])
		if err != nil {
			return nil, err
		}
		b = append(b, v)
	}
	if err := mr.end(); err != nil {
		return nil, err
	}
	return b, nil
}

// maxEntries is the most entries a rows×cols matrix of the given symmetry
// can store, saturating at math.MaxInt.
func maxEntries(rows, cols int, symmetry string) int {
	if rows == 0 || cols == 0 {
		return 0
	}
	switch symmetry {
	case "symmetric", "skew-symmetric":
		n := rows
		if symmetry == "skew-symmetric" {
			n--
		}
		// n(n+1)/2 without overflow.
		a, b := n/2, n+1
		if n%2 != 0 {
			a, b = n, n/2+1
		}
		if a != 0 && b > math.MaxInt/a {
			return math.MaxInt
		}
		return a * b
	}
	if cols > math.MaxInt/rows {
		return math.MaxInt
	}
	return rows * cols
}

// mmReader reads the lines of a Matrix Market file.
type mmReader struct {
	sc   *bufio.Scanner
	line int
}

func newMMReader(r io.Reader) *mmReader {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), mmMaxLine)
	return &mmReader{sc: sc}
}

func (mr *mmReader) errf(msg string, err error) *FormatError {
	return &FormatError{Format: "Matrix Market", Line: mr.line, Offset: -1, Msg: msg, Err: err}
}

func (mr *mmReader) unsupported(msg string) *FormatError { return mr.errf(msg, ErrUnsupported) }

// next returns the next line, or ok = false at the end of input or on a
// read error, which it returns.
func (mr *mmReader) next() (string, bool, error) {
	if !mr.sc.Scan() {
		if err := mr.sc.Err(); err != nil {
			mr.line++
			if err == bufio.ErrTooLong {
				return "", false, mr.errf(fmt.Sprintf("the line is longer than %d bytes", mmMaxLine), err)
			}
			return "", false, err
		}
		return "", false, nil
	}
	mr.line++
	return mr.sc.Text(), true, nil
}

// banner reads and checks the banner line and returns its lower-cased
// format, field and symmetry.
func (mr *mmReader) banner() (format, field, symmetry string, err error) {
	l, ok, err := mr.next()
	if err != nil {
		return "", "", "", err
	}
	if !ok {
		return "", "", "", mr.errf("the input is empty", io.ErrUnexpectedEOF)
	}
	f := strings.Fields(l)
	if len(f) == 0 || !strings.EqualFold(f[0], mmBanner) {
		return "", "", "", mr.errf("the file does not start with the %%MatrixMarket banner", nil)
	}
	if len(f) != 5 {
		return "", "", "", mr.errf("the banner needs 4 keywords after %%MatrixMarket: matrix, format, field, symmetry", nil)
	}
	for k := range f {
		f[k] = strings.ToLower(f[k])
	}
	if f[1] != "matrix" {
		return "", "", "", mr.unsupported(fmt.Sprintf("object %q (only matrix is defined)", f[1]))
	}
	format, field, symmetry = f[2], f[3], f[4]
	switch format {
	case "coordinate", "array":
	default:
		return "", "", "", mr.errf(fmt.Sprintf("unknown format %q (expected coordinate or array)", format), nil)
	}
	switch field {
	case "real", "integer", "pattern":
	case "complex":
		return "", "", "", mr.unsupported("complex values")
	default:
		return "", "", "", mr.errf(fmt.Sprintf("unknown field %q (expected real, integer, pattern or complex)", field), nil)
	}
	switch symmetry {
	case "general", "symmetric", "skew-symmetric":
	case "hermitian":
		return "", "", "", mr.unsupported("hermitian symmetry")
	default:
		return "", "", "", mr.errf(fmt.Sprintf("unknown symmetry %q (expected general, symmetric or skew-symmetric)", symmetry), nil)
	}
	return format, field, symmetry, nil
}

// sizeLine skips comments and blank lines and reads the size line of n
// non-negative integers.
func (mr *mmReader) sizeLine(n int) ([]int, error) {
	f, err := mr.data("the size line")
	if err != nil {
		return nil, err
	}
	if len(f) != n {
		return nil, mr.errf(fmt.Sprintf("the size line has %d numbers, expected %d", len(f), n), nil)
	}
	size := make([]int, n)
	for k, s := range f {
		v, err := strconv.Atoi(s)
		if err != nil || v < 0 {
			return nil, mr.errf(fmt.Sprintf("size %q is not a non-negative integer", s), nil)
		}
		size[k] = v
	}
	return size, nil
}

// data returns the fields of the next line that is neither blank nor a
// comment; what names the expected line for the error at end of input.
func (mr *mmReader) data(what string) ([]string, error) {
	for {
		l, ok, err := mr.next()
		if err != nil {
			return nil, err
		}
		if !ok {
			return nil, mr.errf("the input ends before "+what, io.ErrUnexpectedEOF)
		}
		if strings.HasPrefix(strings.TrimSpace(l), "%") {
			continue
		}
		if f := strings.Fields(l); len(f) > 0 {
			return f, nil
		}
	}
}

// value parses one number of the given field.
func (mr *mmReader) value(field, s string) (float64, error) {
	if field == "integer" {
		v, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			return 0, mr.errf(fmt.Sprintf("value %q is not an integer", s), nil)
		}
		return float64(v), nil
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil && !isRangeErr(err) {
		return 0, mr.errf(fmt.Sprintf("value %q is not a number", s), nil)
	}
	return v, nil
}

func isRangeErr(err error) bool {
	ne, ok := err.(*strconv.NumError)
	return ok && ne.Err == strconv.ErrRange
}

// end checks that only comments and blank lines follow the last entry.
func (mr *mmReader) end() error {
	for {
		l, ok, err := mr.next()
		if err != nil {
			return err
		}
		if !ok {
			return nil
		}
		t := strings.TrimSpace(l)
		if t != "" && !strings.HasPrefix(t, "%") {
			return mr.errf("more entries than the size line declares", nil)
		}
	}
}
