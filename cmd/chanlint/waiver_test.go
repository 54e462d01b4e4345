package main

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// A submittal that excuses its own overtopping channel with a design
// exception for the always-on capacity rule: the exception is not applied
// (the run still fails and says why) unless the reviewer's policy lists
// capacity in waive_always_on; a placeholder reason is an error of the
// model. The other files are still reported.
func TestExceptionsCannotWaiveAlwaysOnRules(t *testing.T) {
	repo, _ := hostileTree(t)
	src, err := os.ReadFile(filepath.Join(repo, "models", "overtop.chan.hcl"))
	require.NoError(t, err)
	waiver := string(src) + `
exception "capacity" {
  reach        = "lane"
  from_station = 0
  to_station   = 120
  reason       = "The owner accepts that the lane floods in this event"
}
`
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "overtop.chan.hcl"), []byte(waiver), 0o644))
	code, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitFindings, code)
	assert.Regexp(t, `overtop\.chan\.hcl:\d+:\d+: error: \[capacity\]`, out, "still an error, not excepted")
	assert.Regexp(t, `\[unused_exception\] .*the exception for rule "capacity" on reach "lane".* was not applied: capacity is always on and the policy does not let design exceptions waive it \(waive_always_on\)`, out)
	assert.Contains(t, out, "3 files", "the other files are still checked")

	pol := filepath.Join(repo, "lenient.policy.hcl")
	require.NoError(t, os.WriteFile(pol, []byte("policy \"reviewer\" {\n  units = \"si\"\n  extends = \"baseline\"\n  reference = \"Reviewer's notes\"\n  waive_always_on = [\"capacity\"]\n}\n"), 0o644))
	_, out, _ = runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "./lenient.policy.hcl", "models")
	assert.Regexp(t, `excepted: \[capacity\]`, out, "waived when the reviewer's policy allows it")

	require.NoError(t, os.WriteFile(pol, []byte("policy \"x\" {\n  units = \"si\"\n  waive_always_on = [\"freeboard\"]\n}\n"), 0o644))
	code, _, errOut := runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "./lenient.policy.hcl", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, `"freeboard" is not a valid always-on rule id`)

	placeholder := string(src) + "\nexception \"freeboard\" {\n  reach = \"lane\"\n  from_station = 0\n  to_station = 120\n  reason = \".\"\n}\n"
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "overtop.chan.hcl"), []byte(placeholder), 0o644))
	code, out, _ = runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, out, "Reason too short")
	assert.Contains(t, out, "3 files", "the other files are still checked")
}

// A points section whose height reaches above the surveyed ground at an
// end (imaginary banks that would let a flow above the ground pass the
// capacity check) is an error at the height; the other files are still
// reported.
func TestImaginaryBanksAreRefused(t *testing.T) {
	repo, _ := hostileTree(t)
	m := `units = "si"
section "valley" {
  shape     = "points"
  points    = [[0, 1.2], [4, 0], [8, 0], [12, 2.5]]
  height    = 2.5
  roughness = 0.035
}
reach "brook" {
  from    = "a"
  to      = "b"
  length  = 100
  section = "valley"
  slope   = 0.001
}
event "q100" {
  inflow = { brook = 8 }
  outlet = { condition = "normal" }
}
`
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "valley.chan.hcl"), []byte(m), 0o644))
	code, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, out, "models/valley.chan.hcl:5:15: error: [model] Height above the ground: height of section \"valley\" is 2.5 m above its lowest point, but the surveyed ground at its left end (elevation 1.2) is only 1.2 m above it")
	assert.Contains(t, out, "4 files (1 invalid)", "the other files are still reported")
}
