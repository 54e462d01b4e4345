package rules

import "github.com/chanlint/chanlint/policies"

// NoRiseID is the id of the no_rise block, judged by `chanlint diff`
// between an existing and a proposed model (see revdiff).
const NoRiseID = "no_rise"

var noRiseRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       NoRiseID,
		Severity: policies.Error,
		OptIn:    true,
		Settings: []policies.Setting{
			{Name: "limit", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0), Required: true,
				Doc: "the largest rise of the proposed water surface over the existing one"},
		},
	},
	Title: "Proposed water surface no higher than the existing one plus a limit",
	Doc: Doc{
		Checks: `in a revision diff (chanlint diff OLD NEW), at every computed
point of the proposed model, on each reach and event the block selects
(events, return_period, event_classes, reach_classes, shapes, linings),
the rise of the water surface over the existing model's at the same
station of the same reach. The finding gives the span where the rise
exceeds the limit (its ends interpolated linearly between computed
points) and the largest rise. A single model has nothing to compare, so
chanlint check never reports it.`,
		Formula: `    rise(x) = WSE_proposed(x) − WSE_existing(x);  fails where rise > limit
WSE_existing is interpolated linearly between the existing model's computed
points; stations beyond the existing reach's length are not compared.`,
		Basis: `Floodplain reviews ask that an encroachment or a channel change
raise the base-flood water surface by no more than a stated amount: 1.0 ft
is the U.S. national floodway standard (44 CFR 60.3(d)(3), from memory),
and many communities require no rise at all (0.00 ft) or a few hundredths
of a foot within the floodway (common practice, no published source). The
limit is the reviewer's to set.`,
		Sources: []string{
			"44 CFR 60.3(d)(3), floodway encroachment (from memory)",
			"common practice (no published source)",
		},
		Remedies: `restore conveyance where the surface rises (widen, lower or
smooth the section), compensate upstream or downstream, or move the
encroachment out of the effective flow area.`,
	},
	Check: func(*Context, func(Finding)) {},
}
