package rules

import (
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var headwaterRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "headwater",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "max_hw_d", Kind: policies.Number, Quantity: policies.Coefficient, Bounds: policies.AtLeast(0),
				Doc: "the largest headwater depth over the barrel's rise, HW/D (0: not checked)"},
			{Name: "freeboard", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0),
				Doc: "the least freeboard from the headwater to the road's shoulder, or to its crest when the model gives no shoulder"},
		},
	},
	Title: "Culvert headwater above the allowed HW/D, or too close to the road",
	Doc: Doc{
		Checks: `for every culvert block and event, the headwater the culvert
needs (the larger of its inlet- and outlet-control headwaters, FHWA HDS-5)
against two limits: the largest headwater depth over the barrel's rise
(HW/D), and the least freeboard from the headwater to the road, measured to
the road's shoulder when the model gives one (road = { ..., shoulder = ELEV
}) and to its crest otherwise. A culvert without a road is checked for HW/D
only. The finding points at the culvert block, at station 0 of the barrel
(the inlet), and names the control that governs.

Not evaluated: the freeboard of a culvert without a road; blockage by
debris or sediment, which raises the headwater; the stability of the
embankment and of the barrel; the headwater of floods beyond the model's
events.`,
		Formula: `    HW   = max(HW_inlet, HW_outlet)            (elevations, HDS-5)
    HW/D = (HW − inlet invert) / rise          fails where HW/D > max_hw_d
    freeboard = level − HW                     fails where freeboard < freeboard
level is the road's shoulder, else its crest. With overtopping the
headwater is that of the barrel and road flow together.`,
		Basis: `the headwater limits are site criteria: FHWA HDS-5 (2012) leaves
the allowable headwater to the designer's criteria (the upstream property,
the road, the embankment), and highway agencies commonly cap HW/D near 1.2
to 1.5 for the design flow with about 0.3 m (1 ft) of freeboard to the edge
of the shoulder (common practice, no single published source).`,
		Sources: []string{
			"FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. (2012): headwater by inlet and outlet control (from memory)",
			"common practice (no published source): HW/D 1.2–1.5 and 0.3 m (1 ft) freeboard to the shoulder",
		},
		Remedies: `under inlet control, a better inlet (bevelled or flared edges,
wingwalls) or a larger barrel; under outlet control, a larger or smoother
barrel, an additional barrel, or a lower tailwater; or raise the road.`,
	},
	Check: checkHeadwater,
}

func checkHeadwater(ctx *Context, report func(Finding)) {
	maxHWD, need := ctx.Config.Number("max_hw_d"), ctx.Config.Number("freeboard")
	lu := ctx.units().Length()
	ctx.eachCulvert(func(ev *solver.EventResult, cr *solver.CulvertResult) {
		road := cr.Culvert.Road
		overHWD := maxHWD > 0 && cr.HWD > maxHWD
		var level, have float64
		var what string
		if road != nil {
			level, what = road.FreeboardLevel()
			have = level - cr.Headwater
		}
		short := road != nil && !(have >= need)
		if !overHWD && !short {
			return // nothing to report, so nothing to word
		}
		name := culvertName(cr.Culvert)
		how := "by " + cr.Method()
		if overHWD {
			f := culvertFinding(ev, cr, 0)
			f.Value, f.Limit = cr.HWD, maxHWD
			val, lim := numfmt.Pair(cr.HWD, maxHWD)
			f.Message = name + ": HW/D " + val + " exceeds " + lim + ": headwater " + numfmt.Num(cr.Headwater) + " " + lu + " " + how
			f.Remedy = "lower the headwater by " + numfmt.Up((cr.HWD-maxHWD)*cr.Rise) + " " + lu +
				" or more: a better inlet or a larger barrel under inlet control, a larger, smoother or additional barrel under outlet control"
			report(f)
		}
		if !short {
			return
		}
		f := culvertFinding(ev, cr, 0)
		f.Focus = road.Range
		f.Value, f.Limit = have, need
		val, lim := numfmt.Pair(have, need)
		if have < 0 {
			f.Message = name + ": headwater " + numfmt.Num(cr.Headwater) + " " + lu + " rises " + numfmt.Num(-have) + " " + lu +
				" above the road " + what + " " + numfmt.Num(level) + " " + lu + " (" + lim + " " + lu + " freeboard required)"
		} else {
			f.Message = name + ": freeboard " + val + " " + lu + " from the headwater to the road " + what + " is below " + lim + " " + lu
		}
		f.Remedy = "lower the headwater by " + numfmt.Up(need-have) + " " + lu + " or more (it is set " + how + "), or raise the road"
		report(f)
	})
}
