package solver

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// TestSubcriticalJunction: two mild tributaries join a trunk that runs at
// normal depth to the outlet. Expectations come from the independent
// closed-form model: the trunk's normal depth, the energy grade elevation
// at the head of the trunk, and each tributary's end depth with that
// energy on its subcritical branch.
//
// Source: energy balance without loss at a junction of subcritical flows
// (Chow 1959, §10-3 and ch. 12, from memory) and Manning's equation for
// normal depth (Chow 1959, ch. 6); discharge accumulates downstream
// (model-format.md).
func TestSubcriticalJunction(t *testing.T) {
	const g = 9.80665
	trunkSec := trapezoid("trunk", 4, 0, 0.015, 3)
	westSec := trapezoid("west", 2, 1.5, 0.02, 2)
	northSec := trapezoid("north", 1.5, 0, 0.015, 2)
	m := buildNet(t, model.SI, []netReach{
		{name: "west", from: "w", to: "j", length: 600, slope: 0.001, sec: westSec, inflow: 3},
		{name: "north", from: "n", to: "j", length: 400, slope: 0.004, sec: northSec, inflow: 2},
		{name: "trunk", from: "j", to: "out", length: 800, slope: 0.002, sec: trunkSec, inflow: 0.5},
	}, model.Outlet{Kind: model.OutletNormal})
	ev := solveOne(t, m)
	west, north, trunk := ev.Reaches[0], ev.Reaches[1], ev.Reaches[2]

	// Discharge conserved at the junction.
	require.InDelta(t, west.Discharge+north.Discharge+0.5, trunk.Discharge, 1e-12)
	require.InDelta(t, 5.5, trunk.Discharge, 1e-12)

	refT := gvfTrapezoid{b: 4, z: 0, n: 0.015, k: 1, g: g, q: 5.5, s0: 0.002}
	yn := refT.normalDepth()
	for _, p := range trunk.Points {
		require.InDelta(t, yn, p.Depth, 1e-6*yn, "uniform trunk at station %v", p.Station)
	}
	require.Empty(t, trunk.Profiles, "uniform flow belongs to no varied-flow profile")
	h := m.Reaches[2].InvertUp + refT.energy(yn)
	require.InDelta(t, h, trunk.Points[0].Energy, 1e-6)

	for _, c := range []struct {
		rr  *ReachResult
		ref gvfTrapezoid
	}{
		{west, gvfTrapezoid{b: 2, z: 1.5, n: 0.02, k: 1, g: g, q: 3, s0: 0.001}},
		{north, gvfTrapezoid{b: 1.5, z: 0, n: 0.015, k: 1, g: g, q: 2, s0: 0.004}},
	} {
		last := c.rr.Points[len(c.rr.Points)-1]
		e := h - last.Invert
		yc := c.ref.criticalDepth()
		require.Greater(t, e, c.ref.energy(yc), "the junction level drowns the tributary end")
		want := bisect(func(y float64) float64 { return c.ref.energy(y) - e }, yc, 50)
		require.InDeltaf(t, want, last.Depth, 1e-6*want, "end depth of %s", c.rr.Reach.Name)
		require.InDeltaf(t, h, last.Energy, 1e-6, "energy grade of %s at the junction", c.rr.Reach.Name)
		require.Equal(t, Mild, c.rr.SlopeClass)
	}
	requireFinite(t, &Result{Events: []*EventResult{ev}})
}

