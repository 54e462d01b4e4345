package model

import (
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// parseOK parses src and fails the test on any diagnostic.
func parseOK(t *testing.T, src string) *Model {
	t.Helper()
	m, diags := Parse("t.chan.hcl", []byte(src))
	require.Empty(t, diags, "%s", diags.Error())
	require.NotNil(t, m)
	return m
}

// parseErr parses src, requires it to fail and returns the error summaries.
func parseErr(t *testing.T, src string) hcl.Diagnostics {
	t.Helper()
	m, diags := Parse("t.chan.hcl", []byte(src))
	require.True(t, diags.HasErrors(), "expected errors")
	require.Nil(t, m)
	return diags
}

// lineCol is the start of a range as "line:col".
func lineCol(r hcl.Range) [2]int { return [2]int{r.Start.Line, r.Start.Column} }

// oneReach wraps sections in a minimal valid model around reach "r" using
// section "s".
func oneReach(sections string) string {
	return `units = "si"
` + sections + `
reach "r" {
  from = "a"
  to = "b"
  length = 100
  section = "s"
  slope = 0.001
}
event "e" {
  inflow = { r = 1 }
  outlet = { condition = "normal" }
}
`
}

func TestSectionShapes(t *testing.T) {
	m := parseOK(t, oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = 3
  height = 1.5
  roughness = 0.015
  lining = "concrete"
}
section "tz" {
  shape = "trapezoid"
  bottom_width = 2
  side_slope = 1.5
  height = 1.2
  roughness = 0.02
}
section "tr" {
  shape = "triangle"
  side_slope = 4
  height = 0.5
  roughness = 0.025
}
section "c" {
  shape = "circle"
  diameter = 1.2
  roughness = 0.013
}
section "p" {
  shape = "points"
  points = [[0, 4.1], [6, 2.2], [9, 0.3], [12, 0.0], [15, 0.4], [20, 2.6], [30, 3.9]]
  banks = [6, 20]
  roughness = [0.06, 0.035, 0.07]
}
section "wall" {
  shape = "points"
  points = [[0, 2], [0, 0], [4, 0], [4, 1.5]]
  roughness = 0.014
}`))
	require.Len(t, m.Sections, 6)
	s := m.Sections[0]
	assert.Equal(t, Rectangle, s.Shape)
	assert.Equal(t, 3.0, s.BottomWidth)
	assert.Equal(t, 1.5, s.Height)
	assert.Equal(t, [3]float64{0.015, 0.015, 0.015}, s.Roughness)
	assert.Equal(t, "concrete", s.Lining)
	assert.Equal(t, [2]int{2, 1}, lineCol(s.DefRange))
	assert.Equal(t, [2]int{2, 9}, lineCol(s.LabelRange))
	assert.Equal(t, [2]int{4, 18}, lineCol(s.At("bottom_width")))
	assert.Equal(t, [2]int{2, 1}, lineCol(s.At("side_slope")), "absent attribute falls back to DefRange")

	tz := m.Sections[1]
	assert.Equal(t, Trapezoid, tz.Shape)
	assert.Equal(t, 1.5, tz.SideSlope)
	assert.Equal(t, "", tz.Lining, "lining defaults to empty")

	tr := m.Sections[2]
	assert.Equal(t, Triangle, tr.Shape)
	assert.Equal(t, 4.0, tr.SideSlope)
	assert.Equal(t, 0.5, tr.Height)

	c := m.Sections[3]
	assert.Equal(t, Circle, c.Shape)
	assert.Equal(t, 1.2, c.Diameter)
	assert.Equal(t, 1.2, c.Height, "a circle's height is its diameter")
	assert.True(t, c.Closed())

	p := m.Sections[4]
	require.Len(t, p.Points, 7)
	assert.Equal(t, Point{Offset: 9, Elevation: 0.3}, p.Points[2])
	assert.Equal(t, [2]float64{6, 20}, p.Banks)
	assert.Equal(t, [3]float64{0.06, 0.035, 0.07}, p.Roughness)
	assert.Equal(t, 3.9, p.Height, "default height: lower end (3.9) above the lowest point (0)")

	w := m.Sections[5]
	assert.Equal(t, [2]float64{0, 4}, w.Banks, "banks default to the whole section")
	assert.Equal(t, 1.5, w.Height)
	assert.Equal(t, [3]float64{0.014, 0.014, 0.014}, w.Roughness)
}

func TestReachDecoding(t *testing.T) {
	m := parseOK(t, `units = "us"
section "s" {
  shape = "rectangle"
  bottom_width = 10
  height = 4
  roughness = 0.015
}
section "n" {
  shape = "circle"
  diameter = 3
  roughness = 0.013
}
reach "up" {
  from = "a"
  to = "b"
  length = 1000
  section = "s"
  invert = [105, 103]
  max_spacing = 25
  segment {
    from_station = 600
    to_station = 1000
    section = "n"
  }
  segment {
    from_station = 100
    to_station = 200
    section = "n"
  }
}
reach "down" {
  from = "b"
  to = "c"
  length = 500
  section = "s"
  slope = 0.002
}
event "e" {
  inflow = { up = 10 }
  outlet = { depth = 2 }
}
`)
	assert.Equal(t, US, m.Units)
	assert.Equal(t, "ft", m.Units.Length())
	up, down := m.Reaches[0], m.Reaches[1]
	assert.True(t, up.HasInvert)
	assert.Equal(t, 105.0, up.InvertUp)
	assert.Equal(t, 103.0, up.InvertDown)
	assert.InDelta(t, 0.002, up.Slope, 1e-15, "(105-103)/1000")
	assert.Equal(t, 25.0, up.MaxSpacing)
	require.Len(t, up.Segments, 2)
	assert.Equal(t, 100.0, up.Segments[0].FromStation, "segments sorted by station")
	assert.Equal(t, [2]int{25, 3}, lineCol(up.Segments[0].DefRange))
	assert.Equal(t, [2]int{28, 15}, lineCol(up.Segments[0].At("section")))
	assert.Same(t, m.Sections[1], up.Segments[0].Section)
	assert.Same(t, m.Sections[0], up.SectionAt(50))
	assert.Same(t, m.Sections[1], up.SectionAt(150))
	assert.Same(t, m.Sections[1], up.SectionAt(1000))
	assert.False(t, down.HasInvert)
	assert.Equal(t, 0.002, down.Slope)
	assert.Equal(t, 0.0, down.MaxSpacing)
	assert.Equal(t, [2]int{14, 10}, lineCol(up.At("from")))
}

func TestStructuresAndExceptions(t *testing.T) {
	m := parseOK(t, oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.014
}
gate "g" {
  reach = "r"
  opening = 0.3
}
gate "g2" {
  reach = "r2"
  opening = 0.3
  contraction = 0.7
}
basin "late" {
  reach = "r"
  from_station = 60
  to_station = 80
}
basin "early" {
  reach = "r"
  from_station = 10
  to_station = 30
}
bend "b" {
  reach = "r"
  from_station = 40
  to_station = 55.5
  radius = 30
}
exception "froude_band" {
  reach = "r"
  from_station = 0
  to_station = 20
  reason = "Reviewed with the drainage engineer on site"
}
reach "r2" {
  from = "b"
  to = "c"
  length = 10
  section = "s"
  slope = 0.01
}`))
	g := m.Gates[0]
	assert.Equal(t, DefaultContraction, g.Contraction, "contraction defaults to 0.61")
	assert.InDelta(t, 0.183, g.VenaContracta(), 1e-12, "0.61 × 0.3")
	assert.Equal(t, 0.7, m.Gates[1].Contraction)
	r := m.Reaches[1]
	require.Equal(t, "r", r.Name)
	assert.Same(t, g, r.Gate)
	assert.Same(t, r, g.Reach)
	require.Len(t, r.Basins, 2)
	assert.Equal(t, "early", r.Basins[0].Name, "basins sorted by station")
	require.Len(t, r.Bends, 1)
	assert.Equal(t, 55.5, r.Bends[0].ToStation)
	assert.Equal(t, 30.0, r.Bends[0].Radius)
	e := m.Exceptions[0]
	assert.Equal(t, "froude_band", e.Rule)
	assert.Same(t, r, e.Reach)
	assert.Equal(t, "Reviewed with the drainage engineer on site", e.Reason)
	assert.Equal(t, e.DefRange.Start.Line, e.LabelRange.Start.Line)
}

