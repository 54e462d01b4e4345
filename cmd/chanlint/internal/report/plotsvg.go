package report

import (
	"math"
	"strconv"
	"unicode/utf8"

	"github.com/chanlint/chanlint/model/numfmt"
)

// The SVG writer turns a laid-out Plot into markup. It places what
// buildPlot computed and styles it with the palette; the only arithmetic
// here is the fixed offset of a legend swatch from its entry's anchor.
// Every string is escaped as html/template escapes HTML text, so a model's
// names and a finding's message stay text in the page and in an SVG file.

// fontFamily is the plot's font stack.
const fontFamily = `system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif`

// inlineSVG is the plot as an <svg> element for the HTML page.
func inlineSVG(p *Plot) []byte {
	w := &markup{b: make([]byte, 0, 16<<10)}
	w.inlineSVG(p)
	return w.b
}

// inlineSVG writes the plot as an <svg> element of the page; the page's
// sections write their plots with it (section.go).
func (w *markup) inlineSVG(p *Plot) {
	w.raw(`<svg class="profile`)
	if p.Small {
		w.raw(" small")
	}
	w.raw(`"`)
	w.svgBody(p)
}

// fileSVG is the plot as a standalone SVG document.
func fileSVG(p *Plot) []byte {
	w := &markup{b: make([]byte, 0, 16<<10)}
	w.raw(`<svg xmlns="http://www.w3.org/2000/svg"`)
	w.svgBody(p)
	w.raw("\n")
	return w.b
}

// markup appends HTML or SVG markup to a byte slice: the plots
// (plotsvg.go) and each model's section of the page (section.go).
type markup struct{ b []byte }

// raw writes markup of the program's own.
func (w *markup) raw(s string) *markup { w.b = append(w.b, s...); return w }

// text writes a string as escaped text.
func (w *markup) text(s string) *markup { w.b = appendEscaped(w.b, s); return w }

// tag opens an element: "\n<name".
func (w *markup) tag(name string) *markup {
	w.b = append(w.b, '\n', '<')
	w.b = append(w.b, name...)
	return w
}

// n writes a numeric attribute.
func (w *markup) n(name string, x float64) *markup {
	w.b = append(w.b, ' ')
	w.b = append(w.b, name...)
	w.b = append(w.b, '=', '"')
	w.b = appendNum(w.b, x)
	w.b = append(w.b, '"')
	return w
}

// a writes an attribute with an escaped value.
func (w *markup) a(name, v string) *markup {
	w.b = append(w.b, ' ')
	w.b = append(w.b, name...)
	w.b = append(w.b, '=', '"')
	w.b = appendEscaped(w.b, v)
	w.b = append(w.b, '"')
	return w
}

// d writes path data of the plot's own (digits, spaces and commands: no
// escaping needed).
func (w *markup) d(data string) *markup {
	w.b = append(w.b, ` d="`...)
	w.b = append(w.b, data...)
	w.b = append(w.b, '"')
	return w
}

// stroke writes the attributes of a line style.
func (w *markup) stroke(s lineStyle) *markup {
	w.a("stroke", s.Colour).a("stroke-width", s.Width)
	if s.Dash != "" {
		w.a("stroke-dasharray", s.Dash)
	}
	if s.Join != "" {
		w.a("stroke-linejoin", s.Join)
	}
	return w
}

// end closes an empty element.
func (w *markup) end() { w.b = append(w.b, '/', '>') }

// titled closes an element that holds only a tooltip.
func (w *markup) titled(name, title string) {
	w.raw("><title>").text(title).raw("</title></").raw(name).raw(">")
}

// label closes a text element with its content.
func (w *markup) label(s string) { w.raw(">").text(s).raw("</text>") }

// rect opens a rectangle.
func (w *markup) rect(x, y, wd, h float64) *markup {
	return w.tag("rect").n("x", x).n("y", y).n("width", wd).n("height", h)
}

// line opens a line.
func (w *markup) line(x1, x2, y1, y2 float64) *markup {
	return w.tag("line").n("x1", x1).n("x2", x2).n("y1", y1).n("y2", y2)
}

// path writes a stroked path.
func (w *markup) path(d string, s lineStyle) {
	w.tag("path").d(d).a("fill", "none").stroke(s).end()
}

