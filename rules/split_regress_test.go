package rules

import (
	"testing"

	"github.com/chanlint/chanlint/model"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// findingsOf is ruleFindings for a splitCase, whole or cut in two.
func findingsOf(t *testing.T, c splitCase, split bool, rule string) []Finding {
	t.Helper()
	return ruleFindings(t, c.text(split), baselinePack(t), rule)
}

// TestFroudeBufferCarriesThroughNode is the case rapid found for
// TestSplittingAReachChangesNoFinding: a short steep chute, supercritical
// from critical depth at its head (yc = 2.83 m), whose Froude number
// climbs through 1.13 about 25.7 m down, inside the 28.3 m buffer of ten
// critical depths. Whole, froude_band leaves the stretch to the control;
// cut in two at 25 m, the lower half used to report 25–25.7 m because the
// buffer of the control at the head of the upper half stopped at the node.
func TestFroudeBufferCarriesThroughNode(t *testing.T) {
	c := splitCase{shape: 0, width: 1.60546875, z: 1, height: 1, n: 0.0218048095703125, lining: "concrete",
		length: 50, slope: 0.03, flows: []float64{23.96875}, outlet: 0, outletDepth: 1}
	assert.Empty(t, findingsOf(t, c, false, "froude_band"), "whole reach")
	assert.Empty(t, findingsOf(t, c, true, "froude_band"), "cut in two")
}

// TestFroudeNoControlAtNodeOnCriticalSlope is the third case rapid found
// for TestSplittingAReachChangesNoFinding: uniform flow at F = 0.9999 on a
// slope within a hair of critical, every computed point critical. Whole,
// froude_band reports the reach but for the buffers at its head and outlet;
// cut in two, the critical points at the node counted as two more controls
// and left 2 × 10 critical depths around it unchecked.
func TestFroudeNoControlAtNodeOnCriticalSlope(t *testing.T) {
	c := splitCase{shape: 1, width: 0.927734375, z: 0.765625, height: 1, n: 0.012, lining: "concrete",
		length: 50, slope: 0.003, flows: []float64{0.3671875}, outlet: 0, outletDepth: 1}
	whole := findingsOf(t, c, false, "froude_band")
	cut := findingsOf(t, c, true, "froude_band")
	require.Len(t, whole, 1)
	require.Len(t, cut, 2)
	assert.Equal(t, whole[0].FromStation, cut[0].FromStation)
	assert.Equal(t, 25.0, cut[0].ToStation)
	assert.Equal(t, 0.0, cut[1].FromStation)
	assert.InDelta(t, whole[0].ToStation, 25+cut[1].ToStation, 1e-9)
}

// TestFroudeBreakControlCountedOnce is the case rapid found for
// TestFindingsIndependentOfUnits after the buffer began to carry through
// nodes: a mild reach breaking into a steep one is critical at the end of
// the first and the start of the second, and the two reaches saw the
// control twice at one station. Each copy hid the other's buffer edge from
// bufferEdgeSpans, so the stretch between a crossing of F = 0.86 and the
// buffer edge was reported only where a computed point fell in it (in US
// units, not in SI).
func TestFroudeBreakControlCountedOnce(t *testing.T) {
	pol := baselinePack(t)
	c := unitCase{shape: 1, width: 0.5029296875, z: 1.875, height: 1, n: 0.0208740234375, lining: "concrete",
		reaches: 2, lengths: [2]float64{59.9375, 50}, slopes: [2]float64{0.003, 0.01},
		flows: []float64{30}, outlet: 0, outletDepth: 1}
	si := ruleFindings(t, c.text(model.SI), pol, "froude_band")
	us := ruleFindings(t, c.text(model.US), pol, "froude_band")
	require.Equal(t, len(si), len(us))
	for i := range si {
		assert.Equal(t, si[i].Reach, us[i].Reach)
		assert.InDelta(t, si[i].FromStation, us[i].FromStation*footInMetres, 0.01)
		assert.InDelta(t, si[i].ToStation, us[i].ToStation*footInMetres, 0.01)
	}
}
