package policies

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/hashicorp/hcl/v2/hclwrite"
	"github.com/zclconf/go-cty/cty"
)

// Format renders the effective policy as HCL that loads back to the same
// settings: a comment with the chain it came from, then one policy block
// whose rule blocks each carry a comment naming the file and line that set
// them. A number converted from other units is rounded to 6 significant
// digits, so the text loads back to the same settings within 5e-6
// relative.
func Format(p *Policy) []byte {
	f := hclwrite.NewEmptyFile()
	top := f.Body()
	top.AppendUnstructuredTokens(comment(fmt.Sprintf("Effective policy %q in %s units.", p.Name, p.Units)))
	top.AppendUnstructuredTokens(comment(unitNote(p)))
	top.AppendUnstructuredTokens(comment("Merged from (child first): " + strings.Join(p.Chain, " → ")))
	top.AppendNewline()
	b := top.AppendNewBlock("policy", []string{p.Name}).Body()
	b.SetAttributeValue("units", cty.StringVal(string(p.Units)))
	if p.Reference != "" {
		b.SetAttributeValue("reference", cty.StringVal(p.Reference))
	}
	if p.Version != "" {
		b.SetAttributeValue("version", cty.StringVal(p.Version))
	}
	b.SetAttributeValue("exceptions", cty.StringVal(p.Exceptions))
	if len(p.WaiveAlwaysOn) > 0 {
		vals := make([]cty.Value, len(p.WaiveAlwaysOn))
		for i, w := range p.WaiveAlwaysOn {
			vals[i] = cty.StringVal(w)
		}
		b.SetAttributeValue("waive_always_on", cty.ListVal(vals))
	}
	for _, id := range slices.Sorted(maps.Keys(p.Rules)) {
		blocks := p.Rules[id].Blocks()
		if len(blocks) > 1 {
			b.AppendNewline()
			b.AppendUnstructuredTokens(comment(id + ": the most specific matching block applies:"))
			for i, rc := range ordered(blocks) {
				b.AppendUnstructuredTokens(comment(fmt.Sprintf("  %d. %s (specificity %d, %s:%d)", i+1, rc.SelectorText(), rc.Specificity(), rc.File, rc.DefRange.Start.Line)))
			}
		}
		for _, rc := range blocks {
			b.AppendNewline()
			b.AppendUnstructuredTokens(comment(fmt.Sprintf("from %s:%d", rc.File, rc.DefRange.Start.Line)))
			for _, c := range packCitations(rc) {
				b.AppendUnstructuredTokens(comment("  " + c))
			}
			writeBlock(b.AppendNewBlock(id, nil).Body(), rc)
		}
	}
	return hclwrite.Format(f.Bytes())
}

// packCitations are the source notes a built-in pack writes beside a rule
// block, so that `policy show` keeps the citation of every number it
// shows: the comment lines just above the block and inside it, an inline
// comment prefixed with the setting or lining word it follows ("concrete:
// ≈ 20 ft/s ..."). Nil for a block that does not come from a pack.
func packCitations(rc *RuleConfig) []string {
	name, ok := strings.CutPrefix(rc.File, packPrefix)
	if !ok {
		return nil
	}
	src, ok := packSources[name]
	if !ok {
		return nil
	}
	lines := strings.Split(string(src), "\n")
	start := rc.DefRange.Start.Line - 1 // 0-based line of the block header
	if start < 0 || start >= len(lines) {
		return nil
	}
	first := start
	for first > 0 && strings.HasPrefix(strings.TrimSpace(lines[first-1]), "#") {
		first--
	}
	var out []string
	depth := 0
	for i := first; i < len(lines); i++ {
		line := strings.TrimSpace(lines[i])
		if text, ok := strings.CutPrefix(line, "#"); ok {
			out = append(out, strings.TrimSpace(text))
			continue
		}
		code, note, inline := strings.Cut(line, "#")
		if inline {
			key, _, _ := strings.Cut(code, "=")
			out = append(out, strings.TrimSpace(key)+": "+strings.TrimSpace(note))
		}
		if i >= start {
			depth += strings.Count(code, "{") - strings.Count(code, "}")
			if depth <= 0 && strings.Contains(code, "}") {
				break
			}
		}
	}
	return out
}

// ordered lists a rule's blocks from the most specific down, in source
// order among equals: the order in which they are tried.
func ordered(blocks []*RuleConfig) []*RuleConfig {
	out := slices.Clone(blocks)
	slices.SortStableFunc(out, func(a, b *RuleConfig) int { return b.Specificity() - a.Specificity() })
	return out
}

// writeBlock writes one rule block: its settings, severity, section and
// selectors.
func writeBlock(rb *hclwrite.Body, rc *RuleConfig) {
	if rc.Spec != nil {
		for i := range rc.Spec.Settings {
			s := &rc.Spec.Settings[i]
			if toks := settingTokens(s, rc); toks != nil {
				rb.SetAttributeRaw(s.Name, toks)
			}
		}
	}
	rb.SetAttributeValue("severity", cty.StringVal(string(rc.Severity)))
	if rc.Section != "" {
		rb.SetAttributeValue("section", cty.StringVal(rc.Section))
	}
	if rc.Events != nil {
		rb.SetAttributeValue("events", stringList(rc.Events))
	}
	sel := &rc.Select
	if sel.HasReturnPeriod {
		ends := make([]hclwrite.Tokens, 2)
		for i, v := range sel.ReturnPeriod {
			if v == 0 || math.IsInf(v, 1) {
				ends[i] = hclwrite.TokensForValue(cty.NullVal(cty.Number))
			} else {
				ends[i] = numberTokens(v)
			}
		}
		rb.SetAttributeRaw("return_period", hclwrite.TokensForTuple(ends))
	}
	for _, w := range []struct {
		name  string
		words []string
	}{{"event_classes", sel.EventClasses}, {"reach_classes", sel.ReachClasses}, {"shapes", sel.Shapes}, {"linings", sel.Linings}} {
		if w.words != nil {
			rb.SetAttributeValue(w.name, stringList(w.words))
		}
	}
}

