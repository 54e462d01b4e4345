package policies_test

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
	"pgregory.net/rapid"
)

func TestConversionFactors(t *testing.T) {
	// Source: international yard and pound agreement (1959): 1 ft = 0.3048 m exactly.
	assert.Equal(t, 0.3048, policies.MetresPerFoot)
	// Source: NIST SP 811 (2008), Appendix B.8: 1 lbf/ft² = 4.788026 E+01 Pa
	// (47.880259 Pa to eight digits from 1 lbf = 4.4482216152605 N).
	assert.InDelta(t, 47.880259, policies.PascalsPerPSF, 5e-7)
}

func TestInConvertsEveryQuantity(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units = "us"
  freeboard {
    minimum  = 1.0
    fraction = 0.2
  }
  max_velocity { limit = { concrete = 20.0, rock = null, default = 5.0 } }
  min_velocity {
    limit  = 2.0
    events = ["q10"]
  }
  froude_band { avoid = [[0.86, 1.13]] }
  jump_type { avoid = [[2.5, 4.5]] }
  superelevation {
    subcritical_coefficient = 0.6
    minimum                 = 0.5
  }
  shear_stress { limit = { grass = 1.0, default = 0.075 } }
}`)
	require.Empty(t, diags)
	si := p.In(model.SI)
	require.Equal(t, model.SI, si.Units)
	const tol = 1e-12 // one multiplication by an exact factor: rounding only
	eq := func(want, got float64, msg string) {
		t.Helper()
		assert.True(t, scalar.EqualWithinAbsOrRel(got, want, tol, tol), "%s: want %v got %v", msg, want, got)
	}
	// Source: 1 ft = 0.3048 m (exact definition) for lengths and ft/s → m/s.
	eq(0.3048, si.Rules["freeboard"].Number("minimum"), "freeboard minimum")
	eq(0.1524, si.Rules["superelevation"].Number("minimum"), "superelevation minimum")
	v, _ := si.Rules["max_velocity"].Table("limit").For("concrete")
	eq(6.096, v, "concrete velocity")
	v, _ = si.Rules["max_velocity"].Table("limit").For("clay")
	eq(1.524, v, "default velocity")
	_, ok := si.Rules["max_velocity"].Table("limit").For("rock")
	assert.False(t, ok, "no limit stays no limit")
	v, _ = si.Rules["min_velocity"].Table("limit").For("")
	eq(0.6096, v, "min velocity")
	// Source: NIST SP 811 (2008) Appendix B: 1 lbf/ft² = 47.880259 Pa.
	v, _ = si.Rules["shear_stress"].Table("limit").For("grass")
	assert.InDelta(t, 47.880259, v, 5e-7)
	v, _ = si.Rules["shear_stress"].Table("limit").For("earth")
	assert.InDelta(t, 0.075*47.880259, v, 5e-7)
	// Dimensionless settings do not change.
	assert.Equal(t, 0.2, si.Rules["freeboard"].Number("fraction"))
	assert.Equal(t, []policies.Band{{0.86, 1.13}}, si.Rules["froude_band"].Bands("avoid"))
	assert.Equal(t, []policies.Band{{2.5, 4.5}}, si.Rules["jump_type"].Bands("avoid"))
	assert.Equal(t, 0.6, si.Rules["superelevation"].Number("subcritical_coefficient"))
	assert.Equal(t, 1.0, si.Rules["superelevation"].Number("supercritical_coefficient"))

	// The original is untouched: In returns a deep copy.
	assert.Equal(t, model.US, p.Units)
	assert.Equal(t, 1.0, p.Rules["freeboard"].Number("minimum"))
	v, _ = p.Rules["max_velocity"].Table("limit").For("concrete")
	assert.Equal(t, 20.0, v)
	si.Rules["froude_band"].Bands("avoid")[0].Low = 0
	si.Rules["freeboard"].Attrs["minimum"] = si.DefRange
	assert.Equal(t, 0.86, p.Rules["froude_band"].Bands("avoid")[0].Low)
	assert.NotEqual(t, si.DefRange, p.Rules["freeboard"].Attrs["minimum"])

	same := p.In(model.US)
	assert.NotSame(t, p, same)
	assert.Equal(t, p.Rules["freeboard"].Number("minimum"), same.Rules["freeboard"].Number("minimum"))
}

// US → SI → US gives back every number.
func TestInRoundTrip(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		length := rapid.Float64Range(0, 1e4).Draw(t, "length")
		velocity := rapid.Float64Range(1e-3, 1e3).Draw(t, "velocity")
		stress := rapid.Float64Range(1e-3, 1e4).Draw(t, "stress")
		p := &policies.Policy{Units: model.US, Rules: map[string]*policies.RuleConfig{
			"freeboard":    {Rule: "freeboard", Spec: rules.Language().Spec("freeboard"), Values: map[string]policies.Value{"minimum": {Number: length}}},
			"max_velocity": {Rule: "max_velocity", Spec: rules.Language().Spec("max_velocity"), Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": velocity}, Default: velocity, HasDefault: true}}}},
			"shear_stress": {Rule: "shear_stress", Spec: rules.Language().Spec("shear_stress"), Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Default: stress, HasDefault: true}}}},
		}}
		back := p.In(model.SI).In(model.US)
		const rel = 1e-14 // two multiplications: a few ulps
		if !scalar.EqualWithinAbsOrRel(back.Rules["freeboard"].Number("minimum"), length, 1e-300, rel) ||
			!scalar.EqualWithinAbsOrRel(back.Rules["max_velocity"].Table("limit").Values["grass"], velocity, 0, rel) ||
			!scalar.EqualWithinAbsOrRel(back.Rules["max_velocity"].Table("limit").Default, velocity, 0, rel) ||
			!scalar.EqualWithinAbsOrRel(back.Rules["shear_stress"].Table("limit").Default, stress, 0, rel) {
			t.Fatalf("round trip changed a number: %+v", back.Rules)
		}
	})
}

func BenchmarkLoadPackStrict(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, diags := rules.Language().Pack("strict"); diags.HasErrors() {
			b.Fatal(diags)
		}
	}
}

func BenchmarkResolveCachedParse(b *testing.B) {
	l := rules.Language().NewLoader("")
	b.ReportAllocs()
	for b.Loop() {
		if _, diags := l.Resolve("strict"); diags.HasErrors() {
			b.Fatal(diags)
		}
	}
}

func BenchmarkIn(b *testing.B) {
	p, _ := rules.Language().Pack("baseline")
	b.ReportAllocs()
	for b.Loop() {
		_ = p.In(model.US)
	}
}

func BenchmarkFormat(b *testing.B) {
	p, _ := rules.Language().Pack("baseline")
	b.ReportAllocs()
	for b.Loop() {
		_ = policies.Format(p)
	}
}
