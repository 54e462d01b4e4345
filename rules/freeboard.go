package rules

import (
	"math"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var freeboardRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "freeboard",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "minimum", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "the least freeboard"},
			{Name: "fraction", Kind: policies.Number, Quantity: policies.Ratio, Bounds: policies.Within(0, 1),
				Doc: "the freeboard as a share of the flow depth", Must: "a ratio of the flow depth from 0 to 1 (0.2 means 20 %)"},
		},
		Together: []policies.Group{{Settings: []string{"minimum", "fraction"}, Need: policies.AtLeastOne,
			Note: "the larger of minimum and fraction × depth governs"}},
	},
	Title: "Freeboard between the water surface and the top of bank or lining",
	Doc: Doc{
		Checks: `at every computed point of an open section, the
freeboard available between the water surface and the top of bank (or of
the lining) against the freeboard the policy requires. Contiguous failing
points of one reach and section merge into one span; the finding gives the
smallest freeboard of the span and the requirement there.`,
		Formula: `    available = invert + height − WSE        (height: section, invert to top)
    required  = max(minimum, fraction · depth)
    fails where available < required
The bank rise the message asks for is the largest required − available
over the span.

Closed conduits have no freeboard: whether a culvert or pipe flows full is
the capacity rule's concern, so closed sections are not checked here.`,
		Basis: `a fixed minimum plus a share of the depth is common local practice
(no published source for the combination). The USBR guide for lined and
unlined canals, F = √(C·y) with C from 1.5 to 2.5 in feet, grows with the
square root of depth (Chow, Open-Channel Hydraulics, 1959, §7-6, from
memory); a policy can approximate it over its range of depths with a
minimum and a fraction.`,
		Sources: []string{
			"common practice (no published source): a minimum plus a share of the depth",
			"Chow, Open-Channel Hydraulics (1959), §7-6: the USBR freeboard F = √(C·y) (from memory)",
		},
		Remedies: `raise the top of bank or the lining over the span, widen or
deepen the section so the flow runs lower, flatten a steep backwater by
lowering the downstream control, or reduce the design flow with upstream
storage.`,
	},
	Check: checkFreeboard,
}

func checkFreeboard(ctx *Context, report func(Finding)) {
	st := freeboardSettings{minimum: ctx.Config.Number("minimum"), fraction: ctx.Config.Number("fraction")}
	u := ctx.units()
	ctx.scanPointsThen(func(rr *solver.ReachResult, r *run) bool {
		sec := r.sec
		if sec == nil || sec.Closed() || !finiteNum(sec.Height) {
			return true
		}
		// The least freeboard of the run, height − the highest stage,
		// against the largest requirement of the run.
		return belowStage(r, sec.Height-max(st.minimum, st.fraction*r.maxDepth))
	}, lower, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		sec := sectionAt(rr, p)
		if sec == nil || sec.Closed() || !finiteNum(sec.Height) {
			return false
		}
		avail := p.Invert + sec.Height - p.WSE
		if avail < -1e-12*max(1, sec.Height) {
			// The channel overtops here: capacity reports it, once.
			return false
		}
		req := max(st.minimum, st.fraction*p.Depth)
		if avail >= req-1e-12*max(1, req) {
			v.short = req - avail // the margin, for locate
			return false
		}
		*v = verdict{value: avail, limit: req, short: req - avail}
		return true
	}, func(rr *solver.ReachResult, spans []span) []span {
		return overtopEdgeSpans(rr, ctx.screenedRuns(rr), st, spans, &ctx.trial)
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		depth := rr.Points[s.worst].Depth
		if sec, ok := overtopsAtLocatedEnd(rr, s); ok {
			// The span runs up to where the water surface reaches the top
			// of bank: there the freeboard is zero and the depth is the
			// section's height, exactly. The failing trial nearest that
			// station (within locateTol of it) would give a freeboard of a
			// fraction of a millimetre that depends only on where the
			// bracketing stopped, and so on the unit of the model.
			s.value, depth = 0, sec.Height
			s.limit = max(st.minimum, st.fraction*depth)
			s.short = max(s.short, s.limit)
		}
		msg, remedy := freeboardMessage(st, rr, s, depth, u)
		msg += overtopsBeside(rr, s, u)
		f := spanFinding(ev, rr, s, msg, remedy)
		f.Unit = u.Length()
		if sec := sectionAt(rr, &rr.Points[s.worst]); sec != nil {
			f.Focus = sec.At("height") // the attribute a designer raises
		}
		report(f)
	})
}

