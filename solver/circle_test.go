package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"

	"github.com/chanlint/chanlint/model"
)

func TestCirclePartlyFullRatios(t *testing.T) {
	g := geoCircle(1.0, 0.013, model.SI)
	full := g.Props(g.Height())
	qFull := full.Conveyance
	vFull := full.Conveyance / full.Area

	half := g.Props(0.5)
	// Source: references.md, partly full circle with constant n: at
	// y/D = 0.5, Q/Qfull = 0.500 and V/Vfull = 1.000 (exact by symmetry).
	geoClose(t, 0.5, half.Conveyance/qFull, 1e-12, "Q/Qfull at y/D=0.5")
	geoClose(t, 1.0, half.Conveyance/half.Area/vFull, 1e-12, "V/Vfull at y/D=0.5")

	// Scan y/D on a 1e-5 grid for the maxima (independent of the
	// stationary-point equations used by the code).
	var qMax, qAt, vMax, vAt float64
	for i := 50000; i < 100000; i++ {
		y := float64(i) * 1e-5
		p := g.Props(y)
		if r := p.Conveyance / qFull; r > qMax {
			qMax, qAt = r, y
		}
		if r := p.Conveyance / p.Area / vFull; r > vMax {
			vMax, vAt = r, y
		}
	}
	// Source: references.md: maximum Q/Qfull = 1.0757 at y/D = 0.9382;
	// maximum V/Vfull = 1.1400 at y/D = 0.8128 (rel 1e-3).
	geoClose(t, 1.0757, qMax, 1e-3, "max Q/Qfull")
	geoClose(t, 0.9382, qAt, 1e-3, "y/D of max Q")
	geoClose(t, 1.1400, vMax, 1e-3, "max V/Vfull")
	geoClose(t, 0.8128, vAt, 1e-3, "y/D of max V")
	geoClose(t, 0.9382, circleQmaxDepthRatio, 1e-4, "stationary y/D of max Q")
	geoClose(t, 0.8128, circleVmaxDepthRatio, 1e-4, "stationary y/D of max V")

	kFull, kMax, yMax, ok := g.FullFlow()
	assert.True(t, ok)
	geoClose(t, qFull, kFull, 1e-12, "FullFlow K_full")
	geoClose(t, 1.0757, kMax/kFull, 1e-3, "FullFlow K_max/K_full")
	geoClose(t, 0.9382, yMax, 1e-3, "FullFlow depth")
	_, _, _, ok = geoRect(1, 0.013, model.SI).FullFlow()
	assert.False(t, ok)
}

func TestCircleHalfAndFull(t *testing.T) {
	// Source: common practice (no published source): the half-full and
	// full circle, A = πD²/8 and πD²/4, P = πD/2 and πD, T = D and 0,
	// A·z̄ of a half disc = D³/12 (centroid 4r/3π below the diameter).
	const d = 1.8
	g := geoCircle(d, 0.013, model.SI)
	h := g.Props(d / 2)
	geoClose(t, math.Pi*d*d/8, h.Area, 1e-13, "half area")
	geoClose(t, math.Pi*d/2, h.Perimeter, 1e-13, "half perimeter")
	geoClose(t, d, h.TopWidth, 1e-13, "half top width")
	geoClose(t, d*d*d/12, h.FirstMoment, 1e-12, "half first moment")
	assert.False(t, h.Full)

	f := g.Props(d)
	assert.True(t, f.Full, "at the crown the conduit is full")
	geoClose(t, math.Pi*d*d/4, f.Area, 1e-13, "full area")
	geoClose(t, math.Pi*d, f.Perimeter, 1e-13, "full perimeter")
	geoClose(t, d/4, f.HydraulicRadius, 1e-13, "full R")
	geoClose(t, math.Pi*d*d/4*d/2, f.FirstMoment, 1e-12, "full first moment about the crown")

	// Surcharged: the Preissmann slot adds SlotRatio·D per unit rise; the
	// conveyance stays that of the full pipe. Continuity at the crown.
	s := g.Props(d + 2)
	assert.True(t, s.Full)
	geoClose(t, math.Pi*d*d/4+SlotRatio*d*2, s.Area, 1e-13, "slot area")
	geoClose(t, SlotRatio*d, s.TopWidth, 1e-13, "slot width")
	geoClose(t, f.Conveyance, s.Conveyance, 1e-13, "conveyance above the crown")
	below := g.Props(d * (1 - 1e-9))
	geoClose(t, f.Area, below.Area, 1e-8, "area continuous at the crown")
	// The perimeter grows like √(D − y) just below the crown, so K differs
	// by about √1e-9 ≈ 3e-5 relative there.
	geoClose(t, f.Conveyance, below.Conveyance, 1e-4, "conveyance continuous at the crown")
	geoClose(t, f.FirstMoment, below.FirstMoment, 1e-8, "first moment continuous at the crown")
}

func TestCircleSmallDepthSeries(t *testing.T) {
	// Source: common practice (no published source): for y ≪ D the wetted
	// segment is a parabola of width T = 2√(yD), so A → (2/3)·T·y; the
	// series branch for small central angles must agree with it and with
	// the direct formula just above the switch.
	g := geoCircle(1, 0.013, model.SI)
	y := 1e-8
	p := g.Props(y)
	geoClose(t, 2.0/3*2*math.Sqrt(y)*y, p.Area, 1e-6, "tiny-depth area")
	// Around the series switch (θ = 0.01, y/D ≈ 2.5e-5): continuous.
	ys := (1 - math.Cos(0.005)) / 2
	a, b := g.Props(ys*(1-1e-9)), g.Props(ys*(1+1e-9))
	geoClose(t, a.Area, b.Area, 1e-8, "series/direct continuity")
}
