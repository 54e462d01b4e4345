package solver

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// TestProfileClasses runs one reach per slope class and checks the slope
// class and the profile type the solver reports.
//
// Source: classification of gradually-varied-flow profiles by slope class
// and zone (Chow 1959, §9-2 and Fig. 9-1, from memory): zone 1 above both
// normal and critical depth, zone 2 between, zone 3 below both; H and A
// have no zone 1.
func TestProfileClasses(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 5)
	const q = 10.0
	// Critical slope: Sf at critical depth, from the independent model.
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: q}
	sc := ref.sf(ref.criticalDepth())
	gate := func(a float64) *model.Gate { return &model.Gate{Opening: a, Contraction: 0.61} }
	cases := []struct {
		name   string
		slope  float64
		outlet model.Outlet
		gate   *model.Gate
		class  SlopeClass
		types  []string
	}{
		{"mild backwater", 0.001, model.Outlet{Kind: model.OutletDepth, Value: 2}, nil, Mild, []string{"M1"}},
		{"mild drawdown", 0.001, model.Outlet{Kind: model.OutletCritical}, nil, Mild, []string{"M2"}},
		{"mild below a gate to a free outfall", 0.001, model.Outlet{Kind: model.OutletCritical}, gate(0.3), Mild, []string{"M3", "M2"}},
		{"steep drawdown", 0.02, model.Outlet{Kind: model.OutletCritical}, nil, Steep, []string{"S2"}},
		{"steep below a low gate", 0.02, model.Outlet{Kind: model.OutletCritical}, gate(0.3), Steep, []string{"S3"}},
		{"steep under a high tailwater", 0.02, model.Outlet{Kind: model.OutletDepth, Value: 2}, nil, Steep, []string{"S2", "S1"}},
		{"critical slope under a tailwater", sc, model.Outlet{Kind: model.OutletDepth, Value: 2}, nil, CriticalSl, []string{"C1"}},
		{"critical slope below a gate", sc, model.Outlet{Kind: model.OutletCritical}, gate(0.3), CriticalSl, []string{"C3"}},
		{"horizontal to a free outfall", 0, model.Outlet{Kind: model.OutletCritical}, nil, Horizontal, []string{"H2"}},
		{"horizontal below a gate", 0, model.Outlet{Kind: model.OutletCritical}, gate(0.3), Horizontal, []string{"H3", "H2"}},
		{"adverse to a free outfall", -0.001, model.Outlet{Kind: model.OutletCritical}, nil, Adverse, []string{"A2"}},
		{"adverse below a gate", -0.001, model.Outlet{Kind: model.OutletCritical}, gate(0.3), Adverse, []string{"A3", "A2"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 300, slope: c.slope, sec: sec, inflow: q, gate: c.gate}}, c.outlet)
			rr := solveOne(t, m).Reaches[0]
			require.Equal(t, c.class, rr.SlopeClass)
			require.Equal(t, c.types, rr.ProfileTypes(), "spans %+v", rr.Profiles)
			hasN := c.class != Horizontal && c.class != Adverse
			for _, p := range rr.Points {
				require.Equal(t, hasN, p.HasNormal)
			}
		})
	}
}

func TestClassOfTolerance(t *testing.T) {
	// Source: common practice (no published source): the 1 % band of
	// critical slope and the 1e-9 horizontal slope are this solver's
	// documented choices (network.go).
	require.Equal(t, CriticalSl, classOf(0.01, 1.009, 1, true))
	require.Equal(t, Mild, classOf(0.01, 1.011, 1, true))
	require.Equal(t, Steep, classOf(0.01, 0.989, 1, true))
	require.Equal(t, Horizontal, classOf(1e-10, 0, 1, false))
	require.Equal(t, Adverse, classOf(-1e-6, 0, 1, false))
	require.Equal(t, Mild, classOf(0.01, 0, 1, false), "a conduit with no normal depth")
}

