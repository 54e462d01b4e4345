package report

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func renderHTML(t testing.TB, in Input) string {
	t.Helper()
	var buf bytes.Buffer
	require.NoError(t, HTML(&buf, in))
	return buf.String()
}

func TestHTMLStructure(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	require.NotEmpty(t, in.Models[0].Findings, "the fixture should fail some criteria")
	out := renderHTML(t, in)
	assert.Contains(t, out, "<!DOCTYPE html>")
	assert.Contains(t, out, "Heron Flats outfall channel")
	assert.Contains(t, out, rules.Caution)
	assert.Contains(t, out, in.Policy.Name)
	// Two events: each a main-stem plot and one small plot (chute).
	assert.Equal(t, 4, strings.Count(out, "<svg "))
	assert.Contains(t, out, "main stem: long-ditch → outfall")
	assert.Contains(t, out, "reach chute")
	assert.Contains(t, out, "jump F₁")
	assert.Contains(t, out, "gate chute-gate")
	assert.Contains(t, out, "basin apron")
	assert.Contains(t, out, "bend mill-bend")
	assert.Contains(t, out, "Tailwater from the river governs")
	// Self-contained: no external resources, no scripts.
	for _, bad := range []string{"<script", "<link", "src=", "href=\"http", "@import", "url(http"} {
		assert.NotContains(t, out, bad)
	}
	assert.NotContains(t, out, "NaN")
	assert.NotRegexp(t, `\bInf\b`, out) // "Info" is a word of the page
	// Printed pages carry the report and model names at the top (escaped
	// for the CSS string) and a page counter.
	assert.Regexp(t, `@top-left \{ content: "Channel design review — [^"<>]+";`, out)
	assert.Contains(t, out, `@bottom-right { content: "page " counter(page) " of " counter(pages);`)
	// One word for the lowest severity, as in text, JSON and SARIF.
	assert.Contains(t, out, `<span class="l">info</span>`)
	assert.NotRegexp(t, `(?i)>notes?<|\binfos\b`, out)
}

func TestHTMLDeterministic(t *testing.T) {
	a := renderHTML(t, fixtureInput(t, "heron-flats.chan.hcl"))
	b := renderHTML(t, fixtureInput(t, "heron-flats.chan.hcl"))
	assert.Equal(t, a, b)
}

func TestHTMLEscapesModelStrings(t *testing.T) {
	in := fixtureInput(t, "inject.chan.hcl")
	// Add an invalid file whose diagnostic quotes markup.
	in.Invalid = []rules.Finding{{Rule: "model", Severity: policies.Error,
		Message: `unknown section "<script>alert(3)</script>"`, Range: hcl.Range{Filename: "bad<script>.chan.hcl", Start: hcl.Pos{Line: 2, Column: 3}}}}
	in.Policy.Reference = `Manual <script>alert("ref")</script> & co`
	out := renderHTML(t, in)
	assert.NotContains(t, out, "<script")
	assert.NotContains(t, out, "<img")
	assert.NotContains(t, out, "<svg onload")
	assert.NotContains(t, out, "<b>bold")
	assert.NotContains(t, out, `" onmouseover="`)
	assert.Contains(t, out, "&lt;script&gt;alert(&#39;title&#39;)&lt;/script&gt; Quarry &amp; &#34;Mill&#34;")
	assert.Contains(t, out, "&lt;/td&gt;&lt;/tr&gt;&lt;/table&gt;&lt;script&gt;alert(&#39;reason&#39;)")
	assert.Contains(t, out, "Manual &lt;script&gt;")
	// The only tags are the page's own.
	tags := regexp.MustCompile(`<([a-zA-Z][a-zA-Z0-9]*)`).FindAllStringSubmatch(out, -1)
	allowed := map[string]bool{"html": true, "head": true, "meta": true, "title": true, "style": true, "body": true, "header": true,
		"p": true, "h1": true, "h2": true, "h3": true, "h4": true, "span": true, "aside": true, "strong": true, "section": true,
		"div": true, "table": true, "thead": true, "tbody": true, "tr": true, "th": true, "td": true, "a": true, "dl": true,
		"dt": true, "dd": true, "nav": true, "ol": true, "li": true, "figure": true, "figcaption": true, "svg": true,
		"desc": true, "rect": true, "text": true, "g": true, "line": true, "path": true, "em": true, "br": true, "footer": true,
		"defs": true, "pattern": true, "clipPath": true, "bdi": true}
	for _, m := range tags {
		assert.True(t, allowed[m[1]], "unexpected tag <%s>", m[1])
	}
}

