package model

import (
	"bytes"
	"errors"
	"fmt"
	"reflect"
	"regexp"
	"sort"
	"strings"

	toml "github.com/pelletier/go-toml/v2"
)

// decodeTOML decodes src into the raw schema in strict mode and turns the
// library's errors into *Error values with a full key path and a message
// that says what is expected.
func (d *decoder) decodeTOML(src []byte) (*rawFile, error) {
	var raw rawFile
	dec := toml.NewDecoder(bytes.NewReader(src)).DisallowUnknownFields()
	err := dec.Decode(&raw)
	if err == nil {
		return &raw, nil
	}
	var strict *toml.StrictMissingError
	if errors.As(err, &strict) && len(strict.Errors) > 0 {
		return nil, d.unknownKey(strict)
	}
	var de *toml.DecodeError
	if errors.As(err, &de) {
		line, col := de.Position()
		if m := typeMismatch.FindStringSubmatch(de.Error()); m != nil {
			return nil, d.wrongType(pos{line, col}, m[1], de)
		}
		msg := strings.TrimPrefix(de.Error(), "toml: ")
		return nil, &Error{File: d.name, Line: line, Column: col, Key: strings.Join(de.Key(), "."),
			Msg: "not valid TOML: " + msg, Err: errors.Join(ErrSyntax, err)}
	}
	return nil, &Error{File: d.name, Msg: "not valid TOML: " + err.Error(), Err: errors.Join(ErrSyntax, err)}
}

// typeMismatch matches the library's message for a value of the wrong
// type; the first group is the TOML type found.
var typeMismatch = regexp.MustCompile(`cannot decode TOML ([a-z ]+?) into`)

func (d *decoder) unknownKey(strict *toml.StrictMissingError) error {
	errs := strict.Errors
	sort.SliceStable(errs, func(i, j int) bool {
		li, ci := errs[i].Position()
		lj, cj := errs[j].Position()
		return li < lj || li == lj && ci < cj
	})
	first := &errs[0]
	line, col := first.Position()
	key := d.ix.near(pos{line, col})
	if key == "" || lastPart(key) != last(first.Key()) {
		key = strings.Join(first.Key(), ".")
	}
	table := parent(key)
	where := "at the top level"
	if table != "" {
		where = "in " + table
	}
	msg := fmt.Sprintf("unknown key %q %s", lastPart(key), where)
	if keys := knownKeys(table); keys != "" {
		msg += "; expected one of: " + keys
	}
	if n := len(errs) - 1; n == 1 {
		msg += " (and 1 more unknown key)"
	} else if n > 1 {
		msg += fmt.Sprintf(" (and %d more unknown keys)", n)
	}
	return &Error{File: d.name, Line: line, Column: col, Key: key, Msg: msg, Err: errors.Join(ErrSchema, strict)}
}

func last(k []string) string {
	if len(k) == 0 {
		return ""
	}
	return k[len(k)-1]
}

func (d *decoder) wrongType(at pos, got string, de *toml.DecodeError) error {
	key := d.ix.near(at)
	if key == "" {
		key = strings.Join(de.Key(), ".")
	}
	want := "a different type"
	if t := schemaType(key); t != nil {
		want = describe(t)
	}
	if h, ok := typeHints[schemaPath(key)]; ok {
		want = h
	}
	article := "a "
	if strings.IndexByte("aeiou", got[0]) >= 0 {
		article = "an "
	}
	return &Error{File: d.name, Line: at.line, Column: at.col, Key: key,
		Msg: fmt.Sprintf("expected %s, got %s%s", want, article, got), Err: errors.Join(ErrSchema, de)}
}

