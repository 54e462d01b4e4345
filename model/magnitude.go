package model

import (
	"math"

	"github.com/hashicorp/hcl/v2"
)

// A Bound is one end of the physical range of a kind of quantity, written
// in each unit system as a round number of its own (so that a message
// never quotes a converted bound such as 0.00328 ft). The US value is the
// SI one converted and rounded towards the more permissive side, so that
// no model valid in SI is refused when written in US units.
type Bound struct {
	SI, US float64
}

// In returns the bound in the model's units.
func (b Bound) In(u Units) float64 {
	if u == US {
		return b.US
	}
	return b.SI
}

// The physical ranges of the magnitudes of a model. A value outside them
// describes no channel that can be built or surveyed: it is a slip of the
// units, of the decimal point or of an exponent, and the model is
// refused (exit 2) rather than solved into numbers that mean nothing.
// README "### Limits" tables them in both unit systems with their basis.
var (
	// MinLength bounds reach lengths, the station ranges of segments,
	// basins, bends and exceptions, the pieces a reach's sections leave
	// between section changes, max_spacing and the depths at the outlet
	// and entrances: 1 mm (0.003 ft), below the setting-out tolerance of
	// any earthwork or lining and the resolution of a levelling survey.
	// A real short reach (a 0.5 m transition) is far above it. Source:
	// common practice (no published source).
	MinLength = Bound{SI: 0.001, US: 0.003}
	// MinDimension bounds the dimensions of a cross-section (bottom
	// width, height, diameter, the top width at full height of a triangle
	// and the width of a points section), a gate opening, and a road's
	// crest length and width: 1 cm (0.03 ft), smaller than the aggregate
	// of a concrete lining and than any drain or pipe; Manning's equation,
	// which assumes rough turbulent flow, does not describe a film of that
	// size. A trapezoid narrower at the bottom is a triangle. Source:
	// common practice (no published source).
	MinDimension = Bound{SI: 0.01, US: 0.03}
	// MaxDimension bounds the same dimensions and the depths at the
	// outlet and entrances from above: 100 km (330,000 ft), beyond the
	// widest floodplains (the Amazon's reaches about 50 km, from memory).
	// MaxLength bounds reach lengths and max_spacing: 10,000 km
	// (33,000,000 ft), a quarter of the Earth's circumference, beyond the
	// longest canals (about 1,400 km, from memory). Both are slips of the
	// units or an exponent, not channels. Source: common practice (no
	// published source).
	MaxDimension = Bound{SI: 1e5, US: 3.3e5}
	MaxLength    = Bound{SI: 1e7, US: 3.3e7}
	// MaxElevation bounds the magnitude of every elevation (inverts, the
	// outlet level, road crest and shoulder, point elevations): 20,000 m
	// (66,000 ft), beyond the highest and lowest points of the Earth's
	// surface (about +8,850 m and −10,935 m) under any datum offset in
	// use. Source: common practice (no published source) for the bound;
	// the extremes of the surface are published survey values (from
	// memory).
	MaxElevation = Bound{SI: 20000, US: 66000}
	// MinDischarge and MaxDischarge bound an inflow: 0.1 L/s (0.003
	// ft³/s), a trickle whose depth in a drainage channel is a fraction
	// of a millimetre, and 1,000,000 m³/s (36,000,000 ft³/s), about five
	// times the mean discharge of the Amazon (about 2.1e5 m³/s, from
	// memory). Source: common practice (no published source).
	MinDischarge = Bound{SI: 1e-4, US: 0.003}
	MaxDischarge = Bound{SI: 1e6, US: 3.6e7}
	// MinRoadCoefficient and MaxRoadCoefficient bound the weir
	// coefficient of an overtopped road (Q = Cr·L·Hr^1.5), in m^0.5/s and
	// ft^0.5/s: HDS-5 uses 3.0 ft^0.5/s for deep flow over pavement and
	// its curves fall to about 2.5 at shallow heads over gravel (FHWA
	// HDS-5, 2012, roadway overtopping, from memory); an ideal
	// broad-crested weir passes 3.09 and a sharp-crested one about 3.33.
	// The range is about half the lowest to a little above the highest.
	// Source: common practice (no published source) for the bounds.
	MinRoadCoefficient = Bound{SI: 0.8, US: 1.4}
	MaxRoadCoefficient = Bound{SI: 2.0, US: 3.7}
)

