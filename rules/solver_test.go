package rules

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestSolverAssumptionNotes: a note of an assumption of the method is
// information, with its own wording; a control that could not act stays
// a warning.
func TestSolverAssumptionNotes(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200}, []float64{0.5, 0.5, 0.5}, []float64{1, 1, 1})
	notes := []solver.Note{
		{Kind: solver.NoteInfo, Station: 0, Message: "supercritical flows meet at junction \"j\""},
		{Kind: solver.NoteControl, Station: 200, Message: "gate \"g\" is submerged"},
	}
	fs := runRule(t, "solver", m, result(m, r, pts, nil, notes), nil)
	require.Len(t, fs, 2)
	assert.Equal(t, policies.Info, fs[0].Severity)
	assert.Contains(t, fs[0].Message, "rests on an assumption of the method (supercritical flows meet")
	assert.InDelta(t, 0, fs[0].FromStation, 0)
	assert.NotContains(t, fs[0].Message, "could not act")
	assert.Equal(t, policies.Severity(""), fs[1].Severity, "the rule's default, a warning")
	assert.Contains(t, fs[1].Message, "boundary condition could not act as written")
	assert.InDelta(t, 200, fs[1].FromStation, 0)
}

// TestSolverJunctionAssumptionIsInfo: end to end, two steep tributaries
// that arrive supercritical at a junction give the trunk an assumption
// note, reported at severity info and not as a warning.
func TestSolverJunctionAssumptionIsInfo(t *testing.T) {
	src := `units = "si"
section "a" {
  shape        = "rectangle"
  bottom_width = 1.2
  height       = 1.5
  roughness    = 0.014
  lining       = "concrete"
}
section "b" {
  shape        = "trapezoid"
  bottom_width = 1.0
  side_slope   = 1
  height       = 1.5
  roughness    = 0.014
  lining       = "concrete"
}
section "trunk" {
  shape        = "rectangle"
  bottom_width = 4
  height       = 2
  roughness    = 0.014
  lining       = "concrete"
}
reach "a" {
  from    = "ha"
  to      = "j"
  length  = 1500
  section = "a"
  slope   = 0.03
}
reach "b" {
  from    = "hb"
  to      = "j"
  length  = 1500
  section = "b"
  slope   = 0.05
}
reach "trunk" {
  from    = "j"
  to      = "out"
  length  = 300
  section = "trunk"
  slope   = 0.03
}
event "q" {
  inflow = { a = 2, b = 1.5 }
  outlet = { condition = "critical" }
}
`
	m, diags := model.Parse("junction.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	p, pd := Language().Pack("baseline")
	require.False(t, pd.HasErrors())
	var got []Finding
	for _, f := range Check(m, res, p) {
		if f.Rule == "solver" {
			got = append(got, f)
		}
	}
	require.Len(t, got, 1, "%v", got)
	assert.Equal(t, policies.Info, got[0].Severity)
	assert.Equal(t, "trunk", got[0].Reach)
	assert.Contains(t, got[0].Message, "supercritical flows meet at junction")
	assert.Contains(t, got[0].Message, "assumption of the method")
}
