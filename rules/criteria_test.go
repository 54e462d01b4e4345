package rules

import (
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestGoldenCriteria: the geometric and safety rules on the same model in
// SI and in US units, each checked with the policy in SI. The geometric
// values are the model's own numbers; the trunk's depth and velocity come
// from the test's own Manning bisection.
func TestGoldenCriteria(t *testing.T) {
	for _, tc := range []struct {
		model string
		u     uniformUnits
	}{{"criteria.chan.hcl", siUnits}, {"criteria-us.chan.hcl", usUnits}} {
		t.Run(tc.model, func(t *testing.T) {
			m, _, fs := golden(t, tc.model, "criteria.policy.hcl")
			assertFinite(t, fs)
			got := matchWants(t, m.Source, "", fs)
			L := 1 / tc.u.length // metres → model length
			for w, f := range got {
				var value, limit float64
				switch w.Rule {
				case "side_slope":
					value, limit = 2, 3
				case "bottom_width":
					value, limit = 0.5*L, 0.6*L
				case "bed_slope":
					value, limit = 0.003, 0.005
					if f.Reach == "trunk" {
						value, limit = 0.001, 0.002
					}
				case "public_safety":
					// Source: continuity (common practice, no published
					// source): in a rectangle y·V = y·Q/(b·y) = Q/b.
					value, limit = 4.0*L*L*L/(3*L), 1.0*L*L
				case "bend_radius":
					// Source: common practice (no published source): a
					// rectangle's top width is its bottom width.
					value, limit = 8*L, 3*3*L
				}
				assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, value, 1e-6, 1e-6), "%s %s value %g want %g", w.Rule, f.Reach, f.Value, value)
				assert.True(t, scalar.EqualWithinAbsOrRel(f.Limit, limit, 1e-9, 1e-9), "%s %s limit %g want %g", w.Rule, f.Reach, f.Limit, limit)
			}
		})
	}
}

// TestPublicSafetyDepth: the depth limit is checked first, against the
// trunk's normal depth from the test's own Manning bisection, on the same
// model in SI and in US units with the limit written in metres.
func TestPublicSafetyDepth(t *testing.T) {
	for _, tc := range []struct {
		model string
		u     uniformUnits
		msg   string
	}{
		{"criteria.chan.hcl", siUnits, "flow depth 0.92 m exceeds the greatest 0.80 m"},
		{"criteria-us.chan.hcl", usUnits, "flow depth 3.02 ft exceeds the greatest 2.62 ft"},
	} {
		t.Run(tc.model, func(t *testing.T) {
			m, diags := model.Load(filepath.Join(goldenDir, tc.model))
			require.False(t, diags.HasErrors())
			res, err := solver.Solve(m, solver.Options{})
			require.NoError(t, err)
			p, pd := Language().NewLoader("").LoadSource("p.policy.hcl", []byte(`policy "p" {
  units = "si"
  public_safety {
    reach_classes = ["constructed"]
    depth         = 0.8
  }
}`))
			require.False(t, pd.HasErrors(), "%v", pd)
			var got []Finding
			for _, f := range Check(m, res, p) {
				if f.Rule == "public_safety" {
					got = append(got, f)
				}
			}
			require.Len(t, got, 1)
			L := 1 / tc.u.length // metres → model length
			// Source: Manning's equation (Chow 1959, ch. 5); 1 ft = 0.3048 m.
			y := manningNormalDepth(tc.u, 4.0*L*L*L, 3*L, 0.015, 0.001)
			assert.Equal(t, "q-design", got[0].Event)
			assert.True(t, scalar.EqualWithinAbsOrRel(got[0].Value, y, 1e-6, 1e-6), "depth %g want %g", got[0].Value, y)
			assert.True(t, scalar.EqualWithinAbsOrRel(got[0].Limit, 0.8*L, 1e-9, 1e-9), "limit %g", got[0].Limit)
			assert.Contains(t, got[0].Message, tc.msg)
		})
	}
}