// overtopsBeside is the related note of a freeboard or superelevation
// span next to a stretch where the channel overtops: capacity reports that
// stretch once, and this span stops where it begins.
func overtopsBeside(rr *solver.ReachResult, s span, u model.Units) string {
	var at []string
	for _, i := range [2]int{s.first - 1, s.last + 1} {
		if i < 0 || i >= len(rr.Points) {
			continue
		}
		p := &rr.Points[i]
		if overtopsAt(sectionAt(rr, p), p) {
			x := s.from
			if i > s.last {
				x = s.to
			}
			at = append(at, numfmt.Num(x))
		}
	}
	if len(at) == 0 {
		return ""
	}
	return "; the channel overtops beyond station " + strings.Join(at, " and ") + " " + u.Length() + " (reported once, by capacity)"
}

// overtopsAtLocatedEnd reports whether an end of span s was located
// (moved off its computed point by locate) toward a neighbouring point
// where the open channel overtops, and the section there: the span then
// ends where the water surface crosses the top of bank.
func overtopsAtLocatedEnd(rr *solver.ReachResult, s span) (*model.Section, bool) {
	for _, end := range [2]struct {
		i     int  // the neighbouring point
		moved bool // the span end lies between the points
	}{{s.first - 1, s.from < rr.Points[s.first].Station}, {s.last + 1, s.to > rr.Points[s.last].Station}} {
		if end.i < 0 || end.i >= len(rr.Points) || !end.moved {
			continue
		}
		p := &rr.Points[end.i]
		if sec := sectionAt(rr, p); overtopsAt(sec, p) {
			return sec, true
		}
	}
	return nil, false
}

// overtopEdgeSpans appends to spans the failing stretches that lie wholly
// between two computed points, one passing and the other where the channel
// overtops (which freeboard leaves to capacity): from the passing point
// the freeboard falls continuously to zero at the top of bank, so it
// crosses the requirement in between, yet no computed point fails and scan
// sees nothing. Whether a computed point falls in that stretch depends
// only on the step sizes (rapid found a reach cut in two at its middle
// whose upper half reported such a stretch, 12.5 m long, that the whole
// reach did not). The span runs from where the freeboard meets the
// requirement to where the water surface reaches the top of bank, each
// bracketed to locateTol by bisection.
//
// runs (nil: none) are the reach's runs (see run): two points of runs in
// which no point overtops (inBank) cannot be such a pair, so only the
// pairs with a point in another run are looked at.
func overtopEdgeSpans(rr *solver.ReachResult, runs []run, st freeboardSettings, spans []span, trial *solver.Point) []span {
	return overtopEdges(rr, runs, math.Inf(-1), math.Inf(1), spans, trial, overtopEdge{
		short: func(p *solver.Point, sec *model.Section) float64 {
			return max(st.minimum, st.fraction*p.Depth) - (p.Invert + sec.Height - p.WSE)
		},
		bank:  func(sec *model.Section) float64 { return max(st.minimum, st.fraction*sec.Height) },
		block: reachBlock,
	})
}

// overtopEdge is what overtopEdges needs of a rule: short, how far a
// point falls short of its requirement (> 0 fails); bank, the requirement
// at the top of bank (nothing to find where it is not above 0); block, the
// block a span answers to.
type overtopEdge struct {
	short func(p *solver.Point, sec *model.Section) float64
	bank  func(sec *model.Section) float64
	block func(rr *solver.ReachResult, p *solver.Point) *model.Src
}

