package rules

import (
	"fmt"
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The hand-built results below are exact by construction: every expected
// value is arithmetic on the numbers written into the points, following
// the formula the rule documents. Tolerance 1e-12 absorbs the rounding of
// invert + depth − invert.
const exact = 1e-12

// span asserts a finding's span, value and limit.
func assertSpan(t *testing.T, f Finding, from, to, value, limit float64) {
	t.Helper()
	assert.True(t, f.HasSpan)
	assert.InDelta(t, from, f.FromStation, exact, "from")
	assert.InDelta(t, to, f.ToStation, exact, "to")
	assert.True(t, f.HasValue)
	assert.InDelta(t, value, f.Value, exact, "value")
	assert.InDelta(t, limit, f.Limit, exact, "limit")
}

func depthsPoints(r *model.Reach, stations, depths, velocities []float64) []solver.Point {
	pts := make([]solver.Point, len(stations))
	for i := range stations {
		pts[i] = pt(r, stations[i], depths[i], velocities[i])
	}
	return pts
}

func TestFreeboardSpansAndMessage(t *testing.T) {
	m, r := handModel()
	st := []float64{0, 100, 200, 300, 400}
	pts := depthsPoints(r, st, []float64{0.5, 0.8, 0.85, 0.6, 0.9}, []float64{1, 1, 1, 1, 1})
	fs := runRule(t, "freeboard", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.3}}})
	// Source: common practice (no published source): available = height −
	// depth = 0.5, 0.2, 0.15, 0.4, 0.1 against 0.3 → failing runs 100–200
	// (smallest 0.15) and 400 (0.1).
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 100, 200, 0.15, 0.3)
	assertSpan(t, fs[1], 400, 400, 0.1, 0.3)
	assert.Equal(t, r.DefRange, fs[0].Range)
	assert.Equal(t, "main", fs[0].Reach)
	assert.Equal(t, "q", fs[0].Event)
	assert.Equal(t, "freeboard 0.15 m is below the required 0.30 m", fs[0].Message)
	assert.Equal(t, "raise the top of bank by at least 0.15 m over this span", fs[0].Remedy)
	assert.Equal(t, "freeboard 0.1 m is below the required 0.3 m", fs[1].Message)
	assert.Equal(t, "raise the top of bank by at least 0.20 m over this span", fs[1].Remedy)
}

func TestFreeboardFractionGovernsAndOvertopping(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200}, []float64{0.5, 0.85, 1.1}, []float64{1, 1, 1})
	fs := runRule(t, "freeboard", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.05}, "fraction": {Number: 0.25}}})
	// required = max(0.05, 0.25·d): 0.125, 0.2125, 0.275; available 0.5,
	// 0.15, −0.1. At 200 the channel overtops: capacity reports that, and
	// freeboard stops at 100 with a related note.
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 100, 100, 0.15, 0.2125)
	assert.Contains(t, fs[0].Message, "(0.25 × depth 0.85 m)")
	assert.Contains(t, fs[0].Message, "the channel overtops beyond station 100 m (reported once, by capacity)")
	assert.Contains(t, fs[0].Remedy, "by at least 0.07 m") // 0.2125 − 0.15, up to 0.01 m
}

func TestFreeboardSkipsClosedAndSplitsAtSegments(t *testing.T) {
	m, r := handModel()
	pipe := &model.Section{Src: model.Src{DefRange: rng(2)}, Name: "pipe", Shape: model.Circle, Diameter: 1, Height: 1}
	seg := &model.Segment{Src: model.Src{DefRange: rng(12)}, FromStation: 200, ToStation: 300, SectionName: "wide",
		Section: &model.Section{Name: "wide", Shape: model.Rectangle, BottomWidth: 8, Height: 1, Lining: "grass"}}
	r.Segments = []*model.Segment{seg}
	pts := depthsPoints(r, []float64{0, 100, 200, 300, 400}, []float64{0.9, 0.9, 0.9, 0.9, 0.9}, []float64{1, 1, 1, 1, 1})
	pts[4].Section = pipe
	fs := runRule(t, "freeboard", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.3}}})
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 0, 100, 0.1, 0.3)
	assert.Equal(t, r.DefRange, fs[0].Range)
	assertSpan(t, fs[1], 200, 300, 0.1, 0.3)
	assert.Equal(t, seg.DefRange, fs[1].Range, "the segment sets the section there")
}

