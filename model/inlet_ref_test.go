package model

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestInletTableAgainstReferences checks every row of the named-inlet
// table that the reference list gives, coefficient by coefficient.
//
// Source: FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. (2012),
// Table A.1 (inlet-control coefficients, form 1) and Table C.2 (entrance
// loss coefficients), as recalled in references.md (from memory).
func TestInletTableAgainstReferences(t *testing.T) {
	const none = -1.0 // references.md gives no entrance loss for the row
	cases := []struct {
		name       string
		k, m, c, y float64
		ke         float64
	}{
		{"square-edge-headwall", 0.0098, 2.0, 0.0398, 0.67, 0.5},
		{"groove-end-headwall", 0.0018, 2.0, 0.0292, 0.74, 0.2},
		{"corrugated-headwall", 0.0078, 2.0, 0.0379, 0.69, none},
		{"corrugated-projecting", none, none, none, none, 0.9},
		{"box-wingwalls-30-75", 0.026, 1.0, 0.0347, 0.81, 0.4},
		{"box-wingwalls-90-15", 0.061, 0.75, 0.0400, 0.80, 0.5},
		{"box-wingwalls-0", 0.061, 0.75, 0.0423, 0.82, none},
	}
	for _, c := range cases {
		it, ok := LookupInlet(c.name)
		require.True(t, ok, c.name)
		co := it.Coefficients
		assert.Equal(t, 1, co.Form, c.name)
		for _, v := range []struct {
			what      string
			want, got float64
		}{{"K", c.k, co.K}, {"M", c.m, co.M}, {"c", c.c, co.C}, {"Y", c.y, co.Y}, {"Ke", c.ke, co.EntranceLoss}} {
			if v.want != none {
				assert.Equalf(t, v.want, v.got, "%s: %s", c.name, v.what)
			}
		}
		// Source: references.md (HDS-5, from memory): Ks = −0.5, 0.7 for
		// mitered inlets.
		assert.Equal(t, SlopeTermDefault, co.SlopeTerm, c.name)
	}
	assert.Equal(t, -0.5, SlopeTermDefault)
	assert.Equal(t, 0.7, SlopeTermMitered)
	mitered, ok := LookupInlet("corrugated-mitered")
	require.True(t, ok)
	assert.Equal(t, SlopeTermMitered, mitered.SlopeTerm)
}
