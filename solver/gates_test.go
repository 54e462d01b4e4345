package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// gateNet is one rectangular reach of width 3 with a sluice gate at its
// head.
func gateNet(t *testing.T, q, opening, slope float64, outlet model.Outlet, withGate bool) *model.Model {
	t.Helper()
	sec := trapezoid("box", 3, 0, 0.014, 6)
	r := netReach{name: "r", from: "a", to: "b", length: 200, slope: slope, sec: sec, inflow: q}
	if withGate {
		r.gate = &model.Gate{Name: "head", Opening: opening, Contraction: 0.61}
	}
	return buildNet(t, model.SI, []netReach{r}, outlet)
}

// rectEnergyRoot solves y + q²/(2g·y²) = e for the subcritical root by
// bisection (independent of the solver's root finders).
func rectEnergyRoot(q, g, e float64) float64 {
	lo, hi := math.Cbrt(q*q/g), e
	for i := 0; i < 200; i++ {
		mid := (lo + hi) / 2
		if mid+q*q/(2*g*mid*mid) > e {
			hi = mid
		} else {
			lo = mid
		}
	}
	return (lo + hi) / 2
}

// TestGateFreeFlow: the depth upstream of a gate in free flow against the
// energy equation with the contraction coefficient, and the same depth by
// the discharge-coefficient form of the gate equation.
func TestGateFreeFlow(t *testing.T) {
	const q, a, cc, g, b = 6.0, 0.4, 0.61, 9.80665, 3.0
	rr := solveOne(t, gateNet(t, q, a, 0.03, model.Outlet{Kind: model.OutletCritical}, true)).Reaches[0]
	require.Len(t, rr.Structures, 1)
	require.Equal(t, StateFree, rr.Structures[0].State)
	y1 := rr.GateUpstreamDepth
	qu, yv := q/b, cc*a
	// Source: Henderson, Open Channel Flow (1966), §6.2 (energy conserved
	// to the vena contracta, from memory).
	require.InDelta(t, yv+qu*qu/(2*g*yv*yv), y1+qu*qu/(2*g*y1*y1), 1e-6)
	// Source: Novak et al., Hydraulic Structures, eq. 6.4:
	// q = Cd·a·√(2g·y1), Cd = Cc/√(1 + Cc·a/y1).
	cd := cc / math.Sqrt(1+cc*a/y1)
	require.InDelta(t, qu, cd*a*math.Sqrt(2*g*y1), 1e-6*qu)
	require.InDelta(t, yv, rr.Points[0].Depth, 1e-12, "the jet starts at the vena contracta")
	require.Greater(t, y1, a, "the gate touches the water")
}

// TestGateAboveWater: a gate whose lip stands above the water upstream does
// not control: a note says so and the profile is the ungated one.
func TestGateAboveWater(t *testing.T) {
	// On a steep reach: the first gate's jet would be supercritical, but
	// the depth upstream it needs in free flow, 0.93, stays below its lip
	// at 1.0; the second one's jet (0.915) would be deeper than the flow
	// (critical depth 0.357).
	for _, c := range []struct{ q, a float64 }{{6.0, 1.0}, {2.0, 1.5}} {
		out := model.Outlet{Kind: model.OutletCritical}
		gated := solveOne(t, gateNet(t, c.q, c.a, 0.03, out, true)).Reaches[0]
		free := solveOne(t, gateNet(t, c.q, c.a, 0.03, out, false)).Reaches[0]
		require.True(t, hasNote(gated, NoteControl, "above the water"), "notes: %v", gated.Notes)
		require.Len(t, gated.Structures, 1)
		require.Equal(t, StateNoControl, gated.Structures[0].State)
		require.Zero(t, gated.GateUpstreamDepth)
		require.Equal(t, len(free.Points), len(gated.Points))
		for i := range free.Points {
			require.Equal(t, free.Points[i].Depth, gated.Points[i].Depth)
		}
	}
}

// TestGateSubmergedHenderson: with the tailwater above the sequent depth of
// the vena contracta the depth upstream follows from momentum between the
// vena contracta and the tailwater and energy upstream of the vena
// contracta, here in closed form for a rectangle.
func TestGateSubmergedHenderson(t *testing.T) {
	const q, a, cc, g, b = 6.0, 0.5, 0.61, 9.80665, 3.0
	rr := solveOne(t, gateNet(t, q, a, 0.001, model.Outlet{Kind: model.OutletDepth, Value: 2.2}, true)).Reaches[0]
	require.Len(t, rr.Structures, 1)
	require.Equal(t, StateSubmerged, rr.Structures[0].State)
	qu, yv := q/b, cc*a
	yt := rr.Points[0].Depth
	y2 := yv / 2 * (math.Sqrt(1+8*qu*qu/(g*yv*yv*yv)) - 1)
	require.Greater(t, yt, y2, "tailwater above the sequent depth of the vena contracta")
	// Source: Henderson, Open Channel Flow (1966), ch. 6, submerged sluice
	// gate (from memory): momentum y3²/2 + q²/(g·yv) = yt²/2 + q²/(g·yt),
	// energy y1 + q²/(2g·y1²) = y3 + q²/(2g·yv²).
	y3 := math.Sqrt(yt*yt + 2*qu*qu/g*(1/yt-1/yv))
	y1 := rectEnergyRoot(qu, g, y3+qu*qu/(2*g*yv*yv))
	require.InDelta(t, y1, rr.GateUpstreamDepth, 1e-6)
	require.Empty(t, rr.Jumps)
}
