package model

import (
	"sort"
	"strings"
)

// Material is a named dielectric with its relative permittivity.
type Material struct {
	// Name is the material's display name, as a report prints it.
	Name string
	// EpsR is the relative permittivity ε_r (static or low-frequency).
	EpsR float64
	// Note says where the value comes from and what it assumes.
	Note string
}

// builtin is the table of common dielectrics a model file may name without
// defining them. Values are typical; a design that depends on the exact
// permittivity should define its own material from the data sheet.
var builtin = []Material{
	// Exact by definition of ε0.
	{"vacuum", 1, "exact by definition"},
	// Air is taken as 1 in common practice; the true value (dry-air) moves
	// a capacitance by about 0.05 %.
	{"air", 1, "common practice; dry air at 20 °C is 1.00054"},
	// CRC Handbook of Chemistry and Physics (from memory), 20 °C, 1 atm.
	{"dry-air", 1.00054, "dry air at 20 °C, 1 atm; CRC Handbook (from memory)"},
	// common practice; 2.0–2.1 and very stable with frequency; von Hippel,
	// Dielectric Materials and Applications, 1954 (from memory).
	{"PTFE", 2.1, "common practice (2.0–2.1); von Hippel 1954 (from memory)"},
	// common practice; 4.3–4.7 at 1 MHz–1 GHz, varies with resin content.
	{"FR-4", 4.4, "common practice (4.3–4.7 at 1 MHz–1 GHz)"},
	// common practice (substrate data sheets), 99.5 % alumina.
	{"alumina", 9.8, "common practice, 99.5 % Al2O3 (9.7–10.1); 96 % grades are 9.0–9.6"},
	// common practice; mineral oil 2.1–2.3.
	{"transformer-oil", 2.2, "common practice, mineral oil (2.1–2.3)"},
	// common practice; 2.25–2.3.
	{"polyethylene", 2.25, "common practice (2.25–2.3)"},
	// common practice; polyimide film 3.4–3.5.
	{"polyimide", 3.4, "common practice, film (3.4–3.5)"},
	// common practice; 11.7–11.9.
	{"silicon", 11.7, "common practice (11.7–11.9)"},
	// common practice.
	{"GaAs", 12.9, "common practice"},
	// CRC Handbook (from memory), 20 °C.
	{"water", 80, "pure water at 20 °C; CRC Handbook (from memory)"},
	// common practice (from memory), gas at 0.1 MPa.
	{"SF6", 1.002, "common practice, gas at 0.1 MPa (from memory)"},
}

// Materials returns the built-in table of common dielectrics, in a fixed
// order, so that reports can list the values a model relied on. The caller
// owns the returned slice.
func Materials() []Material {
	return append([]Material(nil), builtin...)
}

// materialKey normalises a material name for lookup: case, spaces,
// hyphens and underscores do not matter, so "FR-4", "fr4" and "Fr_4" are
// one material, as are "transformer oil" and "transformer-oil".
func materialKey(name string) string {
	return strings.Map(func(r rune) rune {
		switch r {
		case ' ', '-', '_':
			return -1
		}
		return r
	}, strings.ToLower(name))
}

// materialTable is the set of materials a model can use: the built-ins,
// overridden by the file's own [materials].
type materialTable struct {
	byKey map[string]Material
}

func newMaterialTable() *materialTable {
	t := &materialTable{byKey: map[string]Material{}}
	for _, m := range builtin {
		t.byKey[materialKey(m.Name)] = m
	}
	return t
}

func (t *materialTable) lookup(name string) (Material, bool) {
	m, ok := t.byKey[materialKey(name)]
	return m, ok
}

// names lists every material name, sorted, for messages.
func (t *materialTable) names() string {
	var s []string
	for _, m := range t.byKey {
		s = append(s, m.Name)
	}
	sort.Slice(s, func(i, j int) bool { return strings.ToLower(s[i]) < strings.ToLower(s[j]) })
	return strings.Join(s, ", ")
}
