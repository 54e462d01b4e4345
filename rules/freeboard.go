package rules

import (
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var freeboardRule = &Rule{
	ID:       "freeboard",
	Title:    "Freeboard between the water surface and the top of bank or lining",
	Severity: policies.Error,
	Doc: `What it checks: at every computed point of an open section, the
freeboard available between the water surface and the top of bank (or of
the lining) against the freeboard the policy requires. Contiguous failing
points of one reach and section merge into one span; the finding gives the
smallest freeboard of the span and the requirement there.

Formula:
    available = invert + height − WSE        (height: section, invert to top)
    required  = max(minimum, fraction · depth)
    fails where available < required
The bank rise the message asks for is the largest required − available
over the span.

Closed conduits have no freeboard: whether a culvert or pipe flows full is
the capacity rule's concern, so closed sections are not checked here.

Settings: minimum (length), fraction (of flow depth); the larger governs.

Basis: a fixed minimum plus a share of the depth is common local practice
(no published source for the combination). The USBR guide for lined and
unlined canals, F = √(C·y) with C from 1.5 to 2.5 in feet, grows with the
square root of depth (Chow, Open-Channel Hydraulics, 1959, §7-6, from
memory); a policy can approximate it over its range of depths with a
minimum and a fraction.

Remedies: raise the top of bank or the lining over the span, widen or
deepen the section so the flow runs lower, flatten a steep backwater by
lowering the downstream control, or reduce the design flow with upstream
storage.`,
	Check: checkFreeboard,
}

func checkFreeboard(ctx *Context, report func(Finding)) {
	cfg := ctx.Config
	u := ctx.units()
	ctx.scanPoints(lower, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		sec := sectionAt(rr, p)
		if sec == nil || sec.Closed() || !finiteNum(sec.Height) {
			return false
		}
		avail := p.Invert + sec.Height - p.WSE
		req := max(cfg.Minimum, cfg.Fraction*p.Depth)
		if avail >= req-1e-12*max(1, req) {
			return false
		}
		*v = verdict{value: avail, limit: req, short: req - avail}
		return true
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		msg, remedy := freeboardMessage(cfg, rr, s, u)
		f := spanFinding(ev, rr, s, msg, remedy)
		if sec := sectionAt(rr, &rr.Points[s.worst]); sec != nil {
			f.Focus = sec.At("height") // the attribute a designer raises
		}
		report(f)
	})
}

func freeboardMessage(cfg *policies.RuleConfig, rr *solver.ReachResult, s span, u model.Units) (msg, remedy string) {
	lu := u.Length()
	p := &rr.Points[s.worst]
	val, lim := numPair(s.value, s.limit)
	basis := ""
	if cfg.Fraction*p.Depth > cfg.Minimum {
		basis = " (" + num(cfg.Fraction) + " × depth " + num(p.Depth) + " " + lu + ")"
	}
	msg = "freeboard " + val + " " + lu + " is below the required " + lim + " " + lu + basis
	if s.value < 0 {
		msg = "the channel overtops here: the water surface is " + num(-s.value) + " " + lu +
			" above the top of bank; required freeboard " + lim + " " + lu + basis
	}
	return msg, "raise the top of bank by at least " + numUp(s.short) + " " + lu + " over this span"
}
