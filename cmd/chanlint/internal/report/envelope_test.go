package report

import (
	"bytes"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// variedInput checks model files through the pipeline with a sensitivity
// run of the given SPEC (as `chanlint report --vary SPEC` does).
func variedInput(t testing.TB, spec string, paths ...string) Input {
	t.Helper()
	s, err := pipeline.ParseSensitivity(spec)
	require.NoError(t, err)
	in := Input{Policy: testPolicy(t), Caution: rules.Caution, ToolVersion: "0.1.0-test", SensitivitySource: "--vary"}
	for _, path := range paths {
		r := pipeline.CheckFile(pipeline.File{Name: filepath.ToSlash(path), Path: path}, in.Policy,
			pipeline.Options{Keep: pipeline.Keep{Solved: true}, Vary: &s})
		require.False(t, r.Invalid, "%v", r.Findings)
		require.NotEmpty(t, r.Bands, "a sensitivity run keeps its water-surface bands")
		in.Models = append(in.Models, Model{Model: r.Model, Result: r.Solution, Findings: r.Findings,
			Envelope: &Envelope{Sizes: r.Sensitivity.String(), Cases: len(r.Cases), Bands: r.Bands}})
	}
	return in
}

// The demo checked over an envelope: every flow-dependent finding shows its
// verdict in the HTML and Markdown findings tables, the policy section
// states the run, and every plot draws the band with its legend entry.
func TestReportShowsEnvelope(t *testing.T) {
	in := variedInput(t, "roughness=0.2,tailwater=0.3,discharge=0.1", demoModel)
	out := renderHTML(t, in)

	run := "Sensitivity run, asked by --vary: each event solved in 14 more cases, roughness ±20 %, tailwater ±0.3 m, discharge ±10 %, " +
		"each lowered and raised alone and together in every corner; "
	assert.Contains(t, out, `<p class="run">`+escapeHTML(run))

	// Each verdict appears once per finding that has one, in words.
	verdicts := map[string]int{}
	for _, f := range in.Models[0].Findings {
		if f.Envelope != nil {
			verdicts[f.Envelope.Verdict]++
			assert.Contains(t, out, "Envelope: "+escapeHTML(f.Envelope.Text()))
		}
	}
	require.Positive(t, verdicts[rules.KnifeEdge], "the demo has knife-edge findings under ±20 %% n")
	require.Positive(t, verdicts[rules.RobustFail])
	assert.Equal(t, verdicts[rules.KnifeEdge], strings.Count(out, `<span class="envelope knife_edge">Envelope: knife-edge: fails in `))
	assert.Equal(t, verdicts[rules.RobustFail], strings.Count(out, `<span class="envelope robust_fail">Envelope: robust fail: fails in all 14 perturbed cases`))
	assert.Equal(t, verdicts[rules.Sensitivity], strings.Count(out, `<span class="envelope sensitivity">Envelope: sensitivity finding: passes as designed`))

	// Every plot with a water surface draws the band, hatched and
	// outlined, behind the water-surface line, with a legend entry and a
	// caption that says the range in words.
	plots := strings.Count(out, "<svg ")
	band := regexp.MustCompile(`<g class="envelope"><title>Water-surface envelope over 14 sensitivity cases \(roughness ±20 %, tailwater ±0.3 m, discharge ±10 %\): widest [0-9.]+ m, at station [0-9.]+ m of [a-z-]+</title>\n` +
		`<path d="M[0-9. MLZ]+ Z" fill="#56b4e9" fill-opacity="0.35" stroke="none"/>\n` +
		`<path d="M[0-9. MLZ]+ Z" fill="url\(#m1-plot\d+-hatch-envelope\)" stroke="#0072b2" stroke-width="0.8"/>`)
	assert.Len(t, band.FindAllString(out, -1), plots)
	assert.Equal(t, plots, strings.Count(out, `<pattern id="m1-plot`)-strings.Count(out, `-hatch-error"`)-strings.Count(out, `-hatch-warning"`))
	assert.Equal(t, plots, strings.Count(out, ">water-surface envelope, hatched<"))
	assert.Contains(t, out, "The hatched band is the range of the water surface over the 14 sensitivity cases and the nominal one")
	assert.Less(t, strings.Index(out, `<g class="envelope">`), strings.Index(out, `stroke="#0072b2" stroke-width="1.9"`),
		"the band is drawn before (behind) the water-surface line")

	// Markdown: the same run and verdicts.
	var mdOut bytes.Buffer
	require.NoError(t, MarkdownInline(&mdOut, in))
	page := mdOut.String()
	assert.Contains(t, page, "**"+run)
	for _, f := range in.Models[0].Findings {
		if f.Envelope != nil {
			assert.Contains(t, page, " — envelope: _"+md(f.Envelope.Text())+"_")
		}
	}

	// Without a run: no band, no verdicts, no run line.
	plain := renderHTML(t, solvedInput(t, demoModel))
	for _, s := range []string{`class="envelope`, "Envelope:", "Sensitivity run", "water-surface envelope"} {
		assert.NotContains(t, plain, s)
	}
}

// The band's path runs along the highest water surface downstream and
// back along the lowest, at the band's stations, on the plot's scale; the
// widest point is named.
func TestEnvelopePath(t *testing.T) {
	r := &model.Reach{Name: "cut", Length: 100, InvertUp: 10, InvertDown: 9}
	pcs := []piece{{reach: r, band: &pipeline.Band{Event: "e", Reach: "cut", Station: []float64{0, 40, 100},
		Low: []float64{11, 10.6, 10}, High: []float64{11.5, 11.4, 10.2}}}}
	p := &Plot{Frame: Rect{X: 72, Y: 40, W: 904, H: 302}}
	sc := newScale(pcs, p, nil)
	assert.GreaterOrEqual(t, sc.ymax, 11.5, "the scale holds the band's top")
	p.addEnvelope(pcs, sc, &Envelope{Sizes: "roughness ±20 %", Cases: 2}, "m")
	var want pathBuilder
	want.start()
	for _, q := range [][2]float64{{0, 11.5}, {40, 11.4}, {100, 10.2}, {100, 10}, {40, 10.6}, {0, 11}} {
		want.to(sc.x(q[0]), sc.y(q[1]))
	}
	want.close()
	assert.Equal(t, want.String(), p.Envelope)
	assert.Equal(t, "Water-surface envelope over 2 sensitivity cases (roughness ±20 %): widest 0.8 m, at station 40 m of cut", p.EnvelopeTitle)
	assert.Contains(t, p.Caption, "it is widest (0.8 m) at station 40 m of cut.")

	// No run, or a reach without a band: nothing drawn.
	q := &Plot{Frame: p.Frame}
	q.addEnvelope([]piece{{reach: r}}, sc, &Envelope{Cases: 2}, "m")
	assert.Empty(t, q.Envelope)
	q.addEnvelope(pcs, sc, nil, "m")
	assert.Empty(t, q.Envelope)
}

// escapeHTML is what html/template makes of a text.
func escapeHTML(s string) string { return string(appendEscaped(nil, s)) }
