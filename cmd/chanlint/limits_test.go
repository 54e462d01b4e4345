package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestComputedPointsLimit: a model whose one event needs more computed
// points than the solver's budget (solver.DefaultMaxPoints, a million) ends
// in a positioned diagnostic of the solver rule and exit status 2, not in a
// long run or an exhausted memory; the other files are still checked.
func TestComputedPointsLimit(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// 1,000 km at a spacing of 0.5 m needs two million points.
	huge := `units = "si"
section "s" {
  shape        = "rectangle"
  bottom_width = 3
  height       = 2
  roughness    = 0.015
}
reach "endless" {
  from        = "a"
  to          = "b"
  length      = 1000000
  section     = "s"
  slope       = 0.001
  max_spacing = 0.5
}
event "q" {
  inflow = { endless = 2 }
  outlet = { condition = "normal" }
}
`
	require.NoError(t, os.WriteFile(filepath.Join(dir, "huge.chan.hcl"), []byte(huge), 0o644))
	clean, err := os.ReadFile(filepath.Join("testdata", "models", "clean.chan.hcl"))
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(filepath.Join(dir, "clean.chan.hcl"), clean, 0o644))

	code, out, errOut := runIn(dir, runOpts{}, "check", "--color", "never")
	assert.Equal(t, exitInvalid, code, "%s%s", out, errOut)
	var line string
	for _, l := range strings.Split(out, "\n") {
		if strings.Contains(l, "too many computed points") {
			line = l
		}
	}
	require.NotEmpty(t, line, "%s", out)
	// The finding points at the units value, line 1, column 9.
	assert.True(t, strings.HasPrefix(line, "huge.chan.hcl:1:9:"), "%s", line)
	assert.Contains(t, line, "1000000")
	assert.Contains(t, line, "max_spacing")
	assert.NotContains(t, out, "clean.chan.hcl:", "the clean model still checks clean")
}
