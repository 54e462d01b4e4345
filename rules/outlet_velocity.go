package rules

import (
	"strconv"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var outletVelocityRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "outlet_velocity",
		Severity: policies.Warning,
		Settings: []policies.Setting{
			{Name: "limit", Kind: policies.PerLining, Quantity: policies.Velocity, Bounds: policies.Above(0),
				Required: true, Doc: "the largest culvert outlet velocity without outlet protection, by the receiving channel's lining word"},
		},
	},
	Title: "Culvert outlet velocity that needs outlet protection",
	Doc: Doc{
		Checks: `for every culvert block and event, the mean velocity at the
barrel's outlet against the largest velocity the receiving channel's
lining takes without outlet protection. The receiving lining is that of the
section at the start of the reach below the barrel; when the barrel is the
model's outlet reach it is unknown and the limit's default applies. The
finding points at the culvert block, at the outlet station of the barrel.

Not evaluated: scour of the receiving bed beyond the velocity comparison
(the scour hole depth of HEC-14), and the size of the protection needed.`,
		Formula: `    V_out = Q_barrel / A(y_out)   y_out from the barrel's profile, at most the rise
    fails where V_out > limit(receiving lining)`,
		Basis: `FHWA HEC-14, Hydraulic Design of Energy Dissipators for Culverts
and Channels, 3rd ed. (2006), compares the culvert outlet velocity with
the velocity the downstream channel can withstand and calls for outlet
protection (a riprap apron or a dissipator) above it (from memory); the
packs use the permissible velocities of the max_velocity rule for the
receiving linings.`,
		Sources: []string{
			"FHWA HEC-14, Hydraulic Design of Energy Dissipators for Culverts and Channels, 3rd ed. (2006) (from memory)",
			"Fortier and Scobey, \"Permissible canal velocities\", Trans. ASCE 89 (1926), in Chow (1959) Table 7-3",
		},
		Remedies: `outlet protection sized for the velocity (a riprap apron, a
stilling basin or another dissipator, HEC-14), a flatter or rougher barrel
that leaves it slower, or more barrels sharing the flow.`,
	},
	Check: checkOutletVelocity,
}

func checkOutletVelocity(ctx *Context, report func(Finding)) {
	table := ctx.Config.Table("limit")
	vu := ctx.units().Velocity()
	ctx.eachCulvert(func(ev *solver.EventResult, cr *solver.CulvertResult) {
		lining, sec := receivingLining(cr.Culvert)
		lim, ok := table.For(lining)
		if !ok || cr.OutletVelocity <= lim {
			return
		}
		station := 0.0
		if r := cr.Culvert.Reach; r != nil {
			station = r.Length
		}
		f := culvertFinding(ev, cr, station)
		f.Value, f.Limit = cr.OutletVelocity, lim
		val, l := numfmt.Pair(cr.OutletVelocity, lim)
		for_ := "the policy's default (no receiving channel)"
		if sec != nil {
			var buf [64]byte
			for_ = "receiving lining " + string(strconv.AppendQuote(buf[:0], lining))
			if _, listed := table.Values[lining]; !listed {
				for_ += " (the policy's default)"
			}
		}
		f.Message = culvertName(cr.Culvert) + ": outlet velocity " + val + " " + vu + " exceeds " + l + " " + vu + " for " + for_
		f.Remedy = "provide outlet protection for " + numfmt.Up(cr.OutletVelocity) + " " + vu + " (a riprap apron or a dissipator, FHWA HEC-14), or slow the outlet flow"
		report(f)
	})
}

// receivingLining is the lining word of the channel a culvert discharges
// into (the section at station 0 of the reach below its barrel), with that
// section; "" and nil when the barrel is the outlet reach.
func receivingLining(c *model.Culvert) (string, *model.Section) {
	if c.Reach == nil || c.Reach.Downstream == nil {
		return "", nil
	}
	sec := c.Reach.Downstream.SectionAt(0)
	if sec == nil {
		return "", nil
	}
	return sec.Lining, sec
}
