package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/integrate/quad"

	"github.com/chanlint/chanlint/model"
)

// Helpers of the section-hydraulics tests carry a geo prefix so that they
// cannot collide with the profile tests of the same package.

func geoRect(b, n float64, u model.Units) *Geometry {
	return NewGeometry(&model.Section{Shape: model.Rectangle, BottomWidth: b, Height: 10, Roughness: [3]float64{n, n, n}}, u)
}

func geoTrap(b, z, n float64, u model.Units) *Geometry {
	return NewGeometry(&model.Section{Shape: model.Trapezoid, BottomWidth: b, SideSlope: z, Height: 10, Roughness: [3]float64{n, n, n}}, u)
}

func geoTri(z, n float64, u model.Units) *Geometry {
	return NewGeometry(&model.Section{Shape: model.Triangle, SideSlope: z, Height: 10, Roughness: [3]float64{n, n, n}}, u)
}

func geoCircle(d, n float64, u model.Units) *Geometry {
	return NewGeometry(&model.Section{Shape: model.Circle, Diameter: d, Height: d, Roughness: [3]float64{n, n, n}}, u)
}

func geoPoints(pts [][2]float64, banks [2]float64, n [3]float64, u model.Units) *Geometry {
	s := &model.Section{Shape: model.Points, Banks: banks, Roughness: n}
	for _, p := range pts {
		s.Points = append(s.Points, model.Point{Offset: p[0], Elevation: p[1]})
	}
	return NewGeometry(s, u)
}

// geoNatural is the compound section of the model-format example.
func geoNatural() *Geometry {
	return geoPoints([][2]float64{{0, 4.1}, {6, 2.2}, {9, 0.3}, {12, 0.0}, {15, 0.4}, {20, 2.6}, {30, 3.9}},
		[2]float64{6, 20}, [3]float64{0.06, 0.035, 0.06}, model.SI)
}

// geoClose asserts |got − want| ≤ rel·|want| (or ≤ rel when want is 0).
func geoClose(t *testing.T, want, got, rel float64, what string, args ...any) {
	t.Helper()
	assert.Truef(t, scalar.EqualWithinAbsOrRel(got, want, rel, rel), what+": got %.15g, want %.15g (rel %g)", append(args, got, want, rel)...)
}

func TestGeometryPrismaticClosedForms(t *testing.T) {
	// Source: Chow, Open-Channel Hydraulics (1959), Table 2-1, from memory (geometric
	// elements of channel sections), written out here independently.
	const y = 1.3
	cases := []struct {
		name       string
		g          *Geometry
		a, p, w, m float64
	}{
		{"rectangle", geoRect(3, 0.015, model.SI), 3 * y, 3 + 2*y, 3, 3 * y * y / 2},
		{"trapezoid", geoTrap(3, 2, 0.015, model.SI), (3 + 2*y) * y, 3 + 2*y*math.Sqrt(5), 3 + 4*y, 3*y*y/2 + 2*y*y*y/3},
		{"triangle", geoTri(1.5, 0.015, model.SI), 1.5 * y * y, 2 * y * math.Sqrt(1+1.5*1.5), 3 * y, 1.5 * y * y * y / 3},
	}
	for _, c := range cases {
		p := c.g.Props(y)
		geoClose(t, c.a, p.Area, 1e-14, "%s area", c.name)
		geoClose(t, c.p, p.Perimeter, 1e-14, "%s perimeter", c.name)
		geoClose(t, c.w, p.TopWidth, 1e-14, "%s top width", c.name)
		geoClose(t, c.a/c.p, p.HydraulicRadius, 1e-14, "%s R", c.name)
		geoClose(t, c.m, p.FirstMoment, 1e-14, "%s A·z̄", c.name)
		// Manning: K = (1/n)·A·R^(2/3) in SI.
		geoClose(t, c.a*math.Pow(c.a/c.p, 2.0/3)/0.015, p.Conveyance, 1e-13, "%s conveyance", c.name)
		assert.Equal(t, 1.0, p.Alpha)
		assert.False(t, p.Full)
	}
}

