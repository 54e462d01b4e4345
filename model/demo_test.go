package model

import (
	"testing"

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
