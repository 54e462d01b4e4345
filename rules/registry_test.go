package rules

import (
	"slices"
	"strings"
	"testing"

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
			assert.NotEmpty(t, strings.TrimSpace(r.Doc.Checks), "doc: what it checks")
			assert.NotEmpty(t, strings.TrimSpace(r.Doc.Formula), "doc: formula")
			assert.NotEmpty(t, strings.TrimSpace(r.Doc.Basis), "doc: basis")
			assert.NotEmpty(t, strings.TrimSpace(r.Doc.Remedies), "doc: remedies")
			if assert.NotEmpty(t, r.Doc.Sources, "doc: at least one source line") {
				for _, src := range r.Doc.Sources {
					assert.NotEmpty(t, strings.TrimSpace(src), "empty source line")
				}
			}
			for _, part := range []string{"What it checks", "Formula", "Settings", "Basis", "Sources", "Remedies"} {
				assert.Contains(t, r.Text(), part, "explain text part %q", part)
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

// TestRegistryMatchesPolicyLanguage: the policy language is built from
// the registry's specs, so every rule has a block (configurable or refused
// as always on) with the rule's default severity.
func TestRegistryMatchesPolicyLanguage(t *testing.T) {
	lang := Language()
	for _, r := range All() {
		spec := lang.Spec(r.ID)
		if assert.NotNil(t, spec, r.ID) {
			assert.Same(t, &r.RuleSpec, spec, r.ID)
			assert.NoError(t, spec.Validate(), r.ID)
		}
		assert.Equal(t, !r.AlwaysOn, slices.Contains(lang.Configurable(), r.ID), r.ID)
	}
}

func TestSuggest(t *testing.T) {
	assert.Equal(t, "freeboard", suggest("frebaord"))
	assert.Equal(t, "jump_type", suggest("jump-type"))
	assert.Equal(t, "", suggest("culvert_inlet"))

}
