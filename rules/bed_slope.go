package rules

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
)

var bedSlopeRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "bed_slope",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "minimum", Kind: policies.PerLining, Quantity: policies.Grade, Bounds: policies.AtLeast(0),
				Doc: "the least bed slope by lining word, for drainage"},
			{Name: "maximum", Kind: policies.PerLining, Quantity: policies.Grade, Bounds: policies.Above(0),
				Doc: "the greatest bed slope by lining word, for stability"},
		},
		Together: []policies.Group{{Settings: []string{"minimum", "maximum"}, Need: policies.AtLeastOne,
			Note: "the slope must lie between them"}},
	},
	Title: "Bed slope within the range the policy sets for the lining",
	Doc: Doc{
		Checks: `the longitudinal bed slope of every reach the block applies
to, against the least slope (so the channel drains and does not pond) and
the greatest slope (so the lining stays stable) the policy sets for the
lining word of each section of the reach. A reach with segments is judged
stretch by stretch, each by its own section's lining. A finding covers
the stretch and points at the reach's slope (or invert).`,
		Formula: `    S0 = (invert up − invert down) / length   (rise over run)
    fails where S0 < minimum(lining) or S0 > maximum(lining)
An adverse or horizontal reach (S0 ≤ 0) fails any positive minimum.`,
		Basis: `a least slope of about 0.5 % for grassed channels and
0.2 % to 0.3 % for paved ones, and a greatest one above which a lining
erodes or supercritical flow becomes the design condition, are common in
local criteria (common practice, no published source); the numbers belong
to the manual the policy carries, so the policy must write them.`,
		Sources: []string{"common practice (no published source)"},
		Remedies: `regrade the reach; below the least slope add a paved low-flow
channel or a steeper invert, above the greatest add drops (grade control)
or a stronger lining.`,
	},
	Check: checkBedSlope,
}

func checkBedSlope(ctx *Context, report func(Finding)) {
	lo, hi := ctx.Config.Table("minimum"), ctx.Config.Table("maximum")
	ctx.selectedReaches(func(r *model.Reach) {
		attr := "slope"
		if r.HasInvert {
			attr = "invert"
		}
		s := r.Slope
		for _, p := range pieces(r) {
			if p.sec == nil {
				continue
			}
			lining := p.sec.Lining
			var f Finding
			if v, ok := lo.For(lining); ok && s < v-1e-12 {
				f = pieceFinding(r, p, s, v,
					fmt.Sprintf("bed slope %s is flatter than the least %s for %s", numfmt.Num(s), numfmt.Num(v), liningWord(lining)),
					fmt.Sprintf("steepen the bed to at least %s, or add a paved low-flow channel", numfmt.Num(v)))
			} else if v, ok := hi.For(lining); ok && s > v+1e-12 {
				f = pieceFinding(r, p, s, v,
					fmt.Sprintf("bed slope %s is steeper than the greatest %s for %s", numfmt.Num(s), numfmt.Num(v), liningWord(lining)),
					fmt.Sprintf("flatten the bed to at most %s with drops, or use a stronger lining", numfmt.Num(v)))
			} else {
				continue
			}
			f.Focus = r.At(attr)
			report(f)
		}
	})
}

// liningWord names a lining in a message: `lining "grass"`, or "a section
// without a lining word".
func liningWord(lining string) string {
	if lining == "" {
		return "a section without a lining word"
	}
	return fmt.Sprintf("lining %q", lining)
}
