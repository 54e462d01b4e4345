package model

import (
	"fmt"
	"math"
	"regexp"
	"strings"
	"unicode"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// maxBedSlope is the steepest bed (rise over run) accepted: at a slope of
// 1 (45°) the gradually-varied-flow equations, which take the depth as
// vertical and the pressure as hydrostatic, no longer describe the flow;
// such a fall is a drop structure, not a channel. Source: common practice
// (no published source).
const maxBedSlope = 1.0

func schema(names ...string) *hcl.BodySchema {
	s := &hcl.BodySchema{}
	for _, n := range names {
		s.Attributes = append(s.Attributes, hcl.AttributeSchema{Name: n})
	}
	return s
}

var (
	reachSchema = func() *hcl.BodySchema {
		s := schema("from", "to", "length", "section", "slope", "invert", "max_spacing", "class")
		s.Blocks = []hcl.BlockHeaderSchema{{Type: "segment"}}
		return s
	}()
	segmentSchema   = schema("from_station", "to_station", "section")
	gateSchema      = schema("reach", "opening", "contraction")
	basinSchema     = schema("reach", "from_station", "to_station")
	bendSchema      = schema("reach", "from_station", "to_station", "radius")
	eventSchema     = schema("inflow", "outlet", "entrance", "return_period", "class")
	exceptionSchema = schema("reach", "from_station", "to_station", "reason")
)

// MaxClassWord bounds the length of a class word (`class` of a reach or
// an event).
const MaxClassWord = 64

// classWord decodes an optional class word: letters, digits, "-" and "_",
// at most MaxClassWord of them, matched by policy selectors exactly.
func (a attrSet) classWord(name, example string) string {
	if !a.has(name) {
		return ""
	}
	w, ok := a.text(name)
	if !ok {
		return ""
	}
	if !IsClassWord(w) {
		a.d.Errorf(a.m[name].Expr.Range(), "Invalid class word",
			"%s of %s must be one word of letters, digits, \"-\" or \"_\" (at most %d), e.g. %s.", name, a.what, MaxClassWord, example)
		return ""
	}
	return w
}

// IsClassWord reports whether w is a valid class word: 1 to MaxClassWord
// ASCII letters, digits, "-" or "_". Policies hold their selector words to
// the same form.
func IsClassWord(w string) bool {
	if w == "" || len(w) > MaxClassWord {
		return false
	}
	for _, c := range w {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
			return false
		}
	}
	return true
}

// DefaultContraction is the contraction coefficient of a vertical sluice
// gate in free flow used when a gate does not give one. Source: Henry
// (1950); Henderson, Open Channel Flow (1966), §6.2 (from memory).
const DefaultContraction = 0.61

func (d *decoder) reach(b *hcl.Block) *Reach {
	r := &Reach{Src: newSrc(b), Name: d.blockName(b)}
	a, content := d.attrs(b, reachSchema, &r.Src)
	a.require(b.Body, "from", "to", "length", "section")
	r.From, _ = a.name("from")
	r.To, _ = a.name("to")
	r.SectionName, _ = a.name("section")
	r.Length, _ = a.length("length", fixUnits+", or merge a piece this short into the reach beside it")
	switch {
	case a.has("slope") && a.has("invert"):
		d.Errorf(a.m["invert"].NameRange, "Both slope and invert",
			"%s gives both slope and invert; keep one: slope for a bed fixed by the node below, invert for fixed elevations.", a.what)
	case a.has("slope"):
		if s, ok := a.number("slope"); ok {
			if math.Abs(s) >= maxBedSlope {
				d.Errorf(a.m["slope"].Expr.Range(), "Bed slope too steep",
					"slope of %s is %g; a slope is rise over run (e.g. 0.002), and %g or more is a drop, not a channel.", a.what, s, maxBedSlope)
			}
			r.Slope = s
		}
	case a.has("invert"):
		if p, ok := d.pair(a.m["invert"].Expr, label{attr: "invert", owner: a.what}, "[upstream elevation, downstream elevation]"); ok &&
			d.elevation(a.m["invert"].Expr.Range(), label{attr: "the upstream invert", owner: a.what}, p[0]) &&
			d.elevation(a.m["invert"].Expr.Range(), label{attr: "the downstream invert", owner: a.what}, p[1]) {
			r.InvertUp, r.InvertDown, r.HasInvert = p[0], p[1], true
			if r.Length > 0 {
				r.Slope = (p[0] - p[1]) / r.Length
				if math.Abs(r.Slope) >= maxBedSlope {
					d.Errorf(a.m["invert"].Expr.Range(), "Bed slope too steep",
						"invert of %s falls %g over a length of %g, a slope of %.3g; %g or more is a drop, not a channel. Check the elevations and the length.",
						a.what, p[0]-p[1], r.Length, r.Slope, maxBedSlope)
				}
			}
		}
	default:
		d.Errorf(b.Body.MissingItemRange(), "Missing bed slope",
			"%s needs slope (rise over run, e.g. 0.002) or invert = [upstream elevation, downstream elevation].", a.what)
	}
	if a.has("max_spacing") {
		r.MaxSpacing, _ = a.length("max_spacing", "A spacing this fine adds no accuracy; leave max_spacing out for the solver's own step control, or write a spacing of centimetres or more")
	}
	r.Class = a.classWord("class", `"roadside-ditch"`)
	if len(content.Blocks) > MaxSegments {
		d.Errorf(content.Blocks[MaxSegments].DefRange, "Too many segments",
			"%s has %d segment blocks; at most %d are accepted.", a.what, len(content.Blocks), MaxSegments)
	}
	for i, sb := range content.Blocks {
		if i == MaxSegments {
			break
		}
		r.Segments = append(r.Segments, d.segment(sb, r.Name))
	}
	return r
}

