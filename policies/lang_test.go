package policies_test

import (
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Every construct of the language, written once.
const everyConstruct = `policy "alder-review" {
  units      = "us"
  reference  = "Alder County Drainage Manual, ch. 5"
  exceptions = "deny"

  freeboard {
    minimum  = 1.0
    fraction = 0.25
    severity = "warning"
    events   = ["q100", "q10"]
  }
  max_velocity {
    limit = { concrete = 20.0, "dumped riprap" = 9.5, rock = null, default = 3.0 }
  }
  min_velocity {
    limit         = 2.0
    enabled       = true
    return_period = [null, 2]
  }
  froude_band {
    avoid = [[1.5, 2.0], [0.86, 1.13]]
  }
  side_slope {
    minimum       = 4
    reach_classes = ["roadside-ditch"]
    section       = "5.4.1"
  }
  bottom_width {
    minimum = 2
  }
  bed_slope {
    minimum = { grass = 0.005, default = 0.002 }
    maximum = 0.05
  }
  public_safety {
    depth_velocity = 4.3
  }
  bend_radius {}
  jump_containment {}
  jump_type {
    avoid    = [[2.5, 4.5]]
    severity = "info"
  }
  superelevation {
    subcritical_coefficient = 0.6
    minimum                 = 0.5
  }
  shear_stress {
    limit = { grass = 0.6, earth = 0.075 }
  }
  headwater {
    max_hw_d  = 1.2
    freeboard = 1.5
  }
  overtopping {
    max_depth = 0.5
    events    = ["q100"]
  }
  outlet_velocity {
    limit = { riprap = 10.0, default = 4.0 }
  }
}
`

func TestParseEveryConstruct(t *testing.T) {
	p, diags, path := loadSource(t, everyConstruct)
	require.Empty(t, diags)
	require.NotNil(t, p)

	assert.Equal(t, "alder-review", p.Name)
	assert.Equal(t, model.US, p.Units)
	assert.Equal(t, "Alder County Drainage Manual, ch. 5", p.Reference)
	assert.Equal(t, "deny", p.Exceptions)
	assert.Equal(t, []string{path}, p.Chain)
	assert.ElementsMatch(t, rules.Language().Criteria(), keys(p.Rules))

	fb := p.Rules["freeboard"]
	assert.Equal(t, 1.0, fb.Number("minimum"))
	assert.Equal(t, 0.25, fb.Number("fraction"))
	assert.Equal(t, policies.Warning, fb.Severity)
	assert.Equal(t, []string{"q100", "q10"}, fb.Events)
	assert.True(t, fb.AppliesTo("q10"))
	assert.False(t, fb.AppliesTo("q2"))
	assert.Equal(t, path, fb.File)
	assert.Equal(t, 6, fb.DefRange.Start.Line)
	start, _ := span(t, everyConstruct, "0.25")
	assert.Equal(t, start, fb.Attrs["fraction"].Start)

	mv := p.Rules["max_velocity"]
	assert.Equal(t, policies.Error, mv.Severity, "default severity")
	v, ok := mv.Table("limit").For("concrete")
	assert.True(t, ok)
	assert.Equal(t, 20.0, v)
	v, ok = mv.Table("limit").For("dumped riprap")
	assert.True(t, ok)
	assert.Equal(t, 9.5, v)
	_, ok = mv.Table("limit").For("rock")
	assert.False(t, ok, "null means no limit for the lining")
	v, ok = mv.Table("limit").For("sod")
	assert.True(t, ok)
	assert.Equal(t, 3.0, v)
	assert.Nil(t, mv.Events)
	assert.True(t, mv.AppliesTo("anything"))

	mn := p.Rules["min_velocity"]
	assert.Equal(t, policies.Warning, mn.Severity)
	v, ok = mn.Table("limit").For("concrete")
	assert.True(t, ok)
	assert.Equal(t, 2.0, v)

	fr := p.Rules["froude_band"]
	assert.Equal(t, []policies.Band{{0.86, 1.13}, {1.5, 2.0}}, fr.Bands("avoid"), "sorted by low end")

	assert.Equal(t, policies.Error, p.Rules["jump_containment"].Severity)
	assert.Equal(t, policies.Info, p.Rules["jump_type"].Severity)

	se := p.Rules["superelevation"]
	assert.Equal(t, 0.6, se.Number("subcritical_coefficient"))
	assert.Equal(t, 1.0, se.Number("supercritical_coefficient"))
	assert.Equal(t, 0.5, se.Number("minimum"))

	ss := p.Rules["shear_stress"]
	_, ok = ss.Table("limit").For("concrete")
	assert.False(t, ok, "no default: unlisted linings are not checked")
	v, _ = ss.Table("limit").For("earth")
	assert.Equal(t, 0.075, v)
}

func keys[V any](m map[string]V) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	return out
}

func TestDefaults(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units = "si"
  superelevation {}
  jump_containment {}
}`)
	require.Empty(t, diags)
	assert.Equal(t, "report", p.Exceptions)
	assert.Equal(t, "", p.Reference)
	se := p.Rules["superelevation"]
	// Source: U.S. Army Corps of Engineers, EM 1110-2-1601 (from memory):
	// C = 0.5 subcritical, 1.0 supercritical in a simple curve.
	assert.Equal(t, 0.5, se.Number("subcritical_coefficient"))
	assert.Equal(t, 1.0, se.Number("supercritical_coefficient"))
	assert.Equal(t, 0.0, se.Number("minimum"))
	lang := rules.Language()
	for _, id := range lang.Configurable() {
		assert.NotEmpty(t, lang.Spec(id).Severity, id)
	}
	assert.Equal(t, policies.Error, lang.Spec("freeboard").Severity)
	assert.Equal(t, policies.Error, lang.Spec("max_velocity").Severity)
	assert.Equal(t, policies.Warning, lang.Spec("min_velocity").Severity)
	assert.Equal(t, policies.Warning, lang.Spec("froude_band").Severity)
	assert.Equal(t, policies.Error, lang.Spec("jump_containment").Severity)
	assert.Equal(t, policies.Warning, lang.Spec("jump_type").Severity)
	assert.Equal(t, policies.Error, lang.Spec("superelevation").Severity)
	assert.Equal(t, policies.Error, lang.Spec("shear_stress").Severity)
	assert.True(t, lang.Spec("capacity").AlwaysOn)
}

func TestDisabledBlockIsNotInRules(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units = "si"
  max_velocity { enabled = false }
}`)
	require.Empty(t, diags)
	assert.Empty(t, p.Rules)
}