// TestFreeFallIntoJunction: a tributary whose bed ends high above the
// junction level ends at critical depth (a drop into the junction).
//
// Source: a free overfall passes through critical depth at the brink
// (Chow 1959, §4-4; common practice to take the brink depth as critical
// in a screening model).
func TestFreeFallIntoJunction(t *testing.T) {
	trunkSec := trapezoid("trunk", 6, 0, 0.015, 3)
	sideSec := trapezoid("side", 1, 0, 0.015, 2)
	m := buildNet(t, model.SI, []netReach{
		{name: "side", from: "s", to: "j", length: 200, slope: 0.001, sec: sideSec, inflow: 1},
		{name: "main", from: "m", to: "j", length: 200, slope: 0.001, sec: trunkSec, inflow: 4},
		{name: "trunk", from: "j", to: "out", length: 300, slope: 0.001, sec: trunkSec, inflow: 0},
	}, model.Outlet{Kind: model.OutletNormal})
	// Raise the side reach's bed by a 2 m step above the junction.
	m.Reaches[0].InvertUp += 2
	m.Reaches[0].InvertDown += 2
	ev := solveOne(t, m)
	side := ev.Reaches[0]
	last := side.Points[len(side.Points)-1]
	ref := gvfTrapezoid{b: 1, z: 0, n: 0.015, k: 1, g: 9.80665, q: 1, s0: 0.001}
	require.InDelta(t, ref.criticalDepth(), last.Depth, 1e-7)
	require.Equal(t, Critical, last.Regime)
	require.Equal(t, []string{"M2"}, side.ProfileTypes())
}

// TestSupercriticalJunction: two steep tributaries reach normal depth and
// join a steep trunk. The rule documented in network.go: the trunk starts
// on its supercritical branch at the discharge-weighted energy grade
// elevation of the inflows, H = Σ Qᵢ·Hᵢ / Σ Qᵢ, without loss. The trunk
// is wide enough that its critical energy (the junction level the
// subcritical pass passes upstream) is below both tributaries' critical
// energies, so neither is drowned and both arrive supercritical. (With a
// narrow trunk the junction level can exceed a tributary's sequent depth
// and the jump then forms at the tributary's end.)
//
// Source: conservation of energy flux at a junction without loss
// (common practice (no published source) for a screening model);
// normal depth by Manning's equation (Chow 1959, ch. 6).
func TestSupercriticalJunction(t *testing.T) {
	const g = 9.80665
	a := trapezoid("a", 1.2, 0, 0.014, 1.5)
	b := trapezoid("b", 1.0, 1, 0.014, 1.5)
	trunk := trapezoid("trunk", 4, 0, 0.014, 2)
	m := buildNet(t, model.SI, []netReach{
		{name: "a", from: "ha", to: "j", length: 1500, slope: 0.03, sec: a, inflow: 2},
		{name: "b", from: "hb", to: "j", length: 1500, slope: 0.05, sec: b, inflow: 1.5},
		{name: "trunk", from: "j", to: "out", length: 300, slope: 0.03, sec: trunk},
	}, model.Outlet{Kind: model.OutletCritical})
	ev := solveOne(t, m)
	refA := gvfTrapezoid{b: 1.2, z: 0, n: 0.014, k: 1, g: g, q: 2, s0: 0.03}
	refB := gvfTrapezoid{b: 1.0, z: 1, n: 0.014, k: 1, g: g, q: 1.5, s0: 0.05}
	refT := gvfTrapezoid{b: 4, z: 0, n: 0.014, k: 1, g: g, q: 3.5, s0: 0.03}
	z := m.Reaches[2].InvertUp
	hA := z + refA.energy(refA.normalDepth())
	hB := z + refB.energy(refB.normalDepth())
	h := (2*hA + 1.5*hB) / 3.5
	yc := refT.criticalDepth()
	want := bisect(func(y float64) float64 { return refT.energy(y) - (h - z) }, 1e-3, yc)
	got := ev.Reaches[2].Points[0]
	// The tributaries are 1.5 km long: their S2 curves are at normal depth
	// to far better than 1e-6 at the junction.
	require.InDelta(t, want, got.Depth, 1e-6*want)
	require.Equal(t, Supercritical, got.Regime)
	require.True(t, hasNote(ev.Reaches[2], NoteInfo, "discharge-weighted energy"))
	for _, r := range ev.Reaches[:2] {
		require.Equal(t, Steep, r.SlopeClass)
		require.Equal(t, []string{"S2"}, r.ProfileTypes())
	}
	require.InDelta(t, 3.5, ev.Reaches[2].Discharge, 1e-12)
}

