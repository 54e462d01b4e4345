package sarifout

import (
	"bytes"
	"encoding/json"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/owenrumney/go-sarif/v3/pkg/report/v210/sarif"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var update = flag.Bool("update", false, "rewrite the golden SARIF logs in testdata")

const root = "/srv/drainage" // an absolute root so the golden logs do not depend on the machine

// src is an invented demo model. The reach label holds a family emoji: one
// grapheme cluster for HCL, 5 code points, 8 UTF-16 code units.
var src = []byte("units = \"si\"\n" +
	"title = \"Alder Flats outfall\"\n" +
	"reach \"a\U0001F469\u200D\U0001F469\u200D\U0001F467b\" { length = 5 }\n" +
	"exception \"freeboard\" { reason = \"Reviewed with the <drainage> authority & \\\"county\\\"\" }\n")

const file = root + "/models/alder.chan.hcl"

// ranges parses src with HCL itself so the ranges are the ones the model
// package produces.
func ranges(t *testing.T) (title, length, label, exc hcl.Range) {
	t.Helper()
	f, diags := hclsyntax.ParseConfig(src, file, hcl.InitialPos)
	require.False(t, diags.HasErrors(), diags.Error())
	body := f.Body.(*hclsyntax.Body)
	title = body.Attributes["title"].Expr.Range()
	var reach, ex *hclsyntax.Block
	for _, b := range body.Blocks {
		switch b.Type {
		case "reach":
			reach = b
		case "exception":
			ex = b
		}
	}
	length = reach.Body.Attributes["length"].Expr.Range()
	label = reach.LabelRanges[0]
	exc = ex.DefRange()
	return
}

func registry() []*rules.Rule {
	return []*rules.Rule{
		{RuleSpec: policies.RuleSpec{ID: "capacity", Severity: policies.Error, AlwaysOn: true}, Title: "Water surface within the section",
			Doc: rules.Doc{Checks: "Reports points where the water surface rises above the section height.", Remedies: "Raise the lining or enlarge the section."}},
		{RuleSpec: policies.RuleSpec{ID: "freeboard", Severity: policies.Error}, Title: "Freeboard above the water surface",
			Doc: rules.Doc{Checks: "Checks top of bank minus water surface against the larger of a minimum and a fraction of the depth."}},
		{RuleSpec: policies.RuleSpec{ID: "froude_band", Severity: policies.Warning}, Title: "Froude number outside unstable bands",
			Doc: rules.Doc{Checks: "Near-critical flow (Froude 0.89–1.13) forms unstable waves.", Sources: []string{"Brown & Clyde, HEC-11, 1989"}}},
		{RuleSpec: policies.RuleSpec{ID: "model", Severity: policies.Error, AlwaysOn: true}, Title: "Model file is valid", Doc: rules.Doc{Checks: "The file could not be decoded."}},
	}
}

func findings(t *testing.T) []rules.Finding {
	_, length, label, exc := ranges(t)
	rel := "models/birch lane.chan.hcl"
	return []rules.Finding{
		{Rule: "freeboard", Severity: policies.Error, Message: "freeboard 0.18 m is below the required 0.30 m",
			Range: length, Reach: "a\U0001F469\u200D\U0001F469\u200D\U0001F467b", Event: "q100",
			FromStation: 1.5, ToStation: 4.25, HasSpan: true, Value: 0.18, Limit: 0.30, HasValue: true,
			Reference: "County Drainage Criteria Manual, ch. 5",
			Excepted:  true, ExceptionReason: "Reviewed with the <drainage> authority & \"county\"", ExceptionRange: exc,
			Related: []rules.Related{
				{Label: "limit freeboard.minimum", Range: hcl.Range{Filename: "pack:baseline", Start: hcl.Pos{Line: 22, Column: 15}, End: hcl.Pos{Line: 22, Column: 18}}},
				{Label: "exception", Range: exc},
			}},
		{Rule: "froude_band", Severity: policies.Info, Message: "Froude number 0.95 in the avoided band 0.89–1.13",
			Range: label, Reach: "a\U0001F469\u200D\U0001F469\u200D\U0001F467b", Event: "q10",
			FromStation: 0, ToStation: 5, HasSpan: true, Value: 0.95, Limit: 0.89, HasValue: true},
		{Rule: "solver", Severity: policies.Warning, Message: "critical depth taken at station 3.0",
			Range: length, Reach: "a\U0001F469\u200D\U0001F469\u200D\U0001F467b", Event: "q10",
			FromStation: 3, ToStation: 3, HasSpan: true},
		// A model finding in another file with no source given: HCL columns kept.
		{Rule: "model", Severity: policies.Error, Message: `unknown section "lined"`,
			Range: hcl.Range{Filename: root + "/" + rel, Start: hcl.Pos{Line: 4, Column: 13, Byte: 60}, End: hcl.Pos{Line: 4, Column: 20, Byte: 67}}},
	}
}

func input(t *testing.T, fs []rules.Finding) Input {
	return Input{Findings: fs, Rules: registry(), Root: root, Sources: map[string][]byte{file: src}, ToolVersion: "0.1.0"}
}

func render(t *testing.T, in Input) []byte {
	t.Helper()
	var buf bytes.Buffer
	require.NoError(t, Write(&buf, in))
	return buf.Bytes()
}

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	p := filepath.Join("testdata", name)
	if *update {
		require.NoError(t, os.WriteFile(p, got, 0o644))
	}
	want, err := os.ReadFile(p)
	require.NoError(t, err, "run go test -update to create %s", p)
	assert.Equal(t, string(want), string(got), "golden %s differs; inspect, then go test -update", p)
}