// inletRanges bound the inlet-control coefficients of an explicit inlet,
// the same in both unit systems (HDS-5 writes its equations with a unit
// factor Ku): several times beyond the spread of HDS-5's Table A.1 on
// either side (form 1: K 0.0018 to 0.061, M 0.67 to 2.0, c 0.029 to
// 0.055, Y 0.54 to 0.85; form 2: K about 0.3 to 0.6, M about 0.5 to 0.8;
// FHWA HDS-5, 2012, from memory). Outside them the inlet's headwater is no
// inlet's: with M = 1e9 or K = 1e9 the solver puts the whole flow over the
// road. Source: common practice (no published source) for the bounds.
var inletRanges = map[string][2]float64{
	"K": {1e-4, 2},
	"M": {0.2, 4},
	"c": {0.003, 0.6},
	"Y": {0.05, 3},
}

// Dimensionless bounds, the same in both unit systems.
const (
	// MaxSideSlope is the flattest side slope accepted (horizontal per
	// unit rise): 1000, a cross slope of 0.1 %, ten times flatter than the
	// flattest surface graded to drain (a gutter or pavement cross slope
	// of about 1 %). Source: common practice (no published source).
	MaxSideSlope = 1000.0
	// MinContraction is the smallest contraction coefficient of a gate:
	// 0.5, Borda's re-entrant mouthpiece, the strongest contraction the
	// momentum balance allows a jet (a vertical sluice gate gives about
	// 0.61). Source: Borda's mouthpiece, e.g. Rouse, Elementary Mechanics
	// of Fluids (1946) (from memory).
	MinContraction = 0.5
	// RoughnessFloor is the smallest Manning's n accepted: 0.005, well
	// below the smoothest tabulated surfaces (about 0.008 to 0.010 for
	// glass, lucite and planed timber; Chow 1959, Table 5-6, from
	// memory); a smaller n is a slip (a value of a different formula, or
	// an exponent). Between it and minRoughness a warning is given.
	// Source: common practice (no published source) for the floor.
	RoughnessFloor = 0.005
)

// below reports a value under the least of its range at rng: what is
// "length of reach "main"", the bound's basis and the fix are sentences.
// A value as written prints as %g; one the check worked out (a width, a
// station range) to three significant figures.
func (d *decoder) below(rng hcl.Range, summary string, what any, v, least float64, unit, why, fix string) {
	d.Errorf(rng, summary, "%s is %.3g%s; the least accepted is %g%s: %s. %s", what, v, unit, least, unit, why, fix)
}

// above reports a value beyond the greatest of its range at rng.
func (d *decoder) above(rng hcl.Range, summary string, what any, v, most float64, unit, why, fix string) {
	d.Errorf(rng, summary, "%s is %.6g%s; the most accepted is %g%s: %s. %s", what, v, unit, most, unit, why, fix)
}

// Reasons and fixes of the refusals, shared by the attributes of one
// kind.
const (
	whyLength       = "a length or depth under 1 mm is below the tolerance of construction and the resolution of a survey"
	whyDimension    = "a cross-section or opening under 1 cm is smaller than any drain, and Manning's equation does not describe flow that thin"
	whyBigDimension = "the widest floodplains are some tens of kilometres across (the Amazon's up to about 50 km), and no cross-section, opening or depth is 100 km"
	whyLongLength   = "a reach of 10,000 km is a quarter of the way round the Earth, and the longest canals are about 1,400 km"
	whyRoad         = "a road crest under 1 cm long or wide is no road, and the weir formula does not apply to it"
	fixUnits        = "Check the units and the decimal point"
)

// length decodes a positive length of at least MinLength (reach length,
// max_spacing).
func (a attrSet) length(name, fix string) (float64, bool) {
	v, ok := a.atLeast(name, MinLength, "Length too small", whyLength, fix)
	return v, ok && a.atMost(name, v, MaxLength, "Length too large", whyLongLength)
}

// dimension decodes a positive dimension from MinDimension to
// MaxDimension.
func (a attrSet) dimension(name, fix string) (float64, bool) {
	v, ok := a.atLeast(name, MinDimension, "Dimension too small", whyDimension, fix)
	return v, ok && a.atMost(name, v, MaxDimension, "Dimension too large", whyBigDimension)
}

// atMost checks a decoded value against the greatest of its range.
func (a attrSet) atMost(name string, v float64, most Bound, summary, why string) bool {
	if max := most.In(a.d.m.Units); v > max {
		a.d.above(a.m[name].Expr.Range(), summary, label{attr: name, owner: a.what}, v, max, a.d.unitSuffix(), why, fixUnits)
		return false
	}
	return true
}

// atLeast decodes a positive number not under least (in the model's
// units).
func (a attrSet) atLeast(name string, least Bound, summary, why, fix string) (float64, bool) {
	unit := a.d.unitSuffix()
	v, ok := a.positive(name, unit)
	if !ok {
		return 0, false
	}
	if min := least.In(a.d.m.Units); v < min {
		a.d.below(a.m[name].Expr.Range(), summary, label{attr: name, owner: a.what}, v, min, unit, why, fix)
		return 0, false
	}
	return v, true
}

