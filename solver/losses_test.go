package solver

import (
	"fmt"
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// lossModel is a one-reach model whose rectangular section changes width
// at station 300, with the loss block given.
func lossModel(t *testing.T, widthUp, widthDown, slope float64, loss, outlet, entrance string) *model.Model {
	t.Helper()
	src := fmt.Sprintf(`
units = "si"
section "up" {
  shape        = "rectangle"
  bottom_width = %g
  height       = 5
  roughness    = 0.014
}
section "down" {
  shape        = "rectangle"
  bottom_width = %g
  height       = 5
  roughness    = 0.014
}
reach "trunk" {
  from    = "head"
  to      = "end"
  length  = 600
  section = "up"
  slope   = %g
  segment {
    from_station = 300
    to_station   = 600
    section      = "down"
  }
}
%s
event "q" {
  inflow = { "trunk" = 8.0 }
  outlet = %s
  %s
}
`, widthUp, widthDown, slope, loss, outlet, entrance)
	return parseModel(t, "loss.chan.hcl", []byte(src))
}

// pairAt returns the two points of a reach at one station (the two sides
// of a section change).
func pairAt(t *testing.T, rr *ReachResult, x float64) (up, down Point) {
	t.Helper()
	for i := 1; i < len(rr.Points); i++ {
		if rr.Points[i-1].Station == x && rr.Points[i].Station == x {
			return rr.Points[i-1], rr.Points[i]
		}
	}
	t.Fatalf("no pair of points at station %v", x)
	return
}

// TestLossAtSectionChange checks that the energy drop across a loss block
// equals k·|Δ(αV²/2g)|, with the contraction coefficient where the
// velocity head rises downstream and the expansion coefficient where it
// falls, in subcritical and in supercritical flow.
func TestLossAtSectionChange(t *testing.T) {
	const kc, ke = 0.1, 0.3 // warped transition (Hinds 1928 in Chow 1959 Table 17-1, from memory)
	cases := []struct {
		name             string
		wUp, wDown, s0   float64
		outlet, entrance string
		super            bool
		wantState        string
	}{
		{"subcritical narrowing", 4, 2.5, 0.0005, "{ depth = 2.0 }", "", false, StateContraction},
		{"subcritical widening", 2.5, 4, 0.0005, "{ depth = 2.0 }", "", false, StateExpansion},
		// In supercritical flow a narrowing deepens the flow and slows it:
		// the velocity head falls, so the expansion coefficient applies.
		{"supercritical narrowing", 3.5, 3, 0.03, `{ condition = "critical" }`, `entrance = { "trunk" = 0.35 }`, true, StateExpansion},
		{"supercritical widening", 3, 3.5, 0.03, `{ condition = "critical" }`, `entrance = { "trunk" = 0.35 }`, true, StateContraction},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			loss := fmt.Sprintf("loss \"throat\" {\n  reach = \"trunk\"\n  station = 300\n  contraction = %g\n  expansion = %g\n}\n", kc, ke)
			m := lossModel(t, c.wUp, c.wDown, c.s0, loss, c.outlet, c.entrance)
			rr := solveOne(t, m).Reaches[0]
			require.Empty(t, rr.Jumps, "notes: %v", rr.Notes)
			a, b := pairAt(t, rr, 300)
			if c.super {
				require.Equal(t, Supercritical, a.Regime)
				require.Equal(t, Supercritical, b.Regime)
			} else {
				require.Equal(t, Subcritical, a.Regime)
				require.Equal(t, Subcritical, b.Regime)
			}
			// Velocity heads computed here from the depths, not read back.
			g := 9.80665
			hv := func(p Point, w float64) float64 { v := 8.0 / (w * p.Depth); return v * v / (2 * g) }
			hva, hvb := hv(a, c.wUp), hv(b, c.wDown)
			k := ke
			if hvb > hva {
				k = kc
			}
			// Source: Chow, Open-Channel Hydraulics (1959), §17-2: transition
			// loss h = k·|Δ(αV²/2g)|, α = 1 in a rectangle.
			require.InDelta(t, k*math.Abs(hvb-hva), (a.Depth+hva)-(b.Depth+hvb), 1e-6)
			require.Len(t, rr.Structures, 1)
			st := rr.Structures[0]
			require.Equal(t, StructTransition, st.Kind)
			require.Equal(t, c.wantState, st.State)
			require.InDelta(t, k, st.Coefficient, 0)
			require.InDelta(t, k*math.Abs(hvb-hva), st.HeadLoss, 1e-6)
		})
	}
}

