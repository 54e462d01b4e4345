package solver

import (
	"math"
	"slices"

	"github.com/chanlint/chanlint/model"
)

// Zones of a points section.
const (
	zoneLeft  = 0 // left overbank: offset < left bank
	zoneMain  = 1 // main channel: left bank ≤ offset ≤ right bank
	zoneRight = 2 // right overbank: offset > right bank
)

// gridSub is the number of scan intervals between two consecutive vertex
// elevations of a points section, used to find every sign change of the
// critical-flow and momentum conditions (which are smooth between vertex
// elevations, so 8 intervals resolve any double crossing that a real
// section produces).
const gridSub = 8

// gridJustAbove places a scan depth just above each vertex elevation l, at
// l + gridJustAbove·(1 + l).
const gridJustAbove = 1e-9

// compound is a points (polyline) section, subdivided into left overbank,
// main channel and right overbank for conveyance.
//
// The stage is level across the section (the usual one-dimensional
// assumption): every part of the polyline below the water surface is wet,
// including isolated pockets. Above the higher end point the two end
// points are extended by vertical walls, which are wetted (they add
// perimeter, no area outside the polyline's offsets). The vertical lines
// that divide the zones are not wetted perimeter (Chow 1959, §6-7, divided
// channel method).
type compound struct {
	x, e  []float64 // vertices (offsets, elevations above the lowest point), banks inserted
	zone  []uint8   // zone of segment i (vertices i and i+1)
	wallL uint8     // zone of the left wall
	wallR uint8     // zone of the right wall
	kn    [3]float64
	grid  []float64 // ascending scan depths (see gridSub)
	zmin  float64   // elevation of the lowest point
}

func newCompound(s *model.Section, k float64) compound {
	c := compound{}
	n1 := positive(s.Roughness[1])
	for i := range 3 {
		n := s.Roughness[i]
		if !(n > 0) || math.IsInf(n, 0) {
			n = n1
		}
		c.kn[i] = k / n
	}
	pts := s.Points
	if len(pts) == 0 {
		pts = []model.Point{{Offset: 0, Elevation: 0}}
	}
	c.zmin = pts[0].Elevation
	for _, p := range pts {
		c.zmin = math.Min(c.zmin, p.Elevation)
	}
	bl, br := math.Min(s.Banks[0], s.Banks[1]), math.Max(s.Banks[0], s.Banks[1])
	if !(bl < br) {
		// No main channel given: the whole section is one subdivision.
		bl, br = math.Inf(-1), math.Inf(1)
	}
	zoneOf := func(x float64) uint8 {
		switch {
		case x < bl:
			return zoneLeft
		case x > br:
			return zoneRight
		}
		return zoneMain
	}
	// Vertices with the bank offsets inserted where they fall inside a
	// segment, so that every segment lies in exactly one zone.
	for i, p := range pts {
		if i > 0 {
			q := pts[i-1]
			for _, b := range [2]float64{bl, br} {
				if b > q.Offset && b < p.Offset {
					f := (b - q.Offset) / (p.Offset - q.Offset)
					c.x = append(c.x, b)
					c.e = append(c.e, q.Elevation+f*(p.Elevation-q.Elevation)-c.zmin)
				}
			}
		}
		c.x = append(c.x, p.Offset)
		c.e = append(c.e, p.Elevation-c.zmin)
	}
	c.zone = make([]uint8, max(len(c.x)-1, 0))
	for i := range c.zone {
		c.zone[i] = zoneOf((c.x[i] + c.x[i+1]) / 2)
	}
	c.wallL, c.wallR = zoneOf(c.x[0]), zoneOf(c.x[len(c.x)-1])

	// Scan grid: the distinct vertex elevations above the lowest point,
	// each interval split in gridSub parts, and a depth just above each
	// vertex elevation, where the top width jumps when a flat part of the
	// bed (an overbank) starts to flood.
	levels := slices.Clone(c.e)
	slices.Sort(levels)
	levels = slices.Compact(levels)
	prev := 0.0
	for _, l := range levels {
		if l <= 0 {
			continue
		}
		for j := 1; j <= gridSub; j++ {
			c.grid = append(c.grid, prev+(l-prev)*float64(j)/gridSub)
		}
		c.grid = append(c.grid, l+gridJustAbove*(1+l))
		prev = l
	}
	return c
}

