package rules

import (
	"slices"
	"strings"

	suggestpkg "github.com/chanlint/chanlint/model/suggest"
	"github.com/chanlint/chanlint/policies"
)

// registry holds every rule sorted by id. It is filled in init because
// some rules consult the registry (the model rule suggests ids).
var registry []*Rule

// language is the policy language of the registry's rules.
var language *policies.Language

func init() {
	registry = sorted([]*Rule{
		bedSlopeRule,
		bendRadiusRule,
		bottomWidthRule,
		capacityRule,
		freeboardRule,
		froudeBandRule,
		headwaterRule,
		jumpContainmentRule,
		jumpTypeRule,
		maxVelocityRule,
		minVelocityRule,
		modelRule,
		noRiseRule,
		publicSafetyRule,
		outletVelocityRule,
		overtoppingRule,
		sensitivityRule,
		shearStressRule,
		sideSlopeRule,
		solverRule,
		superelevationRule,
		unmatchedSelectorRule,
		unusedExceptionRule,
	})
	specs := make([]*policies.RuleSpec, len(registry))
	for i, r := range registry {
		specs[i] = &r.RuleSpec
	}
	var err error
	if language, err = policies.NewLanguage(specs); err != nil {
		panic("rules: " + err.Error()) // a rule file declares an invalid spec
	}
}

// Language is the policy language of the registry: its loader decodes and
// validates every rule block from the rules' specs.
//
//	pol, diags := rules.Language().NewLoader(root).Resolve("baseline")
func Language() *policies.Language { return language }

func sorted(rs []*Rule) []*Rule {
	slices.SortFunc(rs, func(a, b *Rule) int { return strings.Compare(a.ID, b.ID) })
	return rs
}

// All returns every rule of the registry, sorted by id. The slice is a
// copy; the rules themselves are shared and must not be modified.
func All() []*Rule { return slices.Clone(registry) }

// Lookup returns the rule with the given id, or nil.
func Lookup(id string) *Rule {
	i, ok := slices.BinarySearchFunc(registry, id, func(r *Rule, id string) int {
		return strings.Compare(r.ID, id)
	})
	if !ok {
		return nil
	}
	return registry[i]
}

// suggest returns the registry id closest to a misspelt one (at most a
// third of its letters wrong, plus one so that two swapped letters count
// as one mistake), or "".
func suggest(id string) string {
	ids := make([]string, len(registry))
	for i, r := range registry {
		ids[i] = r.ID
	}
	return suggestpkg.Closest(id, ids, len(id)/3+1, nil)
}
