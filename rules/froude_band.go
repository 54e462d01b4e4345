package rules

import (
	"math"
	"sort"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var froudeBandRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "froude_band",
		Severity: policies.Warning,
		Settings: []policies.Setting{
			{Name: "avoid", Kind: policies.FroudeBands, Quantity: policies.Froude, Bounds: policies.AtLeast(0),
				Required: true, Doc: "the bands of Froude number to flag"},
			{Name: "control_buffer", Kind: policies.Number, Quantity: policies.Coefficient, Bounds: policies.AtLeast(0),
				Default: defaultControlBuffer,
				Doc:     "the stretch next to a critical-depth control the solver imposed that is not checked, in critical depths"},
		},
	},
	Title: "Froude number inside a band the policy avoids (unstable near-critical flow)",
	Doc: Doc{
		Checks: `at every computed point, the Froude number against the
bands the policy avoids. Near critical flow a small change of energy gives
a large change of depth: the surface is wavy and unstable, and the depth
the design relies on is uncertain. Contiguous failing points of one reach
and section merge into one span; the finding gives the Froude number
deepest inside the band and the band edge nearest to it.`,
		Formula: `    F = V / √(g · A / T)   (the solver's F at the point)
    fails where low ≤ F ≤ high for some avoided band [low, high]
    not checked within control_buffer × yc of a critical-depth control

A critical-depth control the solver imposes (a free outfall or brink, a
reach that ends in a free fall at a junction, the head of a steep reach, a
change of section that chokes the flow) passes the flow through F = 1 by
construction, so the profile next to it always crosses the band: that
stretch is the control's, not a design choice, and reporting it would be
noise. Points within control_buffer critical depths (yc of the control
point, default 10) of such a control are not checked, measured along the
channel and through a node into the next reach where the water level
carries on unchanged; the output's "not evaluated" statement counts them. A near-critical stretch that reaches
beyond the buffer (a slope close to critical, say) is reported from where
the buffer ends. Set control_buffer = 0 to check every point.`,
		Basis: `avoiding a band of Froude numbers around 1 (roughly 0.86–1.13)
is common practice in channel design, because the surface is wavy and the
depth uncertain there; the band is usually cited to the flood-control
channel guidance of the U.S. Army Corps of Engineers, EM 1110-2-1601
(from memory: the page is not confirmed, and an attribution of the band to
FHWA HEC-11 could not be confirmed either). Many local manuals avoid a
wider band (0.7–1.3, say), so the band is a policy setting.`,
		Sources: []string{
			"common practice (no published source confirmed)",
			"U.S. Army Corps of Engineers, Hydraulic Design of Flood Control Channels, EM 1110-2-1601 (from memory)",
		},
		Remedies: `change the slope or the section so that the design flow is
clearly subcritical or clearly supercritical; where the transition cannot
be avoided, add freeboard for the surface waves over the span.`,
	},
	Check: checkFroudeBand,
}

// bandOf returns the first avoided band that contains x.
func bandOf(bands []policies.Band, x float64) (policies.Band, bool) {
	for _, b := range bands {
		if b.Contains(x) {
			return b, true
		}
	}
	return policies.Band{}, false
}

// outside is how far x lies from the nearest avoided band.
func outside(bands []policies.Band, x float64) float64 {
	d := math.Inf(1)
	for _, b := range bands {
		d = min(d, max(b.Low-x, x-b.High))
	}
	return d
}

// nearestEdge is the edge of b nearest to x and how far inside b x lies.
func nearestEdge(b policies.Band, x float64) (edge, depth float64) {
	if x-b.Low <= b.High-x {
		return b.Low, x - b.Low
	}
	return b.High, b.High - x
}

// defaultControlBuffer is the stretch next to a critical-depth control not
// checked by froude_band, in critical depths: on a mild slope the M2
// drawdown to a brink crosses F = 0.86 about 1.5·ε²·yc/(Sc − S0) upstream
// of it (ε = 0.106 the relative depth above yc there), a few critical
// depths unless the slope is near critical. Source: common practice (no
// published source).
const defaultControlBuffer = 10

