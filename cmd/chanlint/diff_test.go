package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// diffModel is a small model whose bank height is the parameter.
func diffModel(height string) string {
	return `units = "si"
section "ditch" {
  shape        = "trapezoid"
  bottom_width = 1.5
  side_slope   = 2
  height       = ` + height + `
  roughness    = 0.03
  lining       = "grass"
}
reach "ditch" {
  from    = "top"
  to      = "outfall"
  length  = 300
  section = "ditch"
  slope   = 0.002
}
event "q10" {
  inflow = { ditch = 1.2 }
  outlet = { condition = "normal" }
}
`
}

// TestDiffCommand runs `chanlint diff` on two files and against a git
// revision: a raised bank fixes the freeboard finding, the exit status
// follows new findings only, and every format names what changed.
//
// Source: common practice (no published source).
func TestDiffCommand(t *testing.T) {
	dir := t.TempDir()
	write := func(name, src string) {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644))
	}
	write("old.chan.hcl", diffModel("0.7"))
	write("new.chan.hcl", diffModel("1.2"))

	code, out, errOut := runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--color", "never")
	require.Equal(t, exitOK, code, errOut)
	assert.Contains(t, out, "old.chan.hcl → new.chan.hcl")
	assert.Contains(t, out, "fixed findings (1):")
	assert.Contains(t, out, "[freeboard] reach ditch, event q10")
	assert.Contains(t, out, "1 comparison, 0 new, 1 fixed, 0 changed")
	assert.Contains(t, out, "licensed professional engineer")

	// The other way round the finding is new: exit status 1.
	code, out, _ = runIn(dir, runOpts{}, "diff", "new.chan.hcl", "old.chan.hcl", "--color", "never")
	assert.Equal(t, exitFindings, code)
	assert.Contains(t, out, "new findings (1):")

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--format", "json")
	require.Equal(t, exitOK, code)
	var doc struct {
		Comparisons []struct {
			Fixed    []struct{ Rule string } `json:"fixed_findings"`
			Profiles []struct {
				Reach         string
				FreeboardGain *struct{ Delta float64 } `json:"freeboard_gain"`
			}
		}
		Summary struct{ Fixed int }
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc), out)
	require.Len(t, doc.Comparisons, 1)
	assert.Equal(t, 1, doc.Summary.Fixed)
	require.Len(t, doc.Comparisons[0].Profiles, 1)
	require.NotNil(t, doc.Comparisons[0].Profiles[0].FreeboardGain)
	assert.InDelta(t, 0.5, doc.Comparisons[0].Profiles[0].FreeboardGain.Delta, 1e-9, "the banks were raised 0.5 m")

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--format", "markdown")
	require.Equal(t, exitOK, code)
	assert.Contains(t, out, "**Fixed findings (1)**")

	code, _, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "OLD NEW")

	// --git: the working tree against the last commit.
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("git is not installed; the --git comparison was not tested")
	}
	repo := t.TempDir()
	git := func(args ...string) {
		cmd := exec.Command("git", append([]string{"-C", repo, "-c", "user.email=t@example.invalid", "-c", "user.name=t"}, args...)...)
		b, err := cmd.CombinedOutput()
		require.NoError(t, err, string(b))
	}
	git("init", "-q")
	require.NoError(t, os.WriteFile(filepath.Join(repo, "ditch.chan.hcl"), []byte(diffModel("0.7")), 0o644))
	git("add", ".")
	git("commit", "-q", "-m", "existing")
	require.NoError(t, os.WriteFile(filepath.Join(repo, "ditch.chan.hcl"), []byte(diffModel("1.2")), 0o644))
	code, out, errOut = runIn(repo, runOpts{}, "diff", "--git", "HEAD", "--color", "never")
	require.Equal(t, exitOK, code, errOut)
	assert.Contains(t, out, "ditch.chan.hcl@HEAD → ditch.chan.hcl")
	assert.Contains(t, out, "fixed findings (1):")

	code, _, errOut = runIn(repo, runOpts{}, "diff", "--git", "--upload-pack=x")
	assert.Equal(t, exitInvalid, code)
	assert.True(t, strings.Contains(errOut, "not a revision"), errOut)
	code, _, errOut = runIn(repo, runOpts{}, "diff", "--git", "no-such-rev")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "unknown revision")
}

