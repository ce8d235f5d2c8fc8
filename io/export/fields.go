package export

import (
	"math"
	"sort"
	"strings"
	"unicode"

	"github.com/phigrid/phigrid/grid"
)

// Fields holds named arrays on the nodes and cells of one grid. It is the
// input of WriteVTR and WriteNPYSet. Any of the maps may be nil.
//
// A name is 1 to 64 letters, digits, '_', '-' or '.', not starting with
// '.'; names are used as file names by WriteNPYSet, so they must also
// differ other than in letter case.
type Fields struct {
	// Point holds scalars on nodes: g.Len() values each, node (i, j) at
	// g.Index(i, j).
	Point map[string][]float64
	// PointVectors holds two-component vectors on nodes: component 0 along
	// X (r in an axisymmetric grid), component 1 along Y (z), g.Len() values
	// each.
	PointVectors map[string][2][]float64
	// Cell holds scalars on cells: g.Cells() values each, cell (i, j) at
	// g.CellIndex(i, j).
	Cell map[string][]float64
}

// sortedKeys returns the keys of m in increasing order.
func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// checkName reports whether name is usable as an array and file name.
func checkName(kind, name string) error {
	if name == "" || len(name) > 64 || name[0] == '.' {
		return invalidf("%s name %q must be 1 to 64 characters and not start with '.'", kind, name)
	}
	for _, c := range name {
		if !unicode.IsLetter(c) && !unicode.IsDigit(c) && c != '_' && c != '-' && c != '.' {
			return invalidf("%s name %q has the character %q; use letters, digits, '_', '-' and '.'", kind, name, c)
		}
	}
	return nil
}

// check verifies names and lengths against g.
func (f Fields) check(g *grid.Grid) error {
	if g == nil {
		return invalidf("no grid given")
	}
	for _, name := range sortedKeys(f.Point) {
		if err := checkName("point array", name); err != nil {
			return err
		}
		if n := len(f.Point[name]); n != g.Len() {
			return invalidf("point array %q has %d values but the %d×%d grid has %d nodes", name, n, g.Nx(), g.Ny(), g.Len())
		}
	}
	for _, name := range sortedKeys(f.PointVectors) {
		if err := checkName("point vector", name); err != nil {
			return err
		}
		if _, dup := f.Point[name]; dup {
			return invalidf("%q names both a point array and a point vector; rename one", name)
		}
		for c, v := range f.PointVectors[name] {
			if len(v) != g.Len() {
				return invalidf("component %d of point vector %q has %d values but the %d×%d grid has %d nodes", c, name, len(v), g.Nx(), g.Ny(), g.Len())
			}
		}
	}
	for _, name := range sortedKeys(f.Cell) {
		if err := checkName("cell array", name); err != nil {
			return err
		}
		if n := len(f.Cell[name]); n != g.Cells() {
			return invalidf("cell array %q has %d values but the %d×%d grid has %d cells", name, n, g.Nx(), g.Ny(), g.Cells())
		}
	}
	return nil
}

// firstNonFinite returns the index of the first NaN or infinite value in v,
// or -1.
func firstNonFinite(v []float64) int {
	for k, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return k
		}
	}
	return -1
}

// foldName is the case-folded form of a file name, for collision checks on
// case-insensitive file systems.
func foldName(name string) string { return strings.ToLower(name) }