func stringList(ws []string) cty.Value {
	vals := make([]cty.Value, len(ws))
	for i, w := range ws {
		vals[i] = cty.StringVal(w)
	}
	return cty.ListVal(vals)
}

// unitNote says what the numbers of p are in.
func unitNote(p *Policy) string {
	if p.Units == model.US {
		return "Lengths in ft, velocities in ft/s, shear stresses in lb/ft²."
	}
	return "Lengths in m, velocities in m/s, shear stresses in N/m²."
}

func comment(text string) hclwrite.Tokens {
	return hclwrite.Tokens{{Type: hclsyntax.TokenComment, Bytes: []byte("# " + text + "\n")}}
}

// settingTokens writes the value of a setting; nil for a PerLining or
// FroudeBands setting that is not set.
func settingTokens(s *Setting, rc *RuleConfig) hclwrite.Tokens {
	v, ok := rc.Values[s.Name]
	switch s.Kind {
	case Number:
		return numberTokens(rc.Number(s.Name))
	case PerLining:
		if ok {
			return limitTokens(v.Table)
		}
	case FroudeBands:
		if ok {
			return bandTokens(v.Bands)
		}
	case Choice:
		return hclwrite.TokensForValue(cty.StringVal(rc.Word(s.Name)))
	}
	return nil
}

func numberTokens(v float64) hclwrite.Tokens {
	s := numfmt.Written(v)
	var toks hclwrite.Tokens
	if strings.HasPrefix(s, "-") {
		toks = append(toks, &hclwrite.Token{Type: hclsyntax.TokenMinus, Bytes: []byte("-")})
		s = s[1:]
	}
	return append(toks, &hclwrite.Token{Type: hclsyntax.TokenNumberLit, Bytes: []byte(s)})
}

func limitTokens(b ByLining) hclwrite.Tokens {
	if len(b.Values) == 0 && len(b.NoLimit) == 0 && b.HasDefault {
		return numberTokens(b.Default)
	}
	keys := make([]string, 0, len(b.Values)+len(b.NoLimit))
	for k := range b.Values {
		keys = append(keys, k)
	}
	for k := range b.NoLimit {
		if _, dup := b.Values[k]; !dup {
			keys = append(keys, k)
		}
	}
	slices.Sort(keys)
	var attrs []hclwrite.ObjectAttrTokens
	for _, k := range keys {
		val := hclwrite.TokensForValue(cty.NullVal(cty.Number))
		if v, ok := b.Values[k]; ok {
			val = numberTokens(v)
		}
		attrs = append(attrs, hclwrite.ObjectAttrTokens{Name: keyTokens(k), Value: val})
	}
	if b.HasDefault {
		attrs = append(attrs, hclwrite.ObjectAttrTokens{Name: hclwrite.TokensForIdentifier("default"), Value: numberTokens(b.Default)})
	}
	return hclwrite.TokensForObject(attrs)
}

// keyTokens writes a lining word bare when it is an identifier other than
// "default", else quoted.
func keyTokens(k string) hclwrite.Tokens {
	if k != "default" && hclsyntax.ValidIdentifier(k) {
		return hclwrite.TokensForIdentifier(k)
	}
	return hclwrite.TokensForValue(cty.StringVal(k))
}

func bandTokens(bands []Band) hclwrite.Tokens {
	elems := make([]hclwrite.Tokens, len(bands))
	for i, b := range bands {
		elems[i] = hclwrite.TokensForTuple([]hclwrite.Tokens{numberTokens(b.Low), numberTokens(b.High)})
	}
	return hclwrite.TokensForTuple(elems)
}

// Summary describes the settings of a rule block in one line, in the
// policy's units u, with num formatting each number: "minimum 0.3 m;
// fraction 0.2" or "limit concrete 6, grass 1.5, sand no limit, other
// linings 2 m/s". It follows the rule's spec; "" for a block without
// settings.
func (rc *RuleConfig) Summary(u model.Units, num func(float64) string) string {
	if rc.Spec == nil {
		return ""
	}
	var parts []string
	for i := range rc.Spec.Settings {
		s := &rc.Spec.Settings[i]
		unit := s.Quantity.Unit(u)
		if unit != "" {
			unit = " " + unit
		}
		switch s.Kind {
		case Number:
			parts = append(parts, s.Name+" "+num(rc.Number(s.Name))+unit)
		case PerLining:
			t, ok := rc.Values[s.Name]
			if !ok {
				continue
			}
			var items []string
			for _, w := range slices.Sorted(maps.Keys(t.Table.Values)) {
				items = append(items, w+" "+num(t.Table.Values[w]))
			}
			for _, w := range slices.Sorted(maps.Keys(t.Table.NoLimit)) {
				if t.Table.NoLimit[w] {
					items = append(items, w+" no limit")
				}
			}
			if t.Table.HasDefault {
				items = append(items, "other linings "+num(t.Table.Default))
			}
			parts = append(parts, s.Name+" "+strings.Join(items, ", ")+unit)
		case Choice:
			parts = append(parts, s.Name+" "+rc.Word(s.Name))
		case FroudeBands:
			var items []string
			for _, b := range rc.Bands(s.Name) {
				items = append(items, num(b.Low)+" – "+num(b.High))
			}
			if len(items) > 0 {
				parts = append(parts, s.Name+" "+strings.Join(items, ", "))
			}
		}
	}
	return strings.Join(parts, "; ")
}
