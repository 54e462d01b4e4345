package solver

import (
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

// refProfile is one branch of a reference profile: the control (x0, y0)
// and the depth it tends to away from the control (its depth range).
type refProfile struct{ x0, y0, yFar float64 }

// refJumpStation is where the specific force of the supercritical
// reference profile equals that of the subcritical one. It searches on the
// upstream sequent depth y1 within [y1a, y1b] (on the supercritical
// profile): its station follows by quadrature, its conjugate depth y2 from
// equal specific force, and the station of y2 on the subcritical profile
// by quadrature again; the toe is where the two stations coincide.
func (t gvfTrapezoid) refJumpStation(sup, sub refProfile, y1a, y1b float64) float64 {
	yc := t.criticalDepth()
	conj := func(y1 float64) float64 {
		m := t.force(y1)
		return bisect(func(y float64) float64 { return t.force(y) - m }, yc, 1e3)
	}
	xSup := func(y1 float64) float64 { return sup.x0 + t.distance(sup.y0, y1) }
	y1 := bisect(func(y1 float64) float64 { return xSup(y1) - (sub.x0 + t.distance(sub.y0, conj(y1))) }, y1a, y1b)
	return xSup(y1)
}

// energy is the specific energy y + Q²/(2gA²).
func (t gvfTrapezoid) energy(y float64) float64 {
	a := t.area(y)
	return y + t.q*t.q/(2*t.g*a*a)
}

// checkJump verifies a computed jump against momentum and the solver's
// own sequent-depth function, and its station against the reference.
//
// Source: specific force equal on both sides of a jump (Chow 1959, ch. 3
// and §15-2); jump station where the forces of the two independently
// integrated profiles are equal (Chow 1959, §10-3 on locating jumps,
// from memory).
func checkJump(t *testing.T, ref gvfTrapezoid, rr *ReachResult, sup, sub refProfile, y1a, y1b float64) Jump {
	t.Helper()
	require.Len(t, rr.Jumps, 1)
	j := rr.Jumps[0]
	m1, m2 := ref.force(j.UpstreamDepth), ref.force(j.DownstreamDepth)
	require.Truef(t, scalar.EqualWithinAbsOrRel(m1, m2, 0, 1e-6), "specific force %v upstream, %v downstream", m1, m2)
	g := NewGeometry(rr.Reach.Section, model.SI)
	y2, err := SequentDepth(g, ref.q, j.UpstreamDepth)
	require.NoError(t, err)
	require.Truef(t, scalar.EqualWithinAbsOrRel(y2, j.DownstreamDepth, 0, 1e-6), "sequent %v, jump %v", y2, j.DownstreamDepth)
	f1 := math.Sqrt(ref.f2(j.UpstreamDepth))
	require.InDelta(t, f1, j.Froude, 1e-9*f1)
	require.Equal(t, ClassifyJump(f1), j.Type)
	require.InDelta(t, ref.energy(j.UpstreamDepth)-ref.energy(j.DownstreamDepth), j.EnergyLoss, 1e-9)
	require.Greater(t, j.Length, 0.0)

	want := ref.refJumpStation(sup, sub, y1a, y1b)
	// The station follows from depths accurate to 0.2 % (the accuracy
	// target): δx ≈ 0.002·y1 / |dy/dx| on the steeper of the two profiles
	// at the toe.
	slope := math.Max(math.Abs(1/ref.dxdy(j.UpstreamDepth)), math.Abs(1/ref.dxdy(j.DownstreamDepth)))
	tol := 0.002 * j.UpstreamDepth / slope
	require.InDeltaf(t, want, j.Station, tol, "jump toe (tolerance %.3g)", tol)
	t.Logf("jump toe %.3f (reference %.3f, tolerance %.3g), y1 %.4f, y2 %.4f, F1 %.3f", j.Station, want, tol, j.UpstreamDepth, j.DownstreamDepth, j.Froude)
	return j
}

func TestGateJumpOnMildReach(t *testing.T) {
	const q, length, tail = 10.0, 400.0, 1.6
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	gate := &model.Gate{Name: "head", Opening: 0.3, Contraction: 0.61}
	m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: length, slope: 0.001, sec: sec, inflow: q, gate: gate}},
		model.Outlet{Kind: model.OutletDepth, Value: tail})
	rr := solveOne(t, m).Reaches[0]
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: q, s0: 0.001}
	yn, yc := ref.normalDepth(), ref.criticalDepth()
	yv := 0.61 * 0.3
	require.Equal(t, []string{"M3", "M1"}, rr.ProfileTypes())
	require.InDelta(t, yv, rr.Points[0].Depth, 1e-12)
	require.Equal(t, Supercritical, rr.Points[0].Regime)
	require.Equal(t, Subcritical, rr.Points[len(rr.Points)-1].Regime)
	sup := refProfile{0, yv, yc}
	sub := refProfile{length, tail, yn * 1.0001}
	checkJump(t, ref, rr, sup, sub, yv*(1+1e-9), yc*(1-1e-9))
	// Source: energy conserved through a free sluice gate (Henderson 1966,
	// §6.6, from memory): the upstream depth has the vena contracta's energy.
	up := bisect(func(y float64) float64 { return ref.energy(y) - ref.energy(yv) }, yc, 100)
	require.InDelta(t, up, rr.GateUpstreamDepth, 1e-6*up)
	// The points upstream of the toe are supercritical, those after it
	// subcritical.
	toe := rr.Jumps[0].Station
	for i, p := range rr.Points {
		if p.Station < toe {
			require.Equalf(t, Supercritical, p.Regime, "point %d at %v", i, p.Station)
		}
		if p.Station > toe {
			require.Equalf(t, Subcritical, p.Regime, "point %d at %v", i, p.Station)
		}
	}
}