// TestDefaultLossApplies: a model-wide default applies at a section change
// without a loss of its own, and a model without loss blocks says that no
// local losses were modelled.
func TestDefaultLossApplies(t *testing.T) {
	m := lossModel(t, 4, 2.5, 0.0005, "loss \"everywhere\" {\n  contraction = 0.2\n  expansion = 0.4\n}\n", "{ depth = 2.0 }", "")
	res, err := Solve(m, Options{})
	require.NoError(t, err)
	require.Empty(t, res.Assumptions())
	rr := res.Events[0].Reaches[0]
	require.Len(t, rr.Structures, 1)
	require.Equal(t, "everywhere", rr.Structures[0].Name)
	require.InDelta(t, 0.2, rr.Structures[0].Coefficient, 0)

	res, err = Solve(lossModel(t, 4, 2.5, 0.0005, "", "{ depth = 2.0 }", ""), Options{})
	require.NoError(t, err)
	require.Equal(t, []string{NoLocalLosses}, res.Assumptions())
	a, b := pairAt(t, res.Events[0].Reaches[0], 300)
	require.InDelta(t, a.Energy, b.Energy, 1e-9, "no loss without a loss block")
}

// conduitModel is a circular conduit discharging at node "exit" into a
// wide channel that ends at the outfall with the given depth; the
// channel's invert at its head is 1 m below the conduit's end for the low
// tailwater case (drop = 1) or level with it.
func conduitModel(t *testing.T, tail, drop float64, loss string) *model.Model {
	t.Helper()
	src := fmt.Sprintf(`
units = "si"
section "pipe" {
  shape     = "circle"
  diameter  = 1.2
  roughness = 0.013
}
section "channel" {
  shape        = "trapezoid"
  bottom_width = 4
  side_slope   = 2
  height       = 4
  roughness    = 0.030
}
reach "conduit" {
  from    = "inlet"
  to      = "exit"
  length  = 60
  section = "pipe"
  invert  = [%g, %g]
}
reach "channel" {
  from    = "exit"
  to      = "outfall"
  length  = 100
  section = "channel"
  invert  = [10.0, 9.9]
}
%s
event "q" {
  inflow = { "conduit" = 1.5 }
  outlet = { depth = %g }
}
`, 10.06+drop, 10.0+drop, loss, tail)
	return parseModel(t, "conduit.chan.hcl", []byte(src))
}

// circleAT is the area and top width of a circle of diameter d at depth y.
// Source: common practice (no published source): segment geometry,
// θ = 2·acos(1 − 2y/d), A = d²(θ − sin θ)/8, T = d·sin(θ/2).
func circleAT(d, y float64) (a, tw float64) {
	th := 2 * math.Acos(1-2*y/d)
	return d * d * (th - math.Sin(th)) / 8, d * math.Sin(th/2)
}

