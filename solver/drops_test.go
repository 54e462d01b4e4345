package solver

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// dropModel is a mild rectangular reach falling over a vertical drop of
// height h onto a second reach (rectangle of the same width, or a
// trapezoid), with the outlet control given and an optional loss block.
func dropModel(t *testing.T, q, h float64, lower, outlet, loss string) *model.Model {
	t.Helper()
	return dropModelIn(t, "si", q, h, lower, outlet, loss)
}

// dropModelIn is dropModel in the given units (lengths as written).
func dropModelIn(t *testing.T, units string, q, h float64, lower, outlet, loss string) *model.Model {
	t.Helper()
	src := fmt.Sprintf(`
units = %q
section "rect" {
  shape        = "rectangle"
  bottom_width = 3
  height       = 8
  roughness    = 0.014
}
section "trap" {
  shape        = "trapezoid"
  bottom_width = 3
  side_slope   = 1.5
  height       = 8
  roughness    = 0.014
}
reach "upper" {
  from    = "top"
  to      = "brink"
  length  = 300
  section = "rect"
  invert  = [%g, %g]
}
reach "lower" {
  from    = "brink"
  to      = "end"
  length  = 300
  section = "%s"
  invert  = [10.0, 9.9]
}
%s
event "q" {
  inflow = { "upper" = %g }
  outlet = %s
}
`, units, 10+h+0.06, 10+h, lower, loss, q, outlet)
	return parseModel(t, "drop.chan.hcl", []byte(src))
}

// TestStraightDropRand checks the drop's depths against Rand's relations
// for several drop numbers, the start of the supercritical profile at the
// toe of the nappe, and the energy from brink to toe.
func TestStraightDropRand(t *testing.T) {
	const g, b, h = 9.80665, 3.0, 2.0
	for _, d := range []float64{0.002, 0.01, 0.05, 0.2, 0.6} {
		t.Run(fmt.Sprintf("D=%g", d), func(t *testing.T) {
			q := math.Sqrt(d * g * h * h * h) // unit discharge for drop number D
			m := dropModel(t, q*b, h, "rect", `{ condition = "critical" }`, "")
			ev := solveOne(t, m)
			up, low := ev.Reaches[0], ev.Reaches[1]
			require.Len(t, low.Drops, 1, "notes: %v", low.Notes)
			dr := low.Drops[0]
			require.Contains(t, dr.Method, "Rand (1955)")
			require.InDelta(t, d, dr.Number, 1e-9*d)
			require.InDelta(t, h, dr.Height, 1e-9)
			// Source: Rand, Flow geometry at straight drop spillways (1955),
			// as given in Chow, Open-Channel Hydraulics (1959), ch. 15
			// (from memory; /work references list the same coefficients).
			y1 := 0.54 * math.Pow(d, 0.425) * h
			yp := 1.00 * math.Pow(d, 0.22) * h
			ld := 4.30 * math.Pow(d, 0.27) * h
			require.InDelta(t, y1, dr.ToeDepth, 1e-9*y1)
			require.InDelta(t, yp, dr.PoolDepth, 1e-9*yp)
			require.InDelta(t, ld, dr.Length, 1e-9*ld)
			// Rand's sequent depth against Belanger's from y1, within the
			// scatter of the fitted relations (a few per cent).
			// Source: Belanger, y2/y1 = ½(√(1+8F1²) − 1), Chow 1959 ch. 15.
			f1 := q / (y1 * math.Sqrt(g*y1))
			y2 := y1 / 2 * (math.Sqrt(1+8*f1*f1) - 1)
			require.InDelta(t, 1.66*math.Pow(d, 0.27)*h, y2, 0.05*y2)
			require.InDelta(t, y2, dr.SequentDepth, 1e-6*y2)
			// The brink is at critical depth, yc = (q²/g)^(1/3).
			brink := up.Points[len(up.Points)-1]
			require.InDelta(t, math.Cbrt(q*q/g), brink.Depth, 1e-9)
			// The profile below starts at the toe of the nappe with y1.
			var toe Point
			for _, p := range low.Points {
				if p.Station == dr.Length {
					toe = p
					break
				}
			}
			require.InDelta(t, y1, toe.Depth, 1e-9*y1, "a point at the toe, station %v", ld)
			require.Equal(t, Supercritical, toe.Regime)
			// Energy from brink to toe: the loss Rand's relations imply,
			// positive and reported.
			e1 := toe.Invert + y1 + q*q/(2*g*y1*y1)
			e0 := brink.Invert + brink.Depth + q*q/(2*g*brink.Depth*brink.Depth)
			require.Greater(t, e0-e1, 0.0)
			require.InDelta(t, e0-e1, dr.EnergyLoss, 1e-9)
		})
	}
}

