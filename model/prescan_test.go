package model

import (
	"bytes"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// repeatTo is head, then unit repeated until the text reaches size bytes,
// then tail: the generator of large hostile inputs for the tests, the
// benchmarks and the fuzz targets.
func repeatTo(head, unit, tail string, size int) []byte {
	var b bytes.Buffer
	b.Grow(size + len(tail))
	b.WriteString(head)
	for b.Len()+len(unit)+len(tail) <= size {
		b.WriteString(unit)
	}
	b.WriteString(tail)
	return b.Bytes()
}

// hostileExpressions are 4 MiB files of one construct each that would
// drive the HCL parser into deep recursion (a stack overflow, which no
// recover catches) or into gigabytes of allocation.
var hostileExpressions = []struct {
	name, head, unit, tail, summary string
}{
	{"splats", "units = \"si\"\nx = a", ".*", "\n", "Expression too long"},
	{"full splats", "units = \"si\"\nx = a", "[*]", "\n", "Expression too long"},
	{"attribute splats", "units = \"si\"\nx = a", ".*.b", "\n", "Expression too long"},
	{"traversals", "units = \"si\"\nx = a", ".b", "\n", "Expression too long"},
	{"legacy index", "units = \"si\"\nx = a", ".0", "\n", "Expression too long"},
	{"index", "units = \"si\"\nx = a", "[0]", "\n", "Expression too long"},
	{"sums", "units = \"si\"\nx = 1", "+1", "\n", "Expression too long"},
	{"sums over lines", "units = \"si\"\nx = (1", "+\n1", ")\n", "Expression too long"},
	{"differences", "units = \"si\"\nx = 1", " - 1", "\n", "Expression too long"},
	{"products", "units = \"si\"\nx = 1", "*1", "\n", "Expression too long"},
	{"comparisons", "units = \"si\"\nx = 1", "==1", "\n", "Expression too long"},
	{"less than", "units = \"si\"\nx = 1", "<1", "\n", "Expression too long"},
	{"logic", "units = \"si\"\nx = x", "&&x", "\n", "Expression too long"},
	{"signs", "units = \"si\"\nx = ", "-", "1\n", "Too deeply nested"},
	{"calls", "units = \"si\"\nx = ", "f(", "\n", "Too deeply nested"},
	{"conditionals", "units = \"si\"\nx = ", "a ? b : ", "c\n", "Too deeply nested"},
	{"long list", "units = \"si\"\nx = [", "1,", "]\n", "Too many items"},
	{"long list over lines", "units = \"si\"\nx = [", "1,\n", "]\n", "Too many items"},
	{"long object", "units = \"si\"\nx = {", "a = 1\n", "}\n", "Too many items"},
	{"long call", "units = \"si\"\nx = f(", "1,", ")\n", "Too many items"},
	{"templates", "units = \"si\"\nx = \"", "${a}", "\"\n", "Too many interpolations"},
	{"template directives", "units = \"si\"\nx = \"", "%{if a}b%{endif}", "\"\n", "Too many interpolations"},
	{"heredoc templates", "units = \"si\"\nx = <<EOT\n", "${a}", "\nEOT\n", "Too many interpolations"},
	// Token soup: content that is not HCL a model can hold, which the
	// parser would otherwise tokenise whole and report line by line.
	{"names on lines", "units = \"si\"\n", "a\n", "", "Too many items"},
	{"numbers on lines", "units = \"si\"\n", "1\n", "", "Too many items"},
	{"arguments on lines", "units = \"si\"\n", "x = 1\n", "", "Too many items"},
	{"empty blocks on lines", "units = \"si\"\n", "b {}\n", "", "Too many items"},
	{"names in a row", "units = \"si\"\n", "a ", "\n", "Not a model"},
	{"strings in a row", "units = \"si\"\n", `"a"`, "\n", "Not a model"},
	{"numbers in a row", "units = \"si\"\n", "1 ", "\n", "Not a model"},
	// Strings in many literal pieces: the parser joins consecutive pieces
	// by copying the string once per piece, quadratic in their number (a
	// heredoc of 250,000 lines took minutes).
	{"heredoc lines", "units = \"si\"\ntitle = <<EOT\n", "  12.2 1.03\n", "EOT\n", "String in too many pieces"},
	{"indented heredoc lines", "units = \"si\"\ntitle = <<-EOT\n", "  12.2 1.03\n", "  EOT\n", "String in too many pieces"},
	{"empty heredoc lines", "units = \"si\"\ntitle = <<EOT\n", "\n", "EOT\n", "String in too many pieces"},
	{"literal interpolations", "units = \"si\"\ntitle = \"", "$${", "\"\n", "String in too many pieces"},
	{"literal directives", "units = \"si\"\ntitle = \"", "%%{", "\"\n", "String in too many pieces"},
	{"dollar signs", "units = \"si\"\ntitle = \"", "$", "\"\n", "String in too many pieces"},
	{"percent signs", "units = \"si\"\ntitle = \"", "%a", "\"\n", "String in too many pieces"},
	{"heredoc dollar lines", "units = \"si\"\ntitle = <<EOT\n", "$a\n", "EOT\n", "String in too many pieces"},
	// Text: the parser spends on every byte of a string (grapheme
	// clusters, normalisation), whatever the token count.
	{"text in one string", "units = \"si\"\ntitle = \"", "Straße, Überlauf — nördlich; ", "\"\n", "Too much text"},
	{"text in short strings", "units = \"si\"\n", "title = \"a long name of a reach in the north\"\n", "", "Too much text"},
	{"text in a heredoc", "units = \"si\"\ntitle = <<EOT\n", strings.Repeat("x", 60000) + "\n", "EOT\n", "Too much text"},
	// Number literals: the parser's decimal conversion is quadratic in
	// their length.
	{"long number", "units = \"si\"\nx = 1", "1", "\n", "Number too long"},
	{"long fraction", "units = \"si\"\nx = 1.", "5", "\n", "Number too long"},
	{"long exponent", "units = \"si\"\nx = 1e1", "0", "\n", "Number too long"},
	// What the lexer reports one diagnostic each for, by the million.
	{"invalid characters", "units = \"si\"\n", "@", "\n", "Too many invalid characters"},
	{"curly quotes", "units = \"si\"\n", "\u201ca\u201d\n", "", "Too many invalid characters"},
	{"control characters", "units = \"si\"\n", "\x01\n", "", "Too many invalid characters"},
	{"invalid escapes", "units = \"si\"\ntitle = \"", "\\q", "\"\n", "Too many invalid characters"},
	{"short unicode escapes", "units = \"si\"\ntitle = \"", "\\u12", "\"\n", "Too many invalid characters"},
	{"unterminated strings", "units = \"si\"\n", "x = \"a\n", "", "Too many invalid characters"},
	// Valid-looking but dense: past the token budget, the parser's time
	// and memory (a microsecond and 1.5 KB a token) would be seconds and
	// gigabytes.
	{"short lists on lines", "units = \"si\"\n", "x = [1, 2, 3, 4, 5, 6, 7, 8]\n", "", "File too dense"},
	{"comment lines", "units = \"si\"\n", "#\n", "", "File too dense"},
	{"block comments", "units = \"si\"\n", "/**/", "\n", "File too dense"},
	{"points sections", "units = \"si\"\n", pointsSection(MaxPoints), "", "File too dense"},
}

// pointsSection is a valid points section of n points, one pair a line:
// a wide V with its lowest point in the middle.
func pointsSection(n int) string {
	var b strings.Builder
	b.WriteString("section \"s\" {\n  shape = \"points\"\n  roughness = 0.03\n  points = [\n")
	for i := range n {
		fmt.Fprintf(&b, "    [%d.5, %.3f],\n", i, 2+math.Abs(float64(i-n/2))/1000)
	}
	b.WriteString("  ]\n}\n")
	return b.String()
}

// Every hostile construct is rejected by the pre-scan, before the parser
// runs, with a diagnostic at its place; Parse then returns at once.
func TestPreScanRejectsHostileExpressions(t *testing.T) {
	for _, h := range hostileExpressions {
		t.Run(h.name, func(t *testing.T) {
			src := repeatTo(h.head, h.unit, h.tail, MaxFileSize)
			diags := CheckNesting("h.chan.hcl", src)
			require.Len(t, diags, 1)
			assert.Equal(t, h.summary, diags[0].Summary)
			// At the place the bound is crossed, inside the construct
			// (a number: at its start), not at the top of the file.
			assert.GreaterOrEqual(t, diags[0].Subject.Start.Line, 2)
			assert.Greater(t, diags[0].Subject.Start.Byte, strings.LastIndexByte(h.head, '\n'))
			m, pdiags := Parse("h.chan.hcl", src)
			assert.Nil(t, m)
			require.Len(t, pdiags, 1)
			assert.Equal(t, h.summary, pdiags[0].Summary)
		})
	}
}

// The bounds leave every valid construct alone: a section of MaxPoints
// points, an inflow of MaxReaches entries, numbers with exponents,
// comparison-like text inside strings and comments, heredocs.
func TestPreScanAcceptsLargeValidInput(t *testing.T) {
	var b strings.Builder
	b.WriteString("units = \"si\" # a + b + c.d.e[0][1]\n/* ${x} a.b.c.d.e.f */\ntitle = <<EOT\na.b.c.d ${\"x\"} [[[\nEOT\n")
	b.WriteString("section \"s\" {\n  points = [\n")
	for i := range MaxPoints {
		b.WriteString("    [1.5e+1, -2.25E-3],\n")
		_ = i
	}
	b.WriteString("  ]\n}\nevent \"e\" {\n  inflow = {\n")
	for range MaxReaches {
		b.WriteString("    \"a.b.c\" = 1.0e-1\n")
	}
	b.WriteString("  }\n}\n")
	assert.Empty(t, CheckNesting("v.chan.hcl", []byte(b.String())))

	// Each bound exactly reached is still accepted.
	for name, src := range map[string]string{
		"heredoc":        "title = <<EOT\n" + strings.Repeat("a line\n", MaxStringPieces-1) + "EOT\n",
		"signs":          "title = \"" + strings.Repeat("50% ", (MaxStringPieces-1)/2) + "\"\n",
		"number":         "x = 1." + strings.Repeat("5", MaxNumberBytes-2) + "\n",
		"escapes":        "title = \"" + strings.Repeat(`\n\t\"\\\u00e9\U0001F600`, 1000) + "\"\n",
		"unicode names":  "straße = { größe = 1, ñandú_2 = 2, \"x\" = 3 }\n",
		"invalid":        strings.Repeat("@", MaxInvalid) + "\n",
		"literal signs":  "title = \"" + strings.Repeat("$${", (MaxStringPieces-1)/2) + "\"\n",
		"comment tokens": strings.Repeat("# comment\n", MaxTokens/2-10),
		"text":           "title = \"" + strings.Repeat("é", MaxTextBytes/2-1) + "\"\n",
	} {
		assert.Empty(t, CheckNesting("v.chan.hcl", []byte(src)), name)
	}
}

// The pre-scan reads strings, comments and heredocs exactly where the HCL
// lexer does; where they part, a run of "[" the parser recurses on would
// pass as text (the first two crashed chanlint with a stack overflow).
func TestPreScanFollowsTheLexer(t *testing.T) {
	for _, c := range []struct{ name, head, summary string }{
		// A broken UTF-8 byte can swallow the quote after it.
		{"bad UTF-8 before a quote", "units = \"si\"\nx = \xde\"", "Not UTF-8 text"},
		// <<EOT then a CR alone is no heredoc.
		{"CR after a heredoc marker", "units = \"si\"\nx = <<EOT\rz\ny = ", "Too deeply nested"},
		// An unclosed /* is a / and a *, not a comment.
		{"unclosed block comment", "units = \"si\"\n/*\ny = ", "Too deeply nested"},
		// A } closes the interpolation, and the ( left open in it.
		{"brace closing a template", "units = \"si\"\nx = \"${(}\"\ny = ", "Too deeply nested"},
		{"brace closing a template over lines", "units = \"si\"\nx = \"${[(}\n\"\ny = ", "Too deeply nested"},
		// A line end does not end a quoted string.
		{"line end in a string", "units = \"si\"\nx = \"a\nb\"\ny = ", "Too deeply nested"},
		// A Unicode marker: the lexer's tables decide; refused.
		{"Unicode heredoc marker", "units = \"si\"\nx = <<EOT\u00e9\n\"\nEOT\u00e9\ny = ", "Unsupported heredoc"},
	} {
		t.Run(c.name, func(t *testing.T) {
			src := repeatTo(c.head, "[", "", 1<<20)
			diags := CheckNesting("l.chan.hcl", src)
			require.Len(t, diags, 1)
			assert.Equal(t, c.summary, diags[0].Summary)
			line := strings.Count(c.head, "\n") + 1 // in the run of [
			if c.summary == "Unsupported heredoc" {
				line = 2 // at the heredoc
			}
			assert.Equal(t, line, diags[0].Subject.Start.Line)
			_, pdiags := Parse("l.chan.hcl", src)
			require.NotEmpty(t, pdiags)
			assert.Equal(t, c.summary, pdiags[0].Summary)
		})
	}
}

// A file at the documented limits fits the token budget: 10,000 reaches
// sharing one points section of 5,000 points, with one event. The reach
// blocks are as short as a reach can be written.
func TestPreScanBudgetHoldsTheLimits(t *testing.T) {
	var b strings.Builder
	b.WriteString("units = \"si\"\n")
	b.WriteString(pointsSection(MaxPoints))
	for i := range MaxReaches {
		fmt.Fprintf(&b, "reach \"r%d\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = 10\n  section = \"s\"\n  slope = 0.001\n}\n", i, i+1, i)
	}
	b.WriteString("event \"e\" {\n  inflow = { r0 = 1 }\n  outlet = { depth = 1 }\n}\n")
	off, problem, tokens := preScan([]byte(b.String()))
	require.Equal(t, scanOK, problem, "at %d", off)
	assert.Less(t, tokens, MaxTokens)
	t.Logf("%d tokens of %d", tokens, MaxTokens)
}

// The pre-scan counts at least the tokens the HCL lexer makes (so that
// the budget bounds the parser's work), and not many more (so that a
// valid file is not refused early): checked on every HCL file of the
// repository (the bad-input corpus too) and on generated constructs.
func TestPreScanCountsTokens(t *testing.T) {
	inputs := map[string][]byte{}
	err := filepath.WalkDir("..", func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(path, ".hcl") {
			inputs[path], err = os.ReadFile(path)
		}
		return err
	})
	require.NoError(t, err)
	require.Greater(t, len(inputs), 100)
	for _, u := range []string{
		"x = [1, 2.5, -3e-2]\n", "# comment\n", "// comment\n", "/* a\nb */\n", "x = \"a b\"\n", "x = \"\"\n",
		"title = <<EOT\na\n\nb $x %y ${z}\nEOT\n", "title = <<-EOT\n  a\n  EOT\n", "x = \"a ${b} %{if c}d%{endif} $${e} %%{f} $ %\"\n",
		"x = \"\\n\\u00e9\"\n", "b \"l\" \"m\" {\n  a = { k = 1, \"k 2\": 2 }\n}\n", "x = a.b[0].c\n", "x = 1 == 2 && !y || -z\n",
		"größe = 1\n", "x = f(1, 2)\n", "x = [for v in l : v]\n", "\r\nx = 1\r\n",
		"x = \u201ca\u201d\n", "x = @\n", "x = \"${(}\"\n", "x = \"a\nb\"\n", "x = \"\\\u00e9\\\n\"\n",
		"/* [ */ x = 1\n", "x = \"a\rb\"\n", "x = {\"${ {a = (1)} }\" = 2}\n",
	} {
		inputs[fmt.Sprintf("%q", u)] = repeatTo("", u, "", 3000) // invalid characters below MaxInvalid
	}
	for name, src := range inputs {
		toks, _ := hclsyntax.LexConfig(src, name, hcl.InitialPos)
		_, problem, n := preScan(src)
		if problem != scanOK && strings.Contains(name, "/bad/") {
			continue // a bad-input file the pre-scan refuses: counted only up to there
		}
		require.Equal(t, scanOK, problem, name)
		assert.GreaterOrEqual(t, n, len(toks), name)
		assert.LessOrEqual(t, n, 2*len(toks), name)
	}
}

