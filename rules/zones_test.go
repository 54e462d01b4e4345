package rules

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// solveSource parses and solves a model text.
func solveSource(t *testing.T, src string) (*model.Model, *solver.Result) {
	t.Helper()
	m, diags := model.Parse("hand.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), "%v", diags)
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	return m, res
}

// vDitchSource is a V-ditch in uniform flow.
const vDitchSource = `units = "si"
section "vee" {
  shape = "triangle"
  side_slope = 3
  height = 1.2
  roughness = 0.03
  lining = "grass"
}
reach "ditch" {
  from = "a"
  to = "b"
  length = 400
  section = "vee"
  slope = 0.002
}
event "q" {
  inflow = { "ditch" = 0.5 }
  outlet = { condition = "normal" }
}
`

// TestVDitchShearAndVelocity: a V-ditch (side slopes 3:1, n = 0.03,
// S0 = 0.002, Q = 0.5 m³/s) in uniform flow against the closed forms.
func TestVDitchShearAndVelocity(t *testing.T) {
	m, res := solveSource(t, vDitchSource)
	// Source: Manning's equation in a triangle (Chow 1959, ch. 5):
	// A = z·y², P = 2·y·√(1+z²), so Q = (1/n)·z·y²·(z·y/(2√(1+z²)))^(2/3)·√S
	// gives y = (Q·n/(z·√S·(z/(2√(1+z²)))^(2/3)))^(3/8).
	z, n, s, q := 3.0, 0.03, 0.002, 0.5
	y := math.Pow(q*n/(z*math.Sqrt(s)*math.Pow(z/(2*math.Sqrt(1+z*z)), 2.0/3)), 3.0/8)
	v := q / (z * y * y)
	// Source: Kilgore and Cotton, FHWA HEC-15, 3rd ed. (2005), eq. 2.3 (from
	// memory): τd = γ·d·S, d the maximum depth (at the vertex of the V),
	// here 2.1 times the mean γ·R·S (R = z·y/(2√10)).
	tau := 9806.65 * y * s
	fs := runRule(t, "max_velocity", m, res, limitCfg(0.5))
	require.Len(t, fs, 1)
	assert.InEpsilon(t, v, fs[0].Value, 1e-4)
	fs = runRule(t, "shear_stress", m, res, limitCfg(1))
	require.Len(t, fs, 1)
	assert.InEpsilon(t, tau, fs[0].Value, 1e-4)
	assert.Contains(t, fs[0].Message, "τd = γ·d·Sf")
}

// compoundSource is a points section: a main channel 10 m wide at the
// bottom, 2 m deep with 1:2 banks, between flat overbanks 19 m wide that
// rise 1 m over their last metre (offsets 0–52 m).
const compoundSource = `units = "si"
section "valley" {
  shape = "points"
  points = [[0, 3], [1, 2], [20, 2], [21, 0], [31, 0], [32, 2], [51, 2], [52, 3]]
  banks = [20, 32]
  roughness = [0.06, 0.035, 0.06]
  height = 3
  lining = "earth"
}
reach "valley" {
  from = "a"
  to = "b"
  length = 2000
  section = "valley"
  slope = 0.001
}
event "q" {
  inflow = { "valley" = 60 }
  outlet = { depth = 2.5 }
}
`

// TestCompoundZoneVelocity: in a compound section the permissible velocity
// is held to the main channel's velocity from the conveyance split, not the
// section mean. The outlet depth 2.5 m is below normal depth (an M2
// drawdown), so the outlet has the highest velocity of the reach.
func TestCompoundZoneVelocity(t *testing.T) {
	m, res := solveSource(t, compoundSource)
	// Source: divided channel method, Chow 1959, ch. 6 (from memory), by
	// hand at depth 2.5 m (0.5 m on the overbanks):
	//   left/right: A = 0.5·0.5·0.5 + 19·0.5 = 9.625, P = 0.5·√2 + 19
	//   main:       A = 2·(0.5 + 2.5)/2 + 10·2.5 = 28,  P = 2·√5 + 10
	//   K_i = A_i·R_i^(2/3)/n_i;  V_i = Q·K_i/(K·A_i)
	aOB, pOB := 9.625, 0.5*math.Sqrt2+19
	aM, pM := 28.0, 2*math.Sqrt(5)+10
	kOB := aOB * math.Pow(aOB/pOB, 2.0/3) / 0.06
	kM := aM * math.Pow(aM/pM, 2.0/3) / 0.035
	k := 2*kOB + kM
	vMain := 60 * kM / (k * aM)
	vOB := 60 * kOB / (k * aOB)
	mean := 60 / (2*aOB + aM)

	rr := res.Events[0].Reaches[0]
	last := &rr.Points[len(rr.Points)-1]
	require.InDelta(t, 2.5, last.Depth, 1e-12)
	zf, ok := rr.Zones(last)
	require.True(t, ok)
	assert.InEpsilon(t, vMain, zf.Velocity[solver.MainChannel], 1e-9)
	assert.InEpsilon(t, vOB, zf.Velocity[solver.LeftOverbank], 1e-9)
	assert.InEpsilon(t, vOB, zf.Velocity[solver.RightOverbank], 1e-9)
	assert.InEpsilon(t, mean, last.Velocity, 1e-9)

	fs := runRule(t, "max_velocity", m, res, limitCfg(1.6))
	require.Len(t, fs, 1)
	assert.InEpsilon(t, vMain, fs[0].Value, 1e-9)
	assert.Contains(t, fs[0].Message, "in the main channel (conveyance split")
	// The section mean (1.27 m/s) would have passed the 1.6 m/s limit.
	assert.Less(t, mean, 1.6)
}

// choiceCfg is limitCfg with Choice settings written.
func choiceCfg(limit float64, words map[string]string) *policies.RuleConfig {
	c := limitCfg(limit)
	for k, w := range words {
		c.Values[k] = policies.Value{Word: w}
	}
	return c
}

// TestPolicyChoosesMeanQuantities: a policy whose limits are defined for
// the mean shear or the section mean velocity says so, and gets them; one
// that excludes natural channels gets no finding on a points section.
func TestPolicyChoosesMeanQuantities(t *testing.T) {
	m, res := solveSource(t, vDitchSource)
	// Source: mean boundary shear γ·R·S (Chow 1959, ch. 7, from memory);
	// triangle R = z·y/(2√(1+z²)).
	z, n, s, q := 3.0, 0.03, 0.002, 0.5
	y := math.Pow(q*n/(z*math.Sqrt(s)*math.Pow(z/(2*math.Sqrt(1+z*z)), 2.0/3)), 3.0/8)
	fs := runRule(t, "shear_stress", m, res, choiceCfg(1, map[string]string{"quantity": "mean"}))
	require.Len(t, fs, 1)
	assert.InEpsilon(t, 9806.65*z*y/(2*math.Sqrt(1+z*z))*s, fs[0].Value, 1e-4)
	assert.Contains(t, fs[0].Message, "mean boundary shear stress")

	m, res = solveSource(t, compoundSource)
	fs = runRule(t, "max_velocity", m, res, choiceCfg(1.0, map[string]string{"velocity": "mean"}))
	require.Len(t, fs, 1)
	// Source: continuity, the section mean Q/A at the outlet depth 2.5 m
	// (A = 2·9.625 + 28 by hand, see TestCompoundZoneVelocity).
	assert.InEpsilon(t, 60/(2*9.625+28), fs[0].Value, 1e-9)
	assert.NotContains(t, fs[0].Message, "main channel")
	for _, id := range []string{"max_velocity", "shear_stress", "min_velocity"} {
		fs = runRule(t, id, m, res, choiceCfg(0.01, map[string]string{"points_sections": "excluded"}))
		assert.Empty(t, fs, id)
	}
}

// conduitSource is a concrete pipe in uniform flow, lining word "pipe".
const conduitSource = `units = "si"
section "pipe" {
  shape = "circle"
  diameter = 1.0
  roughness = 0.013
  lining = "pipe"
}
reach "drain" {
  from = "a"
  to = "b"
  length = 100
  section = "pipe"
  slope = 0.01
}
event "q" {
  inflow = { "drain" = 0.8 }
  outlet = { condition = "normal" }
}
`

// TestConduitNoErosionDefault: a closed conduit is held only to a limit its
// lining word has in the table, not to the default written for erodible
// channels.
func TestConduitNoErosionDefault(t *testing.T) {
	m, res := solveSource(t, conduitSource)
	assert.Empty(t, runRule(t, "max_velocity", m, res, limitCfg(0.5)))
	assert.Empty(t, runRule(t, "shear_stress", m, res, limitCfg(0.5)))
	named := &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"pipe": 0.5}}}}}
	fs := runRule(t, "max_velocity", m, res, named)
	require.Len(t, fs, 1)
	assert.Contains(t, fs[0].Message, `for lining "pipe"`)
	// The self-cleansing minimum does apply to conduits by default.
	assert.NotEmpty(t, runRule(t, "min_velocity", m, res, limitCfg(5)))
}