// narrowModel is diffModel with the bottom width as the parameter.
func narrowModel(width string) string {
	return strings.Replace(diffModel("0.8"), "bottom_width = 1.5", "bottom_width = "+width, 1)
}

// TestDiffReport: `diff --out` writes the proposed model's review report
// with the existing water surface drawn on each profile and the revision's
// changes, as HTML, as Markdown with SVG files beside it, and to standard
// output; the comparison itself still goes to standard output.
//
// Source: common practice (no published source).
func TestDiffReport(t *testing.T) {
	dir := t.TempDir()
	for name, src := range map[string]string{"old.chan.hcl": narrowModel("2.5"), "new.chan.hcl": narrowModel("1.0")} {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644))
	}
	code, out, errOut := runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "review.html", "--color", "never")
	require.Equal(t, exitFindings, code, errOut) // the narrowed ditch loses its freeboard
	assert.Contains(t, out, "reach ditch, event q10: water surface +")
	assert.Contains(t, errOut, "chanlint diff: wrote review.html")
	data, err := os.ReadFile(filepath.Join(dir, "review.html"))
	require.NoError(t, err)
	page := string(data)
	assert.True(t, strings.HasPrefix(page, "<!DOCTYPE html>"))
	assert.True(t, strings.HasSuffix(strings.TrimSpace(page), "</html>"))
	assert.Contains(t, page, `<g class="existing"><title>Water surface of the existing revision old.chan.hcl</title>`)
	assert.Contains(t, page, ">existing water surface<")
	assert.Contains(t, page, "<h3>Revision changes</h3>")
	assert.Contains(t, page, "<caption>New findings (1)</caption>")
	assert.Regexp(t, `<td class="name" dir="auto">ditch</td><td class="name" dir="auto">q10</td><td class="num">&#43;[0-9.]+ at [0-9.]+</td>`, page)
	assert.Equal(t, strings.Count(page, "<svg "), strings.Count(page, "</svg>"))

	code, _, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "review.md")
	require.Equal(t, exitFindings, code, errOut)
	md, err := os.ReadFile(filepath.Join(dir, "review.md"))
	require.NoError(t, err)
	assert.Contains(t, string(md), "### Revision changes")
	assert.Contains(t, string(md), "**New findings (1)**")
	assert.Contains(t, string(md), "![")
	svg, err := os.ReadFile(filepath.Join(dir, "review-1.svg"))
	require.NoError(t, err)
	assert.Contains(t, string(svg), `<g class="existing">`)
	assert.Contains(t, string(svg), ">existing water surface<")

	code, out, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "-")
	require.Equal(t, exitFindings, code, errOut)
	assert.True(t, strings.HasPrefix(out, "<!DOCTYPE html>"), "only the report goes to standard output")
	assert.Contains(t, out, "<h3>Revision changes</h3>")

	// The report never replaces an input model.
	code, _, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "old.chan.hcl")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "cannot write old.chan.hcl")
	src, err := os.ReadFile(filepath.Join(dir, "old.chan.hcl"))
	require.NoError(t, err)
	assert.Equal(t, narrowModel("2.5"), string(src))
}

// TestCriterionLine: a finding from a policy block with a `section` cites
// the manual's reference, version and section on a criterion: line.
//
// Source: common practice (no published source): a reviewer's checklist
// cites the clause of the criteria manual each finding rests on.
func TestCriterionLine(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "ditch.chan.hcl"), []byte(diffModel("0.7")), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "county.policy.hcl"), []byte(`policy "county" {
  units     = "si"
  reference = "County Drainage Manual"
  version   = "2026.1"
  freeboard {
    minimum = 0.3
    section = "5.3.2"
  }
}
`), 0o644))
	code, out, errOut := runIn(dir, runOpts{}, "check", "ditch.chan.hcl", "--policy", "./county.policy.hcl", "--color", "never")
	require.Equal(t, exitFindings, code, errOut)
	assert.Contains(t, out, "    criterion: County Drainage Manual (version 2026.1), section 5.3.2\n")
}