// svgBody writes the rest of the opening tag, then the plot's layers from
// back to front, and the closing tag.
func (w *markup) svgBody(p *Plot) {
	fr := p.Frame
	w.raw(` viewBox="0 0 `)
	w.b = appendNum(w.b, p.W)
	w.raw(" ")
	w.b = appendNum(w.b, p.H)
	w.raw(`"`).n("width", p.W).n("height", p.H).a("role", "img").a("aria-labelledby", p.ID+"-t").raw(` font-family="` + fontFamily + `">`)
	w.raw("\n<title").a("id", p.ID+"-t").raw(">").text(p.Title).raw("</title>")
	w.raw("\n<desc>Longitudinal profile: ").text(p.XLabel).raw(" against ").text(p.YLabel).raw(".")
	if p.Caption != "" {
		w.raw(" ").text(p.Caption)
	}
	w.raw("</desc>")
	w.hatches(p)
	w.rect(0, 0, p.W, p.H).a("fill", pal.Paper).end()
	w.tag("text").n("x", p.Text.TitleX).n("y", p.Text.TitleY).a("font-size", "13").a("font-weight", "600").a("fill", pal.Title).label(p.Title)

	w.tag("g").a("font-size", "11").a("fill", pal.TickText).raw(">")
	for _, t := range p.YTicks {
		w.line(fr.X, fr.Right(), t.Pos, t.Pos).a("stroke", pal.GridY).a("stroke-width", "1").end()
		w.tag("text").n("x", p.Text.YTickX).n("y", t.Pos).a("dy", "3.5").a("text-anchor", "end").label(t.Label)
	}
	for _, t := range p.XTicks {
		w.line(t.Pos, t.Pos, fr.Y, fr.Bottom()).a("stroke", pal.GridX).a("stroke-width", "1").end()
		w.tag("text").n("x", t.Pos).n("y", p.Text.XTickY).a("text-anchor", "middle").label(t.Label)
	}
	w.raw("\n</g>")

	w.tag("g").raw(">")
	for _, b := range p.Bands {
		if b.Kind == "basin" {
			w.rect(b.X, fr.Y, b.W, fr.H).a("fill", pal.Basin).a("fill-opacity", "0.12").titled("rect", b.Title)
		}
	}
	w.raw("\n</g>")
	w.tag("g").raw(">")
	for _, b := range p.Bands {
		switch b.Kind {
		case "error", "warning", "info":
			w.rect(b.X, fr.Y, b.W, fr.H).a("fill", bandColour(b.Kind)).a("fill-opacity", "0.1").titled("rect", b.Title)
			if spanHatch(b.Kind) != "" {
				w.rect(b.X, fr.Y, b.W, fr.H).a("fill", "url(#"+hatchID(p.ID, b.Kind)+")").a("fill-opacity", "0.3").end()
			}
		case "excepted":
			w.rect(b.X, fr.Y, b.W, fr.H).a("fill", pal.Excepted).a("fill-opacity", "0.05").
				stroke(lineStyle{Colour: pal.Excepted, Width: "0.6", Dash: "4 3"}).titled("rect", b.Title)
		}
	}
	w.raw("\n</g>")
	if p.Ground != "" {
		w.tag("path").d(p.Ground).a("fill", pal.Ground).a("stroke", "none").end()
	}
	if p.Water != "" {
		w.tag("path").d(p.Water).a("fill", pal.Water).a("stroke", "none").end()
	}
	if p.Envelope != "" {
		w.tag("g").a("class", "envelope").raw("><title>").text(p.EnvelopeTitle).raw("</title>")
		w.tag("path").d(p.Envelope).a("fill", pal.EnvelopeFill).a("fill-opacity", "0.35").a("stroke", "none").end()
		w.tag("path").d(p.Envelope).a("fill", "url(#"+envelopeHatchID(p.ID)+")").stroke(pal.Envelope).end()
		w.raw("\n</g>")
	}

	w.tag("g").raw(">")
	for _, b := range p.Bands {
		if b.Kind == "basin" {
			w.tag("text").n("x", b.LabelX).n("y", b.LabelY).a("font-size", "10").a("fill", pal.BasinText).a("text-anchor", "middle").label(b.Label)
		}
	}
	for _, b := range p.Bands {
		w.laneStrip(p.ID, b)
	}
	w.raw("\n</g>")
	for _, b := range p.Bends {
		w.rect(b.X, p.Text.BendY, b.W, 4).a("fill", pal.Bend).a("fill-opacity", "0.75").titled("rect", b.Title)
		w.tag("text").n("x", b.LabelX).n("y", b.LabelY).a("font-size", "10").a("fill", pal.BendText).a("text-anchor", "middle").label(b.Label)
	}

	if p.Bank != "" {
		w.path(p.Bank, pal.Bank)
	}
	if p.Energy != "" {
		clip := ""
		if p.ClipEnergy {
			clip = p.ID + "-clip"
			w.raw("<clipPath").a("id", clip).raw("><rect").n("x", fr.X).n("y", fr.Y).n("width", fr.W).n("height", fr.H).raw("/></clipPath>")
		}
		w.tag("path").d(p.Energy)
		if clip != "" {
			w.a("clip-path", "url(#"+clip+")")
		}
		w.a("fill", "none").stroke(pal.Energy).end()
	}
	if p.Critical != "" {
		w.path(p.Critical, pal.Critical)
	}
	if p.WSE != "" {
		w.path(p.WSE, pal.WSE)
	}
	if p.Existing != "" {
		w.tag("g").a("class", "existing").raw("><title>").text(p.ExistingTitle).raw("</title>")
		w.path(p.Existing, pal.Existing)
		w.raw("\n</g>")
	}
	if p.Bed != "" {
		w.path(p.Bed, pal.Bed)
	}

	for _, b := range p.Boundaries {
		if !b.First {
			w.line(b.X, b.X, fr.Y, fr.Bottom()).stroke(pal.Boundary).end()
		}
		w.tag("text").n("x", b.LabelX).n("y", p.ReachY).a("font-size", "11").a("font-style", "italic").a("fill", pal.Label).a("text-anchor", "middle").
			raw("><title>").text(b.Title).raw("</title>").text(b.Label).raw("</text>")
	}
	for _, g := range p.Gates {
		w.line(g.X, g.X, g.Y1, g.Y2).stroke(pal.Gate).titled("line", g.Title)
		w.tag("text").n("x", g.LabelX).n("y", g.LabelY).a("font-size", "10.5").a("fill", pal.Gate.Colour).a("text-anchor", g.Anchor).label(g.Label)
	}
	for _, r := range p.Roads {
		w.tag("g").raw("><title>").text(r.Title).raw("</title>")
		w.line(r.X, r.X2, r.Y1, r.Y1).stroke(pal.Road).end()
		w.tag("text").n("x", r.LabelX).n("y", r.LabelY).a("font-size", "10").a("fill", pal.Road.Colour).a("text-anchor", r.Anchor).label(r.Label)
		w.raw("\n</g>")
	}
	for _, c := range p.Culverts {
		w.tag("g").raw("><title>").text(c.Title).raw("</title>")
		w.line(c.X, c.X2, c.Y1, c.Y1).stroke(pal.Pool).end()
		w.line(c.X2, c.X2, c.Y1, c.Y2).stroke(pal.Bank).end()
		w.tag("text").n("x", c.LabelX).n("y", c.LabelY).a("font-size", "10.5").a("fill", pal.Pool.Colour).a("text-anchor", c.Anchor).label(c.Label)
		w.raw("\n</g>")
	}
	for _, j := range p.Jumps {
		w.tag("g").raw("><title>").text(j.Title).raw("</title>")
		w.line(j.X, j.X2, j.Y2, j.Y2).stroke(lineStyle{Colour: pal.Jump, Width: "1", Dash: "3 2"}).end()
		w.line(j.X, j.X, j.Y1, j.Y2).stroke(lineStyle{Colour: pal.Jump, Width: "2.2"}).end()
		w.tag("path").raw(` d="M `)
		w.b = appendNum(w.b, j.X)
		w.raw(" ")
		w.b = appendNum(w.b, j.Y2)
		w.raw(` l -4 7 l 8 0 Z"`).a("fill", pal.Jump).end()
		w.tag("text").n("x", j.LabelX).n("y", j.LabelY).a("font-size", "10.5").a("fill", pal.Jump).a("text-anchor", j.Anchor).label(j.Label)
		w.raw("\n</g>")
	}
	if p.Empty != "" {
		w.tag("text").n("x", fr.CentreX()).n("y", fr.CentreY()).a("font-size", "13").a("fill", pal.Empty).a("text-anchor", "middle").label(p.Empty)
	}
	w.rect(fr.X, fr.Y, fr.W, fr.H).a("fill", "none").stroke(pal.Frame).end()
	w.tag("text").n("x", p.Text.XLabelX).n("y", p.Text.XLabelY).a("font-size", "11.5").a("fill", pal.Label).a("text-anchor", "middle").label(p.XLabel)
	w.tag("text").raw(` transform="translate(`)
	w.b = appendNum(w.b, p.Text.YLabelX)
	w.raw(" ")
	w.b = appendNum(w.b, p.Text.YLabelY)
	w.raw(`) rotate(-90)"`).a("font-size", "11.5").a("fill", pal.Label).a("text-anchor", "middle").label(p.YLabel)

	w.tag("g").a("font-size", "11").a("fill", pal.Label).raw(">")
	for _, it := range p.Legend {
		w.swatch(p.ID, it)
		w.tag("text").n("x", it.X+30).n("y", it.Y).a("dy", "3.5").label(it.Label)
	}
	w.raw("\n</g>\n</svg>")
}

