package main

import (
	"os"
	"path/filepath"
	"regexp"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// negativeZero matches a number printed as "-0", "-0.0" and the like, not
// a negative number such as -0.5.
var negativeZero = regexp.MustCompile(`[\s:=\[(,]-0(\.0*)?([^.0-9eE]|$)`)

// A zero written with a sign in a policy or a model is zero: no output
// prints "-0", not even SARIF's unrounded result properties or `policy
// show`.
func TestNegativeZeroWritten(t *testing.T) {
	t.Parallel()
	dir := workspace(t, 1)
	pol := `policy "signed-zeros" {
  extends = "baseline"
  units   = "si"
  froude_band {
    avoid = [[-0, 0.98]]
  }
  freeboard {
    minimum  = -0.0
    fraction = -0
  }
}
`
	require.NoError(t, os.WriteFile(filepath.Join(dir, "z.policy.hcl"), []byte(pol), 0o644))
	for _, format := range []string{"text", "json", "sarif"} {
		code, out, errOut := runIn(dir, runOpts{}, "check", "set00/demo", "--policy", "z.policy.hcl", "--format", format, "--color", "never")
		require.Equal(t, exitFindings, code, errOut)
		assert.Contains(t, out, "froude_band", format)
		assert.NotRegexp(t, negativeZero, out, format)
	}
	code, out, errOut := runIn(dir, runOpts{}, "policy", "show", "z.policy.hcl")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "avoid")
	assert.NotRegexp(t, negativeZero, out)
}
