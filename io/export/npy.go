package export

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// NPY layout (NumPy Enhancement Proposal 1, "A simple file format for NumPy
// arrays", and the numpy.lib.format documentation):
//
//	magic     "\x93NUMPY"                         6 bytes
//	version   major, minor                        2 bytes (1.0, 2.0 or 3.0)
//	hlen      header length, little-endian        uint16 (1.0) or uint32 (2.0, 3.0)
//	header    Python dict literal, space-padded, ending in '\n'
//	data      the elements in C (row-major) order
//
// The total length of magic, version, hlen and header is a multiple of 64.

const (
	npyMagic = "\x93NUMPY"
	// npyAlign is the alignment of the data start (numpy's ARRAY_ALIGN).
	npyAlign = 64
	// npyGrowth is the width numpy reserves for the first dimension so the
	// header can be rewritten in place when an array grows (numpy's
	// GROWTH_AXIS_MAX_DIGITS).
	npyGrowth = 21
	// npyChunk is the number of elements converted per read or write.
	npyChunk = 4096
	// npyMaxDims is the most dimensions an array may have, as in NumPy.
	npyMaxDims = 64
)

// MaxNPYHeader is the largest NPY header ReadNPY accepts, in bytes. numpy
// itself refuses headers over 10000 bytes by default.
const MaxNPYHeader = 1 << 16

// WriteNPY writes data as a NumPy .npy file (format version 1.0) with
// element type '<f8' (little-endian float64) in C order. The header is
// byte-for-byte what numpy.save writes for the same array.
//
// The shape defaults to one dimension of len(data). Otherwise it has at
// most 64 dimensions, each ≥ 0, and their product must be len(data). A field on the
// nodes of a grid g is written with shape (g.Ny(), g.Nx()), so that element
// [j, i] of the NumPy array is node (i, j); a field on cells uses
// (g.Ny()−1, g.Nx()−1).
func WriteNPY(w io.Writer, data []float64, shape ...int) error {
	if len(shape) == 0 {
		shape = []int{len(data)}
	}
	if len(shape) > npyMaxDims {
		return invalidf("NPY arrays have at most %d dimensions, not %d", npyMaxDims, len(shape))
	}
	n := 1
	for k, d := range shape {
		if d < 0 {
			return invalidf("NPY shape %s has a negative dimension %d at axis %d", pyShape(shape), d, k)
		}
		if d != 0 && n > math.MaxInt/d {
			return invalidf("NPY shape %s is too large", pyShape(shape))
		}
		n *= d
	}
	if n != len(data) {
		return invalidf("NPY shape %s holds %d values but the data has %d; pass a shape whose product is the data length", pyShape(shape), n, len(data))
	}
	if _, err := w.Write(npyHeader("<f8", shape)); err != nil {
		return err
	}
	buf := make([]byte, 8*min(len(data), npyChunk))
	for len(data) > 0 {
		m := min(len(data), npyChunk)
		for k, v := range data[:m] {
			binary.LittleEndian.PutUint64(buf[8*k:], math.Float64bits(v))
		}
		if _, err := w.Write(buf[:8*m]); err != nil {
			return err
		}
		data = data[m:]
	}
	return nil
}

// pyShape returns the Python repr of a shape tuple: "()", "(3,)", "(2, 3)".
func pyShape(shape []int) string {
	var b strings.Builder
	b.WriteByte('(')
	for k, d := range shape {
		if k > 0 {
			b.WriteString(", ")
		}
		b.WriteString(strconv.Itoa(d))
	}
	if len(shape) == 1 {
		b.WriteByte(',')
	}
	b.WriteByte(')')
	return b.String()
}

// npyHeader returns magic, version, length and padded header for a C-order
// array, laid out as numpy's _write_array_header does. With at most
// npyMaxDims dimensions the header always fits format version 1.0.
func npyHeader(descr string, shape []int) []byte {
	dict := "{'descr': '" + descr + "', 'fortran_order': False, 'shape': " + pyShape(shape) + ", }"
	if len(shape) > 0 {
		dict += strings.Repeat(" ", max(0, npyGrowth-len(strconv.Itoa(shape[0]))))
	}
	hlen := len(dict) + 1 // with the closing newline
	const prefix = len(npyMagic) + 2 + 2
	pad := npyAlign - (prefix+hlen)%npyAlign
	b := make([]byte, 0, prefix+hlen+pad)
	b = append(b, npyMagic...)
	b = append(b, 1, 0)
	b = binary.LittleEndian.AppendUint16(b, uint16(hlen+pad))
	b = append(b, dict...)
	b = append(b, strings.Repeat(" ", pad)...)
	return append(b, '\n')
}

// npyType describes an element type ReadNPY converts to float64.
type npyType struct {
	size    int
	convert func(b []byte) float64
}

