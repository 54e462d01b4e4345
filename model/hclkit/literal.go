package hclkit

import (
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/zclconf/go-cty/cty"
)

// Construct is a kind of expression that is not a literal value.
type Construct int

// The constructs the walker tells apart. Each decoder words its own
// diagnostic for each of them.
const (
	// Variable is a name or a traversal (lining, var.x, a[0]); the
	// expression is a *hclsyntax.ScopeTraversalExpr.
	Variable Construct = iota + 1
	// Call is a function call; the expression is a
	// *hclsyntax.FunctionCallExpr.
	Call
	// Operator is a binary operator: arithmetic, comparison or logic.
	Operator
	// Not is the logical negation !x, of a literal x.
	Not
	// Interpolation is ${x} inside the text of a quoted string, x a
	// literal; the expression is x.
	Interpolation
	// LoneInterpolation is a quoted string that is nothing but ${x}, x a
	// literal, whose value is x's with x's type; the expression is x.
	LoneInterpolation
	// Directive is a %{for} or %{if} sequence in a quoted string; the
	// expression is the whole string.
	Directive
	// For is a for expression.
	For
	// Other is anything else: a conditional, a splat, an index or
	// attribute step after a value, an expression that is not native HCL
	// syntax.
	Other
)

// Allow lists the constructs a language accepts besides literal values
// (numbers, strings, true, false, null, a negative sign, parentheses,
// lists, objects with bare or quoted keys). Only constructs of constant
// value can be allowed.
type Allow struct {
	Not bool // the logical negation of a literal
}

func (a Allow) admits(c Construct) bool {
	return c == Not && a.Not
}

// Literal reports whether expr is made of literal values only, besides
// what allow admits, and calls reject for every other construct, outermost
// first, descending into lists, objects, parentheses and signs to find
// every one. An allowed construct is walked into like a literal; an
// interpolation is only rejected as such when what it holds is literal
// (otherwise what it holds is). Evaluating an accepted expression with no
// EvalContext takes time in proportion to its text and reads nothing from
// outside the file: an untrusted file holds values, not a program.
func Literal(expr hcl.Expression, allow Allow, reject func(Construct, hcl.Expression)) bool {
	w := walker{allow: allow, reject: reject}
	return w.walk(expr)
}

type walker struct {
	allow  Allow
	reject func(Construct, hcl.Expression)
}

// no rejects e as c, unless c is allowed; it reports whether e stands.
func (w *walker) no(c Construct, e hcl.Expression) bool {
	if w.allow.admits(c) {
		return true
	}
	w.reject(c, e)
	return false
}

func (w *walker) walk(expr hcl.Expression) bool {
	switch e := expr.(type) {
	case *hclsyntax.LiteralValueExpr:
		return true
	case *hclsyntax.ParenthesesExpr:
		return w.walk(e.Expression)
	case *hclsyntax.UnaryOpExpr:
		if e.Op == hclsyntax.OpNegate {
			return w.walk(e.Val)
		}
		if !w.allow.Not {
			return w.no(Not, e)
		}
		return w.walk(e.Val)
	case *hclsyntax.TemplateExpr:
		ok := true
		for _, part := range e.Parts {
			if isText(part) {
				continue
			}
			ok = w.walk(part) && w.no(Interpolation, part) && ok
		}
		return ok
	case *hclsyntax.TemplateWrapExpr:
		return w.walk(e.Wrapped) && w.no(LoneInterpolation, e.Wrapped)
	case *hclsyntax.TupleConsExpr:
		ok := true
		for _, x := range e.Exprs {
			ok = w.walk(x) && ok
		}
		return ok
	case *hclsyntax.ObjectConsExpr:
		ok := true
		for _, item := range e.Items {
			ok = w.walk(item.KeyExpr) && ok
			ok = w.walk(item.ValueExpr) && ok
		}
		return ok
	case *hclsyntax.ObjectConsKeyExpr:
		if t, bare := e.Wrapped.(*hclsyntax.ScopeTraversalExpr); bare && !e.ForceNonLiteral && len(t.Traversal) == 1 {
			return true // a bare key such as concrete is taken as text
		}
		return w.walk(e.Wrapped)
	case *hclsyntax.ScopeTraversalExpr:
		return w.no(Variable, e)
	case *hclsyntax.FunctionCallExpr:
		return w.no(Call, e)
	case *hclsyntax.BinaryOpExpr:
		return w.no(Operator, e)
	case *hclsyntax.TemplateJoinExpr:
		return w.no(Directive, e)
	case *hclsyntax.ForExpr:
		return w.no(For, e)
	}
	return w.no(Other, expr)
}

// isText reports whether part of a template is its text: a string literal
// (a literal inside ${} is a number, a bool or null, or, being quoted
// itself, a template).
func isText(part hclsyntax.Expression) bool {
	lit, ok := part.(*hclsyntax.LiteralValueExpr)
	return ok && lit.Val.Type() == cty.String && !lit.Val.IsNull()
}

// TraversalName is a traversal as a message names it: its root and
// attribute steps (var.lining), a "?" for a traversal that starts with
// anything else, and nothing for index or splat steps.
func TraversalName(t hcl.Traversal) string {
	name := ""
	for i, step := range t {
		switch s := step.(type) {
		case hcl.TraverseRoot:
			name += s.Name
		case hcl.TraverseAttr:
			name += "." + s.Name
		default:
			if i == 0 {
				name += "?"
			}
		}
	}
	return name
}
