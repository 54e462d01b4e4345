package rules

import (
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestRegistry validates every rule value, the way a registry of analyzers
// is validated before use.
func TestRegistry(t *testing.T) {
	all := All()
	require.NotEmpty(t, all)
	assert.True(t, slices.IsSortedFunc(all, func(a, b *Rule) int { return strings.Compare(a.ID, b.ID) }), "All is sorted by id")
	seen := map[string]bool{}
	for _, r := range all {
		t.Run(r.ID, func(t *testing.T) {
			assert.NotEmpty(t, r.ID)
			assert.False(t, seen[r.ID], "duplicate id")
			seen[r.ID] = true
			assert.Regexp(t, `^[a-z][a-z_]*$`, r.ID)
			assert.NotEmpty(t, r.Title)
			assert.NotContains(t, r.Title, "\n", "title is one line")
			assert.Positive(t, r.Severity.Rank(), "valid default severity")
			assert.NotNil(t, r.Check)
			for _, part := range []string{"What it checks", "Formula", "Basis", "Remedies"} {
				assert.Contains(t, r.Doc, part+":", "doc part %q", part)
			}
			assert.Same(t, r, Lookup(r.ID))
		})
	}
	assert.Nil(t, Lookup("no_such_rule"))
	for _, id := range []string{"model", "solver", "capacity", "unused_exception"} {
		require.NotNil(t, Lookup(id), id)
		assert.True(t, Lookup(id).AlwaysOn, id)
	}
}

// TestRegistryMatchesPolicyLanguage: every id the policy language accepts
// has a rule, every rule that is not always on can be configured, and the
// default severities agree.
func TestRegistryMatchesPolicyLanguage(t *testing.T) {
	configurable := policies.Configurable()
	for _, id := range configurable {
		r := Lookup(id)
		if assert.NotNil(t, r, "policy rule %q has no rule", id) {
			assert.False(t, r.AlwaysOn, id)
			assert.Equal(t, policies.DefaultSeverity(id), r.Severity, id)
		}
	}
	for _, r := range All() {
		if !r.AlwaysOn {
			assert.Contains(t, configurable, r.ID, "rule %q cannot be configured", r.ID)
		}
	}
}

func TestSuggest(t *testing.T) {
	assert.Equal(t, "freeboard", suggest("frebaord"))
	assert.Equal(t, "jump_type", suggest("jump-type"))
	assert.Equal(t, "", suggest("culvert_inlet"))
	assert.Equal(t, 3, editDistance("kitten", "sitting")) // Source: the classic Levenshtein example (common practice)
}
