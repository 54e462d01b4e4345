package rules

import (
	"fmt"
	"maps"
	"slices"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/hashicorp/hcl/v2"
)

const unmatchedSelectorID = "unmatched_selector"

var unmatchedSelectorRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       unmatchedSelectorID,
		Severity: policies.Warning,
		AlwaysOn: true,
	},
	Title: "A policy block's selector matches no event or reach of the model",
	Doc: Doc{
		Checks: `every rule block of the policy that selects events (events,
return_period, event_classes) or reaches (reach_classes, shapes, linings)
must match at least one event on at least one reach of the model. A block
that matches nothing is a criterion the run silently did not apply: the
model names its events or classes differently from the manual the policy
carries, or lacks the return_period or class the selector reads. The
warning is reported at the top of the model file and names the block, its
selection and where the policy wrote it.`,
		Formula: `none; it compares the block's selector with the model's events and reaches.`,
		Basis: `a check that applied to nothing must not read as a pass
(common practice, no published source).`,
		Sources: []string{"common practice (no published source)"},
		Remedies: `give the model's events a return_period and class and its
reaches a class, as the policy's manual names them; or correct the
selector; or, if the criterion does not concern this model, say so to the
reviewer.`,
	},
	Check: checkUnmatchedSelectors,
}

func checkUnmatchedSelectors(ctx *Context, report func(Finding)) {
	m, p := ctx.Model, ctx.Policy
	if m == nil || p == nil {
		return
	}
	top := hcl.Range{Filename: m.File, Start: hcl.InitialPos, End: hcl.InitialPos}
	for _, id := range slices.Sorted(maps.Keys(p.Rules)) {
		for _, b := range p.Rules[id].Blocks() {
			if !b.Selective() || matchesSome(b, m) {
				continue
			}
			report(Finding{
				Range: top,
				Message: fmt.Sprintf("the %s block at %s:%d (%s) matches no event on any reach of this model, so it was not applied",
					id, b.File, b.DefRange.Start.Line, b.SelectorText()),
				Reference: policies.Cite(p, b),
			})
		}
	}
}

// matchesSome reports whether the block's selector admits some event of
// the model on some reach.
func matchesSome(b *policies.RuleConfig, m *model.Model) bool {
	for _, ev := range m.Events {
		if !b.MatchesEvent(ev) {
			continue
		}
		for _, r := range m.Reaches {
			if b.MatchesReach(r) {
				return true
			}
		}
	}
	return false
}
