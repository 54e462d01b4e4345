package rules

import (
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// Kinds of capacity failure; a span holds one kind.
const (
	overtops = iota + 1
	flowsFull
)

var capacityRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "capacity",
		Severity: policies.Error,
		AlwaysOn: true,
	},
	Title: "The channel overtops, or a closed conduit flows full",
	Doc: Doc{
		Checks: `(always on) at every computed point, whether the
section carries the flow at all. An open section whose water surface rises
above its top of bank (or lining) overtops: the water leaves the channel
and the one-dimensional results no longer describe the flow. A closed
conduit that flows full runs under pressure, which the free-surface method
does not compute. Contiguous failing points of one reach and section merge
into one span; the finding gives the largest depth and the section height.`,
		Formula: `    open:   fails where WSE > invert + height  (value depth, limit height)
    closed: fails where the solver marks the point full, or depth ≥ the
            diameter or box height; not for the barrel of a culvert
            block, whose pressure flow the HDS-5 outlet-control
            computation covers (see the headwater rule)`,
		SettingsNote: "A design exception can cover a span that is meant to overflow (a spillway crest, say), with its reason.",
		Basis: `common practice (no published source): a channel is designed to
contain its design flow; culverts flowing full are analysed for pressure
flow with entrance and exit losses instead.`,
		Sources: []string{
			"common practice (no published source)",
		},
		Remedies: `enlarge the section (deeper or wider), raise the banks, lower
the downstream control, or, for a conduit, a larger diameter or an
additional barrel, or an inlet- or outlet-control culvert analysis.`,
	},
	Check: checkCapacity,
}

// capacityRemedy is what would contain an overtopping flow, worded for
// the object: a built channel's banks, or a natural channel (a points
// section), whose surveyed cross-section the water leaves. When the
// policy requires freeboard, the bank rise that would also meet it is
// given: freeboard does not report the overtopping stretch again.
func capacityRemedy(ctx *Context, ev *solver.EventResult, rr *solver.ReachResult, s span, u model.Units) string {
	lu := u.Length()
	p := &rr.Points[s.worst]
	rise := practicalUp(s.short, heightStep, u)
	var r string
	if sec := sectionAt(rr, p); sec != nil && sec.Shape == model.Points {
		r = "the flow leaves the surveyed cross-section onto the land beside it: extend the section's points to ground above the " +
			"water surface (at least " + rise + " " + lu + " higher) to check the flood extent, or carry the flow with a levee, " +
			"a wider floodplain or upstream storage"
	} else {
		r = "deepen or widen the section, or raise the banks by at least " + rise + " " + lu + " to contain the flow"
	}
	if cfg := ctx.Policy.Rules["freeboard"]; cfg != nil && cfg.AppliesTo(ev.Event.Name) {
		req := max(cfg.Number("minimum"), cfg.Number("fraction")*p.Depth)
		if req > 0 {
			r += " and by " + practicalUp(s.short+req, heightStep, u) + " " + lu + " to keep the freeboard the policy requires (" + numfmt.Num(req) + " " + lu + ")"
		}
	}
	return r
}

func checkCapacity(ctx *Context, report func(Finding)) {
	u := ctx.units()
	lu := u.Length()
	ctx.scanPoints(func(rr *solver.ReachResult, r *run) bool {
		sec := r.sec
		if sec == nil || !finiteNum(sec.Height) {
			return true
		}
		if sec.Closed() {
			return rr.Reach != nil && rr.Reach.Culvert != nil || !r.full && below(r.maxDepth, sec.Height)
		}
		return inBank(r)
	}, higher, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		sec := sectionAt(rr, p)
		if sec == nil || !finiteNum(sec.Height) {
			return false
		}
		kind := overtops
		if sec.Closed() {
			if !p.Full && p.Depth < sec.Height || rr.Reach != nil && rr.Reach.Culvert != nil {
				v.short = p.Depth - sec.Height // the margin, for locate
				return false
			}
			kind = flowsFull
		} else if p.WSE <= p.Invert+sec.Height+1e-12*max(1, sec.Height) {
			v.short = p.WSE - (p.Invert + sec.Height)
			return false
		}
		*v = verdict{kind: kind, value: p.Depth, limit: sec.Height, short: p.Depth - sec.Height}
		return true
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		val, lim := numfmt.Pair(s.value, s.limit)
		var msg, remedy string
		if s.kind == flowsFull {
			head := ""
			if s.short > 0 {
				head = ", the hydraulic grade up to " + numfmt.Num(s.short) + " " + lu + " above its crown"
			}
			msg = "the " + lim + " " + lu + " closed conduit flows full (depth " + val + " " + lu + head + "): " +
				"it runs under pressure, which the free-surface results do not describe"
			remedy = "enlarge the conduit or add a barrel, or analyse it for pressure flow"
		} else {
			msg = "the channel overtops here: depth " + val + " " + lu + " exceeds the section height " + lim + " " + lu +
				", the water surface " + numfmt.Num(s.short) + " " + lu + " above the top of bank"
			remedy = capacityRemedy(ctx, ev, rr, s, u)
		}
		f := spanFinding(ev, rr, s, msg, remedy)
		f.Unit = lu
		if sec := sectionAt(rr, &rr.Points[s.worst]); sec != nil {
			f.Focus = sec.At("height")
		}
		report(f)
	})
}
