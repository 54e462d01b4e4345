package model

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"

	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/numfmt"
	suggestpkg "github.com/chanlint/chanlint/model/suggest"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/zclconf/go-cty/cty"
)

// MaxMagnitude bounds every number of a model: a value whose magnitude is
// larger is rejected before any arithmetic can overflow downstream.
const MaxMagnitude = 1e9

// diagnoser accumulates the diagnostics of one file and decodes values
// with the model's wording.
type diagnoser struct {
	hclkit.Diagnostics
	src []byte // the file's text, which the ranges of its expressions index
}

// literalOnly reports a diagnostic for every construct of expr that a model
// may not use. A model is untrusted input: only literal values (a number
// may carry a sign), lists, objects, quoted strings and parentheses are
// accepted. Function calls, variables, arithmetic, for expressions,
// conditionals, splats and indexing are rejected, so that evaluation takes
// time proportional to the size of the source and reads nothing from
// outside the file.
func (d *diagnoser) literalOnly(expr hcl.Expression) bool {
	return hclkit.Literal(expr, modelAllows, d.rejectConstruct)
}

// modelAllows is what a model accepts besides literal values: the logical
// negation of a literal (which then fails as a bool where a number or a
// string is wanted). An interpolation, even of a literal, is refused.
var modelAllows = hclkit.Allow{Not: true}

// rejectConstruct words the diagnostic of a construct literalOnly found.
func (d *diagnoser) rejectConstruct(c hclkit.Construct, e hcl.Expression) {
	switch c {
	case hclkit.Operator:
		// Arbitrary-precision arithmetic on huge operands can take
		// tens of milliseconds per operation, so a hostile file of
		// such expressions would run for hours; a model gives values.
		d.Errorf(e.Range(), "Arithmetic not allowed",
			"A model holds values, not formulas; write the result of this expression as a number.")
	case hclkit.Variable:
		name := hclkit.TraversalName(e.(*hclsyntax.ScopeTraversalExpr).Traversal)
		d.Errorf(e.Range(), "Variables not allowed",
			"A model holds literal values only; %q is a name, not a value. Quote it if it is text (\"%s\") or write the number.",
			name, name)
	case hclkit.Call:
		call := e.(*hclsyntax.FunctionCallExpr)
		d.Errorf(call.NameRange, "Function calls not allowed",
			"A model is untrusted input and no functions are evaluated in it; write the value of %s(...) as a literal.", call.Name)
	case hclkit.Interpolation:
		d.Errorf(e.Range(), "Interpolation not allowed",
			"A model holds literal text; write the text itself instead of ${...} (write $${ for a literal ${).")
	case hclkit.LoneInterpolation:
		d.Errorf(e.Range(), "Interpolation not allowed",
			"A model holds literal values; write the value itself instead of \"${...}\".")
	default:
		d.Errorf(e.Range(), "Expression not allowed",
			"A model holds literal values, lists and objects only; write the value itself instead of this expression.")
	}
}

// literal is the value of the two forms nearly every attribute of a model
// takes, a bare literal (a number, true, false, null) and a quoted string
// without interpolation, read without walking and evaluating the
// expression: the value is the one Value would return.
func literal(expr hcl.Expression) (cty.Value, bool) {
	switch e := expr.(type) {
	case *hclsyntax.LiteralValueExpr:
		return e.Val, true
	case *hclsyntax.TemplateExpr:
		if len(e.Parts) == 1 {
			if lit, ok := e.Parts[0].(*hclsyntax.LiteralValueExpr); ok && lit.Val.Type() == cty.String && !lit.Val.IsNull() {
				return lit.Val, true
			}
		}
	}
	return cty.NilVal, false
}

// quoted is `kind "name"`, e.g. reach "main", as %s %q formats it. A
// name of printable ASCII without quotes or backslashes, the usual one, is
// quoted as it stands, which is what strconv.Quote would do.
func quoted(kind, name string) string {
	for i := 0; i < len(name); i++ {
		if c := name[i]; c < 0x20 || c > 0x7e || c == '"' || c == '\\' {
			return kind + " " + strconv.Quote(name)
		}
	}
	return kind + ` "` + name + `"`
}

