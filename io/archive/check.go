package archive

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/phigrid/phigrid/bc"
)

// check verifies that the archive is complete and consistent, so that
// assembling it and evaluating fields on it cannot fail or panic.
func (a *Archive) check() error {
	m, g := a.Map, a.Grid
	if m == nil || g == nil {
		return fmt.Errorf("the archive needs a grid and a map")
	}
	if m.Grid != g {
		return fmt.Errorf("the archive's grid is not its map's grid")
	}
	if _, ok := metricNames[g.Metric()]; !ok {
		return fmt.Errorf("the grid has unknown metric %d", int(g.Metric()))
	}
	n, c, k := g.Len(), g.Cells(), len(m.Conductors)
	if n > MaxNodes {
		return fmt.Errorf("the grid has %d nodes, more than an archive holds (%d)", n, MaxNodes)
	}
	if k > MaxConductors {
		return fmt.Errorf("the map has %d conductors, more than an archive holds (%d)", k, MaxConductors)
	}
	if len(a.ModelSource) > MaxText || len(a.Report) > MaxText {
		return fmt.Errorf("the model text or the report is longer than %d bytes", MaxText)
	}
	if a.Report != nil && !json.Valid(a.Report) {
		return fmt.Errorf("the report is not valid JSON")
	}
	for _, l := range []struct {
		name      string
		got, want int
		optional  bool
		isNil     bool
	}{
		{"map.Kind", len(m.Kind), n, false, m.Kind == nil},
		{"map.Cond", len(m.Cond), n, false, m.Cond == nil},
		{"map.Value", len(m.Value), n, false, m.Value == nil},
		{"map.Eps", len(m.Eps), c, false, m.Eps == nil},
		{"map.CutX", len(m.CutX), n, false, m.CutX == nil},
		{"map.CutY", len(m.CutY), n, false, m.CutY == nil},
		{"map.Rho", len(m.Rho), c, true, m.Rho == nil},
		{"map.Point", len(m.Point), n, true, m.Point == nil},
		{"map.CellRegion", len(m.CellRegion), c, true, m.CellRegion == nil},
		{"map.EpsX", len(m.EpsX), 2 * c, true, m.EpsX == nil && m.EpsY == nil},
		{"map.EpsY", len(m.EpsY), 2 * c, true, m.EpsX == nil && m.EpsY == nil},
		{"Phi", len(a.Phi), n, false, a.Phi == nil},
		{"V", len(a.V), k, false, false},
	} {
		if l.optional && l.isNil {
			continue
		}
		if l.got != l.want {
			return fmt.Errorf("%s has %d entries, want %d", l.name, l.got, l.want)
		}
	}
	for i, kind := range m.Kind {
		ci := m.Cond[i]
		if kind > bc.Prescribed {
			return fmt.Errorf("node %d has unknown kind %d", i, kind)
		}
		if ci < -1 || int(ci) >= k {
			return fmt.Errorf("node %d belongs to conductor %d of %d", i, ci, k)
		}
		if (kind == bc.OnConductor) != (ci >= 0) {
			return fmt.Errorf("node %d has kind %d but conductor index %d", i, kind, ci)
		}
	}
	for _, f := range []struct {
		name string
		v    []float64
	}{{"map.Value", m.Value}, {"map.Rho", m.Rho}, {"map.Point", m.Point}, {"Phi", a.Phi}, {"V", a.V}} {
		if i := nonFinite(f.v); i >= 0 {
			return fmt.Errorf("%s[%d] = %g is not finite", f.name, i, f.v[i])
		}
	}
	for _, eps := range []struct {
		name string
		v    []float64
	}{{"map.Eps", m.Eps}, {"map.EpsX", m.EpsX}, {"map.EpsY", m.EpsY}} {
		for i, e := range eps.v {
			if !(e > 0) || math.IsInf(e, 0) {
				return fmt.Errorf("%s[%d] is %g; a relative permittivity must be finite and positive", eps.name, i, e)
			}
		}
	}
	for s, sd := range m.Sides {
		if _, ok := sideKinds[sd.Kind]; !ok {
			return fmt.Errorf("the map's %s side has unknown kind %d", bc.SideNames[s], int(sd.Kind))
		}
		if sd.Conductor != "" && sd.Kind == bc.Fixed {
			found := false
			for _, c := range m.Conductors {
				found = found || c.Name == sd.Conductor
			}
			if !found {
				return fmt.Errorf("the map's %s side belongs to conductor %q, which the map does not have", bc.SideNames[s], sd.Conductor)
			}
		}
		if !finite(sd.Potential) {
			return fmt.Errorf("the map's %s side has a potential that is not finite", bc.SideNames[s])
		}
	}
	if f := m.Far; !finite(f.X, f.Y, f.Decay) || f.Decay < 0 {
		return fmt.Errorf("the far field (%g, %g) with decay %g is not finite and non-negative", f.X, f.Y, f.Decay)
	}
	for _, cut := range [][]float64{m.CutX, m.CutY} {
		for i, f := range cut {
			if !(f > 0 && f <= 1) {
				return fmt.Errorf("node %d has cut fraction %g outside (0, 1]", i, f)
			}
		}
	}
	for i, r := range m.CellRegion {
		if r < -1 || int(r) >= len(m.Regions) {
			return fmt.Errorf("cell %d lies in region %d of %d", i, r, len(m.Regions))
		}
	}
	if err := checkRegions(m.Regions); err != nil {
		return fmt.Errorf("map regions: %v", err)
	}
	if m.Snapped < 0 || m.Snapped > n {
		return fmt.Errorf("%d snapped nodes does not fit the grid", m.Snapped)
	}
	if err := checkSurface(a); err != nil {
		return err
	}
	if p := a.Problem; p != nil {
		if err := p.Validate(); err != nil {
			return fmt.Errorf("the problem: %v", err)
		}
		if p.Metric != g.Metric() {
			return fmt.Errorf("the problem is %v but the grid is %v", p.Metric, g.Metric())
		}
		if len(p.Conductors) != k {
			return fmt.Errorf("the problem has %d conductors but the map %d", len(p.Conductors), k)
		}
		for i := range p.Conductors {
			if p.Conductors[i].Name != m.Conductors[i].Name {
				return fmt.Errorf("conductor %d is %q in the problem but %q in the map", i, p.Conductors[i].Name, m.Conductors[i].Name)
			}
		}
	}
	return nil
}

