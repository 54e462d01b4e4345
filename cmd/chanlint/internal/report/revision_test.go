package report

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// revisionModel is a one-reach model whose bottom width is the parameter
// and whose names carry markup, so that escaping is exercised.
func revisionModel(width string) string {
	return `units = "si"
title = "Ditch <b>revision</b>"
section "ditch" {
  shape        = "trapezoid"
  bottom_width = ` + width + `
  side_slope   = 2
  height       = 0.8
  roughness    = 0.03
  lining       = "grass"
}
reach "ditch<i>" {
  from    = "top"
  to      = "outfall"
  length  = 300
  section = "ditch"
  slope   = 0.002
}
event "q<10>" {
  inflow = { "ditch<i>" = 1.2 }
  outlet = { condition = "normal" }
}
`
}

// revisionInput checks the two revisions through the pipeline and
// compares them, as `chanlint diff --out` does.
func revisionInput(t *testing.T, oldSrc, newSrc string) Input {
	t.Helper()
	dir := t.TempDir()
	pol := testPolicy(t)
	opts := pipeline.Options{Keep: pipeline.Keep{Solved: true}}
	check := func(name, src string) *pipeline.Result {
		path := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(path, []byte(src), 0o644))
		r := pipeline.CheckFile(pipeline.File{Name: name, Path: path}, pol, opts)
		require.False(t, r.Invalid, "%v", r.Findings)
		return r
	}
	old, prop := check("old.chan.hcl", oldSrc), check("new.chan.hcl", newSrc)
	d := revdiff.Compare(old, prop, pol)
	in := Input{Policy: pol, ToolVersion: "0.1.0-test"}
	in.Models = append(in.Models, Model{Model: prop.Model, Result: prop.Solution, Findings: prop.Findings, Revision: d})
	return in
}

// TestRevisionDrawn: a reach narrowed from 2.5 m to 1.0 m raises its
// normal-depth water surface; the proposed model's plots draw the
// existing surface below the proposed one, dashed, with a legend entry,
// and the section names the rise with escaped names. The page's plots
// stay well-formed and the Markdown variant carries the same section.
func TestRevisionDrawn(t *testing.T) {
	in := revisionInput(t, revisionModel("2.5"), revisionModel("1.0"))
	d := in.Models[0].Revision
	require.Len(t, d.Profiles, 1)
	require.Positive(t, d.Profiles[0].Rise.Delta, "a narrower reach raises the water surface")
	out := renderHTML(t, in)

	plots := strings.Count(out, "<svg ")
	require.Positive(t, plots)
	line := regexp.MustCompile(`<g class="existing"><title>Water surface of the existing revision old.chan.hcl</title>\n` +
		`<path d="M[0-9. L]+" fill="none" stroke="#a8467f" stroke-width="1.7" stroke-dasharray="9 2 2 2 2 2" stroke-linejoin="round"/>`)
	assert.Len(t, line.FindAllString(out, -1), plots)
	assert.Equal(t, plots, strings.Count(out, ">existing water surface<"))
	assert.Less(t, strings.Index(out, `stroke="#0072b2" stroke-width="1.9"`), strings.Index(out, `<g class="existing">`),
		"the existing surface is drawn over the proposed one")

	// The existing surface is lower: on the SVG's downward y axis its
	// first point lies below the proposed line's.
	firstY := func(re string) string {
		m := regexp.MustCompile(re).FindStringSubmatch(out)
		require.NotNil(t, m, re)
		return m[1]
	}
	oldY := firstY(`<g class="existing"><title>[^<]*</title>\n<path d="M[0-9.]+ ([0-9.]+)`)
	newY := firstY(`<path d="M[0-9.]+ ([0-9.]+)[^"]*" fill="none" stroke="#0072b2" stroke-width="1.9"`)
	oy, err := strconv.ParseFloat(oldY, 64)
	require.NoError(t, err)
	ny, err := strconv.ParseFloat(newY, 64)
	require.NoError(t, err)
	assert.Greater(t, oy, ny)

	assert.Contains(t, out, "<h3>Revision changes</h3>")
	assert.Contains(t, out, `Existing revision <span class="mono"><bdi>old.chan.hcl</bdi></span>`)
	rise := regexp.MustCompile(`<tr><td class="name" dir="auto">ditch&lt;i&gt;</td><td class="name" dir="auto">q&lt;10&gt;</td><td class="num">&#43;[0-9.]+ at [0-9.]+</td>`)
	assert.Regexp(t, rise, out)
	assert.Contains(t, out, "Reaches added: <bdi>none</bdi>. Reaches removed: <bdi>none</bdi>.")
	assert.NotContains(t, out, "<i>")
	assert.NotContains(t, out, "<b>revision")

	pg := build(in, renderer{plot: inlineSVG})
	for _, ev := range pg.Models[0].Events {
		for _, p := range ev.Plots {
			assertWellFormed(t, p.svg, p.ID)
			assertWellFormed(t, fileSVG(p.Plot), p.ID)
		}
	}

	var mdOut bytes.Buffer
	require.NoError(t, MarkdownInline(&mdOut, in))
	page := mdOut.String()
	assert.Contains(t, page, "### Revision changes\n\nExisting revision `old.chan.hcl`, proposed `new.chan.hcl`")
	assert.Regexp(t, `\| `+regexp.QuoteMeta(md("ditch<i>"))+` \| `+regexp.QuoteMeta(md("q<10>"))+` \| \+[0-9.]+ at [0-9.]+ \| `, page)
	assert.Contains(t, page, "Reaches added: none. Reaches removed: none.")

	// Without a comparison nothing of it is drawn.
	in.Models[0].Revision = nil
	plain := renderHTML(t, in)
	for _, s := range []string{`class="existing"`, "existing water surface", "Revision changes"} {
		assert.NotContains(t, plain, s)
	}
}

// A changed finding whose value moved never reads as unchanged: the two
// values print to the decimals that tell them apart.
func TestRevisionChangedValueMoved(t *testing.T) {
	old := rules.Finding{Rule: "shear_stress", HasValue: true, Value: 29.9959, Unit: "N/m²"}
	moved := old
	moved.Value = 29.9901
	rv := revisionSection(&revdiff.Diff{Changed: []revdiff.Change{{Old: old, New: moved}}}, "m")
	require.Len(t, rv.Changed, 1)
	assert.Equal(t, "30.00 → 29.99 N/m²", rv.Changed[0].Value)
}
