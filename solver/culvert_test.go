package solver

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"

	"github.com/chanlint/chanlint/model"
)

// squareEdge is HDS-5's circular concrete pipe with a square edge in a
// headwall, written out here rather than read from the model's table.
// Source: FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. (2012),
// Table A.1 (from memory): K 0.0098, M 2.0, c 0.0398, Y 0.67, Ks −0.5.
var squareEdge = model.Coefficients{Form: 1, K: 0.0098, M: 2.0, C: 0.0398, Y: 0.67, SlopeTerm: -0.5, EntranceLoss: 0.5}

func constHead(h float64) func(float64) float64 { return func(float64) float64 { return h } }

func TestInletControlForm1US(t *testing.T) {
	// Source: FHWA HDS-5 (2012), Appendix A, inlet-control equations
	// (from memory), US constant Ku = 1.0. A 4 ft pipe, A = 4π ft², S =
	// 0.01, with Hc = 2.9 ft given: unsubmerged form 1 at 60 ft³/s
	// (Q/(A·D^0.5) = 2.387), HW = Hc + D·(K·x² − 0.5·S) = 3.1034 ft; submerged
	// at 200 ft³/s (x = 7.958), HW = D·(c·x² + Y − 0.5·S) = 12.7415 ft, both
	// evaluated by hand.
	const d = 4.0
	a := math.Pi * d * d / 4
	u := InletHeadwater(squareEdge, model.US, 60, a, d, 0.01, constHead(2.9))
	assert.Equal(t, Unsubmerged, u.Regime)
	geoClose(t, 2.3873241, u.Intensity, 1e-7, "intensity")
	geoClose(t, 3.1034132, u.HW, 1e-7, "unsubmerged form 1 headwater")
	s := InletHeadwater(squareEdge, model.US, 200, a, d, 0.01, constHead(2.9))
	assert.Equal(t, Submerged, s.Regime)
	geoClose(t, 12.7414578, s.HW, 1e-7, "submerged headwater")
}

func TestInletControlForm1SI(t *testing.T) {
	// Source: FHWA HDS-5 (2012), Appendix A (from memory), SI constant Ku =
	// 1.811. A 1.2 m pipe carrying 1.5 m³/s with Hc = 0.9 m given, S =
	// 0.01: x = 1.811·Q/(A·D^0.5) = 2.1926, HW = 0.9 + 1.2·(0.0098·x² −
	// 0.005) = 0.95054 m, evaluated by hand.
	const d = 1.2
	a := math.Pi * d * d / 4
	r := InletHeadwater(squareEdge, model.SI, 1.5, a, d, 0.01, constHead(0.9))
	assert.Equal(t, Unsubmerged, r.Regime)
	geoClose(t, 2.1926369, r.Intensity, 1e-7, "intensity")
	geoClose(t, 0.9505380, r.HW, 1e-7, "headwater")

	// The same culvert in feet gives the same headwater in feet: Ku = 1.811
	// is √(ft per m) to the precision HDS-5 prints it (4 figures, so
	// within 5e-4 once squared in the submerged form).
	// Source: common practice (no published source): unit conversion.
	const ft = 1 / 0.3048
	for _, q := range []float64{0.8, 1.5, 4, 6} {
		si := InletHeadwater(squareEdge, model.SI, q, a, d, 0.01, constHead(0.9))
		us := InletHeadwater(squareEdge, model.US, q*ft*ft*ft, a*ft*ft, d*ft, 0.01, constHead(0.9*ft))
		geoClose(t, us.HW, si.HW*ft, 5e-4, "SI and US headwater at %g m³/s", q) // 1.811 vs √3.28084 = 1.81134, squared
		assert.Equal(t, us.Regime, si.Regime)
	}
}