// TestStraightDropRandUS: Rand's relations are dimensionless; in US units
// (feet, g = 32.174 ft/s²) a 6 ft drop of drop number 0.05 gives the same
// ratios.
func TestStraightDropRandUS(t *testing.T) {
	const g, b, h, d = 32.174, 3.0, 6.0, 0.05
	q := math.Sqrt(d * g * h * h * h)
	low := solveOne(t, dropModelIn(t, "us", q*b, h, "rect", `{ condition = "critical" }`, "")).Reaches[1]
	require.Len(t, low.Drops, 1)
	dr := low.Drops[0]
	// Source: Rand (1955) as given in Chow 1959 ch. 15 (from memory).
	require.InDelta(t, d, dr.Number, 1e-9*d)
	require.InDelta(t, 0.54*math.Pow(d, 0.425)*h, dr.ToeDepth, 1e-9*h)
	require.InDelta(t, math.Pow(d, 0.22)*h, dr.PoolDepth, 1e-9*h)
	require.InDelta(t, 4.30*math.Pow(d, 0.27)*h, dr.Length, 1e-9*h)
}

// TestDropDrownedByTailwater: a tailwater above the sequent depth of the
// jet drowns the jump against the drop face; a tailwater above the brink's
// critical level drowns the outlet itself, and there is no drop.
func TestDropDrownedByTailwater(t *testing.T) {
	const q, h = 6.0, 2.0
	m := dropModel(t, q, h, "rect", "{ depth = 2.4 }", "")
	low := solveOne(t, m).Reaches[1]
	require.Len(t, low.Drops, 1)
	require.True(t, low.Drops[0].Drowned)
	require.Empty(t, low.Jumps)
	require.True(t, hasNote(low, NoteInfo, "drowned against the drop face"), "notes: %v", low.Notes)
	require.Equal(t, Subcritical, low.Points[0].Regime)

	// The tailwater level 12.96 stands above the brink's critical level
	// 12.74 (yc = 0.742 on the brink invert 12.0) but its energy is below
	// the brink's critical energy: the outlet is drowned, and without a
	// loss block the reach ends at the level below (Borda–Carnot, k = 1).
	m = dropModel(t, q, h, "rect", "{ depth = 3.0 }", "")
	ev := solveOne(t, m)
	require.Empty(t, ev.Reaches[1].Drops)
	up := ev.Reaches[0]
	end := up.Points[len(up.Points)-1]
	require.Equal(t, Subcritical, end.Regime)
	require.InDelta(t, ev.Reaches[1].Points[0].WSE, end.WSE, 1e-9, "drowned outlet at the level below")
	require.True(t, hasNote(up, NoteInfo, "drowned"), "notes: %v", up.Notes)
}

// TestDropByEnergy: onto a trapezoid Rand's relations do not apply; the
// jet's energy is the brink's less the node's loss k·|Δ(αV²/2g)| with the
// contraction coefficient (the velocity head rises into the jet).
func TestDropByEnergy(t *testing.T) {
	const q, h, k, g = 6.0, 2.0, 0.2, 9.80665
	m := dropModel(t, q, h, "trap", `{ condition = "critical" }`,
		fmt.Sprintf("loss \"face\" {\n  node = \"brink\"\n  contraction = %g\n}\n", k))
	ev := solveOne(t, m)
	up, low := ev.Reaches[0], ev.Reaches[1]
	require.Len(t, low.Drops, 1)
	dr := low.Drops[0]
	require.True(t, strings.HasPrefix(dr.Method, "energy"), dr.Method)
	require.Zero(t, dr.Length)
	brink, toe := up.Points[len(up.Points)-1], low.Points[0]
	hvB := brink.Energy - brink.WSE
	a := (3 + 1.5*toe.Depth) * toe.Depth
	hvT := (q / a) * (q / a) / (2 * g)
	// Source: Chow 1959, §17-2: h = k·|Δ(αV²/2g)|.
	require.InDelta(t, k*(hvT-hvB), brink.Energy-(toe.Invert+toe.Depth+hvT), 1e-6)
	require.InDelta(t, brink.Energy-toe.Energy, dr.EnergyLoss, 1e-9)
	require.Equal(t, Supercritical, toe.Regime)
}