// overtopEdges is overtopEdgeSpans for any rule that leaves an
// overtopped point to capacity and falls short as the water surface
// nears the top of bank (freeboard, the superelevation of a bend), over
// the pairs of points with stations in [from, to].
func overtopEdges(rr *solver.ReachResult, runs []run, from, to float64, spans []span, trial *solver.Point, e overtopEdge) []span {
	pts := rr.Points
	found := len(spans)
	k := 0 // the run of point i; the runs split the points in order
	for i := 0; i+1 < len(pts); i++ {
		for k < len(runs) && runs[k].last < i {
			k++
		}
		if k < len(runs) && inBank(&runs[k]) {
			if i < runs[k].last {
				i = runs[k].last - 1 // the pairs inside the run: on to its last point
				continue
			}
			if k+1 < len(runs) && inBank(&runs[k+1]) {
				continue
			}
		}
		a, b := &pts[i], &pts[i+1]
		if a.Station < from || b.Station > to {
			continue
		}
		sec := sectionAt(rr, a)
		if sec == nil || sec.Closed() || sec != sectionAt(rr, b) || !finiteNum(sec.Height) || !(b.Station > a.Station) {
			continue
		}
		oa, ob := overtopsAt(sec, a), overtopsAt(sec, b)
		if oa == ob {
			continue
		}
		o := i // the passing point
		if oa {
			o = i + 1
		}
		q := &pts[o]
		if covered(spans[:found], o) || !usable(q) {
			continue // a span reaches the passing point: locate moved its end
		}
		req := e.bank(sec)
		if e.short(q, sec) > 0 || !(req > 0) {
			continue // q fails (it would be in a span), or nothing is required at the bank
		}
		// top: the station where the water surface reaches the top of bank.
		dry, wet := q.Station, pts[i+1-(o-i)].Station
		for n := 0; n < locateMaxIter && math.Abs(wet-dry) > locateTol(dry); n++ {
			x := dry + (wet-dry)/2
			p, _, ok := rr.Between(i, x)
			if !ok {
				break
			}
			if overtopsAt(sec, &p) {
				wet = x
			} else {
				dry = x
			}
		}
		top := dry
		// meet: where the point meets the requirement, between q and top.
		pass, fail := q.Station, top
		for n := 0; n < locateMaxIter && math.Abs(fail-pass) > locateTol(pass); n++ {
			x := pass + (fail-pass)/2
			p, _, ok := rr.Between(i, x)
			if !ok {
				break
			}
			if e.short(&p, sec) > 0 {
				fail = x
			} else {
				pass = x
			}
		}
		*trial = *q
		trial.Station = top
		spans = append(spans, span{first: o, last: o, worst: o, from: min(pass, top), to: max(pass, top),
			value: 0, limit: req, short: req, block: e.block(rr, trial)})
	}
	return spans
}

// overtopsAt reports whether the water surface at p is above the top of
// the open section sec.
func overtopsAt(sec *model.Section, p *solver.Point) bool {
	return sec != nil && !sec.Closed() && p.WSE > p.Invert+sec.Height+1e-12*max(1, sec.Height)
}

// freeboardSettings are the freeboard block's settings, read once per check.
type freeboardSettings struct{ minimum, fraction float64 }

// freeboardMessage words a freeboard span whose requirement is set by the
// flow depth given (that of the worst point).
func freeboardMessage(cfg freeboardSettings, rr *solver.ReachResult, s span, depth float64, u model.Units) (msg, remedy string) {
	lu := u.Length()
	p := &rr.Points[s.worst]
	val, lim := numfmt.Pair(s.value, s.limit)
	basis := ""
	if cfg.fraction*depth > cfg.minimum {
		basis = " (" + numfmt.Num(cfg.fraction) + " × depth " + numfmt.Num(depth) + " " + lu + ")"
	}
	msg = "freeboard " + val + " " + lu + " is below the required " + lim + " " + lu + basis
	if s.value < 0 {
		msg = "the channel overtops here: the water surface is " + numfmt.Num(-s.value) + " " + lu +
			" above the top of bank; required freeboard " + lim + " " + lu + basis
	}
	rise := practicalUp(s.short, heightStep, u)
	if sec := sectionAt(rr, p); sec != nil && sec.Shape == model.Points {
		return msg, "raise the bank or levee by at least " + rise + " " + lu + " over this span (or lower the water surface: " +
			"a wider floodplain, a lower downstream control, upstream storage)"
	}
	return msg, "raise the top of bank by at least " + rise + " " + lu + " over this span"
}