func TestInletControlForm2AndBox(t *testing.T) {
	// Source: FHWA HDS-5 (2012), Appendix A (from memory): form 2,
	// HW/D = K·x^M, with coefficients given explicitly (K 0.5, M 0.667); a
	// 2.0 × 1.5 m box at 4 m³/s, x = 1.811·4/(3·√1.5) = 1.97157, HW =
	// 1.5·0.5·x^0.667 = 1.17951 m. Submerged with the box coefficients of
	// 30–75° wingwalls (c 0.0347, Y 0.81) at 12 m³/s, S = 0.02: x = 5.91470,
	// HW = 1.5·(0.0347·x² + 0.81 − 0.01) = 3.02090 m; by hand.
	form2 := model.Coefficients{Form: 2, K: 0.5, M: 0.667, C: 0.0347, Y: 0.81, SlopeTerm: -0.5}
	const b, d = 2.0, 1.5
	r := InletHeadwater(form2, model.SI, 4, b*d, d, 0.02, nil)
	assert.Equal(t, Unsubmerged, r.Regime)
	geoClose(t, 1.1795071, r.HW, 1e-7, "form 2 headwater")
	s := InletHeadwater(form2, model.SI, 12, b*d, d, 0.02, nil)
	assert.Equal(t, Submerged, s.Regime)
	geoClose(t, 3.0209011, s.HW, 1e-7, "submerged box headwater")
}

func TestInletControlTransition(t *testing.T) {
	// Source: FHWA HDS-5 (2012), Appendix A (from memory): between
	// intensities 3.5 and 4.0 the headwater passes linearly from the
	// unsubmerged value at 3.5 to the submerged value at 4.0; it is
	// continuous at both ends.
	const d = 4.0
	a := math.Pi * d * d / 4
	q := func(x float64) float64 { return x * a * math.Sqrt(d) }
	hc := func(q float64) float64 { return 0.1 * q / a } // any smooth Hc(Q)
	at := func(x float64) InletControl { return InletHeadwater(squareEdge, model.US, q(x), a, d, 0.01, hc) }
	hu := hc(q(3.5)) + d*(0.0098*3.5*3.5-0.005)
	hs := d * (0.0398*16 + 0.67 - 0.005)
	geoClose(t, hu, at(3.5).HW, 1e-12, "unsubmerged end")
	geoClose(t, hs, at(4.0).HW, 1e-12, "submerged end")
	mid := at(3.75)
	assert.Equal(t, Transition, mid.Regime)
	geoClose(t, (hu+hs)/2, mid.HW, 1e-12, "midpoint of the transition")
	geoClose(t, hu, at(3.5+1e-9).HW, 1e-8, "continuous at 3.5")
	geoClose(t, hs, at(4.0-1e-9).HW, 1e-8, "continuous at 4.0")
}

func TestFullBarrelLossByHand(t *testing.T) {
	// Source: FHWA HDS-5 (2012), outlet control, full flow (from memory):
	// H = (1 + ke + kf)·V²/2g with kf = 2g·n²·L/(k²·R^(4/3)). A 1.2 m
	// concrete pipe (n 0.013, R = 0.3 m), 40 m long, 3 m³/s, ke 0.5:
	// V = 2.65258 m/s, kf = 0.660190, H = 0.774960 m, by hand.
	const d = 1.2
	a := math.Pi * d * d / 4
	h := FullBarrelLoss(0.5, 0.013, 1.0, 9.80665, 40, d/4, 3/a)
	geoClose(t, 0.7749596, h, 1e-7, "full-barrel head loss")
	// ho = max(TW, (dc + D)/2).
	geoClose(t, 1.5, LowTailwater(1.5, 0.9, 1.2), 1e-15, "tailwater above the crown")
	geoClose(t, 1.05, LowTailwater(0.4, 0.9, 1.2), 1e-15, "low tailwater")
	geoClose(t, 1.2, LowTailwater(0.4, 1.5, 1.2), 1e-15, "dc not above the rise")
}