// validate checks the written bytes, not only the Go value, against the
// SARIF 2.1.0 schema the library embeds.
func validate(t *testing.T, out []byte) *sarif.Report {
	t.Helper()
	rep, err := sarif.FromBytes(out)
	require.NoError(t, err)
	require.NoError(t, rep.Validate())
	return rep
}

func TestEmptyLog(t *testing.T) {
	out := render(t, input(t, nil))
	rep := validate(t, out)
	require.Len(t, rep.Runs, 1)
	assert.Empty(t, rep.Runs[0].Results)
	assert.Contains(t, string(out), `"results": []`, "GitHub needs the results array even when empty")
	assert.Len(t, rep.Runs[0].Tool.Driver.Rules, 4)
	golden(t, "empty.sarif", out)
}

func TestFindingsLog(t *testing.T) {
	out := render(t, input(t, findings(t)))
	rep := validate(t, out)
	golden(t, "findings.sarif", out)

	run := rep.Runs[0]
	require.Equal(t, "2.1.0", rep.Version)
	require.Equal(t, ColumnKind, *run.ColumnKind)
	require.Len(t, run.Results, 4)
	// "solver" is not in the registry given: added so its ruleIndex is valid.
	require.Len(t, run.Tool.Driver.Rules, 5)
	for _, r := range run.Results {
		idx := r.RuleIndex
		require.True(t, idx >= 0 && idx < len(run.Tool.Driver.Rules))
		assert.Equal(t, *r.RuleID, *run.Tool.Driver.Rules[idx].ID)
		require.Len(t, r.Locations, 1)
		al := r.Locations[0].PhysicalLocation.ArtifactLocation
		assert.Equal(t, BaseID, *al.URIBaseID)
		assert.Equal(t, *run.Artifacts[al.Index].Location.URI, *al.URI)
	}
	assert.Equal(t, "models/alder.chan.hcl", *run.Results[0].Locations[0].PhysicalLocation.ArtifactLocation.URI)
	assert.Equal(t, "models/birch%20lane.chan.hcl", *run.Results[3].Locations[0].PhysicalLocation.ArtifactLocation.URI)
	assert.Equal(t, "file:///srv/drainage/", *run.OriginalUriBaseIds[BaseID].URI)

	// Levels: info becomes note.
	assert.Equal(t, "error", run.Results[0].Level)
	assert.Equal(t, "note", run.Results[1].Level)
	assert.Equal(t, "warning", run.Results[2].Level)

	// Suppression of the excepted finding, with the reason verbatim.
	require.Len(t, run.Results[0].Suppressions, 1)
	s := run.Results[0].Suppressions[0]
	assert.Equal(t, "inSource", *s.Kind)
	assert.Equal(t, `Reviewed with the <drainage> authority & "county"`, *s.Justification)
	assert.Equal(t, 4, *s.Location.PhysicalLocation.Region.StartLine)
	assert.Empty(t, run.Results[1].Suppressions)

	// Properties.
	p := run.Results[0].Properties.Properties
	assert.Equal(t, "q100", p["event"])
	assert.InDelta(t, 4.25, p["to_station"], 0) // copied, not computed
	assert.InDelta(t, 0.30, p["limit"], 0)

	// Caution as an invocation notification.
	require.Len(t, run.Invocations, 1)
	assert.True(t, *run.Invocations[0].ExecutionSuccessful)
	require.Len(t, run.Invocations[0].ToolExecutionNotifications, 1)
	assert.Equal(t, rules.Caution, *run.Invocations[0].ToolExecutionNotifications[0].Message.Text)
}

