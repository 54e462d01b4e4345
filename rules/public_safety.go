package rules

import (
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// Kinds of public_safety failure; a change of kind ends a span.
const (
	tooDeep = iota + 1
	tooFast
)

var publicSafetyRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "public_safety",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "depth", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "the greatest flow depth (0: not checked)"},
			{Name: "depth_velocity", Kind: policies.Number, Quantity: policies.UnitDischarge, Bounds: policies.AtLeast(0),
				Doc: "the greatest product of depth and velocity (0: not checked)"},
		},
		Together: []policies.Group{{Settings: []string{"depth", "depth_velocity"}, Need: policies.AtLeastOne,
			Note: "each written limit applies"}},
	},
	Title: "Flow depth and depth × velocity within the limits for public safety",
	Doc: Doc{
		Checks: `at every computed point of an open section, the flow depth
against the greatest depth, and the product of depth and mean velocity
against the greatest product, that the policy allows where people can
reach the water (a channel beside a footpath, a street, a school). A point
failing the depth limit is reported as too deep before the product is
looked at; contiguous failing points of one reach, section and kind merge
into one span, and the finding gives the worst value and its limit.`,
		Formula: `    y = the greatest depth of the section (thalweg);  fails where y > depth
    y · V, V = Q / A the mean velocity;  fails where y · V > depth_velocity
The product uses the greatest depth and the mean velocity of the section:
where the velocity varies across a wide section (points sections), the
local product in the main channel can be higher, and the check is then an
approximation that says so here. Closed conduits are not checked.`,
		Basis: `people, children first, lose their footing in moving water
when depth × velocity exceeds about 0.4 m²/s, and adults about 0.6 m²/s,
with a depth limit near 0.5 m for children (Cox, Shand and Blacka 2010,
Australian Rainfall and Runoff Revision Project 10: Appropriate safety
criteria for people, from memory). The numbers belong to the manual the
policy carries; the rule has no default.`,
		Sources: []string{
			"Cox, Shand and Blacka (2010), Australian Rainfall and Runoff Revision Project 10: Appropriate Safety Criteria for People (from memory)",
		},
		Remedies: `widen the section so the flow runs shallower and slower,
fence or screen the channel from public access, or route the flow through a
closed conduit.`,
	},
	Check: checkPublicSafety,
}

func checkPublicSafety(ctx *Context, report func(Finding)) {
	maxDepth, maxDV := ctx.Config.Number("depth"), ctx.Config.Number("depth_velocity")
	u := ctx.units()
	lu := u.Length()
	ctx.scanPoints(func(rr *solver.ReachResult, r *run) bool {
		if r.sec == nil || r.sec.Closed() {
			return true
		}
		return (maxDepth <= 0 || below(r.maxDepth, maxDepth)) && (maxDV <= 0 || below(r.maxDV, maxDV))
	}, higher, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		sec := sectionAt(rr, p)
		if sec == nil || sec.Closed() || p.Depth <= 0 {
			return false
		}
		short := -1e300
		if maxDepth > 0 {
			if p.Depth > maxDepth*(1+1e-12) {
				*v = verdict{kind: tooDeep, value: p.Depth, limit: maxDepth, short: p.Depth - maxDepth}
				return true
			}
			short = max(short, p.Depth-maxDepth)
		}
		if maxDV > 0 {
			dv := p.Depth * p.Velocity
			if dv > maxDV*(1+1e-12) {
				*v = verdict{kind: tooFast, value: dv, limit: maxDV, short: dv - maxDV}
				return true
			}
			short = max(short, dv-maxDV)
		}
		v.short = short
		return false
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		val, lim := numfmt.Pair(s.value, s.limit)
		unit, what := lu, "flow depth"
		remedy := "widen the section, or keep the public away from the water over this span"
		if s.kind == tooFast {
			unit, what = lu+"²/s", "depth × velocity"
			remedy = "widen or roughen the section to slow and lower the flow, or keep the public away from the water over this span"
		}
		msg := what + " " + val + " " + unit + " exceeds the greatest " + lim + " " + unit + " allowed for public safety"
		if sec := sectionAt(rr, &rr.Points[s.worst]); s.kind == tooFast && sec != nil && sec.Shape == model.Points {
			msg += " (greatest depth × mean velocity: the local product in the main channel may be higher)"
		}
		f := spanFinding(ev, rr, s, msg, remedy)
		f.Unit = unit
		report(f)
	})
}
