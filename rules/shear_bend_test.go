package rules

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestShearSpansStopAtBendEnds are the cases rapid found for
// TestSplittingAReachChangesNoFinding once it put bends in the reach. The
// bend factor Kb steps the bed shear at a bend end, so the stress on the
// two sides of it is two criteria, each continuous:
//   - a trapezoid whose straight stretch fails up to 26.5 m and whose bend
//     (30.19–38.58 m, Kb 2) fails from its start: the span ran 0–34.43 m
//     over the passing 26.5–30.19 m, with no computed point in it;
//   - a trapezoid whose bend (2.09–18.81 m) fails and whose straight
//     channel below it fails for 2.8 m more with no computed point in them:
//     that stretch was not reported;
//   - the same before a bend that starts at a computed point.
//
// Source: Kilgore and Cotton, FHWA HEC-15, 3rd ed. (2005), eq. 2.3 and 3.8
// (from memory): τd = γ·d·Sf on the bed, τb = Kb·τd in a bend.
func TestShearSpansStopAtBendEnds(t *testing.T) {
	pol := baselinePack(t)
	gap := splitCase{shape: 1, width: 0.5, z: 3, height: 1, n: 0.04, lining: "earth", length: 83.875, slope: 0.03,
		flows: []float64{1.75}, outlet: 1, outletDepth: 3, withBend: true, bendFrom: 0.36, bendTo: 0.46, radius: 10}
	fs := ruleFindings(t, gap.text(false), pol, "shear_stress")
	require.Len(t, fs, 2)
	assert.InDelta(t, 26.51, fs[0].ToStation, 0.01)
	assert.Equal(t, 0.36*83.875, fs[1].FromStation)
	assert.NotContains(t, fs[0].Message, "in the bend")
	assert.Contains(t, fs[1].Message, "in the bend")

	below := splitCase{shape: 1, width: 1.65625, z: 0.875, height: 1, n: 0.03125, lining: "earth", length: 104.5, slope: 0.003,
		flows: []float64{0.2373046875}, outlet: 1, outletDepth: 0.5, withBend: true, bendFrom: 0.02, bendTo: 0.18, radius: 10}
	fs = ruleFindings(t, below.text(false), pol, "shear_stress")
	require.Len(t, fs, 3)
	assert.Equal(t, 0.18*104.5, fs[2].FromStation)
	assert.InDelta(t, 21.60, fs[2].ToStation, 0.01) // the cut reach, with a computed point in the stretch, puts it at 21.597
	assert.NotContains(t, fs[2].Message, "in the bend")

	// A bend starting at a computed point (25 m) of a circle running full
	// below: the straight stretch before it, 17.94–25 m, failed on the cut
	// reach only, because the bend-end pass looked for the straight side
	// in the interval after the computed point.
	atPoint := splitCase{shape: 2, width: 1, z: 1, height: 0.984375, n: 0.04, lining: "grass", length: 50, slope: 0.01,
		flows: []float64{0.3125}, outlet: 1, outletDepth: 1.9375, withBend: true, bendFrom: 0.5, bendTo: 0.6, radius: 10}
	fs = ruleFindings(t, atPoint.text(false), pol, "shear_stress")
	require.Len(t, fs, 3)
	assert.InDelta(t, 17.94, fs[0].FromStation, 0.01)
	assert.Equal(t, 25.0, fs[0].ToStation)
	assert.Contains(t, fs[1].Message, "in the bend")
}
