package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// A submittal that ships its own .chanlint.hcl, switching off freeboard
// and keeping the pack's reference line: when a reviewer runs from inside
// it, every output names the discovered file, says that the checked tree
// chose its own criteria, lists the rule it turns off and never shows the
// pack's reference as if it were the submittal's.
func TestDiscoveredPolicyIsShownEverywhere(t *testing.T) {
	repo, _ := hostileTree(t)
	sub := filepath.Join(repo, "models")
	require.NoError(t, os.WriteFile(filepath.Join(sub, configName), []byte(`policy "lenient" {
  units   = "si"
  extends = "baseline"
  freeboard {
    enabled = false
  }
}
`), 0o644))

	code, out, _ := runIn(sub, runOpts{}, "check", "--color", "never")
	assert.Equal(t, exitFindings, code, "capacity still fails: it is always on")
	assert.Contains(t, out, "policy: lenient (.chanlint.hcl) — extends the baseline pack; no reference of its own\n")
	assert.Contains(t, out, "policy file .chanlint.hcl was discovered (no --policy given)\n")
	assert.Contains(t, out, "warning: the checked tree holds its own policy file .chanlint.hcl: the files checked chose their own criteria")
	assert.Contains(t, out, "rules off: freeboard (on in the baseline pack)\n")
	assert.NotContains(t, out, "chanlint baseline pack (published screening values")
	assert.Contains(t, out, "overtop.chan.hcl:", "the findings are still reported")

	_, out, _ = runIn(sub, runOpts{}, "check", "--format", "json")
	var doc struct {
		Policy policyJSON `json:"policy"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc))
	assert.Equal(t, ".chanlint.hcl", doc.Policy.Discovered)
	assert.True(t, doc.Policy.InCheckedTree)
	assert.Equal(t, []string{"freeboard"}, doc.Policy.RulesOff)
	assert.Empty(t, doc.Policy.Reference)
	assert.Len(t, doc.Policy.Notes, 3)

	_, out, _ = runIn(sub, runOpts{}, "check", "--format", "sarif")
	assert.Contains(t, out, "the files checked chose their own criteria")
	assert.Contains(t, out, "rules off: freeboard")

	code, out, _ = runIn(sub, runOpts{}, "report", "--out", "r.html", ".")
	assert.Equal(t, exitOK, code)
	assert.Contains(t, out, "warning: the checked tree holds its own policy file")
	page, err := os.ReadFile(filepath.Join(sub, "r.html"))
	require.NoError(t, err)
	assert.Contains(t, string(page), "the files checked chose their own criteria")
	assert.Contains(t, string(page), "rules off: freeboard")
	code, _, _ = runIn(sub, runOpts{}, "report", "--out", "r.md", ".")
	assert.Equal(t, exitOK, code)
	md, err := os.ReadFile(filepath.Join(sub, "r.md"))
	require.NoError(t, err)
	assert.Contains(t, string(md), "chose their own criteria")

	// Run from the reviewer's side on the submittal's directory, with the
	// reviewer's --policy: no notice, the pack's own reference.
	_, out, _ = runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "baseline", "models")
	assert.NotContains(t, out, "chose their own criteria")
	assert.NotContains(t, out, "rules off")
	assert.Contains(t, out, "policy: baseline (built-in pack) — chanlint baseline pack")
}
