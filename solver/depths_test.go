package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"

	"github.com/chanlint/chanlint/model"
)

func TestCriticalDepthRectangle(t *testing.T) {
	// Source: references.md closed form, yc = (q²/g)^(1/3) with q = Q/b
	// (Chow 1959, ch. 4).
	for _, u := range []model.Units{model.SI, model.US} {
		for _, c := range []struct{ b, q float64 }{{3, 5}, {0.5, 0.01}, {12, 400}, {2, 1e-4}} {
			g := geoRect(c.b, 0.015, u)
			yc, err := CriticalDepth(g, c.q)
			require.NoError(t, err)
			qq := c.q / c.b
			geoClose(t, math.Cbrt(qq*qq/u.Gravity()), yc, 1e-9, "rectangle yc b=%g Q=%g %s", c.b, c.q, u)
			geoClose(t, 1, FroudeNumber(g, c.q, yc), 1e-9, "F at yc")
		}
	}
}

func TestCriticalConditionAllShapes(t *testing.T) {
	// Source: references.md: at critical depth Q²T/(gA³) = 1 for any shape
	// (α Q²T/(gA³) = 1 with the energy coefficient of a compound section,
	// Chow 1959, ch. 4).
	cases := []struct {
		name string
		g    *Geometry
		q    float64
	}{
		{"trapezoid", geoTrap(3, 2, 0.015, model.SI), 12},
		{"triangle", geoTri(1.5, 0.015, model.SI), 0.8},
		{"circle", geoCircle(1.2, 0.013, model.SI), 1.1},
		{"circle-big", geoCircle(1.2, 0.013, model.SI), 6},
		{"points", geoNatural(), 30},
		{"points-low", geoNatural(), 0.2},
		{"points-walls", geoNatural(), 900},
	}
	for _, c := range cases {
		yc, err := CriticalDepth(c.g, c.q)
		require.NoError(t, err, c.name)
		p := c.g.Props(yc)
		geoClose(t, 1, p.Alpha*c.q*c.q*p.TopWidth/(c.g.G()*p.Area*p.Area*p.Area), 1e-9, "%s critical condition", c.name)
	}
	yc, err := CriticalDepth(geoTrap(3, 2, 0.015, model.SI), 0)
	require.NoError(t, err)
	assert.Equal(t, 0.0, yc)
}

func TestCriticalDepthCompoundRule(t *testing.T) {
	// A narrow deep main channel with very wide flat overbanks has two
	// critical depths for a suitable discharge: one in the main channel and
	// one just above the bank, where the top width jumps. Source: common
	// practice (no published source); Blalock & Sturm 1981 describe such
	// multiple critical depths (from memory).
	g := geoPoints([][2]float64{{0, 3}, {0, 1}, {100, 1}, {100, 0}, {102, 0}, {102, 1}, {202, 1}, {202, 3}},
		[2]float64{100, 102}, [3]float64{0.03, 0.03, 0.03}, model.SI)
	const q = 6.0
	roots := CriticalDepths(g, q, nil)
	require.GreaterOrEqual(t, len(roots), 2, "roots %v", roots)
	for i, r := range roots {
		geoClose(t, 1, FroudeNumber(g, q, r), 1e-9, "root %d at %g", i, r)
		if i > 0 {
			assert.Greater(t, r, roots[i-1])
		}
	}
	yc, err := CriticalDepth(g, q)
	require.NoError(t, err)
	for _, r := range roots {
		assert.LessOrEqual(t, SpecificEnergy(g, q, yc), SpecificEnergy(g, q, r)+1e-12, "the least specific energy is chosen")
	}
	// Independent check of the roots by a fine scan of the Froude number
	// for the depths where it falls through 1 (step 1e-5).
	var scan []float64
	prev := FroudeNumber(g, q, 1e-5)
	for i := 2; i <= 300000; i++ {
		y := float64(i) * 1e-5
		f := FroudeNumber(g, q, y)
		if prev > 1 && f <= 1 {
			scan = append(scan, y)
		}
		prev = f
	}
	require.Len(t, roots, len(scan), "scan found %v", scan)
	for i := range scan {
		assert.InDelta(t, scan[i], roots[i], 1e-5)
	}
}

