package rules

import (
	"fmt"
	"math"
	"sort"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// Default superelevation coefficients when a policy leaves them unset
// (zero): 0.5 for tranquil flow, 1.0 for rapid flow in a simple curve.
// Source: U.S. Army Corps of Engineers, EM 1110-2-1601 (from memory).
const (
	defaultSubcriticalC   = 0.5
	defaultSupercriticalC = 1.0
)

var superelevationRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "superelevation",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "subcritical_coefficient", Kind: policies.Number, Quantity: policies.Coefficient, Bounds: policies.Above(0),
				Default: defaultSubcriticalC, Doc: "C for subcritical flow (F < 1)"},
			{Name: "supercritical_coefficient", Kind: policies.Number, Quantity: policies.Coefficient, Bounds: policies.Above(0),
				Default: defaultSupercriticalC, Doc: "C for supercritical flow"},
			{Name: "minimum", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "the freeboard that must remain at the outer bank"},
		},
	},
	Title: "Freeboard at the outer bank of a bend after superelevation",
	Doc: Doc{
		Checks: `in every bend block, the water surface rises towards
the outer bank; at each computed point inside the bend the rise is added
to the water surface and the freeboard that remains at the outer bank must
be at least the policy's minimum. The finding is at the bend.`,
		Formula: `    Δy = C · V² · T / (g · rc)
    remaining = invert + height − (WSE + Δy);  fails where remaining < minimum
V mean velocity, T top width, rc the bend's centreline radius, g gravity;
C = subcritical_coefficient for subcritical flow (F < 1), else
supercritical_coefficient; flow within 1e-4 of F = 1 counts as critical
(as the solver classifies it), so it takes the supercritical coefficient. Unset coefficients default to 0.5 and 1.0.
The message gives the rise, the bank rise needed (minimum − remaining at
its largest) and the radius that would pass, where one exists.
Closed conduits are not checked (their crown is the capacity rule's
concern).`,
		Basis: `U.S. Army Corps of Engineers, Hydraulic Design of Flood Control
Channels, EM 1110-2-1601: C = 0.5 for tranquil flow, 1.0 for rapid flow in
a simple circular curve (from memory). Rapid flow in curves also forms
cross waves; spiral transitions or banked inverts are the usual measure.`,
		Sources: []string{
			"U.S. Army Corps of Engineers, EM 1110-2-1601, Hydraulic Design of Flood Control Channels (from memory)",
		},
		Remedies: `raise the outer bank (or lining) over the bend, increase the
radius, reduce the velocity in the bend, or for supercritical flow use
spiral transitions or a banked invert.`,
	},
	Check: checkSuperelevation,
}

func checkSuperelevation(ctx *Context, report func(Finding)) {
	cfg := ctx.Config
	u := ctx.units()
	g := u.Gravity()
	cSub, cSup := cfg.Number("subcritical_coefficient"), cfg.Number("supercritical_coefficient")
	minimum := cfg.Number("minimum")
	if cSub <= 0 {
		cSub = defaultSubcriticalC
	}
	if cSup <= 0 {
		cSup = defaultSupercriticalC
	}
	for ev := range ctx.events() {
		for rr := range ctx.reaches(ev) {
			for _, bend := range rr.Reach.Bends {
				if bend.Radius <= 0 {
					continue
				}
				lo := bend.FromStation - exceptionTolerance(bend.FromStation)
				hi := bend.ToStation + exceptionTolerance(bend.ToStation)
				sub, offset := pointsBetween(rr, lo, hi)
				judge := func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
					sec := sectionAt(rr, p)
					if sec == nil || sec.Closed() || p.Depth <= 0 || !finiteNum(sec.Height) {
						return false
					}
					c := bendCoefficient(p, cSub, cSup)
					dy := c * p.Velocity * p.Velocity * p.TopWidth / (g * bend.Radius)
					top := p.Invert + sec.Height
					if p.WSE > top+1e-12*max(1, sec.Height) {
						// The straight channel overtops: capacity reports it, once.
						return false
					}
					remaining := top - (p.WSE + dy)
					if remaining >= minimum-1e-12*max(1, minimum) {
						v.short = minimum - remaining // the margin, for locate
						return false
					}
					// The radius at which the rise just leaves the minimum:
					// rc = C·V²·T/(g·(top − WSE − minimum)); none exists when the
					// straight channel already lacks the minimum.
					room := top - p.WSE - minimum
					need := math.MaxFloat64
					if room > 0 {
						need = c * p.Velocity * p.Velocity * p.TopWidth / (g * room)
					}
					*v = verdict{value: remaining, limit: minimum, short: minimum - remaining, aux: need}
					return true
				}
				atBend := func(*solver.ReachResult, *solver.Point) *model.Src { return &bend.Src }
				spans := scan(sub, nil, nil, lower, judge, atBend, &ctx.verdict, ctx.spans[:0])
				locate(sub, lower, judge, atBend, &ctx.verdict, &ctx.trial, spans)
				for i := range spans {
					s := &spans[i]
					s.first, s.last, s.worst = s.first+offset, s.last+offset, s.worst+offset
				}
				// Between a passing point and one where the straight channel
				// overtops, the outer bank's margin falls to −Δy at the top
				// of bank with no failing computed point between: as for
				// freeboard, the stretch from where it meets the minimum.
				spans = overtopEdges(rr, nil, lo, hi, spans, &ctx.trial, overtopEdge{
					short: func(p *solver.Point, sec *model.Section) float64 {
						c := bendCoefficient(p, cSub, cSup)
						return minimum - (p.Invert + sec.Height - p.WSE - c*p.Velocity*p.Velocity*p.TopWidth/(g*bend.Radius))
					},
					bank:  func(*model.Section) float64 { return max(minimum, math.SmallestNonzeroFloat64) },
					block: atBend,
				})
				ctx.spans = spans
				for _, s := range spans {
					at := &rr.Points[s.worst]
					if q, ok := overtopCrossing(rr, s); ok {
						// The span runs up to where the water surface
						// reaches the top of bank: there the rise takes all
						// of it, remaining = −Δy exactly, where the failing
						// trial nearest that station gives a value that
						// depends on where the bracketing stopped.
						dy := bendCoefficient(&q, cSub, cSup) * q.Velocity * q.Velocity * q.TopWidth / (g * bend.Radius)
						s.value, s.short, s.aux, at = -dy, max(s.short, minimum+dy), math.MaxFloat64, &q
					}
					msg, remedy := superelevationMessage(bend, s, at, cSub, cSup, u)
					msg += overtopsBeside(rr, s, u)
					f := spanFinding(ev, rr, s, msg, remedy)
					f.Unit = u.Length()
					f.Focus = bend.At("radius")
					report(f)
				}
			}
		}
	}
}

