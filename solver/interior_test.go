package solver

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestBetweenMatchesNeighbours: the flow recomputed between two computed
// points of an M1 profile joins both of them (a step toward a station next
// to a point returns that point's depth), lies between them, and agrees
// with a direct standard step from the downstream point.
func TestBetweenMatchesNeighbours(t *testing.T) {
	m := parseModel(t, "m1.chan.hcl", []byte(`units = "si"
section "t" {
  shape = "trapezoid"
  bottom_width = 5
  side_slope = 2
  height = 8
  roughness = 0.03
}
reach "r" {
  from = "a"
  to = "b"
  length = 12000
  section = "t"
  slope = 0.0004
}
event "e" {
  inflow = { "r" = 40 }
  outlet = { depth = 5 }
}
`))
	res, err := Solve(m, Options{})
	require.NoError(t, err)
	rr := res.Events[0].Reaches[0]
	require.Greater(t, len(rr.Points), 4)
	for i := 0; i+1 < len(rr.Points); i++ {
		a, b := rr.Points[i], rr.Points[i+1]
		if !(b.Station > a.Station) {
			continue
		}
		eps := 1e-9 * (b.Station - a.Station)
		near, approx, ok := rr.Between(i, b.Station-eps)
		require.True(t, ok)
		assert.False(t, approx)
		assert.InEpsilon(t, b.Depth, near.Depth, 1e-8)
		mid, _, ok := rr.Between(i, (a.Station+b.Station)/2)
		require.True(t, ok)
		assert.True(t, (mid.Depth-a.Depth)*(mid.Depth-b.Depth) <= 0, "midpoint depth %g outside %g–%g", mid.Depth, a.Depth, b.Depth)
		assert.InDelta(t, mid.Invert+mid.Depth, mid.WSE, 1e-12)
		assert.InEpsilon(t, 40/mid.Area, mid.Velocity, 1e-12)
	}
	_, _, ok := rr.Between(0, rr.Points[0].Station)
	assert.False(t, ok, "a station at a point is not between points")
	hand := &ReachResult{Points: rr.Points}
	_, _, ok = hand.Between(0, (rr.Points[0].Station+rr.Points[1].Station)/2)
	assert.False(t, ok, "a result not produced by Solve has nothing to recompute from")
}
