package revdiff

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/integrate/quad"
)

// rect is an independent description of a rectangular channel in SI
// units for the reference computations (it shares no code with the
// solver).
type rect struct {
	b, n, q, s0 float64
}

const g = 9.80665 // m/s², standard gravity

func (r rect) area(y float64) float64 { return r.b * y }

// sf is Manning's friction slope (n·Q/(A·R^(2/3)))².
func (r rect) sf(y float64) float64 {
	a := r.area(y)
	v := r.n * r.q / (a * math.Pow(a/(r.b+2*y), 2.0/3))
	return v * v
}

// energy is the specific energy y + Q²/(2gA²).
func (r rect) energy(y float64) float64 {
	a := r.area(y)
	return y + r.q*r.q/(2*g*a*a)
}

func (r rect) f2(y float64) float64 { return r.q * r.q / (g * r.b * r.b * y * y * y) }

func (r rect) normalDepth() float64 {
	return bisect(func(y float64) float64 { return r.s0 - r.sf(y) }, 1e-4, 50)
}

// bisect finds the root of f on [a, b] (f(a), f(b) of opposite signs).
func bisect(f func(float64) float64, a, b float64) float64 {
	fa := f(a)
	for range 200 {
		m := (a + b) / 2
		if (f(m) > 0) == (fa > 0) {
			a, fa = m, f(m)
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

// upstreamDistance is how far upstream of depth y0 the M1 profile has
// fallen to depth y: ∫ (1 − F²)/(S0 − Sf) dy from y to y0 by
// Gauss–Legendre quadrature.
func (r rect) upstreamDistance(y, y0 float64) float64 {
	f := func(d float64) float64 { return (1 - r.f2(d)) / (r.s0 - r.sf(d)) }
	const parts = 200
	h := (y0 - y) / parts
	sum := 0.0
	for i := range parts {
		a := y + float64(i)*h
		sum += quad.Fixed(f, a, a+h, 20, quad.Legendre{}, 0)
	}
	return sum
}

// twoReaches is a model of an upper and a lower rectangular reach, the
// lower one bLower wide with its banks at heightLower.
func twoReaches(bLower, heightLower float64) string {
	return fmt.Sprintf(`units = "si"
section "upper" {
  shape        = "rectangle"
  bottom_width = 4
  height       = 3
  roughness    = 0.015
}
section "lower" {
  shape        = "rectangle"
  bottom_width = %g
  height       = %.6f
  roughness    = 0.015
}
reach "upper" {
  from    = "a"
  to      = "b"
  length  = 2000
  section = "upper"
  slope   = 0.001
}
reach "lower" {
  from    = "b"
  to      = "c"
  length  = 1500
  section = "lower"
  slope   = 0.001
}
event "design" {
  inflow = { upper = 6 }
  outlet = { condition = "normal" }
}
`, bLower, heightLower)
}

func solved(t *testing.T, name, src string, pol *policies.Policy) *pipeline.Result {
	t.Helper()
	p := pipeline.Parse(pipeline.File{Name: name}, []byte(src))
	require.False(t, p.Invalid, "%v", p.Diagnostics)
	r := p.Check(pol, pipeline.Options{Keep: pipeline.Keep{Solved: true}})
	require.False(t, r.Invalid, "%v", r.Findings)
	return r
}

func policy(t *testing.T, body string) *policies.Policy {
	t.Helper()
	pol, diags := rules.Language().NewLoader(t.TempDir()).LoadSource("review.policy.hcl",
		[]byte("policy \"review\" {\n  units = \"si\"\n"+body+"\n}\n"))
	require.False(t, diags.HasErrors(), diags.Error())
	return pol
}

// TestIdenticalRevisions: a model compared with itself changes nothing.
//
// Source: common practice (no published source).
func TestIdenticalRevisions(t *testing.T) {
	pol := policy(t, "freeboard {\n minimum = 0.3\n fraction = 0\n}\nno_rise {\n limit = 0\n}")
	src := twoReaches(4, 0.9)
	d := Compare(solved(t, "old.chan.hcl", src, pol), solved(t, "new.chan.hcl", src, pol), pol)
	assert.Empty(t, d.New)
	assert.Empty(t, d.Fixed)
	assert.Empty(t, d.Changed)
	assert.Empty(t, d.Added)
	assert.Empty(t, d.Removed)
	require.Len(t, d.Profiles, 2)
	for _, p := range d.Profiles {
		assert.Zero(t, p.Rise.Delta, p.Reach)
		assert.Zero(t, p.Fall.Delta, p.Reach)
		assert.True(t, p.HasFreeboard)
		assert.Zero(t, p.LessFree.Delta)
	}
}

// TestIdenticalRevisionsWithJumps: the demo compared with itself changes
// nothing either, at its hydraulic jumps and other stations where a
// profile holds two points (the depth on each side) included: each
// side is compared with the same side of the existing profile, and no
// jump moved.
//
// Source: common practice (no published source).
func TestIdenticalRevisionsWithJumps(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl"))
	require.NoError(t, err)
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	new := solved(t, "new.chan.hcl", string(src), pol)
	d := Compare(solved(t, "old.chan.hcl", string(src), pol), new, pol)
	require.NotEmpty(t, d.Profiles)
	jumps := 0
	for _, ev := range new.Solution.Events {
		for _, rr := range ev.Reaches {
			jumps += len(rr.Jumps)
		}
	}
	require.Positive(t, jumps, "the demo has hydraulic jumps")
	for _, p := range d.Profiles {
		assert.Empty(t, p.Jumps, "%s %s: no jump moved", p.Event, p.Reach)
		assert.Zero(t, p.Rise.Delta, "%s %s at %v", p.Event, p.Reach, p.Rise.Station)
		assert.Zero(t, p.Fall.Delta, "%s %s at %v", p.Event, p.Reach, p.Fall.Station)
		assert.Zero(t, p.Faster.Delta, "%s %s", p.Event, p.Reach)
		assert.Zero(t, p.Slower.Delta, "%s %s", p.Event, p.Reach)
		assert.Zero(t, p.LessFree.Delta, "%s %s", p.Event, p.Reach)
		assert.Zero(t, p.MoreFree.Delta, "%s %s", p.Event, p.Reach)
		for i := range p.Stations {
			assert.Equal(t, p.OldWSE[i], p.NewWSE[i], "%s %s at %v", p.Event, p.Reach, p.Stations[i])
		}
	}
}

// TestRaisedBankFixesFreeboard: the lower reach in uniform flow with its
// banks 0.2 m above normal depth fails a 0.3 m freeboard; raised to 0.5 m
// above it, the finding is fixed and the freeboard gained is the 0.3 m
// the banks were raised, with the water surface unchanged.
//
// Source: Manning's equation for uniform flow (Chow, Open-Channel
// Hydraulics, 1959, ch. 6), normal depth by bisection.
func TestRaisedBankFixesFreeboard(t *testing.T) {
	pol := policy(t, "freeboard {\n minimum = 0.3\n fraction = 0\n}")
	yn := rect{b: 4, n: 0.015, q: 6, s0: 0.001}.normalDepth()
	d := Compare(solved(t, "old.chan.hcl", twoReaches(4, yn+0.2), pol), solved(t, "new.chan.hcl", twoReaches(4, yn+0.5), pol), pol)
	require.Len(t, d.Fixed, 1)
	assert.Equal(t, "freeboard", d.Fixed[0].Rule)
	assert.Equal(t, "lower", d.Fixed[0].Reach)
	assert.Empty(t, d.New)
	for _, p := range d.Profiles {
		if p.Reach != "lower" {
			continue
		}
		assert.InDelta(t, 0, p.Rise.Delta, 1e-9)
		assert.InDelta(t, 0.3, p.MoreFree.Delta, 1e-6)
		assert.InDelta(t, 0.3, p.LessFree.Delta, 1e-6)
	}
}

// TestNarrowedReachRaisesUpstream narrows the lower reach from 4 m to
// 3 m. The lower reach stays at its (higher) normal depth; at the
// junction the upper reach ends at the subcritical depth of equal specific
// energy, and an M1 backwater carries the rise upstream. The rise at the
// junction and 800 m upstream is checked against an independent
// computation, and the no_rise criterion fails just below the largest
// rise and passes just above it, its span starting where the independent
// profile crosses the limit.
//
// Source: energy balance at a junction without loss and the
// gradually-varied-flow equation dx/dy = (1 − F²)/(S0 − Sf), Chow,
// Open-Channel Hydraulics (1959), ch. 9, integrated with gonum
// integrate/quad; Manning's normal depth by bisection.
func TestNarrowedReachRaisesUpstream(t *testing.T) {
	upper := rect{b: 4, n: 0.015, q: 6, s0: 0.001}
	lower := rect{b: 3, n: 0.015, q: 6, s0: 0.001}
	yn4, yn3 := upper.normalDepth(), lower.normalDepth()
	e := lower.energy(yn3)
	yc := math.Cbrt(upper.q * upper.q / (g * upper.b * upper.b))
	yb := bisect(func(y float64) float64 { return upper.energy(y) - e }, yc*1.0001, 20)
	riseAt := func(distance float64) float64 {
		y := bisect(func(y float64) float64 { return upper.upstreamDistance(y, yb) - distance }, yn4*1.00001, yb)
		return y - yn4
	}

	old := solved(t, "old.chan.hcl", twoReaches(4, 3), nil)
	new := solved(t, "new.chan.hcl", twoReaches(3, 3), nil)
	d := Compare(old, new, nil)
	var up *Profile
	for i := range d.Profiles {
		if d.Profiles[i].Reach == "upper" {
			up = &d.Profiles[i]
		}
	}
	require.NotNil(t, up)
	assert.InDelta(t, 2000, up.Rise.Station, 1e-6, "the largest rise is at the junction")
	assert.InDelta(t, yb-yn4, up.Rise.Delta, 0.002, "rise at the junction")
	var at1200 float64
	for i, x := range up.Stations {
		if x >= 1200 {
			at1200 = up.NewWSE[i] - up.OldWSE[i] // the first point at or past 1200 m
			ref := riseAt(2000 - x)
			assert.InDelta(t, ref, at1200, 0.002, "rise at station %g", x)
			break
		}
	}
	require.NotZero(t, at1200)

	// no_rise just below and just above the largest rise.
	worst := up.Rise.Delta
	limit := math.Round((worst-0.02)*1000) / 1000
	fails := Compare(old, new, policy(t, fmt.Sprintf("no_rise {\n limit = %g\n}", limit)))
	require.Len(t, fails.NoRise, 1)
	f := fails.NoRise[0]
	assert.Equal(t, "upper", f.Reach)
	assert.Equal(t, policies.Error, f.Severity)
	assert.InDelta(t, worst, f.Value, 1e-9)
	assert.Equal(t, limit, f.Limit)
	assert.InDelta(t, 2000, f.ToStation, 1e-6)
	// The span starts where the independent profile's rise equals the
	// limit: distance upstream of the junction by bisection on the
	// quadrature.
	yLimit := yn4 + limit
	startRef := 2000 - upper.upstreamDistance(yLimit, yb)
	t.Logf("junction rise %.5f vs ref %.5f; span start %.2f vs ref %.2f; limit %g", up.Rise.Delta, yb-yn4, f.FromStation, startRef, limit)
	assert.InDelta(t, startRef, f.FromStation, 0.01*2000, "span start against the reference (%g)", startRef)
	assert.Contains(t, fails.New, f, "a no_rise finding is a new finding")

	passes := Compare(old, new, policy(t, fmt.Sprintf("no_rise {\n limit = %g\n}", math.Round((worst+0.002)*1000)/1000)))
	assert.Empty(t, passes.NoRise)
}