// controls are the critical-depth controls of a reach result that the
// solver imposed: points at critical depth (regime critical) at a reach
// end or at a change of section (two points at one station). near reports
// whether station x lies within buffer critical depths of one.
//
// With the event result set (forEvent), the controls of the reaches above
// and below whose profile carries on through the node without a break (the
// same water level on both sides: no fall, jump or drop) count too, at
// their stations measured along the channel: a buffer does not end at a
// node the flow passes unchanged, or cutting a reach in two would report
// a stretch next to a control that the whole reach leaves unchecked. The
// first own of them are the reach's own.
type controls struct {
	ev  *solver.EventResult
	rr  *solver.ReachResult
	at  []float64 // stations
	len []float64 // buffer lengths
	own int
}

// forEvent sets the event result whose reaches the controls of the next
// reach are looked up in.
func (c *controls) forEvent(ev *solver.EventResult) {
	if c.ev != ev {
		c.ev, c.rr = ev, nil
	}
}

// maxNodeHops bounds the walk through nodes for neighbouring controls.
const maxNodeHops = 16

func (c *controls) near(rr *solver.ReachResult, x, buffer float64) bool {
	if buffer <= 0 {
		return false
	}
	if c.rr != rr {
		c.rr, c.at, c.len = rr, c.at[:0], c.len[:0]
		c.add(rr, 0, buffer)
		c.own = len(c.at)
		c.neighbours(rr, buffer)
	}
	for i, s := range c.at {
		if math.Abs(x-s) <= c.len[i] {
			return true
		}
	}
	return false
}

// add appends the controls of rr, their stations shifted by offset.
func (c *controls) add(rr *solver.ReachResult, offset, buffer float64) {
	pts := rr.Points
	for i := range pts {
		p := &pts[i]
		if p.Regime != solver.Critical || !(p.CriticalDepth > 0) {
			continue
		}
		end := (i == 0 || i == len(pts)-1) && !c.criticalThrough(rr, i)
		change := (i > 0 && pts[i-1].Station == p.Station) || (i+1 < len(pts) && pts[i+1].Station == p.Station)
		if end || change {
			x := p.Station + offset
			if offset != 0 && c.has(x) {
				// The same control seen from both sides of a node (a
				// mild-to-steep break is critical at the end of one reach
				// and the start of the next): two controls at one station
				// would each hide the other's buffer edge from
				// bufferEdgeSpans.
				continue
			}
			c.at = append(c.at, x)
			c.len = append(c.len, buffer*p.CriticalDepth)
		}
	}
}

// has reports whether a control is already recorded at station x.
func (c *controls) has(x float64) bool {
	for _, s := range c.at {
		if math.Abs(s-x) <= 1e-9*max(1, math.Abs(x)) {
			return true
		}
	}
	return false
}

// neighbours adds the controls of the reaches the profile of rr runs on
// into, upstream and downstream, as far as a buffer could reach.
func (c *controls) neighbours(rr *solver.ReachResult, buffer float64) {
	if c.ev == nil || len(rr.Points) == 0 {
		return
	}
	// Upstream: a single reach above whose end meets rr's start level.
	cur, offset := rr, 0.0
	for hop := 0; hop < maxNodeHops; hop++ {
		if len(cur.Reach.Upstream) != 1 {
			break
		}
		up := c.resultOf(cur.Reach.Upstream[0])
		if up == nil || len(up.Points) == 0 || !sameLevel(up.Points[len(up.Points)-1], cur.Points[0]) {
			break
		}
		offset -= up.Reach.Length
		c.add(up, offset, buffer)
		if -offset > buffer*maxCritical(up) {
			break
		}
		cur = up
	}
	// Downstream: the reach below, when rr is its only inflow.
	cur, offset = rr, 0.0
	for hop := 0; hop < maxNodeHops; hop++ {
		dn := cur.Reach.Downstream
		if dn == nil || len(dn.Upstream) != 1 {
			break
		}
		down := c.resultOf(dn)
		if down == nil || len(down.Points) == 0 || !sameLevel(cur.Points[len(cur.Points)-1], down.Points[0]) {
			break
		}
		offset += cur.Reach.Length
		c.add(down, offset, buffer)
		// The next reach starts at offset + its length, that far beyond
		// the end of rr (stations of rr run to its length): a short
		// reach between rr and a control does not end the walk.
		if offset+down.Reach.Length-rr.Reach.Length > buffer*maxCritical(down) {
			break
		}
		cur = down
	}
}