func TestNormalDepthWideRectangle(t *testing.T) {
	// Source: references.md: wide rectangle, yn = (q·n/(k·√S0))^(3/5).
	// With b = 1e6·yn, R = y/(1 + 2y/b) and yn exceeds the wide-channel
	// value by a factor (1 + 2y/b)^(2/5) ≈ 1 + 8e-7, so 2e-6 is the bound.
	for _, u := range []model.Units{model.SI, model.US} {
		const n, s, q = 0.03, 0.0005, 2.0 // per unit width
		yw := math.Pow(q*n/(u.Manning()*math.Sqrt(s)), 0.6)
		b := 1e6 * yw
		yn, err := NormalDepth(geoRect(b, n, u), q*b, s)
		require.NoError(t, err)
		geoClose(t, yw, yn, 2e-6, "wide rectangle %s", u)
	}
}

func TestNormalDepthManningExact(t *testing.T) {
	// Source: Manning's equation Q = (k/n)·A·R^(2/3)·√S0 written out for
	// each shape (Chow 1959, ch. 6), evaluated at the returned depth.
	cases := []struct {
		name string
		g    *Geometry
		a, p func(y float64) float64
	}{
		{"rectangle", geoRect(2.5, 0.015, model.SI), func(y float64) float64 { return 2.5 * y }, func(y float64) float64 { return 2.5 + 2*y }},
		{"trapezoid", geoTrap(3, 1.5, 0.022, model.US), func(y float64) float64 { return (3 + 1.5*y) * y }, func(y float64) float64 { return 3 + 2*y*math.Sqrt(1+2.25) }},
		{"triangle", geoTri(2, 0.03, model.SI), func(y float64) float64 { return 2 * y * y }, func(y float64) float64 { return 2 * y * math.Sqrt(5) }},
	}
	for _, c := range cases {
		for _, q := range []float64{0.01, 3, 250} {
			const s = 0.002
			yn, err := NormalDepth(c.g, q, s)
			require.NoError(t, err)
			n := c.g.Section().Roughness[1]
			a := c.a(yn)
			got := c.g.K() / n * a * math.Pow(a/c.p(yn), 2.0/3) * math.Sqrt(s)
			geoClose(t, q, got, 1e-9, "%s Manning at yn, Q=%g", c.name, q)
		}
	}
}

func TestPublishedTrapezoidExample(t *testing.T) {
	// Source: Chow, Open-Channel Hydraulics (1959), ch. 10, direct-step
	// example (from memory; references.md): b = 20 ft, z = 2, S0 = 0.0016,
	// n = 0.025, Q = 400 ft³/s: yn = 3.36 ft, yc = 2.15 ft (published to
	// 0.01 ft).
	g := geoTrap(20, 2, 0.025, model.US)
	yn, err := NormalDepth(g, 400, 0.0016)
	require.NoError(t, err)
	assert.InDelta(t, 3.36, yn, 0.01)
	yc, err := CriticalDepth(g, 400)
	require.NoError(t, err)
	assert.InDelta(t, 2.15, yc, 0.01)
}

