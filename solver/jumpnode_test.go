package solver

import (
	"math"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestJumpAtNodeNotLost: a reach that ends a hair (7.6e-9 m) short of
// where a jump's toe would stand leaves its supercritical flow to the
// reach below, whose start it then drowns within the specific-force tie.
// The jump used to vanish between the two reaches (a supercritical point
// and a subcritical one at the start of the reach below, no Jump); it now
// stands at that start, with the depths and Froude number of the uncut
// reach's jump. Source: common practice (no published source): cutting a
// prismatic reach changes nothing physical; and Bélanger's sequent-depth
// ratio y2/y1 = (√(1 + 8F1²) − 1)/2 (Chow, Open-Channel Hydraulics, 1959,
// eq. 3-20, from memory).
func TestJumpAtNodeNotLost(t *testing.T) {
	const head = `units = "si"
section "s" {
  shape        = "trapezoid"
  bottom_width = 0.84375
  side_slope   = 0
  height       = 1.25
  roughness    = 0.021240234375
}
gate "g" {
  reach   = "up"
  opening = 0.322265625
}
event "e" {
  inflow = { "up" = 3.875 }
  outlet = { condition = "normal" }
}
`
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	reach := func(name, from, to string, length float64) string {
		return "reach \"" + name + "\" {\n  from    = \"" + from + "\"\n  to      = \"" + to + "\"\n  length  = " + f(length) +
			"\n  section = \"s\"\n  slope   = 0.002\n}\n"
	}
	whole, err := Solve(parseModel(t, "whole.chan.hcl", []byte(head+reach("up", "a", "d", 20))), Options{})
	require.NoError(t, err)
	require.Len(t, whole.Events[0].Reaches[0].Jumps, 1)
	ref := whole.Events[0].Reaches[0].Jumps[0]

	cut := ref.Station - 7.62939453125e-09
	src := head + reach("up", "a", "b", cut) + reach("mm", "b", "c", 0.001) + reach("down", "c", "d", 20-cut-0.001)
	res, err := Solve(parseModel(t, "cut.chan.hcl", []byte(src)), Options{})
	require.NoError(t, err)
	var jumps []Jump
	var at []float64
	offset := map[string]float64{"up": 0, "mm": cut, "down": cut + 0.001}
	for _, rr := range res.Events[0].Reaches {
		for _, j := range rr.Jumps {
			jumps = append(jumps, j)
			at = append(at, offset[rr.Reach.Name]+j.Station)
		}
	}
	require.Len(t, jumps, 1, "one jump over the three reaches")
	j := jumps[0]
	assert.InDelta(t, ref.Station, at[0], 0.001, "the toe within 1 mm of the uncut reach's")
	assert.InDelta(t, ref.Froude, j.Froude, 0.01*ref.Froude)
	assert.InDelta(t, ref.DownstreamDepth, j.DownstreamDepth, 0.01*ref.DownstreamDepth)
	ratio := (math.Sqrt(1+8*j.Froude*j.Froude) - 1) / 2
	assert.InDelta(t, ratio, j.DownstreamDepth/j.UpstreamDepth, 0.02*ratio, "Bélanger's sequent depths")
}