// hatchID is the id of a plot's hatch pattern for a severity.
func hatchID(plotID, kind string) string { return plotID + "-hatch-" + kind }

// envelopeHatchID is the id of a plot's hatch pattern for the
// water-surface envelope.
func envelopeHatchID(plotID string) string { return plotID + "-hatch-envelope" }

// hatches defines the hatch patterns of the severities the plot shows
// (see spanHatch), stroked dark so that they read in greyscale too, and
// that of the water-surface envelope when it is drawn.
func (w *markup) hatches(p *Plot) {
	var kinds []string
	for _, k := range []string{"error", "warning"} {
		if p.failing[k] {
			kinds = append(kinds, k)
		}
	}
	if len(kinds) == 0 && p.Envelope == "" {
		return
	}
	pattern := func(id, d, colour string) {
		w.raw("<pattern").a("id", id).a("width", "6").a("height", "6").a("patternUnits", "userSpaceOnUse").raw(">")
		w.raw("<path").a("d", d).a("stroke", colour).a("stroke-width", "0.9").raw("/></pattern>")
	}
	w.raw("\n<defs>")
	for _, k := range kinds {
		pattern(hatchID(p.ID, k), spanHatch(k), "#1d2630")
	}
	if p.Envelope != "" {
		pattern(envelopeHatchID(p.ID), envelopeHatch, pal.Envelope.Colour)
	}
	w.raw("</defs>")
}