// TestJumpMovesIntoNextReach: a steep chute runs supercritical to its end
// and the jump forms in the mild reach below; with a higher tailwater the
// jump moves up into the chute.
//
// Source: specific force equal across a jump (Chow 1959, ch. 3); a jump
// forms where the supercritical flow's force falls to the subcritical
// flow's (Chow 1959, §10-3, from memory).
func TestJumpMovesIntoNextReach(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 5)
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: 10}
	build := func(tail float64) *EventResult {
		m := buildNet(t, model.SI, []netReach{
			{name: "chute", from: "top", to: "toe", length: 100, slope: 0.02, sec: sec, inflow: 10},
			{name: "canal", from: "toe", to: "out", length: 400, slope: 0.001, sec: sec},
		}, model.Outlet{Kind: model.OutletDepth, Value: tail})
		return solveOne(t, m)
	}

	ev := build(1.6)
	chute, canal := ev.Reaches[0], ev.Reaches[1]
	require.Equal(t, []string{"S2"}, chute.ProfileTypes())
	require.Empty(t, chute.Jumps)
	end := chute.Points[len(chute.Points)-1]
	require.Equal(t, Supercritical, end.Regime)
	// Same section and invert at the junction: equal energy gives the
	// same supercritical depth.
	require.InDelta(t, end.Depth, canal.Points[0].Depth, 1e-7)
	require.Equal(t, []string{"M3", "M1"}, canal.ProfileTypes()[:2])
	require.Len(t, canal.Jumps, 1)
	j := canal.Jumps[0]
	require.InDelta(t, ref.force(j.UpstreamDepth), ref.force(j.DownstreamDepth), 1e-6*ref.force(j.UpstreamDepth))

	ev = build(3.0)
	chute, canal = ev.Reaches[0], ev.Reaches[1]
	require.Equal(t, []string{"S2", "S1"}, chute.ProfileTypes())
	require.Len(t, chute.Jumps, 1)
	require.Empty(t, canal.Jumps)
	for _, p := range canal.Points {
		require.Equal(t, Subcritical, p.Regime)
	}
}

// junctionJumpNet is a steep rectangular chute and a mild side channel
// joining a wider mild canal that runs to a tailwater depth: the pool the
// tailwater backs up to the junction decides whether the chute's jump
// lies inside the chute or is held at the junction.
// It returns the solved event and, from the independent reference, the
// canal's depth and specific energy at the junction (its M1 curve
// integrated by quadrature from the tailwater).
func junctionJumpNet(t *testing.T, canalWidth, tail float64) (ev *EventResult, poolY, poolE float64) {
	m := buildNet(t, model.SI, []netReach{
		{name: "chute", from: "top", to: "j", length: 60, slope: 0.02, sec: trapezoid("chute", 2, 0, 0.014, 3), inflow: 6},
		{name: "side", from: "s", to: "j", length: 200, slope: 0.001, sec: trapezoid("side", 1.5, 0, 0.015, 3), inflow: 1},
		{name: "canal", from: "j", to: "out", length: 300, slope: 0.0005, sec: trapezoid("canal", canalWidth, 0, 0.015, 5)},
	}, model.Outlet{Kind: model.OutletDepth, Value: tail})
	refC := gvfTrapezoid{b: canalWidth, z: 0, n: 0.015, k: 1, g: 9.80665, q: 7, s0: 0.0005}
	poolY = refC.depthAt(300, tail, refC.normalDepth()*1.0001, 0)
	return solveOne(t, m), poolY, refC.energy(poolY)
}

// chuteRef is the independent model of the chute of junctionJumpNet.
var chuteRef = gvfTrapezoid{b: 2, z: 0, n: 0.014, k: 1, g: 9.80665, q: 6, s0: 0.02}

