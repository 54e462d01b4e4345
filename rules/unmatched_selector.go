package rules

import (
	"fmt"
	"maps"
	"path"
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
	Title: "A policy block's selector or names match no event, reach or lining of the model",
	Doc: Doc{
		Checks: `every rule block of the policy that selects events (events,
return_period, event_classes) or reaches (reach_classes, shapes, linings)
must match at least one event on at least one reach of the model. A block
that matches nothing is a criterion the run silently did not apply: the
model names its events or classes differently from the manual the policy
carries, or lacks the return_period or class the selector reads. The
warning is reported at the model's units attribute and names the block, its
selection and where the policy wrote it.

It also compares the names a block writes with the model's: an events list
with a name that matches no event of the model but resembles one that the
block then leaves unchecked, and a per-lining table (limit = { concrete =
…, grass = … }) with a key that matches no lining of the model but
resembles one that then falls through to the default (or to no limit).
Both are how a renamed event or lining ("Q100" for "q100", "Concrete" for
"concrete") silently skips a criterion. The warning names the unmatched
keys and the model's names, and calls out names that differ only in case
(names are case-sensitive). A block that matches no event at all gets the
unmatched names in its warning too.`,
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
	top := m.UnitsRange // the model's first statement, where a model-wide finding points
	if top.Filename == "" {
		top = hcl.Range{Filename: m.File, Start: hcl.InitialPos, End: hcl.InitialPos}
	}
	linings := modelLinings(m)
	for _, id := range ruleIDs(p) {
		for _, b := range p.Rules[id].Blocks() {
			where := func() string {
				return fmt.Sprintf("the %s block at %s:%d", id, path.Base(b.File), b.DefRange.Start.Line)
			}
			events, renamed := eventKeys(b, m)
			if b.Selective() && !matchesSome(b, m) {
				msg := fmt.Sprintf("%s (%s) matches no event on any reach of this model, so it was not applied", where(), b.SelectorText())
				if events != "" {
					msg += "; " + events
				}
				report(Finding{Range: top, Message: msg, Reference: policies.Cite(p, b)})
				continue
			}
			if renamed {
				report(Finding{Range: top, Message: where() + ": " + events, Reference: policies.Cite(p, b)})
			}
			for _, lk := range liningKeys(b, linings) {
				report(Finding{Range: top, Message: where() + ": " + lk, Reference: policies.Cite(p, b)})
			}
		}
	}
}

// ruleIDs are the ids of the rules a policy configures, sorted: in the
// order of the registry, which is sorted, unless the policy names a rule
// the registry does not have (a policy built by hand), whose ids are then
// sorted afresh.
func ruleIDs(p *policies.Policy) []string {
	ids := make([]string, 0, len(p.Rules))
	for _, r := range registry {
		if _, ok := p.Rules[r.ID]; ok {
			ids = append(ids, r.ID)
		}
	}
	if len(ids) != len(p.Rules) {
		return slices.Sorted(maps.Keys(p.Rules))
	}
	return ids
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