func TestEventDecoding(t *testing.T) {
	base := `units = "si"
section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.014
}
reach "a-b" {
  from = "a"
  to = "b"
  length = 100
  section = "s"
  slope = 0.01
}
reach "c" {
  from = "b"
  to = "c"
  length = 100
  section = "s"
  slope = 0.001
}
`
	m := parseOK(t, base+`event "one" {
  inflow   = { "a-b" = 2.5, c = 0.5 }
  outlet   = { elevation = 1.2 }
  entrance = { "a-b" = 0.3 }
}
event "two" {
  inflow = { "a-b" = 1 }
  outlet = { condition = "critical" }
}
event "three" {
  inflow = { "a-b" = 1 }
  outlet = { depth = 0.7 }
}
`)
	one := m.Events[0]
	require.Len(t, one.Inflows, 2)
	assert.Equal(t, Inflow{ReachName: "a-b", Reach: m.Reaches[0], Discharge: 2.5, Range: one.Inflows[0].Range}, one.Inflows[0])
	assert.Equal(t, [2]int{23, 16}, lineCol(one.Inflows[0].Range), "inflow keeps the range of its key")
	assert.Equal(t, [2]int{23, 29}, lineCol(one.Inflows[1].Range))
	assert.Equal(t, Outlet{Kind: OutletElevation, Value: 1.2, Range: one.Outlet.Range}, one.Outlet)
	assert.Equal(t, [2]int{24, 28}, lineCol(one.Outlet.Range), "outlet range is its value")
	require.Len(t, one.Entrances, 1)
	assert.Equal(t, 0.3, one.Entrances[0].Depth)
	assert.Same(t, m.Reaches[0], one.Entrances[0].Reach)
	assert.Equal(t, [2]int{25, 16}, lineCol(one.Entrances[0].Range))
	assert.Equal(t, OutletCritical, m.Events[1].Outlet.Kind)
	assert.Equal(t, Outlet{Kind: OutletDepth, Value: 0.7, Range: m.Events[2].Outlet.Range}, m.Events[2].Outlet)
}