// TestSegmentsAndStops: a reach with a segment of another section, a basin
// and a bend. Points fall on every segment, basin and bend end; at a
// section change two points share the station, one per section, with the
// same energy (a transition without friction loss).
//
// Source: energy equation across a short transition without loss
// (Chow 1959, §10-3 and ch. 17, from memory).
func TestSegmentsAndStops(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 5)
	box := trapezoid("box", 4, 0, 0.015, 5)
	m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 1000, slope: 0.001, sec: sec, inflow: 10,
		segments: []*model.Segment{{FromStation: 300, ToStation: 500, Section: box}}}}, model.Outlet{Kind: model.OutletDepth, Value: 2})
	r := m.Reaches[0]
	r.Basins = []*model.Basin{{Name: "b1", Reach: r, FromStation: 100, ToStation: 150}}
	r.Bends = []*model.Bend{{Name: "c1", Reach: r, FromStation: 700, ToStation: 777.7, Radius: 50}}
	rr := solveOne(t, m).Reaches[0]
	at := map[float64][]Point{}
	for _, p := range rr.Points {
		at[p.Station] = append(at[p.Station], p)
	}
	for _, x := range []float64{0, 100, 150, 700, 777.7, 1000} {
		require.Len(t, at[x], 1, "one point at station %v", x)
	}
	for _, x := range []float64{300, 500} {
		pair := at[x]
		require.Len(t, pair, 2, "two points at the section change %v", x)
		require.NotSame(t, pair[0].Section, pair[1].Section)
		require.InDelta(t, pair[0].Energy, pair[1].Energy, 1e-6)
	}
	for _, p := range rr.Points {
		if p.Station > 300 && p.Station < 500 {
			require.Same(t, box, p.Section, "segment section inside the segment")
		}
		if p.Station < 300 || p.Station > 500 {
			require.Same(t, sec, p.Section, "reach section outside the segment")
		}
	}
	require.Empty(t, rr.Notes)
}

// TestChokeAtSectionChange: a throat too narrow for the approaching
// subcritical energy chokes the flow. Critical depth is taken at its
// downstream end with a NoteCriticalFallback; the flow leaves it
// supercritical and jumps back to the tailwater downstream, with equal
// specific force across the jump.
//
// Source: choking at a contraction, flow through critical depth at the
// throat (Henderson 1966, §2.7, from memory); specific force equal across
// a jump (Chow 1959, ch. 3).
func TestChokeAtSectionChange(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 6)
	narrow := trapezoid("narrow", 0.8, 0, 0.015, 6)
	m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 1000, slope: 0.001, sec: sec, inflow: 10,
		segments: []*model.Segment{{FromStation: 300, ToStation: 500, Section: narrow}}}}, model.Outlet{Kind: model.OutletDepth, Value: 1.6})
	rr := solveOne(t, m).Reaches[0]
	require.True(t, hasNote(rr, NoteCriticalFallback, "station 500"), "notes %v", rr.Notes)
	require.Len(t, rr.Jumps, 1)
	j := rr.Jumps[0]
	require.Greater(t, j.Station, 500.0)
	ref := gvfTrapezoid{b: 3, z: 2, n: 0.015, k: 1, g: 9.80665, q: 10}
	require.InDelta(t, ref.force(j.UpstreamDepth), ref.force(j.DownstreamDepth), 1e-6*ref.force(j.UpstreamDepth))
	yc := gvfTrapezoid{b: 0.8, z: 0, n: 0.015, k: 1, g: 9.80665, q: 10}.criticalDepth()
	for _, p := range rr.Points {
		if p.Station == 500 && p.Section == narrow {
			require.InDelta(t, yc, p.Depth, 1e-7)
		}
	}
}

// TestDryReach: a reach that carries nothing in an event gets finite
// zero-depth points and a note.
func TestDryReach(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 5)
	m := buildNet(t, model.SI, []netReach{
		{name: "dry", from: "a", to: "j", length: 200, slope: 0.001, sec: sec},
		{name: "wet", from: "c", to: "j", length: 200, slope: 0.001, sec: sec, inflow: 5},
		{name: "trunk", from: "j", to: "o", length: 200, slope: 0.001, sec: sec},
	}, model.Outlet{Kind: model.OutletNormal})
	res, err := Solve(m, Options{})
	require.NoError(t, err)
	requireFinite(t, res)
	dry := res.Events[0].Reaches[0]
	require.NotEmpty(t, dry.Points)
	require.True(t, hasNote(dry, NoteInfo, "no discharge"))
	require.InDelta(t, 5, res.Events[0].Reaches[2].Discharge, 1e-12)
}

// TestSupercriticalEntrance: an entrance depth below critical depth on a
// mild reach starts an M3 curve; one above critical depth is noted and the
// subcritical profile from downstream is kept.
func TestSupercriticalEntrance(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 5)
	for _, c := range []struct {
		depth float64
		types []string
		note  bool
	}{{0.3, []string{"M3", "M1"}, false}, {1.5, []string{"M1"}, true}} {
		m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 300, slope: 0.001, sec: sec, inflow: 10, entrance: c.depth}},
			model.Outlet{Kind: model.OutletDepth, Value: 2})
		rr := solveOne(t, m).Reaches[0]
		require.Equal(t, c.types, rr.ProfileTypes())
		require.Equal(t, c.note, hasNote(rr, NoteControl, "entrance depth"), "notes %v", rr.Notes)
		if !c.note {
			require.InDelta(t, c.depth, rr.Points[0].Depth, 1e-12)
			require.Len(t, rr.Jumps, 1)
		}
	}
}
