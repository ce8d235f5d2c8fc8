package archive

import (
	"errors"
	"fmt"
)

// ErrFormat is matched (with errors.Is) by every *FormatError.
var ErrFormat = errors.New("archive: not a valid phigrid archive")

// ErrVersion is matched by every *VersionError.
var ErrVersion = errors.New("archive: unsupported archive version")

// ErrInvalid is wrapped by the errors Write returns for an Archive that is
// incomplete or inconsistent; nothing has been written then.
var ErrInvalid = errors.New("archive: invalid archive contents")

// FormatError reports why and where Read rejected its input.
type FormatError struct {
	// Section is the section being read, or "" for the file header.
	Section string
	// Offset is the byte offset of the problem: in the file for the
	// header, in the decompressed payload otherwise; −1 when unknown.
	Offset int64
	// Msg says what is wrong.
	Msg string
	// Err is the underlying cause (io.ErrUnexpectedEOF, a zstd or JSON
	// error), or nil.
	Err error
}

// Error returns the message with its position and a hint.
func (e *FormatError) Error() string {
	where := "header"
	if e.Section != "" {
		where = "section " + e.Section
	}
	s := "archive: " + where
	if e.Offset >= 0 {
		s += fmt.Sprintf(" at byte %d", e.Offset)
	}
	s += ": " + e.Msg
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s + " (the file is damaged or not a phigrid archive; write it again from the model)"
}

// Unwrap returns the underlying cause.
func (e *FormatError) Unwrap() error { return e.Err }

// Is reports whether target is ErrFormat.
func (e *FormatError) Is(target error) bool { return target == ErrFormat }

// VersionError reports an archive of a major version this package does not
// read.
type VersionError struct {
	Major, Minor int
}

// Error names the version found and the one supported.
func (e *VersionError) Error() string {
	return fmt.Sprintf("archive: the file is archive format %d.%d but this phigrid reads format %d.x; open it with the phigrid release that wrote it, or solve the model again",
		e.Major, e.Minor, Major)
}

// Is reports whether target is ErrVersion.
func (e *VersionError) Is(target error) bool { return target == ErrVersion }

func invalidf(format string, args ...any) error {
	return fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)
}