func (d *decoder) segment(b *hcl.Block, reach string) *Segment {
	s := &Segment{Src: newSrc(b)}
	a, _ := d.attrs(b, segmentSchema, &s.Src)
	a.what = ownerOf("a segment of reach", reach)
	a.require(b.Body, "section")
	s.FromStation, s.ToStation = a.stations(b.Body)
	s.SectionName, _ = a.name("section")
	return s
}

func (d *decoder) gate(b *hcl.Block) *Gate {
	g := &Gate{Src: newSrc(b), Name: d.blockName(b), Contraction: DefaultContraction}
	a, _ := d.attrs(b, gateSchema, &g.Src)
	a.require(b.Body, "reach", "opening")
	g.ReachName, _ = a.name("reach")
	g.Opening, _ = a.dimension("opening", fixUnits+"; a gate opened less than that is closed")
	if c, ok := a.number("contraction"); ok {
		if c < MinContraction || c > 1 {
			d.Errorf(a.m["contraction"].Expr.Range(), "Contraction out of range",
				"contraction of %s is %g; the vena contracta is thinner than the opening, but no jet contracts more than Borda's re-entrant mouthpiece (%g), so it must lie in [%g, 1] (about %g for a vertical gate).",
				a.what, c, MinContraction, MinContraction, DefaultContraction)
		} else {
			g.Contraction = c
		}
	}
	return g
}

// span decodes reach, from_station and to_station, shared by basins, bends
// and exceptions.
func (a attrSet) span(body hcl.Body) (reach string, from, to float64) {
	a.require(body, "reach")
	reach, _ = a.name("reach")
	from, to = a.stations(body)
	return reach, from, to
}

// stations decodes from_station and to_station and checks that the first
// is less than the second.
func (a attrSet) stations(body hcl.Body) (from, to float64) {
	a.require(body, "from_station", "to_station")
	from, fok := a.station("from_station")
	to, tok := a.station("to_station")
	switch least := MinLength.In(a.d.m.Units); {
	case !fok || !tok:
	case from >= to:
		a.d.Errorf(a.m["to_station"].Expr.Range(), "Empty station range",
			"to_station (%g) of %s must be greater than from_station (%g).", to, a.what, from)
	case shorter(from, to, least):
		unit := a.d.unitSuffix()
		a.d.below(a.m["to_station"].Expr.Range(), "Station range too short",
			label{attr: "the station range " + fmt.Sprintf("%g to %g", from, to), owner: a.what}, to-from, least, unit, whyLength,
			fixUnits+" of the stations, or widen the range to the stretch it is about")
	}
	return from, to
}

func (d *decoder) basin(b *hcl.Block) *Basin {
	bs := &Basin{Src: newSrc(b), Name: d.blockName(b)}
	a, _ := d.attrs(b, basinSchema, &bs.Src)
	bs.ReachName, bs.FromStation, bs.ToStation = a.span(b.Body)
	return bs
}

func (d *decoder) bend(b *hcl.Block) *Bend {
	bn := &Bend{Src: newSrc(b), Name: d.blockName(b)}
	a, _ := d.attrs(b, bendSchema, &bn.Src)
	bn.ReachName, bn.FromStation, bn.ToStation = a.span(b.Body)
	a.require(b.Body, "radius")
	bn.Radius, _ = a.atLeast("radius", MinDimension, "Dimension too small",
		"a centreline radius under 1 cm is a corner no channel can follow", fixUnits+"; the radius is that of the bend's centreline")
	return bn
}

