package model

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// FuzzParse feeds arbitrary bytes to Parse, seeded with the demo, the valid
// models and the bad corpus. Parse must not panic; it returns a model
// exactly when there is no error; every diagnostic has a position; a
// returned model holds no NaN or Inf; and when the pre-scan lets a file
// through, it counted at least the tokens the HCL lexer makes of it (so
// that the token budget bounds the parser's work).
func FuzzParse(f *testing.F) {
	for _, pattern := range []string{"../testdata/demo/*" + Suffix, "../testdata/valid/*" + Suffix, "../testdata/bad/*" + Suffix} {
		files, err := filepath.Glob(pattern)
		if err != nil {
			f.Fatal(err)
		}
		for _, file := range files {
			src, err := os.ReadFile(file)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(src)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		m, diags := Parse("fuzz.chan.hcl", src)
		if (m == nil) != diags.HasErrors() {
			t.Fatalf("model %v with errors=%v: %s", m != nil, diags.HasErrors(), diags.Error())
		}
		for _, d := range diags {
			if d.Subject == nil {
				t.Fatalf("diagnostic without position: %s", d.Summary)
			}
		}
		if m != nil {
			checkFinite(t, m)
		}
		checkAgainstLexer(t, src)
	})
}

// checkAgainstLexer checks, for a file the pre-scan lets through, that it
// counted at least the lexer's tokens and that the lexer's tokens nest no
// deeper than the bound, closed by the pre-scan's rule (a ] or ) its own
// bracket only, a } the innermost { or interpolation): a string, comment
// or heredoc the scan read where the lexer reads code would show here.
func checkAgainstLexer(t *testing.T, src []byte) {
	t.Helper()
	if CheckNesting("fuzz.chan.hcl", src) != nil {
		return
	}
	toks, _ := hclsyntax.LexConfig(src, "fuzz.chan.hcl", hcl.InitialPos)
	if n := Tokens(src); n < len(toks) {
		t.Fatalf("pre-scan counted %d tokens, the lexer made %d", n, len(toks))
	}
	var stack []hclsyntax.TokenType
	popTo := func(open ...hclsyntax.TokenType) {
		for j := len(stack) - 1; j >= 0; j-- {
			if slices.Contains(open, stack[j]) {
				stack = stack[:j]
				return
			}
		}
	}
	for _, tok := range toks {
		switch tok.Type {
		case hclsyntax.TokenOBrack, hclsyntax.TokenOParen, hclsyntax.TokenOBrace, hclsyntax.TokenOQuote,
			hclsyntax.TokenOHeredoc, hclsyntax.TokenTemplateInterp, hclsyntax.TokenTemplateControl:
			stack = append(stack, tok.Type)
		case hclsyntax.TokenCBrack, hclsyntax.TokenCParen:
			open := hclsyntax.TokenOBrack
			if tok.Type == hclsyntax.TokenCParen {
				open = hclsyntax.TokenOParen
			}
			if len(stack) > 0 && stack[len(stack)-1] == open {
				stack = stack[:len(stack)-1]
			}
		case hclsyntax.TokenCBrace, hclsyntax.TokenTemplateSeqEnd:
			popTo(hclsyntax.TokenOBrace, hclsyntax.TokenTemplateInterp, hclsyntax.TokenTemplateControl)
		case hclsyntax.TokenCQuote:
			popTo(hclsyntax.TokenOQuote)
		case hclsyntax.TokenCHeredoc:
			popTo(hclsyntax.TokenOHeredoc)
		}
		if len(stack) > MaxNesting {
			t.Fatalf("the lexer's tokens nest %d deep at %s, the pre-scan let the file through", len(stack), tok.Range)
		}
	}
}

func checkFinite(t *testing.T, m *Model) {
	t.Helper()
	bad := func(what string, vs ...float64) {
		for _, v := range vs {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%s is %v", what, v)
			}
		}
	}
	for _, s := range m.Sections {
		bad("section "+s.Name, s.BottomWidth, s.SideSlope, s.Diameter, s.Height, s.Banks[0], s.Banks[1], s.Roughness[0], s.Roughness[1], s.Roughness[2])
		for _, p := range s.Points {
			bad("point of "+s.Name, p.Offset, p.Elevation)
		}
	}
	for _, r := range m.Reaches {
		bad("reach "+r.Name, r.Length, r.InvertUp, r.InvertDown, r.Slope, r.MaxSpacing)
		if r.Section == nil {
			t.Fatalf("reach %s has no section", r.Name)
		}
	}
	for _, e := range m.Events {
		bad("discharge of "+e.Name, e.Discharge...)
		bad("outlet of "+e.Name, e.Outlet.Value)
		if len(e.Discharge) != len(m.Reaches) {
			t.Fatalf("event %s has %d discharges for %d reaches", e.Name, len(e.Discharge), len(m.Reaches))
		}
	}
	if m.Network == nil || len(m.Network.Order) != len(m.Reaches) {
		t.Fatalf("network order incomplete")
	}
}

// FuzzParseRepeated reaches large inputs: the fuzzer chooses a head, a
// construct and a tail, and the construct is repeated until the file
// reaches size bytes (at most a little over MaxFileSize), so that chains,
// long lists, deep nesting and floods of diagnostics are explored at the
// sizes a hostile submittal can use. Besides FuzzParse's invariants, the
// diagnostics stay within their bounds in count and bytes.
//
// Run: go test ./model -run '^$' -fuzz '^FuzzParseRepeated$' -fuzztime 60s
func FuzzParseRepeated(f *testing.F) {
	for _, h := range hostileExpressions {
		f.Add([]byte(h.head), []byte(h.unit), []byte(h.tail), uint32(MaxFileSize))
	}
	f.Add([]byte("units = \"si\"\nsection \"s\" {\n  shape = \"points\"\n  roughness = 0.03\n  points = [\n"),
		[]byte("[1.5, 2.0],\n"), []byte("]\n}\n"), uint32(200_000))
	f.Add([]byte("units = \"si\"\n"), []byte("reach \"r\" {\n  from = \"a\"\n  to = \"b\"\n}\n"), []byte(""), uint32(1<<20))
	f.Add([]byte("units = \"si\"\nsection \"s\" {\n"), []byte("  "+strings.Repeat("w", 300)+" = 1\n"), []byte("}\n"), uint32(MaxFileSize))
	f.Fuzz(func(t *testing.T, head, unit, tail []byte, size uint32) {
		if len(unit) == 0 {
			return
		}
		src := repeatTo(string(head), string(unit), string(tail), int(size%uint32(MaxFileSize+4096)))
		m, diags := Parse("fuzz.chan.hcl", src)
		if (m == nil) != diags.HasErrors() {
			t.Fatalf("model %v with errors=%v", m != nil, diags.HasErrors())
		}
		if len(diags) > MaxDiagnostics+1 {
			t.Fatalf("%d diagnostics", len(diags))
		}
		total := 0
		for _, d := range diags {
			if d.Subject == nil {
				t.Fatalf("diagnostic without position: %s", d.Summary)
			}
			if len(d.Summary) > MaxSummaryBytes || len(d.Detail) > MaxDetailBytes {
				t.Fatalf("diagnostic of %d+%d bytes", len(d.Summary), len(d.Detail))
			}
			total += len(d.Summary) + len(d.Detail)
		}
		if total > MaxDiagnosticBytes+MaxSummaryBytes+MaxDetailBytes+200 {
			t.Fatalf("%d bytes of diagnostics", total)
		}
		if m != nil {
			checkFinite(t, m)
		}
		checkAgainstLexer(t, src)
	})
}