// BenchmarkPreScanHostile measures the pre-scan and Parse on the 4 MiB
// hostile files (each rejected by the pre-scan) against the plain scan of
// a 4 MiB valid-looking points list.
func BenchmarkPreScanHostile(b *testing.B) {
	for _, h := range hostileExpressions {
		src := repeatTo(h.head, h.unit, h.tail, MaxFileSize)
		b.Run(strings.ReplaceAll(h.name, " ", "-"), func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			for b.Loop() {
				Parse("h.chan.hcl", src)
			}
		})
	}
	points := repeatTo("units = \"si\"\nsection \"s\" {\n  points = [\n", "[12.25, 3.5],\n", "]\n}\n", MaxFileSize)
	b.Run("scan-4MiB-points", func(b *testing.B) {
		b.SetBytes(int64(len(points)))
		for b.Loop() {
			CheckNesting("p.chan.hcl", points)
		}
	})
	// What the pre-scan lets through costs the HCL parser: a valid file
	// of points sections just within the token budget, the most a file
	// can cost it.
	valid := atBudget(b)
	_, _, tokens := preScan(valid)
	b.Run("parse-valid-at-budget", func(b *testing.B) {
		b.SetBytes(int64(len(valid)))
		b.ReportAllocs()
		for b.Loop() {
			if _, diags := Parse("p.chan.hcl", valid); diags.HasErrors() {
				b.Fatal(diags.Error())
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(tokens), "ns/token")
	})
	// Few tokens but many bytes: the lexer's cost per byte (it measures
	// every token's columns in grapheme clusters, and normalises the text
	// of strings), for MaxTextBytes of text in one string and 4 MiB of
	// comment lines.
	tail := "reach \"r\" {\n  from = \"a\"\n  to = \"b\"\n  length = 100\n  section = \"s\"\n  slope = 0.001\n}\nevent \"e\" {\n  inflow = { r = 1 }\n  outlet = { condition = \"normal\" }\n}\n"
	head := "units = \"si\"\nsection \"s\" {\n  shape = \"rectangle\"\n  bottom_width = 2\n  height = 1\n  roughness = 0.014\n}\n" + tail
	for name, src := range map[string][]byte{
		"parse-text-at-limit": repeatTo(head+"title = \"", "Straße, Überlauf — nördlich; ", "\"\n", MaxTextBytes),
		"parse-4MiB-comments": repeatTo(head, "# a comment line that explains the model\n", "", MaxFileSize),
	} {
		b.Run(name, func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			for b.Loop() {
				if _, diags := Parse("p.chan.hcl", src); diags.HasErrors() {
					b.Fatal(diags.Error())
				}
			}
		})
	}
}