// laneStrip writes the strip of a failing or excepted span in its lane,
// with its row number inside or beside it, linked to its row of the
// findings table when the span has one.
func (w *markup) laneStrip(plotID string, b Band) {
	switch b.Kind {
	case "error", "warning", "info", "excepted":
	default:
		return
	}
	if b.Href != "" {
		w.tag("a").a("href", b.Href).raw(">")
	}
	w.tag("g").raw("><title>").text(b.Title).raw("</title>")
	if b.Kind == "excepted" {
		w.rect(b.X, b.LaneY, b.W, 11).a("fill", "#ffffff").stroke(lineStyle{Colour: pal.Excepted, Width: "0.8", Dash: "3 2"}).end()
	} else {
		w.rect(b.X, b.LaneY, b.W, 11).a("fill", bandColour(b.Kind)).end()
		if spanHatch(b.Kind) != "" {
			w.rect(b.X, b.LaneY, b.W, 11).a("fill", "url(#"+hatchID(plotID, b.Kind)+")").a("fill-opacity", "0.35").end()
		}
	}
	w.tag("text").n("x", b.LabelX).n("y", b.LabelY).a("font-size", "9.5").a("font-weight", "600")
	switch {
	case b.LabelInside && b.Kind == "excepted":
		w.a("fill", pal.ExceptedText).a("text-anchor", "middle")
	case b.LabelInside:
		w.a("fill", "#ffffff").a("text-anchor", "middle")
	default:
		w.a("fill", bandColour(b.Kind))
	}
	w.label(b.Label)
	w.raw("\n</g>")
	if b.Href != "" {
		w.raw("\n</a>")
	}
}

