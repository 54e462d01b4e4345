package rules

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestFreeboardBesideOvertoppingBetweenPoints is the other case rapid
// found for TestSplittingAReachChangesNoFinding: an M1 backwater on a
// rectangle 2.25 m deep rises over its banks near the outlet (3.0 m). The
// freeboard falls below the required 0.2 × depth where the depth passes
// 1.875 m and reaches zero at 2.25 m, a stretch of 12.5 m with no
// computed point of the whole reach in it (9.50 m passes, 27.99 m
// overtops), so freeboard reported nothing on the whole reach and the
// stretch on the upper half of the cut one.
func TestFreeboardBesideOvertoppingBetweenPoints(t *testing.T) {
	c := splitCase{shape: 0, width: 0.75, z: 1, height: 2.25, n: 0.04, lining: "concrete",
		length: 50, slope: 0.03, flows: []float64{0.125}, outlet: 1, outletDepth: 3}
	// Source: Chow, Open-Channel Hydraulics (1959), eq. 9-13 and §10-2
	// (direct integration, see stationOf); the requirement
	// max(0.3 m, 0.2 × depth) of the baseline pack is met where
	// 2.25 − y = 0.2·y, y = 1.875 m (closed form).
	ref := rectBackwater(0.75, 0.04, 0.03, 0.125, 50, 3)
	from, to := ref.stationOf(1.875), ref.stationOf(2.25)
	for _, split := range []bool{false, true} {
		got := findingsOf(t, c, split, "freeboard")
		require.Len(t, got, 1, "cut %v", split)
		f := got[0]
		// Both within 2 mm of the quadrature (0.15 m would be the solver's
		// 0.2 % accuracy over dy/dx ≈ 0.03).
		assert.InDelta(t, from, f.FromStation, 0.01, "cut %v", split)
		assert.InDelta(t, to, f.ToStation, 0.01, "cut %v", split)
		assert.Equal(t, 0.0, f.Value)
		assert.InDelta(t, 0.45, f.Limit, 1e-12)
		assert.Contains(t, f.Message, "the channel overtops beyond station")
		t.Logf("cut %v: %.4f..%.4f m, quadrature %.4f..%.4f m", split, f.FromStation, f.ToStation, from, to)
	}
}
