package report

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// solvedInput runs the real pipeline (model.Parse, solver.Solve,
// rules.Check) on model files.
func solvedInput(t testing.TB, paths ...string) Input {
	t.Helper()
	p := testPolicy(t)
	in := Input{Policy: p, Caution: rules.Caution, ToolVersion: "0.1.0-test"}
	for _, path := range paths {
		src, err := os.ReadFile(path)
		require.NoError(t, err)
		m, diags := model.Parse(filepath.ToSlash(path), src)
		require.False(t, diags.HasErrors(), diags.Error())
		res, err := solver.Solve(m, solver.Options{})
		require.NoError(t, err)
		in.Models = append(in.Models, Model{Model: m, Result: res, Findings: rules.Check(m, res, p)})
	}
	return in
}

// demoModel is the project's demo scenario.
var demoModel = filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")

func TestSolvedModelsRender(t *testing.T) {
	in := solvedInput(t, filepath.Join("testdata", "heron-flats.chan.hcl"), demoModel)
	var buf bytes.Buffer
	require.NoError(t, HTML(&buf, in))
	out := buf.String()
	assert.NotContains(t, out, "NaN")
	assert.NotRegexp(t, `\bInf\b`, out) // "Info" is a word of the page
	assert.Contains(t, out, "Kestrel Ridge")
	// One main stem per event plus every other reach.
	want := 0
	for _, m := range in.Models {
		want += len(m.Result.Events) * (1 + len(m.Model.Reaches) - len(mainStem(m.Model)))
	}
	// The demo's gated chute, apron and culvert are short against its
	// main stem: one detail plot per event.
	want += 2
	assert.Contains(t, out, "detail: chute → apron → quarry-lane-culvert")
	// Exceptions: the demo's covers one finding; Heron Flats' covers none
	// (its freeboard span runs past the exception) and says so.
	assert.Contains(t, out, "covers 1 finding")
	assert.Contains(t, out, "covers no finding")
	assert.Equal(t, want, strings.Count(out, "<svg "))
	dir := t.TempDir()
	require.NoError(t, Markdown(dir, "review.md", in))
	files, err := filepath.Glob(filepath.Join(dir, "review-*.svg"))
	require.NoError(t, err)
	assert.Len(t, files, want)
}

func BenchmarkHTMLDemo(b *testing.B) {
	in := solvedInput(b, demoModel)
	var buf bytes.Buffer
	b.ReportAllocs()
	for b.Loop() {
		buf.Reset()
		if err := HTML(&buf, in); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(buf.Len()), "bytes/page")
}

// TestCulvertRendered: the demo's culvert has a performance row per event
// and its plots draw the headwater pool and the road crest at their levels.
func TestCulvertRendered(t *testing.T) {
	in := solvedInput(t, demoModel)
	var buf bytes.Buffer
	require.NoError(t, HTML(&buf, in))
	out := buf.String()
	assert.Equal(t, 2, strings.Count(out, "<caption>Culvert performance"), "one table per event")
	assert.Contains(t, out, `<td dir="auto">quarry-lane</td>`)
	assert.Contains(t, out, "culvert headwater")
	assert.Contains(t, out, "road crest")
	res := in.Models[0].Result
	for _, ev := range res.Events {
		require.Len(t, ev.Culverts, 1)
		cr := ev.Culverts[0]
		assert.Contains(t, out, "headwater "+num(cr.Headwater)+" m, HW/D "+num2(cr.HWD))
	}
	// The pool is drawn at the headwater's height on the plot's scale.
	m := in.Models[0].Model
	var pieces []piece
	off := 0.0
	byReach := map[*model.Reach]*solver.ReachResult{}
	for _, rr := range res.Events[0].Reaches {
		byReach[rr.Reach] = rr
	}
	for _, r := range mainStem(m) {
		pieces = append(pieces, piece{reach: r, rr: byReach[r], offset: off})
		off += r.Length
	}
	cr := res.Events[0].Culverts[0]
	p := buildPlot(plotInput{id: "t", units: m.Units, pieces: pieces, w: mainW, h: mainH, stem: true,
		culverts: map[*model.Reach]*solver.CulvertResult{cr.Culvert.Reach: cr}})
	require.Len(t, p.Culverts, 1)
	require.Len(t, p.Roads, 1)
	sc := newScale(pieces, &Plot{Frame: p.Frame}, map[*model.Reach]*solver.CulvertResult{cr.Culvert.Reach: cr})
	assert.InDelta(t, round1(sc.y(cr.Headwater)), p.Culverts[0].Y1, 1e-9)
	assert.InDelta(t, round1(sc.y(cr.Culvert.Road.Crest)), p.Roads[0].Y1, 1e-9)
	assert.Less(t, p.Culverts[0].X, p.Culverts[0].X2, "the pool extends upstream of the inlet")
}