func TestColumnsFromBytes(t *testing.T) {
	out := render(t, input(t, findings(t)))
	rep := validate(t, out)
	_, length, _, _ := ranges(t)
	// HCL counts the emoji as one column.
	// Source: Unicode UAX #29 (grapheme clusters) and UTF-16 (RFC 2781),
	// counted by hand: `reach "a` is 8 units, the emoji 3×2 surrogate
	// units + 2 joiners = 8, `b" { length = ` 14, so "5" is at UTF-16
	// column 8+8+14+1 = 31 while HCL's grapheme column is 8+1+14+1 = 24.
	require.Equal(t, 24, length.Start.Column)
	reg := rep.Runs[0].Results[0].Locations[0].PhysicalLocation.Region
	assert.Equal(t, 3, *reg.StartLine)
	assert.Equal(t, 31, *reg.StartColumn)
	assert.Equal(t, 32, *reg.EndColumn, "end column is exclusive in both HCL and SARIF")
	assert.Equal(t, length.Start.Byte, reg.ByteOffset)
	assert.Equal(t, 1, *reg.ByteLength)
	// Character offset: line 1 (13) + line 2 (30) + 30 units on line 3.
	assert.Equal(t, 13+30+30, reg.CharOffset)
	// No source given for the second file: HCL columns as they are, no offsets.
	reg = rep.Runs[0].Results[3].Locations[0].PhysicalLocation.Region
	assert.Equal(t, 13, *reg.StartColumn)
	assert.Equal(t, 20, *reg.EndColumn)
	assert.Equal(t, -1, reg.ByteOffset)
}

func fp(t *testing.T, out []byte, i int) string {
	rep := validate(t, out)
	return rep.Runs[0].Results[i].PartialFingerprints[FingerprintKey]
}

func TestFingerprintsIgnoreLines(t *testing.T) {
	base := findings(t)
	moved := findings(t)
	for i := range moved {
		moved[i].Range.Start.Line += 10
		moved[i].Range.End.Line += 10
	}
	a, b := render(t, input(t, base)), render(t, input(t, moved))
	for i := range base {
		assert.Equal(t, fp(t, a, i), fp(t, b, i))
	}
	// A small hydraulic change (a span end moves, the measured value
	// drifts) keeps every alert's identity; another kind of message does not.
	changed := findings(t)
	changed[0].ToStation = 4.5
	changed[0].Value = 0.17
	changed[0].Message = "freeboard 0.17 m is below the required 0.30 m"
	c := render(t, input(t, changed))
	assert.Equal(t, fp(t, a, 0), fp(t, c, 0), "a span end that moves keeps the alert")
	assert.Equal(t, fp(t, a, 1), fp(t, c, 1))
	changed[0].Message = "the channel overtops here"
	d := render(t, input(t, changed))
	assert.NotEqual(t, fp(t, a, 0), fp(t, d, 0))
}

