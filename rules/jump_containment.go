package rules

import (
	"fmt"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var jumpContainmentRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "jump_containment",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "min_froude", Kind: policies.Number, Quantity: policies.Froude, Bounds: policies.AtLeast(0),
				Doc: "jumps with a lower upstream Froude number F1 need no basin (0: every jump needs one)"},
			{Name: "min_energy_loss", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "jumps that dissipate less energy (head) need no basin (0: every jump needs one)"},
		},
	},
	Title: "Hydraulic jump outside a stilling basin",
	Doc: Doc{
		Checks: `every hydraulic jump, from its toe to the end of its
length, must lie within one basin block of its reach. A jump dissipates
energy in intense turbulence that scours an unprotected bed and banks; the
basin is the hardened zone built for it. A jump that escapes its basin is
reported at that basin (the one it overlaps most), a jump in no basin at
the reach, with the distance it escapes by upstream and downstream.`,
		Formula: `    jump occupies [toe, toe + L],  L from the solver (Peterka's curve,
    about 6·y2 for 4.5 < F1 < 13)
    contained when basin.from ≤ toe and toe + L ≤ basin.to for one basin
    (within a millimetre or a thousandth of a foot)
    exempt when F1 < min_froude or E1 − E2 < min_energy_loss
The finding's value is the length of channel outside the basin.

A jump whose roller runs past the downstream end of its reach continues
into the reach below (or out of the outlet): its span is clipped to the
reach and the message says where it continues. It is contained when the
part in its reach lies in a basin that runs to the reach end and the rest
lies in a basin that starts at station 0 of the reach below.

Undular jumps (F1 below about 1.7) are a train of standing waves with
little loss of energy; a policy may exempt them, or any jump below a head
loss it names, from needing a basin (min_froude, min_energy_loss). The
output's "not evaluated" statement lists the jumps so exempted.

Near critical flow the toe is computed to centimetres but stands where
inputs known to a per cent put it; 1 % more or less depth below the toe
moves it by
    δx = A2·(1 − F2²)·0.01·y2 / |A1·(S0 − Sf1) − A2·(S0 − Sf2)|
(metres on a chute barely steeper than critical). Where δx is at least the
distance the verdict rests on, an escaping jump's message says the verdict
is sensitive, and a jump inside its basin by less than δx is listed in the
"not evaluated" statement.`,
		Basis: `Peterka, Hydraulic Design of Stilling Basins and Energy
Dissipators, USBR Engineering Monograph 25 (1958): basin lengths follow
the length of the jump; Chow, Open-Channel Hydraulics (1959), ch. 15.`,
		Sources: []string{
			"Peterka, Hydraulic Design of Stilling Basins and Energy Dissipators, USBR Engineering Monograph 25 (1958)",
			"Chow, Open-Channel Hydraulics (1959), ch. 15",
		},
		Remedies: `lengthen the basin or move it to where the jump forms; fix the
jump's position with a tailwater control (end sill, baffles, a drop) or by
changing the gate opening or the approach slope.`,
	},
	Check: checkJumpContainment,
}

// exemptJump reports whether a policy's thresholds exempt a jump from
// needing a basin: F1 below min_froude, or an energy loss below
// min_energy_loss.
func exemptJump(cfg *policies.RuleConfig, j solver.Jump) bool {
	if cfg == nil {
		return false
	}
	minF, minE := cfg.Number("min_froude"), cfg.Number("min_energy_loss")
	return (minF > 0 && j.Froude < minF) || (minE > 0 && j.EnergyLoss < minE)
}

// jumpReach is where a jump lies: the part of [toe, toe + L] in its reach
// and how far it runs past the reach end (over, 0 when it ends inside),
// into the reach below (next; nil at the outlet).
type jumpReach struct {
	toe, end, over float64
	next           *model.Reach
}

func clipJump(r *model.Reach, j solver.Jump) jumpReach {
	jr := jumpReach{toe: j.Station, end: j.End()}
	if l := r.Length; l > 0 && jr.end > l+exceptionTolerance(l) {
		jr.toe, jr.end, jr.over, jr.next = min(jr.toe, l), l, j.End()-l, r.Downstream
	} else if l > 0 && jr.end > l {
		// Within the tolerance of the reach end: the span stops there
		// (a span never leaves its reach) and nothing runs on below.
		jr.toe, jr.end = min(jr.toe, l), l
	}
	return jr
}

// continues says where a clipped jump's roller goes on, "" when it ends in
// its reach.
func (jr jumpReach) continues(r *model.Reach, u model.Units) string {
	if jr.over <= 0 {
		return ""
	}
	into := fmt.Sprintf("beyond the outlet node %q", r.To)
	if jr.next != nil {
		into = fmt.Sprintf("into reach %q through node %q", jr.next.Name, r.To)
	}
	return fmt.Sprintf("; its roller continues %s %s past the reach end, %s", numfmt.Num(jr.over), u.Length(), into)
}

