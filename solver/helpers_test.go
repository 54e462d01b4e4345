package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// testHelper is what the helpers need from *testing.T, *testing.B and
// *rapid.T.
type testHelper interface {
	Helper()
	Errorf(format string, args ...any)
	FailNow()
}

// netReach describes one reach of a hand-built test network.
type netReach struct {
	name, from, to string
	length, slope  float64
	sec            *model.Section
	inflow         float64
	maxSpacing     float64
	gate           *model.Gate // Opening and Contraction; wired to the reach
	segments       []*model.Segment
	entrance       float64
}

// buildNet builds a validated-looking model in code: nodes from from/to,
// Upstream/Downstream links, inverts from slopes (the outlet node at
// elevation 0, each reach's downstream invert the upstream invert of the
// reach below), the topological order and one event with accumulated
// discharges. It stands in for model.Parse in tests of the solver alone.
func buildNet(t testHelper, u model.Units, specs []netReach, outlet model.Outlet) *model.Model {
	t.Helper()
	m := &model.Model{File: "test.chan.hcl", Units: u}
	byFrom := map[string]*model.Reach{}
	for i, sp := range specs {
		r := &model.Reach{Index: i, Name: sp.name, From: sp.from, To: sp.to, Length: sp.length,
			SectionName: sp.sec.Name, Section: sp.sec, Slope: sp.slope, MaxSpacing: sp.maxSpacing, Segments: sp.segments}
		if sp.gate != nil {
			g := *sp.gate
			g.ReachName, g.Reach = sp.name, r
			if g.Name == "" {
				g.Name = sp.name + "-gate"
			}
			r.Gate = &g
			m.Gates = append(m.Gates, &g)
		}
		require.Nil(t, byFrom[sp.from], "two reaches leave node %s", sp.from)
		byFrom[sp.from] = r
		m.Reaches = append(m.Reaches, r)
	}
	net := &model.Network{}
	for _, r := range m.Reaches {
		r.Downstream = byFrom[r.To]
		if r.Downstream == nil {
			require.Nil(t, net.OutletReach, "two outlets")
			net.OutletReach = r
		}
		for _, o := range m.Reaches {
			if o.To == r.From {
				r.Upstream = append(r.Upstream, o)
			}
		}
		if len(r.Upstream) == 0 {
			net.Headwaters = append(net.Headwaters, r)
		}
	}
	require.NotNil(t, net.OutletReach)
	var setInverts func(r *model.Reach, down float64)
	setInverts = func(r *model.Reach, down float64) {
		r.InvertDown = down
		r.InvertUp = down + r.Slope*r.Length
		for _, up := range r.Upstream {
			setInverts(up, r.InvertUp)
		}
	}
	setInverts(net.OutletReach, 0)
	var visit func(r *model.Reach)
	visit = func(r *model.Reach) {
		for _, up := range r.Upstream {
			visit(up)
		}
		net.Order = append(net.Order, r)
	}
	visit(net.OutletReach)
	m.Network = net
	ev := &model.Event{Name: "design", Outlet: outlet, Discharge: make([]float64, len(m.Reaches))}
	for i, sp := range specs {
		if sp.inflow > 0 {
			ev.Inflows = append(ev.Inflows, model.Inflow{ReachName: sp.name, Reach: m.Reaches[i], Discharge: sp.inflow})
		}
		if sp.entrance > 0 {
			ev.Entrances = append(ev.Entrances, model.Entrance{ReachName: sp.name, Reach: m.Reaches[i], Depth: sp.entrance})
		}
	}
	for _, r := range net.Order {
		q := specs[r.Index].inflow
		for _, up := range r.Upstream {
			q += ev.Discharge[up.Index]
		}
		ev.Discharge[r.Index] = q
	}
	m.Events = []*model.Event{ev}
	for _, sp := range specs {
		m.Sections = appendSection(m.Sections, sp.sec)
		for _, sg := range sp.segments {
			m.Sections = appendSection(m.Sections, sg.Section)
		}
	}
	return m
}

func appendSection(list []*model.Section, s *model.Section) []*model.Section {
	for _, o := range list {
		if o == s {
			return list
		}
	}
	return append(list, s)
}

// trapezoid is a prismatic test section.
func trapezoid(name string, b, z, n, height float64) *model.Section {
	shape := model.Trapezoid
	if z == 0 {
		shape = model.Rectangle
	}
	return &model.Section{Name: name, Shape: shape, BottomWidth: b, SideSlope: z, Height: height, Roughness: [3]float64{n, n, n}}
}

// solveOne solves a model and returns its first event.
func solveOne(t testing.TB, m *model.Model) *EventResult {
	t.Helper()
	res, err := Solve(m, Options{})
	require.NoError(t, err)
	require.Len(t, res.Events, 1)
	return res.Events[0]
}

// requireFinite fails on any NaN or Inf anywhere in a result, and on
// points out of station order.
func requireFinite(t interface {
	testHelper
	Fatalf(string, ...any)
}, res *Result) {
	t.Helper()
	fin := func(what string, v float64) {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("%s is %v", what, v)
		}
	}
	for _, ev := range res.Events {
		for _, rr := range ev.Reaches {
			fin("discharge", rr.Discharge)
			fin("gate upstream depth", rr.GateUpstreamDepth)
			for i, p := range rr.Points {
				for _, v := range []float64{p.Station, p.Invert, p.Depth, p.WSE, p.Velocity, p.Froude, p.Energy,
					p.CriticalDepth, p.NormalDepth, p.Area, p.TopWidth, p.HydraulicRadius, p.FrictionSlope, p.Alpha} {
					fin("point field", v)
				}
				if i > 0 && p.Station < rr.Points[i-1].Station {
					t.Fatalf("reach %s: point %d at station %v before %v", rr.Reach.Name, i, p.Station, rr.Points[i-1].Station)
				}
				if p.Section == nil {
					t.Fatalf("reach %s: point %d has no section", rr.Reach.Name, i)
				}
			}
			for _, j := range rr.Jumps {
				for _, v := range []float64{j.Station, j.UpstreamDepth, j.DownstreamDepth, j.Froude, j.Length, j.EnergyLoss} {
					fin("jump field", v)
				}
			}
			for _, s := range rr.Profiles {
				fin("span", s.FromStation)
				fin("span", s.ToStation)
			}
			for _, n := range rr.Notes {
				fin("note station", n.Station)
			}
		}
	}
}
