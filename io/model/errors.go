package model

import (
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"strings"
)

// Sentinel errors. Every error returned by Parse and Load is an *Error whose
// Unwrap chain holds exactly one of them, so callers can tell a file that is
// not TOML from one that is TOML but does not describe a valid model.
var (
	// ErrSyntax is wrapped when the file is not valid TOML.
	ErrSyntax = errors.New("model: not valid TOML")
	// ErrSchema is wrapped when the file is valid TOML but has an unknown
	// key, a value of the wrong type or a missing value.
	ErrSchema = errors.New("model: does not follow the model schema")
	// ErrInvalid is wrapped when the file follows the schema but describes
	// a problem that cannot be solved: shapes outside the domain, unknown
	// names, overlapping conductors, no fixed potential, a grid too large.
	ErrInvalid = errors.New("model: invalid model")
)

// Error is an error in a model file, with the position it was found at.
// Like json.SyntaxError it carries the position as fields, so a caller can
// point an editor at it; Error formats it the way compilers do:
//
//	coax.toml:12:5: region[2].circle.radius: must be > 0, got -1
type Error struct {
	// File is the model's name as given to Parse (a path for Load).
	File string
	// Line is the 1-based line of the offending key or table; 0 when the
	// error belongs to the file as a whole (for example a missing table).
	Line int
	// Column is the 1-based byte column on Line; 0 when unknown.
	Column int
	// Key is the dotted key path of the offending value, with a 1-based
	// index for each entry of an array of tables, such as
	// "region[2].circle.radius"; empty when the error has no key.
	Key string
	// Msg says what is wrong and what is expected.
	Msg string
	// Err is the underlying cause: always one of ErrSyntax, ErrSchema or
	// ErrInvalid, possibly joined with the error of the TOML parser or of
	// package bc.
	Err error
}

// Error implements the error interface.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		b.WriteString(":" + strconv.Itoa(e.Line))
		if e.Column > 0 {
			b.WriteString(":" + strconv.Itoa(e.Column))
		}
	}
	b.WriteString(": ")
	if e.Key != "" {
		b.WriteString(e.Key + ": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// Unwrap returns the underlying cause.
func (e *Error) Unwrap() error { return e.Err }

// errAt builds an ErrInvalid error positioned at the definition of key.
func (d *decoder) errAt(key, format string, args ...any) *Error {
	p := d.ix.find(key)
	return &Error{File: d.name, Line: p.line, Column: p.col, Key: key, Msg: fmt.Sprintf(format, args...), Err: ErrInvalid}
}

// schemaAt builds an ErrSchema error positioned at the definition of key.
func (d *decoder) schemaAt(key, format string, args ...any) *Error {
	e := d.errAt(key, format, args...)
	e.Err = ErrSchema
	return e
}

// missing builds the error for a required key that is absent from table.
func (d *decoder) missing(table, key, what string) *Error {
	full := join(table, key)
	p := d.ix.find(table)
	where := table
	if table == "" {
		where = "the top level"
	} else if !strings.Contains(table, "[") {
		where = "[" + table + "]"
	}
	return &Error{File: d.name, Line: p.line, Column: p.col, Key: full, Err: ErrSchema,
		Msg: fmt.Sprintf("missing key %q in %s: %s", key, where, what)}
}

// bcRefs finds the names and region numbers that package bc quotes in its
// messages, so an error found later (when rasterising) can be traced back
// to a line of the model file.
var (
	bcConductorRef = regexp.MustCompile(`conductors? "([^"]*)"`)
	bcRegionRef    = regexp.MustCompile(`region (\d+)`)
	bcSideRef      = regexp.MustCompile(`the (left|right|bottom|top) side`)
)

// Locate turns an error from a later stage — rasterising the problem,
// building the grid, solving — into an *Error that points at the line of
// the model file where the region, conductor or boundary side it names was
// defined. It returns err unchanged when err is nil or already an *Error,
// and an *Error without a line when it cannot tell where the cause lies.
func (m *Model) Locate(err error) error {
	if err == nil {
		return nil
	}
	var me *Error
	if errors.As(err, &me) {
		return err
	}
	e := &Error{File: m.Name, Msg: err.Error(), Err: errors.Join(ErrInvalid, err)}
	msg := err.Error()
	key := ""
	if s := bcRegionRef.FindStringSubmatch(msg); s != nil {
		if n, perr := strconv.Atoi(s[1]); perr == nil && n >= 0 && n < len(m.regionKeys) {
			key = m.regionKeys[n]
		}
	}
	if s := bcConductorRef.FindStringSubmatch(msg); key == "" && s != nil {
		if k := m.Problem.ConductorIndex(s[1]); k >= 0 && k < len(m.conductorKeys) {
			key = m.conductorKeys[k]
		}
	}
	if s := bcSideRef.FindStringSubmatch(msg); key == "" && s != nil {
		key = "boundary." + s[1]
	}
	if key != "" && m.ix != nil {
		p := m.ix.find(key)
		e.Key, e.Line, e.Column = key, p.line, p.col
	}
	return e
}
