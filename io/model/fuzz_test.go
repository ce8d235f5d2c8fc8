package model

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// FuzzParse checks that Parse never panics and keeps its contract on any
// input: either a Model whose problem validates, or an *Error wrapping one
// of the three sentinels. The seed corpus is every model under testdata
// (valid ones, among them open.toml with open sides, a far field, ellipses
// and the [grid] keys gap and corner), the shared broken models and two
// shipped examples.
func FuzzParse(f *testing.F) {
	for _, pattern := range []string{"testdata/*.toml", "../../testdata/broken/*.toml", "../../examples/coax/*.toml", "../../examples/sphere/*.toml"} {
		files, err := filepath.Glob(pattern)
		if err != nil {
			f.Fatal(err)
		}
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(src)
		}
	}
	f.Add([]byte(base))
	f.Add([]byte("region = [{ kind = \"conductor\", polygon = { points = [[0, 0], [1, 0]] } }]\n[units]\nlength = \"m\"\n"))
	f.Add([]byte(sphereInSpace + "far = { center = [0, 1], decay = 2, extend = 1e3 }\n[grid]\ngap = 1\ncorner = 1\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		m, err := Parse("fuzz.toml", src)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("error %v is %T, not *Error", err, err)
			}
			if e.Msg == "" || !(errors.Is(err, ErrSyntax) || errors.Is(err, ErrSchema) || errors.Is(err, ErrInvalid)) {
				t.Fatalf("error %q has no message or no sentinel", err)
			}
			if e.Line < 0 || e.Column < 0 {
				t.Fatalf("error %q has a negative position", err)
			}
			return
		}
		if err := m.Problem.Validate(); err != nil {
			t.Fatalf("Parse accepted a problem that bc rejects: %v", err)
		}
		if len(m.RegionMaterial) != len(m.Problem.Regions) {
			t.Fatalf("%d region materials for %d regions", len(m.RegionMaterial), len(m.Problem.Regions))
		}
		if m.Mesh.MaxNodes <= 0 || !(m.Mesh.Cell > 0) {
			t.Fatalf("mesh %+v lacks its defaults", m.Mesh)
		}
	})
}