func TestMaxVelocity(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300}, []float64{0.5, 0.5, 0.5, 0.5}, []float64{1, 3, 4.2, 2})
	cfg := &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": 3.0}, Default: 5, HasDefault: true}}}}
	fs := runRule(t, "max_velocity", m, result(m, r, pts, nil, nil), cfg)
	// 3.0 is not above 3.0; only 4.2 fails.
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 200, 200, 4.2, 3.0)
	assert.Equal(t, `velocity 4.2 m/s exceeds 3.0 m/s for lining "grass"`, fs[0].Message)
	assert.Equal(t, `a lining rated for at least 4.2 m/s would meet the limit, or reduce velocity (flatter slope, rougher or wider section)`, fs[0].Remedy)

	// No value for the lining and no default: not checked.
	cfg = &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"concrete": 1}}}}}
	assert.Empty(t, runRule(t, "max_velocity", m, result(m, r, pts, nil, nil), cfg))
}

func TestMinVelocity(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300, 400}, []float64{0.5, 0.5, 0.5, 0.5, 0}, []float64{0.5, 0.4, 0.7, 0.3, 0})
	pts[4].Area = 0 // dry
	cfg := &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Default: 0.6, HasDefault: true}}}}
	assert.Empty(t, runRule(t, "min_velocity", m, result(m, r, pts, nil, nil), cfg),
		"a default minimum never applies to a grass (or natural) lining")
	r.Section.Lining = "earth"
	fs := runRule(t, "min_velocity", m, result(m, r, pts, nil, nil), cfg)
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 0, 100, 0.4, 0.6)
	assertSpan(t, fs[1], 300, 300, 0.3, 0.6)
	assert.Contains(t, fs[0].Message, `velocity 0.4 m/s is below the self-cleansing 0.6 m/s for lining "earth" (unlisted: the policy's default applied)`)
	r.Section.Lining = "grass"
	cfg = &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": 0.6}}}}}
	fs = runRule(t, "min_velocity", m, result(m, r, pts, nil, nil), cfg)
	require.Len(t, fs, 2, "a grass lining named in the table is checked")
	assert.Contains(t, fs[0].Message, `velocity 0.4 m/s is below the self-cleansing 0.6 m/s for lining "grass"`)
}

func TestFroudeBand(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300, 400}, []float64{1, 1, 1, 1, 1}, []float64{1, 1, 1, 1, 1})
	for i, f := range []float64{0.5, 0.9, 1.0, 1.2, 0.95} {
		pts[i].Froude = f
	}
	fs := runRule(t, "froude_band", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"avoid": {Bands: []policies.Band{{Low: 0.86, High: 1.13}}}}})
	// 0.9 lies 0.04 inside, 1.0 lies 0.13 inside (nearest edge 1.13): the
	// worst of 100–200 is 1.0; 0.95 is nearest to 0.86.
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 100, 200, 1.0, 1.13)
	assertSpan(t, fs[1], 400, 400, 0.95, 0.86)
	assert.Contains(t, fs[0].Message, "Froude number 1 lies in the avoided band 0.86–1.13")
	assert.Contains(t, fs[0].Remedy, "below 0.86 or above 1.13")
}

func jumpModel() (*model.Model, *model.Reach, *model.Basin) {
	m, r := handModel()
	b := &model.Basin{Src: model.Src{DefRange: rng(20)}, Name: "pool", ReachName: "main", Reach: r, FromStation: 20, ToStation: 45}
	r.Basins = []*model.Basin{b}
	m.Basins = []*model.Basin{b}
	return m, r, b
}

func TestJumpContainment(t *testing.T) {
	m, r, b := jumpModel()
	jumps := []solver.Jump{
		{Station: 25, Length: 15, Froude: 5},  // 25–40: inside
		{Station: 20, Length: 25, Froude: 5},  // 20–45: exactly the basin
		{Station: 30, Length: 25, Froude: 5},  // 30–55: 10 downstream
		{Station: 15, Length: 20, Froude: 5},  // 15–35: 5 upstream
		{Station: 100, Length: 10, Froude: 5}, // in no basin
	}
	fs := runRule(t, "jump_containment", m, result(m, r, nil, jumps, nil), &policies.RuleConfig{})
	require.Len(t, fs, 3)
	assertSpan(t, fs[0], 30, 55, 10, 0)
	assert.Equal(t, b.DefRange, fs[0].Range)
	assert.Contains(t, fs[0].Message, `escapes basin "pool" (20–45 m) by 10 m downstream: unprotected channel downstream may scour`)
	assert.Equal(t, "lengthen the basin or move it", fs[0].Remedy)
	assertSpan(t, fs[1], 15, 35, 5, 0)
	assert.Contains(t, fs[1].Message, "by 5 m upstream: unprotected channel upstream may scour")
	assertSpan(t, fs[2], 100, 110, 10, 0)
	assert.Equal(t, r.DefRange, fs[2].Range)
	assert.Contains(t, fs[2].Message, `lies in no basin of reach "main"`)
}