// defaultHeight is the lower end point above the lowest point (the
// model's default `height`), or the higher one when the lower end point
// is itself the lowest point.
func (c *compound) defaultHeight() float64 {
	l, r := c.e[0], c.e[len(c.e)-1]
	if h := math.Min(l, r); h > 0 {
		return h
	}
	return math.Max(l, r)
}

// props of a points section at depth y (already clamped to a positive
// value). Each segment from (x_a, e_a) to (x_b, e_b) contributes, over its
// wetted part, with d = y − e(x) linear along it:
//
//	A = ∫ d dx     T = wetted horizontal length     P = wetted length
//	A·z̄ = ∫ d²/2 dx = Δx·(d_a² + d_a·d_b + d_b²)/6 for a fully wet segment
//
// (exact for a polyline; common practice, no published source). Per zone
// i, K_i = (k/n_i)·A_i·R_i^(2/3) with R_i = A_i/P_i; K = Σ K_i and
// α = (Σ K_i³/A_i²)/(K³/A²) (divided channel method: Chow 1959, §6-7
// and §8-7, from memory).
func (c *compound) props(y float64) Props {
	var a, p, t, m [3]float64
	x, e := c.x, c.e
	for i, z := range c.zone {
		ea, eb := e[i], e[i+1]
		if ea >= y && eb >= y {
			continue
		}
		dx := x[i+1] - x[i]
		if dx <= 0 {
			// Vertical segment: wetted height only.
			lo, hi := math.Min(ea, eb), math.Min(math.Max(ea, eb), y)
			p[z] += hi - lo
			continue
		}
		da, db := y-ea, y-eb
		l := math.Hypot(dx, eb-ea)
		switch {
		case da >= 0 && db >= 0:
			a[z] += dx * (da + db) / 2
			t[z] += dx
			p[z] += l
			m[z] += dx * (da*da + da*db + db*db) / 6
		case da > 0: // wet at a, dry at b
			f := da / (da - db)
			a[z] += f * dx * da / 2
			t[z] += f * dx
			p[z] += f * l
			m[z] += f * dx * da * da / 6
		default: // dry at a, wet at b
			f := db / (db - da)
			a[z] += f * dx * db / 2
			t[z] += f * dx
			p[z] += f * l
			m[z] += f * dx * db * db / 6
		}
	}
	if w := y - e[0]; w > 0 {
		p[c.wallL] += w
	}
	if w := y - e[len(e)-1]; w > 0 {
		p[c.wallR] += w
	}
	var out Props
	var sk3a2 float64
	for i := range 3 {
		out.Area += a[i]
		out.Perimeter += p[i]
		out.TopWidth += t[i]
		out.FirstMoment += m[i]
		if a[i] > 0 && p[i] > 0 {
			r := a[i] / p[i]
			ki := c.kn[i] * a[i] * math.Cbrt(r*r)
			out.Conveyance += ki
			sk3a2 += ki * ki * ki / (a[i] * a[i])
		}
	}
	out.Alpha = 1
	if out.Perimeter > 0 {
		out.HydraulicRadius = out.Area / out.Perimeter
	}
	if k := out.Conveyance; k > 0 {
		out.Alpha = sk3a2 * out.Area * out.Area / (k * k * k)
	}
	return out
}

// scanAbove returns the first scan depth of a points section strictly
// above y, or 2·y beyond the grid (and for the other shapes).
func (g *Geometry) scanAbove(y float64) float64 {
	grid := g.pts.grid
	if g.kind == kindPoints && len(grid) > 0 {
		i, _ := slices.BinarySearch(grid, y)
		for ; i < len(grid); i++ {
			if grid[i] > y*(1+1e-12) {
				return grid[i]
			}
		}
	}
	return 2 * y
}

// scanBelow returns the last scan depth of a points section strictly
// below y, or y/2 below the grid (and for the other shapes).
func (g *Geometry) scanBelow(y float64) float64 {
	grid := g.pts.grid
	if g.kind == kindPoints && len(grid) > 0 {
		i, _ := slices.BinarySearch(grid, y)
		for i--; i >= 0; i-- {
			if grid[i] < y*(1-1e-12) {
				return grid[i]
			}
		}
	}
	return y / 2
}
