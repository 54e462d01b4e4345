package rules

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/integrate/quad"
)

// backwater is a long M1 profile in a trapezoid (bottom 5 m, side slopes
// 2:1, n = 0.03, S0 = 0.0004, Q = 40 m³/s, 12 km, 5.0 m at the outlet),
// the normal depth 3.31 m and critical depth 1.52 m, in SI or in US
// customary units (every length divided by 0.3048). Its numbers are test
// inputs, not a design.
type backwater struct {
	u              model.Units
	l              float64 // metres → model length
	b, z, n, s0, q float64
	length, yOut   float64
	g, k           float64
}

func newBackwater(u model.Units) backwater {
	l := 1.0
	if u == model.US {
		l = 1 / 0.3048
	}
	return backwater{u: u, l: l, b: 5 * l, z: 2, n: 0.03, s0: 0.0004, q: 40 * l * l * l,
		length: 12000 * l, yOut: 5.0 * l, g: u.Gravity(), k: u.Manning()}
}

func (c backwater) area(y float64) float64  { return (c.b + c.z*y) * y }
func (c backwater) top(y float64) float64   { return c.b + 2*c.z*y }
func (c backwater) perim(y float64) float64 { return c.b + 2*y*math.Sqrt(1+c.z*c.z) }
func (c backwater) sf(y float64) float64 {
	a := c.area(y)
	k := c.k / c.n * a * math.Pow(a/c.perim(y), 2.0/3)
	return (c.q / k) * (c.q / k)
}
func (c backwater) froude(y float64) float64 {
	a := c.area(y)
	return c.q / a / math.Sqrt(c.g*a/c.top(y))
}

// stationOf is the station where the profile has depth y, by Gauss–Legendre
// quadrature of the gradually-varied-flow equation written for the distance,
//
//	dx/dy = (1 − F²)/(S0 − Sf)
//
// from depth y to the outlet depth, split into 64 panels of 32 nodes each: an
// integration independent of the solver's standard step.
// Source: Chow, Open-Channel Hydraulics (1959), eq. 9-13 and §10-2 (direct
// integration); gonum's quad.Fixed as the quadrature.
func (c backwater) stationOf(y float64) float64 {
	f := func(eta float64) float64 {
		fr := c.froude(eta)
		return (1 - fr*fr) / (c.s0 - c.sf(eta))
	}
	const panels = 64
	lo, hi, sign := y, c.yOut, 1.0
	if lo > hi {
		lo, hi, sign = hi, lo, -1
	}
	sum := 0.0
	for i := range panels {
		a := lo + (hi-lo)*float64(i)/panels
		b := lo + (hi-lo)*float64(i+1)/panels
		sum += quad.Fixed(f, a, b, 32, quad.Legendre{}, 0)
	}
	return c.length - sign*sum
}

// depthWhere finds the depth in [lo, hi] where fn changes sign, by
// bisection (the test's own root finder).
func depthWhere(fn func(y float64) float64, lo, hi float64) float64 {
	flo := fn(lo)
	for range 200 {
		m := (lo + hi) / 2
		if (fn(m) > 0) == (flo > 0) {
			lo = m
		} else {
			hi = m
		}
	}
	return (lo + hi) / 2
}

// source is the model text: height h (model length), a bend over the
// whole reach of radius rc when rc > 0.
func (c backwater) source(h, rc float64) string {
	var b strings.Builder
	fmt.Fprintf(&b, "units = %q\n", c.u)
	fmt.Fprintf(&b, "section \"trap\" {\n  shape = \"trapezoid\"\n  bottom_width = %g\n  side_slope = %g\n  height = %g\n  roughness = %g\n  lining = \"earth\"\n}\n",
		c.b, c.z, h, c.n)
	fmt.Fprintf(&b, "reach \"long\" {\n  from = \"up\"\n  to = \"out\"\n  length = %g\n  section = \"trap\"\n  slope = %g\n}\n", c.length, c.s0)
	if rc > 0 {
		fmt.Fprintf(&b, "bend \"sweep\" {\n  reach = \"long\"\n  from_station = 0\n  to_station = %g\n  radius = %g\n}\n", c.length, rc)
	}
	fmt.Fprintf(&b, "event \"design\" {\n  inflow = { \"long\" = %g }\n  outlet = { depth = %g }\n}\n", c.q, c.yOut)
	return b.String()
}

