package sarifout

import (
	"bytes"
	"encoding/json"
	"math"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// TestStreamedResults: the streamed log is byte for byte what
// encoding/json writes for the go-sarif report (empty arrays pruned), for findings with hostile
// strings (markup, control characters, line separators, invalid UTF-8),
// extreme and non-finite numbers, ranges that do and do not match the
// source, exceptions and findings without a file.
//
// Source: common practice (no published source) — go-sarif's types
// encoded by json.MarshalIndent as the reference encoding.
func TestStreamedResults(t *testing.T) {
	srcText := []byte("units = \"si\"\nreach \"a\u00e9\U0001F469b\" {\n  length = 5\n}\n\xff\xfe bad\nlast line\n")
	text := rapid.StringOf(rapid.SampledFrom([]rune("ab <>&\"\\\x00\x01\b\f\n\r\t\x7f\u2028\u2029é\U0001F469–\ufffd")))
	num := rapid.OneOf(rapid.Float64(), rapid.SampledFrom([]float64{0, math.Copysign(0, -1), 1e-7, -3e-9, 1e21, 123456789.125, math.NaN(), math.Inf(1), 0.1 + 0.2}))
	pos := rapid.Custom(func(t *rapid.T) hcl.Pos {
		return hcl.Pos{Line: rapid.IntRange(0, 8).Draw(t, "line"), Column: rapid.IntRange(0, 20).Draw(t, "col"), Byte: rapid.IntRange(-1, len(srcText)+2).Draw(t, "byte")}
	})
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(0, 12).Draw(t, "n")
		files := []string{"/srv/m/a.chan.hcl", "/srv/m/b c.chan.hcl", "/srv/m/../m/a.chan.hcl", "/elsewhere/x.chan.hcl", ""}
		var fs []rules.Finding
		var units []string
		for range n {
			f := rules.Finding{
				Rule:     rapid.SampledFrom([]string{"freeboard", "model", "unknown_rule"}).Draw(t, "rule"),
				Severity: rapid.SampledFrom([]policies.Severity{policies.Error, policies.Warning, policies.Info, "odd"}).Draw(t, "sev"),
				Message:  text.Draw(t, "msg"),
				Range:    hcl.Range{Filename: rapid.SampledFrom(files).Draw(t, "file"), Start: pos.Draw(t, "start"), End: pos.Draw(t, "end")},
				Reach:    text.Draw(t, "reach"), Event: text.Draw(t, "event"), Reference: text.Draw(t, "ref"),
				HasSpan: rapid.Bool().Draw(t, "span"), FromStation: num.Draw(t, "from"), ToStation: num.Draw(t, "to"),
				HasValue: rapid.Bool().Draw(t, "value"), Value: num.Draw(t, "v"), Limit: num.Draw(t, "l"),
			}
			for range rapid.IntRange(0, 3).Draw(t, "related") {
				f.Related = append(f.Related, rules.Related{Label: text.Draw(t, "label"),
					Range: hcl.Range{Filename: rapid.SampledFrom(append(files, "pack:baseline")).Draw(t, "relfile"), Start: pos.Draw(t, "relstart"), End: pos.Draw(t, "relend")}})
			}
			if rapid.Bool().Draw(t, "excepted") {
				f.Excepted, f.ExceptionReason = true, text.Draw(t, "reason")
				if rapid.Bool().Draw(t, "exrange") {
					f.ExceptionRange = hcl.Range{Filename: rapid.SampledFrom(files).Draw(t, "exfile"), Start: pos.Draw(t, "exstart"), End: pos.Draw(t, "exend")}
				}
			}
			fs = append(fs, f)
			units = append(units, rapid.SampledFrom([]string{"ft", "m", ""}).Draw(t, "unit"))
		}
		var states []string
		if rapid.Bool().Draw(t, "baseline") {
			for range fs {
				states = append(states, rapid.SampledFrom([]string{"new", "unchanged", ""}).Draw(t, "state"))
			}
		}
		var problems []Problem
		if rapid.Bool().Draw(t, "problems") {
			problems = append(problems, Problem{Message: text.Draw(t, "problem"),
				Range: hcl.Range{Filename: rapid.SampledFrom(files).Draw(t, "pfile"), Start: pos.Draw(t, "pstart"), End: pos.Draw(t, "pend")}})
		}
		in := Input{Findings: fs, BaselineStates: states, Problems: problems, Rules: registry(), Root: "/srv", ToolVersion: "1.2.3",
			Sources: map[string][]byte{"/srv/m/a.chan.hcl": srcText}, Units: units}
		var got bytes.Buffer
		require.NoError(t, Write(&got, in))
		rep, err := Build(in)
		require.NoError(t, err)
		raw, err := json.Marshal(rep)
		require.NoError(t, err)
		pruned, _, err := pruneEmptyArrays(raw)
		require.NoError(t, err)
		var indented bytes.Buffer
		require.NoError(t, json.Indent(&indented, pruned, "", "  "))
		want := indented.Bytes()
		if !bytes.Equal(got.Bytes(), append(want, '\n')) {
			t.Fatalf("streamed log differs from encoding/json's:\n%s\n---\n%s", got.String(), want)
		}
	})
}