// typeHints give a more specific expectation for keys whose type alone
// says too little. Keys are schema paths, with [] for an entry of an array.
var typeHints = map[string]string{
	"units":                         `a table such as [units] length = "mm"`,
	"domain.x":                      "an array [x0, x1] of two numbers",
	"domain.y":                      "an array [y0, y1] of two numbers",
	"boundary.left":                 `a table such as { kind = "fixed", potential = 0 }`,
	"boundary.right":                `a table such as { kind = "fixed", potential = 0 }`,
	"boundary.bottom":               `a table such as { kind = "fixed", potential = 0 }`,
	"boundary.top":                  `a table such as { kind = "fixed", potential = 0 }`,
	"boundary.far":                  "a table such as { center = [0, 0], decay = 1, extend = 10 }",
	"boundary.far.center":           "a point [x, y] of two numbers",
	"conductor":                     "an array of tables, one [[conductor]] per conductor",
	"region":                        "an array of tables, one [[region]] per region",
	"line_charge":                   "an array of tables, one [[line_charge]] per charge",
	"ring_charge":                   "an array of tables, one [[ring_charge]] per charge",
	"output.picture":                "an array of tables, one [[output.picture]] per picture",
	"output.probe":                  "an array of tables, one [[output.probe]] per probe",
	"output.cut":                    "an array of tables, one [[output.cut]] per cut",
	"materials":                     "a table of name = relative permittivity",
	"materials.":                    "a relative permittivity (a number)",
	"region[].rect":                 "a table such as { x = [0, 1], y = [0, 1] }",
	"region[].circle":               "a table such as { center = [0, 0], radius = 1 }",
	"region[].ellipse":              "a table such as { center = [0, 0], semi_axes = [2, 1] }",
	"region[].annulus":              "a table such as { center = [0, 0], inner_radius = 1, outer_radius = 2 }",
	"region[].polygon":              "a table such as { points = [[0, 0], [1, 0], [0, 1]] }",
	"region[].strip":                "a table such as { from = [0, 0], to = [1, 0], thickness = 0.1 }",
	"region[].rect.x":               "an array [x0, x1] of two numbers",
	"region[].rect.y":               "an array [y0, y1] of two numbers",
	"region[].polygon.points":       "an array of vertices [[x, y], [x, y], ...]",
	"region[].polygon.points[]":     "a vertex [x, y] of two numbers",
	"region[].circle.center":        "a point [x, y] of two numbers",
	"region[].ellipse.center":       "a point [x, y] of two numbers",
	"region[].ellipse.semi_axes":    "an array [a, b] of two numbers",
	"region[].annulus.center":       "a point [x, y] of two numbers",
	"region[].strip.from":           "a point [x, y] of two numbers",
	"region[].strip.to":             "a point [x, y] of two numbers",
	"line_charge[].at":              "a point [x, y] of two numbers",
	"ring_charge[].at":              "a point [r, z] of two numbers",
	"output.probe[].at":             "a point [x, y] of two numbers",
	"output.cut[].from":             "a point [x, y] of two numbers",
	"output.cut[].to":               "a point [x, y] of two numbers",
	"region[].polygon.points[][]":   "a number",
	"region[].circle.center[]":      "a number",
	"output.picture[].arrow_length": `"scaled", "uniform" or "log"`,
}

// schemaPath replaces the array indices of a key path by [], and the names
// under [materials] (which are the user's) by nothing: "region[2].circle"
// → "region[].circle", "materials.PTFE" → "materials.".
func schemaPath(key string) string {
	if strings.HasPrefix(key, "materials.") {
		return "materials."
	}
	var b strings.Builder
	depth := 0
	for _, r := range key {
		switch {
		case r == '[':
			if depth == 0 {
				b.WriteString("[]")
			}
			depth++
		case r == ']':
			depth--
		case depth == 0:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// schemaType returns the Go type of the raw schema at a key path, or nil.
func schemaType(key string) reflect.Type {
	t := reflect.TypeOf(rawFile{})
	if key == "" {
		return t
	}
	for _, part := range strings.Split(key, ".") {
		name, idx := part, 0
		if i := strings.IndexByte(part, '['); i >= 0 {
			name, idx = part[:i], strings.Count(part[i:], "[")
		}
		for t.Kind() == reflect.Pointer {
			t = t.Elem()
		}
		switch t.Kind() {
		case reflect.Struct:
			f, ok := fieldByTag(t, name)
			if !ok {
				return nil
			}
			t = f.Type
		case reflect.Map:
			t = t.Elem()
		default:
			return nil
		}
		for ; idx > 0; idx-- {
			for t.Kind() == reflect.Pointer {
				t = t.Elem()
			}
			if t.Kind() != reflect.Slice {
				return nil
			}
			t = t.Elem()
		}
	}
	return t
}

func fieldByTag(t reflect.Type, name string) (reflect.StructField, bool) {
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if strings.Split(f.Tag.Get("toml"), ",")[0] == name {
			return f, true
		}
	}
	return reflect.StructField{}, false
}

// knownKeys lists the keys the schema allows in the table at key path.
func knownKeys(table string) string {
	t := schemaType(table)
	for t != nil && (t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice) {
		t = t.Elem()
	}
	if t == nil || t.Kind() != reflect.Struct {
		return ""
	}
	var keys []string
	for i := 0; i < t.NumField(); i++ {
		keys = append(keys, strings.Split(t.Field(i).Tag.Get("toml"), ",")[0])
	}
	return strings.Join(keys, ", ")
}

// describe says in words what kind of TOML value a schema type takes.
func describe(t reflect.Type) string {
	switch t.Kind() {
	case reflect.Float64:
		return "a number"
	case reflect.String:
		return "a string"
	case reflect.Bool:
		return "true or false"
	case reflect.Map:
		return "a table of name = number"
	case reflect.Pointer, reflect.Struct:
		return "a table"
	case reflect.Slice:
		switch e := t.Elem(); e.Kind() {
		case reflect.Float64:
			return "an array of numbers"
		case reflect.String:
			return "an array of strings"
		case reflect.Slice:
			return "an array of [x, y] pairs"
		default:
			return "an array of tables"
		}
	}
	return "a value of another type"
}
