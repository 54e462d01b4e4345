package model

import (
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"

	"github.com/stretchr/testify/require"
)

const demoFile = "../testdata/demo/kestrel-ridge.chan.hcl"

func TestDemoLoads(t *testing.T) {
	m, diags := Load(demoFile)
	require.Empty(t, diags, "%v", diags)
	require.NotNil(t, m)
	require.Len(t, m.Reaches, 7)
	require.Len(t, m.Events, 2)
	require.Equal(t, "merrow-brook", m.Network.OutletReach.Name)
}

// text returns the source bytes a range covers.
func text(m *Model, r hcl.Range) string { return string(m.Source[r.Start.Byte:r.End.Byte]) }

// TestDemoRanges checks that the ranges kept for findings cover exactly the
// written values and names.
func TestDemoRanges(t *testing.T) {
	m, diags := Load(demoFile)
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	assert.Equal(t, `"si"`, text(m, m.UnitsRange))
	g := m.Gates[0]
	assert.Equal(t, `"escarpment-gate"`, text(m, g.LabelRange))
	assert.Equal(t, `gate "escarpment-gate"`, text(m, g.DefRange))
	assert.Equal(t, "0.8", text(m, g.At("opening")))
	assert.Equal(t, `"chute"`, text(m, g.At("reach")))
	assert.Equal(t, "35", text(m, m.Bends[0].At("radius")))
	assert.Equal(t, "24", text(m, m.Basins[0].At("to_station")))
	brook := m.Sections[len(m.Sections)-1]
	assert.Equal(t, "[8, 24]", text(m, brook.At("banks")))
	assert.Equal(t, "[0.06, 0.035, 0.07]", text(m, brook.At("roughness")))
	trunk := m.Reaches[2]
	assert.Equal(t, "20", text(m, trunk.At("max_spacing")))
	assert.Equal(t, "570", text(m, trunk.Segments[0].At("from_station")))
	q10 := m.Events[0]
	assert.Equal(t, `"north-swale"`, text(m, q10.Inflows[0].Range))
	assert.Equal(t, `"east-ditch"`, text(m, q10.Entrances[0].Range))
	assert.Equal(t, "0.9", text(m, q10.Outlet.Range))
	ex := m.Exceptions[0]
	assert.Equal(t, `"max_velocity"`, text(m, ex.LabelRange))
	assert.Contains(t, text(m, ex.At("reason")), "Chute slab")
	for _, r := range m.Reaches {
		for _, name := range []string{"from", "to", "length", "section"} {
			assert.True(t, r.Has(name), "reach %s: %s", r.Name, name)
		}
	}
}
