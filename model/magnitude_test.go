package model

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// magnitudeModel is a valid model with one slot, VALUE, for the number
// under test; UNITS is "si" or "us". The slot's line is the line of the
// attribute a refusal must point at.
const magnitudeModel = `units = "UNITS"
section "s" {
  shape        = "rectangle"
  bottom_width = BW
  height       = H
  roughness    = N
}
section "tri" {
  shape      = "triangle"
  side_slope = TZ
  height     = 1
  roughness  = 0.015
}
section "tz" {
  shape        = "trapezoid"
  bottom_width = 2
  side_slope   = SZ
  height       = 1
  roughness    = 0.015
}
section "pipe" {
  shape     = "circle"
  diameter  = D
  roughness = 0.013
}
section "s2" {
  shape        = "rectangle"
  bottom_width = 2
  height       = 1.5
  roughness    = 0.015
}
section "barrel" {
  shape        = "box"
  bottom_width = 1.8
  height       = 1.2
  roughness    = 0.013
}
reach "r" {
  from        = "a"
  to          = "b"
  length      = L
  section     = "s"
  slope       = 0.001
  max_spacing = SP
}
reach "up" {
  from    = "x"
  to      = "a"
  length  = 400
  section = "s2"
  slope   = 0.001
}
reach "culv" {
  from    = "b"
  to      = "c"
  length  = 30
  section = "barrel"
  invert  = [-19999.44, -19999.5]
}
gate "g" {
  reach       = "r"
  opening     = GO
  contraction = CC
}
basin "pad" {
  reach        = "up"
  from_station = 0
  to_station   = BS
}
bend "curve" {
  reach        = "up"
  from_station = 0
  to_station   = 0.5
  radius       = RAD
}
culvert "road" {
  reach = "culv"
  inlet = { form = 1, K = IK, M = IM, c = 0.0347, Y = 0.81, entrance_loss = 0.4 }
  road  = { crest = -19990, length = RL, width = 10, coefficient = RC }
}
event "e" {
  inflow   = { up = Q }
  outlet   = { depth = Y }
  entrance = { up = EN }
}
event "f" {
  inflow        = { up = 1 }
  outlet        = { elevation = Z }
  return_period = RP
}
`

// magnitudeSlot is one number of magnitudeModel with its range in each
// unit system (lo ≤ v ≤ hi; ±Inf for no bound) and the value it takes
// when another slot is under test.
type magnitudeSlot struct {
	key          string
	lo, hi       Bound
	fill         float64 // a value inside the range in both systems
	allowNegZero bool    // values ≤ 0 are in range down to lo (side slopes, elevations)
	loOpen       bool    // lo itself is out of range
	station      bool    // a station range from 0: lo allows the rounding of a difference (shorter)
}

var noUpper = Bound{SI: math.Inf(1), US: math.Inf(1)}

