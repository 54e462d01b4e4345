package rules

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// nearCriticalChute is a trapezoidal chute (b = 3 m, 2:1, n = 0.015,
// Q = 10 m³/s, 400 m) on 1.05 times its critical slope: normal depth
// 0.845 m just below critical depth 0.856 m (F = 1.02), under a tailwater
// of 1.2 times the sequent depth of normal depth, so that an undular jump
// stands on the uniform supercritical flow about 50 m above the outlet.
// With a basin from..to when to > from.
func nearCriticalChute(slope, tail, from, to float64) string {
	basin := ""
	if to > from {
		basin = fmt.Sprintf("basin \"pool\" {\n  reach = \"chute\"\n  from_station = %.17g\n  to_station = %.17g\n}\n", from, to)
	}
	return fmt.Sprintf(`units = "si"
section "s" {
  shape = "trapezoid"
  bottom_width = 3
  side_slope = 2
  height = 4
  roughness = 0.015
  lining = "concrete"
}
reach "chute" {
  from = "a"
  to = "b"
  length = 400
  section = "s"
  slope = %.17g
}
%sevent "e" {
  inflow = { chute = 10 }
  outlet = { depth = %.17g }
}
`, slope, basin, tail)
}

// TestToeShiftNearCritical checks toeShift against an independent
// quadrature and the sentence and statement it adds where a containment
// verdict rests on less than it.
//
// Source: specific force equal on both sides of a jump and the
// gradually-varied-flow equation (Chow, Open-Channel Hydraulics, 1959,
// ch. 3 and eq. 9-13); on the uniform supercritical flow the toe is where
// the S1 curve has the sequent depth y2 of normal depth, so 1 % of depth
// there moves the toe by the S1 curve's distance from 0.995·y2 to
// 1.005·y2, integrated by stationOf (gonum quadrature). (From y2 to
// 1.01·y2 it is 1.64 m against 1.42: the S1 curve bends within that 1 %.)
func TestToeShiftNearCritical(t *testing.T) {
	ref := backwater{u: model.SI, l: 1, b: 3, z: 2, n: 0.015, q: 10, length: 400, g: model.SI.Gravity(), k: model.SI.Manning()}
	// Critical depth and slope by the test's own bisection.
	yc := depthWhere(func(y float64) float64 { return ref.froude(y) - 1 }, 0.1, 5)
	ref.s0 = 1.05 * ref.sf(yc)
	yn := depthWhere(func(y float64) float64 { return ref.sf(y) - ref.s0 }, 0.1, 5)
	force := func(y float64) float64 { a := ref.area(y); return ref.q*ref.q/(ref.g*a) + ref.b*y*y/2 + ref.z*y*y*y/3 }
	y2 := depthWhere(func(y float64) float64 { return force(y) - force(yn) }, yc, 5)
	ref.yOut = 1.2 * y2
	want := math.Abs(ref.stationOf(1.005*y2) - ref.stationOf(0.995*y2))

	src := nearCriticalChute(ref.s0, ref.yOut, 0, 0)
	m, diags := model.Parse("chute.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), diags.Error())
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	rr := res.Events[0].Reaches[0]
	require.Len(t, rr.Jumps, 1)
	j := rr.Jumps[0]
	require.Equal(t, solver.Undular, j.Type)
	got, ok := toeShift(rr, j)
	require.True(t, ok)
	// First order against the central difference: within 5 %.
	assert.InDelta(t, want, got, 0.05*want)
	t.Logf("toe %.3f m, F1 %.4f: shift %.3f m for 1 %% of y2 (quadrature %.3f m)", j.Station, j.Froude, got, want)

	pol := baselinePack(t)
	// A basin 0.4 m longer than the jump on either side: contained, by
	// less than the shift.
	in := nearCriticalChute(ref.s0, ref.yOut, j.Station-0.4, j.End()+0.4)
	assert.Empty(t, ruleFindings(t, in, pol, "jump_containment"))
	mi, _ := model.Parse("in.chan.hcl", []byte(in))
	ri, err := solver.Solve(mi, solver.Options{})
	require.NoError(t, err)
	notes := strings.Join(NotEvaluated(mi, ri, pol), "\n")
	assert.Contains(t, notes, "jump_containment: jumps inside their basin by less than their toe moves")
	assert.Contains(t, notes, `in basin "pool"`)
	// Starting 0.4 m below the toe: escapes by 0.4 m, which the shift
	// overturns.
	out := nearCriticalChute(ref.s0, ref.yOut, j.Station+0.4, j.End()+5)
	fs := ruleFindings(t, out, pol, "jump_containment")
	require.Len(t, fs, 1)
	assert.Contains(t, fs[0].Message, "escapes basin")
	assert.Contains(t, fs[0].Message, "the verdict is sensitive")
	// A basin with metres to spare says nothing of it.
	wide := nearCriticalChute(ref.s0, ref.yOut, j.Station-10, j.End()+10)
	mw, _ := model.Parse("wide.chan.hcl", []byte(wide))
	rw, err := solver.Solve(mw, solver.Options{})
	require.NoError(t, err)
	assert.NotContains(t, strings.Join(NotEvaluated(mw, rw, pol), "\n"), "inside their basin by less")
}