// pointsBetween returns a reach result restricted to the points with
// lo ≤ station ≤ hi (points are ordered by station), and the index of its
// first point in the whole result.
func pointsBetween(rr *solver.ReachResult, lo, hi float64) (*solver.ReachResult, int) {
	i := sort.Search(len(rr.Points), func(k int) bool { return rr.Points[k].Station >= lo })
	j := max(i, sort.Search(len(rr.Points), func(k int) bool { return rr.Points[k].Station > hi }))
	cp := *rr
	cp.Points = rr.Points[i:j]
	return &cp, i
}

// bendCoefficient is C of the superelevation at a computed point: the
// subcritical coefficient where the solver finds the flow subcritical,
// else the supercritical one. The solver's regime, not F < 1, decides: at
// critical depth (a control, or flow passing through it) F is 1 only to
// rounding, 0.9999999999999998 in one unit system and 1.0000000000000002
// in the other, and within the solver's criticalFroudeTol of 1 it tells
// nothing about the regime; the larger rise of rapid flow is taken there.
// A point without a regime (not from the solver) goes by F < 1.
func bendCoefficient(p *solver.Point, cSub, cSup float64) float64 {
	switch p.Regime {
	case solver.Subcritical:
		return cSub
	case solver.Critical, solver.Supercritical:
		return cSup
	}
	if p.Froude < 1 {
		return cSub
	}
	return cSup
}

// superelevationMessage words a superelevation span; p is the flow its
// worst value was measured in (its worst computed point, or the station
// where the water surface reaches the top of bank). The rise is worked out
// at p from the formula, not as top − WSE − value: locate may take the
// value from a trial station between computed points (absorb), and that
// difference mixed it with the worst computed point's water surface (a
// rise of 0.029 m printed, the freeboard of that point, where the rise
// was 0.0001 m, beside an overtopping stretch).
func superelevationMessage(bend *model.Bend, s span, p *solver.Point, cSub, cSup float64, u model.Units) (msg, remedy string) {
	lu := u.Length()
	c := bendCoefficient(p, cSub, cSup)
	dy := c * p.Velocity * p.Velocity * p.TopWidth / (u.Gravity() * bend.Radius)
	rem, lim := numfmt.Pair(s.value, s.limit)
	msg = fmt.Sprintf("in bend %q (radius %s %s) the outer bank water surface rises %s %s "+
		"(Δy = C·V²·T/(g·rc), C = %s, V %s %s, T %s %s), leaving %s %s to the top of bank where %s %s is required",
		bend.Name, numfmt.Num(bend.Radius), lu, numfmt.Num(dy), lu, numfmt.Num(c), numfmt.Num(p.Velocity), u.Velocity(), numfmt.Num(p.TopWidth), lu,
		rem, lu, lim, lu)
	remedy = fmt.Sprintf("raise the outer bank by at least %s %s over the bend", practicalUp(s.short, heightStep, u), lu)
	if s.aux < math.MaxFloat64 {
		remedy += fmt.Sprintf(", or make the radius at least %s %s", practicalUp(s.aux, radiusStep, u), lu)
	}
	if s.value < 0 {
		msg = "the channel overtops here at the outer bank of the bend: " + msg
	}
	return msg, remedy
}

// overtopCrossing is the flow at an end of span s (indices of rr) that
// locate moved off its computed point toward a neighbouring point where
// the channel overtops: there the water surface reaches the top of bank.
// ok is false when no end of s is such an end.
func overtopCrossing(rr *solver.ReachResult, s span) (solver.Point, bool) {
	for _, end := range [2]struct {
		i, from int     // the overtopped neighbour; the computed point the step starts from
		x       float64 // the span end
		moved   bool
	}{{s.first - 1, s.first - 1, s.from, s.from < rr.Points[s.first].Station},
		{s.last + 1, s.last, s.to, s.to > rr.Points[s.last].Station}} {
		if end.i < 0 || end.i >= len(rr.Points) || !end.moved {
			continue
		}
		p := &rr.Points[end.i]
		if !overtopsAt(sectionAt(rr, p), p) {
			continue
		}
		if q, _, ok := rr.Between(end.from, end.x); ok {
			return q, true
		}
	}
	return solver.Point{}, false
}