func TestJumpOnSteepReachUnderHighTailwater(t *testing.T) {
	const q, length, tail, slope = 10.0, 60.0, 2.0, 0.02
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	m := buildNet(t, model.SI, []netReach{{name: "chute", from: "a", to: "b", length: length, slope: slope, sec: sec, inflow: q}},
		model.Outlet{Kind: model.OutletDepth, Value: tail})
	rr := solveOne(t, m).Reaches[0]
	require.Equal(t, Steep, rr.SlopeClass)
	require.Equal(t, []string{"S2", "S1"}, rr.ProfileTypes())
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: q, s0: slope}
	yn, yc := ref.normalDepth(), ref.criticalDepth()
	require.InDelta(t, yc, rr.Points[0].Depth, 1e-9*yc, "critical depth at the head of the steep reach")
	sup := refProfile{0, yc, yn * 1.0001}
	sub := refProfile{length, tail, yc}
	checkJump(t, ref, rr, sup, sub, yn*1.001, yc*(1-1e-9))
	for _, n := range rr.Notes {
		require.NotEqual(t, NoteCriticalFallback, n.Kind, "the fallback points replaced by the S2 curve must not be reported: %s", n.Message)
	}
}

func TestSubmergedGate(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	gate := &model.Gate{Name: "head", Opening: 0.3, Contraction: 0.61}
	m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 400, slope: 0.001, sec: sec, inflow: 10, gate: gate}},
		model.Outlet{Kind: model.OutletDepth, Value: 3.0})
	rr := solveOne(t, m).Reaches[0]
	require.Empty(t, rr.Jumps)
	require.Equal(t, []string{"M1"}, rr.ProfileTypes())
	require.True(t, hasNote(rr, NoteInfo, "submerged"), "notes: %v", rr.Notes)
	require.Len(t, rr.Structures, 1)
	require.Equal(t, StateSubmerged, rr.Structures[0].State)
	for _, p := range rr.Points {
		require.Equal(t, Subcritical, p.Regime)
	}
}

func TestOutletDepthTooLowForSupercriticalFlow(t *testing.T) {
	// A steep chute into a shallow tailwater: the S2 curve runs to the
	// outlet and a note explains the tailwater cannot act.
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	m := buildNet(t, model.SI, []netReach{{name: "chute", from: "a", to: "b", length: 300, slope: 0.02, sec: sec, inflow: 10}},
		model.Outlet{Kind: model.OutletDepth, Value: 0.9})
	rr := solveOne(t, m).Reaches[0]
	require.Equal(t, []string{"S2"}, rr.ProfileTypes())
	require.Empty(t, rr.Jumps)
	require.Equal(t, Supercritical, rr.Points[len(rr.Points)-1].Regime)
	require.True(t, hasNote(rr, NoteControl, "cannot control the supercritical flow"), "notes: %v", rr.Notes)
}

func TestOutletControls(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: 10, s0: 0.001}
	yn, yc := ref.normalDepth(), ref.criticalDepth()
	cases := []struct {
		name   string
		slope  float64
		outlet model.Outlet
		want   float64
		note   string
	}{
		// Source: closed-form normal and critical depth by bisection on
		// Manning's equation and Q²T/(gA³) = 1 (Chow 1959, ch. 4 and 6).
		{"normal", 0.001, model.Outlet{Kind: model.OutletNormal}, yn, ""},
		{"critical", 0.001, model.Outlet{Kind: model.OutletCritical}, yc, ""},
		{"elevation", 0.001, model.Outlet{Kind: model.OutletElevation, Value: 1.5}, 1.5, ""},
		{"elevation below invert", 0.001, model.Outlet{Kind: model.OutletElevation, Value: -0.5}, yc, "free outfall"},
		{"depth below critical", 0.001, model.Outlet{Kind: model.OutletDepth, Value: 0.5}, yc, "below critical depth"},
		{"normal on a horizontal bed", 0, model.Outlet{Kind: model.OutletNormal}, yc, "no normal depth"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 500, slope: c.slope, sec: sec, inflow: 10}}, c.outlet)
			rr := solveOne(t, m).Reaches[0]
			last := rr.Points[len(rr.Points)-1]
			require.InDelta(t, c.want, last.Depth, 1e-7*c.want)
			if c.note != "" {
				require.True(t, hasNote(rr, NoteControl, c.note), "notes: %v", rr.Notes)
			} else {
				require.Empty(t, rr.Notes)
			}
		})
	}
}

func hasNote(rr *ReachResult, kind NoteKind, text string) bool {
	for _, n := range rr.Notes {
		if n.Kind == kind && strings.Contains(n.Message, text) {
			return true
		}
	}
	return false
}
