package solver

import (
	"errors"
	"fmt"
	"math"
	"reflect"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// drawSection draws a valid section of any shape.
func drawSection(t *rapid.T, name string) *model.Section {
	n := rapid.Float64Range(0.010, 0.08).Draw(t, name+"-n")
	s := &model.Section{Name: name, Roughness: [3]float64{n, n, n}, Height: rapid.Float64Range(0.3, 6).Draw(t, name+"-height")}
	switch rapid.IntRange(0, 5).Draw(t, name+"-shape") {
	case 5:
		s.Shape, s.BottomWidth = model.Box, rapid.Float64Range(0.3, 6).Draw(t, name+"-b")
	case 0:
		s.Shape, s.BottomWidth = model.Rectangle, rapid.Float64Range(0.2, 30).Draw(t, name+"-b")
	case 1:
		s.Shape, s.BottomWidth = model.Trapezoid, rapid.Float64Range(0.2, 30).Draw(t, name+"-b")
		s.SideSlope = rapid.Float64Range(0.1, 4).Draw(t, name+"-z")
	case 2:
		s.Shape, s.SideSlope = model.Triangle, rapid.Float64Range(0.3, 4).Draw(t, name+"-z")
	case 3:
		s.Shape, s.Diameter = model.Circle, rapid.Float64Range(0.3, 4).Draw(t, name+"-d")
		s.Height = s.Diameter
	default:
		// A main channel with two overbanks.
		w := rapid.Float64Range(2, 20).Draw(t, name+"-w")
		d := rapid.Float64Range(0.5, 3).Draw(t, name+"-depth")
		ob := rapid.Float64Range(2, 40).Draw(t, name+"-overbank")
		s.Shape = model.Points
		pt := func(x, y float64) model.Point { return model.Point{Offset: x, Elevation: y} }
		s.Points = []model.Point{pt(0, d+1.5), pt(ob, d+0.5), pt(ob+1, d), pt(ob+1+w/2, 0), pt(ob+1+w, d), pt(ob+2+w, d+0.5), pt(2*ob+2+w, d+1.5)}
		s.Banks = [2]float64{ob + 1, ob + 1 + w}
		s.Roughness = [3]float64{rapid.Float64Range(0.03, 0.1).Draw(t, name+"-nl"), n, rapid.Float64Range(0.03, 0.1).Draw(t, name+"-nr")}
		s.Height = d + 1.5
	}
	return s
}

// drawLayout draws a network of one reach, a chain of two, or a junction
// of two reaches above a third: the layout number and, per reach, its
// name, upstream and downstream node.
func drawLayout(t *rapid.T) (int, [][3]string) {
	layout := rapid.IntRange(0, 2).Draw(t, "layout")
	names := [][3]string{{"r0", "a", "out"}}
	switch layout {
	case 1:
		names = [][3]string{{"r0", "a", "b"}, {"r1", "b", "out"}}
	case 2:
		names = [][3]string{{"r0", "a", "j"}, {"r1", "c", "j"}, {"r2", "j", "out"}}
	}
	return layout, names
}

// TestSolveAlwaysFinite: on random valid networks (one to three reaches in
// a chain or a junction, every shape, slopes from adverse to very steep,
// gates, entrances, segments, basins, every outlet kind) Solve returns
// finite numbers everywhere, points in station order within the reach,
// and never an error.
//
// Source: common practice (no published source): a screening tool must
// degrade to a noted fallback, never to NaN.
func TestSolveAlwaysFinite(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		units := model.SI
		if rapid.Bool().Draw(t, "us") {
			units = model.US
		}
		layout, names := drawLayout(t)
		var specs []netReach
		for i, nm := range names {
			slope := rapid.SampledFrom([]float64{-0.003, 0, 1e-4, 5e-4, 0.001, 0.003, 0.01, 0.03, 0.08}).Draw(t, fmt.Sprint("slope", i))
			sp := netReach{name: nm[0], from: nm[1], to: nm[2],
				length: rapid.Float64Range(5, 3000).Draw(t, fmt.Sprint("length", i)),
				slope:  slope, sec: drawSection(t, fmt.Sprint("sec", i))}
			if i == 0 || layout == 2 && i == 1 || rapid.Bool().Draw(t, fmt.Sprint("lateral", i)) {
				sp.inflow = rapid.Float64Range(0.01, 60).Draw(t, fmt.Sprint("q", i))
			}
			if rapid.IntRange(0, 3).Draw(t, fmt.Sprint("gate?", i)) == 0 {
				sp.gate = &model.Gate{Opening: rapid.Float64Range(0.03, 2).Draw(t, fmt.Sprint("opening", i)), Contraction: 0.61}
			}
			if rapid.IntRange(0, 3).Draw(t, fmt.Sprint("segment?", i)) == 0 {
				a := rapid.Float64Range(0, sp.length*0.9).Draw(t, fmt.Sprint("segfrom", i))
				b := rapid.Float64Range(a+sp.length*0.05, sp.length).Draw(t, fmt.Sprint("segto", i))
				sp.segments = []*model.Segment{{FromStation: a, ToStation: b, Section: drawSection(t, fmt.Sprint("seg", i))}}
			}
			if (i == 0 || layout == 2 && i == 1) && rapid.IntRange(0, 3).Draw(t, fmt.Sprint("entrance?", i)) == 0 {
				sp.entrance = rapid.Float64Range(0.02, 3).Draw(t, fmt.Sprint("entrance", i))
			}
			specs = append(specs, sp)
		}
		var outlet model.Outlet
		switch rapid.IntRange(0, 3).Draw(t, "outlet") {
		case 0:
			outlet = model.Outlet{Kind: model.OutletDepth, Value: rapid.Float64Range(0.02, 8).Draw(t, "tail")}
		case 1:
			outlet = model.Outlet{Kind: model.OutletElevation, Value: rapid.Float64Range(-1, 8).Draw(t, "level")}
		case 2:
			outlet = model.Outlet{Kind: model.OutletNormal}
		default:
			outlet = model.Outlet{Kind: model.OutletCritical}
		}
		m := buildNet(t, units, specs, outlet)
		for _, r := range m.Reaches {
			if rapid.Bool().Draw(t, "basin-"+r.Name) {
				b := &model.Basin{Name: r.Name + "-basin", Reach: r, FromStation: r.Length * 0.2, ToStation: r.Length * 0.6}
				r.Basins = append(r.Basins, b)
			}
		}
		res, err := Solve(m, Options{})
		if err != nil {
			t.Fatalf("Solve: %v", err)
		}
		requireFinite(t, res)
		for _, rr := range res.Events[0].Reaches {
			if len(rr.Points) == 0 {
				t.Fatalf("reach %s has no points", rr.Reach.Name)
			}
			first, last := rr.Points[0], rr.Points[len(rr.Points)-1]
			if first.Station != 0 || math.Abs(last.Station-rr.Reach.Length) > 1e-9*rr.Reach.Length {
				t.Fatalf("reach %s computed from %v to %v, length %v", rr.Reach.Name, first.Station, last.Station, rr.Reach.Length)
			}
			for _, p := range rr.Points {
				if p.Depth <= 0 && rr.Discharge > 0 {
					t.Fatalf("reach %s: depth %v at %v", rr.Reach.Name, p.Depth, p.Station)
				}
			}
			requireEnergyBalance(t, rr)
			for i := 1; i < len(rr.Notes); i++ {
				if rr.Notes[i].Station < rr.Notes[i-1].Station {
					t.Fatalf("notes out of order")
				}
			}
			for i, s := range rr.Profiles {
				if s.FromStation > s.ToStation || s.FromStation < 0 || s.ToStation > rr.Reach.Length*(1+1e-9) {
					t.Fatalf("span %+v outside the reach", s)
				}
				if i > 0 && s.FromStation < rr.Profiles[i-1].ToStation-1e-9 {
					t.Fatalf("spans overlap: %+v %+v", rr.Profiles[i-1], s)
				}
			}
		}
	})
}

