package policies

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/hashicorp/hcl/v2"
	"github.com/zclconf/go-cty/cty"
)

// A rule may have several blocks in a policy, each with a selector on the
// events and reaches it applies to. For one event and one reach the block
// that applies is the most specific of those whose selector matches: the
// one with the most selector attributes written. Two blocks of a rule with
// as many selector attributes whose selectors can match the same event and
// reach tie; the loader refuses a tie, so resolution never has to choose
// arbitrarily.

// Selector is what a rule block applies to besides its `events` names.
// An empty field selects everything on its dimension.
type Selector struct {
	// ReturnPeriod is an inclusive range of event return periods in years
	// (`return_period = [low, high]`, either end null for open); an event
	// without a return period is not in any range.
	ReturnPeriod    [2]float64
	HasReturnPeriod bool
	EventClasses    []string // `event_classes`: the events' class words
	ReachClasses    []string // `reach_classes`: the reaches' class words
	Shapes          []string // `shapes`: the shapes of the reaches' sections
	Linings         []string // `linings`: the lining words of the reaches' sections
}

// SelectorSettings are the selector attributes a rule block takes, with
// their documentation, in the order `policy show` writes them.
var SelectorSettings = []CommonSetting{
	{"return_period", "[low, high] in years, inclusive, either end null for open; selects events by return_period"},
	{"event_classes", "a list of event class words; selects events by class"},
	{"reach_classes", "a list of reach class words; selects reaches by class"},
	{"shapes", "a list of section shapes; selects reaches by the shape of their section"},
	{"linings", "a list of lining words; selects reaches by the lining of their section"},
}

// Specificity is the number of selector attributes the block writes,
// `events` included: the most specific matching block applies.
func (c *RuleConfig) Specificity() int {
	n := 0
	if c.Events != nil {
		n++
	}
	s := &c.Select
	if s.HasReturnPeriod {
		n++
	}
	for _, l := range [][]string{s.EventClasses, s.ReachClasses, s.Shapes, s.Linings} {
		if l != nil {
			n++
		}
	}
	return n
}

// Selective reports whether the block writes any selector.
func (c *RuleConfig) Selective() bool { return c.Specificity() > 0 }

// MatchesEvent reports whether the block's event selectors admit ev.
func (c *RuleConfig) MatchesEvent(ev *model.Event) bool {
	if ev == nil {
		return false
	}
	if !c.AppliesTo(ev.Name) {
		return false
	}
	s := &c.Select
	if s.HasReturnPeriod && (ev.ReturnPeriod <= 0 || ev.ReturnPeriod < s.ReturnPeriod[0] || ev.ReturnPeriod > s.ReturnPeriod[1]) {
		return false
	}
	return s.EventClasses == nil || slices.Contains(s.EventClasses, ev.Class)
}

// MatchesReach reports whether the block's reach selectors admit r. Shapes
// and linings are those of the section the reach names; a segment with
// another section keeps the block chosen for its reach.
func (c *RuleConfig) MatchesReach(r *model.Reach) bool {
	s := &c.Select
	if s.ReachClasses == nil && s.Shapes == nil && s.Linings == nil {
		return true
	}
	if r == nil {
		return false
	}
	if s.ReachClasses != nil && !slices.Contains(s.ReachClasses, r.Class) {
		return false
	}
	if s.Shapes == nil && s.Linings == nil {
		return true
	}
	if r.Section == nil {
		return false
	}
	return (s.Shapes == nil || slices.Contains(s.Shapes, string(r.Section.Shape))) &&
		(s.Linings == nil || slices.Contains(s.Linings, r.Section.Lining))
}

// Blocks returns every block of the rule: c itself, then the others.
func (c *RuleConfig) Blocks() []*RuleConfig {
	if c == nil {
		return nil
	}
	return append([]*RuleConfig{c}, c.More...)
}

// Resolve returns the block of the rule that applies to an event on a
// reach: the most specific matching one (the first in order on a tie,
// which the loader refuses), or nil when none matches.
func (c *RuleConfig) Resolve(ev *model.Event, r *model.Reach) *RuleConfig {
	var best *RuleConfig
	for _, b := range c.Blocks() {
		if b.MatchesEvent(ev) && b.MatchesReach(r) && (best == nil || b.Specificity() > best.Specificity()) {
			best = b
		}
	}
	return best
}

