package policies

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/model"
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
	b.SetAttributeValue("exceptions", cty.StringVal(p.Exceptions))
	for _, spec := range ruleSpecs {
		rc := p.Rules[spec.id]
		if rc == nil {
			continue
		}
		b.AppendNewline()
		b.AppendUnstructuredTokens(comment(fmt.Sprintf("from %s:%d", rc.File, rc.DefRange.Start.Line)))
		rb := b.AppendNewBlock(spec.id, nil).Body()
		for _, s := range spec.settings {
			switch s {
			case "minimum":
				rb.SetAttributeRaw(s, numberTokens(rc.Minimum))
			case "fraction":
				rb.SetAttributeRaw(s, numberTokens(rc.Fraction))
			case "limit":
				rb.SetAttributeRaw(s, limitTokens(rc.Limit))
			case "avoid":
				rb.SetAttributeRaw(s, bandTokens(rc.Avoid))
			case "subcritical_coefficient":
				rb.SetAttributeRaw(s, numberTokens(rc.SubcriticalCoefficient))
			case "supercritical_coefficient":
				rb.SetAttributeRaw(s, numberTokens(rc.SupercriticalCoefficient))
			}
		}
		rb.SetAttributeValue("severity", cty.StringVal(string(rc.Severity)))
		if rc.Events != nil {
			ev := make([]cty.Value, len(rc.Events))
			for i, e := range rc.Events {
				ev[i] = cty.StringVal(e)
			}
			rb.SetAttributeValue("events", cty.ListVal(ev))
		}
	}
	return hclwrite.Format(f.Bytes())
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

// formatNumber prints v as written when it has at most 8 significant
// digits, else rounded to 6 (the noise of a unit conversion), without an
// exponent for the magnitudes policies use.
func formatNumber(v float64) string {
	short := strconv.FormatFloat(v, 'e', -1, 64)
	mantissa := strings.TrimLeft(short[:strings.IndexByte(short, 'e')], "-")
	if len(strings.ReplaceAll(mantissa, ".", "")) > 8 {
		v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	}
	if a := math.Abs(v); a != 0 && (a < 1e-6 || a >= 1e15) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

func numberTokens(v float64) hclwrite.Tokens {
	s := formatNumber(v)
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
