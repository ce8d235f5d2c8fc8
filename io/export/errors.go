package export

import (
	"errors"
	"fmt"
)

// ErrInvalid is wrapped by every error a writer returns because its
// arguments do not fit together (wrong slice lengths, bad shapes, unusable
// names, out-of-range matrix indices). Nothing was written to the
// destination, or what was written must be discarded.
var ErrInvalid = errors.New("export: invalid input")

// ErrFormat is matched (with errors.Is) by every *FormatError a reader
// returns: the input is not a well-formed file of the expected format.
var ErrFormat = errors.New("export: malformed input")

// ErrUnsupported is wrapped by a *FormatError when the input is well formed
// but uses a feature this package does not read (an element type, a
// Fortran-ordered array, a complex matrix). Such an error also matches
// ErrFormat.
var ErrUnsupported = errors.New("export: unsupported feature")

// FormatError reports where and why a reader rejected its input.
type FormatError struct {
	// Format names the file format, such as "NPY" or "Matrix Market".
	Format string
	// Line is the 1-based line of a line-oriented format, or 0.
	Line int
	// Offset is the byte offset in a binary format, or -1 when Line is used.
	Offset int64
	// Msg says what is wrong and, where it helps, what to do about it.
	Msg string
	// Err is the underlying cause (io.ErrUnexpectedEOF, ErrUnsupported, a
	// strconv error), or nil.
	Err error
}

// Error returns the format, the position and the message.
func (e *FormatError) Error() string {
	pos := ""
	switch {
	case e.Line > 0:
		pos = fmt.Sprintf(" line %d", e.Line)
	case e.Offset >= 0:
		pos = fmt.Sprintf(" byte %d", e.Offset)
	}
	s := "export: " + e.Format + pos + ": " + e.Msg
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s
}

// Unwrap returns the underlying cause.
func (e *FormatError) Unwrap() error { return e.Err }

// Is reports whether target is ErrFormat, so that every FormatError matches it.
func (e *FormatError) Is(target error) bool { return target == ErrFormat }

// invalidf returns an error wrapping ErrInvalid.
func invalidf(format string, args ...any) error {
	return fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)
}
