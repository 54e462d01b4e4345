package model

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

const culvertModel = `units = "si"
section "pipe" {
  shape     = "circle"
  diameter  = 1.2
  roughness = 0.013
}
section "box" {
  shape        = "box"
  bottom_width = 2.0
  height       = 1.5
  roughness    = 0.013
}
reach "pipe-run" {
  from    = "a"
  to      = "b"
  length  = 40
  section = "pipe"
  invert  = [5.0, 4.8]
}
reach "box-run" {
  from    = "b"
  to      = "c"
  length  = 30
  section = "box"
  slope   = 0.01
}
culvert "named" {
  reach = "pipe-run"
  inlet = "square-edge-headwall"
  road  = { crest = 7.4, length = 40, width = 10 }
}
culvert "explicit" {
  reach   = "box-run"
  barrels = 3
  inlet   = { form = 2, K = 0.5, M = 0.667, c = 0.0347, Y = 0.81, entrance_loss = 0.4, Ks = 0.7 }
}
event "q" {
  inflow = { "pipe-run" = 2.0 }
  outlet = { depth = 1.0 }
}
`

func TestCulvertBlock(t *testing.T) {
	m := parseOK(t, culvertModel)
	require.Len(t, m.Culverts, 2)
	named, explicit := m.Culverts[0], m.Culverts[1]
	assert.Same(t, named, m.Reaches[0].Culvert)
	assert.Same(t, explicit, m.Reaches[1].Culvert)
	assert.Equal(t, 1, named.Barrels)
	assert.Equal(t, "square-edge-headwall", named.Inlet.Type)
	// Source: FHWA HDS-5 (2012), Table A.1 and Table C.2 (from memory).
	assert.Equal(t, Coefficients{Form: 1, K: 0.0098, M: 2.0, C: 0.0398, Y: 0.67, SlopeTerm: -0.5, EntranceLoss: 0.5}, named.Inlet.Coefficients)
	require.NotNil(t, named.Road)
	assert.Equal(t, 7.4, named.Road.Crest)
	assert.Equal(t, 40.0, named.Road.Length)
	assert.Equal(t, 10.0, named.Road.Width)
	assert.Equal(t, 3, explicit.Barrels)
	assert.Empty(t, explicit.Inlet.Type)
	assert.Equal(t, Coefficients{Form: 2, K: 0.5, M: 0.667, C: 0.0347, Y: 0.81, SlopeTerm: 0.7, EntranceLoss: 0.4}, explicit.Inlet.Coefficients)
	assert.Nil(t, explicit.Road)
	assert.True(t, m.Sections[1].Closed())
	assert.Equal(t, 1.5, m.Sections[1].Height)
}

func TestInletTable(t *testing.T) {
	for i, it := range InletTypes {
		if i > 0 {
			assert.Less(t, InletTypes[i-1].Name, it.Name, "sorted")
		}
		got, ok := LookupInlet(it.Name)
		assert.True(t, ok)
		assert.Equal(t, it, got)
		assert.Contains(t, it.Source, "HDS-5")
		assert.Contains(t, it.Source, "from memory")
		assert.Contains(t, []Shape{Circle, Box}, it.Shape)
		assert.Equal(t, 1, it.Form)
		assert.Greater(t, it.EntranceLoss, 0.0)
	}
	_, ok := LookupInlet("nope")
	assert.False(t, ok)
}
