package solver

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestAtStation: linear between points, the downstream value at a jump
// (two points at one station), the end values beyond the ends.
//
// Source: common practice (no published source): linear interpolation.
func TestAtStation(t *testing.T) {
	pts := []Point{{Station: 0, WSE: 10}, {Station: 10, WSE: 12}, {Station: 10, WSE: 11}, {Station: 30, WSE: 15}}
	wse := func(p *Point) float64 { return p.WSE }
	assert.InDelta(t, 11, AtStation(pts, 5, wse), 1e-12)
	assert.InDelta(t, 11, AtStation(pts, 10, wse), 1e-12, "downstream side of the jump")
	assert.InDelta(t, 13, AtStation(pts, 20, wse), 1e-12)
	assert.InDelta(t, 10, AtStation(pts, -1, wse), 1e-12)
	assert.InDelta(t, 15, AtStation(pts, 40, wse), 1e-12)
}
