package solver

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
)

// finish turns the final profile of a reach into Points, profile spans and
// notes, and records the state at its downstream end for the reach below.
func (s *solver) finish(w *reachWork) {
	res := w.res
	defer func() { s.finBuf = w.final[:0] }()
	if w.q == 0 || len(w.pieces) == 0 || len(w.final) == 0 {
		s.dryReach(w)
		return
	}
	res.Points = make([]Point, len(w.final))
	for i, c := range w.final {
		res.Points[i] = w.point(c)
	}
	last := w.final[len(w.final)-1]
	lp := &w.pieces[last.piece]
	w.endY = last.y
	w.endH = w.f.invert(last.x) + w.f.eval(lp, last.y).e
	res.Notes = fallbackNotes(w.final, w.pieces, res.Notes)
	if w.f.noConv > 0 {
		res.Notes = append(res.Notes, Note{Kind: NoteNoConvergence, Station: 0, Message: fmt.Sprintf(
			"the root finder did not close the energy equation within its iteration bound %d times in this reach; the best estimates were used", w.f.noConv)})
	}
	if w.r.Downstream == nil {
		s.outletNotes(w, lp)
	}
	s.transitions(w)
	if w.outletStruct.Kind != "" && !w.endSuper {
		res.Structures = append(res.Structures, w.outletStruct)
	}
	slices.SortStableFunc(res.Structures, func(a, b Structure) int { return cmp.Compare(a.Station, b.Station) })
	res.Profiles = spans(res.Points, w.final, w.pieces)
	w.keepFlow()
	sortNotes(res.Notes)
	sanitize(res)
}

// dryReach fills a reach that carries no discharge in the event: points at
// its stops with zero depth, and a note.
func (s *solver) dryReach(w *reachWork) {
	res := w.res
	w.endY, w.endH = 0, w.r.InvertDown
	for _, x := range w.stops {
		z := w.r.InvertAt(x)
		p := Point{Station: x, Invert: z, WSE: z, Energy: z, Regime: Subcritical, Section: w.r.SectionAt(x), Alpha: 1}
		res.Points = append(res.Points, p)
	}
	res.Notes = append(res.Notes, noteInfo(0, "the reach carries no discharge in this event: nothing is computed"))
	sanitize(res)
}

// outletNotes explains an outlet control that could not act.
func (s *solver) outletNotes(w *reachWork, lp *piece) {
	res := w.res
	L := w.f.length
	res.Notes = append(res.Notes, w.outletNotes...)
	req := w.outletReq
	switch {
	case w.endSuper && req > lp.yc*(1+1e-9):
		msg := "the outlet depth %s cannot control the supercritical flow arriving at depth %s"
		args := []any{num(req), num(w.endY)}
		if y2, err := SequentDepth(lp.geo, w.q, w.endY); err == nil {
			msg += " (its sequent depth is %s)"
			args = append(args, num(y2))
		}
		msg += ": the flow leaves the outlet supercritical and a jump, if any, forms downstream of the model"
		res.Notes = append(res.Notes, noteControl(L, msg, args...))
	case !w.endSuper && req < lp.yc*(1-1e-9):
		if w.outletKind == model.OutletNormal {
			res.Notes = append(res.Notes, noteControl(L,
				"the normal depth %s at the outlet is supercritical and cannot control the subcritical flow arriving: critical depth %s is taken",
				num(req), num(lp.yc)))
		} else {
			res.Notes = append(res.Notes, noteControl(L,
				"the outlet depth %s is below critical depth %s and cannot control the subcritical flow arriving: critical depth is taken (a free outfall)",
				num(req), num(lp.yc)))
		}
	}
}

// point fills every field of a result point.
func (w *reachWork) point(c pt) Point {
	p := &w.pieces[c.piece]
	g := p.geo
	pr := g.Props(c.y)
	z := w.f.invert(c.x)
	v := pr.Velocity(w.q)
	kq := w.q / pr.Conveyance
	f2 := froude2(g, w.q, pr)
	out := Point{
		Station:         c.x,
		Invert:          z,
		Depth:           c.y,
		WSE:             z + c.y,
		Velocity:        v,
		Froude:          math.Sqrt(f2),
		Energy:          z + c.y + pr.Alpha*v*v/(2*g.g),
		CriticalDepth:   p.ycF,
		NormalDepth:     p.yn,
		HasNormal:       p.hasN,
		Section:         g.Section(),
		Area:            pr.Area,
		TopWidth:        pr.TopWidth,
		HydraulicRadius: pr.HydraulicRadius,
		FrictionSlope:   kq * kq,
		Alpha:           pr.Alpha,
		Full:            pr.Full,
	}
	out.Regime = regimeOf(c.y, p.yc, out.Froude)
	if c.fallback {
		out.Regime = Critical
	}
	return out
}

// criticalFroudeTol is how near 1 a Froude number is taken as critical
// flow. The step control holds the depth to stepRelTol (1e-4) of itself
// per step, and F varies as y^(−3/2) in a rectangle, so along a profile at
// critical depth on a near-critical slope F wanders by a few 1e-5 about 1:
// nearer than this it tells nothing about the regime (common practice for
// a numerical tolerance, no published source).
const criticalFroudeTol = 1e-4

// regimeOf: critical where the depth is the critical depth itself or the
// Froude number is within criticalFroudeTol of 1, else by the Froude number.
func regimeOf(y, yc, fr float64) Regime {
	switch {
	case y == yc || math.Abs(fr-1) <= criticalFroudeTol:
		return Critical
	case fr < 1:
		return Subcritical
	}
	return Supercritical
}

