package archive

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"

	"github.com/phigrid/phigrid/bc"
)

// Element types of a section; see the package documentation.
const (
	typeBytes    byte = 1
	typeJSON     byte = 2
	typeUint8    byte = 3
	typeInt8     byte = 4
	typeInt32    byte = 5
	typeFloat64  byte = 6
	typeCrossing byte = 7
)

// elemSize is the size in bytes of one element of each type.
var elemSize = [...]uint64{typeBytes: 1, typeJSON: 1, typeUint8: 1, typeInt8: 1, typeInt32: 4, typeFloat64: 8, typeCrossing: crossingSize}

var typeNames = [...]string{typeBytes: "bytes", typeJSON: "json", typeUint8: "uint8", typeInt8: "int8", typeInt32: "int32", typeFloat64: "float64", typeCrossing: "crossing"}

// crossingSize is the size of one encoded bc.Crossing: two int32, two int8
// and six float64.
const crossingSize = 4 + 4 + 1 + 1 + 6*8

// maxName is the longest section name.
const maxName = 64

// chunk is the number of bytes encoded or decoded at a time.
const chunk = 64 << 10

// sectionWriter writes sections with a sticky error.
type sectionWriter struct {
	w   io.Writer
	err error
	buf []byte
}

func (s *sectionWriter) write(b []byte) {
	if s.err != nil {
		return
	}
	_, s.err = s.w.Write(b)
}

func (s *sectionWriter) header(name string, typ byte, length uint64) {
	h := make([]byte, 0, 2+len(name)+8)
	h = append(h, byte(len(name)))
	h = append(h, name...)
	h = append(h, typ)
	h = binary.LittleEndian.AppendUint64(h, length)
	s.write(h)
}

func (s *sectionWriter) raw(name string, typ byte, b []byte) {
	s.header(name, typ, uint64(len(b)))
	s.write(b)
}

// flushIf writes the buffer when it is full enough.
func (s *sectionWriter) flushIf(force bool) {
	if len(s.buf) >= chunk || (force && len(s.buf) > 0) {
		s.write(s.buf)
		s.buf = s.buf[:0]
	}
}

func (s *sectionWriter) float64s(name string, v []float64) {
	s.header(name, typeFloat64, 8*uint64(len(v)))
	for _, x := range v {
		s.buf = binary.LittleEndian.AppendUint64(s.buf, math.Float64bits(x))
		s.flushIf(false)
	}
	s.flushIf(true)
}

func (s *sectionWriter) int32s(name string, v []int32) {
	s.header(name, typeInt32, 4*uint64(len(v)))
	for _, x := range v {
		s.buf = binary.LittleEndian.AppendUint32(s.buf, uint32(x))
		s.flushIf(false)
	}
	s.flushIf(true)
}

func (s *sectionWriter) kinds(name string, v []bc.NodeKind) {
	s.header(name, typeUint8, uint64(len(v)))
	for _, x := range v {
		s.buf = append(s.buf, byte(x))
		s.flushIf(false)
	}
	s.flushIf(true)
}

func (s *sectionWriter) crossings(name string, v []bc.Crossing) {
	s.header(name, typeCrossing, crossingSize*uint64(len(v)))
	for _, c := range v {
		s.buf = binary.LittleEndian.AppendUint32(s.buf, uint32(c.Free))
		s.buf = binary.LittleEndian.AppendUint32(s.buf, uint32(c.Node))
		s.buf = append(s.buf, byte(c.Axis), byte(c.Dir))
		for _, f := range [...]float64{c.Frac, c.X, c.Y, c.Nx, c.Ny, c.EpsR} {
			s.buf = binary.LittleEndian.AppendUint64(s.buf, math.Float64bits(f))
		}
		s.flushIf(false)
	}
	s.flushIf(true)
}

// countingReader counts the bytes read through it and keeps the first
// error of the underlying reader.
type countingReader struct {
	r   io.Reader
	n   int64
	err error
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += int64(n)
	if err != nil && c.err == nil {
		c.err = err
	}
	return n, err
}

// sectionReader reads sections from the decompressed payload.
type sectionReader struct {
	r *countingReader
	// Current section.
	name   string
	typ    byte
	length uint64
	start  int64
}

// fail returns a FormatError for the current section at the current
// offset. A failure of the decompressor itself is reported as such,
// whatever was being read.
func (s *sectionReader) fail(err error, format string, args ...any) error {
	msg := fmt.Sprintf(format, args...)
	if e := s.r.err; e != nil && !errors.Is(e, io.EOF) && !errors.Is(e, io.ErrUnexpectedEOF) {
		err, msg = e, "the compressed data is damaged"
	} else if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(e, io.ErrUnexpectedEOF) {
		err, msg = io.ErrUnexpectedEOF, msg+": the data ends early (is the file truncated?)"
	}
	name := s.name
	if name == "" {
		name = "payload"
	}
	return &FormatError{Section: name, Offset: s.r.n, Msg: msg, Err: err}
}

