package geom

import (
	"math"
)

// grid is a uniform grid of cells over a rectangle in surface coordinates
// (u, v). Cell k lists the sensors whose photocathode bounding box overlaps
// it, entries[start[k]:start[k+1]], with their coordinates stored inline so
// that a lookup reads one short contiguous run of memory.
type grid struct {
	nu, nv  int
	u0, v0  float64 // lower corner of the rectangle
	su, sv  float64 // cells per unit of u and of v
	start   []int32
	entries []gridEntry
}

type gridEntry struct {
	u, v  float64 // photocathode centre in surface coordinates
	index int32   // sensor index
}

// cellRange returns the bounds in entries of the cell holding (u, v); points
// outside the rectangle use the nearest cell.
func (g *grid) cellRange(u, v float64) (lo, hi int) {
	k := clampIndex((v-g.v0)*g.sv, g.nv)*g.nu + clampIndex((u-g.u0)*g.su, g.nu)
	return int(g.start[k]), int(g.start[k+1])
}

func clampIndex(x float64, n int) int {
	if !(x >= 0) { // also sends NaN to cell 0 rather than out of range
		return 0
	}
	if x >= float64(n) {
		return n - 1
	}
	return int(x)
}

// newGrid lays a grid over [u0, u0+lu] x [v0, v0+lv] for n sensors of
// photocathode diameter diameter. Cells are at least one diameter wide, so a
// photocathode overlaps at most 2 x 2 of them and a cell holds a few sensors
// at any coverage; for sparse sensors they are widened to keep the number of
// cells within 8n+64, so memory stays proportional to the sensor count.
func newGrid(u0, lu, v0, lv float64, n int, diameter float64) grid {
	limit := float64(8*n + 64)
	cell := math.Max(diameter, math.Sqrt(lu*lv/limit))
	// For a rectangle much longer than wide the short side holds less than
	// one square cell; the cells are then stretched along the long side so
	// that the count still stays within the limit (a long thin tank would
	// otherwise ask for billions of cells).
	nu := cellCount(lu/cell, limit)
	nv := cellCount(lv/cell, limit/float64(nu))
	return grid{nu: nu, nv: nv, u0: u0, v0: v0, su: float64(nu) / lu, sv: float64(nv) / lv}
}

// cellCount is the number of cells, at least 1 and at most limit, into which
// x cell widths are cut; NaN (from an infinite extent) gives 1.
func cellCount(x, limit float64) int {
	if !(x >= 1) || !(limit >= 1) {
		return 1
	}
	return int(math.Min(math.Floor(x), math.Floor(limit)))
}

// fill lists each entry in every cell its bounding box, half widths hu and
// hv, overlaps. If periodic, u wraps around with period nu cells.
func (g *grid) fill(items []gridEntry, hu, hv float64, periodic bool) {
	counts := make([]int32, g.nu*g.nv+1)
	g.eachCell(items, hu, hv, periodic, func(k int, _ gridEntry) { counts[k+1]++ })
	for k := 1; k < len(counts); k++ {
		counts[k] += counts[k-1]
	}
	g.start = counts
	g.entries = make([]gridEntry, counts[len(counts)-1])
	next := append([]int32(nil), counts[:len(counts)-1]...)
	g.eachCell(items, hu, hv, periodic, func(k int, e gridEntry) {
		g.entries[next[k]] = e
		next[k]++
	})
}

func (g *grid) eachCell(items []gridEntry, hu, hv float64, periodic bool, fn func(int, gridEntry)) {
	for _, e := range items {
		ulo := int(math.Floor((e.u - hu - g.u0) * g.su))
		uhi := int(math.Floor((e.u + hu - g.u0) * g.su))
		if periodic {
			uhi = min(uhi, ulo+g.nu-1) // never list a cell twice
		} else {
			ulo, uhi = max(ulo, 0), min(uhi, g.nu-1)
		}
		vlo := max(int(math.Floor((e.v-hv-g.v0)*g.sv)), 0)
		vhi := min(int(math.Floor((e.v+hv-g.v0)*g.sv)), g.nv-1)
		for iv := vlo; iv <= vhi; iv++ {
			for iu := ulo; iu <= uhi; iu++ {
				fn(iv*g.nu+((iu%g.nu)+g.nu)%g.nu, e)
			}
		}
	}
}

// buildIndex sorts the sensors into the three surface grids.
func (d *Detector) buildIndex() {
	var barrel, top, bottom []gridEntry
	for _, s := range d.sensors {
		switch s.Surface {
		case Barrel:
			barrel = append(barrel, gridEntry{math.Atan2(s.Pos.Y, s.Pos.X), s.Pos.Z, int32(s.Index)})
		case Top:
			top = append(top, gridEntry{s.Pos.X, s.Pos.Y, int32(s.Index)})
		case Bottom:
			bottom = append(bottom, gridEntry{s.Pos.X, s.Pos.Y, int32(s.Index)})
		}
	}
	c, half := d.cyl, d.diameter/2
	// The barrel grid is in (phi, z); its cells are at least D wide in arc
	// length, hence the scaling of the u extent by r.
	d.barrel = newGrid(-math.Pi, 2*math.Pi*c.r, -c.h, 2*c.h, len(barrel), d.diameter)
	d.barrel.su *= c.r
	d.barrel.fill(barrel, half/c.r, half, true)
	d.top = newGrid(-c.r, 2*c.r, -c.r, 2*c.r, len(top), d.diameter)
	d.top.fill(top, half, half, false)
	d.bottom = newGrid(-c.r, 2*c.r, -c.r, 2*c.r, len(bottom), d.diameter)
	d.bottom.fill(bottom, half, half, false)
}

// findOverlap returns a pair of sensors whose photocathodes overlap by more
// than positionTolerance, and their distance along the surface. Two
// overlapping photocathodes share a point, so they share a cell: comparing
// the pairs within each cell finds every overlap.
func (d *Detector) findOverlap() (i, j int, dist float64, found bool) {
	limit := d.diameter - positionTolerance
	for _, g := range []*grid{&d.barrel, &d.top, &d.bottom} {
		barrel := g == &d.barrel
		for k := 0; k+1 < len(g.start); k++ {
			cell := g.entries[g.start[k]:g.start[k+1]]
			for a := range cell {
				for b := a + 1; b < len(cell); b++ {
					du, dv := cell[b].u-cell[a].u, cell[b].v-cell[a].v
					if barrel {
						du = d.cyl.r * wrapAngle(du)
					}
					if dd := math.Hypot(du, dv); dd < limit {
						i, j = int(min(cell[a].index, cell[b].index)), int(max(cell[a].index, cell[b].index))
						return i, j, dd, true
					}
				}
			}
		}
	}
	return 0, 0, 0, false
}

// wrapAngle maps an angle difference in [-2pi, 2pi] to [-pi, pi].
func wrapAngle(a float64) float64 {
	if a > math.Pi {
		return a - 2*math.Pi
	}
	if a < -math.Pi {
		return a + 2*math.Pi
	}
	return a
}
