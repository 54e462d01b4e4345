package solver

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// untabulated is a copy of g whose depth searches evaluate Props over the
// whole grid, as before the table existed.
func untabulated(g *Geometry) *Geometry {
	u := *g
	u.pts.tab = gridTable{}
	return &u
}

// The tabulated depth searches find the same normal and critical depths as
// the untabulated sweep over the grid, on random sections with pockets,
// flats, walls and banks, for discharges and slopes over several orders of
// magnitude. Both end in Brent's method on the same bracket, so the
// depths agree to the root finder's tolerance: 1e-9 relative here.
// Source: common practice (no published source): the reference is the
// solver's own untabulated search, which the compound-section checks
// against direct integration above (TestCompoundBandsMatchDirect).
func TestTabulatedDepthsMatchUntabulated(t *testing.T) {
	rapid.Check(t, func(rt *rapid.T) {
		s := drawPointsSection(rt, 60, [3]float64{0.06, 0.03, 0.05}, 30, 50)
		g := NewGeometry(s, model.SI)
		u := untabulated(g)
		q := math.Pow(10, rapid.Float64Range(-3, 3.5).Draw(rt, "log q"))
		slope := math.Pow(10, rapid.Float64Range(-5, -1).Draw(rt, "log s"))

		yt, et := NormalDepth(g, q, slope)
		yu, eu := NormalDepth(u, q, slope)
		if (et == nil) != (eu == nil) {
			rt.Fatalf("normal depth: tabulated err %v, untabulated %v", et, eu)
		}
		if et == nil && math.Abs(yt-yu) > 1e-9*math.Max(yu, 1e-6) {
			rt.Fatalf("normal depth q=%g S=%g: tabulated %.15g, untabulated %.15g", q, slope, yt, yu)
		}
		ct := CriticalDepths(g, q, nil)
		cu := CriticalDepths(u, q, nil)
		if len(ct) != len(cu) {
			rt.Fatalf("critical depths q=%g: tabulated %v, untabulated %v", q, ct, cu)
		}
		for i := range ct {
			if math.Abs(ct[i]-cu[i]) > 1e-9*math.Max(cu[i], 1e-6) {
				rt.Fatalf("critical depth %d q=%g: tabulated %.15g, untabulated %.15g", i, q, ct[i], cu[i])
			}
		}
	})
}

// bigPoints is a 5,000-point valley section (the model's limit) with wide
// overbanks and a wavy bed, so that conveyance and the critical condition
// have many vertex levels.
func bigPoints() *model.Section {
	s := &model.Section{Shape: model.Points, Roughness: [3]float64{0.06, 0.035, 0.06}, Banks: [2]float64{1000, 4000}}
	for i := range 5000 {
		x := float64(i)
		s.Points = append(s.Points, model.Point{Offset: x, Elevation: 1e-6*(x-2500)*(x-2500) + 0.3*math.Sin(x/7)})
	}
	return s
}

// BenchmarkPointsDepthSearch measures one normal and one critical depth
// search on the 5,000-point section, tabulated and untabulated (run both
// in one invocation and compare the ratio).
func BenchmarkPointsDepthSearch(b *testing.B) {
	g := NewGeometry(bigPoints(), model.SI)
	for _, c := range []struct {
		name string
		g    *Geometry
	}{{"tabulated", g}, {"untabulated", untabulated(g)}} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			var buf [8]float64
			q := 50.0
			for b.Loop() {
				y, _ := NormalDepth(c.g, q, 0.001)
				geoSink += y
				geoSink += float64(len(CriticalDepths(c.g, q, buf[:0])))
				q = 50 + math.Mod(q*1.37, 500)
			}
		})
	}
}

// pointsNetwork is a model of `reaches` reaches in a chain sharing
// `sections` copies of a points section of `points` points, under
// `events` events with an inflow into every reach, so that every reach of
// every event needs its own depth searches.
func pointsNetwork(t testing.TB, sections, points, reaches, events int) *model.Model {
	var b strings.Builder
	b.WriteString("units = \"si\"\n")
	for s := range sections {
		fmt.Fprintf(&b, "section \"v%d\" {\n  shape = \"points\"\n  roughness = [0.05, 0.03, 0.05]\n  points = [", s)
		for i := range points {
			x := float64(i) * 0.05
			e := 0.5 + 3*math.Abs(float64(i)-float64(points)/2)/(float64(points)/2) + 0.003*float64(i%7)
			fmt.Fprintf(&b, "[%.3f, %.4f], ", x, e)
		}
		b.WriteString("]\n}\n")
	}
	for r := range reaches {
		fmt.Fprintf(&b, "reach \"r%d\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = 40\n  section = \"v%d\"\n  slope = %g\n}\n", r, r, r+1, r%sections, 0.001+0.0005*float64(r%2))
	}
	for e := range events {
		fmt.Fprintf(&b, "event \"e%d\" {\n  inflow = {", e)
		for r := range reaches {
			fmt.Fprintf(&b, " r%d = %g,", r, 0.2+0.01*float64(e))
		}
		b.WriteString(" }\n  outlet = { condition = \"normal\" }\n}\n")
	}
	m, diags := model.Parse("net.chan.hcl", []byte(b.String()))
	if diags.HasErrors() {
		t.Fatalf("%s", diags.Error())
	}
	return m
}

// The work budget counts the depth searches (which the point budget does
// not see) and ends Solve with ErrWorkBudget, naming the event; a budget
// that covers the model solves it.
func TestWorkBudgetEndsSolve(t *testing.T) {
	m := pointsNetwork(t, 3, 400, 30, 20)
	_, err := Solve(m, Options{})
	require.NoError(t, err, "the default budget covers a model this size")
	_, err = Solve(m, Options{MaxWork: 20_000})
	require.ErrorIs(t, err, ErrWorkBudget)
	assert.Contains(t, err.Error(), `reached in event "e`)
	assert.Contains(t, err.Error(), "20000 units of work")
}

// BenchmarkPointsNetwork solves 60 sections of 3,000 points (what fits in 4 MiB) under 200
// events (the hostile shape within every documented limit); it
// ends within the default work budget or with ErrWorkBudget, in seconds.
func BenchmarkPointsNetwork(b *testing.B) {
	m := pointsNetwork(b, 60, 3000, 60, 200)
	for b.Loop() {
		_, err := Solve(m, Options{})
		if err != nil && !errors.Is(err, ErrWorkBudget) {
			b.Fatal(err)
		}
	}
}
