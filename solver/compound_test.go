package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"

	"github.com/chanlint/chanlint/model"
)

func TestPointsTraceClosedForms(t *testing.T) {
	// Source: Chow 1959, Table 2-1, from memory (rectangle and trapezoid), compared with
	// points sections that trace the same shapes exactly.
	const n = 0.015
	rect := geoRect(4, n, model.SI)
	rectPts := geoPoints([][2]float64{{0, 3}, {0, 0}, {4, 0}, {4, 3}}, [2]float64{0, 4}, [3]float64{n, n, n}, model.SI)
	trap := geoTrap(3, 2, n, model.SI)
	trapPts := geoPoints([][2]float64{{0, 2.5}, {5, 0}, {8, 0}, {13, 2.5}}, [2]float64{0, 13}, [3]float64{n, n, n}, model.SI)
	for _, y := range []float64{0.01, 0.4, 1.1, 2.5} {
		for _, c := range []struct {
			name       string
			want, have *Geometry
		}{{"rectangle", rect, rectPts}, {"trapezoid", trap, trapPts}} {
			w, h := c.want.Props(y), c.have.Props(y)
			geoClose(t, w.Area, h.Area, 1e-12, "%s area at %g", c.name, y)
			geoClose(t, w.Perimeter, h.Perimeter, 1e-12, "%s perimeter at %g", c.name, y)
			geoClose(t, w.TopWidth, h.TopWidth, 1e-12, "%s top width at %g", c.name, y)
			geoClose(t, w.FirstMoment, h.FirstMoment, 1e-12, "%s first moment at %g", c.name, y)
			geoClose(t, w.Conveyance, h.Conveyance, 1e-12, "%s conveyance at %g", c.name, y)
			geoClose(t, 1, h.Alpha, 1e-12, "%s alpha at %g", c.name, y)
		}
	}
	// Above the rectangle's end points the vertical walls continue it.
	geoClose(t, rect.Props(5).Perimeter, rectPts.Props(5).Perimeter, 1e-12, "walls above the end points")
	geoClose(t, rect.Props(5).Area, rectPts.Props(5).Area, 1e-12, "area between the walls")
}

func TestPointsSubdividedConveyance(t *testing.T) {
	// Source: hand calculation of the divided channel method (Chow 1959,
	// ch. 6, from memory): a 4-wide rectangle with banks at offsets 1 and 3
	// and depth 1. Left and right zones: A = 1, P = 1 (bed) + 1 (wall);
	// main zone: A = 2, P = 2; the division lines are not wetted, so
	// K = (1/n)·(2·1·(1/2)^(2/3) + 2·1^(2/3)).
	const n = 0.02
	g := geoPoints([][2]float64{{0, 3}, {0, 0}, {4, 0}, {4, 3}}, [2]float64{1, 3}, [3]float64{n, n, n}, model.SI)
	p := g.Props(1)
	geoClose(t, 4, p.Area, 1e-12, "area")
	geoClose(t, 6, p.Perimeter, 1e-12, "perimeter")
	geoClose(t, (2*math.Pow(0.5, 2.0/3)+2)/n, p.Conveyance, 1e-12, "divided conveyance")
	// α = (Σ K_i³/A_i²)/(K³/A²) from the same zones.
	kl, km := math.Pow(0.5, 2.0/3)/n, 2/n
	k := 2*kl + km
	geoClose(t, (2*kl*kl*kl+km*km*km/4)*16/(k*k*k), p.Alpha, 1e-12, "alpha")
}

func TestPointsPockets(t *testing.T) {
	// Source: hand calculation (common practice, no published source): two
	// pockets of a W-shaped bed, level stage 1.0 above the lowest point.
	// Left pocket: wet from x = 4/3 to 3, depth 1 at x = 2 → A = 1/3 + 1/2,
	// T = 5/3. Right pocket: wet from x = 16/3 to 6.4, depth 0.5 at x = 6
	// → A = (2/3 + 0.4)·0.5/2, T = 2/3 + 0.4. The ridge at 2.0 is dry.
	g := geoPoints([][2]float64{{0, 3}, {2, 0}, {4, 2}, {6, 0.5}, {8, 3}}, [2]float64{0, 8}, [3]float64{0.03, 0.03, 0.03}, model.SI)
	p := g.Props(1)
	geoClose(t, 1.0/3+0.5+(2.0/3+0.4)*0.25, p.Area, 1e-12, "area of two pockets")
	geoClose(t, 5.0/3+2.0/3+0.4, p.TopWidth, 1e-12, "top width of two pockets")
}

func TestPointsCompoundAlphaAndContinuity(t *testing.T) {
	// Symmetric compound section: main channel 6 wide and 2 deep, flat
	// overbanks 20 wide each, rougher.
	g := geoPoints([][2]float64{{0, 4}, {0, 2}, {20, 2}, {21, 0}, {27, 0}, {28, 2}, {48, 2}, {48, 4}},
		[2]float64{20, 28}, [3]float64{0.06, 0.03, 0.06}, model.SI)
	// Source: Chow 1959, ch. 6 (from memory): α > 1 in a compound section
	// with flowing overbanks (typically 1.1 to 2); α = 1 with one zone.
	assert.InDelta(t, 1.0, g.Props(1.5).Alpha, 1e-12, "overbanks dry: one subdivision")
	a := g.Props(2.5).Alpha
	assert.Greater(t, a, 1.1, "overbanks flowing")
	assert.Less(t, a, 5.0)

	// Source: common practice (no published source): divided-channel
	// conveyance is continuous at the bank elevation because a flooding
	// zone starts with zero area. With dK/dy bounded, a step of 2e-9
	// changes K by a few 1e-8 relative at most.
	lo, hi := g.Props(2-1e-9), g.Props(2+1e-9)
	geoClose(t, lo.Conveyance, hi.Conveyance, 1e-6, "K across the bank elevation")
	geoClose(t, lo.Alpha, hi.Alpha, 1e-3, "alpha across the bank elevation")
	// The top width jumps there (flat overbanks), as it must.
	assert.Greater(t, hi.TopWidth, lo.TopWidth+39)
}