func TestJumpType(t *testing.T) {
	m, r, b := jumpModel()
	jumps := []solver.Jump{
		{Station: 25, Length: 10, Froude: 3.1, Type: solver.Oscillating},
		{Station: 60, Length: 10, Froude: 5.0, Type: solver.Steady},
		{Station: 80, Length: 10, Froude: 4.4, Type: solver.Oscillating},
	}
	fs := runRule(t, "jump_type", m, result(m, r, nil, jumps, nil), &policies.RuleConfig{Values: map[string]policies.Value{"avoid": {Bands: []policies.Band{{Low: 2.5, High: 4.5}}}}})
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 25, 35, 3.1, 2.5)
	assert.Equal(t, b.DefRange, fs[0].Range, "toe inside the basin")
	assert.Contains(t, fs[0].Message, "upstream Froude number 3.1 (oscillating), in the avoided band 2.5–4.5")
	assert.Contains(t, fs[0].Remedy, "waves")
	assertSpan(t, fs[1], 80, 90, 4.4, 4.5)
	assert.Equal(t, r.DefRange, fs[1].Range)
}

func TestSuperelevation(t *testing.T) {
	m, r := handModel()
	bend := &model.Bend{Src: model.Src{DefRange: rng(25)}, Name: "elbow", ReachName: "main", Reach: r,
		FromStation: 300, ToStation: 380, Radius: 40}
	r.Bends = []*model.Bend{bend}
	m.Bends = []*model.Bend{bend}
	st := []float64{250, 300, 340, 380, 420}
	pts := depthsPoints(r, st, []float64{0.67, 0.67, 0.67, 0.67, 0.67}, []float64{3, 3, 3, 3, 3})
	pts[2].Froude, pts[2].Regime = 1.5, solver.Supercritical // take the supercritical coefficient at 340
	cfg := &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.3}, "subcritical_coefficient": {Number: 0.5}, "supercritical_coefficient": {Number: 1.0}}}
	fs := runRule(t, "superelevation", m, result(m, r, pts, nil, nil), cfg)
	// Source: USACE EM 1110-2-1601 (from memory): Δy = C·V²·T/(g·rc).
	g := 9.80665
	dySub := 0.5 * 9 * 4 / (g * 40)
	dySup := 1.0 * 9 * 4 / (g * 40)
	remSup := 1 - 0.67 - dySup
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 300, 380, remSup, 0.3)
	assert.Equal(t, bend.DefRange, fs[0].Range)
	assert.Greater(t, 1-0.67-dySub, 0.28, "subcritical points fail too (0.2841 < 0.3)")
	// The radius that passes at the supercritical point: C·V²·T/(g·(top − WSE − minimum)).
	rc := 1.0 * 9 * 4 / (g * (1 - 0.67 - 0.3))
	// Remedies rounded up to 1 m of radius and 0.01 m of height.
	assert.Contains(t, fs[0].Remedy, fmt.Sprintf("or make the radius at least %.0f m", math.Ceil(rc)))
	assert.Contains(t, fs[0].Remedy, fmt.Sprintf("raise the outer bank by at least %.2f m", math.Ceil((0.3-remSup)*100)/100))
	assert.Contains(t, fs[0].Message, `in bend "elbow" (radius 40 m)`)

	// Unset coefficients take the documented defaults 0.5 and 1.0.
	fs2 := runRule(t, "superelevation", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.3}}})
	require.Len(t, fs2, 1)
	assert.InDelta(t, remSup, fs2[0].Value, exact)
}