// value evaluates a literal expression with no evaluation context.
func (d *diagnoser) value(expr hcl.Expression) (cty.Value, bool) {
	v, ok := literal(expr)
	if !ok {
		if !d.literalOnly(expr) {
			return cty.NilVal, false
		}
		var diags hcl.Diagnostics
		v, diags = expr.Value(nil)
		if d.Append(diags) {
			return cty.NilVal, false
		}
	}
	if v.IsNull() {
		d.Errorf(expr.Range(), "Missing value", "null is not a value here; write the value or remove the line.")
		return cty.NilVal, false
	}
	if !v.IsWhollyKnown() {
		d.Errorf(expr.Range(), "Unknown value", "The value could not be determined; write it as a literal.")
		return cty.NilVal, false
	}
	return v, true
}

// owner names the object a value belongs to in messages, e.g. reach
// "main" as quoted writes it; like label, it is only formatted when a
// message is written.
type owner struct {
	kind, name string
	named      bool // false: kind alone, e.g. segment or a whole phrase
}

// ownerOf is the object kind "name", e.g. ownerOf("reach", "main").
func ownerOf(kind, name string) owner { return owner{kind: kind, name: name, named: true} }

// phrase is an owner written out already.
func phrase(s string) owner { return owner{kind: s} }

func (o owner) String() string {
	if !o.named {
		return o.kind
	}
	return quoted(o.kind, o.name)
}

// label names a value in messages, e.g. `length of reach "main"`, or an
// entry of an object, `inflow to "r1" in event "q10"` (in); it is only
// formatted when a message is written, which keeps decoding a valid file
// free of string building.
type label struct {
	attr  string
	owner owner
	key   string // with in: the entry's key
	in    bool
}

func (l label) String() string {
	switch {
	case l.in:
		return fmt.Sprintf("%s %q in %s", l.attr, l.key, l.owner)
	case l.owner == owner{}:
		return l.attr
	}
	return l.attr + " of " + l.owner.String()
}

func plain(s string) label { return label{attr: s} }

// number decodes a finite number of bounded magnitude.
func (d *diagnoser) number(expr hcl.Expression, what label) (float64, bool) {
	if f, ok := d.shortDecimal(expr); ok {
		return f, true
	}
	v, ok := d.value(expr)
	if !ok {
		return 0, false
	}
	return d.numberValue(v, expr.Range(), what)
}

func (d *diagnoser) numberValue(v cty.Value, rng hcl.Range, what label) (float64, bool) {
	if v.Type() != cty.Number {
		d.Errorf(rng, "Number required", "%s must be a number, not %s; write it without quotes.", what, typeName(v.Type()))
		return 0, false
	}
	f, _ := v.AsBigFloat().Float64()
	if !numfmt.Finite(f) || math.Abs(f) > MaxMagnitude {
		d.Errorf(rng, "Number too large", "%s is beyond ±%g; check the units and the decimal point.", what, MaxMagnitude)
		return 0, false
	}
	if f == 0 {
		f = 0 // -0 as written is zero, which no output prints with a sign
	}
	return f, true
}

// maxShortDecimal is the longest number literal shortDecimal reads: 19
// characters hold at most 19 significant digits.
const maxShortDecimal = 19

// shortDecimal reads the number literal of nearly every numeric attribute
// (digits with at most one decimal point, no exponent, such as 3000 or
// 0.0008, at most maxShortDecimal characters) from its text, with
// strconv, rather than copying the parser's 512-bit value and rounding
// that. The result is the same float64: a decimal of at most 19
// significant digits lies at least 2⁻⁹⁸ of its size away from any point
// halfway between two float64 values, far beyond the 2⁻⁵¹² error of the
// 512-bit value, so both roundings to nearest agree (exact halfway points
// are dyadic and held exactly at 512 bits; TestShortDecimal checks
// against cty). Values beyond MaxMagnitude, and every other form, take
// the general path for its diagnostics.
func (d *diagnoser) shortDecimal(expr hcl.Expression) (float64, bool) {
	// The text tells a number: true, false and null are words, and a
	// quoted string is a template, not a literal value.
	lit, ok := expr.(*hclsyntax.LiteralValueExpr)
	if !ok {
		return 0, false
	}
	start, end := lit.SrcRange.Start.Byte, lit.SrcRange.End.Byte
	if start < 0 || end > len(d.src) || end <= start || end-start > maxShortDecimal {
		return 0, false
	}
	text := d.src[start:end]
	points := 0
	for _, c := range text {
		switch {
		case c == '.':
			points++
		case c < '0' || c > '9':
			return 0, false
		}
	}
	if points > 1 {
		return 0, false
	}
	f, err := strconv.ParseFloat(string(text), 64)
	if err != nil || f > MaxMagnitude {
		return 0, false
	}
	return f, true
}

