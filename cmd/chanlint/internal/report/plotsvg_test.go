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
// SVG and in a model's section of the page exactly as html/template
// escapes HTML text and a quoted attribute's value, invalid UTF-8
// included.
//
// Source: common practice (no published source) — html/template's
// contextual escaping is the reference for text in an HTML page.
func TestAppendEscapedMatchesHTMLTemplate(t *testing.T) {
	text := template.Must(template.New("").Parse(`{{.}}`))
	attr := template.Must(template.New("").Parse(`<td title="{{.}}">`))
	rapid.Check(t, func(t *rapid.T) {
		pieces := rapid.SliceOf(rapid.SampledFrom([]string{"a", "b", " ", "<", ">", "&", "'", `"`, "+", "=", "`", "\x00",
			"é", "→", "ä", "\u202e", "\xff", "\xe2\x82"})).Draw(t, "pieces")
		s := strings.Join(pieces, "")
		var want bytes.Buffer
		require.NoError(t, text.Execute(&want, s))
		if got := string(appendEscaped(nil, s)); got != want.String() {
			t.Fatalf("text: appendEscaped(%q) = %q, want %q", s, got, want.String())
		}
		want.Reset()
		require.NoError(t, attr.Execute(&want, s))
		w := &markup{}
		w.raw(`<td title="`).attrValue(s).raw(`">`)
		if got := string(w.b); got != want.String() {
			t.Fatalf("attribute: %q, want %q", got, want.String())
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
	pg := build(in, renderer{plot: inlineSVG})
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
	pg := build(in, renderer{plot: inlineSVG})
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

// TestPathLeavesOutOnlyStraightPoints: a path keeps its first and last
// points, and every point it leaves out lies within pathTol of the line
// it draws; a straight run of many points draws as one segment.
//
// Source: common practice (no published source) — polyline
// simplification bounded by the distance to the drawn segments.
func TestPathLeavesOutOnlyStraightPoints(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(2, 300).Draw(t, "n")
		var in [][2]float64
		var p pathBuilder
		p.start()
		x, y := 0.0, 100.0
		slope := rapid.Float64Range(-1, 1).Draw(t, "slope")
		for range n {
			x += rapid.Float64Range(0.01, 5).Draw(t, "dx")
			slope += rapid.Float64Range(-0.05, 0.05).Draw(t, "bend")
			y += slope * rapid.Float64Range(0, 3).Draw(t, "dy")
			p.to(x, y)
			in = append(in, [2]float64{round1(x), round1(y)})
		}
		var out [][2]float64
		f := strings.Fields(p.String())
		for i := 0; i+1 < len(f); i += 2 {
			if f[i][0] != 'M' && f[i][0] != 'L' {
				t.Fatalf("command %q", f[i])
			}
			px, _ := strconv.ParseFloat(f[i][1:], 64)
			py, _ := strconv.ParseFloat(f[i+1], 64)
			out = append(out, [2]float64{px, py})
		}
		if len(out) == 0 {
			return // every point the same: no line
		}
		if out[0] != in[0] || out[len(out)-1] != in[len(in)-1] {
			t.Fatalf("ends %v %v, want %v %v", out[0], out[len(out)-1], in[0], in[len(in)-1])
		}
		for _, q := range in {
			best := math.Inf(1)
			for i := 1; i < len(out); i++ {
				best = math.Min(best, segDist(q, out[i-1], out[i]))
			}
			if len(out) == 1 {
				best = math.Hypot(q[0]-out[0][0], q[1]-out[0][1])
			}
			if best > pathTol+1e-9 {
				t.Fatalf("point %v is %.4f from the path", q, best)
			}
		}
	})
	var p pathBuilder
	for i := range 100 {
		p.to(float64(i), 2*float64(i))
	}
	// A run is checked over at most pathRunMax points.
	assert.Equal(t, "M0 0 L64 128 L99 198", p.String())
}

// segDist is the distance from q to the segment a–b.
func segDist(q, a, b [2]float64) float64 {
	dx, dy := b[0]-a[0], b[1]-a[1]
	t := 0.0
	if l2 := dx*dx + dy*dy; l2 > 0 {
		t = math.Max(0, math.Min(1, ((q[0]-a[0])*dx+(q[1]-a[1])*dy)/l2))
	}
	return math.Hypot(q[0]-a[0]-t*dx, q[1]-a[1]-t*dy)
}
