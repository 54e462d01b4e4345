package model

import (
	"fmt"
	"slices"
	"strings"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// Plausible range of Manning's n. Published tables run from about 0.010
// (smooth glass, planed timber) to about 0.15–0.20 (floodplains in dense
// brush or timber); Source: Chow, Open-Channel Hydraulics (1959), Table 5-6
// (from memory). Above maxRoughness the value is almost certainly a unit or
// percentage slip and is an error; below minRoughness it is smoother than
// any lining and draws a warning.
const (
	maxRoughness = 0.3
	minRoughness = 0.008
)

var sectionSchema = &hcl.BodySchema{Attributes: []hcl.AttributeSchema{
	{Name: "shape"}, {Name: "bottom_width"}, {Name: "side_slope"}, {Name: "height"},
	{Name: "diameter"}, {Name: "roughness"}, {Name: "lining"}, {Name: "points"}, {Name: "banks"},
}}

// shapeAttrs lists, per shape, the attributes it requires and those it
// accepts besides them. Every shape accepts `shape` and `lining`.
var shapeAttrs = map[Shape]struct{ required, optional []string }{
	Rectangle: {required: []string{"bottom_width", "height", "roughness"}},
	Trapezoid: {required: []string{"bottom_width", "side_slope", "height", "roughness"}},
	Triangle:  {required: []string{"side_slope", "height", "roughness"}},
	Circle:    {required: []string{"diameter", "roughness"}},
	Box:       {required: []string{"bottom_width", "height", "roughness"}},
	Points:    {required: []string{"points", "roughness"}, optional: []string{"banks", "height"}},
}

var shapeNames = []string{string(Rectangle), string(Trapezoid), string(Triangle), string(Circle), string(Box), string(Points)}

func (d *decoder) section(b *hcl.Block) *Section {
	s := &Section{Src: newSrc(b), Name: d.blockName(b)}
	a, _ := d.attrs(b, sectionSchema, &s.Src)
	if !a.has("shape") {
		a.require(b.Body, "shape")
		return s
	}
	shape, ok := a.text("shape")
	if !ok {
		return s
	}
	s.Shape = Shape(shape)
	spec, known := shapeAttrs[s.Shape]
	if !known {
		d.Errorf(a.m["shape"].Expr.Range(), "Unknown section shape",
			"shape must be one of %s, not %q.%s", strings.Join(shapeNames, ", "), shape, suggest(shape, shapeNames))
		return s
	}
	allowed := map[string]bool{"shape": true, "lining": true}
	for _, n := range spec.required {
		allowed[n] = true
	}
	for _, n := range spec.optional {
		allowed[n] = true
	}
	for _, n := range inSourceOrder(a.m) {
		if !allowed[n] {
			hint := "remove it"
			if s.Shape == Circle && n == "height" {
				hint = "a circle's height is its diameter; remove it"
			}
			d.Errorf(a.m[n].NameRange, "Argument not used by this shape",
				"%s is not used by a %s section; %s.", n, s.Shape, hint)
		}
	}
	a.require(b.Body, spec.required...)
	if a.has("lining") {
		s.Lining, _ = a.text("lining")
	}
	switch s.Shape {
	case Rectangle, Trapezoid, Box:
		fix := fixUnits
		if s.Shape == Trapezoid {
			fix += `; a V-shaped channel is shape = "triangle"`
		}
		s.BottomWidth, _ = a.dimension("bottom_width", fix)
		s.Height, _ = a.dimension("height", fixUnits)
		if s.Shape == Trapezoid {
			var zok bool
			s.SideSlope, zok = a.sideSlope(false)
			if zok && s.BottomWidth > 0 && s.Height > 0 {
				d.topWidthAtMost(a, s.BottomWidth+2*s.SideSlope*s.Height, "bottom_width + 2 × side_slope × height")
			}
		}
	case Triangle:
		z, zok := a.sideSlope(true)
		s.SideSlope = z
		var hok bool
		s.Height, hok = a.dimension("height", fixUnits)
		// The top width at full height, 2·z·h, is the triangle's only
		// width: a slot narrower than MinDimension carries no flow
		// Manning's equation describes.
		if least := MinDimension.In(d.m.Units); zok && hok && 2*z*s.Height < least {
			d.below(a.m["side_slope"].Expr.Range(), "Section too narrow",
				label{attr: "the top width at full height (2 × side_slope × height)", owner: a.what}, 2*z*s.Height, least, d.unitSuffix(), whyDimension,
				"Check side_slope (the horizontal run per unit rise, e.g. 3 for 3:1) and height")
			s.SideSlope = 0
		}
		if zok && hok {
			d.topWidthAtMost(a, 2*z*s.Height, "2 × side_slope × height")
		}
	case Circle:
		s.Diameter, _ = a.dimension("diameter", fixUnits)
		s.Height = s.Diameter
	case Points:
		d.points(s, a)
	}
	if s.Shape != Points {
		if n, ok := a.roughness(a.m["roughness"]); ok {
			s.Roughness = [3]float64{n, n, n}
		}
	}
	return s
}

// sideSlope decodes side_slope (horizontal per unit vertical). A trapezoid
// accepts 0 (vertical walls); a triangle needs a positive slope.
func (a attrSet) sideSlope(positive bool) (float64, bool) {
	v, ok := a.number("side_slope")
	if !ok {
		return 0, false
	}
	rng := a.m["side_slope"].Expr.Range()
	switch {
	case positive && v <= 0:
		a.d.Errorf(rng, "Value must be positive",
			"side_slope of %s is %g; a triangle needs a positive side slope (horizontal run per unit rise).", a.what, v)
		return 0, false
	case v < 0:
		a.d.Errorf(rng, "Negative side slope",
			"side_slope of %s is %g; it is the horizontal run per unit rise and must be 0 or more.", a.what, v)
		return 0, false
	case v > MaxSideSlope:
		a.d.above(rng, "Side slope too flat", label{attr: "side_slope", owner: a.what}, v, MaxSideSlope, "",
			"side_slope is the horizontal run per unit rise, and a run of more than 1000 per unit (a cross slope under 0.1 %) is flatter than any surface graded to drain",
			"Write the run per unit rise (e.g. 3 for 3:1, 50 for a 2 % cross slope), not a percentage or a slope in the other sense")
		return 0, false
	}
	return v, true
}

// roughness decodes one Manning's n.
func (a attrSet) roughness(at *hclsyntax.Attribute) (float64, bool) {
	if at == nil {
		return 0, false
	}
	return a.manning(at.Expr)
}

func (a attrSet) manning(expr hcl.Expression) (float64, bool) {
	n, ok := a.d.number(expr, label{attr: "roughness", owner: a.what})
	if !ok {
		return 0, false
	}
	switch {
	case n <= 0:
		a.d.Errorf(expr.Range(), "Value must be positive",
			"roughness of %s is %g; Manning's n must be greater than 0 (concrete is about 0.013–0.015).", a.what, n)
		return 0, false
	case n > maxRoughness:
		a.d.Errorf(expr.Range(), "Implausible roughness",
			"roughness of %s is %g; Manning's n above %g is outside published tables. Write n itself, not a percentage or another coefficient.", a.what, n, maxRoughness)
		return 0, false
	case n < RoughnessFloor:
		a.d.below(expr.Range(), "Roughness too low", label{attr: "roughness", owner: a.what}, n, RoughnessFloor, "",
			"Manning's n of the smoothest tabulated surfaces (glass, lucite, planed timber) is about 0.008 to 0.010",
			"Write Manning's n itself (concrete is about 0.013 to 0.015), not another formula's coefficient")
		return 0, false
	case n < minRoughness:
		a.d.Warnf(expr.Range(), "Unusually low roughness",
			"roughness of %s is %g; Manning's n below %g is smoother than any channel lining. Check the value.", a.what, n, minRoughness)
	}
	return n, true
}

// points decodes a points section: the [offset, elevation] list, banks,
// roughness (one n or three: left overbank, main channel, right overbank)
// and the optional height.
//
// Offsets must not decrease from one point to the next; two consecutive
// points may share an offset (a vertical wall), three may not. The height
// defaults to the lower of the two end elevations minus the lowest
// elevation. Banks default to the first and last offsets, i.e. the whole
// section is main channel.
func (d *decoder) points(s *Section, a attrSet) {
	at, ok := a.m["points"]
	if !ok {
		return
	}
	const example = "[[0, 2.0], [5, 0.0], [10, 2.0]]"
	what := label{attr: "points", owner: a.what}
	items, ok := d.list(at.Expr, what, example)
	if !ok {
		return
	}
	if len(items) > MaxPoints {
		d.Errorf(at.Expr.Range(), "Too many points", "%s has %d points; at most %d are accepted.", what, len(items), MaxPoints)
		return
	}
	if len(items) < 3 {
		d.Errorf(at.Expr.Range(), "Too few points", "%s has %d point(s); a cross-section needs at least 3 [offset, elevation] pairs.", what, len(items))
		return
	}
	pts := make([]Point, 0, len(items))
	good := true
	for i, it := range items {
		pair, ok := d.pair(it, label{attr: "a point", owner: a.what}, "[offset, elevation]")
		if ok && !d.elevation(it.Range(), label{attr: fmt.Sprintf("the elevation of point %d", i+1), owner: a.what}, pair[1]) {
			ok = false
		}
		if !ok {
			good = false
			continue
		}
		pts = append(pts, Point{Offset: pair[0], Elevation: pair[1]})
		if !good || i == 0 {
			continue
		}
		prev := pts[i-1].Offset
		switch {
		case pair[0] < prev:
			d.Errorf(it.Range(), "Offsets out of order",
				"point %d of %s has offset %g, less than the %g before it; list the points from left to right.", i+1, a.what, pair[0], prev)
			good = false
		case pair[0] == prev && i >= 2 && pts[i-2].Offset == prev:
			d.Errorf(it.Range(), "Three points at one offset",
				"point %d of %s is the third at offset %g; a vertical wall needs two points, remove the middle one.", i+1, a.what, prev)
			good = false
		}
	}
	if !good {
		return
	}
	s.Points = pts
	first, last := pts[0], pts[len(pts)-1]
	if last.Offset <= first.Offset {
		d.Errorf(at.Expr.Range(), "Section has no width", "%s all lie at one offset; spread them across the channel.", what)
		return
	}
	width := label{attr: "the width of the points (last offset − first offset)", owner: a.what}
	if least := MinDimension.In(d.m.Units); last.Offset-first.Offset < least {
		d.below(at.Expr.Range(), "Section too narrow", width, last.Offset-first.Offset, least, d.unitSuffix(), whyDimension, fixUnits+" of the offsets")
		return
	}
	if most := MaxDimension.In(d.m.Units); last.Offset-first.Offset > most {
		d.above(at.Expr.Range(), "Section too wide", width, last.Offset-first.Offset, most, d.unitSuffix(), whyBigDimension, fixUnits+" of the offsets")
		return
	}
	low := first.Elevation
	for _, p := range pts {
		low = min(low, p.Elevation)
	}
	if a.has("height") {
		s.Height, _ = a.dimension("height", fixUnits)
		// A height above the surveyed ground at an end would put the top
		// of bank on imaginary walls: water above the ground there spills
		// out of the section, and a capacity check against the height
		// would pass a flow that overtops the real ground.
		if ground := min(first.Elevation, last.Elevation) - low; s.Height > ground*(1+1e-9) {
			end, elev := "left", first.Elevation
			if last.Elevation < first.Elevation {
				end, elev = "right", last.Elevation
			}
			d.Errorf(a.m["height"].Expr.Range(), "Height above the ground",
				"height of %s is %g%s above its lowest point, but the surveyed ground at its %s end (elevation %g) is only %g%s above it: water above the ground would spill out of the section. Lower height to at most %g, or extend the points to higher ground.",
				a.what, s.Height, d.unitSuffix(), end, elev, ground, d.unitSuffix(), ground)
		}
	} else {
		s.Height = min(first.Elevation, last.Elevation) - low
		if s.Height <= 0 {
			d.Errorf(at.Expr.Range(), "Section holds no water",
				"The lowest point of %s is at an end, so the section has no depth below its lower end; add points that rise at both ends, or write height.", a.what)
		} else if least := MinDimension.In(d.m.Units); s.Height < least {
			d.below(at.Expr.Range(), "Section too shallow", label{attr: "the depth below the lower end of the points", owner: a.what},
				s.Height, least, d.unitSuffix(), whyDimension, fixUnits+" of the elevations")
		}
	}
	s.Banks = [2]float64{first.Offset, last.Offset}
	if bk, ok := a.m["banks"]; ok {
		if pair, ok := d.pair(bk.Expr, label{attr: "banks", owner: a.what}, "[left offset, right offset]"); ok {
			switch {
			case pair[0] < first.Offset || pair[1] > last.Offset:
				d.Errorf(bk.Expr.Range(), "Bank outside the section",
					"banks of %s are [%g, %g]; both must lie within the point offsets %g to %g.", a.what, pair[0], pair[1], first.Offset, last.Offset)
			case pair[0] >= pair[1]:
				d.Errorf(bk.Expr.Range(), "Banks out of order",
					"banks of %s are [%g, %g]; write the left bank offset first, smaller than the right.", a.what, pair[0], pair[1])
			case pair[1]-pair[0] < MinDimension.In(d.m.Units):
				d.below(bk.Expr.Range(), "Main channel too narrow", label{attr: "the width between the banks", owner: a.what},
					pair[1]-pair[0], MinDimension.In(d.m.Units), d.unitSuffix(), whyDimension, fixUnits+" of the bank offsets")
			default:
				s.Banks = [2]float64{pair[0], pair[1]}
			}
		}
	}
	if r, ok := a.m["roughness"]; ok {
		d.zoneRoughness(s, a, r)
	}
}

// zoneRoughness decodes the roughness of a points section: one number for
// the whole section or [left overbank, main channel, right overbank].
func (d *decoder) zoneRoughness(s *Section, a attrSet, r *hclsyntax.Attribute) {
	if _, isList := hcl.ExprList(r.Expr); isList.HasErrors() {
		if n, ok := a.manning(r.Expr); ok {
			s.Roughness = [3]float64{n, n, n}
		}
		return
	}
	items, ok := d.list(r.Expr, label{attr: "roughness", owner: a.what}, "[0.06, 0.035, 0.06]")
	if !ok {
		return
	}
	if len(items) != 3 {
		d.Errorf(r.Expr.Range(), "Three roughness values required",
			"roughness of %s has %d values; write one n, or three: [left overbank, main channel, right overbank].", a.what, len(items))
		return
	}
	for i, it := range items {
		if n, ok := a.manning(it); ok {
			s.Roughness[i] = n
		}
	}
}

// pair decodes a two-number list such as [offset, elevation].
func (d *diagnoser) pair(expr hcl.Expression, what label, form string) ([2]float64, bool) {
	items, ok := d.list(expr, what, form)
	if !ok {
		return [2]float64{}, false
	}
	if len(items) != 2 {
		d.Errorf(expr.Range(), "Two numbers required", "%s must be %s, two numbers; it has %d.", what, form, len(items))
		return [2]float64{}, false
	}
	var out [2]float64
	for i, it := range items {
		v, ok := d.number(it, what)
		if !ok {
			return out, false
		}
		out[i] = v
	}
	return out, true
}

// inSourceOrder returns the attribute names in the order they were written.
func inSourceOrder(m hclsyntax.Attributes) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(x, y string) int { return m[x].SrcRange.Start.Byte - m[y].SrcRange.Start.Byte })
	return keys
}

// topWidthAtMost refuses a trapezoid or triangle whose top width at full
// height, each of its dimensions in range, is beyond MaxDimension (a side
// slope of 1000 on a bank 200 m high), at its side_slope.
func (d *decoder) topWidthAtMost(a attrSet, top float64, formula string) {
	if most := MaxDimension.In(d.m.Units); top > most {
		d.above(a.m["side_slope"].Expr.Range(), "Section too wide",
			label{attr: "the top width at full height (" + formula + ")", owner: a.what}, top, most, d.unitSuffix(), whyBigDimension,
			"Check side_slope (the horizontal run per unit rise) and height")
	}
}