// TestConduitIntoHighTailwater: with the tailwater above the conduit's
// critical level the outlet is drowned: with an exit loss k = 1 its end
// water level equals the tailwater's (FHWA HDS-5 takes ho = TW), with
// another coefficient its energy exceeds the energy below by k·Δhv, and
// the profile upstream follows by the energy equation; with a low
// tailwater (a drop below the outlet) the conduit ends at critical depth.
func TestConduitIntoHighTailwater(t *testing.T) {
	const q, d, n, g = 1.5, 1.2, 0.013, 9.80665
	for _, k := range []float64{1.0, 0.5} {
		t.Run(fmt.Sprintf("k=%g", k), func(t *testing.T) {
			m := conduitModel(t, 1.6, 0, fmt.Sprintf("loss \"exit\" {\n  node = \"exit\"\n  expansion = %g\n}\n", k))
			ev := solveOne(t, m)
			pipe, ch := ev.Reaches[0], ev.Reaches[1]
			end, head := pipe.Points[len(pipe.Points)-1], ch.Points[0]
			require.Greater(t, end.Depth, end.CriticalDepth, "drowned outlet")
			a, _ := circleAT(d, end.Depth)
			hvEnd := (q / a) * (q / a) / (2 * g)
			hvDown := head.Energy - head.WSE
			// Source: FHWA HDS-5 (2012), exit loss Ho = 1.0·(V²/2g − Vd²/2g)
			// (from memory); Chow 1959 §17-2 for the general k.
			require.InDelta(t, k*(hvEnd-hvDown), (end.WSE+hvEnd)-head.Energy, 1e-6)
			if k == 1 {
				require.InDelta(t, head.WSE, end.WSE, 1e-6, "outlet level = tailwater level")
			}
			require.Equal(t, StateDrowned, pipe.Structures[len(pipe.Structures)-1].State)
			// The profile upstream: every pair of neighbouring points closes
			// the energy equation with the average friction slope, evaluated
			// here with the segment formulas (Chow 1959, §10-3).
			for i := 1; i < len(pipe.Points); i++ {
				p1, p2 := pipe.Points[i-1], pipe.Points[i]
				e := func(p Point) (float64, float64) {
					a, _ := circleAT(d, p.Depth)
					th := 2 * math.Acos(1-2*p.Depth/d)
					r := a / (d * th / 2)
					v := q / a
					sf := math.Pow(v*n/math.Pow(r, 2.0/3), 2)
					return p.Invert + p.Depth + v*v/(2*g), sf
				}
				h1, s1 := e(p1)
				h2, s2 := e(p2)
				require.InDelta(t, h1, h2+(p2.Station-p1.Station)*(s1+s2)/2, 1e-6, "points %d-%d", i-1, i)
			}
		})
	}
	t.Run("low tailwater", func(t *testing.T) {
		m := conduitModel(t, 0.5, 1.0, "")
		pipe := solveOne(t, m).Reaches[0]
		end := pipe.Points[len(pipe.Points)-1]
		a, tw := circleAT(d, end.Depth)
		// Source: Chow 1959, ch. 4: critical flow Q²T/(gA³) = 1.
		require.InDelta(t, 1, q*q*tw/(g*a*a*a), 1e-6, "critical depth at the free outlet")
		require.Equal(t, StateFree, pipe.Structures[len(pipe.Structures)-1].State)
	})
}

// TestOutfallExitLoss: a loss at the outlet node makes the outlet level
// that of still receiving water; with k = 1 the reach ends exactly at it.
func TestOutfallExitLoss(t *testing.T) {
	src := []byte(`
units = "si"
section "pipe" {
  shape     = "circle"
  diameter  = 1.2
  roughness = 0.013
}
reach "conduit" {
  from    = "inlet"
  to      = "pond"
  length  = 60
  section = "pipe"
  slope   = 0.004
}
loss "pond-exit" {
  node      = "pond"
  expansion = 1.0
}
event "q" {
  inflow = { "conduit" = 1.5 }
  outlet = { depth = 1.4 }
}
`)
	rr := solveOne(t, parseModel(t, "outfall.chan.hcl", src)).Reaches[0]
	end := rr.Points[len(rr.Points)-1]
	// Source: FHWA HDS-5 (2012): the outlet depth of a conduit is the
	// tailwater depth when it is above the critical depth (from memory).
	require.InDelta(t, 1.4, end.Depth, 1e-9)
	require.Equal(t, StateDrowned, rr.Structures[0].State)
	require.InDelta(t, end.Energy-end.WSE, rr.Structures[0].HeadLoss, 1e-9)
}

