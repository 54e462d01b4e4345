package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/sarifout"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// slowModel is a model whose one finding is a low-flow velocity warning
// on reach "drain", stations 0–150; exceptionBlock excepts it.
func slowModel(t *testing.T) string {
	t.Helper()
	src, err := os.ReadFile(filepath.Join("testdata", "models", "slow.chan.hcl"))
	require.NoError(t, err)
	return string(src)
}

// slowPolicy is the baseline with a minimum velocity for the slow model's
// event: the packs leave min_velocity to the events a policy names.
const slowPolicy = `policy "slow" {
  units   = "si"
  extends = "baseline"
  min_velocity {
    events = ["base", "q25"]
    limit  = { concrete = 0.6 }
  }
}
`

const exceptionBlock = `
exception "min_velocity" {
  reach        = "drain"
  from_station = 0
  to_station   = 150
  reason       = "Base flow only; the sump is flushed monthly"
}
`

// A baseline never records an excepted finding, so removing the
// exception re-opens it; --write-baseline says what it wrote; entries no
// finding matches are listed as stale.
func TestBaselineExceptedAndStale(t *testing.T) {
	dir := t.TempDir()
	model := filepath.Join(dir, "drain.chan.hcl")
	require.NoError(t, os.WriteFile(model, []byte(slowModel(t)+exceptionBlock), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, ".chanlint.hcl"), []byte(slowPolicy), 0o644))
	copyTree(t, filepath.Join("testdata", "models", "overtop.chan.hcl"), filepath.Join(dir, "overtop.chan.hcl"))

	code, _, errOut := runIn(dir, runOpts{}, "check", "--write-baseline", "known.json")
	require.Equal(t, exitOK, code, errOut)
	// The overtopping ditch gives one finding: capacity reports the
	// overtopping, and freeboard does not repeat it.
	assert.Equal(t, "chanlint check: recorded 1 finding in baseline known.json; "+
		"1 finding covered by design exceptions not recorded\n", errOut)
	data, err := os.ReadFile(filepath.Join(dir, "known.json"))
	require.NoError(t, err)
	assert.NotContains(t, string(data), "min_velocity")

	// With the exception the run passes; without it the finding is new.
	code, out, _ := runIn(dir, runOpts{}, "check", "--baseline", "known.json", "--color", "never")
	assert.Equal(t, exitOK, code, out)
	assert.Contains(t, out, "excepted: [min_velocity]")
	require.NoError(t, os.WriteFile(model, []byte(slowModel(t)), 0o644))
	code, out, _ = runIn(dir, runOpts{}, "check", "--baseline", "known.json", "--color", "never", "--fail-on", "warning")
	assert.Equal(t, exitFindings, code, out)
	assert.Contains(t, out, "warning: [min_velocity] reach drain")

	// The overtopping ditch fixed: its entry is stale.
	require.NoError(t, os.Remove(filepath.Join(dir, "overtop.chan.hcl")))
	_, out, _ = runIn(dir, runOpts{}, "check", "--baseline", "known.json", "--color", "never")
	assert.Contains(t, out, "baseline: 1 entry no longer found (write the baseline again to drop it):\n")
	assert.Regexp(t, `(?m)^    overtop\.chan\.hcl:10: error \[capacity\] reach lane, event q25, stations 0–120$`, out)
	_, jsonOut, _ := runIn(dir, runOpts{}, "check", "--baseline", "known.json", "--format", "json")
	var doc struct {
		Summary struct {
			Known, Stale *int
		}
		StaleEntries []struct{ Rule string } `json:"stale_entries"`
		Findings     []struct{ Baseline string }
	}
	require.NoError(t, json.Unmarshal([]byte(jsonOut), &doc))
	require.NotNil(t, doc.Summary.Stale)
	assert.Equal(t, 1, *doc.Summary.Stale)
	assert.Len(t, doc.StaleEntries, 1)
	require.Len(t, doc.Findings, 1)
	assert.Equal(t, "new", doc.Findings[0].Baseline)
}