// Each failing span's tag in a plot links to its row of the findings
// table, and the legend names every marker of the plot.
func TestPlotLinksAndLegend(t *testing.T) {
	out := renderHTML(t, solvedInput(t, demoModel))
	links := regexp.MustCompile(`<a href="#(m1-f\d+)">`).FindAllStringSubmatch(out, -1)
	require.NotEmpty(t, links)
	for _, l := range links {
		assert.Contains(t, out, `<tr class="`, l[1])
		assert.Regexp(t, `<tr class="[a-z]+" id="`+l[1]+`">`, out)
	}
	for _, entry := range []string{">gate<", ">bend<", ">reach boundary<", ">error span, cross-hatched (#N: finding row)<"} {
		assert.Contains(t, out, entry)
	}
	assert.Contains(t, out, `<pattern id="`, "severity hatching")
}

func TestMarkdown(t *testing.T) {
	dir := t.TempDir()
	in := fixtureInput(t, "heron-flats.chan.hcl", "inject.chan.hcl")
	require.NoError(t, Markdown(dir, "../review.md", in))
	md, err := os.ReadFile(filepath.Join(dir, "review.md"))
	require.NoError(t, err)
	s := string(md)
	assert.Contains(t, s, "# Channel design review")
	assert.Contains(t, s, "> **Caution.** "+md2(rules.Caution))
	links := regexp.MustCompile(`!\[[^\n]*\]\(([^)]+\.svg)\)`).FindAllStringSubmatch(s, -1)
	require.Len(t, links, 5) // heron: 2 events × (main stem + chute); inject: 1 event × 1 reach
	for _, l := range links {
		svg, err := os.ReadFile(filepath.Join(dir, l[1]))
		require.NoError(t, err, l[1])
		assert.True(t, strings.HasPrefix(string(svg), `<svg xmlns="http://www.w3.org/2000/svg"`))
		assert.Contains(t, string(svg), "<path ")
		assert.NotContains(t, string(svg), "<script")
	}
	// Model strings are inert in Markdown too.
	assert.NotContains(t, s, "<script")
	assert.Contains(t, s, "&lt;script&gt;")
	assert.Contains(t, s, `\`+"`tick\\`")
	assert.Contains(t, s, `\| pipe`)
}

// md2 is the Markdown escaping of the caution (plain ASCII punctuation).
func md2(s string) string { return md(s) }

func TestMainStemIsLongestPath(t *testing.T) {
	m := loadModel(t, "heron-flats.chan.hcl")
	stem := mainStem(m)
	require.Len(t, stem, 2)
	// Source: common practice (no published source) — the main stem is
	// the longest headwater-to-outlet path: long-ditch (900) + outfall
	// (700) = 1600 beats chute (60) + outfall (700) = 760.
	assert.Equal(t, "long-ditch", stem[0].Name)
	assert.Equal(t, "outfall", stem[1].Name)
}

func TestNiceTicks(t *testing.T) {
	// Source: common practice (no published source) — axis ticks on 1, 2,
	// 2.5 and 5 times a power of ten covering the data range.
	assert.Equal(t, []float64{0, 200, 400, 600, 800, 1000, 1200, 1400, 1600}, niceTicks(0, 1600, 10))
	assert.Equal(t, []float64{98.5, 99, 99.5, 100, 100.5, 101, 101.5}, niceTicks(98.7, 101.2, 6))
	assert.Equal(t, 2.5, niceStep(2.1))
	assert.Equal(t, 0.05, niceStep(0.031))
	assert.Nil(t, niceTicks(1, 1, 5))
	assert.Equal(t, "99.5", formatTick(99.5, []float64{99, 99.5}))
}

func TestSig2(t *testing.T) {
	// Source: common practice (no published source) — two significant figures.
	assert.Equal(t, "3.9", sig2(3.9000000000000004))
	assert.Equal(t, "110", sig2(112.4))
	assert.Equal(t, "53", sig2(52.6))
	assert.Equal(t, "1.5", sig2(1.46))
}

func TestNumNeverPrintsNaN(t *testing.T) {
	nan := 0.0
	nan = nan / nan
	assert.Equal(t, "–", num(nan))
	// The report prints numbers as the text output does (rules.Num).
	for _, x := range []float64{0.18, 1234.5, -0.0001, 6.6438} {
		assert.Equal(t, numfmt.Num(x), num(x))
	}
	assert.Equal(t, "6.64", num(6.6438))
	assert.Equal(t, "305 – 350", stationRange(305.2855, 350))
}

func TestUnsolvedAndEmpty(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	in.Models[0].Result = nil
	out := renderHTML(t, in)
	assert.Contains(t, out, "was not solved")
	assert.Equal(t, 0, strings.Count(out, "<svg "))
	// No models at all: still a page with the caution.
	out = renderHTML(t, Input{})
	assert.Contains(t, out, rules.Caution)
}

func TestNonFiniteInputNeverReachesOutput(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	inf := 1.0
	for i := 0; i < 2000; i++ {
		inf *= 10
	}
	nan := inf - inf
	rr := in.Models[0].Result.Events[0].Reaches[0]
	rr.Points[3].WSE, rr.Points[4].Energy, rr.Points[5].Invert = nan, inf, -inf
	rr.Points[6].Velocity, rr.Points[7].Froude, rr.Discharge = nan, inf, nan
	in.Models[0].Findings[0].Value, in.Models[0].Findings[0].ToStation = nan, inf
	out := renderHTML(t, in)
	assert.NotContains(t, out, "NaN")
	assert.NotRegexp(t, `\bInf\b`, out) // "Info" is a word of the page
	dir := t.TempDir()
	require.NoError(t, Markdown(dir, "r.md", in))
	files, _ := filepath.Glob(filepath.Join(dir, "*"))
	for _, f := range files {
		b, err := os.ReadFile(f)
		require.NoError(t, err)
		assert.NotContains(t, string(b), "NaN", f)
		assert.NotRegexp(t, `\bInf\b`, string(b), f)
	}
}

func TestThinKeepsExtremes(t *testing.T) {
	// Source: common practice (no published source) — min/max decimation
	// for drawing keeps every local extreme of each bucket.
	pts := make([]solver.Point, 10000)
	for i := range pts {
		pts[i] = solver.Point{Station: float64(i), WSE: math.Sin(float64(i) / 300)}
	}
	pts[4321].WSE = 5 // a spike
	got := thin(pts)
	assert.LessOrEqual(t, len(got), maxPlotPoints)
	assert.Equal(t, pts[0], got[0])
	assert.Equal(t, pts[len(pts)-1], got[len(got)-1])
	hasSpike := false
	for i, p := range got {
		if p.WSE == 5 {
			hasSpike = true
		}
		if i > 0 {
			assert.GreaterOrEqual(t, p.Station, got[i-1].Station)
		}
	}
	assert.True(t, hasSpike)
	short := pts[:10]
	assert.Equal(t, short, thin(short))
}

// Names with bidi controls are isolated in the page (bdi, dir=auto), so
// an override in one name cannot reorder the cells and values after it;
// the Markdown report makes them visible and defangs link syntax.
func TestBidiAndLinksIsolated(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	in.Models[0].Model.Title = "Mill \u202eroad [click](http://evil.example) www.evil.example"
	out := renderHTML(t, in)
	assert.Regexp(t, `<h2><bdi>Mill \x{202e}road`, out)
	assert.Regexp(t, `<td class="name" dir="auto">`, out)
	dir := t.TempDir()
	require.NoError(t, Markdown(dir, "r.md", in))
	md, err := os.ReadFile(filepath.Join(dir, "r.md"))
	require.NoError(t, err)
	assert.Contains(t, string(md), `Mill \\u202Eroad \[click\]\(http\[:\]//evil.example\) www\[.\]evil.example`)
	assert.NotContains(t, string(md), "\u202e")
}