// TestGeometryFirstMomentByQuadrature checks A and A·z̄ of every shape
// against numerical integration of the top width: A(y) = ∫₀^y T(η) dη and
// A·z̄ = ∫₀^y (y − η)·T(η) dη.
func TestGeometryFirstMomentByQuadrature(t *testing.T) {
	// Source: common practice (no published source): definition of area
	// and first moment, integrated with gonum's Gauss–Legendre quadrature.
	shapes := map[string]struct {
		g *Geometry
		y float64
	}{
		"trapezoid":     {geoTrap(2, 1.5, 0.015, model.SI), 1.7},
		"circle-low":    {geoCircle(1.2, 0.013, model.SI), 0.31},
		"circle-high":   {geoCircle(1.2, 0.013, model.SI), 1.07},
		"points-bank":   {geoNatural(), 2.9},
		"points-walled": {geoNatural(), 4.6},
	}
	for name, s := range shapes {
		tw := func(eta float64) float64 { return s.g.Props(eta).TopWidth }
		// The top width has kinks at vertex elevations (and a square-root
		// end behaviour in the circle), so many nodes are used; the
		// tolerance 1e-5 is that quadrature's accuracy, not the code's.
		area := quad.Fixed(tw, 0, s.y, 4000, nil, 0)
		mom := quad.Fixed(func(eta float64) float64 { return (s.y - eta) * tw(eta) }, 0, s.y, 4000, nil, 0)
		p := s.g.Props(s.y)
		geoClose(t, area, p.Area, 1e-5, "%s area", name)
		geoClose(t, mom, p.FirstMoment, 1e-5, "%s first moment", name)
	}
}

func TestGeometryPropsAlwaysFinite(t *testing.T) {
	// Source: common practice (no published source): no NaN or Inf for
	// any depth argument.
	gs := []*Geometry{geoRect(3, 0.015, model.SI), geoTrap(3, 2, 0.015, model.US), geoTri(2, 0.02, model.SI),
		geoCircle(0.9, 0.013, model.SI), geoNatural()}
	for _, g := range gs {
		for _, y := range []float64{math.NaN(), math.Inf(-1), -1, 0, 1e-300, 1e-6, 1, 1e20, math.Inf(1)} {
			p := g.Props(y)
			for _, v := range []float64{p.Area, p.Perimeter, p.TopWidth, p.HydraulicRadius, p.FirstMoment, p.Conveyance, p.Alpha} {
				require.Falsef(t, math.IsNaN(v) || math.IsInf(v, 0), "%s at y=%g: %+v", g.Section().Shape, y, p)
			}
			for _, v := range []float64{FroudeNumber(g, 5, y), SpecificEnergy(g, 5, y), SpecificForce(g, 5, y), FrictionSlope(g, 5, y)} {
				require.Falsef(t, math.IsNaN(v) || math.IsInf(v, 0), "%s at y=%g", g.Section().Shape, y)
			}
		}
	}
}

func TestGeometryAccessors(t *testing.T) {
	// Source: Manning's constant 1.486 and g = 32.174 ft/s² in US units
	// (references.md).
	g := geoTrap(20, 2, 0.025, model.US)
	assert.Equal(t, 1.486, g.K())
	assert.Equal(t, 32.174, g.G())
	assert.Equal(t, 10.0, g.Height())
	assert.False(t, g.Closed())
	c := geoCircle(1.5, 0.013, model.SI)
	assert.Equal(t, 1.5, c.Height())
	assert.True(t, c.Closed())
	assert.Equal(t, model.Circle, c.Section().Shape)
	// The model's default height of a points section: the lower end point
	// above the lowest point (3.9 − 0.0).
	assert.InDelta(t, 3.9, geoNatural().Height(), 1e-12)
	assert.Equal(t, 0.0, Props{}.Velocity(3))
	assert.Equal(t, 2.0, Props{Area: 1.5}.Velocity(3))
}

func TestGeometryDegenerateSectionsDoNotPanic(t *testing.T) {
	// Source: common practice (no published source): sections that model
	// validation rejects must still not panic or loop here.
	secs := []*model.Section{
		{Shape: model.Rectangle},
		{Shape: model.Trapezoid, BottomWidth: -1, SideSlope: -2},
		{Shape: model.Triangle},
		{Shape: model.Circle},
		{Shape: model.Points},
		{Shape: model.Points, Points: []model.Point{{Offset: 1, Elevation: 2}}},
		{Shape: model.Points, Points: []model.Point{{Offset: 0, Elevation: 0}, {Offset: 0, Elevation: 1}}, Banks: [2]float64{3, 1}},
	}
	for _, s := range secs {
		g := NewGeometry(s, model.SI)
		_ = g.Props(1)
		_, _ = NormalDepth(g, 1, 0.001)
		_, _ = CriticalDepth(g, 1)
		_ = CriticalDepths(g, 1, nil)
		_, _ = SequentDepth(g, 1, 0.5)
	}
}