func TestRoadWeir(t *testing.T) {
	// Source: FHWA HDS-5 (2012), roadway overtopping, after HDS-1 (1978),
	// from memory: Q = kt·Cr·L·Hr^1.5 with Cr = 3.0 ft^0.5/s for a paved
	// road. 100 ft of crest under 1.0 ft of head carries 300 ft³/s free;
	// 1.66 m^0.5/s in SI.
	cr := RoadWeirCoefficient(model.US)
	geoClose(t, 300, RoadFlow(cr, 100, 50, 51, 40), 1e-12, "free road flow")
	geoClose(t, 1.66, RoadWeirCoefficient(model.SI), 3e-3, "SI coefficient")
	geoClose(t, 0, RoadFlow(cr, 100, 50, 49.9, 40), 0, "no flow below the crest")
	// Submerged: ht/Hr = 0.9 gives kt = 0.93 on the paved-road curve (the
	// tabulated point, from memory).
	geoClose(t, 0.93*300, RoadFlow(cr, 100, 50, 51, 50.9), 1e-12, "submerged road flow")
	assert.Equal(t, 1.0, RoadSubmergenceFactor(0.5))
	assert.Equal(t, 0.0, RoadSubmergenceFactor(1.2))
	// roadHeadwater inverts RoadFlow, submerged or not.
	for _, tw := range []float64{40, 50.5, 50.9} {
		hw := roadHeadwater(cr, 100, 50, tw, 250)
		geoClose(t, 250, RoadFlow(cr, 100, 50, hw, tw), 1e-9, "inverted road flow, tailwater %g", tw)
	}
}

func TestSplitFlowBalancesHeadwater(t *testing.T) {
	// Source: common practice (no published source): the barrel and the
	// road pass the event's flow at one headwater (HDS-5 2012, roadway
	// overtopping, from memory); the balance must close to 1 mm.
	const crest, tw = 6.4, 3.0
	barrel := func(qb float64) float64 { return 2.0 + 1.8 + 0.05*qb*qb } // a full-barrel rating, HW = z + ho + c·Q²
	cr := RoadWeirCoefficient(model.SI)
	for _, q := range []float64{5, 12, 20, 40} {
		s := SplitFlow(q, barrel, cr, 40, crest, tw)
		geoClose(t, q, s.Barrel+s.Road, 1e-12, "continuity at %g", q)
		if barrel(q) <= crest {
			assert.Equal(t, q, s.Barrel)
			assert.Zero(t, s.Road)
			continue
		}
		assert.Greater(t, s.Road, 0.0)
		road := roadHeadwater(cr, 40, crest, tw, s.Road)
		assert.Less(t, math.Abs(barrel(s.Barrel)-road), 1e-3, "headwater balance to 1 mm at %g", q)
		assert.Less(t, math.Abs(s.HW-road), 1e-3)
		// and the weir formula at that headwater gives the road's share
		geoClose(t, s.Road, cr*40*math.Pow(s.HW-crest, 1.5), 1e-6, "weir flow at the balanced headwater")
	}
	// Without a road the barrel takes everything.
	s := SplitFlow(40, barrel, cr, 0, crest, tw)
	assert.Equal(t, 40.0, s.Barrel)
}

func TestInletControlMoreFormsAndUnits(t *testing.T) {
	// Source: FHWA HDS-5 (2012), Appendix A (from memory), US Ku = 1.0 and
	// SI Ku = 1.811, coefficients given explicitly; values by hand:
	//   form 2, US, 6 × 4 ft box, 150 ft³/s: x = 150/(24·2) = 3.125,
	//     HW = 4·0.5·x^0.667 = 4.27656 ft;
	//   submerged, US, same box, 400 ft³/s, S = 0.02: x = 8.3333,
	//     HW = 4·(0.0347·x² + 0.81 − 0.01) = 12.83889 ft;
	//   form 1 submerged, SI, 1.2 m pipe, 5 m³/s, S = 0.01: x = 7.30879,
	//     HW = 1.2·(0.0398·x² + 0.67 − 0.005) = 3.34926 m.
	form2 := model.Coefficients{Form: 2, K: 0.5, M: 0.667, C: 0.0347, Y: 0.81, SlopeTerm: -0.5}
	r := InletHeadwater(form2, model.US, 150, 24, 4, 0.02, nil)
	assert.Equal(t, Unsubmerged, r.Regime)
	geoClose(t, 4.2765638, r.HW, 1e-7, "form 2, US")
	s := InletHeadwater(form2, model.US, 400, 24, 4, 0.02, nil)
	assert.Equal(t, Submerged, s.Regime)
	geoClose(t, 12.8388889, s.HW, 1e-7, "submerged, US")
	const d = 1.2
	si := InletHeadwater(squareEdge, model.SI, 5, math.Pi*d*d/4, d, 0.01, constHead(0.9))
	assert.Equal(t, Submerged, si.Regime)
	geoClose(t, 3.3492630, si.HW, 1e-7, "form 1 submerged, SI")
}
