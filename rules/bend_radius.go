package rules

import (
	"fmt"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
)

var bendRadiusRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "bend_radius",
		Severity: policies.Warning,
		Settings: []policies.Setting{
			{Name: "multiple", Kind: policies.Number, Quantity: policies.Coefficient, Bounds: policies.Above(0), Default: 3,
				Doc: "the least centreline radius as a multiple of the flow's top width"},
		},
	},
	Title: "Bend radius no less than a multiple of the top width",
	Doc: Doc{
		Checks: `in every bend of every reach and event the block applies
to, the centreline radius against the policy's multiple of the widest top
width of the flow in the bend. A tight bend raises the water at the outer
bank (the superelevation rule checks that rise against the bank),
concentrates shear on the outer bank and sets up secondary currents that
scour it, whatever the freeboard. The finding points at the bend's radius
and gives the radius that would pass.`,
		Formula: `    T = the widest top width over the bend's computed points
    fails where rc < multiple · T`,
		Basis: `a centreline radius of at least about three times the water
surface width is the usual guidance for channel bends, below which bend
losses and outer-bank attack grow quickly (USACE EM 1110-2-1601, Hydraulic
Design of Flood Control Channels, from memory); the default multiple is 3.`,
		Sources: []string{
			"U.S. Army Corps of Engineers, EM 1110-2-1601, Hydraulic Design of Flood Control Channels (from memory)",
		},
		Remedies: `lengthen the radius (realign the channel), or protect the
outer bank and check superelevation and shear in the bend with the bend
factors of the other rules.`,
	},
	Check: checkBendRadius,
}

func checkBendRadius(ctx *Context, report func(Finding)) {
	k := ctx.Config.Number("multiple")
	lu := ctx.units().Length()
	for ev := range ctx.events() {
		for rr := range ctx.reaches(ev) {
			for _, bend := range rr.Reach.Bends {
				if bend.Radius <= 0 {
					continue
				}
				t, at := widestInBend(rr, bend)
				need := k * t
				if t <= 0 || bend.Radius >= need*(1-1e-12) {
					continue
				}
				rad, lim := numfmt.Pair(bend.Radius, need)
				report(Finding{
					Message: fmt.Sprintf("bend %q has a centreline radius of %s %s, less than the %s %s required (%s × the widest top width of the flow, %s %s at station %s %s)",
						bend.Name, rad, lu, lim, lu, numfmt.Num(k), numfmt.Num(t), lu, numfmt.Num(at), lu),
					Remedy: fmt.Sprintf("lengthen the radius to at least %s %s, or protect the outer bank", numfmt.Up(need), lu),
					Range:  bend.DefRange, Focus: bend.At("radius"),
					Reach: rr.Reach.Name, Event: ev.Event.Name,
					FromStation: bend.FromStation, ToStation: bend.ToStation, HasSpan: true,
					Value: bend.Radius, Limit: need, HasValue: true, Unit: lu,
				})
			}
		}
	}
}
