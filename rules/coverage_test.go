package rules

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestNotEvaluated: what a check did not evaluate is listed: the rules the
// policy leaves off, the stretch next to a brink froude_band skips, an
// exempted undular jump, a conduit without an erosion limit, the solver's
// notes and what the rules never compute.
func TestNotEvaluated(t *testing.T) {
	m, res, _ := golden(t, "froude-buffer.chan.hcl", "froude-buffer.policy.hcl")
	p, diags := Language().NewLoader("..").Load(goldenDir + "/froude-buffer.policy.hcl")
	require.False(t, diags.HasErrors())
	ne := strings.Join(NotEvaluated(m, res, p), "\n")
	assert.Contains(t, ne, "rules the policy does not enable (not checked): bed_slope, bend_radius, bottom_width, freeboard, headwater")
	assert.Contains(t, ne, `froude_band: not checked within control_buffer critical depths of the critical-depth controls the solver imposed: reach "ostler-row" at 300 m (4.67 m, event "q")`)

	m, res, _ = golden(t, "undular.chan.hcl", "undular-froude.policy.hcl")
	p, diags = Language().NewLoader("..").Load(goldenDir + "/undular-froude.policy.hcl")
	require.False(t, diags.HasErrors())
	ne = strings.Join(NotEvaluated(m, res, p), "\n")
	assert.Contains(t, ne, `jump_containment: jumps below the policy's min_froude or min_energy_loss, not required to lie in a basin: reach "relief" at 12.2 m (event "q", F1 1.51`)

	m, res = solveSource(t, conduitSource)
	p, diags = Language().Pack("baseline")
	require.False(t, diags.HasErrors())
	ne = strings.Join(NotEvaluated(m, res, p), "\n")
	assert.Contains(t, ne, `max_velocity: no limit for sections "pipe" (a closed conduit, "pipe" not in the table: no erosion limit)`)
	assert.Contains(t, ne, "shear_stress: the raised shear downstream of bends")
	assert.NotContains(t, ne, "min_velocity: no limit", "the self-cleansing minimum applies to conduits")
}
