package plot

import (
	"github.com/phigrid/phigrid/bc"
	"github.com/phigrid/phigrid/grid"
)

// contourLines returns the lines φ = level of the nodal potential phi on
// grid g by marching squares, joined into polylines in model coordinates.
// Along a grid link cut by a conductor surface the conductor's potential
// is taken at the cut point, not at the conductor node, so equipotentials
// next to curved electrodes follow the surface rather than the grid's
// staircase. Saddle cells are resolved by the mean of their corners.
//
// A level equal to the potential of a conductor or a prescribed side would
// also trace that electrode's own surface; pieces of line running along
// such a surface (both ends on a fixed node at the level) are left out,
// and the line is split there.
func contourLines(g *grid.Grid, m *bc.Map, phi []float64, level float64) [][]pt {
	nx, ny := g.Nx(), g.Ny()
	xs, ys := g.X(), g.Y()
	above := func(n int) bool { return phi[n] > level }

	// crossing returns the point where the level crosses the link from
	// node a to node b = a+st (st = 1 along X, nx along Y).
	crossing := func(a, b int, horizontal bool) pt {
		fa, fb := phi[a], phi[b]
		t := (level - fa) / (fb - fa)
		var cut float64 = 1
		if horizontal {
			cut = m.CutX[a]
		} else {
			cut = m.CutY[a]
		}
		if cut < 1 {
			switch {
			case m.Kind[a] != bc.OnConductor && m.Kind[b] == bc.OnConductor:
				t *= cut
			case m.Kind[a] == bc.OnConductor && m.Kind[b] != bc.OnConductor:
				t = 1 - cut*(level-fb)/(fa-fb)
			}
		}
		ia, ja := a%nx, a/nx
		if horizontal {
			return pt{xs[ia] + t*(xs[ia+1]-xs[ia]), ys[ja]}
		}
		return pt{xs[ia], ys[ja] + t*(ys[ja+1]-ys[ja])}
	}

	// Edge ids: 2n for the X-link from node n, 2n+1 for its Y-link.
	points := map[int]pt{}
	onFixed := map[int]bool{} // crossings that sit on a fixed node at the level
	fixedAt := func(n int) bool { return m.Kind[n] != bc.Free && phi[n] == level }
	edgePoint := func(id int) {
		if _, ok := points[id]; ok {
			return
		}
		n := id / 2
		b := n + 1
		if id%2 == 1 {
			b = n + nx
		}
		points[id] = crossing(n, b, id%2 == 0)
		if fixedAt(n) || fixedAt(b) {
			onFixed[id] = true
		}
	}
	type seg struct{ a, b int }
	var segs []seg
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			n0 := j*nx + i
			n1, n2, n3 := n0+1, n0+nx+1, n0+nx
			if m.Kind[n0] == bc.OnConductor && m.Kind[n1] == bc.OnConductor &&
				m.Kind[n2] == bc.OnConductor && m.Kind[n3] == bc.OnConductor {
				continue
			}
			s0, s1, s2, s3 := above(n0), above(n1), above(n2), above(n3)
			if s0 == s1 && s1 == s2 && s2 == s3 {
				continue
			}
			// Edges in cyclic order: bottom n0–n1, right n1–n2, top n3–n2,
			// left n0–n3.
			e := [4]int{2 * n0, 2*n1 + 1, 2 * n3, 2*n0 + 1}
			cross := [4]bool{s0 != s1, s1 != s2, s2 != s3, s3 != s0}
			var hit []int
			for k := range 4 {
				if cross[k] {
					hit = append(hit, k)
					edgePoint(e[k])
				}
			}
			if len(hit) == 2 {
				segs = append(segs, seg{e[hit[0]], e[hit[1]]})
				continue
			}
			// Saddle: every edge is crossed.
			centre := 0.25*(phi[n0]+phi[n1]+phi[n2]+phi[n3]) > level
			if centre == s1 {
				// n1 and n3 connect through the centre; cut off n0 and n2.
				segs = append(segs, seg{e[3], e[0]}, seg{e[1], e[2]})
			} else {
				segs = append(segs, seg{e[0], e[1]}, seg{e[2], e[3]})
			}
		}
	}
	chains := joinSegments(len(segs), func(i int) (int, int) { return segs[i].a, segs[i].b })
	var out [][]pt
	for _, ids := range chains {
		var cur []pt
		for k, id := range ids {
			if k > 0 && onFixed[id] && onFixed[ids[k-1]] {
				// This piece runs along a fixed surface: break the line.
				if len(cur) >= 2 {
					out = append(out, cur)
				}
				cur = nil
			}
			cur = append(cur, points[id])
		}
		if len(cur) >= 2 {
			out = append(out, cur)
		}
	}
	return out
}

// joinSegments chains segments that share end ids into sequences of ids.
func joinSegments(n int, ends func(int) (int, int)) [][]int {
	at := make(map[int][]int, 2*n)
	for i := range n {
		a, b := ends(i)
		at[a] = append(at[a], i)
		at[b] = append(at[b], i)
	}
	used := make([]bool, n)
	other := func(s, id int) int {
		a, b := ends(s)
		if a == id {
			return b
		}
		return a
	}
	next := func(id int) (int, bool) {
		for _, s := range at[id] {
			if !used[s] {
				return s, true
			}
		}
		return 0, false
	}
	var out [][]int
	for i := range n {
		if used[i] {
			continue
		}
		used[i] = true
		a, b := ends(i)
		fwd := []int{a, b}
		for id := b; ; {
			s, ok := next(id)
			if !ok {
				break
			}
			used[s] = true
			id = other(s, id)
			fwd = append(fwd, id)
		}
		var back []int
		for id := a; ; {
			s, ok := next(id)
			if !ok {
				break
			}
			used[s] = true
			id = other(s, id)
			back = append(back, id)
		}
		line := make([]int, 0, len(back)+len(fwd))
		for k := len(back) - 1; k >= 0; k-- {
			line = append(line, back[k])
		}
		line = append(line, fwd...)
		out = append(out, line)
	}
	return out
}