func TestShearStress(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200}, []float64{0.3, 0.5, 0.5}, []float64{1, 1, 1})
	cfg := &policies.RuleConfig{Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": 3.5}}}}}
	fs := runRule(t, "shear_stress", m, result(m, r, pts, nil, nil), cfg)
	// Source: Kilgore and Cotton, FHWA HEC-15, 3rd ed. (2005), eq. 2.3
	// (from memory): τd = γ·d·Sf with γ = 9806.65 N/m³; d = 0.3 →
	// τd = 2.942 < 3.5; d = 0.5 → τd = 4.903 > 3.5.
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 100, 200, 9806.65*0.5*0.001, 3.5)
	assert.Contains(t, fs[0].Message, `shear stress on the bed 4.9 N/m² (τd = γ·d·Sf, d the maximum depth 0.5 m) exceeds 3.5 N/m² for lining "grass"`)
}

func TestCapacity(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300}, []float64{0.9, 1.1, 1.05, 0.9}, []float64{1, 1, 1, 1})
	fs := runRule(t, "capacity", m, result(m, r, pts, nil, nil), nil)
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 100, 200, 1.1, 1.0)
	assert.Contains(t, fs[0].Message, "the channel overtops here")

	pipe := &model.Section{Name: "pipe", Shape: model.Circle, Diameter: 1, Height: 1, Lining: "concrete"}
	pts = depthsPoints(r, []float64{0, 100, 200}, []float64{0.8, 1, 0.8}, []float64{1, 1, 1})
	for i := range pts {
		pts[i].Section = pipe
	}
	pts[1].Full = true
	fs = runRule(t, "capacity", m, result(m, r, pts, nil, nil), nil)
	require.Len(t, fs, 1)
	assertSpan(t, fs[0], 100, 100, 1, 1)
	assert.Contains(t, fs[0].Message, "flows full")
}

func TestSolverNotes(t *testing.T) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300, 400}, []float64{0.5, 0.5, 0.5, 0.5, 0.5}, []float64{1, 1, 1, 1, 1})
	pts[3].Depth = math.NaN()
	notes := []solver.Note{
		{Kind: solver.NoteControl, Station: 0, Message: "outlet depth below critical"},
		{Kind: solver.NoteCriticalFallback, Station: 100},
		{Kind: solver.NoteCriticalFallback, Station: 200},
		{Kind: solver.NoteCriticalFallback, Station: 400},
	}
	fs := runRule(t, "solver", m, result(m, r, pts, nil, notes), nil)
	require.Len(t, fs, 4)
	assert.Contains(t, fs[0].Message, "boundary condition could not act as written (outlet depth below critical)")
	assert.Equal(t, [2]float64{100, 200}, [2]float64{fs[1].FromStation, fs[1].ToStation}, "adjacent points merge")
	assert.Contains(t, fs[1].Message, "critical depth was taken because")
	assert.Equal(t, [2]float64{400, 400}, [2]float64{fs[2].FromStation, fs[2].ToStation}, "a point between splits")
	assert.Contains(t, fs[3].Message, "not finite at 1 computed point of reach \"main\"")
	for _, f := range fs {
		assert.Equal(t, r.DefRange, f.Range)
		assert.False(t, f.HasValue)
	}

	empty := runRule(t, "solver", m, result(m, r, nil, nil, nil), nil)
	require.Len(t, empty, 1)
	assert.Contains(t, empty[0].Message, "no computed point")
}

func TestModelRule(t *testing.T) {
	m, r := handModel()
	bend := &model.Bend{Src: model.Src{DefRange: rng(25), Attrs: map[string]hcl.Range{"radius": rng(26)}},
		Name: "kink", ReachName: "main", Reach: r, FromStation: 0, ToStation: 100, Radius: 1.5}
	r.Bends, m.Bends = []*model.Bend{bend}, []*model.Bend{bend}
	m.Exceptions = []*model.Exception{
		{Src: model.Src{DefRange: rng(40), LabelRange: rng(41)}, Rule: "frebaord", ReachName: "main"},
		{Src: model.Src{DefRange: rng(42), LabelRange: rng(43)}, Rule: "model", ReachName: "main"},
		{Src: model.Src{DefRange: rng(44), LabelRange: rng(45)}, Rule: "capacity", ReachName: "main"},
	}
	pts := depthsPoints(r, []float64{0, 50, 100}, []float64{0.5, 0.5, 0.5}, []float64{1, 1, 1})
	fs := runRule(t, "model", m, result(m, r, pts, nil, nil), nil)
	require.Len(t, fs, 3)
	assert.Equal(t, rng(41), fs[0].Range)
	assert.Contains(t, fs[0].Message, `did you mean "freeboard"?`)
	assert.Equal(t, rng(43), fs[1].Range)
	assert.Contains(t, fs[1].Message, "cannot be excepted")
	// rc = 1.5 < T/2 = 2.
	assert.Equal(t, rng(26), fs[2].Range)
	assert.Equal(t, policies.Warning, fs[2].Severity)
	assert.Contains(t, fs[2].Message, "less than half the top width")
}

