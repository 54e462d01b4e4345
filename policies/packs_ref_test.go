package policies_test

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestPackVelocitiesAgainstFortierScobey checks the erodible linings of the
// packs' max_velocity against the published clear-water velocities, the US
// pack exactly and the SI pack within its two-decimal rounding of the
// converted value.
//
// Source: Fortier & Scobey (1926), ASCE, reproduced in Chow, Open-Channel
// Hydraulics (1959), Table 7-3, clear water (from memory, per
// references.md): fine sand 1.5, firm loam 2.5, stiff clay 3.75, coarse
// gravel 4.0, shales and hardpans 6.0 ft/s; 1 ft = 0.3048 m exactly.
func TestPackVelocitiesAgainstFortierScobey(t *testing.T) {
	published := map[string]float64{"sand": 1.5, "earth": 2.5, "clay": 3.75, "gravel": 4.0, "shale": 6.0, "hardpan": 6.0}
	for _, c := range []struct {
		pack   string
		units  model.Units
		factor float64
		tol    float64
	}{{"baseline-us", model.US, 1, 0}, {"baseline", model.SI, 0.3048, 0.005}} {
		p, diags := rules.Language().Pack(c.pack)
		require.False(t, diags.HasErrors(), "%v", diags)
		require.Equal(t, c.units, p.Units)
		rc := p.Rules["max_velocity"]
		require.NotNil(t, rc, c.pack)
		limits := rc.Table("limit")
		for lining, v := range published {
			got, ok := limits.For(lining)
			require.Truef(t, ok, "%s: %s", c.pack, lining)
			assert.InDeltaf(t, v*c.factor, got, c.tol+1e-12, "%s: %s", c.pack, lining)
		}
	}
}