// In SARIF a baseline marks results instead of dropping them: known ones
// "unchanged", the others "new".
func TestBaselineSARIFStates(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, filepath.Join("testdata", "models", "overtop.chan.hcl"), filepath.Join(dir, "overtop.chan.hcl"))
	require.NoError(t, os.WriteFile(filepath.Join(dir, ".chanlint.hcl"), []byte(slowPolicy), 0o644))
	code, _, errOut := runIn(dir, runOpts{}, "check", "--write-baseline", "known.json")
	require.Equal(t, exitOK, code, errOut)
	require.NoError(t, os.WriteFile(filepath.Join(dir, "drain.chan.hcl"), []byte(slowModel(t)), 0o644))
	code, out, _ := runIn(dir, runOpts{}, "check", "--baseline", "known.json", "--format", "sarif", "--fail-on", "warning")
	assert.Equal(t, exitFindings, code)
	var log struct {
		Runs []struct {
			Results []struct {
				RuleID        string `json:"ruleId"`
				BaselineState string `json:"baselineState"`
			} `json:"results"`
		} `json:"runs"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &log))
	states := map[string]string{}
	for _, r := range log.Runs[0].Results {
		states[r.RuleID] += r.BaselineState + " "
	}
	assert.Equal(t, map[string]string{"min_velocity": "new ", "capacity": "unchanged "}, states)
}

// An invalid policy, baseline or model still gives a SARIF log on stdout,
// whose tool execution notifications say why (exit 2).
func TestSARIFAlwaysALog(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, filepath.Join("testdata", "models", "overtop.chan.hcl"), filepath.Join(dir, "overtop.chan.hcl"))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "bad.policy.hcl"), []byte("units = \"metric\"\n"), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "junk.json"), []byte("not json"), 0o644))
	copyTree(t, filepath.Join("testdata", "models", "broken.chan.hcl"), filepath.Join(dir, "sub", "broken.chan.hcl"))
	for _, tc := range []struct {
		args []string
		want string
		at   string // the problem's place, URI:line:column, "" for none
	}{
		{[]string{"--policy", "bad.policy.hcl", "overtop.chan.hcl"}, `bad\.policy\.hcl:1:1: error: `, "bad.policy.hcl:1:1"},
		{[]string{"--baseline", "junk.json", "overtop.chan.hcl"}, `baseline junk\.json: not a chanlint baseline file`, ""},
		{[]string{"--policy", "no-such-pack"}, `unknown policy`, ""},
		{[]string{"sub"}, `sub/broken\.chan\.hcl: not checked: `, "sub/broken.chan.hcl:1:1"},
	} {
		code, out, _ := runIn(dir, runOpts{}, append([]string{"check", "--format", "sarif"}, tc.args...)...)
		assert.Equal(t, exitInvalid, code, tc.args)
		var log struct {
			Version string
			Runs    []struct {
				Invocations []struct {
					ExecutionSuccessful        bool `json:"executionSuccessful"`
					ToolExecutionNotifications []struct {
						Level     string
						Message   struct{ Text string }
						Locations []struct {
							PhysicalLocation struct {
								ArtifactLocation struct{ URI string }
								Region           struct{ StartLine, StartColumn int }
							}
						}
					} `json:"toolExecutionNotifications"`
				}
			}
		}
		require.NoError(t, json.Unmarshal([]byte(out), &log), "%v: %s", tc.args, out)
		assert.Equal(t, "2.1.0", log.Version)
		inv := log.Runs[0].Invocations[0]
		assert.False(t, inv.ExecutionSuccessful, tc.args)
		var texts, places []string
		for _, n := range inv.ToolExecutionNotifications {
			texts = append(texts, n.Level+" "+n.Message.Text)
			if n.Level == "error" {
				for _, l := range n.Locations {
					p := l.PhysicalLocation
					places = append(places, fmt.Sprintf("%s:%d:%d", p.ArtifactLocation.URI, p.Region.StartLine, p.Region.StartColumn))
				}
			}
		}
		if tc.at == "" {
			assert.Empty(t, places, tc.args)
		} else {
			assert.NotEmpty(t, places, tc.args)
			for _, p := range places {
				assert.Equal(t, tc.at, p, tc.args)
			}
		}
		assert.Regexp(t, regexp.MustCompile(`(?m)^error .*`+tc.want), strings.Join(texts, "\n"), tc.args)
		assert.NotContains(t, out, "\u001b[", "no colour codes")
	}
}

// Every rule's helpUri anchor names a heading of the README.
func TestSARIFHelpURIsExist(t *testing.T) {
	readme, err := os.ReadFile(filepath.Join(repoDir(t), "README.md"))
	require.NoError(t, err)
	for _, r := range rules.All() {
		anchor := strings.TrimPrefix(sarifout.HelpURI(r), sarifout.InformationURI+"#")
		heading := "### `" + r.ID + "`"
		if r.AlwaysOn {
			heading += " (always on)"
		}
		assert.Contains(t, string(readme), "\n"+heading+"\n", "rule %s: anchor #%s", r.ID, anchor)
	}
}

// A 0.8 % change of every inflow of the demo moves span ends and values a
// little: every SARIF fingerprint stays, and the baseline still knows
// every finding. A much worse overtopping is new again, and says why.
func TestSmallHydraulicChangeKeepsIdentity(t *testing.T) {
	dir := t.TempDir()
	copyTree(t, filepath.Join(repoDir(t), "testdata", "demo"), filepath.Join(dir, "demo"))
	fingerprints := func() []string {
		_, out, _ := runIn(dir, runOpts{}, "check", "demo", "--format", "sarif")
		return regexp.MustCompile(`"chanlintFinding/v1": "([0-9a-f:]+)"`).FindAllString(out, -1)
	}
	before := fingerprints()
	require.NotEmpty(t, before)
	code, _, errOut := runIn(dir, runOpts{}, "check", "demo", "--write-baseline", "known.json")
	require.Equal(t, exitOK, code, errOut)

	p := filepath.Join(dir, "demo", "kestrel-ridge.chan.hcl")
	src, err := os.ReadFile(p)
	require.NoError(t, err)
	scaled := regexp.MustCompile(`(inflow\s*=\s*\{[^}]*\})`).ReplaceAllStringFunc(string(src), func(s string) string {
		return regexp.MustCompile(`= (\d+\.\d+)`).ReplaceAllStringFunc(s, func(n string) string {
			var x float64
			_, err := fmt.Sscan(strings.TrimPrefix(n, "= "), &x)
			require.NoError(t, err)
			return "= " + strconv.FormatFloat(x*1.008, 'f', 4, 64)
		})
	})
	require.NotEqual(t, string(src), scaled)
	require.NoError(t, os.WriteFile(p, []byte(scaled), 0o644))
	assert.ElementsMatch(t, before, fingerprints())
	code, out, _ := runIn(dir, runOpts{}, "check", "demo", "--baseline", "known.json", "--color", "never", "--fail-on", "info")
	assert.Equal(t, exitOK, code, out)
	assert.NotContains(t, out, "no longer found")

	// Much worse: the ditch's tailwater raised from 1.3 to 1.6 m doubles
	// the overtopping (0.3 → 0.6 m), more than the 25 % allowed.
	copyTree(t, filepath.Join("testdata", "models", "overtop.chan.hcl"), filepath.Join(dir, "ditch", "overtop.chan.hcl"))
	code, _, errOut = runIn(dir, runOpts{}, "check", "ditch", "--write-baseline", "ditch.json")
	require.Equal(t, exitOK, code, errOut)
	d := filepath.Join(dir, "ditch", "overtop.chan.hcl")
	src, err = os.ReadFile(d)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(d, []byte(strings.Replace(string(src), "depth = 1.3", "depth = 1.6", 1)), 0o644))
	code, out, _ = runIn(dir, runOpts{}, "check", "ditch", "--baseline", "ditch.json", "--color", "never")
	assert.Equal(t, exitFindings, code, out)
	assert.Regexp(t, `(?m)^    baseline: new: much worse than recorded, 0\.6 m past the limit where the baseline has 0\.3 m`, out)
}