// TestSpanEndsAtCrossing checks, for every point rule in both unit
// systems, that the end of a failing span on a long backwater is where the
// limit is crossed, within 0.5 m or 0.1 % of the reach length, whichever
// is larger. The crossing depth follows from the rule's formula; its
// station from the independent quadrature (stationOf). Each case first
// checks that the computed points around the crossing lie further apart
// than the tolerance, so that a span reported from point to point fails it.
func TestSpanEndsAtCrossing(t *testing.T) {
	for _, u := range []model.Units{model.SI, model.US} {
		c := newBackwater(u)
		l := c.l
		gamma := unitWeight(u)
		// Crossing depths: chosen on the part of the M1 curve where the
		// computed points lie far apart (depths 3.6–4.4 m).
		type tc struct {
			rule     string
			h, rc    float64
			cfg      *policies.RuleConfig
			fails    func(y float64) float64 // > 0 where the rule fails
			downward bool                    // the span runs to the outlet (its start is located)
		}
		const cSub = 0.5
		yF := 4.3 * l
		vLim := 0.75 * l
		tauLim := gamma * 3.9 * l * c.sf(3.9*l)
		cases := []tc{
			{rule: "freeboard", h: 5.5 * l, cfg: numCfg("minimum", 5.5*l-yF),
				// Source: common practice (no published source): available
				// = height − depth against the minimum.
				fails: func(y float64) float64 { return y - yF }, downward: true},
			{rule: "capacity", h: 4.4 * l,
				// Source: common practice (no published source): the
				// surface above the top of bank.
				fails: func(y float64) float64 { return y - 4.4*l }, downward: true},
			{rule: "max_velocity", h: 8 * l, cfg: limitCfg(vLim),
				// Source: continuity V = Q/A.
				fails: func(y float64) float64 { return c.q/c.area(y) - vLim }},
			{rule: "shear_stress", h: 8 * l, cfg: limitCfg(tauLim),
				// Source: Kilgore and Cotton, FHWA HEC-15, 3rd ed. (2005),
				// eq. 2.3 (from memory): τd = γ·d·Sf.
				fails: func(y float64) float64 { return gamma*y*c.sf(y) - tauLim }},
			{rule: "froude_band", h: 8 * l, cfg: &policies.RuleConfig{Values: map[string]policies.Value{"avoid": {Bands: []policies.Band{{Low: 0.16, High: 0.9}}}}},
				// Source: F = V/√(g·A/T) (Chow 1959, ch. 3).
				fails: func(y float64) float64 { return c.froude(y) - 0.16 }},
			{rule: "superelevation", h: 5.5 * l, rc: 30 * l,
				cfg: &policies.RuleConfig{Values: map[string]policies.Value{"subcritical_coefficient": {Number: cSub}, "supercritical_coefficient": {Number: 1}, "minimum": {Number: 1.0 * l}}},
				// Source: Δy = C·V²·T/(g·rc), USACE EM 1110-2-1601 (from
				// memory); fails where height − depth − Δy < minimum.
				fails: func(y float64) float64 {
					v := c.q / c.area(y)
					return y + cSub*v*v*c.top(y)/(c.g*30*l) - (5.5-1.0)*l
				}, downward: true},
		}
		for _, k := range cases {
			t.Run(string(u)+"/"+k.rule, func(t *testing.T) {
				m, diags := model.Parse("bw.chan.hcl", []byte(c.source(k.h, k.rc)))
				require.False(t, diags.HasErrors(), "%v", diags)
				res, err := solver.Solve(m, solver.Options{})
				require.NoError(t, err)
				ystar := depthWhere(k.fails, 3.4*l, 5*l)
				want := c.stationOf(ystar)
				tol := max(0.5*l, 1e-3*c.length)
				pts := res.Events[0].Reaches[0].Points
				gap := 0.0
				for i := 1; i < len(pts); i++ {
					if pts[i-1].Station <= want && pts[i].Station >= want {
						gap = pts[i].Station - pts[i-1].Station
					}
				}
				require.Greater(t, gap, 2*tol, "points around the crossing lie closer than the tolerance: the test could not fail")
				fs := runRule(t, k.rule, m, res, k.cfg)
				require.Len(t, fs, 1, "%v", fs)
				f := fs[0]
				got := f.ToStation
				if k.downward {
					got = f.FromStation
					require.InDelta(t, c.length, f.ToStation, 1e-9*c.length)
				} else {
					require.InDelta(t, 0, f.FromStation, 1e-9)
				}
				t.Logf("crossing depth %.4f, station %.2f; reported %.2f (error %.3f, tolerance %.2f, points %.1f apart)",
					ystar, want, got, got-want, tol, gap)
				require.InDelta(t, want, got, tol)
			})
		}
	}
}

