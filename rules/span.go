package rules

import (
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
)

// reachBlock is the block that sets the section in force at a computed
// point: the segment covering its station, else the reach itself. A
// finding is placed at the block a designer edits to fix it: a failing span
// of a rule that depends on the section (freeboard, velocity, stress) on a
// segment leads to the segment, not the reach header.
func reachBlock(rr *solver.ReachResult, p *solver.Point) *model.Src {
	r := rr.Reach
	for _, s := range r.Segments {
		// At a boundary the solver may compute two points at one station,
		// one in each section: the point's own section decides.
		if p.Station >= s.FromStation && p.Station <= s.ToStation && (p.Section == nil || p.Section == s.Section) {
			return &s.Src
		}
	}
	return &r.Src
}

// sectionAt is the section of a computed point: the one the solver
// recorded, else the one the model puts at its station.
func sectionAt(rr *solver.ReachResult, p *solver.Point) *model.Section {
	if p.Section != nil {
		return p.Section
	}
	if rr.Reach == nil {
		return nil
	}
	return rr.Reach.SectionAt(p.Station)
}

// usable reports whether a computed point carries finite numbers in every
// field the rules read. The solver promises finite output; the solver rule
// reports a point that breaks the promise, and the other rules skip any
// point whose judged figures are not finite (see scan).
func usable(p *solver.Point) bool {
	// finite's test written out: the rules call this for every point, and
	// the spelled-out sum costs a fraction of the variadic loop.
	z := p.Station*0 + p.Invert*0 + p.Depth*0 + p.WSE*0 + p.Velocity*0 + p.Froude*0 +
		p.Energy*0 + p.Area*0 + p.TopWidth*0 + p.HydraulicRadius*0 + p.FrictionSlope*0
	return z == 0
}

// finiteNum is finite of one number, for the per-point paths.
func finiteNum(x float64) bool { return x*0 == 0 }

// verdict is what a rule reports about a failing computed point. A judge
// (see scan) returns false for a point that passes or is not checked there
// (no applicable limit, outside the zone), and fills a verdict and returns
// true for a point that fails: passing points, the great majority, cost a
// comparison and nothing more.
type verdict struct {
	kind  int     // rule-specific kind of failure; a change of kind ends a span
	value float64 // the measured quantity
	limit float64 // the limit it is held to at this point
	// short is how far the point misses its limit, in the units of value
	// (positive when failing); the span keeps the largest, which sizes the
	// remedy ("raise the bank by at least ...").
	short float64
	// aux is a rule-specific figure the span keeps the largest of
	// (superelevation: the bend radius that would pass).
	aux float64
}

// judgeFunc judges one computed point: false when it passes or is not
// checked, else true with the verdict filled in.
type judgeFunc func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool

// span is a run of contiguous failing points of one reach and event with
// the same responsible block and kind.
type span struct {
	first, last int     // point indices
	from, to    float64 // stations
	worst       int     // index of the worst point
	value       float64 // at the worst point
	limit       float64 // at the worst point
	short       float64 // the largest over the span
	aux         float64 // the largest over the span
	kind        int
	block       *model.Src // the responsible block
}

// worse orders measured values: worse(a, b) reports whether a is further
// past the limit than b. Nil means "the larger shortfall is worse".
type worse func(a, b float64) bool

func higher(a, b float64) bool { return a > b }
func lower(a, b float64) bool  { return a < b }

// scan walks the points of a reach result in station order, asks judge
// about each and merges contiguous failing points into spans. A point whose
// station, or whose judged figures, are not finite numbers is skipped
// without ending a span (the solver rule reports such points); checking
// the figures a rule computed, rather than every field of the point, keeps
// the per-point cost to what the rule reads.
//
// v is scratch space for the judge's verdict: a judge is an unknown
// function, so the verdict it fills lives on the heap; callers pass one
// they own (Context keeps one per rule run) rather than allocate per walk.
// The spans are appended to out, which callers pass empty to reuse its
// array from one reach to the next.
func scan(rr *solver.ReachResult, w worse, judge judgeFunc,
	at func(rr *solver.ReachResult, p *solver.Point) *model.Src, v *verdict, out []span) []span {
	var cur *span
	for i := range rr.Points {
		p := &rr.Points[i]
		if !finiteNum(p.Station) {
			continue
		}
		if !judge(rr, p, v) {
			cur = nil
			continue
		}
		// A figure that overflows (or a limit that is not finite) cannot be
		// reported honestly: the point is left unchecked.
		if v.value*0+v.limit*0+v.short*0+v.aux*0 != 0 { // finite, spelled out
			continue
		}
		blk := at(rr, p) // asked of failing points only
		if cur != nil && (cur.block != blk || cur.kind != v.kind) {
			cur = nil
		}
		if cur == nil {
			out = append(out, span{first: i, from: p.Station, worst: i, value: v.value,
				limit: v.limit, short: v.short, aux: v.aux, kind: v.kind, block: blk})
			cur = &out[len(out)-1]
		}
		cur.last, cur.to = i, p.Station
		if (w != nil && w(v.value, cur.value)) || (w == nil && v.short > cur.short) {
			cur.worst, cur.value, cur.limit = i, v.value, v.limit
		}
		cur.short = max(cur.short, v.short)
		cur.aux = max(cur.aux, v.aux)
	}
	return out
}

// spanFinding is the finding of a span, without rule, severity and the
// fields Check fills in.
// The finding points at the block of the span; rules that know the
// attribute that matters set Range to it afterwards.
func spanFinding(ev *solver.EventResult, rr *solver.ReachResult, s span, msg, remedy string) Finding {
	return Finding{
		Message:     msg,
		Remedy:      remedy,
		Range:       s.block.DefRange,
		Reach:       rr.Reach.Name,
		Event:       ev.Event.Name,
		FromStation: s.from,
		ToStation:   s.to,
		HasSpan:     true,
		Value:       s.value,
		Limit:       s.limit,
		HasValue:    true,
	}
}