// elevation checks an elevation against MaxElevation at rng.
func (d *decoder) elevation(rng hcl.Range, what any, z float64) bool {
	most := MaxElevation.In(d.m.Units)
	if z > most || z < -most {
		d.Errorf(rng, "Elevation out of range",
			"%s is %g%s; elevations lie within ±%g%s: the Earth's surface spans about −10,935 m to +8,850 m, so a level beyond that is no place under any datum. %s, or refer the levels to a local datum.",
			what, z, d.unitSuffix(), most, d.unitSuffix(), fixUnits)
		return false
	}
	return true
}

// valueRange is the physical range of the values of an event's object
// entries (an inflow, an entrance depth) with the words of its refusals.
type valueRange struct {
	least, most Bound // zero: no bound
	unit        func(Units) string
	small, big  string // summaries
	why, fix    string
	bigWhy      string // why for a value above the range, when not why
}

var (
	dischargeRange = valueRange{least: MinDischarge, most: MaxDischarge,
		unit:  func(u Units) string { return " " + u.Length() + "³/s" },
		small: "Discharge too small", big: "Discharge too large",
		why: "a discharge under 0.1 L/s is a trickle a fraction of a millimetre deep, and one over 1,000,000 m³/s is some five times the Amazon's",
		fix: fixUnits + " (m³/s or ft³/s, not L/s or gal/min)"}
	// returnPeriodRange bounds an event's return period: 0.1 to
	// 1,000,000 years, from below the half-year storm of water-quality
	// design to beyond the 10,000-year and probable-maximum events of dam
	// safety, which some manuals label 1,000,000 years. Source: common
	// practice (no published source).
	returnPeriodRange = valueRange{least: Bound{SI: 0.1, US: 0.1}, most: Bound{SI: 1e6, US: 1e6},
		unit:  func(Units) string { return " years" },
		small: "Return period out of range", big: "Return period out of range",
		why: "design events run from the half-year storm of water-quality design to the 10,000-year and probable-maximum events of dam safety",
		fix: "Write the return period in years (e.g. 100), not an annual probability or a percentage"}
	depthRange = valueRange{least: MinLength, most: MaxDimension, big: "Depth too large",
		unit:  func(u Units) string { return " " + u.Length() },
		small: "Depth too small", why: whyLength, bigWhy: whyBigDimension, fix: fixUnits}
)

// inRange checks v against r at rng.
func (d *decoder) inRange(rng hcl.Range, what any, v float64, r valueRange) bool {
	unit := r.unit(d.m.Units)
	if least := r.least.In(d.m.Units); least > 0 && v < least {
		d.below(rng, r.small, what, v, least, unit, r.why, r.fix)
		return false
	}
	if most := r.most.In(d.m.Units); most > 0 && v > most {
		why := r.why
		if r.bigWhy != "" {
			why = r.bigWhy
		}
		d.above(rng, r.big, what, v, most, unit, why, r.fix)
		return false
	}
	return true
}

// roadRanges are the physical ranges of a road's crest length and width
// and of its weir coefficient.
var roadRanges = map[string]valueRange{
	"length": {least: MinDimension, most: MaxDimension, unit: lengthUnit, small: "Dimension too small", big: "Dimension too large", why: whyRoad, bigWhy: whyBigDimension, fix: fixUnits},
	"width":  {least: MinDimension, most: MaxDimension, unit: lengthUnit, small: "Dimension too small", big: "Dimension too large", why: whyRoad, bigWhy: whyBigDimension, fix: fixUnits},
	"coefficient": {least: MinRoadCoefficient, most: MaxRoadCoefficient,
		unit: func(u Units) string {
			if u == US {
				return " ft^0.5/s"
			}
			return " m^0.5/s"
		},
		small: "Weir coefficient out of range", big: "Weir coefficient out of range",
		why: "published coefficients of roads overtopped as broad-crested weirs run from about 2.5 to 3.1 ft^0.5/s (1.4 to 1.7 m^0.5/s), and no weir passes much more than a sharp-crested one (3.33 ft^0.5/s)",
		fix: "Write the coefficient of Q = Cr·L·H^1.5 in the model's units, or leave it out for the published default"},
}

func lengthUnit(u Units) string { return " " + u.Length() }

// shorter reports whether the stretch from a to b (a < b) is shorter than
// least by more than the rounding of the subtraction: stations written
// 9.999 and 10 are 1 mm apart, though b − a is 0.00099999999999945 in
// binary.
func shorter(a, b, least float64) bool {
	slack := 4 * 0x1p-52 * max(math.Abs(a), math.Abs(b))
	return b-a < least-slack
}
