package policies_test

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Selector diagnostics, each at the value (or block) to change.
func TestSelectorDiagnostics(t *testing.T) {
	cases := []struct{ name, src, summary, detail, at string }{
		{"tie", `policy "x" {
  units = "si"
  freeboard {
    reach_classes = ["roadside-ditch"]
    minimum       = 0.3
  }
  freeboard {
    return_period = [50, null]
    minimum       = 0.6
  }
}`, "Rule blocks tie", "the one at", "freeboard {\n    return_period"},
		{"same selector", `policy "x" {
  units = "si"
  freeboard {
    shapes  = ["trapezoid"]
    minimum = 0.3
  }
  freeboard {
    shapes  = ["trapezoid"]
    minimum = 0.6
  }
}`, "Duplicate rule block", "for shapes trapezoid", "freeboard {\n    shapes  = [\"trapezoid\"]\n    minimum = 0.6"},
		{"return period zero", `policy "x" {
  units = "si"
  freeboard {
    return_period = [0, 10]
    minimum       = 0.3
  }
}`, `Invalid value for "return_period"`, "positive number of years", "0"},
		{"return period reversed", `policy "x" {
  units = "si"
  freeboard {
    return_period = [100, 10]
    minimum       = 0.3
  }
}`, `Invalid value for "return_period"`, "not be above the high end", "[100, 10]"},
		{"return period open both", `policy "x" {
  units = "si"
  freeboard {
    return_period = [null, null]
    minimum       = 0.3
  }
}`, `Invalid value for "return_period"`, "give at least one end", "[null, null]"},
		{"unknown shape", `policy "x" {
  units = "si"
  freeboard {
    shapes  = ["oval"]
    minimum = 0.3
  }
}`, "Invalid shape", "The shapes are rectangle", `"oval"`},
		{"bad class word", `policy "x" {
  units = "si"
  freeboard {
    reach_classes = ["roadside ditch"]
    minimum       = 0.3
  }
}`, "Invalid class word", "letters, digits", `"roadside ditch"`},
		{"min velocity for every event", `policy "x" {
  units = "si"
  min_velocity {
    limit = 0.6
  }
}`, "Missing min_velocity events", "return_period = [null, 2]", "min_velocity"},
		{"empty list", `policy "x" {
  units = "si"
  freeboard {
    linings = []
    minimum = 0.3
  }
}`, `Invalid value for "linings"`, "non-empty list", "[]"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p, diags, _ := loadSource(t, tc.src)
			require.True(t, diags.HasErrors(), "want an error")
			assert.Nil(t, p)
			var found bool
			for _, d := range errorsOnly(diags) {
				if d.Summary != tc.summary {
					continue
				}
				found = true
				assert.Contains(t, d.Detail, tc.detail)
				start, _ := span(t, tc.src, tc.at)
				require.NotNil(t, d.Subject)
				assert.Equal(t, start.Line, d.Subject.Start.Line, "line")
				assert.Equal(t, start.Column, d.Subject.Start.Column, "column")
			}
			assert.True(t, found, "want %q; got %v", tc.summary, diags)
		})
	}
}

// Disjoint selections of equal specificity do not tie, and a more
// specific block inside a less specific one is fine; policy show writes
// every block, the resolution order, and loads back to the same blocks.
func TestSelectorsLoadAndShow(t *testing.T) {
	src := `policy "x" {
  units   = "si"
  version = "3"
  freeboard {
    reach_classes = ["roadside-ditch"]
    minimum       = 0.3
  }
  freeboard {
    reach_classes = ["constructed"]
    minimum       = 0.5
  }
  freeboard {
    reach_classes = ["constructed"]
    return_period = [10, 50]
    event_classes = ["minor"]
    minimum       = 0.4
    section       = "7.1"
  }
  freeboard {
    shapes        = ["points"]
    reach_classes = ["natural-stream"]
    events        = ["q100"]
    minimum       = 0.6
  }
}`
	p, diags, _ := loadSource(t, src)
	require.False(t, diags.HasErrors(), "%v", diags)
	require.Len(t, p.Rules["freeboard"].Blocks(), 4)
	assert.Equal(t, "3", p.Version)
	text := string(policies.Format(p))
	assert.Contains(t, text, "# freeboard: the most specific matching block applies:")
	assert.Contains(t, text, "#   1. return period 10–50 years; event classes minor; reach classes constructed (specificity 3")
	assert.Contains(t, text, "#   2. events q100; reach classes natural-stream; shapes points (specificity 3")
	back, diags, _ := loadSource(t, text)
	require.False(t, diags.HasErrors(), "%v\n%s", diags, text)
	require.Len(t, back.Rules["freeboard"].Blocks(), 4)
	for i, b := range p.Rules["freeboard"].Blocks() {
		g := back.Rules["freeboard"].Blocks()[i]
		assert.Equal(t, b.SelectorText(), g.SelectorText())
		assert.Equal(t, b.Number("minimum"), g.Number("minimum"))
		assert.Equal(t, b.Section, g.Section)
	}
	// In another unit system every block is converted.
	us := p.In(model.US)
	for i, b := range us.Rules["freeboard"].Blocks() {
		assert.InDelta(t, p.Rules["freeboard"].Blocks()[i].Number("minimum")/0.3048, b.Number("minimum"), 1e-9)
	}
	// A child's blocks for a rule replace all of the parent's.
	dir := writeTree(t, map[string]string{
		"base.policy.hcl":  src,
		"child.policy.hcl": "policy \"c\" {\n  units = \"si\"\n  extends = \"base.policy.hcl\"\n  freeboard {\n    minimum = 0.2\n  }\n}\n",
	})
	c, diags := rules.Language().NewLoader(dir).Load(dir + "/child.policy.hcl")
	require.False(t, diags.HasErrors(), "%v", diags)
	require.Len(t, c.Rules["freeboard"].Blocks(), 1)
	assert.Equal(t, "3", c.Version, "version inherited")
}

// Matching: reach selectors read the reach's class and its section's shape
// and lining; event selectors its name, return period and class.
func TestSelectorMatching(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units = "si"
  freeboard {
    return_period = [10, 100]
    event_classes = ["major"]
    reach_classes = ["ditch"]
    shapes        = ["trapezoid"]
    linings       = ["grass"]
    minimum       = 0.3
  }
}`)
	require.False(t, diags.HasErrors(), "%v", diags)
	b := p.Rules["freeboard"]
	sec := &model.Section{Shape: model.Trapezoid, Lining: "grass"}
	r := &model.Reach{Class: "ditch", Section: sec}
	ev := &model.Event{Name: "q", ReturnPeriod: 100, Class: "major"}
	assert.True(t, b.MatchesEvent(ev) && b.MatchesReach(r))
	for _, e := range []model.Event{{Name: "q", ReturnPeriod: 101, Class: "major"}, {Name: "q", ReturnPeriod: 9.9, Class: "major"},
		{Name: "q", Class: "major"}, {Name: "q", ReturnPeriod: 50, Class: "minor"}} {
		assert.False(t, b.MatchesEvent(&e), "%+v", e)
	}
	for _, x := range []*model.Reach{{Class: "other", Section: sec}, {Class: "ditch"},
		{Class: "ditch", Section: &model.Section{Shape: model.Rectangle, Lining: "grass"}},
		{Class: "ditch", Section: &model.Section{Shape: model.Trapezoid, Lining: "concrete"}}} {
		assert.False(t, b.MatchesReach(x), "%+v", x)
	}
	assert.Equal(t, 5, b.Specificity())
}