func TestFromDiagnostics(t *testing.T) {
	subj := rng(7)
	diags := hcl.Diagnostics{
		{Severity: hcl.DiagWarning, Summary: "Odd slope", Detail: "The slope is very steep."},
		{Severity: hcl.DiagError, Summary: "Unsupported argument", Detail: `An argument named "widht" is not expected here.`, Subject: &subj},
	}
	fs := FromDiagnostics("a.chan.hcl", diags)
	require.Len(t, fs, 2)
	assert.Equal(t, "model", fs[0].Rule)
	assert.Equal(t, policies.Warning, fs[0].Severity)
	assert.Equal(t, 1, fs[0].Range.Start.Line, "no subject: the start of the file")
	assert.Equal(t, policies.Error, fs[1].Severity)
	assert.Equal(t, subj.Start, fs[1].Range.Start)
	assert.Equal(t, subj.End, fs[1].Range.End)
	assert.Equal(t, `Unsupported argument: An argument named "widht" is not expected here.`, fs[1].Message)
	// The subject names another file: the finding is in the file given,
	// and names only it.
	assert.Equal(t, "a.chan.hcl", fs[1].File())
	assert.Equal(t, "a.chan.hcl", fs[1].Pos().Filename)
	assert.Equal(t, "a.chan.hcl", fs[0].File())
}

func TestUnusedExceptionContext(t *testing.T) {
	m, r := handModel()
	ex := &model.Exception{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r,
		FromStation: 100, ToStation: 200}
	m.Exceptions = []*model.Exception{ex}
	p := &policies.Policy{Units: model.SI, Rules: map[string]*policies.RuleConfig{"freeboard": {}}}
	run := func(prior []Finding) []Finding {
		var out []Finding
		unusedExceptionRule.Check(&Context{Model: m, Policy: p, Findings: prior}, func(f Finding) { out = append(out, f) })
		return out
	}
	inside := Finding{Rule: "freeboard", Reach: "main", Event: "q", FromStation: 120, ToStation: 200, HasSpan: true}
	assert.Empty(t, run([]Finding{inside}), "covers a finding")
	other := inside
	other.Reach = "side"
	fs := run([]Finding{other})
	require.Len(t, fs, 1, "another reach is not covered")
	assert.Equal(t, rng(50), fs[0].Range)
	assertSpan(t, Finding{HasSpan: fs[0].HasSpan, FromStation: fs[0].FromStation, ToStation: fs[0].ToStation, HasValue: true}, 100, 200, 0, 0)
	p.Exceptions = "deny"
	fs = run([]Finding{inside})
	require.Len(t, fs, 1)
	assert.Equal(t, policies.Info, fs[0].Severity)
	assert.Contains(t, fs[0].Message, "the 1 finding it would cover is reported in full")
}

// TestSegmentBoundaryPoints: two computed points at one station, one in
// each section, belong to their own blocks.
func TestSegmentBoundaryPoints(t *testing.T) {
	m, r := handModel()
	wide := &model.Section{Name: "wide", Shape: model.Rectangle, BottomWidth: 8, Height: 1, Lining: "grass"}
	seg := &model.Segment{Src: model.Src{DefRange: rng(12)}, FromStation: 200, ToStation: 400, SectionName: "wide", Section: wide}
	r.Segments = []*model.Segment{seg}
	pts := depthsPoints(r, []float64{0, 100, 200, 200, 300}, []float64{0.9, 0.9, 0.9, 0.9, 0.9}, []float64{1, 1, 1, 1, 1})
	pts[2].Section = r.Section // the upstream side of the boundary
	fs := runRule(t, "freeboard", m, result(m, r, pts, nil, nil), &policies.RuleConfig{Values: map[string]policies.Value{"minimum": {Number: 0.3}}})
	require.Len(t, fs, 2)
	assertSpan(t, fs[0], 0, 200, 0.1, 0.3)
	assert.Equal(t, r.DefRange, fs[0].Range)
	assertSpan(t, fs[1], 200, 300, 0.1, 0.3)
	assert.Equal(t, seg.DefRange, fs[1].Range)
}