func TestNormalDepthErrors(t *testing.T) {
	// Source: common practice (no published source): no uniform flow on a
	// horizontal or adverse bed.
	g := geoTrap(3, 2, 0.015, model.SI)
	for _, s := range []float64{0, -0.001, math.NaN()} {
		_, err := NormalDepth(g, 5, s)
		assert.ErrorIs(t, err, ErrNoNormalDepth)
	}
	yn, err := NormalDepth(g, 0, 0.001)
	require.NoError(t, err)
	assert.Equal(t, 0.0, yn)

	// Circle: Qfull = (1/n)·(πD²/4)·(D/4)^(2/3)·√S; the largest normal
	// flow is 1.0757·Qfull (references.md). Just below it a depth exists
	// (below y/D = 0.9382); just above it the pipe cannot carry Q in open
	// channel flow and the error says so.
	const d, n, s = 1.0, 0.013, 0.001
	c := geoCircle(d, n, model.SI)
	qFull := math.Pi * d * d / 4 * math.Pow(d/4, 2.0/3) * math.Sqrt(s) / n
	y, err := NormalDepth(c, 1.07*qFull, s)
	require.NoError(t, err)
	assert.Less(t, y, 0.9382*d+1e-3)
	assert.Greater(t, y, 0.8*d)
	geoClose(t, 1.07*qFull, c.Props(y).Conveyance*math.Sqrt(s), 1e-9, "circle Manning at yn")
	_, err = NormalDepth(c, 1.08*qFull, s)
	require.ErrorIs(t, err, ErrNoNormalDepth)
	assert.Contains(t, err.Error(), "full")
	// Half full at Q = Qfull/2.
	y, err = NormalDepth(c, qFull/2, s)
	require.NoError(t, err)
	geoClose(t, 0.5, y/d, 1e-9, "half-full normal depth")
}

func TestNormalDepthPoints(t *testing.T) {
	// Source: Manning's equation with subdivided conveyance (Chow 1959,
	// ch. 6): K(yn)·√S0 = Q at the returned depth.
	g := geoNatural()
	for _, q := range []float64{0.05, 3, 30, 300, 5000} {
		yn, err := NormalDepth(g, q, 0.001)
		require.NoError(t, err)
		geoClose(t, q, g.Props(yn).Conveyance*math.Sqrt(0.001), 1e-9, "points Q at yn (Q=%g)", q)
	}
}

func TestCriticalAndNormalDepthProperties(t *testing.T) {
	// Source: common practice (no published source): the root conditions
	// hold for any trapezoid and discharge.
	rapid.Check(t, func(rt *rapid.T) {
		b := rapid.Float64Range(0, 50).Draw(rt, "b")
		z := rapid.Float64Range(0, 4).Draw(rt, "z")
		if b < 1e-3 && z < 1e-3 {
			z = 1
		}
		q := rapid.Float64Range(1e-3, 2000).Draw(rt, "q")
		s := rapid.Float64Range(1e-5, 0.1).Draw(rt, "s")
		g := geoTrap(b, z, 0.02, model.SI)
		yc, err := CriticalDepth(g, q)
		if err != nil {
			rt.Fatalf("critical depth: %v", err)
		}
		if f := FroudeNumber(g, q, yc); math.Abs(f-1) > 1e-9 {
			rt.Fatalf("F(yc) = %.15g", f)
		}
		yn, err := NormalDepth(g, q, s)
		if err != nil {
			rt.Fatalf("normal depth: %v", err)
		}
		if r := g.Props(yn).Conveyance * math.Sqrt(s) / q; math.Abs(r-1) > 1e-9 {
			rt.Fatalf("K√S/Q = %.15g", r)
		}
	})
}

func TestCriticalDepthCircleLimits(t *testing.T) {
	// Source: common practice (no published source): T → 0 at the crown,
	// so the Froude number of a partly full circle falls to 0 there and a
	// critical depth exists below the crown for any realistic discharge
	// (here Q up to 40 m³/s in a 1 m pipe, a mean velocity of 50 m/s); a
	// discharge still supercritical within 1e-12·D of the crown is
	// reported as having none.
	g := geoCircle(1, 0.013, model.SI)
	for _, q := range []float64{0.01, 1, 5, 40} {
		yc, err := CriticalDepth(g, q)
		require.NoError(t, err, "Q=%g", q)
		assert.Less(t, yc, 1.0)
		geoClose(t, 1, FroudeNumber(g, q, yc), 1e-9, "circle F(yc) at Q=%g", q)
	}
	yc, err := CriticalDepth(g, 1e5)
	require.ErrorIs(t, err, ErrNoCriticalDepth)
	assert.Equal(t, 1.0, yc, "capped at the crown")
	assert.Empty(t, CriticalDepths(g, 1e5, nil))
}
