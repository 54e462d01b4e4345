package solver

import (
	"math"

	"github.com/chanlint/chanlint/model"
)

// This file holds the culvert hydraulics of FHWA HDS-5, Hydraulic Design of
// Highway Culverts, 3rd edition (2012): headwater by inlet control and by
// outlet control, and road overtopping as a broad-crested weir with the
// flow split between barrel and road. The equations below are written
// from memory of the publication; the coefficients of the named inlets
// are in model.InletTypes.

// InletRegime is the regime of an inlet-control headwater.
type InletRegime string

const (
	Unsubmerged InletRegime = "unsubmerged" // Ku·Q/(A·D^0.5) ≤ 3.5
	Transition  InletRegime = "transition"  // between 3.5 and 4.0
	Submerged   InletRegime = "submerged"   // ≥ 4.0
)

// Limits of the unsubmerged and submerged inlet-control equations in the
// discharge intensity Ku·Q/(A·D^0.5) (HDS-5 2012, Appendix A, from
// memory).
const (
	UnsubmergedLimit = 3.5
	SubmergedLimit   = 4.0
)

// InletUnit is Ku of the inlet-control equations: 1.0 in US customary
// units and 1.811 in SI, so that Ku·Q/(A·D^0.5) is the US value of the
// discharge intensity in ft^0.5/s (1.811 = √3.2808, the square root of
// feet per metre; HDS-5 2012, Appendix A, from memory).
func InletUnit(u model.Units) float64 {
	if u == model.US {
		return 1.0
	}
	return 1.811
}

// InletControl is the inlet-control headwater of one barrel.
type InletControl struct {
	HW        float64 // headwater depth above the inlet invert
	Intensity float64 // Ku·Q/(A·D^0.5)
	Regime    InletRegime
}

// InletHeadwater is the inlet-control headwater of a barrel of full area A
// and rise D carrying q on bed slope s0, in unit system u (FHWA HDS-5,
// 3rd ed. 2012, Appendix A, from memory):
//
//	unsubmerged, form 1:  HW/D = Hc/D + K·(Ku·Q/(A·D^0.5))^M + Ks·S
//	unsubmerged, form 2:  HW/D = K·(Ku·Q/(A·D^0.5))^M
//	submerged:            HW/D = c·(Ku·Q/(A·D^0.5))² + Y + Ks·S
//
// with Hc = yc + Vc²/2g the specific head at critical depth (hc(q) gives
// it for a discharge), Ks = −0.5 (+0.7 for mitered inlets) and Ku = 1.0
// (US) or 1.811 (SI). The unsubmerged form holds up to an intensity of
// 3.5, the submerged one from 4.0; between the two the headwater is
// interpolated linearly in the intensity from the unsubmerged value at
// 3.5 to the submerged one at 4.0, as the publication prescribes for the
// transition zone.
func InletHeadwater(c model.Coefficients, u model.Units, q, area, rise, s0 float64, hc func(q float64) float64) InletControl {
	if !(q > 0) || !(area > 0) || !(rise > 0) {
		return InletControl{Regime: Unsubmerged}
	}
	ku := InletUnit(u)
	scale := ku / (area * math.Sqrt(rise)) // intensity per unit discharge
	x := q * scale
	unsub := func(q, x float64) float64 {
		if c.Form == 2 {
			return rise * c.K * math.Pow(x, c.M)
		}
		return hc(q) + rise*(c.K*math.Pow(x, c.M)+c.SlopeTerm*s0)
	}
	sub := func(x float64) float64 { return rise * (c.C*x*x + c.Y + c.SlopeTerm*s0) }
	switch {
	case x <= UnsubmergedLimit:
		return InletControl{HW: unsub(q, x), Intensity: x, Regime: Unsubmerged}
	case x >= SubmergedLimit:
		return InletControl{HW: sub(x), Intensity: x, Regime: Submerged}
	}
	hu := unsub(UnsubmergedLimit/scale, UnsubmergedLimit)
	hs := sub(SubmergedLimit)
	t := (x - UnsubmergedLimit) / (SubmergedLimit - UnsubmergedLimit)
	return InletControl{HW: hu + t*(hs-hu), Intensity: x, Regime: Transition}
}

// FullBarrelLoss is the head H lost through a barrel flowing full, from
// the pool above to the outlet's hydraulic grade (FHWA HDS-5, 3rd ed.
// 2012, ch. 3 on outlet control, from memory):
//
//	H = (1 + ke + kf)·V²/2g,   kf = 2g·n²·L/(k²·R^(4/3))
//
// with V the full-barrel velocity, ke the entrance-loss coefficient, the 1
// the exit loss of the velocity head into a still pool, and kf·V²/2g the
// Manning friction of the full barrel of length L and hydraulic radius R
// (k = 1.0 SI, 1.486 US).
func FullBarrelLoss(ke, n, k, g, length, r, v float64) float64 {
	kf := 2 * g * n * n * length / (k * k * math.Pow(r, 4.0/3))
	return (1 + ke + kf) * v * v / (2 * g)
}

// LowTailwater is the outlet hydraulic grade ho of a barrel flowing full
// under outlet control, as a depth above the outlet invert (HDS-5 2012,
// from memory): the tailwater when it is above (dc + D)/2, else (dc + D)/2
// with dc the critical depth (not above the rise D).
func LowTailwater(tw, dc, rise float64) float64 {
	return math.Max(tw, (math.Min(dc, rise)+rise)/2)
}

