package rules

import (
	"os"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestRollerPastReachEndIntoBareChannel: a jump whose toe lies in a
// basin that runs to the end of its reach, and whose roller continues
// into a reach below with no basin, escapes its protection. The check
// took the missing basin below for one covering the whole overrun and
// reported nothing. The model is jump-contained.chan.hcl cut at 12 m, the
// basin ending there; the jump (toe 8.82 m, length 6.33 m by Peterka's
// curve, which golden_test.go checks) overruns the node by about 3.15 m.
// Source: common practice (no published source): cutting the reach
// changes nothing physical, and bare channel under a roller may scour.
func TestRollerPastReachEndIntoBareChannel(t *testing.T) {
	src, err := os.ReadFile("../testdata/rules/jump-contained.chan.hcl")
	require.NoError(t, err)
	one := `reach "release" {
  from    = "gate-house"
  to      = "river"
  length  = 200
  section = "outlet-channel"
  slope   = 0.0007
}`
	two := `reach "release" {
  from    = "gate-house"
  to      = "apron-end"
  length  = 12
  section = "outlet-channel"
  slope   = 0.0007
}
reach "rest" {
  from    = "apron-end"
  to      = "river"
  length  = 188
  section = "outlet-channel"
  slope   = 0.0007
}`
	require.Contains(t, string(src), one)
	cut := strings.Replace(strings.Replace(string(src), one, two, 1), "to_station   = 30", "to_station   = 12", 1)
	res, fs := solveAndCheck(t, cut)
	require.Len(t, res.Events[0].Reaches[0].Jumps, 1)
	j := res.Events[0].Reaches[0].Jumps[0]
	require.Greater(t, j.End(), 12.0, "the roller overruns the node")
	var found bool
	for _, f := range fs {
		if f.Rule == "jump_containment" {
			found = true
			assert.Equal(t, "release", f.Reach)
			assert.InDelta(t, j.End()-12, f.Value, 1e-9, "the unprotected overrun")
			assert.Contains(t, f.Message, `into reach "rest"`)
		}
	}
	assert.True(t, found, "the jump escaping its basin into bare channel is reported")
}

// TestRollerThroughShortReachIntoBasin: a roller that runs past a basin's
// node through a reach 1 mm long, wholly in a basin, into a basin of the
// reach below is protected all along; the check looked one reach down
// only and reported the 1 mm basin as too short. Where the last basin
// ends early, the rest is reported. Source: common practice (no
// published source): cutting the reach changes nothing physical.
func TestRollerThroughShortReachIntoBasin(t *testing.T) {
	src, err := os.ReadFile("../testdata/rules/jump-contained.chan.hcl")
	require.NoError(t, err)
	one := `reach "release" {
  from    = "gate-house"
  to      = "river"
  length  = 200
  section = "outlet-channel"
  slope   = 0.0007
}`
	three := `reach "release" {
  from    = "gate-house"
  to      = "apron-end"
  length  = 12
  section = "outlet-channel"
  slope   = 0.0007
}
reach "mm" {
  from    = "apron-end"
  to      = "sill"
  length  = 0.001
  section = "outlet-channel"
  slope   = 0.0007
}
reach "rest" {
  from    = "sill"
  to      = "river"
  length  = 187.999
  section = "outlet-channel"
  slope   = 0.0007
}
basin "mm-pad" {
  reach        = "mm"
  from_station = 0
  to_station   = 0.001
}
basin "rest-pad" {
  reach        = "rest"
  from_station = 0
  to_station   = REST
}`
	require.Contains(t, string(src), one)
	cut := strings.Replace(strings.Replace(string(src), one, three, 1), "to_station   = 30", "to_station   = 12", 1)
	for _, tc := range []struct {
		rest      string
		contained bool
	}{{"10", true}, {"2", false}} {
		res, fs := solveAndCheck(t, strings.Replace(cut, "REST", tc.rest, 1))
		require.Len(t, res.Events[0].Reaches[0].Jumps, 1)
		j := res.Events[0].Reaches[0].Jumps[0]
		var got []Finding
		for _, f := range fs {
			if f.Rule == "jump_containment" {
				got = append(got, f)
			}
		}
		if tc.contained {
			assert.Empty(t, got, "rest-pad to %s m holds the roller", tc.rest)
			continue
		}
		require.Len(t, got, 1)
		assert.InDelta(t, j.End()-12-0.001-2, got[0].Value, 1e-9, "the roller past rest-pad's end")
	}
}

// TestSuperelevationBeforeOvertopping: in a bend whose straight channel
// overtops from 282 m on, with computed points only at 131 m (passing by
// a hair) and beyond the overtopping, the outer bank loses its required
// margin somewhere between and the superelevation check found nothing,
// though the same channel cut by a 1 mm reach (another set of computed
// points) reported it; freeboard finds such a stretch between computed
// points and so does superelevation now, up to where capacity takes
// over. Source: common practice (no published source): the rise of the
// outer bank, Δy = C·V²·T/(g·rc), only adds to what freeboard requires.
func TestSuperelevationBeforeOvertopping(t *testing.T) {
	const src = `units = "si"
section "s" {
  shape        = "trapezoid"
  bottom_width = 2.875
  side_slope   = 0
  height       = 1.5
  roughness    = 0.012
  lining       = "concrete"
}
reach "up" {
  from    = "a"
  to      = "d"
  length  = 523.9375
  section = "s"
  slope   = 0.002
}
event "e" {
  inflow = { "up" = 0.5 }
  outlet = { depth = 1.984375 }
}
bend "k" {
  reach        = "up"
  from_station = 130.984375
  to_station   = 392.953125
  radius       = 2.875
}
`
	_, fs := solveAndCheck(t, src)
	var se, fb, capa *Finding
	for i := range fs {
		switch fs[i].Rule {
		case "superelevation":
			se = &fs[i]
		case "freeboard":
			fb = &fs[i]
		case "capacity":
			capa = &fs[i]
		}
	}
	require.NotNil(t, fb)
	require.NotNil(t, capa)
	require.NotNil(t, se, "the outer bank's shortfall before the overtopping is reported")
	assert.InDelta(t, capa.FromStation, se.ToStation, 1e-3, "up to where capacity takes over")
	assert.GreaterOrEqual(t, se.FromStation, 130.984375)
	assert.LessOrEqual(t, se.FromStation, fb.FromStation+1e-3, "the rise only adds to the freeboard's requirement")
}
