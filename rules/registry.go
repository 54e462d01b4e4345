package rules

import (
	"slices"
	"strings"

	"github.com/chanlint/chanlint/policies"
)

// registry holds every rule sorted by id. It is filled in init because
// some rules consult the registry (the model rule suggests ids).
var registry []*Rule

// language is the policy language of the registry's rules.
var language *policies.Language

func init() {
	registry = sorted([]*Rule{
		capacityRule,
		freeboardRule,
		froudeBandRule,
		headwaterRule,
		jumpContainmentRule,
		jumpTypeRule,
		maxVelocityRule,
		minVelocityRule,
		modelRule,
		outletVelocityRule,
		overtoppingRule,
		shearStressRule,
		solverRule,
		superelevationRule,
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
// third of its letters wrong), or "".
func suggest(id string) string {
	best, bestD := "", len(id)/3+1
	for _, r := range registry {
		if d := editDistance(id, r.ID); d < bestD {
			best, bestD = r.ID, d
		}
	}
	return best
}

// editDistance is the optimal-string-alignment distance between two
// strings, by bytes (rule ids are ASCII): insertions, deletions,
// substitutions and transpositions of adjacent letters each count one.
func editDistance(a, b string) int {
	d := make([][]int, len(a)+1)
	for i := range d {
		d[i] = make([]int, len(b)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(a)][len(b)]
}
