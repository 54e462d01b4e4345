package solver

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// parseModel decodes model text with model.Parse.
func parseModel(t *testing.T, name string, src []byte) *model.Model {
	t.Helper()
	m, diags := model.Parse(name, src)
	require.False(t, diags.HasErrors(), "%s: %s", name, diags.Error())
	require.NotNil(t, m)
	return m
}

// TestSolveFromHCL solves a small network written in the model language:
// a gated channel and a side ditch joining a trunk channel at normal depth.
func TestSolveFromHCL(t *testing.T) {
	src := []byte(`
units = "si"
title = "Wrenfield test works"

section "lined" {
  shape        = "trapezoid"
  bottom_width = 3
  side_slope   = 2
  height       = 4
  roughness    = 0.015
}

section "box" {
  shape        = "rectangle"
  bottom_width = 4
  height       = 3
  roughness    = 0.015
}

reach "gated" {
  from    = "sluice"
  to      = "meet"
  length  = 400
  section = "lined"
  slope   = 0.001
}

reach "side" {
  from    = "field"
  to      = "meet"
  length  = 300
  section = "box"
  slope   = 0.002
}

reach "trunk" {
  from    = "meet"
  to      = "river"
  length  = 900
  section = "box"
  slope   = 0.002
}

gate "sluice-gate" {
  reach   = "gated"
  opening = 0.3
}

event "design" {
  inflow = { gated = 10, side = 2 }
  outlet = { condition = "normal" }
}
`)
	m := parseModel(t, "wrenfield.chan.hcl", src)
	ev := solveOne(t, m)
	gated, side, trunk := ev.Reaches[0], ev.Reaches[1], ev.Reaches[2]

	// Source: discharge accumulates downstream (model-format.md).
	require.InDelta(t, 12, trunk.Discharge, 1e-12)

	// Source: Manning's equation for a rectangle, solved by bisection
	// (Chow 1959, ch. 6); the trunk is uniform from its normal-depth outlet.
	refT := gvfTrapezoid{b: 4, z: 0, n: 0.015, k: 1, g: 9.80665, q: 12, s0: 0.002}
	yn := refT.normalDepth()
	require.InDelta(t, yn, trunk.Points[0].Depth, 1e-6*yn)

	// Source: energy balance without loss at a junction of subcritical
	// flows (Chow 1959, §10-3, from memory): every reach ending at the node
	// has the trunk's energy grade elevation there.
	h := trunk.Points[0].Energy
	for _, rr := range []*ReachResult{gated, side} {
		last := rr.Points[len(rr.Points)-1]
		require.InDelta(t, h, last.Energy, 1e-6, rr.Reach.Name)
	}

	// The gate throws a supercritical jet that jumps back to the
	// subcritical backwater from the junction.
	require.Len(t, gated.Jumps, 1)
	require.Equal(t, []string{"M3", "M1"}, gated.ProfileTypes()[:2])
	require.InDelta(t, 0.61*0.3, gated.Points[0].Depth, 1e-12, "default contraction 0.61")
	require.Greater(t, gated.GateUpstreamDepth, gated.Points[0].CriticalDepth)
}

// TestSolveRepositoryModels solves every model of the repository's demo
// and valid corpora and checks that every number is finite.
func TestSolveRepositoryModels(t *testing.T) {
	var files []string
	for _, dir := range []string{"../testdata/demo", "../testdata/valid"} {
		f, err := filepath.Glob(filepath.Join(dir, "*"+model.Suffix))
		require.NoError(t, err)
		files = append(files, f...)
	}
	if len(files) == 0 {
		t.Skip("no repository models yet")
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, err := os.ReadFile(f)
			require.NoError(t, err)
			m := parseModel(t, f, src)
			res, err := Solve(m, Options{})
			require.NoError(t, err)
			require.Len(t, res.Events, len(m.Events))
			requireFinite(t, res)
			for _, ev := range res.Events {
				require.Len(t, ev.Reaches, len(m.Reaches))
				for _, rr := range ev.Reaches {
					require.NotEmpty(t, rr.Points, "%s/%s", ev.Event.Name, rr.Reach.Name)
				}
			}
		})
	}
}

// TestDamBackwaterModelFile solves the repository's canal-and-dam model
// and checks the 4.0 ft station against the independent quadrature with
// the model's constants.
//
// Source: Chow, Open-Channel Hydraulics (1959), ch. 10, direct-step example
// (from memory, per references.md), integrated by gonum quadrature
// (see TestPublishedTrapezoidBackwater for the tolerance).
func TestDamBackwaterModelFile(t *testing.T) {
	const f = "../testdata/valid/dam-backwater-us.chan.hcl"
	src, err := os.ReadFile(f)
	if os.IsNotExist(err) {
		t.Skip("model file not present")
	}
	require.NoError(t, err)
	m := parseModel(t, f, src)
	rr := solveOne(t, m).Reaches[0]
	ref := gvfTrapezoid{b: 20, z: 2, n: 0.025, k: model.US.Manning(), g: model.US.Gravity(), q: 400, s0: 0.0016}
	got := m.Reaches[0].Length - stationOfDepth(t, rr.Points, 4.0)
	want := -ref.distance(5.0, 4.0)
	require.InDelta(t, want, got, 0.005*want)
}