// Source: the bounds of model/magnitude.go and section.go (common
// practice, no published source); the test holds the decoder to them.
var magnitudeSlots = []magnitudeSlot{
	{key: "L", lo: MinLength, hi: MaxLength, fill: 400},
	{key: "SP", lo: MinLength, hi: MaxLength, fill: 10},
	{key: "BW", lo: MinDimension, hi: MaxDimension, fill: 2},
	{key: "H", lo: MinDimension, hi: MaxDimension, fill: 1.5},
	{key: "D", lo: MinDimension, hi: MaxDimension, fill: 0.6},
	// A triangle 1 high is MinDimension wide at the top at z = least/2.
	{key: "TZ", lo: Bound{SI: MinDimension.SI / 2, US: MinDimension.US / 2}, hi: Bound{SI: MaxSideSlope, US: MaxSideSlope}, fill: 3},
	{key: "SZ", lo: Bound{}, hi: Bound{SI: MaxSideSlope, US: MaxSideSlope}, fill: 1.5, allowNegZero: true},
	{key: "N", lo: Bound{SI: RoughnessFloor, US: RoughnessFloor}, hi: Bound{SI: maxRoughness, US: maxRoughness}, fill: 0.015},
	{key: "GO", lo: MinDimension, hi: MaxDimension, fill: 0.3},
	{key: "CC", lo: Bound{SI: MinContraction, US: MinContraction}, hi: Bound{SI: 1, US: 1}, fill: 0.61},
	{key: "BS", lo: MinLength, hi: Bound{SI: 400, US: 400}, fill: 20, station: true},
	{key: "RAD", lo: MinDimension, hi: noUpper, fill: 30},
	{key: "RL", lo: MinDimension, hi: MaxDimension, fill: 40},
	{key: "RC", lo: MinRoadCoefficient, hi: MaxRoadCoefficient, fill: 1.6},
	{key: "IK", lo: Bound{SI: inletRanges["K"][0], US: inletRanges["K"][0]}, hi: Bound{SI: inletRanges["K"][1], US: inletRanges["K"][1]}, fill: 0.026},
	{key: "IM", lo: Bound{SI: inletRanges["M"][0], US: inletRanges["M"][0]}, hi: Bound{SI: inletRanges["M"][1], US: inletRanges["M"][1]}, fill: 1},
	{key: "RP", lo: returnPeriodRange.least, hi: returnPeriodRange.most, fill: 100},
	{key: "Q", lo: MinDischarge, hi: MaxDischarge, fill: 3},
	{key: "Y", lo: MinLength, hi: MaxDimension, fill: 0.8},
	{key: "EN", lo: MinLength, hi: MaxDimension, fill: 0.4},
	// The outlet level stands above the culvert's outlet invert, -19999.5
	// (the lowest elevations accepted are tested in TestRealDesignsAccepted).
	{key: "Z", lo: Bound{SI: -19999.5, US: -19999.5}, hi: MaxElevation, fill: 100, allowNegZero: true, loOpen: true},
}

// magnitudeText fills magnitudeModel: slot under test gets text, the
// others their fill values.
func magnitudeText(units string, under int, text string) string {
	src := strings.Replace(magnitudeModel, "UNITS", units, 1)
	for i, s := range magnitudeSlots {
		v := strconv.FormatFloat(s.fill, 'g', -1, 64)
		if i == under {
			v = text
		}
		src = replaceWord(src, s.key, v)
	}
	return src
}

// replaceWord replaces the placeholder key where it stands as a value
// (after "= ").
func replaceWord(src, key, v string) string {
	src = strings.Replace(src, "= "+key+"\n", "= "+v+"\n", 1)
	src = strings.Replace(src, "= "+key+",", "= "+v+",", 1)
	return strings.Replace(src, "= "+key+" }", "= "+v+" }", 1)
}

// slotLine is the line of the slot's attribute in the filled text.
func slotLine(t require.TestingT, units string, under int) int {
	marked := magnitudeText(units, under, "7.25e-3")
	i := strings.Index(marked, "= 7.25e-3")
	require.GreaterOrEqual(t, i, 0)
	return strings.Count(marked[:i], "\n") + 1
}

func TestMagnitudeModelValid(t *testing.T) {
	for _, u := range []string{"si", "us"} {
		m, diags := Parse("mag.chan.hcl", []byte(magnitudeText(u, -1, "")))
		require.False(t, diags.HasErrors(), "%s: %s", u, diags.Error())
		require.NotNil(t, m)
		for i := range magnitudeSlots {
			slotLine(t, u, i)
		}
	}
}

