package main

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// A model whose event and lining were renamed against the policy ("Q100",
// "Concrete"): the criteria that silently skipped them are reported as
// warnings naming the unmatched keys, the model's names and the case
// difference; the other files are still reported.
func TestRenamedEventsAndLiningsAreReported(t *testing.T) {
	repo, _ := hostileTree(t)
	src, err := os.ReadFile(filepath.Join(repo, "models", "overtop.chan.hcl"))
	require.NoError(t, err)
	model := string(src) + "\nevent \"q100\" {\n  inflow = { \"lane\" = 2.5 }\n  outlet = { depth = 1.3 }\n}\n"
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "overtop.chan.hcl"), []byte(model), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(repo, "p.policy.hcl"), []byte(`policy "county" {
  units     = "si"
  reference = "County manual"
  freeboard {
    minimum = 0.3
    events  = ["q25", "Q100"]
  }
  froude_band {
    avoid  = [[0.9, 1.1]]
    events = ["Q25"]
  }
  max_velocity {
    limit = { Concrete = 1.0, default = 10.0 }
  }
}
`), 0o644))
	_, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "./p.policy.hcl", "models")
	assert.Regexp(t, `overtop\.chan\.hcl:\d+:\d+: warning: \[unmatched_selector\] the freeboard block at \S*p\.policy\.hcl:4: its events "Q100" match no event of this model \(its events: "q25", "q100"\); "Q100" differs from "q100" only in case \(names are case-sensitive\); "q100" is not checked by this block`, out)
	assert.Regexp(t, `overtop\.chan\.hcl:\d+:\d+: warning: \[unmatched_selector\] the froude_band block at \S*p\.policy\.hcl:8 \(events Q25\) matches no event on any reach of this model, so it was not applied; its events "Q25" match no event of this model \(its events: "q25", "q100"\); "Q25" differs from "q25" only in case`, out)
	assert.Regexp(t, `overtop\.chan\.hcl:\d+:\d+: warning: \[unmatched_selector\] the max_velocity block at \S*p\.policy\.hcl:12: its limit keys "Concrete" match no lining of this model \(its linings: "concrete"\); "Concrete" differs from "concrete" only in case \(names are case-sensitive\); "concrete" gets the default limit`, out)
	assert.Contains(t, out, "models/slow.chan.hcl", "the other files are still reported")
}