func TestSignsAndParentheses(t *testing.T) {
	m := parseOK(t, oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = (3)
  height = 1.5
  roughness = -(-0.015)
}`))
	assert.Equal(t, 3.0, m.Sections[0].BottomWidth)
	assert.Equal(t, 1.5, m.Sections[0].Height)
	assert.Equal(t, 0.015, m.Sections[0].Roughness[1])
}

func TestNoFunctionsOrVariables(t *testing.T) {
	for _, expr := range []string{`2 * 1.5`, `1e308*10 - 1e308*10`, `max(2, 3)`, `var.width`, `width`, `[for x in [1]: x][0]`, `true ? 2 : 3`, `file("/etc/passwd")`} {
		t.Run(expr, func(t *testing.T) {
			diags := parseErr(t, oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = `+expr+`
  height = 1
  roughness = 0.015
}`))
			require.Len(t, diags, 1, "%s", diags.Error())
			assert.Equal(t, 4, diags[0].Subject.Start.Line)
		})
	}
}

func TestNoLimitOnWarnings(t *testing.T) {
	// A warning alone keeps the model.
	m, diags := Parse("t.chan.hcl", []byte(oneReach(`section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.005
}`)))
	require.NotNil(t, m)
	require.Len(t, diags, 1)
	assert.Equal(t, hcl.DiagWarning, diags[0].Severity)
	assert.Contains(t, diags[0].Summary, "low roughness")
}

func TestValidModels(t *testing.T) {
	for _, f := range []string{"../testdata/valid/dam-backwater-us.chan.hcl", "../testdata/valid/roadside-si.chan.hcl", demoFile} {
		m, diags := Load(f)
		require.Empty(t, diags, "%s: %s", f, diags.Error())
		require.NotNil(t, m)
		assert.Equal(t, f, m.File)
		assert.NotEmpty(t, m.Source)
	}
}

func TestLoadLimits(t *testing.T) {
	_, diags := Load("testdata/does-not-exist.chan.hcl")
	require.True(t, diags.HasErrors())
	assert.Equal(t, "Cannot read model", diags[0].Summary)

	dir := t.TempDir()
	_, diags = Load(dir)
	require.True(t, diags.HasErrors())
	assert.Contains(t, diags[0].Detail, "directory")

	big := []byte("units = \"si\"\n" + strings.Repeat("#", MaxFileSize))
	_, diags = Parse("big.chan.hcl", big)
	require.True(t, diags.HasErrors())
	assert.Equal(t, "Model file too large", diags[0].Summary)

	deep := []byte("units = \"si\"\ntitle = " + strings.Repeat("[", 10000))
	_, diags = Parse("deep.chan.hcl", deep)
	require.True(t, diags.HasErrors())
	assert.Equal(t, "Too deeply nested", diags[0].Summary)
	assert.Equal(t, 2, diags[0].Subject.Start.Line)
}

func TestSuggest(t *testing.T) {
	assert.Equal(t, ` Did you mean "trapezoid"?`, suggest("trapezoidal", shapeNames))
	assert.Equal(t, "", suggest("oval", shapeNames))
}