// text decodes a string.
func (d *diagnoser) text(expr hcl.Expression, what label) (string, bool) {
	v, ok := d.value(expr)
	if !ok {
		return "", false
	}
	if v.Type() != cty.String {
		d.Errorf(expr.Range(), "String required", "%s must be a quoted string, not %s.", what, typeName(v.Type()))
		return "", false
	}
	return v.AsString(), true
}

// name decodes a string that names an object and rejects empty names and
// control characters (names are printed in every report).
func (d *diagnoser) name(expr hcl.Expression, what label) (string, bool) {
	s, ok := d.text(expr, what)
	if !ok {
		return "", false
	}
	if plainName(s) {
		return s, true
	}
	return s, d.checkName(s, expr.Range(), what)
}

// plainName reports whether checkName accepts s at a glance, as it does
// the usual name: printable ASCII, not only spaces.
func plainName(s string) bool {
	visible := false
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c < 0x20 || c > 0x7e {
			return false
		}
		visible = visible || c != ' '
	}
	return visible
}

func (d *diagnoser) checkName(s string, rng hcl.Range, what label) bool {
	if strings.TrimSpace(s) == "" {
		d.Errorf(rng, "Empty name", "%s must not be empty; write a name such as \"main\".", what)
		return false
	}
	for _, r := range s {
		if unicode.IsControl(r) {
			d.Errorf(rng, "Invalid name", "%s contains a control character; use letters, digits, spaces, '-' or '_'.", what)
			return false
		}
	}
	return true
}

// list splits a static list expression into its elements.
func (d *diagnoser) list(expr hcl.Expression, what label, example string) ([]hcl.Expression, bool) {
	if !d.literalOnly(expr) {
		return nil, false
	}
	items, diags := hcl.ExprList(expr)
	if diags.HasErrors() {
		d.Errorf(expr.Range(), "List required", "%s must be a list written in brackets, e.g. %s.", what, example)
		return nil, false
	}
	return items, true
}

// object splits a static object expression into its key/value pairs; keys
// are decoded as strings and returned with their ranges.
type entry struct {
	Key      string
	KeyRange hcl.Range
	Value    hcl.Expression
}

func (d *diagnoser) object(expr hcl.Expression, what, example string) ([]entry, bool) {
	if !d.literalOnly(expr) {
		return nil, false
	}
	pairs, diags := hcl.ExprMap(expr)
	if diags.HasErrors() {
		d.Errorf(expr.Range(), "Object required", "%s must be an object written in braces, e.g. %s.", what, example)
		return nil, false
	}
	if len(pairs) > MaxReaches {
		d.Errorf(expr.Range(), "Too many entries", "%s has %d entries; at most %d (one per reach) are accepted.", what, len(pairs), MaxReaches)
		return nil, false
	}
	out := make([]entry, 0, len(pairs))
	ok := true
	seen := map[string]hcl.Range{}
	for _, p := range pairs {
		k, kok := d.text(p.Key, label{attr: "a key", owner: phrase(what)})
		if !kok {
			ok = false
			continue
		}
		if first, dup := seen[k]; dup {
			d.Errorf(p.Key.Range(), "Duplicate key", "%q appears twice in %s (first at line %d); keep one entry.", k, what, first.Start.Line)
			ok = false
			continue
		}
		seen[k] = p.Key.Range()
		out = append(out, entry{Key: k, KeyRange: p.Key.Range(), Value: p.Value})
	}
	return out, ok
}

func typeName(t cty.Type) string {
	switch {
	case t == cty.String:
		return "a string"
	case t == cty.Number:
		return "a number"
	case t == cty.Bool:
		return "true/false"
	case t.IsTupleType() || t.IsListType() || t.IsSetType():
		return "a list"
	case t.IsObjectType() || t.IsMapType():
		return "an object"
	}
	return t.FriendlyName()
}

// suggest returns ` Did you mean "x"?` for the closest candidate within a
// small edit distance, or "".
func suggest(got string, candidates []string) string {
	return suggestWithin(got, candidates, nil)
}

// suggestWithin is suggest with a budget of edit-distance cells (see
// suggest.Closest), spent as candidates are compared; when it runs out the
// search stops. It keeps the work on a hostile file bounded.
func suggestWithin(got string, candidates []string, budget *int) string {
	maxDist := 2
	if len(got) <= 3 {
		maxDist = 1
	}
	return hclkit.DidYouMean(suggestpkg.Closest(got, candidates, maxDist, budget))
}
