package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/chanlint/chanlint/model"
)

func boxSection(b, h, n float64) *model.Section {
	return &model.Section{Shape: model.Box, BottomWidth: b, Height: h, Roughness: [3]float64{n, n, n}}
}

func TestBoxPartlyFullAndFull(t *testing.T) {
	// Source: common practice (no published source): a box partly full is
	// an open rectangle, A = b·y, P = b + 2y, T = b, A·z̄ = b·y²/2; full it
	// has A = b·h, P = 2(b + h), R = b·h/(2(b + h)), and Manning's
	// K = (1/n)·A·R^(2/3) (Chow 1959, Table 2-1, from memory).
	const b, h, n = 2.4, 1.5, 0.013
	g := NewGeometry(boxSection(b, h, n), model.SI)
	assert.True(t, g.Closed())
	y := 0.9
	p := g.Props(y)
	geoClose(t, b*y, p.Area, 1e-14, "area")
	geoClose(t, b+2*y, p.Perimeter, 1e-14, "perimeter")
	geoClose(t, b, p.TopWidth, 1e-14, "top width")
	geoClose(t, b*y*y/2, p.FirstMoment, 1e-14, "first moment")
	geoClose(t, b*y/n*math.Pow(b*y/(b+2*y), 2.0/3), p.Conveyance, 1e-12, "conveyance")
	assert.False(t, p.Full)

	f := g.Props(h)
	assert.True(t, f.Full)
	rFull := b * h / (2 * (b + h))
	geoClose(t, b*h, f.Area, 1e-14, "full area")
	geoClose(t, 2*(b+h), f.Perimeter, 1e-14, "full perimeter")
	geoClose(t, rFull, f.HydraulicRadius, 1e-14, "full R")
	geoClose(t, b*h/n*math.Pow(rFull, 2.0/3), f.Conveyance, 1e-12, "full conveyance")

	s := g.Props(h + 3)
	geoClose(t, b*h+SlotRatio*b*3, s.Area, 1e-13, "slot area")
	geoClose(t, SlotRatio*b, s.TopWidth, 1e-14, "slot width")
	geoClose(t, f.Conveyance, s.Conveyance, 1e-14, "friction of the full barrel in the slot")

	kFull, kMax, yMax, ok := g.FullFlow()
	require.True(t, ok)
	geoClose(t, f.Conveyance, kFull, 1e-14, "K_full")
	geoClose(t, b*h/n*math.Pow(b*h/(b+2*h), 2.0/3), kMax, 1e-12, "largest open conveyance, just below the soffit")
	geoClose(t, h, yMax, 1e-14, "its depth")
}

func TestBoxDepthsAndBarrels(t *testing.T) {
	// Source: Chow, Open-Channel Hydraulics (1959), ch. 4 (from memory):
	// critical depth of a rectangle yc = (Q²/(g·b²))^(1/3); N identical
	// barrels carry N times the flow of one at the same depths.
	const b, h, n, q, s0 = 1.8, 1.2, 0.013, 2.5, 0.004
	one := NewGeometry(boxSection(b, h, n), model.SI)
	three := NewBarrels(boxSection(b, h, n), model.SI, 3)
	assert.Equal(t, 3, three.Barrels())

	yc, err := CriticalDepth(one, q)
	require.NoError(t, err)
	geoClose(t, math.Cbrt(q*q/(model.SI.Gravity()*b*b)), yc, 1e-12, "critical depth")
	yc3, err := CriticalDepth(three, 3*q)
	require.NoError(t, err)
	geoClose(t, yc, yc3, 1e-12, "critical depth of three barrels with three times the flow")

	yn, err := NormalDepth(one, q, s0)
	require.NoError(t, err)
	// Manning's equation at the normal depth, written out.
	a, p := b*yn, b+2*yn
	geoClose(t, q, a/n*math.Pow(a/p, 2.0/3)*math.Sqrt(s0), 1e-9, "Manning at normal depth")
	yn3, err := NormalDepth(three, 3*q, s0)
	require.NoError(t, err)
	geoClose(t, yn, yn3, 1e-9, "normal depth of three barrels")

	p1, p3 := one.Props(0.7), three.Props(0.7)
	geoClose(t, 3*p1.Area, p3.Area, 1e-14, "area of three barrels")
	geoClose(t, 3*p1.Conveyance, p3.Conveyance, 1e-14, "conveyance of three barrels")
	geoClose(t, p1.HydraulicRadius, p3.HydraulicRadius, 1e-14, "R of one barrel")
	kFull1, _, _, _ := one.FullFlow()
	kFull3, _, _, _ := three.FullFlow()
	geoClose(t, 3*kFull1, kFull3, 1e-14, "full conveyance of three barrels")

	// Above the largest open-channel flow there is no normal depth.
	_, kMax, _, _ := one.FullFlow()
	_, err = NormalDepth(one, 1.01*kMax*math.Sqrt(s0), s0)
	assert.ErrorIs(t, err, ErrNoNormalDepth)
	// Supercritical up to the soffit.
	_, err = CriticalDepth(one, 1.01*b*math.Sqrt(model.SI.Gravity()*h*h*h))
	assert.ErrorIs(t, err, ErrNoCriticalDepth)
}