// criticalThrough reports whether the end point i (the first or the last)
// of rr lies at a node the flow passes at critical depth without a control:
// the water level carries on into the one reach beyond and both reaches
// are on a critical slope (normal depth at critical depth: uniform flow
// at F ≈ 1, whose computed points the solver labels critical or
// supercritical by a hair). The same flow in one reach has no control at
// that station, so neither has it cut in two. A break from a mild to a
// steep slope, where the flow turns critical at the node, stays a control.
func (c *controls) criticalThrough(rr *solver.ReachResult, i int) bool {
	pts := rr.Points
	if c.ev == nil || len(pts) == 0 || rr.SlopeClass != solver.CriticalSl {
		return false
	}
	var other *solver.ReachResult
	var near solver.Point // the other's point at the node
	if i == 0 {
		if len(rr.Reach.Upstream) != 1 {
			return false
		}
		if other = c.resultOf(rr.Reach.Upstream[0]); other == nil || len(other.Points) == 0 {
			return false
		}
		near = other.Points[len(other.Points)-1]
	} else {
		dn := rr.Reach.Downstream
		if dn == nil || len(dn.Upstream) != 1 {
			return false
		}
		if other = c.resultOf(dn); other == nil || len(other.Points) == 0 {
			return false
		}
		near = other.Points[0]
	}
	return other.SlopeClass == solver.CriticalSl && sameLevel(pts[i], near)
}

// resultOf is the event's result for reach r.
func (c *controls) resultOf(r *model.Reach) *solver.ReachResult {
	if r == nil || r.Index < 0 || r.Index >= len(c.ev.Reaches) {
		return nil
	}
	if rr := c.ev.Reaches[r.Index]; rr != nil && rr.Reach == r {
		return rr
	}
	return nil
}

// sameLevel: the water level carries on through a node (within the
// solver's closure, far below any fall or drop).
func sameLevel(a, b solver.Point) bool {
	return math.Abs(a.WSE-b.WSE) <= 1e-6*max(1, a.Depth, b.Depth)
}

// maxCritical is the largest critical depth of a reach result.
func maxCritical(rr *solver.ReachResult) float64 {
	m := 0.0
	for i := range rr.Points {
		m = max(m, rr.Points[i].CriticalDepth)
	}
	return m
}