// The bad-input cases of the language are files: testdata/policies/bad
// (TestBadPolicies).

// A few positions written out by hand, so the marker search above is
// itself checked.
func TestDiagnosticPositionsByHand(t *testing.T) {
	_, diags, _ := loadSource(t, "policy \"x\" {\n  units = \"metric\"\n}\n")
	require.Len(t, diags, 1)
	assert.Equal(t, hcl.Pos{Line: 2, Column: 11, Byte: 23}, diags[0].Subject.Start)
	assert.Equal(t, hcl.Pos{Line: 2, Column: 19, Byte: 31}, diags[0].Subject.End)
}

func TestAllProblemsOfAFileInOneRun(t *testing.T) {
	src := `policy "x" {
  units = "SI"
  freeboard { minimum = -1 }
  max_velocity { limit = { concrete = 0 } }
  froude_band { avoid = [[2, 1], [-1, 1]] }
  solver {}
  jump_type {
    severity = "fatal"
    avoid    = [[2.5, 4.5]]
  }
  jump_type { avoid = [[2.5, max(4.5, 5)]] }
  shear_stress { limt = 3 }
}`
	_, diags, _ := loadSource(t, src)
	errs := errorsOnly(diags)
	var lines []int
	for _, d := range errs {
		lines = append(lines, d.Subject.Start.Line)
	}
	// units, minimum, concrete, two bands, solver, severity, the duplicate
	// jump_type and the function call inside it, unknown limt (with no
	// second message about the then missing limit).
	assert.Len(t, errs, 10, "%v", errs)
	assert.Subset(t, lines, []int{2, 3, 4, 5, 6, 8, 11, 12})
	assert.IsNonDecreasing(t, lines, "top to bottom")
}

func TestDuplicateEventIsAWarning(t *testing.T) {
	src := `policy "x" {
  units = "si"
  jump_containment { events = ["q100", "q100"] }
}`
	p, diags, _ := loadSource(t, src)
	require.Len(t, diags, 1)
	assert.Equal(t, hcl.DiagWarning, diags[0].Severity)
	require.NotNil(t, p, "a warning does not stop the load")
	assert.Equal(t, []string{"q100"}, p.Rules["jump_containment"].Events)
}

func TestContradictoryVelocityLimitsWarn(t *testing.T) {
	src := `policy "x" {
  units = "us"
  max_velocity { limit = { grass = 1.5, concrete = 20, default = 3.0 } }
  min_velocity {
    limit  = 2.0
    events = ["q10"]
  }
}`
	p, diags, _ := loadSource(t, src)
	require.NotNil(t, p, "a warning does not stop the load")
	require.Len(t, diags, 1, "%v", diags)
	d := diags[0]
	assert.Equal(t, hcl.DiagWarning, d.Severity)
	assert.Equal(t, "Velocity limits leave no room", d.Summary)
	assert.Contains(t, d.Detail, `lining "grass"`)
	assert.Contains(t, d.Detail, "2 is not below the maximum 1.5 ft/s")
	start, end := span(t, src, "2.0")
	assert.Equal(t, start, d.Subject.Start)
	assert.Equal(t, end, d.Subject.End)
}

func TestResolveAcceptsPackPrefix(t *testing.T) {
	p, diags := rules.Language().NewLoader("").Resolve("pack:baseline-us")
	require.Empty(t, diags)
	assert.Equal(t, "baseline-us", p.Name)
}

// Nesting beyond MaxNesting is refused before the recursive HCL parser
// sees it (100,000 levels would overflow the goroutine stack).
func TestNestingIsBounded(t *testing.T) {
	for name, value := range map[string]string{
		"brackets":      strings.Repeat("[", 100000) + strings.Repeat("]", 100000),
		"parentheses":   strings.Repeat("(", 5000) + "1" + strings.Repeat(")", 5000),
		"signs":         strings.Repeat("-", 5000) + "1",
		"interpolation": strings.Repeat(`"${`, 5000) + "1" + strings.Repeat(`}"`, 5000),
	} {
		t.Run(name, func(t *testing.T) {
			src := "policy \"x\" {\n  units     = \"si\"\n  reference = " + value + "\n}\n"
			p, diags, _ := loadSource(t, src)
			assert.Nil(t, p)
			require.Len(t, diags, 1)
			assert.Equal(t, "Too deeply nested", diags[0].Summary)
			require.NotNil(t, diags[0].Subject)
			assert.Equal(t, 3, diags[0].Subject.Start.Line)
		})
	}
	// Exactly MaxNesting levels (policy, block, parentheses) load.
	src := "policy \"x\" {\n  units = \"si\"\n  freeboard { minimum = " + strings.Repeat("(", policies.MaxNesting-2) + "0.3" + strings.Repeat(")", policies.MaxNesting-2) + " }\n}\n"
	_, diags, _ := loadSource(t, src)
	assert.Empty(t, diags)
}
