package rules

import (
	"flag"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var updateREADME = flag.Bool("update-readme", false, "rewrite the generated rule tables of ../README.md from the registry")

const readmePath = "../README.md"

// TestREADME: the README's rule tables are generated from the registry
// (go test ./rules -update-readme rewrites them), and every rule has a
// section of its own in README's "Rules".
func TestREADME(t *testing.T) {
	src, err := os.ReadFile(readmePath)
	require.NoError(t, err)
	text := string(src)
	out := text
	for name, gen := range map[string]func() string{"rules": ruleTable, "rule-blocks": blockTable} {
		begin, end := "<!-- generated: "+name+" -->\n", "<!-- end: "+name+" -->\n"
		i, j := strings.Index(out, begin), strings.Index(out, end)
		require.True(t, i >= 0 && j > i, "README lacks the markers %q and %q", begin, end)
		out = out[:i+len(begin)] + gen() + out[j:]
	}
	if *updateREADME {
		require.NoError(t, os.WriteFile(readmePath, []byte(out), 0o644))
		return
	}
	assert.Equal(t, out, text, "README's generated rule tables differ from the registry; run go test ./rules -update-readme")
	for _, r := range All() {
		assert.Regexp(t, regexp.MustCompile("(?m)^### `"+regexp.QuoteMeta(r.ID)+"`"), text, "README has no section for rule %s", r.ID)
	}
}

// ruleTable is the README table of every rule.
func ruleTable() string {
	var b strings.Builder
	b.WriteString("| id | default | title |\n| --- | --- | --- |\n")
	for _, r := range All() {
		sev := string(r.Severity)
		if r.AlwaysOn {
			sev += ", always on"
		}
		b.WriteString("| `" + r.ID + "` | " + sev + " | " + r.Title + " |\n")
	}
	return b.String()
}

// blockTable is the README table of the configurable rules' blocks.
func blockTable() string {
	var b strings.Builder
	b.WriteString("| Block | Settings | Default severity |\n|---|---|---|\n")
	for _, r := range All() {
		if r.AlwaysOn {
			continue
		}
		var parts []string
		for i := range r.Settings {
			parts = append(parts, readmeSetting(&r.Settings[i]))
		}
		for _, g := range r.Together {
			parts = append(parts, g.String())
		}
		settings := strings.Join(parts, "; ")
		if settings == "" {
			settings = "none besides the common ones"
		}
		b.WriteString("| `" + r.ID + "` | " + settings + " | " + string(r.Severity) + " |\n")
	}
	return b.String()
}

// readmeSetting describes one setting in a table cell.
func readmeSetting(s *policies.Setting) string {
	if s.Kind == policies.Choice {
		words := make([]string, len(s.Choices))
		for i, c := range s.Choices {
			words[i] = "`\"" + c + "\"`"
		}
		return "`" + s.Name + "` " + s.Doc + " (" + strings.Join(words, " or ") + "; default `\"" + s.Choices[0] + "\"`)"
	}
	form := s.Quantity.Word()
	if si, us := s.Quantity.Unit("si"), s.Quantity.Unit("us"); si != "" {
		form += ", " + si + " or " + us
	}
	form += ", " + s.Bounds.String()
	switch s.Kind {
	case policies.PerLining:
		form = "by lining: a number or `{ LINING = v, ..., default = v }`; " + form
	case policies.FroudeBands:
		form = "`[[low, high], ...]`; " + form
	}
	switch {
	case s.Required:
		form += "; required"
	case s.Kind == policies.Number:
		form += "; default " + numfmt.Num(s.Default)
	}
	return "`" + s.Name + "` " + s.Doc + " (" + form + ")"
}