func checkJumpContainment(ctx *Context, report func(Finding)) {
	u := ctx.units()
	lu := u.Length()
	cfg := ctx.Config
	ctx.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		r := rr.Reach
		for _, j := range rr.Jumps {
			if !usableJump(j) || exemptJump(cfg, j) {
				continue
			}
			jr := clipJump(r, j)
			toe, end := jr.toe, jr.end
			b, up, down := bestBasin(r, toe, end)
			tol := exceptionTolerance(end)
			// The part past the reach end must lie in basins of the reaches
			// below from the node on.
			nextDown := 0.0
			if jr.over > 0 {
				nextDown = unprotectedBelow(jr.next, jr.over)
			}
			inReach := b != nil && up <= tol && down <= tol
			if end-toe <= tol && jr.over > 0 {
				inReach = true // the toe at the reach end: the whole body lies below
			}
			if inReach && nextDown <= exceptionTolerance(jr.over) {
				continue
			}
			f := Finding{Reach: r.Name, Event: ev.Event.Name, FromStation: toe, ToStation: end,
				HasSpan: true, Limit: 0, HasValue: true, Unit: lu}
			jump := fmt.Sprintf("the hydraulic jump (length %s %s", numfmt.Num(j.Length), lu)
			if numfmt.Finite(j.Froude) {
				jump += ", F1 " + numfmt.Num(j.Froude)
			}
			jump += ")"
			cont := jr.continues(r, u)
			if inReach {
				// Contained in its reach; the part below is not.
				f.Range, f.Value = r.DefRange, max(nextDown, 0)
				if b != nil {
					f.Range = b.DefRange
				}
				where := "beyond the outlet, where no basin of the model protects the channel"
				if jr.next != nil {
					where = fmt.Sprintf("into reach %q, whose channel below node %q is not in a basin for %s %s", jr.next.Name, r.To, numfmt.Num(nextDown), lu)
				}
				f.Message = fmt.Sprintf("%s runs %s %s past the end of reach %q %s: unprotected channel may scour",
					jump, numfmt.Num(jr.over), lu, r.Name, where)
				f.Remedy = "extend the protection past the node, with a basin from station 0 of the reach below, or move the jump upstream"
				report(f)
				continue
			}
			if b == nil {
				f.Range, f.Value = r.DefRange, end-toe
				from, to := numfmt.Pair(toe, end)
				f.Message = fmt.Sprintf("%s lies in no basin of reach %q: unprotected channel may scour%s", jump, r.Name, cont)
				f.Remedy = fmt.Sprintf("build a basin covering at least stations %s–%s %s, or move the jump", from, to, lu)
			} else {
				var by []string
				if up > tol {
					by = append(by, numfmt.Num(up)+" "+lu+" upstream")
				}
				if down > tol {
					by = append(by, numfmt.Num(down)+" "+lu+" downstream")
				}
				side := "downstream"
				if down <= tol {
					side = "upstream"
				} else if up > tol {
					side = "upstream and downstream"
				}
				f.Range, f.Value = b.DefRange, max(up, 0)+max(down, 0)
				f.Message = fmt.Sprintf("%s escapes basin %q (%s–%s %s) by %s: unprotected channel %s may scour%s%s",
					jump, b.Name, numfmt.Num(b.FromStation), numfmt.Num(b.ToStation), lu, strings.Join(by, " and "), side, cont,
					toeSensitivity(rr, j, max(up, down), u))
				f.Remedy = "lengthen the basin or move it"
			}
			report(f)
		}
	})
}

// bestBasin is the basin of the reach that overlaps [toe, end] most, with
// how far the jump reaches past it upstream and downstream; nil when none
// overlaps.
func bestBasin(r *model.Reach, toe, end float64) (b *model.Basin, up, down float64) {
	best := -1.0
	for _, x := range r.Basins {
		ov := min(end, x.ToStation) - max(toe, x.FromStation)
		if ov < 0 || (ov == 0 && end > toe) {
			continue
		}
		if ov > best {
			best, b = ov, x
		}
	}
	if b == nil {
		return nil, 0, 0
	}
	return b, b.FromStation - toe, end - b.ToStation
}

// unprotectedBelow is how much of a roller that runs over past a node
// into reach next lies in no basin: it must lie in a basin of next that
// starts at its station 0, and where it runs past next too (a short reach
// below), that basin must reach next's end and the rest lie in the reaches
// below in the same way. Beyond the outlet (next nil) nothing protects
// it. The walk is bounded by maxNodeHops reaches.
func unprotectedBelow(next *model.Reach, over float64) float64 {
	for hop := 0; next != nil && over > 0 && hop < maxNodeHops; hop++ {
		l := next.Length
		b, _, down := bestBasin(next, 0, min(over, l))
		switch {
		case b == nil || b.FromStation > exceptionTolerance(0):
			return over // bare channel below the node
		case over <= l+exceptionTolerance(l):
			return max(down, 0) // the roller ends in next
		case b.ToStation < l-exceptionTolerance(l):
			return over - b.ToStation // the basin ends before next does
		}
		over -= l
		next = next.Downstream
	}
	return over
}

// basinAt is the basin of the reach that contains a station, or nil.
func basinAt(r *model.Reach, station float64) *model.Basin {
	for _, b := range r.Basins {
		if station >= b.FromStation-exceptionTolerance(station) && station <= b.ToStation+exceptionTolerance(station) {
			return b
		}
	}
	return nil
}

// jumpBlock is the block responsible for a jump: the basin its toe lies
// in, else the reach.
func jumpBlock(r *model.Reach, j solver.Jump) *model.Src {
	if b := basinAt(r, j.Station); b != nil {
		return &b.Src
	}
	return &r.Src
}

// usableJump reports whether a jump has a finite toe and a finite,
// non-negative length (the solver promises it; anything else is skipped).
func usableJump(j solver.Jump) bool {
	return numfmt.Finite(j.Station, j.Length, j.End()) && j.Length >= 0
}