// Tolerances of the profile classification.
const (
	// uniformTol: a depth within 0.1 % of normal depth is uniform flow and
	// belongs to no gradually-varied-flow profile.
	uniformTol = 1e-3
	// criticalTol: a depth within 1e-6 of critical depth (a control or a
	// fallback) joins the profile next to it.
	criticalTol = 1e-6
)

// pointKind says how a point takes part in the profile spans.
type pointKind uint8

const (
	kindTyped    pointKind = iota // in zone 1, 2 or 3
	kindCritical                  // at critical depth: joins the neighbouring spans
	kindUniform                   // at normal depth: in no span
)

// profileType is the gradually-varied-flow type of a depth y in a piece
// (Chow 1959, §9-2): the letter by the piece's slope class (M mild, S
// steep, C critical, H horizontal, A adverse) and the zone by the depth
// against normal depth yn and critical depth yc — zone 1 above both,
// zone 2 between, zone 3 below both; horizontal and adverse beds have no
// zone 1. The piece's own section decides both, so a steep segment in a
// mild reach shows S profiles.
func profileType(p *piece, y float64) (string, pointKind) {
	yc, yn := p.ycF, p.yn
	if math.Abs(y-yc) <= criticalTol*yc || math.Abs(y-p.yc) <= criticalTol*p.yc {
		return "", kindCritical
	}
	uniform := p.hasN && math.Abs(y-yn) <= uniformTol*yn
	switch p.class {
	case Mild:
		switch {
		case uniform:
			return "", kindUniform
		case p.hasN && y > yn:
			return "M1", kindTyped
		case y > yc:
			return "M2", kindTyped
		}
		return "M3", kindTyped
	case Steep:
		switch {
		case uniform:
			return "", kindUniform
		case y > yc:
			return "S1", kindTyped
		case y > yn:
			return "S2", kindTyped
		}
		return "S3", kindTyped
	case CriticalSl:
		if uniform {
			return "", kindUniform
		}
		if y > yc {
			return "C1", kindTyped
		}
		return "C3", kindTyped
	case Horizontal:
		if y > yc {
			return "H2", kindTyped
		}
		return "H3", kindTyped
	}
	if y > yc {
		return "A2", kindTyped
	}
	return "A3", kindTyped
}

// spans merges neighbouring points of the same profile type into
// ProfileSpans. A point at critical depth extends the span before it and
// starts the span after it; a point at normal depth ends the span; spans
// of zero length are dropped.
func spans(points []Point, final []pt, pieces []piece) []ProfileSpan {
	var out []ProfileSpan
	var cur ProfileSpan
	open := false
	critX, haveCrit := 0.0, false
	closeSpan := func() {
		if open && cur.ToStation > cur.FromStation {
			out = append(out, cur)
		}
		open = false
	}
	for i, c := range final {
		x := points[i].Station
		t, kind := profileType(&pieces[c.piece], c.y)
		switch kind {
		case kindCritical:
			if open {
				cur.ToStation = x
			}
			critX, haveCrit = x, true
		case kindUniform:
			closeSpan()
			haveCrit = false
		default:
			if open && cur.Type == t {
				cur.ToStation = x
			} else {
				closeSpan()
				from := x
				if haveCrit {
					from = critX
				}
				cur, open = ProfileSpan{Type: t, FromStation: from, ToStation: x}, true
			}
			haveCrit = false
		}
	}
	closeSpan()
	return out
}

// sanitize is the last guard of the promise that no NaN or Inf leaves
// Solve: any non-finite number left in a reach result is replaced by 0 and
// recorded as a NoteNoConvergence.
func sanitize(res *ReachResult) {
	bad := false
	fix := func(v *float64) {
		if !numfmt.Finite(*v) {
			*v = 0
			bad = true
		}
	}
	fix(&res.Discharge)
	fix(&res.GateUpstreamDepth)
	for i := range res.Points {
		p := &res.Points[i]
		for _, v := range []*float64{&p.Station, &p.Invert, &p.Depth, &p.WSE, &p.Velocity, &p.Froude,
			&p.Energy, &p.CriticalDepth, &p.NormalDepth, &p.Area, &p.TopWidth, &p.HydraulicRadius,
			&p.FrictionSlope, &p.Alpha} {
			fix(v)
		}
	}
	for i := range res.Jumps {
		j := &res.Jumps[i]
		for _, v := range []*float64{&j.Station, &j.UpstreamDepth, &j.DownstreamDepth, &j.Froude, &j.Length, &j.EnergyLoss} {
			fix(v)
		}
	}
	for i := range res.Structures {
		st := &res.Structures[i]
		for _, v := range []*float64{&st.Station, &st.Coefficient, &st.HeadLoss, &st.UpstreamDepth, &st.DownstreamDepth} {
			fix(v)
		}
	}
	for i := range res.Drops {
		d := &res.Drops[i]
		for _, v := range []*float64{&d.Station, &d.Height, &d.Number, &d.Brink, &d.ToeDepth, &d.PoolDepth, &d.Length, &d.SequentDepth, &d.EnergyLoss} {
			fix(v)
		}
	}
	for i := range res.Profiles {
		fix(&res.Profiles[i].FromStation)
		fix(&res.Profiles[i].ToStation)
	}
	for i := range res.Notes {
		fix(&res.Notes[i].Station)
	}
	if bad {
		res.Notes = append(res.Notes, Note{Kind: NoteNoConvergence, Message: "a computed value was not a finite number and was replaced by 0; treat this reach's results as unreliable"})
	}
}