// TestSolveDeterministic: the same input gives identical results.
func TestSolveDeterministic(t *testing.T) {
	m := chainModel(t, 20)
	m.Reaches[5].Gate = &model.Gate{Name: "g", Reach: m.Reaches[5], Opening: 0.3, Contraction: 0.61}
	a, err := Solve(m, Options{})
	require.NoError(t, err)
	b, err := Solve(m, Options{})
	require.NoError(t, err)
	require.True(t, reflect.DeepEqual(a, b))
}

// TestMaxPoints: the point budget ends Solve with ErrTooManyPoints.
func TestMaxPoints(t *testing.T) {
	m := chainModel(t, 5)
	for _, r := range m.Reaches {
		r.MaxSpacing = 1
	}
	_, err := Solve(m, Options{MaxPoints: 1000})
	require.True(t, errors.Is(err, ErrTooManyPoints), "error %v", err)
	res, err := Solve(m, Options{})
	require.NoError(t, err)
	for _, rr := range res.Events[0].Reaches {
		for i := 1; i < len(rr.Points); i++ {
			require.LessOrEqual(t, rr.Points[i].Station-rr.Points[i-1].Station, 1+1e-9, "max_spacing caps the distance between points")
		}
	}
}

// TestEventFilter: Options.Events keeps only the named events, in model
// order.
func TestEventFilter(t *testing.T) {
	m := chainModel(t, 2)
	ev2 := *m.Events[0]
	ev2.Name = "second"
	m.Events = append(m.Events, &ev2)
	res, err := Solve(m, Options{Events: []string{"second"}})
	require.NoError(t, err)
	require.Len(t, res.Events, 1)
	require.Equal(t, "second", res.Events[0].Event.Name)
	res, err = Solve(m, Options{})
	require.NoError(t, err)
	require.Len(t, res.Events, 2)
}

