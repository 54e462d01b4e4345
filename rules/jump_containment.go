package rules

import (
	"fmt"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var jumpContainmentRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "jump_containment",
		Severity: policies.Error,
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
The finding's value is the length of channel outside the basin.`,
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

func checkJumpContainment(ctx *Context, report func(Finding)) {
	u := ctx.units()
	lu := u.Length()
	ctx.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		r := rr.Reach
		for _, j := range rr.Jumps {
			if !usableJump(j) {
				continue
			}
			toe, end := j.Station, j.End()
			b, up, down := bestBasin(r, toe, end)
			tol := exceptionTolerance(end)
			if b != nil && up <= tol && down <= tol {
				continue
			}
			f := Finding{Reach: r.Name, Event: ev.Event.Name, FromStation: toe, ToStation: end,
				HasSpan: true, Limit: 0, HasValue: true, Unit: lu}
			jump := fmt.Sprintf("the hydraulic jump (length %s %s", num(j.Length), lu)
			if finite(j.Froude) {
				jump += ", F1 " + num(j.Froude)
			}
			jump += ")"
			if b == nil {
				f.Range, f.Value = r.DefRange, end-toe
				from, to := numPair(toe, end)
				f.Message = fmt.Sprintf("%s lies in no basin of reach %q: unprotected channel may scour", jump, r.Name)
				f.Remedy = fmt.Sprintf("build a basin covering at least stations %s–%s %s, or move the jump", from, to, lu)
			} else {
				var by []string
				if up > tol {
					by = append(by, num(up)+" "+lu+" upstream")
				}
				if down > tol {
					by = append(by, num(down)+" "+lu+" downstream")
				}
				side := "downstream"
				if down <= tol {
					side = "upstream"
				} else if up > tol {
					side = "upstream and downstream"
				}
				f.Range, f.Value = b.DefRange, max(up, 0)+max(down, 0)
				f.Message = fmt.Sprintf("%s escapes basin %q (%s–%s %s) by %s: unprotected channel %s may scour",
					jump, b.Name, num(b.FromStation), num(b.ToStation), lu, strings.Join(by, " and "), side)
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
	return finite(j.Station, j.Length, j.End()) && j.Length >= 0
}
