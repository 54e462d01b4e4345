package rules

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
)

var bottomWidthRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "bottom_width",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "minimum", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.Above(0), Required: true,
				Doc: "the least bottom width"},
		},
	},
	Title: "Bottom width no less than the policy's least",
	Doc: Doc{
		Checks: `the bottom width of every open section of every reach the
block applies to (the reach's own and its segments') against the least the
policy sets, so that the channel can be built and maintained with the
equipment the manual assumes and does not concentrate low flows into a
narrow, eroding thread. A finding covers the stretch with that section and
points at its bottom_width.`,
		Formula: `    fails where bottom_width < minimum
rectangle, trapezoid: bottom_width; triangle: 0 (a V has no bottom);
points sections are not checked (their bottom is not a single width) and
closed conduits are not channels to maintain from the bottom.`,
		Basis: `manuals set it by the equipment they assume (a mower or a
small excavator bucket), commonly 2 ft to 4 ft (0.6 m to 1.2 m) for
constructed channels (common practice, no published source), so the
policy must write it.`,
		Sources: []string{"common practice (no published source)"},
		Remedies: `widen the bottom (keeping the side slopes), or use a
trapezoid in place of a V-ditch.`,
	},
	Check: checkBottomWidth,
}

func checkBottomWidth(ctx *Context, report func(Finding)) {
	limit := ctx.Config.Number("minimum")
	lu := ctx.units().Length()
	ctx.selectedReaches(func(r *model.Reach) {
		for _, p := range pieces(r) {
			if p.sec == nil {
				continue
			}
			var b float64
			attr := "bottom_width"
			switch p.sec.Shape {
			case model.Rectangle, model.Trapezoid:
				b = p.sec.BottomWidth
			case model.Triangle:
				attr = "shape"
			default:
				continue
			}
			if b >= limit-1e-12*max(1, limit) {
				continue
			}
			f := pieceFinding(r, p, b, limit,
				fmt.Sprintf("bottom width %s %s of section %q is less than the least %s %s", numfmt.Num(b), lu, p.sec.Name, numfmt.Num(limit), lu),
				fmt.Sprintf("widen the bottom to at least %s %s", numfmt.Num(limit), lu))
			f.Focus, f.Unit = p.sec.At(attr), lu
			report(f)
		}
	})
}
