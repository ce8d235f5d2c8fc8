package archive

import (
	"reflect"
	"testing"

	"github.com/phigrid/phigrid/bc"
)

// TestKnownFields lists the fields of the bc types that the archive
// stores. A field added to one of them fails here with what to do, before
// it could silently go missing from archives.
func TestKnownFields(t *testing.T) {
	for _, c := range []struct {
		typ   any
		known []string
	}{
		{bc.Map{}, []string{"Grid", "Conductors", "Kind", "Cond", "Value", "Eps", "Rho", "Point", "CutX", "CutY", "Snapped", "Regions", "CellRegion", "EpsX", "EpsY", "Sides", "Far", "Surface"}},
		{bc.Problem{}, []string{"Metric", "Domain", "Background", "Conductors", "Regions", "Charges", "Sides", "Far"}},
		{bc.Conductor{}, []string{"Name", "Potential", "Floating", "Charge"}},
		{bc.Region{}, []string{"Name", "Shape", "Kind", "Conductor", "EpsR", "Rho"}},
		{bc.PointCharge{}, []string{"Name", "X", "Y", "Q"}},
		{bc.Side{}, []string{"Kind", "Conductor", "Potential", "Func"}},
		{bc.FarField{}, []string{"X", "Y", "Decay"}},
		{bc.Crossing{}, []string{"Free", "Node", "Axis", "Dir", "Frac", "X", "Y", "Nx", "Ny", "EpsR"}},
		{bc.Rect{}, []string{"X0", "Y0", "X1", "Y1"}},
		{bc.Circle{}, []string{"X", "Y", "R"}},
		{bc.Annulus{}, []string{"X", "Y", "R0", "R1"}},
		{bc.Polygon{}, []string{"X", "Y"}},
		{bc.Strip{}, []string{"X0", "Y0", "X1", "Y1", "Thickness"}},
	} {
		rt := reflect.TypeOf(c.typ)
		known := map[string]bool{}
		for _, f := range c.known {
			known[f] = true
		}
		for i := 0; i < rt.NumField(); i++ {
			if f := rt.Field(i); f.IsExported() && !known[f.Name] {
				t.Errorf("%v.%s is not stored in archives: add it to io/archive (a section or a JSON field, written in Write, read in Read, checked in check.go, documented in doc.go) and to this list", rt, f.Name)
			}
		}
	}
}