// swatch writes the legend symbol of an entry (24 units wide, centred on
// the entry's baseline). Its first element follows without a line break.
func (w *markup) swatch(plotID string, it LegendItem) {
	x, y := it.X, it.Y
	line := func(s lineStyle) {
		w.raw("<line").n("x1", x).n("x2", x+24).n("y1", y).n("y2", y).stroke(s).end()
	}
	switch it.Kind {
	case "bed":
		line(pal.Bed)
	case "wse":
		w.raw("<rect").n("x", x).n("y", y-5).n("width", 24).n("height", 10).a("fill", pal.Water).end()
		w.raw("<line").n("x1", x).n("x2", x+24).n("y1", y-5).n("y2", y-5).stroke(lineStyle{Colour: pal.WSE.Colour, Width: pal.WSE.Width}).end()
	case "envelope":
		w.raw("<rect").n("x", x).n("y", y-6).n("width", 24).n("height", 12).a("fill", pal.EnvelopeFill).a("fill-opacity", "0.35").end()
		w.rect(x, y-6, 24, 12).a("fill", "url(#"+envelopeHatchID(plotID)+")").stroke(pal.Envelope).end()
	case "existing":
		line(pal.Existing)
	case "critical":
		line(pal.Critical)
	case "energy":
		line(pal.Energy)
	case "bank":
		line(pal.Bank)
	case "pool":
		line(pal.Pool)
	case "road":
		line(pal.Road)
	case "jump":
		w.raw("<line").n("x1", x+12).n("x2", x+12).n("y1", y-7).n("y2", y+5).stroke(lineStyle{Colour: pal.Jump, Width: "2.2"}).end()
	case "basin":
		w.raw("<rect").n("x", x).n("y", y-6).n("width", 24).n("height", 12).a("fill", pal.Basin).a("fill-opacity", "0.2").end()
	case "span-error", "span-warning", "span-info":
		kind := it.Kind[len("span-"):]
		c := bandColour(kind)
		w.raw("<rect").n("x", x).n("y", y-6).n("width", 24).n("height", 12).a("fill", c).a("fill-opacity", "0.1").end()
		if spanHatch(kind) != "" {
			w.rect(x, y-6, 24, 12).a("fill", "url(#"+hatchID(plotID, kind)+")").a("fill-opacity", "0.3").end()
		}
		w.raw("<rect").n("x", x).n("y", y-6).n("width", 24).n("height", 4).a("fill", c).end()
	case "gate":
		w.raw("<line").n("x1", x+12).n("x2", x+12).n("y1", y-7).n("y2", y+5).stroke(pal.Gate).end()
	case "bend":
		w.raw("<rect").n("x", x).n("y", y-2).n("width", 24).n("height", 4).a("fill", pal.Bend).a("fill-opacity", "0.75").end()
	case "boundary":
		w.raw("<line").n("x1", x+12).n("x2", x+12).n("y1", y-7).n("y2", y+5).stroke(pal.Boundary).end()
	case "excepted":
		w.raw("<rect").n("x", x).n("y", y-6).n("width", 24).n("height", 12).a("fill", pal.Excepted).a("fill-opacity", "0.08").
			stroke(lineStyle{Colour: pal.Excepted, Width: "0.8", Dash: "4 3"}).end()
	}
}

// appendNum writes a coordinate with at most two decimals (layout
// positions are on tenths; an offset from one must not print float noise).
func appendNum(b []byte, x float64) []byte { return appendFixed(b, x, 100) }

// appendFixed writes x rounded to 1/per (per is 10 or 100) with no trailing
// zeros, no exponent and never "-0": what strconv's shortest form prints
// for the rounded number, without its cost. A non-finite or huge x is
// written as 0 (layout never makes one; the plot must stay valid SVG).
func appendFixed(b []byte, x float64, per int64) []byte {
	r := math.Round(x * float64(per))
	if !numfmt.Finite(r) || math.Abs(r) > 1e15 || r == 0 {
		return append(b, '0')
	}
	n := int64(r)
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	b = strconv.AppendInt(b, n/per, 10)
	frac := n % per
	if frac == 0 {
		return b
	}
	b = append(b, '.')
	for d := per / 10; d > 0 && frac > 0; d /= 10 {
		b = append(b, byte('0'+frac/d))
		frac %= d
	}
	return b
}

// appendEscaped writes s escaped as html/template escapes HTML text and
// quoted attribute values: the five markup characters, '+', and NUL.
func appendEscaped(b []byte, s string) []byte {
	last := 0
	for i := 0; i < len(s); i++ {
		var rep string
		switch s[i] {
		case '&':
			rep = "&amp;"
		case '<':
			rep = "&lt;"
		case '>':
			rep = "&gt;"
		case '"':
			rep = "&#34;"
		case '\'':
			rep = "&#39;"
		case '+':
			rep = "&#43;"
		case 0:
			rep = string(utf8.RuneError)
		default:
			continue
		}
		b = append(b, s[last:i]...)
		b = append(b, rep...)
		last = i + 1
	}
	return append(b, s[last:]...)
}