// TestAbruptExpansionIsNotAControl: a lined trapezoid opening abruptly
// into a wide natural section, subcritical on both sides. The balance
// without loss has no subcritical solution upstream (the narrow channel's
// velocity head exceeds what the wide section's energy allows), which
// used to put a critical control and a drawdown at the change. The water
// below stands above the upstream critical level, so the change is
// drowned: the level carries across, the upstream velocity head is lost
// (Borda–Carnot), and the flow stays subcritical with a note.
//
// Source: Chow, Open-Channel Hydraulics (1959), §17-2 (sudden expansion
// loss, from memory); common practice (no published source) for the
// continuity of the water level across a drowned expansion.
func TestAbruptExpansionIsNotAControl(t *testing.T) {
	src := []byte(`
units = "si"
section "lined" {
  shape        = "trapezoid"
  bottom_width = 2
  side_slope   = 1.5
  height       = 3
  roughness    = 0.014
}
section "valley" {
  shape     = "points"
  points    = [[0, 3], [10, 1.2], [14, 0.1], [16, 0], [18, 0.1], [22, 1.2], [40, 3]]
  banks     = [10, 22]
  roughness = [0.06, 0.035, 0.06]
}
reach "trunk" {
  from    = "top"
  to      = "end"
  length  = 600
  section = "lined"
  slope   = 0.0008
  segment {
    from_station = 300
    to_station   = 600
    section      = "valley"
  }
}
event "q" {
  inflow = { "trunk" = 12 }
  outlet = { depth = 0.9 }
}
`)
	rr := solveOne(t, parseModel(t, "expansion.chan.hcl", src)).Reaches[0]
	require.Empty(t, rr.Jumps)
	for _, n := range rr.Notes {
		require.NotEqual(t, NoteCriticalFallback, n.Kind, n.Message)
	}
	for i, p := range rr.Points {
		require.Equal(t, Subcritical, p.Regime, "point %d at %v", i, p.Station)
		if i > 0 {
			require.LessOrEqual(t, p.Energy, rr.Points[i-1].Energy+1e-9, "energy at %v", p.Station)
		}
	}
	a, b := pairAt(t, rr, 300)
	require.InDelta(t, a.WSE, b.WSE, 1e-12)
	require.True(t, hasNote(rr, NoteInfo, "drowned"), "notes: %v", rr.Notes)
	require.Len(t, rr.Structures, 1)
	require.InDelta(t, a.Energy-b.Energy, rr.Structures[0].HeadLoss, 1e-9)
}

// TestJunctionContractionLoss: a wide channel entering a narrow one at a
// node with a loss block, subcritical: the energy at the end of the reach
// above exceeds the energy at the start of the reach below by
// k·(hv_down − hv_up) with the contraction coefficient.
func TestJunctionContractionLoss(t *testing.T) {
	const k = 0.5
	wide := trapezoid("wide", 6, 2, 0.03, 5)
	narrow := trapezoid("narrow", 2.5, 0, 0.014, 5)
	m := buildNet(t, model.SI, []netReach{
		{name: "above", from: "a", to: "n", length: 300, slope: 0.001, sec: wide, inflow: 9},
		{name: "below", from: "n", to: "out", length: 300, slope: 0.001, sec: narrow},
	}, model.Outlet{Kind: model.OutletDepth, Value: 2.0})
	l := &model.Loss{Name: "entry", NodeName: "n", Contraction: k, Expansion: 0.3}
	m.Losses = []*model.Loss{l}
	m.Reaches[0].EndLoss = l
	ev := solveOne(t, m)
	end, start := ev.Reaches[0].Points[len(ev.Reaches[0].Points)-1], ev.Reaches[1].Points[0]
	require.Equal(t, Subcritical, end.Regime)
	require.Equal(t, Subcritical, start.Regime)
	hv := func(a float64) float64 { return (9 / a) * (9 / a) / (2 * 9.80665) }
	hvUp, hvDown := hv((6+2*end.Depth)*end.Depth), hv(2.5*start.Depth)
	require.Greater(t, hvDown, hvUp)
	// Source: Chow 1959, §17-2: h = k·|Δ(αV²/2g)|, contraction coefficient
	// where the velocity head rises downstream.
	require.InDelta(t, k*(hvDown-hvUp), (end.WSE+hvUp)-(start.WSE+hvDown), 1e-6)
	st := ev.Reaches[0].Structures
	require.Len(t, st, 1)
	require.Equal(t, StateDrowned, st[0].State)
	require.InDelta(t, k, st[0].Coefficient, 0)
}