// atBudget is a valid model of points sections of MaxPoints points, as
// many as fit in the token budget.
func atBudget(tb testing.TB) []byte {
	tail := "reach \"r\" {\n  from = \"a\"\n  to = \"b\"\n  length = 100\n  section = \"s0\"\n  slope = 0.001\n}\nevent \"e\" {\n  inflow = { r = 1 }\n  outlet = { condition = \"normal\" }\n}\n"
	section := pointsSection(MaxPoints)
	_, _, per := preScan([]byte(section))
	src := []byte("units = \"si\"\n")
	for k := 0; ; k++ {
		_, _, n := preScan(src)
		if n+per+100 > MaxTokens {
			break
		}
		src = append(src, strings.Replace(section, `"s"`, fmt.Sprintf(`"s%d"`, k), 1)...)
	}
	src = append(src, tail...)
	if diags := CheckNesting("p.chan.hcl", src); diags.HasErrors() {
		tb.Fatal(diags.Error())
	}
	return src
}

// A 4 MiB file of long unknown arguments cannot produce megabytes of
// diagnostics: each message is clipped and the total is bounded.
func TestDiagnosticsBoundedInBytes(t *testing.T) {
	long := strings.Repeat("w", 4000)
	src := repeatTo("units = \"si\"\nsection \"s\" {\n", "  "+long+" = 1\n", "}\n", MaxFileSize)
	_, diags := Parse("long.chan.hcl", src)
	require.NotEmpty(t, diags)
	total := 0
	for _, d := range diags {
		assert.LessOrEqual(t, len(d.Summary), MaxSummaryBytes)
		assert.LessOrEqual(t, len(d.Detail), MaxDetailBytes)
		total += len(d.Summary) + len(d.Detail)
	}
	assert.LessOrEqual(t, total, MaxDiagnosticBytes+MaxSummaryBytes+MaxDetailBytes)
	last := diags[len(diags)-1]
	assert.Equal(t, "Too many problems", last.Summary)
	assert.Less(t, len(diags), MaxDiagnostics, "the byte bound cut first")
}

// Comment lines are no items: a heavily commented model stays valid.
func TestPreScanIgnoresCommentLines(t *testing.T) {
	src := repeatTo("units = \"si\"\n", "# a comment line that explains the model\n// and another one\n/* and a block */\n", "", MaxFileSize)
	assert.Empty(t, CheckNesting("c.chan.hcl", src))
}

// preScan is the model's pre-scan, hclkit.Scan with ScanBounds.
func preScan(src []byte) (int, hclkit.Problem, int) { return hclkit.Scan(src, ScanBounds) }

const scanOK = hclkit.ScanOK
