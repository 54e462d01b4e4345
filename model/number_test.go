package model

import (
	"math"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/zclconf/go-cty/cty"
	"pgregory.net/rapid"
)

// TestShortDecimal: the float64 that shortDecimal reads from a literal's
// text is the one of the general path, cty's 512-bit value rounded to the
// nearest float64, bit for bit, for every short decimal; other forms are
// left to the general path.
func TestShortDecimal(t *testing.T) {
	// Source: cty.ParseNumberVal and big.Float.Float64 (the value the
	// HCL parser gives a number literal, and its rounding) are the
	// reference.
	read := func(t interface {
		Helper()
		Fatalf(string, ...any)
	}, text string) (float64, bool, float64) {
		t.Helper()
		src := []byte(text)
		expr, diags := hclsyntax.ParseExpression(src, "n.hcl", hcl.InitialPos)
		if diags.HasErrors() {
			t.Fatalf("%s: %s", text, diags.Error())
		}
		d := diagnoser{src: src}
		f, ok := d.shortDecimal(expr)
		want, _ := cty.MustParseNumberVal(text).AsBigFloat().Float64()
		return f, ok, want
	}
	for _, text := range []string{
		"0", "3000", "0.0008", "0.015", "1.5", "0.1", "0.30000000000000004",
		"999999999", "1000000000", "123456789.123456789", "0.00000000000000001", "0.000000000000000",
	} {
		f, ok, want := read(t, text)
		if !ok || math.Float64bits(f) != math.Float64bits(want) {
			t.Errorf("%s: got %v (%v), want %v", text, f, ok, want)
		}
	}
	for _, text := range []string{"1e3", "1.5E-2", "12345678901234567890", "1000000001", "0.000000000000000001"} {
		if _, ok, _ := read(t, text); ok {
			t.Errorf("%s: read by the short path, which takes plain decimals up to 19 characters within MaxMagnitude", text)
		}
	}
	rapid.Check(t, func(t *rapid.T) {
		intPart := rapid.StringMatching(`[0-9]{1,9}`).Draw(t, "int")
		frac := rapid.StringMatching(`[0-9]{0,9}`).Draw(t, "frac")
		text := intPart
		if frac != "" {
			text += "." + frac
		}
		text = strings.TrimLeft(text, "0")
		if text == "" || text[0] == '.' {
			text = "0" + text
		}
		f, ok, want := read(t, text)
		if !ok || math.Float64bits(f) != math.Float64bits(want) {
			t.Fatalf("%s: got %v (%v), want %v", text, f, ok, want)
		}
	})
}

// TestPlainName: a name plainName lets through is one checkName accepts.
func TestPlainName(t *testing.T) {
	for s, want := range map[string]bool{"main": true, "r 0001": true, "a-b_c.d": true, "": false, "   ": false, "tab\there": false, "café": false} {
		if got := plainName(s); got != want {
			t.Errorf("plainName(%q) = %v, want %v", s, got, want)
		}
	}
	rapid.Check(t, func(t *rapid.T) {
		s := rapid.String().Draw(t, "name")
		var d diagnoser
		if plainName(s) && !d.checkName(s, hcl.Range{}, plain("name")) {
			t.Fatalf("plainName(%q) but checkName refuses it: %s", s, d.Diags.Error())
		}
	})
}
