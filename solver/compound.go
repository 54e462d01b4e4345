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

// gridMax bounds the scan grid of sections with many vertex elevations.
const gridMax = 4096

// gridJustAbove places a scan depth just above each vertex elevation l, at
// l + gridJustAbove·(1 + l).
const gridJustAbove = 1e-9

// compound is a points (polyline) section, subdivided into left overbank,
// main channel and right overbank for conveyance.
//
// The stage is level across the section (the usual one-dimensional
// assumption): every part of the polyline below the water surface is wet,
// including isolated pockets. Each end point is extended upwards by a
// vertical wall, so a stage above the lower end point (and above the
// higher one) stays between the first and last offsets instead of
// spilling: the walls are wetted (they add perimeter and bound the top
// width), and Height, the lower end point by default, tells the rules
// where the section overtops. The vertical lines
// that divide the zones are not wetted perimeter (divided channel method;
// Chow 1959, ch. 6, from memory).
//
// Between two consecutive vertex elevations every segment is dry, wetted
// up to the surface or fully wet, so each property is a polynomial of the
// depth there; NewGeometry tabulates those polynomials once (see band)
// and Props finds the band by binary search.
type compound struct {
	x, e  []float64 // vertices (offsets, elevations above the lowest point), banks inserted
	dx, l []float64 // horizontal and true length of segment i (vertices i and i+1)
	zone  []uint8   // zone of segment i
	wallL uint8     // zone of the left wall
	wallR uint8     // zone of the right wall
	kn    [3]float64
	// levels are the distinct vertex elevations above the lowest point,
	// ascending from 0; bands[j] holds the properties for
	// levels[j] < y ≤ levels[j+1].
	levels []float64
	bands  []band
	grid   []float64 // ascending scan depths (see gridSub)
	zmin   float64   // elevation of the lowest point
	// tab holds the section's hydraulics at every scan depth, filled once
	// per Geometry (see tabulate): the depth searches compare against it
	// instead of evaluating Props over the whole grid at every call.
	tab gridTable
}

// gridTable is the hydraulics of a points section at each depth of its
// scan grid, the parts of the depth searches' conditions that do not
// depend on the discharge:
//
//	kmax[i] = max over j ≤ i of K(grid[j])             normal depth: K = Q/√S0
//	zc[i]   = ln(g·A³) − ln(α·T) at grid[i]            critical depth: zc = ln Q²
//
// so that a search finds its bracket by comparisons (a binary search on
// kmax, a sweep over zc) and spends section evaluations only in Brent's
// method inside the bracket. The bracket is the one the untabulated sweep
// finds, and the root Brent's method then converges to is the same.
type gridTable struct {
	kmax []float64
	zc   []float64
}

// tabulateNear is the distance from a condition's root within which a
// tabulated grid value is re-evaluated from Props, so that rounding in the
// table (ln a − ln b against ln(a/b)) can never flip the sign the
// untabulated search would see.
const tabulateNear = 1e-9

