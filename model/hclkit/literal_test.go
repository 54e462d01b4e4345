package hclkit

import (
	"fmt"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/zclconf/go-cty/cty"
)

// walk parses src as one expression and returns what Literal rejected,
// as "Construct@text" with the text of the rejected expression's range.
func walk(t *testing.T, src string, allow Allow) (bool, []string) {
	t.Helper()
	expr, diags := hclsyntax.ParseExpression([]byte(src), "x.hcl", hcl.InitialPos)
	require.False(t, diags.HasErrors(), "%s: %s", src, diags.Error())
	var got []string
	ok := Literal(expr, allow, func(c Construct, e hcl.Expression) {
		r := e.Range()
		got = append(got, fmt.Sprintf("%v@%s", c, src[r.Start.Byte:r.End.Byte]))
	})
	return ok, got
}

func (c Construct) String() string {
	return [...]string{"?", "Variable", "Call", "Operator", "Not", "Interpolation", "LoneInterpolation", "Directive", "For", "Other"}[c]
}

func TestLiteralAccepts(t *testing.T) {
	for _, src := range []string{
		`1.5`, `-2`, `- -2`, `(3)`, `"text"`, `true`, `null`, `"a$${b}"`,
		`[1, "two", [3]]`, `{ concrete = 1, "grass lined" = 2, null = 3 }`,
		`{ a = { b = [-(1)] } }`,
		"<<EOT\nplain text\nEOT\n",
	} {
		ok, got := walk(t, src, Allow{})
		assert.True(t, ok, src)
		assert.Empty(t, got, src)
	}
}

func TestLiteralRejects(t *testing.T) {
	for _, tc := range []struct {
		src  string
		want []string
	}{
		{`lining`, []string{"Variable@lining"}},
		{`var.x[0]`, []string{"Variable@var.x[0]"}},
		{`file("/etc/passwd")`, []string{`Call@file("/etc/passwd")`}},
		{`1 + 2`, []string{"Operator@1 + 2"}},
		{`!true`, []string{"Not@!true"}},
		{`"a${1}"`, []string{"Interpolation@1"}},
		{`"a${(1)}b"`, []string{"Interpolation@(1)"}},
		{`"a${true}b${null}"`, []string{"Interpolation@true", "Interpolation@null"}},
		{`"${0.3}"`, []string{"LoneInterpolation@0.3"}},
		{`"%{ for x in [1] }a%{ endfor }"`, []string{`Directive@%{ for x in [1] }a%{ endfor }`}},
		{`[for x in [1] : x]`, []string{"For@[for x in [1] : x]"}},
		{`true ? 1 : 2`, []string{"Other@true ? 1 : 2"}},
		{`[1][0]`, []string{"Other@[1][0]"}},
		{`{ a.b = 1 }`, []string{"Variable@a.b"}},
		{`{ (k) = 1 }`, []string{"Variable@k"}},
		// An interpolation is rejected as what it holds when that is
		// not literal; every problem of a list or object is reported.
		{`"a${b}"`, []string{"Variable@b"}},
		{`[x, f(), 1 * 2, 3]`, []string{"Variable@x", "Call@f()", "Operator@1 * 2"}},
		{`{ k = y, z = "${w}" }`, []string{"Variable@y", "Variable@w"}},
		{`-lining`, []string{"Variable@lining"}},
	} {
		ok, got := walk(t, tc.src, Allow{})
		assert.False(t, ok, tc.src)
		assert.Equal(t, tc.want, got, tc.src)
	}
}

func TestLiteralAllow(t *testing.T) {
	not := Allow{Not: true}
	for _, src := range []string{`!true`, `[!false, -1]`, `{ k = !(true) }`} {
		ok, got := walk(t, src, not)
		assert.True(t, ok, src)
		assert.Empty(t, got, src)
	}
	// What an allowed construct holds is still walked.
	ok, got := walk(t, `!f(1)`, not)
	assert.False(t, ok)
	assert.Equal(t, []string{"Call@f(1)"}, got)
	// Allowing one construct allows no other.
	ok, got = walk(t, `["${1}", !true]`, not)
	assert.False(t, ok)
	assert.Equal(t, []string{"LoneInterpolation@1"}, got)
}

// TestLiteralNotSyntax: an expression that is not native syntax (JSON,
// or one built by a program) is never taken for a literal.
func TestLiteralNotSyntax(t *testing.T) {
	expr := hcl.StaticExpr(cty.NumberIntVal(1), hcl.Range{})
	var got []Construct
	ok := Literal(expr, Allow{Not: true}, func(c Construct, _ hcl.Expression) { got = append(got, c) })
	assert.False(t, ok)
	assert.Equal(t, []Construct{Other}, got)
}

func TestTraversalName(t *testing.T) {
	for src, want := range map[string]string{
		`lining`:        "lining",
		`var.lining`:    "var.lining",
		`a.b[0].c`:      "a.b.c",
		`local.x[*].id`: "local.x",
	} {
		expr, diags := hclsyntax.ParseExpression([]byte(src), "x.hcl", hcl.InitialPos)
		require.False(t, diags.HasErrors(), src)
		trav, ok := expr.(*hclsyntax.ScopeTraversalExpr)
		if !ok {
			// a splat is not a plain traversal: name its source
			trav = expr.(*hclsyntax.SplatExpr).Source.(*hclsyntax.ScopeTraversalExpr)
		}
		assert.Equal(t, want, TraversalName(trav.Traversal), src)
	}
	assert.Equal(t, "?.x", TraversalName(hcl.Traversal{hcl.TraverseIndex{}, hcl.TraverseAttr{Name: "x"}}))
	assert.Equal(t, "", TraversalName(nil))
}
