package rules

import (
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var overtoppingRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "overtopping",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "max_depth", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "the largest depth of water over the road crest (0: the road must not overtop)"},
		},
	},
	Title: "Road over a culvert overtops, or deeper than allowed",
	Doc: Doc{
		Checks: `for every culvert block with a road, in each event the block's
events select, whether the headwater rises above the road crest, so that
part of the flow crosses the road as a broad-crested weir. With max_depth
0 (the default) any overtopping fails; otherwise the depth over the crest
must not exceed max_depth. Select the events the block applies to with
events = [...] (the design events where the road must stay dry, say); a
flood event allowed a shallow depth is checked with another policy whose
block sets max_depth and selects that event. The finding points at the
culvert's road and gives the depth and the flow over the road.`,
		Formula: `    Hr = HW − crest,  Qr = kt·Cr·L·Hr^1.5        (HDS-5 roadway overtopping)
    fails where Hr > max_depth (max_depth 0: where Qr > 0)
HW is the headwater at which barrel and road together pass the event's
flow; Cr = 3.0 ft^0.5/s (1.66 m^0.5/s) for a paved road unless the model's
road gives its coefficient; kt reduces the flow for a high tailwater.`,
		Basis: `water over a road can float vehicles and wash out the
embankment; whether a road may overtop in a given flood, and how deep, is
set by the road's owner (common practice, no published source). The weir
relation is FHWA HDS-5 (2012), roadway overtopping, after FHWA HDS-1
(1978) (from memory).`,
		Sources: []string{
			"FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. (2012), roadway overtopping (from memory)",
			"common practice (no published source): the allowed depth over a road",
		},
		Remedies: `a larger barrel or an additional barrel, a better inlet, a
higher road profile, or upstream storage that reduces the flow.`,
	},
	Check: checkOvertopping,
}

func checkOvertopping(ctx *Context, report func(Finding)) {
	allowed := ctx.Config.Number("max_depth")
	u := ctx.units()
	lu := u.Length()
	ctx.eachCulvert(func(ev *solver.EventResult, cr *solver.CulvertResult) {
		road := cr.Culvert.Road
		if road == nil || !(cr.RoadFlow > 0) || cr.RoadDepth <= allowed {
			return
		}
		f := culvertFinding(ev, cr, 0)
		f.Focus = road.Range
		f.Value, f.Limit = cr.RoadDepth, allowed
		var what string
		if allowed > 0 {
			val, lim := numfmt.Pair(cr.RoadDepth, allowed)
			what = culvertName(cr.Culvert) + ": " + val + " " + lu + " of water over the road exceeds " + lim + " " + lu +
				" (" + numfmt.Num(cr.RoadFlow) + " " + lu + "³/s over it)"
		} else {
			what = culvertName(cr.Culvert) + ": the road overtops, " + numfmt.Num(cr.RoadDepth) + " " + lu + " deep with " +
				numfmt.Num(cr.RoadFlow) + " " + lu + "³/s over it"
		}
		f.Message = what + "; water on a road can sweep vehicles away"
		f.Remedy = "enlarge or add barrels, improve the inlet or raise the road; the road owner's criteria and a licensed engineer decide what depth is acceptable"
		report(f)
	})
}