// sameSelector reports whether two blocks select exactly the same.
func sameSelector(a, b *RuleConfig) bool {
	sa, sb := &a.Select, &b.Select
	return slices.Equal(a.Events, b.Events) && (a.Events == nil) == (b.Events == nil) &&
		sa.HasReturnPeriod == sb.HasReturnPeriod && sa.ReturnPeriod == sb.ReturnPeriod &&
		sameWords(sa.EventClasses, sb.EventClasses) && sameWords(sa.ReachClasses, sb.ReachClasses) &&
		sameWords(sa.Shapes, sb.Shapes) && sameWords(sa.Linings, sb.Linings)
}

func sameWords(a, b []string) bool {
	return (a == nil) == (b == nil) && slices.Equal(slices.Sorted(slices.Values(a)), slices.Sorted(slices.Values(b)))
}

// mayOverlap reports whether some event on some reach could match both
// blocks: on every dimension both select, their selections intersect. An
// event-name list and a return-period range are different dimensions, so
// they can always meet.
func mayOverlap(a, b *RuleConfig) bool {
	sa, sb := &a.Select, &b.Select
	if sa.HasReturnPeriod && sb.HasReturnPeriod &&
		(sa.ReturnPeriod[1] < sb.ReturnPeriod[0] || sb.ReturnPeriod[1] < sa.ReturnPeriod[0]) {
		return false
	}
	return meet(a.Events, b.Events) && meet(sa.EventClasses, sb.EventClasses) &&
		meet(sa.ReachClasses, sb.ReachClasses) && meet(sa.Shapes, sb.Shapes) && meet(sa.Linings, sb.Linings)
}

// meet reports whether two word selections intersect (nil is every word).
func meet(a, b []string) bool {
	if a == nil || b == nil {
		return true
	}
	for _, w := range a {
		if slices.Contains(b, w) {
			return true
		}
	}
	return false
}

// ties reports the blocks of each rule that tie: as specific as another
// block whose selector can match the same event and reach. Blocks with the
// same selector cannot reach here from one file (the decoder refuses a
// duplicate) and are replaced by merge across files.
func ties(p *Policy) hcl.Diagnostics {
	var diags hcl.Diagnostics
	for _, id := range slices.Sorted(maps.Keys(p.Rules)) {
		blocks := p.Rules[id].Blocks()
		for i, b := range blocks {
			for _, a := range blocks[:i] {
				if a.Specificity() != b.Specificity() || !mayOverlap(a, b) {
					continue
				}
				diags = append(diags, &hcl.Diagnostic{
					Severity: hcl.DiagError,
					Summary:  "Rule blocks tie",
					Detail: fmt.Sprintf("This %s block (%s) and the one at %s:%d (%s) are equally specific and can both apply to the same event on the same reach, so neither is the more specific. Add a selector to the one that should win, or make their selections disjoint.",
						id, b.SelectorText(), a.File, a.DefRange.Start.Line, a.SelectorText()),
					Subject: b.DefRange.Ptr(),
				})
			}
		}
	}
	return diags
}

// SelectorText describes the block's selection in words: "events q100;
// return period 50 years or more; reach classes roadside-ditch"; "every event
// and reach" without a selector.
func (c *RuleConfig) SelectorText() string {
	var parts []string
	if c.Events != nil {
		parts = append(parts, "events "+strings.Join(c.Events, ", "))
	}
	s := &c.Select
	if s.HasReturnPeriod {
		parts = append(parts, "return period "+rangeText(s.ReturnPeriod))
	}
	for _, w := range []struct {
		name  string
		words []string
	}{{"event classes", s.EventClasses}, {"reach classes", s.ReachClasses}, {"shapes", s.Shapes}, {"linings", s.Linings}} {
		if w.words != nil {
			parts = append(parts, w.name+" "+strings.Join(w.words, ", "))
		}
	}
	if len(parts) == 0 {
		return "every event and reach"
	}
	return strings.Join(parts, "; ")
}

// rangeText is a return-period range in words: "10–50 years", "50 years
// or more", "up to 20 years".
func rangeText(r [2]float64) string {
	switch {
	case math.IsInf(r[1], 1):
		return numfmt.Written(r[0]) + " years or more"
	case r[0] == 0:
		return "up to " + numfmt.Written(r[1]) + " years"
	}
	return numfmt.Written(r[0]) + "–" + numfmt.Written(r[1]) + " years"
}