var ruleID = regexp.MustCompile(`^[a-z][a-z0-9_]*$`)

func (d *decoder) exception(b *hcl.Block) *Exception {
	e := &Exception{Src: newSrc(b)}
	if len(b.Labels) > 0 {
		e.Rule = b.Labels[0]
		if !ruleID.MatchString(e.Rule) {
			d.Errorf(b.LabelRanges[0], "Invalid rule id",
				"%q is not a rule id; write the id of the rule being excepted, e.g. exception \"froude_band\".", e.Rule)
		}
	}
	a, _ := d.attrs(b, exceptionSchema, &e.Src)
	e.ReachName, e.FromStation, e.ToStation = a.span(b.Body)
	a.require(b.Body, "reason")
	if reason, ok := a.text("reason"); ok {
		switch {
		case strings.TrimSpace(reason) == "":
			d.Errorf(a.m["reason"].Expr.Range(), "Empty reason",
				"A design exception must say why it is acceptable and who reviewed it; write the reason.")
		case !sentence(reason):
			d.Errorf(a.m["reason"].Expr.Range(), "Reason too short",
				"The reason of a design exception must be at least a sentence (%d words and %d letters) saying why the design is acceptable and who reviewed it, not a placeholder such as \"ok\" or \"TODO\".",
				MinReasonWords, MinReasonLetters)
		}
		e.Reason = reason
	}
	return e
}

// Bounds of a design exception's reason: a waiver must say why, in at
// least a sentence, so that "." or "ok" cannot excuse a failing design.
const (
	MinReasonWords   = 3
	MinReasonLetters = 10
)

// placeholderWords are words that alone make a reason a placeholder.
var placeholderWords = map[string]bool{
	"todo": true, "tbd": true, "fixme": true, "xxx": true, "n/a": true, "na": true,
	"none": true, "ok": true, "okay": true, "reason": true, "placeholder": true,
	"ignore": true, "ignored": true, "wip": true, "test": true, "see": true, "above": true,
	"below": true, "later": true, "fine": true, "reviewed": true, "approved": true, "-": true, ".": true,
}

// sentence reports whether a reason is at least a sentence: MinReasonWords
// words, MinReasonLetters letters, and not only placeholder words.
func sentence(reason string) bool {
	words := strings.Fields(reason)
	letters := 0
	for _, r := range reason {
		if unicode.IsLetter(r) {
			letters++
		}
	}
	if len(words) < MinReasonWords || letters < MinReasonLetters {
		return false
	}
	for _, w := range words {
		if !placeholderWords[strings.ToLower(strings.Trim(w, ".,;:!?\"'()"))] {
			return true
		}
	}
	return false
}

var outletKeys = []string{"depth", "elevation", "condition"}

func (d *decoder) event(b *hcl.Block) *Event {
	ev := &Event{Src: newSrc(b), Name: d.blockName(b)}
	a, _ := d.attrs(b, eventSchema, &ev.Src)
	a.require(b.Body, "inflow", "outlet")
	unit := d.m.Units.Length()
	if at, ok := a.m["inflow"]; ok {
		vals, n := d.reachValues(at.Expr, a.what, "inflow", "inflow to", `{ "main" = 12.5 }`, "Discharge must be positive",
			"give a positive discharge in "+unit+"³/s, or remove the entry", dischargeRange)
		for _, v := range vals {
			ev.Inflows = append(ev.Inflows, Inflow{ReachName: v.Key, Discharge: v.Value, Range: v.KeyRange})
		}
		if n == 0 && !hasErrorAt(d.Diags, at.Expr.Range()) {
			d.Errorf(at.Expr.Range(), "No inflow", "%s has no inflow; name at least one reach and its discharge, e.g. { \"main\" = 12.5 }.", a.what)
		}
	}
	if at, ok := a.m["outlet"]; ok {
		d.outlet(ev, a, at)
	}
	if a.has("return_period") {
		if rp, ok := a.positive("return_period", " years"); ok &&
			d.inRange(a.m["return_period"].Expr.Range(), label{attr: "return_period", owner: a.what}, rp, returnPeriodRange) {
			ev.ReturnPeriod = rp
		}
	}
	ev.Class = a.classWord("class", `"major"`)
	if at, ok := a.m["entrance"]; ok {
		vals, _ := d.reachValues(at.Expr, a.what, "entrance", "entrance depth of", `{ "chute" = 0.4 }`, "Depth must be positive",
			"give the known depth in "+unit+" at the upstream end, or remove the entry", depthRange)
		for _, v := range vals {
			ev.Entrances = append(ev.Entrances, Entrance{ReachName: v.Key, Depth: v.Value, Range: v.KeyRange})
		}
	}
	return ev
}

