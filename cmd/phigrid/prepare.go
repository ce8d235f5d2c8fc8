package main

import (
	"fmt"
	"math"
	"strings"

	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
	"github.com/phigrid/phigrid/io/model"
	"github.com/phigrid/phigrid/solve"
)

// prepared is a model carried through to its assembled system.
type prepared struct {
	model *model.Model
	grid  *grid.Grid
	bcmap *bc.Map
	sys   *solve.System
}

// prepare loads, grids, rasterises and assembles a model. Every failure
// is an input error.
func prepare(path string) (*prepared, error) {
	m, err := model.Load(path)
	if err != nil {
		return nil, &inputError{err}
	}
	g, err := m.Grid()
	if err != nil {
		return nil, &inputError{m.Locate(err)}
	}
	mp, err := bc.Rasterize(m.Problem, g, nil)
	if err != nil {
		return nil, &inputError{m.Locate(err)}
	}
	sys, err := solve.Assemble(mp)
	if err != nil {
		return nil, &inputError{m.Locate(err)}
	}
	return &prepared{model: m, grid: g, bcmap: mp, sys: sys}, nil
}

// settings maps the model's solver choice (with command-line overrides)
// onto solve.Settings.
func (p *prepared) settings(method string, workers int) (solve.Settings, error) {
	s := p.model.Solver
	if method == "" {
		method = s.Method
	}
	set := solve.Settings{Tol: s.Tol, MaxIter: s.MaxIter, Workers: workers}
	if method != "" {
		m, err := solve.ParseMethod(method)
		if err != nil {
			return set, &usageError{err.Error()}
		}
		set.Method = m
	}
	return set, nil
}

// length formats a length in metres in the model's unit.
func (p *prepared) length(v float64) string {
	u := p.model.Unit
	return fmt.Sprintf("%.4g %s", v/u.Scale, u.Name)
}

// si formats v with an engineering prefix and the unit.
func si(v float64, unit string) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Sprintf("%g %s", v, unit)
	}
	prefixes := []struct {
		exp int
		p   string
	}{{-15, "f"}, {-12, "p"}, {-9, "n"}, {-6, "µ"}, {-3, "m"}, {0, ""}, {3, "k"}, {6, "M"}, {9, "G"}, {12, "T"}}
	e := int(math.Floor(math.Log10(math.Abs(v))/3)) * 3
	e = max(-15, min(12, e))
	for _, q := range prefixes {
		if q.exp == e {
			return fmt.Sprintf("%.5g %s%s", v/math.Pow(10, float64(e)), q.p, unit)
		}
	}
	return fmt.Sprintf("%g %s", v, unit)
}

// bytesString formats a byte count.
func bytesString(n float64) string {
	units := []string{"B", "KiB", "MiB", "GiB", "TiB"}
	i := 0
	for n >= 1024 && i < len(units)-1 {
		n /= 1024
		i++
	}
	return fmt.Sprintf("%.3g %s", n, units[i])
}

// plural returns "n thing" or "n things".
func plural(n int, thing string) string {
	if n == 1 {
		return fmt.Sprintf("%d %s", n, thing)
	}
	if strings.HasSuffix(thing, "s") {
		return fmt.Sprintf("%d %ses", n, thing)
	}
	return fmt.Sprintf("%d %ss", n, thing)
}