// The written log has no empty arrays (but a run's results, which SARIF
// reads as "checked, nothing found"), each artifact once, and every rule
// with a name and a help URI that points at its README section.
func TestLogShape(t *testing.T) {
	for _, fs := range [][]rules.Finding{nil, findings(t)} {
		out := string(render(t, input(t, fs)))
		for _, line := range strings.Split(out, "\n") {
			if strings.HasSuffix(strings.TrimSpace(line), "[]") || strings.HasSuffix(strings.TrimSpace(line), "[],") {
				assert.Contains(t, line, `"results": []`, "empty array: %s", line)
			}
		}
		rep := validate(t, []byte(out))
		seen := map[string]bool{}
		for _, a := range rep.Runs[0].Artifacts {
			assert.False(t, seen[*a.Location.URI], "artifact %s twice", *a.Location.URI)
			seen[*a.Location.URI] = true
		}
		for _, r := range rep.Runs[0].Tool.Driver.Rules {
			require.NotNil(t, r.Name, r.ID)
			require.NotNil(t, r.HelpURI, r.ID)
		}
	}
	assert.Equal(t, "MaxVelocity", RuleName("max_velocity"))
}

// Problems make the invocation unsuccessful and become error
// notifications with their location, ahead of the caution.
func TestProblemsAreNotifications(t *testing.T) {
	in := input(t, nil)
	in.Problems = []Problem{{Message: "team.policy.hcl:3:11: error: Invalid units",
		Range: hcl.Range{Filename: "/srv/drainage/team.policy.hcl", Start: hcl.Pos{Line: 3, Column: 11}, End: hcl.Pos{Line: 3, Column: 19}}}}
	rep := validate(t, render(t, in))
	inv := rep.Runs[0].Invocations[0]
	require.NotNil(t, inv.ExecutionSuccessful)
	assert.False(t, *inv.ExecutionSuccessful)
	require.Len(t, inv.ToolExecutionNotifications, 2)
	n := inv.ToolExecutionNotifications[0]
	assert.Equal(t, "error", n.Level)
	assert.Contains(t, *n.Message.Text, "Invalid units")
	assert.Equal(t, "team.policy.hcl", *n.Locations[0].PhysicalLocation.ArtifactLocation.URI)
	assert.Equal(t, rules.Caution, *inv.ToolExecutionNotifications[1].Message.Text)
}

// TestProblemsLog keeps the whole log of a run that could not check
// everything: a problem in a model with its source (byte offsets and
// UTF-16 columns), one in a policy beside it with no source (HCL
// columns kept), one outside the root, and one with no file.
func TestProblemsLog(t *testing.T) {
	_, length, _, _ := ranges(t)
	in := input(t, findings(t)[1:2])
	in.Problems = []Problem{
		{Message: "models/alder.chan.hcl: not checked: Value must be positive", Range: length},
		{Message: "team.policy.hcl:3:11: error: Invalid units",
			Range: hcl.Range{Filename: root + "/team.policy.hcl", Start: hcl.Pos{Line: 3, Column: 11, Byte: -1}, End: hcl.Pos{Line: 3, Column: 12, Byte: -1}}},
		{Message: "/elsewhere/base.policy.hcl:1:1: error: Cannot read policy",
			Range: hcl.Range{Filename: "/elsewhere/base.policy.hcl", Start: hcl.Pos{Line: 1, Column: 1, Byte: -1}, End: hcl.Pos{Line: 1, Column: 2, Byte: -1}}},
		{Message: "chanlint check: the policy or baseline could not be used"},
	}
	out := render(t, in)
	rep := validate(t, out)
	golden(t, "problems.sarif", out)
	inv := rep.Runs[0].Invocations[0]
	require.Len(t, inv.ToolExecutionNotifications, 5)
	for i, n := range inv.ToolExecutionNotifications[:3] {
		require.Len(t, n.Locations, 1, "problem %d", i)
	}
	assert.Empty(t, inv.ToolExecutionNotifications[3].Locations)
}

