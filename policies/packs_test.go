package policies_test

import (
	"bufio"
	"bytes"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

func TestPacksLoadWithoutDiagnostics(t *testing.T) {
	names := policies.PackNames()
	assert.Equal(t, []string{"baseline", "baseline-us", "review", "strict"}, names)
	for _, n := range names {
		p, diags := rules.Language().Pack(n)
		require.Empty(t, diags, n)
		require.NotNil(t, p, n)
		assert.Equal(t, n, p.Name, "a pack's policy block carries the pack's name")
		assert.Equal(t, "pack:"+n, p.File)
		assert.NotEmpty(t, p.Reference, n)
		src, ok := policies.PackSource(n)
		require.True(t, ok)
		assert.Contains(t, string(src), `policy "`+n+`"`)
	}
	_, ok := policies.PackSource("nope")
	assert.False(t, ok)
	_, diags := rules.Language().Pack("nope")
	assert.True(t, diags.HasErrors())
}

// manualRules are the criteria a local manual sets by facility class or
// storm class (side slopes, bottom width, bed slope, public safety, bend
// radius, minimum velocity for the events it names): the screening packs
// leave them off; the review pack turns on those with a published value.
var manualRules = []string{"bed_slope", "bend_radius", "bottom_width", "min_velocity", "public_safety", "side_slope"}

func TestBaselineTurnsOnEveryRule(t *testing.T) {
	var screening []string
	for _, id := range rules.Language().Criteria() {
		if !slices.Contains(manualRules, id) {
			screening = append(screening, id)
		}
	}
	for _, n := range []string{"baseline", "baseline-us", "strict"} {
		p, diags := rules.Language().Pack(n)
		require.Empty(t, diags)
		assert.ElementsMatch(t, screening, keys(p.Rules), n)
	}
	review, diags := rules.Language().Pack("review")
	require.Empty(t, diags)
	assert.ElementsMatch(t, append(screening, "bend_radius", "min_velocity", "side_slope"), keys(review.Rules))
	assert.Equal(t, "2026.1", review.Version)
	for _, n := range []string{"baseline", "baseline-us", "strict", "review"} {
		p, _ := rules.Language().Pack(n)
		for id, rc := range p.Rules {
			assert.Equal(t, id, rc.Rule)
		}
	}
}

// numberRe finds a number in the code part of a line.
var numberRe = regexp.MustCompile(`(^|[^A-Za-z0-9_.])-?[0-9]+(\.[0-9]+)?`)

// sourceRe is what a comment must contain to name a source: a year of
// publication, or the marker for a value of the trade.
var sourceRe = regexp.MustCompile(`\b(1[89][0-9]{2}|20[0-9]{2})\b|common practice`)

// Every number in a pack file carries a comment naming its source, on the
// same line or in the comment lines directly above.
func TestEveryPackNumberNamesASource(t *testing.T) {
	for _, n := range policies.PackNames() {
		src, _ := policies.PackSource(n)
		var above []string // comment lines directly above the current line
		sc := bufio.NewScanner(bytes.NewReader(src))
		line := 0
		numbers := 0
		for sc.Scan() {
			line++
			text := sc.Text()
			code, comment, _ := strings.Cut(text, "#")
			if strings.TrimSpace(code) == "" {
				if strings.TrimSpace(comment) != "" {
					above = append(above, comment)
				} else {
					above = nil
				}
				continue
			}
			if strings.Contains(code, `"`) { // quoted text (names, references) is not a setting
				code = regexp.MustCompile(`"[^"]*"`).ReplaceAllString(code, `""`)
			}
			if numberRe.MatchString(code) {
				numbers++
				context := comment + " " + strings.Join(above, " ")
				assert.Regexp(t, sourceRe, context, "%s line %d: %q has no comment naming a source", n, line, text)
			}
			above = nil
		}
		assert.Positive(t, numbers, n)
	}
}

// The US pack says the same as the SI baseline, within the rounding of the
// SI pack to 0.01 m/s and 3 significant digits of stress.
func TestBaselineAndBaselineUSAgree(t *testing.T) {
	si, _ := rules.Language().Pack("baseline")
	us, _ := rules.Language().Pack("baseline-us")
	conv := us.In(model.SI)
	for id, a := range si.Rules {
		b := conv.Rules[id]
		require.NotNil(t, b, id)
		assert.Equal(t, a.Severity, b.Severity, id)
		assert.Equal(t, a.Bands("avoid"), b.Bands("avoid"), id)
		assert.Equal(t, a.Number("fraction"), b.Number("fraction"), id)
		assert.Equal(t, a.Number("subcritical_coefficient"), b.Number("subcritical_coefficient"), id)
		assert.Equal(t, a.Number("supercritical_coefficient"), b.Number("supercritical_coefficient"), id)
		// 1 ft = 0.3048 m, so 0.3 m against 1 ft differs by 1.6 %.
		assert.True(t, scalar.EqualWithinAbsOrRel(a.Number("minimum"), b.Number("minimum"), 1e-9, 0.02), "%s minimum %g vs %g", id, a.Number("minimum"), b.Number("minimum"))
		assert.Equal(t, a.Table("limit").HasDefault, b.Table("limit").HasDefault, id)
		// concrete 6.0 m/s against 20 ft/s (6.096 m/s) and riprap 3.0 m/s
		// against 10 ft/s (3.048 m/s) are the largest roundings, 1.6 %.
		assert.True(t, scalar.EqualWithinAbsOrRel(a.Table("limit").Default, b.Table("limit").Default, 1e-9, 0.02), id)
		assert.Equal(t, a.Table("limit").NoLimit, b.Table("limit").NoLimit, id)
		require.Equal(t, len(a.Table("limit").Values), len(b.Table("limit").Values), id)
		for k, v := range a.Table("limit").Values {
			assert.True(t, scalar.EqualWithinAbsOrRel(v, b.Table("limit").Values[k], 1e-9, 0.02), "%s %s: %g vs %g", id, k, v, b.Table("limit").Values[k])
		}
	}
}

func TestStrictIsTighterThanBaseline(t *testing.T) {
	base, _ := rules.Language().Pack("baseline")
	strict, _ := rules.Language().Pack("strict")
	assert.Equal(t, []string{"pack:strict", "pack:baseline"}, strict.Chain)
	assert.GreaterOrEqual(t, strict.Rules["freeboard"].Number("minimum"), base.Rules["freeboard"].Number("minimum"))
	assert.Greater(t, strict.Rules["freeboard"].Number("fraction"), base.Rules["freeboard"].Number("fraction"))
	for id, rc := range strict.Rules {
		assert.GreaterOrEqual(t, rc.Severity.Rank(), base.Rules[id].Severity.Rank(), id)
	}
	assert.Equal(t, "pack:baseline", strict.Rules["max_velocity"].File, "inherited unchanged")
}

// Format writes HCL that loads back to the same effective policy.
func TestFormatRoundTrip(t *testing.T) {
	root, err := filepath.Abs("..")
	require.NoError(t, err)
	var cases []*policies.Policy
	for _, n := range policies.PackNames() {
		p, _ := rules.Language().Pack(n)
		cases = append(cases, p, p.In(model.US), p.In(model.SI))
	}
	p, diags := rules.Language().NewLoader(root).Load(filepath.Join(root, "testdata", "policies", "reviewer.policy.hcl"))
	require.Empty(t, diags)
	cases = append(cases, p)
	for _, want := range cases {
		text := policies.Format(want)
		assert.Contains(t, string(text), "# Merged from (child first): "+strings.Join(want.Chain, " → "))
		assert.Contains(t, string(text), map[model.Units]string{model.SI: "velocities in m/s", model.US: "velocities in ft/s"}[want.Units])
		got, diags, _ := loadSource(t, string(text))
		require.Empty(t, diags, "%s", text)
		assert.Equal(t, want.Name, got.Name)
		assert.Equal(t, want.Units, got.Units)
		assert.Equal(t, want.Reference, got.Reference)
		assert.Equal(t, want.Exceptions, got.Exceptions)
		require.ElementsMatch(t, keys(want.Rules), keys(got.Rules))
		for id, w := range want.Rules {
			g := got.Rules[id]
			// Converted numbers are printed to 6 significant digits: at
			// most half a unit of the sixth digit, 5e-6 relative.
			const rel = 5e-6
			assert.Equal(t, w.Severity, g.Severity, id)
			assert.Equal(t, w.Events, g.Events, id)
			assert.Equal(t, w.Bands("avoid"), g.Bands("avoid"), id)
			assert.True(t, scalar.EqualWithinAbsOrRel(w.Number("minimum"), g.Number("minimum"), 0, rel), id)
			assert.Equal(t, w.Number("fraction"), g.Number("fraction"), id)
			assert.Equal(t, w.Number("subcritical_coefficient"), g.Number("subcritical_coefficient"), id)
			assert.Equal(t, w.Number("supercritical_coefficient"), g.Number("supercritical_coefficient"), id)
			assert.Equal(t, w.Table("limit").HasDefault, g.Table("limit").HasDefault, id)
			assert.True(t, scalar.EqualWithinAbsOrRel(w.Table("limit").Default, g.Table("limit").Default, 0, rel), id)
			assert.Equal(t, w.Table("limit").NoLimit, g.Table("limit").NoLimit, id)
			for k, v := range w.Table("limit").Values {
				assert.True(t, scalar.EqualWithinAbsOrRel(v, g.Table("limit").Values[k], 0, rel), "%s %s", id, k)
			}
		}
	}
}

func TestFormatQuotesOddLiningWords(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units = "si"
  max_velocity { limit = { "dumped riprap" = 3.0, concrete = 6 } }
  min_velocity {
    limit  = 0.6
    events = ["q2", "q10"]
  }
}`)
	require.Empty(t, diags)
	text := string(policies.Format(p))
	assert.Contains(t, text, `"dumped riprap" = 3`)
	assert.Contains(t, text, `concrete`)
	assert.Contains(t, text, `events          = ["q2", "q10"]`)
	assert.NotContains(t, text, "extends", "the effective policy is already merged")
}

// TestFormatKeepsPackCitations: `policy show` of a pack keeps the source
// notes the pack writes beside its numbers, inline ones with their key.
func TestFormatKeepsPackCitations(t *testing.T) {
	p, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), "%v", diags)
	text := string(policies.Format(p))
	// Source: the pack's own comments (policies/packs/baseline.policy.hcl).
	assert.Contains(t, text, "#   concrete: ≈ 20 ft/s")
	assert.Contains(t, text, "Peterka, USBR")
	assert.Contains(t, text, "superseded by Kilgore & Cotton's 3rd edition")
	assert.NotContains(t, text, "HEC-11 (1989) p. 38")
}
