package rules

import (
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestGoldenClasses: per-class criteria on a model with two reach classes
// and three events of two storm classes. Each (event, reach) takes the
// most specific matching block; the expected freeboards and velocities
// follow from Manning's equation for the rectangle (the test's own
// bisection), and the limits are the selected blocks' numbers.
func TestGoldenClasses(t *testing.T) {
	m, _, fs := golden(t, "classes.chan.hcl", "classes.policy.hcl")
	var unmatched []Finding
	var rest []Finding
	for _, f := range fs {
		if f.Rule == unmatchedSelectorID {
			unmatched = append(unmatched, f)
		} else {
			rest = append(rest, f)
		}
	}
	src, err := os.ReadFile(filepath.Join(goldenDir, "classes.chan.hcl"))
	require.NoError(t, err)
	got := matchWants(t, src, "", rest)
	flows := map[string]float64{"frequent": 1.0, "design": 3.0, "flood": 4.0}
	// Source: Manning's equation (Chow 1959, ch. 5); freeboard = height −
	// depth (common practice, no published source).
	for w, f := range got {
		y := manningNormalDepth(siUnits, flows[w.Event], 3.0, 0.015, 0.001)
		switch w.Rule {
		case "freeboard":
			limit := map[string]float64{"design": 0.8, "flood": 0.6}[w.Event]
			assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, 1.45-y, 1e-6, 1e-6), "%s %s: %g", w.Event, f.Reach, f.Value)
			assert.Equal(t, limit, f.Limit, "%s %s", w.Event, f.Reach)
			section := map[string]string{"design": "4.4", "flood": "4.2"}[w.Event]
			assert.Equal(t, "golden test manual (version 2026.1), section "+section, f.Reference)
		case "max_velocity":
			assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, flows[w.Event]/(3*y), 1e-6, 1e-6), "%g", f.Value)
			assert.Equal(t, 1.4, f.Limit)
		}
	}
	require.Len(t, unmatched, 1)
	u := unmatched[0]
	assert.Equal(t, m.File, u.File())
	assert.Contains(t, u.Message, "return period up to 20 years; reach classes natural-stream")
	assert.Contains(t, u.Message, "classes.policy.hcl:30")
	assert.Equal(t, "warning", string(u.Severity))
}

// TestResolveSpecificity: the most specific matching block applies; a
// block that does not match is never chosen; without a match the rule
// does not apply.
func TestResolveSpecificity(t *testing.T) {
	m, _, _ := golden(t, "classes.chan.hcl", "classes.policy.hcl")
	p, diags := Language().NewLoader("..").Load(filepath.Join(goldenDir, "classes.policy.hcl"))
	require.False(t, diags.HasErrors(), "%v", diags)
	fb := p.Rules["freeboard"]
	ev := map[string]int{"frequent": 0, "design": 1, "flood": 2}
	reach := map[string]int{"ditch": 0, "channel": 1}
	for _, c := range []struct {
		event, reach, section string
	}{
		{"frequent", "ditch", "4.4"}, {"design", "ditch", "4.4"}, {"flood", "ditch", "4.3"},
		{"frequent", "channel", "4.1"}, {"design", "channel", "4.1"}, {"flood", "channel", "4.2"},
	} {
		b := fb.Resolve(m.Events[ev[c.event]], m.Reaches[reach[c.reach]])
		require.NotNil(t, b, "%s on %s", c.event, c.reach)
		assert.Equal(t, c.section, b.Section, "%s on %s", c.event, c.reach)
	}
	mv := p.Rules["max_velocity"]
	assert.Equal(t, "6.2", mv.Resolve(m.Events[2], m.Reaches[0]).Section)
	assert.Equal(t, "", mv.Resolve(m.Events[0], m.Reaches[0]).Section)
	// An event without a return period or class matches no selector on it.
	bare := *m.Events[2]
	bare.ReturnPeriod, bare.Class = 0, ""
	assert.Equal(t, "4.1", fb.Resolve(&bare, m.Reaches[1]).Section)
	assert.Equal(t, "", mv.Resolve(&bare, m.Reaches[1]).Section)
	assert.False(t, math.IsNaN(bare.ReturnPeriod))
	text := string(policies.Format(p))
	assert.Contains(t, text, "freeboard: the most specific matching block applies:")
	assert.Contains(t, text, "1. return period 50 years or more; reach classes roadside-ditch (specificity 2")
	assert.Regexp(t, `version +=  *"2026.1"`, text)
	assert.Regexp(t, `section += "4.3"`, text)
}