// next reads the next section header.
func (s *sectionReader) next() error {
	s.name, s.start = "", s.r.n
	var n [1]byte
	if _, err := io.ReadFull(s.r, n[:]); err != nil {
		return s.fail(err, "reading a section header (the payload needs an end section)")
	}
	if n[0] == 0 || n[0] > maxName {
		return s.fail(nil, "section name length %d is not in 1..%d", n[0], maxName)
	}
	b := make([]byte, int(n[0])+1+8)
	if _, err := io.ReadFull(s.r, b); err != nil {
		return s.fail(err, "reading a section header")
	}
	name := b[:n[0]]
	for _, c := range name {
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '.' || c == '_') {
			return s.fail(nil, "section name %q has a byte outside a–z, 0–9, '.' and '_'", name)
		}
	}
	s.name = string(name)
	s.typ = b[n[0]]
	s.length = binary.LittleEndian.Uint64(b[n[0]+1:])
	if int(s.typ) >= len(elemSize) || elemSize[s.typ] == 0 {
		return s.fail(nil, "unknown element type %d", s.typ)
	}
	if s.length%elemSize[s.typ] != 0 {
		return s.fail(nil, "length %d is not a multiple of the %s element size %d", s.length, typeNames[s.typ], elemSize[s.typ])
	}
	return nil
}

// expect checks the current section's type and, when count ≥ 0, its
// element count.
func (s *sectionReader) expect(typ byte, count int64) error {
	if s.typ != typ {
		return s.fail(nil, "element type is %s, want %s", typeNames[s.typ], typeNames[typ])
	}
	if count >= 0 && s.length != uint64(count)*elemSize[typ] {
		return s.fail(nil, "holds %d elements, want %d", s.length/elemSize[typ], count)
	}
	return nil
}

// each reads the section's data in chunks, passing each to f; memory is
// bounded by the chunk size whatever length the header declares.
func (s *sectionReader) each(f func([]byte)) error {
	esz := elemSize[s.typ]
	step := uint64(chunk) / esz * esz
	buf := make([]byte, min(step, s.length))
	for left := s.length; left > 0; {
		n := min(step, left)
		if _, err := io.ReadFull(s.r, buf[:n]); err != nil {
			return s.fail(err, "reading %d bytes of data", s.length)
		}
		f(buf[:n])
		left -= n
	}
	return nil
}

// skip discards the current section's data.
func (s *sectionReader) skip() error { return s.each(func([]byte) {}) }

// bytes returns the data of a bytes or json section of at most max bytes.
func (s *sectionReader) bytes(max int64) ([]byte, error) {
	if s.length > uint64(max) {
		return nil, s.fail(nil, "holds %d bytes, more than the limit of %d", s.length, max)
	}
	out := make([]byte, 0, min(s.length, chunk))
	err := s.each(func(b []byte) { out = append(out, b...) })
	return out, err
}

// float64s returns the data of a float64 section.
func (s *sectionReader) float64s() ([]float64, error) {
	out := make([]float64, 0, min(s.length/8, chunk))
	err := s.each(func(b []byte) {
		for i := 0; i+8 <= len(b); i += 8 {
			out = append(out, math.Float64frombits(binary.LittleEndian.Uint64(b[i:])))
		}
	})
	return out, err
}

// int32s returns the data of an int32 section.
func (s *sectionReader) int32s() ([]int32, error) {
	out := make([]int32, 0, min(s.length/4, chunk))
	err := s.each(func(b []byte) {
		for i := 0; i+4 <= len(b); i += 4 {
			out = append(out, int32(binary.LittleEndian.Uint32(b[i:])))
		}
	})
	return out, err
}

// kinds returns the data of a uint8 section as node kinds.
func (s *sectionReader) kinds() ([]bc.NodeKind, error) {
	out := make([]bc.NodeKind, 0, min(s.length, chunk))
	err := s.each(func(b []byte) {
		for _, k := range b {
			out = append(out, bc.NodeKind(k))
		}
	})
	return out, err
}

// crossings returns the data of a crossing section.
func (s *sectionReader) crossings() ([]bc.Crossing, error) {
	out := make([]bc.Crossing, 0, min(s.length/crossingSize, chunk/crossingSize))
	f := func(b []byte) float64 { return math.Float64frombits(binary.LittleEndian.Uint64(b)) }
	err := s.each(func(b []byte) {
		for i := 0; i+crossingSize <= len(b); i += crossingSize {
			r := b[i : i+crossingSize]
			out = append(out, bc.Crossing{
				Free: int32(binary.LittleEndian.Uint32(r[0:])),
				Node: int32(binary.LittleEndian.Uint32(r[4:])),
				Axis: int8(r[8]), Dir: int8(r[9]),
				Frac: f(r[10:]), X: f(r[18:]), Y: f(r[26:]), Nx: f(r[34:]), Ny: f(r[42:]), EpsR: f(r[50:]),
			})
		}
	})
	return out, err
}