var npyTypes = map[string]npyType{
	"<f8": {8, func(b []byte) float64 { return math.Float64frombits(binary.LittleEndian.Uint64(b)) }},
	"<f4": {4, func(b []byte) float64 { return float64(math.Float32frombits(binary.LittleEndian.Uint32(b))) }},
	"<i4": {4, func(b []byte) float64 { return float64(int32(binary.LittleEndian.Uint32(b))) }},
	"<i8": {8, func(b []byte) float64 { return float64(int64(binary.LittleEndian.Uint64(b))) }},
	"|u1": {1, func(b []byte) float64 { return float64(b[0]) }},
	"<u1": {1, func(b []byte) float64 { return float64(b[0]) }},
}

// ReadNPY reads a NumPy .npy file (format version 1.0, 2.0 or 3.0) and
// returns its elements as float64 in C order together with its shape. A 0-d
// array has an empty shape and one element.
//
// The element type must be '<f8', '<f4', '<i4', '<i8' or '|u1'; 64-bit
// integers beyond ±2⁵³ are rounded to the nearest float64. Fortran-ordered
// arrays, big-endian and structured types are refused with an error
// wrapping ErrUnsupported. Malformed input gives a *FormatError.
//
// ReadNPY reads exactly the header and the data and nothing after them.
// Memory grows with the data actually read, so a header that declares more
// elements than the input holds fails with io.ErrUnexpectedEOF instead of a
// large allocation; headers over MaxNPYHeader bytes are refused.
func ReadNPY(r io.Reader) (data []float64, shape []int, err error) {
	var pre [10]byte
	if _, err := io.ReadFull(r, pre[:]); err != nil {
		return nil, nil, npyErr(0, "the input is too short for an NPY file", eofErr(err))
	}
	if string(pre[:6]) != npyMagic {
		return nil, nil, npyErr(0, "the input does not start with the NPY magic \\x93NUMPY", nil)
	}
	major, minor := pre[6], pre[7]
	if minor != 0 || major < 1 || major > 3 {
		return nil, nil, npyErr(6, fmt.Sprintf("format version %d.%d", major, minor), ErrUnsupported)
	}
	var hlen int
	off := int64(10)
	if major == 1 {
		hlen = int(binary.LittleEndian.Uint16(pre[8:]))
	} else {
		var b [2]byte
		if _, err := io.ReadFull(r, b[:]); err != nil {
			return nil, nil, npyErr(10, "the header length is cut short", eofErr(err))
		}
		h := binary.LittleEndian.Uint32(append(pre[8:10:10], b[:]...))
		if h > MaxNPYHeader {
			return nil, nil, npyErr(8, fmt.Sprintf("the header declares %d bytes, more than the %d accepted", h, MaxNPYHeader), nil)
		}
		hlen = int(h)
		off = 12
	}
	hdr := make([]byte, hlen)
	if _, err := io.ReadFull(r, hdr); err != nil {
		return nil, nil, npyErr(off, fmt.Sprintf("the header is cut short (declared %d bytes)", hlen), eofErr(err))
	}
	descr, fortran, shape, err := parseNPYHeader(hdr, off)
	if err != nil {
		return nil, nil, err
	}
	off += int64(hlen)
	typ, ok := npyTypes[descr]
	if !ok {
		return nil, nil, npyErr(off-int64(hlen), fmt.Sprintf("element type %q (readable types are '<f8', '<f4', '<i4', '<i8' and '|u1'; convert with arr.astype('<f8'))", descr), ErrUnsupported)
	}
	if fortran {
		// A Fortran-ordered array with at most one axis longer than 1 has
		// the same memory layout as a C-ordered one.
		long := 0
		for _, d := range shape {
			if d > 1 {
				long++
			}
		}
		if long > 1 {
			return nil, nil, npyErr(off-int64(hlen), "the array is in Fortran order (save np.ascontiguousarray(arr) instead)", ErrUnsupported)
		}
	}
	count := 1
	for _, d := range shape {
		if d != 0 && count > math.MaxInt/typ.size/d {
			return nil, nil, npyErr(off-int64(hlen), fmt.Sprintf("shape %s is too large", pyShape(shape)), nil)
		}
		count *= d
	}
	data = make([]float64, 0, min(count, npyChunk))
	buf := make([]byte, typ.size*min(count, npyChunk))
	for len(data) < count {
		m := min(count-len(data), npyChunk)
		b := buf[:m*typ.size]
		if got, err := io.ReadFull(r, b); err != nil {
			return nil, nil, npyErr(off+int64(got), fmt.Sprintf("the data ends after %d of %d elements", len(data)+got/typ.size, count), eofErr(err))
		}
		for k := 0; k < m; k++ {
			data = append(data, typ.convert(b[k*typ.size:]))
		}
		off += int64(len(b))
	}
	return data, shape, nil
}

// eofErr turns a clean EOF inside a structure into io.ErrUnexpectedEOF.
func eofErr(err error) error {
	if errors.Is(err, io.EOF) {
		return io.ErrUnexpectedEOF
	}
	return err
}