// requireEnergyBalance checks the standard-step energy equation between
// every pair of neighbouring computed points of one section that are not
// at critical depth (controls and fallbacks):
//
//	H₁ − H₂ = Δx·(Sf₁ + Sf₂)/2
//
// with H the energy grade elevation. The residual allowed is ten times the
// root finder's depth tolerance times the sensitivity of the equation to
// the unknown depth, |1 − F²| + (Δx/2)·|dSf/dy|, with |dSf/dy| bounded by
// 6·Sf/y (Manning: Sf ∝ A⁻²R^(−4/3), at most y^(−16/3) for a triangle).
//
// Source: the standard-step method with the average friction slope
// (Chow 1959, §10-3).
func requireEnergyBalance(t interface {
	testHelper
	Fatalf(string, ...any)
}, rr *ReachResult) {
	t.Helper()
	for i := 1; i < len(rr.Points); i++ {
		a, b := rr.Points[i-1], rr.Points[i]
		dx := b.Station - a.Station
		if dx <= 0 || a.Section != b.Section || a.Regime == Critical || b.Regime == Critical || a.Regime != b.Regime {
			continue
		}
		res := (a.Energy - b.Energy) - dx*(a.FrictionSlope+b.FrictionSlope)/2
		sens := 2 + a.Froude*a.Froude + b.Froude*b.Froude + dx*6*math.Max(a.FrictionSlope, b.FrictionSlope)/math.Min(a.Depth, b.Depth)
		tol := 1e-6*sens + 1e-12*math.Abs(a.Energy)
		if math.Abs(res) > tol {
			t.Fatalf("reach %s: energy equation off by %.3g between stations %v and %v (depths %v, %v)",
				rr.Reach.Name, res, a.Station, b.Station, a.Depth, b.Depth)
		}
	}
}

// TestCoarseTolerance: a closure tolerance of common practice (0.003 m)
// must not drive the step control into tiny steps; the profile stays
// within a few tolerances of the default solution.
//
// Source: standard-step closure tolerance 0.003 m, common practice (no
// published source), per references.md.
func TestCoarseTolerance(t *testing.T) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 2000, slope: 0.001, sec: sec, inflow: 10}},
		model.Outlet{Kind: model.OutletDepth, Value: 2})
	fine, err := Solve(m, Options{})
	require.NoError(t, err)
	coarse, err := Solve(m, Options{Tolerance: 0.003})
	require.NoError(t, err)
	fp, cp := fine.Events[0].Reaches[0].Points, coarse.Events[0].Reaches[0].Points
	require.LessOrEqual(t, len(cp), 2*len(fp))
	for _, p := range cp {
		want := 0.0
		for i := 1; i < len(fp); i++ {
			if fp[i].Station >= p.Station {
				a, b := fp[i-1], fp[i]
				want = a.Depth + (b.Depth-a.Depth)*(p.Station-a.Station)/(b.Station-a.Station)
				break
			}
		}
		if p.Station == 0 {
			want = fp[0].Depth
		}
		require.InDelta(t, want, p.Depth, 0.02, "station %v", p.Station)
	}
}