// bufferEdgeSpans appends to spans the failing stretches that end at the
// edge of a control's buffer without a failing computed point between the
// edge and the crossing of the band: the band is crossed between the last
// computed point outside the buffer (which passes) and the edge, and the
// next computed point lies inside the buffer, unchecked. scan sees no
// failing point there, yet the stretch up to the edge fails, and whether a
// computed point happens to fall in it (a few centimetres, say) depends
// on the step sizes, hence on the model's unit. inBand judges a point
// without the buffer; the span runs from the crossing, bracketed to
// locateTol by bisection, to the edge.
func bufferEdgeSpans(rr *solver.ReachResult, ctrl *controls, buffer float64, inBand judgeFunc,
	inSpan func(i int) bool, v *verdict, spans []span) []span {
	if buffer <= 0 {
		return spans
	}
	ctrl.near(rr, math.NaN(), buffer) // fills ctrl.at and ctrl.len for rr
	pts := rr.Points
	// Every control's edge is looked at, a neighbour's too: its buffer
	// may end inside this reach.
	inOther := func(k int, x float64) bool {
		for k2, c := range ctrl.at {
			if k2 != k && math.Abs(x-c) <= ctrl.len[k2] {
				return true
			}
		}
		return false
	}
	for k, c := range ctrl.at {
		for _, e := range [2]float64{c - ctrl.len[k], c + ctrl.len[k]} {
			if inOther(k, e) {
				continue // the edge lies in another control's buffer
			}
			// The computed points i, i+1 on either side of the edge; o is
			// the one outside the buffer.
			i := sort.Search(len(pts), func(j int) bool { return pts[j].Station > e }) - 1
			if i < 0 || i+1 >= len(pts) || !(pts[i].Station < e) {
				continue
			}
			o := i
			if e > c {
				o = i + 1
			}
			if inSpan(o) || ctrl.near(rr, pts[o].Station, buffer) || !usable(&pts[o]) {
				continue // a span scan found reaches the edge already (locate moves its end there)
			}
			p, _, ok := rr.Between(i, e)
			if !ok || !inBand(rr, &p, v) {
				continue
			}
			s := span{first: o, last: o, worst: o, value: v.value, limit: v.limit, short: v.short,
				block: reachBlock(rr, &p)}
			pass, fail := pts[o].Station, e
			for n := 0; n < locateMaxIter && math.Abs(fail-pass) > locateTol(pass); n++ {
				x := pass + (fail-pass)/2
				q, _, ok := rr.Between(i, x)
				if !ok {
					break
				}
				if inBand(rr, &q, v) {
					fail = x
					s.absorb(nil, *v)
				} else {
					pass = x
				}
			}
			s.from, s.to = min(pass, e), max(pass, e)
			spans = append(spans, s)
		}
	}
	return spans
}

func checkFroudeBand(ctx *Context, report func(Finding)) {
	avoid := ctx.Config.Bands("avoid")
	buffer := ctx.Config.Number("control_buffer")
	var ctrl controls
	inBand := func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		if p.Depth <= 0 {
			return false
		}
		b, in := bandOf(avoid, p.Froude)
		if !in {
			v.short = -outside(avoid, p.Froude) // the margin, for locate
			return false
		}
		edge, depth := nearestEdge(b, p.Froude)
		*v = verdict{value: p.Froude, limit: edge, short: depth}
		return true
	}
	judge := func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		return !ctrl.near(rr, p.Station, buffer) && inBand(rr, p, v)
	}
	// A run whose Froude numbers all lie clear of every band passes.
	screen := func(rr *solver.ReachResult, r *run) bool {
		for _, b := range avoid {
			if !below(r.maxFroude, b.Low) && !above(r.minFroude, b.High) {
				return false
			}
		}
		return true
	}
	emit := func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		b, _ := bandOf(avoid, s.value)
		lo, hi := numfmt.Pair(b.Low, b.High)
		side := "below " + lo + " or above " + hi
		if b.Low <= 0 {
			side = "above " + hi
		} else if math.IsInf(b.High, 1) {
			side = "below " + lo
		}
		msg := "Froude number " + numfmt.Num(s.value) + " lies in the avoided band " + lo + "–" + hi
		f := spanFinding(ev, rr, s, msg, "near-critical flow is unstable, with a wavy surface and uncertain depth: "+
			"change the slope or section so that the flow stays "+side+", or add freeboard for surface waves")
		f.Focus = s.block.At("slope") // the grade sets the Froude number
		report(f)
	}
	ctx.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		ctrl.forEvent(ev)
		spans := scan(rr, ctx.runsOf(rr), ctx.screened(screen), nil, judge, reachBlock, &ctx.verdict, ctx.spans[:0])
		locate(rr, nil, judge, reachBlock, &ctx.verdict, &ctx.trial, spans)
		found := len(spans)
		inSpan := func(i int) bool { return covered(spans[:found], i) }
		spans = bufferEdgeSpans(rr, &ctrl, buffer, inBand, inSpan, &ctx.verdict, spans)
		if len(spans) > 1 { // most reaches have none: no sort, and no closure for it
			sort.SliceStable(spans, func(a, b int) bool { return spans[a].from < spans[b].from })
		}
		ctx.spans = spans
		for _, s := range spans {
			emit(ev, rr, s)
		}
	})
}