// tabulate fills g.pts.tab; NewBarrels calls it once the Geometry is
// complete (Props must be usable).
func (g *Geometry) tabulate() {
	c := &g.pts
	n := len(c.grid)
	c.tab = gridTable{kmax: make([]float64, n), zc: make([]float64, n)}
	kmax := 0.0
	for i, y := range c.grid {
		p := g.Props(y)
		kmax = math.Max(kmax, p.Conveyance)
		c.tab.kmax[i] = kmax
		c.tab.zc[i] = math.Log(g.g*p.Area*p.Area*p.Area) - math.Log(p.Alpha*p.TopWidth)
	}
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
	ns := max(len(c.x)-1, 0)
	c.zone, c.dx, c.l = make([]uint8, ns), make([]float64, ns), make([]float64, ns)
	for i := range c.zone {
		c.zone[i] = zoneOf((c.x[i] + c.x[i+1]) / 2)
		c.dx[i] = c.x[i+1] - c.x[i]
		c.l[i] = math.Hypot(c.dx[i], c.e[i+1]-c.e[i])
	}
	c.wallL, c.wallR = zoneOf(c.x[0]), zoneOf(c.x[len(c.x)-1])

	c.buildBands()

	// Scan grid: the distinct vertex elevations above the lowest point,
	// each interval split in sub parts, and a depth just above each
	// vertex elevation, where the top width jumps when a flat part of the
	// bed (an overbank) starts to flood. Sections with very many levels
	// get fewer parts per interval (their intervals are short), which
	// bounds the grid to about gridMax depths plus two per level.
	sub := max(1, min(gridSub, gridMax/len(c.levels)))
	prev := 0.0
	for _, l := range c.levels[1:] {
		for j := 1; j <= sub; j++ {
			c.grid = append(c.grid, prev+(l-prev)*float64(j)/float64(sub))
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

// band holds the hydraulic properties of a points section between two
// consecutive vertex elevations, L_j < y ≤ L_j+1 (the last band: y > L_m),
// as polynomials in u = y − L_j: per zone the area A_i (degree 2) and
// wetted perimeter P_i (degree 1), and for the whole section the top width
// (degree 1) and the first moment A·z̄ (degree 3). Coefficient k multiplies
// u^k.
type band struct {
	a [3][3]float64
	p [3][2]float64
	t [2]float64
	m [4]float64
}

// shift re-expands the polynomials of b about a level h higher: p(u) is
// replaced by p(u + h) (Taylor shift). Every coefficient of the fully wet
// part is a sum of non-negative terms, so the shift adds non-negative
// terms only and loses no precision.
func (b *band) shift(h float64) {
	for z := range 3 {
		a := &b.a[z]
		a[0] += (a[1] + a[2]*h) * h
		a[1] += 2 * a[2] * h
		b.p[z][0] += b.p[z][1] * h
	}
	b.t[0] += b.t[1] * h
	m := &b.m
	m[0] += (m[1] + (m[2]+m[3]*h)*h) * h
	m[1] += (2*m[2] + 3*m[3]*h) * h
	m[2] += 3 * m[3] * h
}

// addFull adds segment i, wetted over its whole length, expanded about
// level l (at or above both its ends). With δa = l − e_a, δb = l − e_b:
//
//	A = Δx·(u + (δa+δb)/2)     T = Δx     P = length
//	A·z̄ = Δx·(3u² + 3u·(δa+δb) + δa² + δa·δb + δb²)/6
func (c *compound) addFull(b *band, i int, l float64) {
	z := c.zone[i]
	dx := c.dx[i]
	b.p[z][0] += c.l[i]
	if dx <= 0 {
		return
	}
	da, db := l-c.e[i], l-c.e[i+1]
	b.a[z][0] += dx * (da + db) / 2
	b.a[z][1] += dx
	b.t[0] += dx
	b.m[0] += dx * (da*da + da*db + db*db) / 6
	b.m[1] += dx * (da + db) / 2
	b.m[2] += dx / 2
}

// addPartial adds segment i, wetted from its lower end up to the water
// surface, expanded about level l (between its ends). With
// d = u + δ, δ = l − e_min and rise Δe = e_max − e_min:
//
//	A = Δx·d²/(2Δe)     T = Δx·d/Δe     P = length·d/Δe
//	A·z̄ = Δx·d³/(6Δe)
//
// (a vertical segment: P = d only).
func (c *compound) addPartial(b *band, i int, l float64) {
	z := c.zone[i]
	ea, eb := c.e[i], c.e[i+1]
	lo, rise := math.Min(ea, eb), math.Abs(eb-ea)
	d := l - lo
	dx := c.dx[i]
	if dx <= 0 {
		b.p[z][0] += d
		b.p[z][1]++
		return
	}
	w := c.l[i] / rise
	b.p[z][0] += w * d
	b.p[z][1] += w
	r := dx / rise
	b.t[0] += r * d
	b.t[1] += r
	ca := r / 2
	b.a[z][0] += ca * d * d
	b.a[z][1] += 2 * ca * d
	b.a[z][2] += ca
	cm := r / 6
	b.m[0] += cm * d * d * d
	b.m[1] += 3 * cm * d * d
	b.m[2] += 3 * cm * d
	b.m[3] += cm
}

// buildBands fills c.levels and c.bands by one sweep up the vertex
// elevations: the fully wet part is carried from band to band by shift,
// the few segments that cross a band (two per crossing of the water
// surface with the bed) are added afresh, so the cost is about
// O(N·log N + N·crossings) and Props is O(log N) for any number of points.
func (c *compound) buildBands() {
	c.levels = slices.Clone(c.e)
	slices.Sort(c.levels)
	c.levels = slices.Compact(c.levels)
	nl := len(c.levels)
	level := func(e float64) int {
		j, _ := slices.BinarySearch(c.levels, e)
		return j
	}
	// The level where each segment starts to be wetted and where it
	// becomes fully wet; the segments in order of each.
	ns := len(c.zone)
	lo, hi := make([]int32, ns), make([]int32, ns)
	var starts []int32
	fulls := make([]int32, ns)
	for i := range ns {
		ea, eb := c.e[i], c.e[i+1]
		lo[i], hi[i] = int32(level(math.Min(ea, eb))), int32(level(math.Max(ea, eb)))
		if lo[i] < hi[i] {
			starts = append(starts, int32(i))
		}
		fulls[i] = int32(i)
	}
	slices.SortStableFunc(starts, func(a, b int32) int { return int(lo[a] - lo[b]) })
	slices.SortStableFunc(fulls, func(a, b int32) int { return int(hi[a] - hi[b]) })
	c.bands = make([]band, nl)
	var full band
	var active []int32
	for j, l := range c.levels {
		if j > 0 {
			full.shift(l - c.levels[j-1])
		}
		for len(fulls) > 0 && int(hi[fulls[0]]) == j {
			i := fulls[0]
			fulls = fulls[1:]
			if k := slices.Index(active, i); k >= 0 {
				active = slices.Delete(active, k, k+1)
			}
			c.addFull(&full, int(i), l)
		}
		// The end walls, wetted above their foot: P = u + (l − e_end).
		for _, w := range [2]struct {
			e float64
			z uint8
		}{{c.e[0], c.wallL}, {c.e[len(c.e)-1], c.wallR}} {
			if level(w.e) == j {
				full.p[w.z][1]++
			}
		}
		for len(starts) > 0 && int(lo[starts[0]]) == j {
			active = append(active, starts[0])
			starts = starts[1:]
		}
		b := full
		for _, i := range active {
			c.addPartial(&b, int(i), l)
		}
		c.bands[j] = b
	}
}

// props of a points section at depth y (already clamped to a positive
// value), from the band that holds y.
func (c *compound) props(y float64) Props {
	b, u, a, p := c.parts(y)
	return c.assemble(a, p, b.t[0]+b.t[1]*u, b.m[0]+(b.m[1]+(b.m[2]+b.m[3]*u)*u)*u)
}

// parts finds the band that holds depth y (already clamped) and evaluates
// the area and wetted perimeter of each zone there; u is y above the
// band's lower level.
func (c *compound) parts(y float64) (b *band, u float64, a, p [3]float64) {
	j, _ := slices.BinarySearch(c.levels, y) // first level ≥ y
	j = max(j-1, 0)
	b = &c.bands[j]
	u = y - c.levels[j]
	for z := range 3 {
		ab := &b.a[z]
		a[z] = ab[0] + (ab[1]+ab[2]*u)*u
		p[z] = b.p[z][0] + b.p[z][1]*u
	}
	return b, u, a, p
}

// assemble completes the properties from the area and wetted perimeter of
// each zone and the section's top width and first moment. Per zone i,
// K_i = (k/n_i)·A_i·R_i^(2/3) with R_i = A_i/P_i; K = Σ K_i and
// α = (Σ K_i³/A_i²)/(K³/A²) (divided channel method: Chow 1959, ch. 6,
// from memory).
func (c *compound) assemble(a, p [3]float64, t, m float64) Props {
	out := Props{TopWidth: t, FirstMoment: m, Alpha: 1}
	var sk3a2 float64
	for z := range 3 {
		out.Area += a[z]
		out.Perimeter += p[z]
		if a[z] > 0 && p[z] > 0 {
			r := a[z] / p[z]
			k := c.kn[z] * a[z] * math.Cbrt(r*r)
			out.Conveyance += k
			sk3a2 += k * k * k / (a[z] * a[z])
		}
	}
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