func TestDuplicateFindingsGetDistinctFingerprints(t *testing.T) {
	f := findings(t)[1]
	out := render(t, input(t, []rules.Finding{f, f}))
	assert.NotEqual(t, fp(t, out, 0), fp(t, out, 1))
}

func TestDeterministicAndFinite(t *testing.T) {
	a := render(t, input(t, findings(t)))
	b := render(t, input(t, findings(t)))
	assert.Equal(t, a, b)
	var v any
	require.NoError(t, json.Unmarshal(a, &v))
}

func TestRelativeRootAndOutside(t *testing.T) {
	in := input(t, []rules.Finding{{Rule: "model", Severity: policies.Error, Message: "x",
		Range: hcl.Range{Filename: "/elsewhere/c.chan.hcl", Start: hcl.Pos{Line: 1, Column: 1}, End: hcl.Pos{Line: 1, Column: 2, Byte: 1}}}})
	rep := validate(t, render(t, in))
	al := rep.Runs[0].Results[0].Locations[0].PhysicalLocation.ArtifactLocation
	assert.Equal(t, "file:///elsewhere/c.chan.hcl", *al.URI)
	assert.Nil(t, al.URIBaseID)

	in.Root = ""
	in.Findings[0].Rename("models/c.chan.hcl")
	rep = validate(t, render(t, in))
	al = rep.Runs[0].Results[0].Locations[0].PhysicalLocation.ArtifactLocation
	assert.Equal(t, "models/c.chan.hcl", *al.URI)
	assert.Equal(t, BaseID, *al.URIBaseID)
	assert.Nil(t, rep.Runs[0].OriginalUriBaseIds[BaseID].URI)
}

// TestStaleApprovalLocatedInItsFile: a finding in another file than its
// model (a stale approval, in the approvals file) is located in that
// file, and its message gives the stations in its model's unit, which
// Units carries per finding.
func TestStaleApprovalLocatedInItsFile(t *testing.T) {
	approvals := root + "/review/approvals.hcl"
	stale := rules.Finding{Rule: "unused_exception", Severity: policies.Warning, Message: "stale approval",
		Range: hcl.Range{Filename: approvals, Start: hcl.Pos{Line: 11, Column: 1}, End: hcl.Pos{Line: 11, Column: 9}},
		Reach: "drain", FromStation: 0, ToStation: 150, HasSpan: true}
	in := input(t, []rules.Finding{stale, findings(t)[1]})
	in.Units = []string{"ft", "m"}
	rep := validate(t, render(t, in))
	res := rep.Runs[0].Results
	require.Len(t, res, 2)
	assert.Equal(t, "review/approvals.hcl", *res[0].Locations[0].PhysicalLocation.ArtifactLocation.URI)
	assert.Equal(t, 11, *res[0].Locations[0].PhysicalLocation.Region.StartLine)
	assert.Contains(t, *res[0].Message.Text, "stations 0–150 ft")
	assert.Equal(t, "models/alder.chan.hcl", *res[1].Locations[0].PhysicalLocation.ArtifactLocation.URI)
	assert.Contains(t, *res[1].Message.Text, " m: ")
}

// A negative zero reaches SARIF's result properties as 0, in both writers.
func TestNegativeZeroProperty(t *testing.T) {
	negZero := math.Copysign(0, -1)
	assert.Equal(t, any(0.0), finite(negZero))
	assert.False(t, math.Signbit(finite(negZero).(float64)))
	e := jsonWriter{}
	e.float(negZero)
	assert.Equal(t, "0", string(e.b))
}
