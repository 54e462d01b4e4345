package report

import (
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/checklist"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// tagRE matches an element's start or end tag; the page's attribute
// values are escaped, so a '>' ends the tag.
var tagRE = regexp.MustCompile(`<(/?)([a-zA-Z][a-zA-Z0-9]*)[^>]*?(/?)>`)

// voidElements are the HTML elements of the page without an end tag.
var voidElements = map[string]bool{"meta": true, "br": true}

// unbalanced returns the first element that is closed out of order or
// left open, "" when every element the page opens it closes, innermost
// first.
func unbalanced(page string) string {
	var open []string
	for _, m := range tagRE.FindAllStringSubmatch(page, -1) {
		closing, name, self := m[1] == "/", m[2], m[3] == "/"
		switch {
		case self || (!closing && voidElements[name]):
		case !closing:
			open = append(open, name)
		case len(open) == 0 || open[len(open)-1] != name:
			return "</" + name + "> closes <" + strings.Join(open, "><") + ">"
		default:
			open = open[:len(open)-1]
		}
	}
	if len(open) > 0 {
		return "left open: <" + strings.Join(open, "><") + ">"
	}
	return ""
}

// TestSectionTagsBalance: the models' sections, written in Go, nest every
// element they open, whatever the model holds: findings, exceptions,
// culverts, a sensitivity run, a revision, an unsolved model and an
// invalid file; and each findings row is there once, with its anchor.
//
// Source: common practice (no published source) — a well-nested page is
// what an HTML parser builds without repairs.
func TestSectionTagsBalance(t *testing.T) {
	inputs := map[string]Input{
		"fixtures": fixtureInput(t, "heron-flats.chan.hcl", "inject.chan.hcl"),
		"demo":     solvedInput(t, demoModel),
		"varied":   variedInput(t, "roughness=0.2,tailwater=0.3", demoModel),
		"revision": revisionInput(t, revisionModel("2.5"), revisionModel("1.0")),
	}
	unsolved := fixtureInput(t, "heron-flats.chan.hcl")
	unsolved.Models[0].Result = nil
	unsolved.Invalid = []rules.Finding{{Rule: "model", Severity: policies.Error, Message: "a <b>diagnostic</b>",
		Range: hcl.Range{Filename: "bad.chan.hcl", Start: hcl.Pos{Line: 1, Column: 1}}}}
	inputs["unsolved"] = unsolved
	for name, in := range inputs {
		for i := range in.Models {
			m := &in.Models[i]
			m.Coverage = checklist.Build(m.Model, m.Result, in.Policy, m.Findings)
			m.NotEvaluated = []string{"a <criterion> & its reason"}
			m.SHA256 = "0123abcd"
		}
		require.NotEmpty(t, in.Models[0].Coverage, name)
		page := renderHTML(t, in)
		assert.Empty(t, unbalanced(page), name)
		for mi, m := range in.Models {
			for i := range m.Findings {
				id := `id="m` + strconv.Itoa(mi+1) + `-f` + strconv.Itoa(i+1) + `"`
				assert.Equal(t, 1, strings.Count(page, id), "%s: findings row %s", name, id)
			}
		}
	}
	require.NotEmpty(t, inputs["demo"].Models[0].Findings)
	assert.NotEmpty(t, unbalanced("<table><tr><td></tr></table>"), "the check can fail")
}

// TestPageIdsUniqueAndLinked: every id of a page is unique, made of
// lower-case letters, digits and '-' (so a link needs no URL escaping),
// and every in-page link has its target, even for events whose names
// differ only in case, are written in another script, or read like the
// page's own ids ("f1", "findings", "plot1").
//
// Source: common practice (no published source) — an HTML id must be
// unique in its document for a fragment link to reach it.
func TestPageIdsUniqueAndLinked(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("testdata", "heron-flats.chan.hcl"))
	require.NoError(t, err)
	text := string(src)
	i := strings.Index(text, "\nevent ")
	require.Positive(t, i, "the fixture has events")
	block := text[i:]
	block = block[:strings.Index(block, "\n}\n")+3]
	name := regexp.MustCompile(`event "([^"]+)"`).FindStringSubmatch(block)[1]
	for _, ev := range []string{"Q-25", "q 25", "f1", "findings", "plot1", "洪水", "наводнение"} {
		text += strings.Replace(block, `"`+name+`"`, `"`+ev+`"`, 1)
	}
	path := filepath.Join(t.TempDir(), "events.chan.hcl")
	require.NoError(t, os.WriteFile(path, []byte(text), 0o644))
	page := renderHTML(t, solvedInput(t, path, path))

	ids := map[string]int{}
	for _, m := range regexp.MustCompile(`\sid="([^"]*)"`).FindAllStringSubmatch(page, -1) {
		ids[m[1]]++
	}
	valid := regexp.MustCompile(`^[a-z0-9-]+$`)
	for id, n := range ids {
		assert.Equal(t, 1, n, "id %q", id)
		assert.Regexp(t, valid, id)
	}
	links := regexp.MustCompile(`href="#([^"]*)"`).FindAllStringSubmatch(page, -1)
	require.NotEmpty(t, links)
	for _, l := range links {
		assert.Contains(t, ids, l[1], "link #%s", l[1])
	}
	assert.Contains(t, ids, "m1-ev-q-25")
	assert.Contains(t, ids, "m1-ev-q-25-2")
	assert.Contains(t, ids, "m2-ev-f1")
	assert.Contains(t, ids, "m1-ev-x-2", "two names in other scripts")
}
