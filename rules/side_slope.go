package rules

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
)

var sideSlopeRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "side_slope",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "minimum", Kind: policies.Number, Quantity: policies.SideSlope, Bounds: policies.AtLeast(0), Default: 3,
				Doc:  "the steepest bank allowed, as the least horizontal per unit vertical (3 means 3H:1V or flatter)",
				Must: "a side slope of at least 0, horizontal per unit vertical (3 means 3H:1V)"},
		},
	},
	Title: "Bank side slopes no steeper than the policy allows",
	Doc: Doc{
		Checks: `the side slopes of every section of every reach the block
applies to (the reach's own and its segments'), against the steepest bank
the policy allows, for maintenance (mowing, access) and for the safety of a
vehicle or person leaving the road. Select the block by reach class
(reach_classes) to hold roadside ditches, constructed channels and natural
streams to different slopes. A finding covers the stretch of the reach
with that section and points at its side_slope.`,
		Formula: `    z = horizontal / vertical of a bank;  fails where z < minimum
trapezoid and triangle: z = side_slope; rectangle: z = 0 (vertical walls);
points: the steepest line between two consecutive points; closed conduits
(circle, box) have no banks and are not checked.`,
		Basis: `roadside foreslopes of 4H:1V or flatter are recoverable and
3H:1V traversable but not recoverable for an errant vehicle (AASHTO
Roadside Design Guide, from memory); 3H:1V or flatter is the usual limit
for mowing grassed channels (common practice, no published source). The
default is 3.`,
		Sources: []string{
			"AASHTO, Roadside Design Guide: foreslopes 1V:4H recoverable, 1V:3H traversable (from memory)",
			"common practice (no published source): 3H:1V or flatter for mowing",
		},
		Remedies: `flatten the banks (a wider top), or where the manual allows
it, line and fence the channel or move it away from the roadway.`,
	},
	Check: checkSideSlope,
}

func checkSideSlope(ctx *Context, report func(Finding)) {
	limit := ctx.Config.Number("minimum")
	ctx.selectedReaches(func(r *model.Reach) {
		for _, p := range pieces(r) {
			if p.sec == nil {
				continue
			}
			z, attr, ok := steepestBank(p.sec)
			if !ok || z >= limit-1e-12*max(1, limit) {
				continue
			}
			f := pieceFinding(r, p, z, limit,
				fmt.Sprintf("side slope %s:1 (H:V) of section %q is steeper than the %s:1 the policy allows", numfmt.Num(z), p.sec.Name, numfmt.Num(limit)),
				fmt.Sprintf("flatten the banks to %s:1 or flatter", numfmt.Num(limit)))
			f.Focus = p.sec.At(attr)
			report(f)
		}
	})
}