func nonFinite(v []float64) int {
	for i, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return i
		}
	}
	return -1
}

// checkRegions checks the kinds and shapes of regions.
func checkRegions(rs []bc.Region) error {
	for i, r := range rs {
		if _, ok := regionKinds[r.Kind]; !ok {
			return fmt.Errorf("region %d has unknown kind %d", i, int(r.Kind))
		}
		if r.Shape == nil {
			return fmt.Errorf("region %d has no shape", i)
		}
		if err := r.Shape.Validate(); err != nil {
			return fmt.Errorf("region %d: %v", i, err)
		}
		if !finite(r.EpsR, r.Rho) {
			return fmt.Errorf("region %d has a permittivity or charge density that is not finite", i)
		}
	}
	return nil
}

func finite(v ...float64) bool { return nonFinite(v) < 0 }

// checkSurface checks that every crossing joins a free node to its
// neighbouring conductor node.
func checkSurface(a *Archive) error {
	m, g := a.Map, a.Grid
	nx, ny, n := g.Nx(), g.Ny(), g.Len()
	for i, c := range m.Surface {
		f, nd := int(c.Free), int(c.Node)
		if f < 0 || f >= n || nd < 0 || nd >= n {
			return fmt.Errorf("surface crossing %d joins nodes %d and %d outside the grid", i, f, nd)
		}
		if m.Kind[f] != bc.Free || m.Kind[nd] != bc.OnConductor {
			return fmt.Errorf("surface crossing %d does not join a free node to a conductor node", i)
		}
		if c.Dir != 1 && c.Dir != -1 {
			return fmt.Errorf("surface crossing %d has direction %d, want ±1", i, c.Dir)
		}
		d := int(c.Dir)
		switch c.Axis {
		case 0:
			if p := f%nx + d; p < 0 || p >= nx || nd != f+d {
				return fmt.Errorf("surface crossing %d is not along a grid line", i)
			}
		case 1:
			if p := f/nx + d; p < 0 || p >= ny || nd != f+d*nx {
				return fmt.Errorf("surface crossing %d is not along a grid line", i)
			}
		default:
			return fmt.Errorf("surface crossing %d has axis %d, want 0 or 1", i, c.Axis)
		}
		if !(c.Frac > 0 && c.Frac <= 1) || !finite(c.X, c.Y, c.Nx, c.Ny, c.EpsR) || !(c.EpsR >= 0) {
			return fmt.Errorf("surface crossing %d has a fraction outside (0, 1] or a value that is not finite", i)
		}
	}
	return nil
}