// selector decodes the selector attributes of a rule block into s.
func (d *decoder) selector(content *hcl.BodyContent, s *Selector) {
	if a := content.Attributes["return_period"]; a != nil {
		s.ReturnPeriod, s.HasReturnPeriod = d.returnPeriod(a)
	}
	if a := content.Attributes["event_classes"]; a != nil {
		s.EventClasses = d.words(a, "class word", `["major"]`, model.IsClassWord)
	}
	if a := content.Attributes["reach_classes"]; a != nil {
		s.ReachClasses = d.words(a, "class word", `["roadside-ditch"]`, model.IsClassWord)
	}
	if a := content.Attributes["shapes"]; a != nil {
		s.Shapes = d.words(a, "shape", `["trapezoid"]`, func(w string) bool { return slices.Contains(model.ShapeNames, w) })
	}
	if a := content.Attributes["linings"]; a != nil {
		s.Linings = d.words(a, "lining word", `["grass"]`, func(w string) bool { return strings.TrimSpace(w) != "" })
	}
}

// returnPeriod reads [low, high] in years, low ≤ high, both positive,
// either null for an open end.
func (d *decoder) returnPeriod(a *hcl.Attribute) ([2]float64, bool) {
	const shape = "return_period must be [low, high] in years, e.g. [50, null] for 50 years and rarer"
	if !d.literal(a.Expr) {
		return [2]float64{}, false
	}
	elems, diags := hcl.ExprList(a.Expr)
	if diags.HasErrors() || len(elems) != 2 {
		d.Errorf(a.Expr.Range(), `Invalid value for "return_period"`, "%s.", shape)
		return [2]float64{}, false
	}
	r := [2]float64{0, math.Inf(1)}
	for i, e := range elems {
		if v, diags := e.Value(nil); !diags.HasErrors() && v.IsNull() {
			continue
		}
		f, ok := d.number(e, "return_period")
		if !ok {
			return [2]float64{}, false
		}
		if f <= 0 {
			d.Errorf(e.Range(), `Invalid value for "return_period"`, "A return period is a positive number of years; got %g.", f)
			return [2]float64{}, false
		}
		r[i] = f
	}
	if r[0] > r[1] {
		d.Errorf(a.Expr.Range(), `Invalid value for "return_period"`, "The low end must not be above the high end; got [%g, %g].", r[0], r[1])
		return [2]float64{}, false
	}
	if r[0] == 0 && math.IsInf(r[1], 1) {
		d.Errorf(a.Expr.Range(), `Invalid value for "return_period"`, "[null, null] selects every event that has a return period; give at least one end.")
		return [2]float64{}, false
	}
	return r, true
}

// words reads a non-empty list of distinct words, each admitted by ok;
// what names one word in messages.
func (d *decoder) words(a *hcl.Attribute, what, example string, ok func(string) bool) []string {
	if !d.literal(a.Expr) {
		return nil
	}
	elems, diags := hcl.ExprList(a.Expr)
	if diags.HasErrors() || len(elems) == 0 {
		d.Errorf(a.Expr.Range(), fmt.Sprintf("Invalid value for %q", a.Name), "%s must be a non-empty list of %ss, e.g. %s.", a.Name, what, example)
		return nil
	}
	out := make([]string, 0, len(elems))
	for _, e := range elems {
		v, good := d.exprValue(e, a.Name, cty.String, "a list of "+what+"s (strings)")
		if !good {
			continue
		}
		w := v.AsString()
		switch {
		case !ok(w):
			detail := fmt.Sprintf("%q is not a valid %s.", w, what)
			if what == "shape" {
				detail += " The shapes are " + strings.Join(model.ShapeNames, ", ") + "."
			} else if what == "class word" {
				detail += fmt.Sprintf(" A class word is letters, digits, \"-\" or \"_\" (at most %d).", model.MaxClassWord)
			}
			d.Errorf(e.Range(), "Invalid "+what, "%s", detail)
		case slices.Contains(out, w):
			d.Warnf(e.Range(), "Word listed twice", "%q is already in this list.", w)
		default:
			out = append(out, w)
		}
	}
	if len(out) == 0 {
		return nil
	}
	return out
}
