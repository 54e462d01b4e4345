package report

import (
	"bytes"
	"encoding/xml"
	"html/template"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// TestAppendFixedMatchesStrconv: the fast coordinate formatter prints what
// strconv's shortest form prints for the number rounded to 1/10 or 1/100.
//
// Source: common practice (no published source) — strconv.FormatFloat with
// precision -1 is the reference formatting of a float64.
func TestAppendFixedMatchesStrconv(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		x := rapid.Float64Range(-1e6, 1e6).Draw(t, "x")
		for _, per := range []int64{10, 100} {
			r := math.Round(x*float64(per)) / float64(per)
			want := strconv.FormatFloat(r, 'f', -1, 64)
			if r == 0 {
				want = "0"
			}
			if got := string(appendFixed(nil, x, per)); got != want {
				t.Fatalf("appendFixed(%v, %d) = %q, want %q", x, per, got, want)
			}
		}
	})
	assert.Equal(t, "0", string(appendFixed(nil, -0.01, 10)), "never -0")
	assert.Equal(t, "0", string(appendFixed(nil, math.NaN(), 10)))
	assert.Equal(t, "0", string(appendFixed(nil, math.Inf(-1), 100)))
	assert.Equal(t, "-12.05", string(appendFixed(nil, -12.049999, 100)))
}

// TestAppendEscapedMatchesHTMLTemplate: a model string is escaped in the
// SVG exactly as html/template escapes HTML text.
//
// Source: common practice (no published source) — html/template's
// contextual escaping is the reference for text in an HTML page.
func TestAppendEscapedMatchesHTMLTemplate(t *testing.T) {
	tm := template.Must(template.New("").Parse(`{{.}}`))
	rapid.Check(t, func(t *rapid.T) {
		s := rapid.StringOf(rapid.SampledFrom([]rune("ab <>&'\"+\x00é→ä\u202e"))).Draw(t, "s")
		var want bytes.Buffer
		require.NoError(t, tm.Execute(&want, s))
		if got := string(appendEscaped(nil, s)); got != want.String() {
			t.Fatalf("appendEscaped(%q) = %q, want %q", s, got, want.String())
		}
	})
}

// TestSVGWellFormed: every plot of the demo and of the hostile fixture is
// well-formed XML, both inline and as a file, and the file declares the SVG
// namespace.
//
// Source: common practice (no published source) — encoding/xml's decoder
// as an independent check of well-formed markup.
func TestSVGWellFormed(t *testing.T) {
	in := solvedInput(t, filepath.Join("testdata", "heron-flats.chan.hcl"), demoModel)
	in.Models = append(in.Models, fixtureInput(t, "inject.chan.hcl").Models...)
	pg, err := build(in, renderer{plot: inlineSVG})
	require.NoError(t, err)
	n := 0
	for _, m := range pg.Models {
		for _, ev := range m.Events {
			for _, p := range ev.Plots {
				n++
				for _, doc := range [][]byte{p.svg, fileSVG(p.Plot)} {
					assertWellFormed(t, doc, p.ID)
				}
				assert.True(t, bytes.HasPrefix(fileSVG(p.Plot), []byte(`<svg xmlns="http://www.w3.org/2000/svg" `)))
				assert.NotContains(t, string(p.svg), "<script")
			}
		}
	}
	assert.Greater(t, n, 10)
}

// TestPlotTextPositions: the axis labels and the empty-plot message are
// centred on the frame.
func TestPlotTextPositions(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	rr := in.Models[0].Result.Events[0].Reaches
	for _, r := range rr {
		r.Points = nil
		r.Jumps = nil
	}
	pg, err := build(in, renderer{plot: inlineSVG})
	require.NoError(t, err)
	p := pg.Models[0].Events[0].Plots[0].Plot
	fr := p.Frame
	// Source: common practice (no published source) — a label centred
	// on a span sits at its midpoint.
	assert.Equal(t, fr.X+fr.W/2, p.Text.XLabelX)
	assert.Equal(t, fr.Y+fr.H/2, p.Text.YLabelY)
	assert.Equal(t, "No computed profile for this event.", p.Empty)
	svg := string(pg.Models[0].Events[0].Plots[0].svg)
	assert.Contains(t, svg, `<text x="`+strconv.FormatFloat(fr.X+fr.W/2, 'f', -1, 64)+`" y="`+strconv.FormatFloat(fr.Y+fr.H/2, 'f', -1, 64)+`" font-size="13"`)
	assert.True(t, strings.Count(svg, "<path ") >= 2, "bed and bank drawn from the reach")
}

// TestMarkdownSVGMatchesPage: the SVG files of the Markdown report hold
// the same drawing as the page's inline plots.
func TestMarkdownSVGMatchesPage(t *testing.T) {
	in := fixtureInput(t, "heron-flats.chan.hcl")
	dir := t.TempDir()
	require.NoError(t, Markdown(dir, "r.md", in))
	page := renderHTML(t, in)
	file, err := os.ReadFile(filepath.Join(dir, "r-1.svg"))
	require.NoError(t, err)
	body := strings.TrimPrefix(string(file), `<svg xmlns="http://www.w3.org/2000/svg"`)
	assert.Contains(t, page, `<svg class="profile"`+strings.TrimSuffix(body, "\n"))
}

// assertWellFormed checks that doc is well-formed XML: every token
// decodes and every element is closed.
//
// Source: common practice (no published source) — encoding/xml's decoder
// as an independent check of well-formed markup.
func assertWellFormed(t *testing.T, doc []byte, name string) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(doc))
	depth := 0
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		require.NoError(t, err, name)
		switch tok.(type) {
		case xml.StartElement:
			depth++
		case xml.EndElement:
			depth--
		}
	}
	assert.Zero(t, depth, name)
}