// reachValue is one `reach = number` entry of an event object.
type reachValue struct {
	Key      string
	KeyRange hcl.Range
	Value    float64
}

// reachValues decodes an object of reach names to positive numbers (the
// inflow or entrance of an event) and returns the valid entries and the
// number of entries written. attr is the attribute's name, what names one
// value in messages ("inflow to"), summary and hint make the error for
// a value that is not positive, and rng is the physical range of a value.
func (d *decoder) reachValues(expr hcl.Expression, event owner, attr, what, example, summary, hint string, rng valueRange) ([]reachValue, int) {
	entries, _ := d.object(expr, attr+" of "+event.String(), example)
	var out []reachValue
	for _, e := range entries {
		lbl := label{attr: what, owner: event, key: e.Key, in: true}
		v, ok := d.number(e.Value, lbl)
		if !ok {
			continue
		}
		if v <= 0 {
			d.Errorf(e.Value.Range(), summary, "%s %q in %s is %g; %s.", what, e.Key, event, v, hint)
			continue
		}
		if !d.inRange(e.Value.Range(), lbl, v, rng) {
			continue
		}
		out = append(out, reachValue{Key: e.Key, KeyRange: e.KeyRange, Value: v})
	}
	return out, len(entries)
}

func hasErrorAt(diags hcl.Diagnostics, rng hcl.Range) bool {
	for _, d := range diags {
		if d.Severity == hcl.DiagError && d.Subject != nil && d.Subject.Start.Byte >= rng.Start.Byte && d.Subject.End.Byte <= rng.End.Byte {
			return true
		}
	}
	return false
}

func (d *decoder) outlet(ev *Event, a attrSet, at *hclsyntax.Attribute) {
	ev.Outlet.Range = at.Expr.Range()
	entries, ok := d.object(at.Expr, "outlet of "+a.what.String(), `{ depth = 1.5 }`)
	if !ok {
		return
	}
	var chosen []entry
	for _, e := range entries {
		switch e.Key {
		case "depth", "elevation", "condition":
			chosen = append(chosen, e)
		default:
			d.Errorf(e.KeyRange, "Unknown outlet control",
				"%q is not an outlet control; use depth, elevation or condition = \"normal\" | \"critical\".%s", e.Key, suggest(e.Key, outletKeys))
			return
		}
	}
	switch len(chosen) {
	case 0:
		d.Errorf(at.Expr.Range(), "No outlet control",
			"The outlet of %s needs one control: depth = ..., elevation = ... or condition = \"normal\" | \"critical\".", a.what)
		return
	case 1:
	default:
		d.Errorf(chosen[1].KeyRange, "More than one outlet control",
			"The outlet of %s gives both %s and %s; keep exactly one.", a.what, chosen[0].Key, chosen[1].Key)
		return
	}
	e := chosen[0]
	ev.Outlet.Range = e.Value.Range()
	switch e.Key {
	case "depth":
		if y, ok := d.number(e.Value, label{attr: "outlet depth", owner: a.what}); ok {
			if y <= 0 {
				d.Errorf(e.Value.Range(), "Depth must be positive",
					"outlet depth of %s is %g; give the tailwater depth above the outlet invert in %s.", a.what, y, d.m.Units.Length())
				return
			}
			if !d.inRange(e.Value.Range(), label{attr: "outlet depth", owner: a.what}, y, depthRange) {
				return
			}
			ev.Outlet.Kind, ev.Outlet.Value = OutletDepth, y
		}
	case "elevation":
		if z, ok := d.number(e.Value, label{attr: "outlet elevation", owner: a.what}); ok &&
			d.elevation(e.Value.Range(), label{attr: "outlet elevation", owner: a.what}, z) {
			ev.Outlet.Kind, ev.Outlet.Value = OutletElevation, z
		}
	case "condition":
		if c, ok := d.text(e.Value, label{attr: "outlet condition", owner: a.what}); ok {
			switch OutletKind(c) {
			case OutletNormal, OutletCritical:
				ev.Outlet.Kind = OutletKind(c)
			default:
				d.Errorf(e.Value.Range(), "Unknown outlet condition",
					"condition must be \"normal\" or \"critical\", not %q.%s", c, suggest(c, []string{"normal", "critical"}))
			}
		}
	}
}
