package model

import (
	"fmt"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// summaries lists "line: summary" of the diagnostics.
func summaries(diags hcl.Diagnostics) []string {
	var out []string
	for _, d := range diags {
		out = append(out, fmt.Sprintf("%d: %s", d.Subject.Start.Line, d.Summary))
	}
	return out
}

const limitSection = `section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.014
}
`

func TestTooManyEvents(t *testing.T) {
	var b strings.Builder
	b.WriteString(oneReach(limitSection))
	for i := range MaxEvents {
		fmt.Fprintf(&b, "event \"x%d\" {\n  inflow = { r = 1 }\n  outlet = { depth = 1 }\n}\n", i)
	}
	diags := parseErr(t, b.String())
	require.Len(t, diags, 1)
	assert.Equal(t, "Too many blocks", diags[0].Summary)
	assert.Contains(t, diags[0].Detail, "at most 200 event blocks")
}

func TestTooManySections(t *testing.T) {
	var b strings.Builder
	for i := range MaxSections + 5 {
		fmt.Fprintf(&b, "section \"s%d\" {\n  shape = \"circle\"\n  diameter = 1\n  roughness = 0.013\n}\n", i)
	}
	diags := parseErr(t, oneReach(limitSection+b.String()))
	require.Len(t, diags, 1, "%v", summaries(diags))
	assert.Equal(t, "Too many blocks", diags[0].Summary)
	assert.Equal(t, 2+6+5*(MaxSections-1), diags[0].Subject.Start.Line, "the first section beyond the limit")
}

func TestTooManyPoints(t *testing.T) {
	pts := make([]string, MaxPoints+1)
	for i := range pts {
		pts[i] = fmt.Sprintf("[%d, %d]", i, (i%2)+1)
	}
	diags := parseErr(t, oneReach(`section "s" {
  shape = "points"
  points = [`+strings.Join(pts, ", ")+`]
  roughness = 0.03
}`))
	assert.Equal(t, []string{"4: Too many points"}, summaries(diags))
}

func TestTooManyInflows(t *testing.T) {
	keys := make([]string, MaxReaches+1)
	for i := range keys {
		keys[i] = fmt.Sprintf("r%d = 1", i)
	}
	src := oneReach(limitSection) + "event \"big\" {\n  inflow = { " + strings.Join(keys, ", ") + " }\n  outlet = { depth = 1 }\n}\n"
	diags := parseErr(t, src)
	assert.Equal(t, []string{"21: Too many entries"}, summaries(diags))
}

func TestWarnings(t *testing.T) {
	m, diags := Parse("w.chan.hcl", []byte(oneReach(limitSection+`
gate "g" {
  reach = "r"
  opening = 1.2
}
basin "a" {
  reach = "r"
  from_station = 0
  to_station = 30
}
basin "b" {
  reach = "r"
  from_station = 20
  to_station = 40
}
event "gated" {
  inflow = { r = 1 }
  outlet = { depth = 1 }
  entrance = { r = 0.3 }
}`)))
	require.NotNil(t, m, "%s", diags.Error())
	assert.Equal(t, []string{
		"11: Gate opening above the section",
		"20: Overlapping basins",
		"26: Entrance depth below a gate",
	}, summaries(diags))
	for _, d := range diags {
		assert.Equal(t, hcl.DiagWarning, d.Severity)
	}
}

func TestManyUnknownNamesStayBounded(t *testing.T) {
	// A hostile file must not make the suggestion search quadratic; every
	// unknown name is still reported.
	var b strings.Builder
	for i := range 300 {
		fmt.Fprintf(&b, "gate \"g%d\" {\n  reach = \"x%d\"\n  opening = 0.2\n}\n", i, i)
	}
	diags := parseErr(t, oneReach(limitSection+b.String()))
	require.Len(t, diags, 300)
}

// TestRecursionBounded: constructs that the HCL parser handles by recursion
// end in one diagnostic instead of a stack overflow, which would kill the
// process whatever the caller does.
func TestRecursionBounded(t *testing.T) {
	for name, body := range map[string]string{
		"signs":         strings.Repeat("-", 2_000_000) + "1",
		"negations":     strings.Repeat("!", 2_000_000) + "true",
		"conditionals":  strings.Repeat("true ? 1 : ", 300_000) + "1",
		"interpolation": strings.Repeat(`"${`, 100_000) + "1" + strings.Repeat(`}"`, 100_000),
		"parentheses":   strings.Repeat("(", 1_000_000) + "1",
	} {
		t.Run(name, func(t *testing.T) {
			diags := parseErr(t, "units = \"si\"\ntitle = "+body+"\n")
			require.Len(t, diags, 1)
			assert.Equal(t, "Too deeply nested", diags[0].Summary)
			assert.Equal(t, 2, diags[0].Subject.Start.Line)
		})
	}
}

func TestHeredocTextDoesNotCount(t *testing.T) {
	deep := strings.Repeat("[", 2*MaxNesting)
	m := parseOK(t, oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.014
  lining = <<-EOT
    `+deep+` $${ %%{ ]]]
    EOT
}`))
	assert.Contains(t, m.Sections[0].Lining, deep)
}

func TestDiagnosticsCapped(t *testing.T) {
	var b strings.Builder
	b.WriteString("units = \"si\"\n")
	for i := range 5000 {
		fmt.Fprintf(&b, "colour%d = \"blue\"\n", i)
	}
	src := b.String()
	_, diags := Parse("many.chan.hcl", []byte(src))
	require.Len(t, diags, MaxDiagnostics+1)
	last := diags[MaxDiagnostics]
	assert.Equal(t, "Too many problems", last.Summary)
	assert.Contains(t, last.Detail, "4002 more problems")
	// "No reach" and "No event" sit at line 1, then one unknown argument
	// per line from line 2.
	assert.Equal(t, MaxDiagnostics, last.Subject.Start.Line)
}
