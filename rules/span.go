package rules

import (
	"math"

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
// checked, else true with the verdict filled in. A judge that holds a
// passing point to a limit also sets v.short to the (negative) shortfall
// there: locate uses it to find where the limit is crossed between points
// in a few steps rather than by halving.
type judgeFunc func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool

// screenFunc reports whether no computed point of a run can fail the
// rule's judge, from the run's extremes (see run): true passes the run
// unjudged, false has its points judged one by one. A screen must never
// pass a run holding a point the judge fails; when in doubt it says false.
type screenFunc func(rr *solver.ReachResult, r *run) bool

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

// covered reports whether computed point i lies in one of the spans.
func covered(spans []span, i int) bool {
	for _, s := range spans {
		if i >= s.first && i <= s.last {
			return true
		}
	}
	return false
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
// With runs (see run) and a screen, a run the screen passes is passed
// whole, as though the judge had passed each of its points: a screen
// reports true only where the run's extremes show that no point of it can
// fail. Without them every point is judged.
//
// v is scratch space for the judge's verdict: a judge is an unknown
// function, so the verdict it fills lives on the heap; callers pass one
// they own (Context keeps one per rule run) rather than allocate per walk.
// The spans are appended to out, which callers pass empty to reuse its
// array from one reach to the next.
func scan(rr *solver.ReachResult, runs []run, screen screenFunc, w worse, judge judgeFunc,
	at func(rr *solver.ReachResult, p *solver.Point) *model.Src, v *verdict, out []span) []span {
	var cur *span
	pts := rr.Points
	if screen == nil {
		runs = nil
	}
	k := 0 // the next run; the runs split the points in order (pointRuns)
	for i := 0; i < len(pts); {
		end := len(pts) // the end of the stretch judged point by point
		if k < len(runs) {
			r := &runs[k]
			k++
			end = r.last + 1
			if r.usable && screen(rr, r) {
				cur = nil // its points pass (they have finite stations: usable), which ends a span
				i = end
				continue
			}
		}
		for ; i < end; i++ {
			p := &pts[i]
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
	}
	return out
}

// locateTol is how closely locate brackets a span end, in the model's
// length unit: the tolerance by which an exception may be exceeded
// (exceptionTolerance, a millimetre or a thousandth of a foot), far inside
// the 0.5 m or 0.1 % of the reach length a span end must be found to, so
// that the error of a located end is that of the solved profile, not of
// the search, and an exception drawn at the crossing covers the span.
func locateTol(station float64) float64 { return exceptionTolerance(station) }

// locateMaxIter bounds the bisection of one span end (2⁶⁰ halvings reach
// below any tolerance from any reach length).
const locateMaxIter = 60

// locate moves each span end from the computed point where the failure is
// first (or last) seen to where the criterion is crossed between that
// point and its passing neighbour. Computed points can lie hundreds of
// metres apart on a long backwater, and the failure begins somewhere in
// between: a span reported point to point would sit inside the stretch
// that really fails.
//
// The flow at a trial station x is computed again from the solved profile
// by the solver's standard step (solver.ReachResult.Between), and judge is
// asked about it; the station where the verdict changes is bracketed to
// within locateTol (see crossing: two to four trials per end). The reported
// end is the passing side of the final bracket, so the span covers every
// station judged failing. An
// end at a reach end, at a change of section or at a jump (two points at
// one station), or whose neighbour is not in the same section, stays at
// its point; so does every end of a result that was not produced by the
// solver (Between reports nothing to compute).
//
// v and trial are scratch space for the judge (see scan): the trial point is
// handed to an unknown function, so it lives with the caller, not on the
// heap of every trial.
func locate(rr *solver.ReachResult, w worse, judge judgeFunc,
	at func(rr *solver.ReachResult, p *solver.Point) *model.Src, v *verdict, trial *solver.Point, spans []span) {
	if len(spans) == 0 {
		return
	}
	for k := range spans {
		s := &spans[k]
		if s.first > 0 {
			if x, worst, ok := crossing(rr, judge, at, v, trial, s.block, s.kind, s.first-1, false); ok {
				s.from = x
				s.absorb(w, worst)
			}
		}
		if s.last+1 < len(rr.Points) {
			if x, worst, ok := crossing(rr, judge, at, v, trial, s.block, s.kind, s.last, true); ok {
				s.to = x
				s.absorb(w, worst)
			}
		}
	}
}

// absorb takes the verdict of a failing trial station into the span's
// worst value when it is worse than every computed point's: a span that
// ends where checking stops rather than where the limit is met (at the
// buffer next to a control, say) is worst at its end, between points.
func (s *span) absorb(w worse, t verdict) {
	if !(t.short > 0) {
		return
	}
	if (w != nil && w(t.value, s.value)) || (w == nil && t.short > s.short) {
		s.value, s.limit = t.value, t.limit
	}
	s.short = max(s.short, t.short)
	s.aux = max(s.aux, t.aux)
}

// crossing brackets the station between points i and i+1 where the
// verdict changes: point i passes and i+1 fails (failFirst false), or the
// reverse. It returns the passing side of the final bracket and the
// verdict of the failing trial nearest to it (short 0 when no trial
// failed).
//
// Each trial goes where the parabola through three samples of the signed
// shortfall (v.short, positive failing) crosses zero (inverse quadratic
// interpolation on the true shortfalls): the bracket's ends and, first,
// the computed point beyond them in the same section, later the end the
// last trial replaced. On a smooth profile that lands within a fraction of
// a millimetre. Where the parabola gives nothing inside the bracket, the
// trial goes by false position with the Illinois modification (the retained end's value
// halved when one end is kept twice in a row). Each trial aims a little past the estimate,
// toward the end the previous trial did not move, so that an accurate
// estimate closes the bracket with the next trial: two or three trials an
// end on the demo, four or five before the parabola. A trial whose verdict gives no usable shortfall (a point not
// checked, a change of kind) is placed by halving instead. Either way the
// bracket always holds the change of verdict.
func crossing(rr *solver.ReachResult, judge judgeFunc,
	at func(rr *solver.ReachResult, p *solver.Point) *model.Src, v *verdict, trial *solver.Point, blk *model.Src, kind, i int, failFirst bool) (float64, verdict, bool) {
	var worst verdict
	a, b := rr.Points[i].Station, rr.Points[i+1].Station
	if !(b > a) || !finiteNum(a) || !finiteNum(b) {
		return 0, worst, false
	}
	pass, fail := a, b
	if failFirst {
		pass, fail = b, a
	}
	// The shortfalls at the two ends, from the computed points themselves
	// (NaN where the judge gives none).
	mPass, mFail := shortfall(rr, judge, v, i), shortfall(rr, judge, v, i+1)
	if failFirst {
		mPass, mFail = mFail, mPass
	}
	if !(mPass <= 0) {
		mPass = math.NaN()
	}
	if !(mFail > 0) {
		mFail = math.NaN()
	}
	side := 0 // which end the last two trials kept: +1 pass moved, −1 fail moved
	// The true shortfalls at the ends (mPass and mFail carry the Illinois
	// halving), and the end the last trial replaced, for the parabola.
	tPass, tFail := mPass, mFail
	hx, hm := neighbour(rr, judge, v, i)
	for n := 0; n < locateMaxIter && math.Abs(fail-pass) > locateTol(pass); n++ {
		x := pass + (fail-pass)/2
		if mPass < 0 && mFail > 0 {
			x = pass + (fail-pass)*(-mPass)/(mFail-mPass)
			if q, ok := inverseQuadratic(pass, tPass, fail, tFail, hx, hm); ok {
				x = q
			}
			// Aim a little past the estimate, toward the end the last trial
			// did not move: a good estimate then moves that end too, and
			// the bracket closes with the next trial.
			d := 0.4 * locateTol(pass)
			if side == +1 {
				x += math.Copysign(d, fail-pass)
			} else {
				x -= math.Copysign(d, fail-pass)
			}
			// Keep the trial off the ends so the bracket always shrinks.
			lo, hi := min(pass, fail), max(pass, fail)
			x = min(max(x, lo+d/2), hi-d/2)
		}
		p, _, ok := rr.Between(i, x)
		if !ok {
			if n == 0 {
				return 0, worst, false
			}
			break
		}
		*trial = p
		v.short = math.NaN()
		v.kind = 0
		failing := judge(rr, trial, v) && v.value*0+v.limit*0+v.short*0+v.aux*0 == 0 && at(rr, trial) == blk && v.kind == kind
		m := v.short
		if failing {
			worst = *v
			if !(m > 0) {
				m = math.NaN()
			}
			hx, hm = fail, tFail
			fail, mFail, tFail = x, m, m
			if side == -1 && mPass < 0 {
				mPass /= 2
			}
			side = -1
		} else {
			if !(m <= 0) {
				m = math.NaN()
			}
			hx, hm = pass, tPass
			pass, mPass, tPass = x, m, m
			if side == +1 && mFail > 0 {
				mFail /= 2
			}
			side = +1
		}
	}
	return pass, worst, true
}

// inverseQuadratic is the root of the parabola x(m) through three samples
// (x, m) of the shortfall, (a, ma) and (b, mb) the ends of a bracket: true
// only when the samples are numbers with distinct shortfalls and the root
// lies strictly inside the bracket.
func inverseQuadratic(a, ma, b, mb, c, mc float64) (float64, bool) {
	if !finiteNum(a) || !finiteNum(b) || !finiteNum(c) || ma == mb || ma == mc || mb == mc ||
		!finiteNum(ma) || !finiteNum(mb) || !finiteNum(mc) {
		return 0, false
	}
	x := a*mb*mc/((ma-mb)*(ma-mc)) + b*ma*mc/((mb-ma)*(mb-mc)) + c*ma*mb/((mc-ma)*(mc-mb))
	if !(x > min(a, b) && x < max(a, b)) {
		return 0, false
	}
	return x, true
}

// neighbour is the station and shortfall of the computed point next to
// the pair i, i+1 (the nearer of i−1 and i+2) when it lies in their
// section: the third sample of the first parabola of crossing (NaN where
// there is none).
func neighbour(rr *solver.ReachResult, judge judgeFunc, v *verdict, i int) (float64, float64) {
	pts := rr.Points
	k := -1
	if i > 0 && pts[i-1].Section == pts[i].Section {
		k = i - 1
	}
	if j := i + 2; j < len(pts) && pts[j].Section == pts[i].Section &&
		(k < 0 || pts[j].Station-pts[i+1].Station < pts[i].Station-pts[k].Station) {
		k = j
	}
	if k < 0 || !(pts[k].Station != pts[i].Station && pts[k].Station != pts[i+1].Station) {
		return math.NaN(), math.NaN()
	}
	return pts[k].Station, shortfall(rr, judge, v, k)
}

// shortfall is the judge's signed shortfall at computed point i (NaN
// where it gives none).
func shortfall(rr *solver.ReachResult, judge judgeFunc, v *verdict, i int) float64 {
	v.short = math.NaN()
	judge(rr, &rr.Points[i], v)
	return v.short
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