func npyErr(off int64, msg string, err error) *FormatError {
	return &FormatError{Format: "NPY", Offset: off, Msg: msg, Err: err}
}

// parseNPYHeader parses the header dict literal. off is the byte offset of
// the header in the file, for error positions.
func parseNPYHeader(hdr []byte, off int64) (descr string, fortran bool, shape []int, err error) {
	p := &pyParser{s: hdr, off: off}
	var seen [3]bool
	p.space()
	if !p.eat('{') {
		return "", false, nil, p.errf("the header is not a dict literal")
	}
	for {
		p.space()
		if p.eat('}') {
			break
		}
		key, err := p.str()
		if err != nil {
			return "", false, nil, err
		}
		p.space()
		if !p.eat(':') {
			return "", false, nil, p.errf("expected ':' after key %q", key)
		}
		p.space()
		switch key {
		case "descr":
			if p.peek() == '[' {
				return "", false, nil, p.unsupported("structured element types")
			}
			descr, err = p.str()
			seen[0] = true
		case "fortran_order":
			fortran, err = p.boolean()
			seen[1] = true
		case "shape":
			shape, err = p.tuple()
			seen[2] = true
		default:
			return "", false, nil, p.errf("unexpected header key %q (expected descr, fortran_order and shape)", key)
		}
		if err != nil {
			return "", false, nil, err
		}
		p.space()
		if p.eat('}') {
			break
		}
		if !p.eat(',') {
			return "", false, nil, p.errf("expected ',' or '}' in the header")
		}
	}
	p.space()
	if p.i != len(p.s) {
		return "", false, nil, p.errf("unexpected text after the header dict")
	}
	for k, name := range []string{"descr", "fortran_order", "shape"} {
		if !seen[k] {
			return "", false, nil, p.errf("the header has no %q key", name)
		}
	}
	return descr, fortran, shape, nil
}

// pyParser reads the small subset of Python literals used in NPY headers.
type pyParser struct {
	s   []byte
	i   int
	off int64
}

func (p *pyParser) errf(format string, args ...any) error {
	return npyErr(p.off+int64(p.i), fmt.Sprintf(format, args...), nil)
}

func (p *pyParser) unsupported(what string) error {
	return npyErr(p.off+int64(p.i), what, ErrUnsupported)
}

func (p *pyParser) peek() byte {
	if p.i < len(p.s) {
		return p.s[p.i]
	}
	return 0
}

func (p *pyParser) eat(c byte) bool {
	if p.peek() == c {
		p.i++
		return true
	}
	return false
}

func (p *pyParser) space() {
	for p.i < len(p.s) {
		switch p.s[p.i] {
		case ' ', '\t', '\n', '\r':
			p.i++
		default:
			return
		}
	}
}

// str reads a quoted string without escapes.
func (p *pyParser) str() (string, error) {
	q := p.peek()
	if q != '\'' && q != '"' {
		return "", p.errf("expected a quoted string")
	}
	start := p.i + 1
	for j := start; j < len(p.s); j++ {
		switch p.s[j] {
		case q:
			p.i = j + 1
			return string(p.s[start:j]), nil
		case '\\', '\n':
			p.i = j
			return "", p.errf("unexpected character %q in a header string", p.s[j])
		}
	}
	return "", p.errf("unterminated string in the header")
}

func (p *pyParser) boolean() (bool, error) {
	for _, c := range []struct {
		word string
		v    bool
	}{{"True", true}, {"False", false}} {
		if bytes.HasPrefix(p.s[p.i:], []byte(c.word)) {
			p.i += len(c.word)
			return c.v, nil
		}
	}
	return false, p.errf("expected True or False")
}

// tuple reads a tuple of non-negative integers such as (), (3,), (2, 3) or
// the Python 2 form (3L,).
func (p *pyParser) tuple() ([]int, error) {
	if !p.eat('(') {
		return nil, p.errf("expected a shape tuple")
	}
	shape := []int{}
	for {
		p.space()
		if p.eat(')') {
			break
		}
		j := p.i
		for j < len(p.s) && p.s[j] >= '0' && p.s[j] <= '9' {
			j++
		}
		if j == p.i {
			return nil, p.errf("expected a non-negative integer in the shape")
		}
		d, err := strconv.ParseInt(string(p.s[p.i:j]), 10, 0)
		if err != nil {
			return nil, p.errf("shape dimension %s is too large", p.s[p.i:j])
		}
		if len(shape) >= npyMaxDims {
			return nil, p.errf("the shape has more than %d dimensions", npyMaxDims)
		}
		shape = append(shape, int(d))
		p.i = j
		p.eat('L')
		p.space()
		if p.eat(')') {
			if len(shape) == 1 {
				// (3) is the integer 3, not a tuple; numpy would not write it.
				return nil, p.errf("a one-dimensional shape needs a trailing comma, as in (3,)")
			}
			break
		}
		if !p.eat(',') {
			return nil, p.errf("expected ',' or ')' in the shape")
		}
	}
	return shape, nil
}