// TestMagnitudesRefusedAtTheirAttribute draws a number for one slot,
// over the whole range a float64 model accepts (tiny, huge and next to
// the bound, in both unit systems): the model is valid exactly when the
// number lies in the slot's range, and a refusal is an error at the
// attribute's line.
func TestMagnitudesRefusedAtTheirAttribute(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		units := rapid.SampledFrom([]string{"si", "us"}).Draw(t, "units")
		i := rapid.IntRange(0, len(magnitudeSlots)-1).Draw(t, "slot")
		s := magnitudeSlots[i]
		u := Units(units)
		lo, hi := s.lo.In(u), s.hi.In(u)
		var v float64
		switch rapid.IntRange(0, 3).Draw(t, "kind") {
		case 0: // anywhere from 1e-21 to 1e9
			v = math.Pow(10, rapid.Float64Range(-21, 9).Draw(t, "exp"))
		case 1: // next to the lower bound
			v = lo * (1 + rapid.Float64Range(-1e-9, 1e-9).Draw(t, "rel"))
		case 2: // next to the upper bound
			if math.IsInf(hi, 1) {
				v = 1e9
			} else {
				v = hi * (1 + rapid.Float64Range(-1e-9, 1e-9).Draw(t, "rel"))
			}
		case 3: // exactly a bound
			v = rapid.SampledFrom([]float64{lo, math.Min(hi, 1e9)}).Draw(t, "bound")
		}
		if s.allowNegZero && rapid.Bool().Draw(t, "negative") {
			v = -v
		}
		if v == 0 && !s.allowNegZero {
			v = 1e-300
		}
		text := strconv.FormatFloat(v, 'g', -1, 64)
		src := magnitudeText(units, i, text)
		m, diags := Parse("mag.chan.hcl", []byte(src))
		inRange := (v > lo || v == lo && !s.loOpen) && v <= hi
		if s.station {
			inRange = !shorter(0, v, lo) && v <= hi
		}
		if inRange {
			if diags.HasErrors() {
				t.Fatalf("%s = %s (%s) refused, but it lies in [%g, %g]: %s", s.key, text, units, lo, hi, diags.Error())
			}
			require.NotNil(t, m)
			return
		}
		if !diags.HasErrors() {
			t.Fatalf("%s = %s (%s) accepted, outside [%g, %g]", s.key, text, units, lo, hi)
		}
		line := slotLine(t, units, i)
		for _, d := range diags {
			if d.Severity == hcl.DiagError {
				require.NotNil(t, d.Subject)
				assert.Equal(t, line, d.Subject.Start.Line, "%s = %s: %s", s.key, text, d.Summary)
				assert.NotContains(t, d.Detail, "NaN")
				assert.NotContains(t, d.Detail, "Inf")
			}
		}
	})
}