// TestExceptionMatchesLocatedSpan: an exception is matched against the
// located span. One drawn from a metre upstream of the true crossing to the
// outlet covers the freeboard finding; one drawn from 20 m downstream of it
// (inside the failing stretch, where the nearest computed point upstream of
// the crossing still lies hundreds of metres away) does not.
func TestExceptionMatchesLocatedSpan(t *testing.T) {
	c := newBackwater(model.SI)
	yF := 4.3
	// Source: common practice (no published source), crossing station by
	// quadrature (see stationOf).
	want := c.stationOf(yF)
	for _, tc := range []struct {
		from    float64
		covered bool
	}{{math.Floor(want) - 1, true}, {want + 20, false}} {
		src := c.source(5.5, 0) + fmt.Sprintf("exception \"freeboard\" {\n  reach = \"long\"\n  from_station = %g\n  to_station = %g\n  reason = \"accepted by the reviewing engineer for this test\"\n}\n", tc.from, c.length)
		m, diags := model.Parse("bw.chan.hcl", []byte(src))
		require.False(t, diags.HasErrors(), "%v", diags)
		res, err := solver.Solve(m, solver.Options{})
		require.NoError(t, err)
		p := &policies.Policy{Units: model.SI, Rules: map[string]*policies.RuleConfig{
			"freeboard": {Rule: "freeboard", Spec: &Lookup("freeboard").RuleSpec, Values: map[string]policies.Value{"minimum": {Number: 5.5 - yF}}}}}
		var fb *Finding
		fs := Check(m, res, p)
		for i := range fs {
			if fs[i].Rule == "freeboard" {
				fb = &fs[i]
			}
		}
		require.NotNil(t, fb)
		require.Equal(t, tc.covered, fb.Excepted, "exception from %.1f, span %.2f–%.2f", tc.from, fb.FromStation, fb.ToStation)
	}
}

// numCfg is a rule block with one Number setting.
func numCfg(name string, v float64) *policies.RuleConfig {
	return &policies.RuleConfig{Values: map[string]policies.Value{name: {Number: v}}}
}

// limitCfg is a rule block whose limit is v for every lining.
func limitCfg(v float64) *policies.RuleConfig {
	return &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Default: v, HasDefault: true}}}}
}

// TestCrossingTrials: on the long backwater, whose computed points lie
// about 500 m apart, a span end is bracketed to locateTol in at most four
// standard-step trials (solver Between calls) for a smooth criterion, at
// crossing depths along the M1 curve, and in about three and a half on
// average. The
// criterion is the depth against a threshold (the judge of a depth limit).
func TestCrossingTrials(t *testing.T) {
	c := newBackwater(model.SI)
	m, diags := model.Parse("bw.chan.hcl", []byte(c.source(8, 0)))
	require.False(t, diags.HasErrors(), "%v", diags)
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	rr := res.Events[0].Reaches[0]
	var trial solver.Point
	var v verdict
	total := 0
	for _, y := range []float64{3.5, 3.7, 3.9, 4.1, 4.3, 4.5, 4.7} {
		trials := 0
		judge := func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
			if p == &trial {
				trials++
			}
			if p.Depth <= y {
				v.short = p.Depth - y
				return false
			}
			*v = verdict{value: p.Depth, limit: y, short: p.Depth - y}
			return true
		}
		spans := scan(rr, nil, nil, nil, judge, reachBlock, &v, nil)
		require.Len(t, spans, 1)
		require.Positive(t, spans[0].first, "the span must start between computed points")
		locate(rr, nil, judge, reachBlock, &v, &trial, spans)
		s := spans[0]
		// The start is the passing side of a bracket of locateTol: the
		// depth there is below the threshold, a millimetre on it above.
		p, _, ok := rr.Between(s.first-1, s.from)
		require.True(t, ok)
		require.LessOrEqual(t, p.Depth, y)
		q, _, ok := rr.Between(s.first-1, s.from+locateTol(s.from))
		require.True(t, ok)
		require.Greater(t, q.Depth, y)
		t.Logf("depth %.1f: %d trials", y, trials)
		require.LessOrEqual(t, trials, 4, "depth %.1f: trials to locate the span start", y)
		total += trials
	}
	// False position alone took five at all but one depth here (33).
	require.LessOrEqual(t, total, 28, "trials over the seven depths")
}
