package rules

import (
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestSuperelevationBesideOvertopping: the M1 backwater of
// TestFreeboardBesideOvertoppingBetweenPoints with a bend (radius 2 m) over
// its upper 40 m. The superelevation span runs up to where the water
// surface reaches the top of bank, 24.98 m. Its message used to print a
// rise of 0.029 m (top − WSE of the worst computed point − a value taken
// at a trial station next to the overtopping), where the rise is 0.0001 m,
// and a remaining height of −0.000079 m that depended on where the
// bracketing stopped.
func TestSuperelevationBesideOvertopping(t *testing.T) {
	c := splitCase{shape: 0, width: 0.75, z: 1, height: 2.25, n: 0.04, lining: "concrete",
		length: 50, slope: 0.03, flows: []float64{0.125}, outlet: 1, outletDepth: 3}
	src := strings.Replace(c.text(false), "event ", "bend \"b\" {\n  reach = \"r\"\n  from_station = 0\n  to_station = 40\n  radius = 2\n}\nevent ", 1)
	got := ruleFindings(t, src, baselinePack(t), "superelevation")
	require.Len(t, got, 1)
	f := got[0]
	// Source: USACE EM 1110-2-1601 (from memory): Δy = C·V²·T/(g·rc),
	// C = 0.5 in subcritical flow; at the top of bank V = Q/(b·h) and
	// T = b (continuity, a rectangle).
	v := 0.125 / (0.75 * 2.25)
	dy := 0.5 * v * v * 0.75 / (9.80665 * 2)
	assert.InDelta(t, -dy, f.Value, 1e-3*dy, "remaining height at the top of bank")
	assert.InDelta(t, 0.3, f.Limit, 1e-12)
	assert.Contains(t, f.Message, "rises 0.000105 m")
	ref := rectBackwater(0.75, 0.04, 0.03, 0.125, 50, 3)
	assert.InDelta(t, ref.stationOf(2.25), f.ToStation, 0.01)
}

// TestSuperelevationStretchBeforeOvertopping is the case rapid found for
// TestSplittingAReachChangesNoFinding: an M1 backwater rising over the
// banks of a trapezoid inside a long, gentle bend (rc 84.5 m). The outer
// bank's remaining height falls below the 0.3 m minimum about 8 m into the
// reach and to −Δy where the water reaches the top of bank at 108 m, with
// no computed point of the whole reach in that stretch: superelevation
// reported it on the cut reach only (as freeboard did before).
func TestSuperelevationStretchBeforeOvertopping(t *testing.T) {
	c := splitCase{shape: 1, width: 1.2219268378942274, z: 0.5201169058143303, height: 2.423474277656595, n: 0.021262387442318356,
		lining: "earth", length: 300.3447265625, slope: 0.003, flows: []float64{0.4651833394046667}, outlet: 1, outletDepth: 3,
		withBend: true, bendFrom: 0.02, bendTo: 0.40, radius: 84.46255934754888}
	got := ruleFindings(t, c.text(false), baselinePack(t), "superelevation")
	require.Len(t, got, 1)
	f := got[0]
	// Source: Chow, Open-Channel Hydraulics (1959), eq. 9-13 and §10-2
	// (direct integration, stationOf): the water surface reaches the top
	// of bank where the depth is the height; the rise Δy = C·V²·T/(g·rc)
	// (USACE EM 1110-2-1601, from memory) is about 1e-5 m here, so the
	// minimum is first missed where the depth is height − 0.3 m.
	ref := backwater{u: model.SI, l: 1, b: c.width, z: c.z, n: c.n, s0: c.slope, q: c.flows[0], length: c.length, yOut: c.outletDepth,
		g: model.SI.Gravity(), k: model.SI.Manning()}
	assert.InDelta(t, ref.stationOf(c.height), f.ToStation, 0.02)
	assert.InDelta(t, ref.stationOf(c.height-0.3), f.FromStation, 0.02)
	assert.Contains(t, f.Message, "the channel overtops beyond station")
	t.Logf("span %.3f..%.3f m, quadrature %.3f..%.3f m", f.FromStation, f.ToStation, ref.stationOf(c.height-0.3), ref.stationOf(c.height))
}