// TestRealDesignsAccepted: the magnitudes of real small and large
// channels are not refused (and carry no warning about their size).
// Source: common practice (no published source): a 0.5 m transition
// reach, a lowland canal at a slope of 1e-5, a roadside V-ditch 0.3 m deep
// carrying 5 L/s, a 100 mm pipe, a 2 % gutter (side slope 50) and a canal
// 60 m wide carrying 3,000 m³/s at an elevation of 4,000 m.
func TestRealDesignsAccepted(t *testing.T) {
	src := `units = "si"
section "v-ditch" {
  shape      = "triangle"
  side_slope = 3
  height     = 0.3
  roughness  = 0.03
}
section "gutter" {
  shape      = "triangle"
  side_slope = 50
  height     = 0.15
  roughness  = 0.016
}
section "underdrain" {
  shape     = "circle"
  diameter  = 0.1
  roughness = 0.011
}
section "canal" {
  shape        = "trapezoid"
  bottom_width = 60
  side_slope   = 2
  height       = 8
  roughness    = 0.025
}
reach "ditch" {
  from    = "field"
  to      = "kerb"
  length  = 120
  section = "v-ditch"
  slope   = 0.004
}
reach "gutter" {
  from    = "kerb"
  to      = "inlet"
  length  = 0.5
  section = "gutter"
  slope   = 0.01
}
reach "drain" {
  from    = "inlet"
  to      = "outfall"
  length  = 30
  section = "underdrain"
  invert  = [4000.2, 4000.0]
}
reach "canal" {
  from    = "outfall"
  to      = "tail"
  length  = 20000
  section = "canal"
  slope   = 0.00001
}
event "low" {
  inflow = { "ditch" = 0.005, "canal" = 3000 }
  outlet = { condition = "normal" }
}
`
	m, diags := Parse("real.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), diags.Error())
	require.NotNil(t, m)
	assert.Empty(t, diags, "no warning on real magnitudes")

	// Stations written 1 mm apart are 1 mm apart, though their binary
	// difference is a hair less; a segment 1 mm from the reach end
	// leaves a piece of 1 mm.
	short := strings.Replace(src, `  section = "canal"
  slope   = 0.00001
}`, `  section = "canal"
  slope   = 0.00001
  segment {
    from_station = 9.999
    to_station   = 10
    section      = "canal"
  }
  segment {
    from_station = 10
    to_station   = 19999.999
    section      = "canal"
  }
}
basin "pad" {
  reach        = "canal"
  from_station = 19999.998
  to_station   = 19999.999
}`, 1)
	require.NotEqual(t, src, short)
	_, diags = Parse("real.chan.hcl", []byte(short))
	assert.False(t, diags.HasErrors(), diags.Error())

	// The bounds themselves are accepted, in both unit systems.
	for _, u := range []string{"si", "us"} {
		for i, s := range magnitudeSlots {
			lo := s.lo.In(Units(u))
			if s.allowNegZero && lo == 0 || s.loOpen {
				lo = s.hi.In(Units(u))
			}
			text := strconv.FormatFloat(lo, 'g', -1, 64)
			_, diags := Parse("mag.chan.hcl", []byte(magnitudeText(u, i, text)))
			assert.False(t, diags.HasErrors(), "%s = %s (%s): %s", s.key, text, u, diags.Error())
		}
		// The lowest and highest elevations: inverts at -MaxElevation, an
		// outlet level and a road at +MaxElevation.
		z := MaxElevation.In(Units(u))
		src := strings.Replace(magnitudeText(u, -1, ""), "invert  = [-19999.44, -19999.5]",
			"invert  = ["+strconv.FormatFloat(-z+0.06, 'f', -1, 64)+", "+strconv.FormatFloat(-z, 'f', -1, 64)+"]", 1)
		src = strings.Replace(src, "elevation = 100", "elevation = "+strconv.FormatFloat(z, 'f', -1, 64), 1)
		_, diags := Parse("mag.chan.hcl", []byte(src))
		assert.False(t, diags.HasErrors(), "%s: %s", u, diags.Error())
	}
}

// TestUSBoundsNoStricter: each bound in US units admits at least what
// the SI one does, so that converting a valid model to US units never
// makes it invalid. Source: the international foot is exactly 0.3048 m
// (NIST SP 811, 2008, appendix B); a discharge scales with the cube of
// length, a weir coefficient with its square root.
func TestUSBoundsNoStricter(t *testing.T) {
	const foot = 0.3048
	for _, c := range []struct {
		name  string
		b     Bound
		power float64 // of length
		lower bool    // a least value (else a most)
	}{
		{"MinLength", MinLength, 1, true},
		{"MaxLength", MaxLength, 1, false},
		{"MinDimension", MinDimension, 1, true},
		{"MaxDimension", MaxDimension, 1, false},
		{"MaxElevation", MaxElevation, 1, false},
		{"MinDischarge", MinDischarge, 3, true},
		{"MaxDischarge", MaxDischarge, 3, false},
		{"MinRoadCoefficient", MinRoadCoefficient, 0.5, true},
		{"MaxRoadCoefficient", MaxRoadCoefficient, 0.5, false},
	} {
		us := c.b.US * math.Pow(foot, c.power) // the US bound in SI
		if c.lower {
			assert.LessOrEqual(t, us, c.b.SI, "%s: %g in US is %g in SI, stricter than %g", c.name, c.b.US, us, c.b.SI)
		} else {
			assert.GreaterOrEqual(t, us, c.b.SI, "%s: %g in US is %g in SI, stricter than %g", c.name, c.b.US, us, c.b.SI)
		}
		assert.Less(t, math.Abs(us/c.b.SI-1), 0.2, "%s: the two bounds are the same limit, rounded", c.name)
	}
}
