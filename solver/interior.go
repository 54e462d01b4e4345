package solver

import (
	"math"
	"slices"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
)

// reachFlow is what a solved reach keeps of its solution so that the flow
// can be recomputed between two of its points: the discharge, bed line and
// tolerance of the energy equation, and the runs of one section with their
// critical and normal depths. It is read-only after Solve, so a result can
// be read by several goroutines.
type reachFlow struct {
	f      flowCtx
	pieces []piece
}

// keepFlow records on the reach result what Between and Zones need.
func (w *reachWork) keepFlow() {
	// The pieces are copied: the reach result outlives the work buffers of
	// its event.
	w.res.flow = reachFlow{f: w.f, pieces: slices.Clone(w.pieces)}
	w.res.flow.f.noConv = 0
}

// evaluations is the number of section evaluations the reach's profiles
// cost in Solve (for the benchmarks).
func (r *ReachResult) evaluations() int { return r.flow.f.evals }

// pieceAt is the run of the reach with section sec that holds station x.
func (rf *reachFlow) pieceAt(sec *model.Section, x float64) (int, bool) {
	eps := 1e-9 * math.Max(rf.f.length, 1)
	for i := range rf.pieces {
		p := &rf.pieces[i]
		if p.geo.Section() == sec && x >= p.from-eps && x <= p.to+eps {
			return i, true
		}
	}
	return 0, false
}

// Between computes the flow at station x strictly between the computed
// points i and i+1 of the reach (same section, distinct stations), so that
// a rule can find where a limit is crossed between two points rather than
// at one of them.
//
// The energy equation is solved again by one standard step from the point
// the profile was computed from, toward x, with the step function of the
// solver itself (Chow 1959, §10-3): from point i+1 upstream when both
// points lie on the subcritical branch (depth ≥ the depth of least
// energy), from point i downstream when both lie on the supercritical
// branch. The step from a neighbour is shorter than the (controlled) step
// that joined the two points, so its error is no larger than theirs.
// Where the two points lie on different branches (the flow passes through
// critical depth between them without a jump) or the energy equation has
// no solution over the step (a critical-depth fallback), the depth is
// interpolated linearly between the two points and approx is true.
//
// ok is false where there is nothing to compute: a result not produced by
// Solve, an index or station outside (point i, point i+1), or two points in
// different sections. The returned point's numbers are finite.
func (r *ReachResult) Between(i int, x float64) (p Point, approx, ok bool) {
	if r == nil || r.flow.pieces == nil || i < 0 || i+1 >= len(r.Points) {
		return Point{}, false, false
	}
	a, b := &r.Points[i], &r.Points[i+1]
	if !(x > a.Station && x < b.Station) || a.Section != b.Section || a.Section == nil {
		return Point{}, false, false
	}
	rf := &r.flow
	pi, found := rf.pieceAt(a.Section, x)
	if !found || !(rf.f.q > 0) {
		return Point{}, false, false
	}
	pc := &rf.pieces[pi]
	t := (x - a.Station) / (b.Station - a.Station)
	lin := a.Depth + t*(b.Depth-a.Depth)
	y, stepped := lin, false
	subA, subB := a.Depth >= pc.yc, b.Depth >= pc.yc
	superA, superB := a.Depth <= pc.yc, b.Depth <= pc.yc
	f := rf.f // a copy: the step counts its work, and the result is read-only
	switch {
	case subA && subB && a.Depth > 0:
		y, stepped = f.standardStep(pc, b.Station, b.Depth, x, false, lin)
	case superA && superB && a.Depth > 0:
		y, stepped = f.standardStep(pc, a.Station, a.Depth, x, true, lin)
	}
	if !stepped || !(y > 0) || math.IsInf(y, 0) {
		y, approx = lin, true
	}
	w := reachWork{f: rf.f, q: rf.f.q, pieces: rf.pieces}
	p = w.point(pt{x: x, y: y, piece: int32(pi), super: y < pc.yc})
	if !finitePoint(&p) {
		return Point{}, false, false
	}
	return p, approx, true
}

// finitePoint reports whether every number of a point is finite.
func finitePoint(p *Point) bool {
	return numfmt.Finite(p.Station, p.Invert, p.Depth, p.WSE, p.Velocity, p.Froude, p.Energy, p.CriticalDepth,
		p.NormalDepth, p.Area, p.TopWidth, p.HydraulicRadius, p.FrictionSlope, p.Alpha)
}

// Zone velocities of a points section (see Zones).
type ZoneFlow struct {
	// Velocity of the left overbank, main channel and right overbank,
	// V_i = Q·K_i/(K·A_i); 0 for a dry zone.
	Velocity [3]float64
	// Area of each zone.
	Area [3]float64
	// Share of the discharge carried by each zone, K_i/K.
	Share [3]float64
}

// Zone indices of ZoneFlow.
const (
	LeftOverbank  = zoneLeft
	MainChannel   = zoneMain
	RightOverbank = zoneRight
)

// Max is the highest zone velocity and its zone.
func (z ZoneFlow) Max() (float64, int) {
	best, at := z.Velocity[MainChannel], MainChannel
	for i, v := range z.Velocity {
		if v > best {
			best, at = v, i
		}
	}
	return best, at
}

// Zones splits the discharge at computed point p of the reach among the
// left overbank, main channel and right overbank of its points section by
// conveyance (divided channel method; Chow 1959, ch. 6):
//
//	Q_i = Q·K_i/K      V_i = Q_i/A_i = Q·K_i/(K·A_i)
//
// ok is false for other shapes (one zone: the mean velocity is the
// velocity), for a dry point and for a result not produced by Solve.
func (r *ReachResult) Zones(p *Point) (ZoneFlow, bool) {
	if r == nil || r.flow.pieces == nil || p == nil || p.Section == nil || p.Section.Shape != model.Points || !(p.Depth > 0) {
		return ZoneFlow{}, false // one zone: the cheap answer for every other shape
	}
	pi, found := r.flow.pieceAt(p.Section, p.Station)
	if !found {
		return ZoneFlow{}, false
	}
	return zonesOf(r.flow.pieces[pi].geo, r.flow.f.q, p.Depth)
}

func zonesOf(g *Geometry, q, y float64) (ZoneFlow, bool) {
	if g == nil || g.kind != kindPoints || !(q > 0) || !(y > 0) || math.IsInf(y, 0) {
		return ZoneFlow{}, false
	}
	a, k := g.pts.zones(clampDepth(y))
	kt := k[0] + k[1] + k[2]
	if !(kt > 0) {
		return ZoneFlow{}, false
	}
	var z ZoneFlow
	for i := range 3 {
		z.Area[i] = a[i]
		z.Share[i] = k[i] / kt
		if a[i] > 0 {
			z.Velocity[i] = q * k[i] / (kt * a[i])
		}
	}
	return z, true
}

// zones is the area and conveyance of each zone of a points section at
// depth y (the parts that assemble sums).
func (c *compound) zones(y float64) (a, k [3]float64) {
	_, _, a, p := c.parts(y)
	for z := range 3 {
		if a[z] > 0 && p[z] > 0 {
			r := a[z] / p[z]
			k[z] = c.kn[z] * a[z] * math.Cbrt(r*r)
		}
	}
	return a, k
}