// TestJumpInIncomingReachAtJunction: supercritical flow down a chute that
// meets a junction whose pool has the greater specific force: the jump
// forms inside the chute, where the force of its S2 curve (from critical
// depth at its head) equals that of its S1 curve (from the depth with the
// junction's energy at its end), and neither the chute's end nor the
// canal's start is supercritical. The expectation is computed
// independently: the canal's M1 curve by quadrature from the tailwater to
// the junction, the junction's energy grade elevation H from it (energy
// balance without loss), the chute's end depth from E(y) = H − z on its
// subcritical branch, and the toe where the two chute profiles' specific
// forces are equal, each integrated by quadrature.
//
// Source: the gradually-varied-flow equation dy/dx = (S0 − Sf)/(1 − F²)
// integrated with gonum quad (Chow 1959, ch. 9); energy balance without
// loss at a junction (Chow 1959, §10-3, from memory); a jump forms where
// the specific forces of the two profiles are equal (Chow 1959, ch. 3 and
// §10-3, from memory).
func TestJumpInIncomingReachAtJunction(t *testing.T) {
	ev, y0, e := junctionJumpNet(t, 3, 2.1)
	chute, canal := ev.Reaches[0], ev.Reaches[2]
	require.InDelta(t, y0, canal.Points[0].Depth, 2e-3*y0, "canal depth at the junction")
	require.Empty(t, canal.Jumps)
	for _, n := range canal.Notes {
		require.NotContains(t, n.Message, "junction", "no jump is held at the junction")
	}

	ref := chuteRef
	yc, yn := ref.criticalDepth(), ref.normalDepth()
	// Same invert at both reach ends of the junction: E(y) = H − z is the
	// canal's specific energy there.
	yEnd := bisect(func(y float64) float64 { return ref.energy(y) - e }, yc, 50)
	require.Greater(t, ref.force(yEnd), ref.force(yn), "the pool drowns the chute's normal flow: the jump is inside the chute")
	sup := refProfile{0, yc, yn * 1.0001}
	sub := refProfile{60, yEnd, yc}
	j := checkJump(t, ref, chute, sup, sub, yn*1.001, yc*(1-1e-9))
	require.Greater(t, j.Station, 0.0)
	require.Less(t, j.Station, 60.0)
	last := chute.Points[len(chute.Points)-1]
	require.Equal(t, Subcritical, last.Regime)
	require.InDelta(t, yEnd, last.Depth, 2e-3*yEnd)
	require.Equal(t, []string{"S2", "S1"}, chute.ProfileTypes())
}

// TestJumpHeldAtJunction: with a canal wide enough, the pool's energy at
// the junction is below the chute's critical energy, so no subcritical
// flow exists at the chute's end to jump to: the chute is supercritical
// to its end, and the jump that the canal's deeper subcritical flow forces
// is held at the junction (station 0 of the canal) with a note. This is
// the one place a jump stays at the node.
//
// Source: as TestJumpInIncomingReachAtJunction; specific energy has its
// minimum at critical depth (Chow 1959, ch. 3).
func TestJumpHeldAtJunction(t *testing.T) {
	ev, _, e := junctionJumpNet(t, 12, 0.9)
	chute, canal := ev.Reaches[0], ev.Reaches[2]
	require.Less(t, e, chuteRef.energy(chuteRef.criticalDepth()), "the pool is below the chute's critical energy")

	require.Empty(t, chute.Jumps)
	for _, p := range chute.Points[1:] {
		require.Equalf(t, Supercritical, p.Regime, "chute at %v", p.Station)
	}
	require.Len(t, canal.Jumps, 1)
	require.Equal(t, 0.0, canal.Jumps[0].Station)
	require.True(t, hasNote(canal, NoteControl, "the jump is held at the junction"), "notes %v", canal.Notes)
}