// RoadWeirCoefficient is the discharge coefficient Cr of a paved road
// overtopped as a broad-crested weir, Q = Cr·L·Hr^1.5: 3.0 ft^0.5/s in US
// units, 1.66 m^0.5/s in SI (the same value times √0.3048). Source: FHWA
// HDS-5 (2012), roadway overtopping, after FHWA HDS-1 (1978), for deep
// overtopping (Hr/Lr > 0.15, Lr the road width), from memory. The
// coefficient is used at every head; below Hr/Lr = 0.15 the published
// curve runs a little lower (about 2.9 at shallow heads), so the road
// flow is slightly overstated there.
func RoadWeirCoefficient(u model.Units) float64 {
	if u == model.US {
		return 3.0
	}
	return 3.0 * math.Sqrt(0.3048)
}

// roadSubmergence tabulates the submergence factor kt of a paved road
// against ht/Hr, the tailwater and the headwater above the crest: no
// reduction up to ht/Hr = 0.8, falling steeply to 0 as the two levels
// meet. Source: the paved-road curve of FHWA HDS-1, Hydraulics of Bridge
// Waterways (1978), as HDS-5 (2012) reproduces it for roadway
// overtopping; the points were read from memory and are to be checked
// against the figure.
var roadSubmergence = [][2]float64{
	{0.80, 1.00}, {0.85, 0.98}, {0.90, 0.93}, {0.93, 0.87}, {0.95, 0.81},
	{0.97, 0.71}, {0.98, 0.63}, {0.99, 0.50}, {1.00, 0.00},
}

// RoadSubmergenceFactor is kt for a ratio ht/Hr (linear between the
// tabulated points; 1 below 0.8, 0 from 1).
func RoadSubmergenceFactor(ratio float64) float64 {
	t := roadSubmergence
	if !(ratio > t[0][0]) {
		return 1
	}
	for i := 1; i < len(t); i++ {
		if ratio <= t[i][0] {
			a, b := t[i-1], t[i]
			return a[1] + (ratio-a[0])/(b[0]-a[0])*(b[1]-a[1])
		}
	}
	return 0
}

// RoadFlow is the discharge over a road of crest elevation crest and
// crest length length, with weir coefficient cr, for headwater hw and
// tailwater tw (elevations):
//
//	Qr = kt·Cr·L·Hr^1.5,  Hr = HW − crest,  kt = kt(ht/Hr),  ht = TW − crest
//
// (FHWA HDS-5 2012, roadway overtopping, from memory). It is 0 when the
// headwater is not above the crest.
func RoadFlow(cr, length, crest, hw, tw float64) float64 {
	hr := hw - crest
	if !(hr > 0) {
		return 0
	}
	kt := 1.0
	if ht := tw - crest; ht > 0 {
		kt = RoadSubmergenceFactor(ht / hr)
	}
	return kt * cr * length * hr * math.Sqrt(hr)
}

// roadHeadwater inverts RoadFlow: the headwater elevation at which the
// road carries qr (the crest for qr ≤ 0). RoadFlow rises with the
// headwater (kt rises as ht/Hr falls), so the root is unique.
func roadHeadwater(cr, length, crest, tw, qr float64) float64 {
	if !(qr > 0) || !(cr > 0) || !(length > 0) {
		return crest
	}
	lo := crest
	if tw > crest {
		lo = tw
	}
	free := math.Pow(qr/(cr*length), 2.0/3) // Hr with kt = 1, a lower bound
	hi := math.Max(lo, crest) + free
	f := func(hw float64) float64 { return RoadFlow(cr, length, crest, hw, tw) - qr }
	for i := 0; f(hi) < 0; i++ {
		if i == maxScanSteps {
			return hi
		}
		hi += 2*(hi-crest) + free
	}
	hw, err := Brent(f, lo, hi, 1e-12*math.Max(1, math.Abs(hi)))
	if err != nil {
		return hi
	}
	return hw
}

// Split is the division of a culvert's discharge between barrel and road.
type Split struct {
	Barrel, Road float64 // discharges
	HW           float64 // headwater elevation both see
}

// SplitFlow divides discharge q between a barrel whose headwater elevation
// for a barrel discharge is barrelHW(qb) (rising with qb) and a road of
// crest elevation crest, crest length and weir coefficient cr, with the
// tailwater elevation tw, so that both see the same headwater:
//
//	barrelHW(Qb) = HW = roadHW(Q − Qb)
//
// found by Brent's method on Qb to a headwater difference far below 1 mm.
// Without a road (length 0) or when the barrel alone keeps the headwater
// at or below the crest, the barrel takes everything.
func SplitFlow(q float64, barrelHW func(qb float64) float64, cr, length, crest, tw float64) Split {
	all := barrelHW(q)
	if !(length > 0) || !(all > crest) || !(q > 0) {
		return Split{Barrel: q, HW: all}
	}
	f := func(qb float64) float64 {
		return barrelHW(qb) - roadHeadwater(cr, length, crest, tw, q-qb)
	}
	qb, err := Brent(f, 0, q, 1e-12*q)
	if err != nil {
		// f(0) is the barrel's still pool against the road at full
		// flow, below the crest; f(q) > 0 was checked: a bracket exists
		// unless barrelHW is not monotone. Keep the barrel at its
		// largest flow below the crest as a last resort.
		qb = 0
	}
	return Split{Barrel: qb, Road: q - qb, HW: barrelHW(qb)}
}
