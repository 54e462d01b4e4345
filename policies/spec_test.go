package policies_test

import (
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// testSpecs is a language of two invented rules, to test the generic
// decoding apart from the registry's rules.
func testSpecs() []*policies.RuleSpec {
	return []*policies.RuleSpec{
		{ID: "clearance", Severity: policies.Warning, Settings: []policies.Setting{
			{Name: "low", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.AtLeast(0), Doc: "low end"},
			{Name: "high", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.Within(0, 10), Default: 5, Doc: "high end"},
		}, Together: []policies.Group{{Settings: []string{"low", "high"}, Need: policies.AllOrNone}}},
		{ID: "watch", Severity: policies.Info, AlwaysOn: true},
	}
}

func loadWith(t *testing.T, lang *policies.Language, src string) (*policies.Policy, []string) {
	t.Helper()
	dir := t.TempDir()
	p, diags := lang.NewLoader(dir).LoadSource(filepath.Join(dir, "p.policy.hcl"), []byte(src))
	var out []string
	for _, d := range diags {
		out = append(out, d.Summary+": "+d.Detail)
	}
	return p, out
}

func TestGenericDecoding(t *testing.T) {
	lang, err := policies.NewLanguage(testSpecs())
	require.NoError(t, err)
	assert.Equal(t, []string{"clearance"}, lang.Configurable())

	p, diags := loadWith(t, lang, "policy \"x\" {\n  units = \"us\"\n  clearance {\n    low = 1\n    high = 2\n  }\n}\n")
	require.Empty(t, diags)
	c := p.Rules["clearance"]
	assert.Equal(t, 1.0, c.Number("low"))
	assert.Equal(t, policies.Warning, c.Severity)
	// Source: 1 ft = 0.3048 m exactly (international foot, 1959).
	assert.InDelta(t, 0.6096, p.In("si").Rules["clearance"].Number("high"), 1e-12)
	assert.Equal(t, "low 1 ft; high 2 ft", c.Summary("us", numfmt.Written))

	_, diags = loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  clearance {\n    low = 1\n  }\n}\n")
	require.Len(t, diags, 1)
	assert.Equal(t, "Missing clearance setting: low and high go together: with low also set high.", diags[0])

	_, diags = loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  clearance {\n    low = 1\n    high = 11\n  }\n}\n")
	require.Len(t, diags, 1)
	assert.Equal(t, `Invalid value for "high": high must be a length from 0 to 10; got 11.`, diags[0])

	_, diags = loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  watch {}\n}\n")
	require.Len(t, diags, 1)
	assert.Contains(t, diags[0], "Rule is always on")
}

func TestNewLanguageRefusesBadSpecs(t *testing.T) {
	for name, mutate := range map[string]func(s []*policies.RuleSpec){
		"no severity":          func(s []*policies.RuleSpec) { s[0].Severity = "" },
		"bad id":               func(s []*policies.RuleSpec) { s[0].ID = "Clear-ance" },
		"twice":                func(s []*policies.RuleSpec) { s[1].ID = "clearance"; s[1].AlwaysOn = false },
		"reserved name":        func(s []*policies.RuleSpec) { s[0].Settings[0].Name = "events" },
		"no doc":               func(s []*policies.RuleSpec) { s[0].Settings[0].Doc = "" },
		"default out of range": func(s []*policies.RuleSpec) { s[0].Settings[1].Default = 20 },
		"unknown group member": func(s []*policies.RuleSpec) { s[0].Together[0].Settings[1] = "hgih" },
		"always on settings":   func(s []*policies.RuleSpec) { s[1].Settings = s[0].Settings },
		"below unknown":        func(s []*policies.RuleSpec) { s[0].Settings[0].Below = "watch.limit" },
	} {
		specs := testSpecs()
		mutate(specs)
		_, err := policies.NewLanguage(specs)
		assert.ErrorIs(t, err, policies.ErrSpec, name)
	}
}

// TestChoiceSetting: a Choice setting takes one of its words, defaults to
// the first, is written back by `policy show` and refuses other words with
// a hint; it is not converted between unit systems.
func TestChoiceSetting(t *testing.T) {
	specs := []*policies.RuleSpec{{ID: "stress", Severity: policies.Error, Settings: []policies.Setting{
		{Name: "quantity", Kind: policies.Choice, Choices: []string{"maximum", "mean"}, Doc: "which stress"},
	}}}
	lang, err := policies.NewLanguage(specs)
	require.NoError(t, err)
	p, diags := loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  stress {}\n}\n")
	require.Empty(t, diags)
	assert.Equal(t, "maximum", p.Rules["stress"].Word("quantity"))
	p, diags = loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  stress {\n    quantity = \"mean\"\n  }\n}\n")
	require.Empty(t, diags)
	assert.Equal(t, "mean", p.In("us").Rules["stress"].Word("quantity"))
	assert.Equal(t, "quantity mean", p.Rules["stress"].Summary("si", numfmt.Written))
	assert.Contains(t, string(policies.Format(p)), `quantity = "mean"`)
	_, diags = loadWith(t, lang, "policy \"x\" {\n  units = \"si\"\n  stress {\n    quantity = \"maen\"\n  }\n}\n")
	require.Len(t, diags, 1)
	assert.Equal(t, `Invalid quantity: quantity must be one of "maximum", "mean"; got "maen". Did you mean "mean"?`, diags[0])
	assert.Equal(t, `quantity: which stress; "maximum" or "mean"; default "maximum"`, specs[0].Settings[0].Line())

	bad := []*policies.RuleSpec{{ID: "stress", Severity: policies.Error, Settings: []policies.Setting{
		{Name: "quantity", Kind: policies.Choice, Choices: []string{"maximum"}, Doc: "which stress"},
	}}}
	_, err = policies.NewLanguage(bad)
	assert.ErrorIs(t, err, policies.ErrSpec)
}