// A changed finding whose value moved never reads as unchanged in the
// text of chanlint diff.
func TestChangeTextValueMoved(t *testing.T) {
	old := rules.Finding{Rule: "shear_stress", HasValue: true, Value: 29.9959, Unit: "N/m²", Message: "m"}
	moved := old
	moved.Value = 29.9901
	assert.Contains(t, changeText(&revdiff.Change{Old: old, New: moved}, "m"), "value 30.00 → 29.99 N/m²")
}

// gateModel is a sluice gate releasing onto a mild rectangular channel
// into the tailwater given: an M3 curve, a hydraulic jump and an M2
// curve. The reach's name carries markup, for the escaping.
func gateModel(tail string) string {
	return `units = "si"
section "outlet-channel" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 2.5
  roughness    = 0.014
}
reach "release<i>" {
  from    = "gate-house"
  to      = "river"
  length  = 200
  section = "outlet-channel"
  slope   = 0.0007
}
gate "sluice" {
  reach       = "release<i>"
  opening     = 0.43
  contraction = 0.61
}
event "release" {
  inflow = { "release<i>" = 4.0 }
  outlet = { depth = ` + tail + ` }
}
`
}

// TestDiffJumpMove: a tailwater 5 cm higher moves the jump about 2.8 m
// upstream (revdiff's tests check the toes against Bélanger's equation).
// Every format reports the move with its toes, direction and tolerance,
// and none reads the jump's height as the profile's rise; a micrometre
// reads as a move of the computation; a model against itself has none.
// A no_rise limit of 0.1 m fails on the move (the surface does rise over
// its span), not on the micrometre.
//
// Source: common practice (no published source).
func TestDiffJumpMove(t *testing.T) {
	dir := t.TempDir()
	for name, src := range map[string]string{"old.chan.hcl": gateModel("1.00"), "new.chan.hcl": gateModel("1.05"),
		"tiny.chan.hcl":   gateModel("1.000001"),
		"rise.policy.hcl": "policy \"rise\" {\n  units = \"si\"\n  no_rise {\n    limit = 0.1\n  }\n}\n"} {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644))
	}
	pol := []string{"--policy", "./rise.policy.hcl"}
	runIn := func(dir string, o runOpts, args ...string) (int, string, string) {
		return runIn(dir, o, append(args, pol...)...)
	}
	code, out, errOut := runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--color", "never")
	require.Equal(t, exitFindings, code, errOut)
	assert.Regexp(t, `error: \[no_rise\] reach release<i>, event release, stations 16\.\d+–19\.\d+ m: the water surface rises 0\.76\d m`, out)
	assert.Contains(t, out, "the rise is the hydraulic jump's move")
	assert.Contains(t, out, "reach release<i>, event release: water surface +0.05 m at 200 m")
	assert.Regexp(t, `reach release<i>, event release: the hydraulic jump moved 2\.8\d m upstream, toe 19\.\d+ → 16\.\d+ m, F1 `, out)
	assert.Contains(t, out, "higher and the flow")
	assert.Contains(t, out, "the move exceeds the solver's toe-location tolerance")
	assert.NotRegexp(t, `water surface \+0\.[1-9]`, out, "the jump's height is not a rise of the profile")

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--format", "json")
	require.Equal(t, exitFindings, code)
	type move struct {
		Kind, Message       string
		Direction           *string
		FromStation         *float64 `json:"from_station"`
		ToStation           *float64 `json:"to_station"`
		Distance, Tolerance *float64
		OldFroude           *float64 `json:"old_froude"`
		NewFroude           *float64 `json:"new_froude"`
		Numerical           bool
		WSE                 *struct{ Delta, Station float64 } `json:"wse_difference"`
	}
	var doc struct {
		Comparisons []struct {
			Profiles []struct {
				WSERise struct{ Delta float64 } `json:"wse_rise"`
				Moves   []move                  `json:"jump_moves"`
			}
		}
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc), out)
	require.Len(t, doc.Comparisons[0].Profiles, 1)
	p := doc.Comparisons[0].Profiles[0]
	assert.InDelta(t, 0.05, p.WSERise.Delta, 1e-9)
	require.Len(t, p.Moves, 1)
	m := p.Moves[0]
	assert.Equal(t, "moved", m.Kind)
	require.NotNil(t, m.Direction)
	assert.Equal(t, "upstream", *m.Direction)
	require.NotNil(t, m.FromStation)
	require.NotNil(t, m.ToStation)
	require.NotNil(t, m.Distance)
	assert.InDelta(t, *m.ToStation-*m.FromStation, *m.Distance, 1e-3)
	assert.Less(t, *m.Distance, -2.0)
	require.NotNil(t, m.Tolerance)
	assert.Less(t, *m.Tolerance, 0.1)
	assert.False(t, m.Numerical)
	require.NotNil(t, m.WSE)
	assert.Greater(t, m.WSE.Delta, 0.5, "the jump's height, across the move")
	require.NotNil(t, m.OldFroude)
	require.NotNil(t, m.NewFroude)
	assert.Greater(t, *m.NewFroude, *m.OldFroude, "the toe moved up the M3 curve, to shallower, faster flow")
	assert.Contains(t, m.Message, "the hydraulic jump moved")

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--format", "markdown")
	require.Equal(t, exitFindings, code)
	assert.Contains(t, out, "**Hydraulic jumps moved, appeared or gone (1)**")
	assert.Regexp(t, `\| release&lt;i&gt; \| release \| the hydraulic jump moved 2\.8\d m upstream`, out)

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "tiny.chan.hcl", "--color", "never")
	require.Equal(t, exitOK, code)
	assert.Contains(t, out, "a move of the computation, not of the flow")
	assert.NotContains(t, out, "water surface +")

	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "old.chan.hcl", "--format", "json")
	require.Equal(t, exitOK, code)
	doc.Comparisons = nil
	require.NoError(t, json.Unmarshal([]byte(out), &doc), out)
	assert.Empty(t, doc.Comparisons[0].Profiles[0].Moves)
	assert.Contains(t, out, `"jump_moves": []`)
	code, out, _ = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "old.chan.hcl", "--color", "never")
	require.Equal(t, exitOK, code)
	assert.Contains(t, out, "1 pair of reach and event unchanged")
	assert.NotContains(t, out, "jump moved")

	code, _, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "review.html")
	require.Equal(t, exitFindings, code, errOut)
	page, err := os.ReadFile(filepath.Join(dir, "review.html"))
	require.NoError(t, err)
	assert.Contains(t, string(page), "<caption>Hydraulic jumps moved, appeared or gone (1)</caption>")
	assert.Regexp(t, `<tr><td class="name" dir="auto">release&lt;i&gt;</td><td class="name" dir="auto">release</td><td><bdi>the hydraulic jump moved 2\.8\d m upstream`, string(page))
	assert.NotContains(t, string(page), "release<i>")
	code, _, errOut = runIn(dir, runOpts{}, "diff", "old.chan.hcl", "new.chan.hcl", "--out", "review.md")
	require.Equal(t, exitFindings, code, errOut)
	page, err = os.ReadFile(filepath.Join(dir, "review.md"))
	require.NoError(t, err)
	assert.Contains(t, string(page), "**Hydraulic jumps moved, appeared or gone (1)**")
	assert.Regexp(t, `\| release&lt;i&gt; \| release \| the hydraulic jump moved 2\.8\d m upstream`, string(page))
}
