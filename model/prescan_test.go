package model

import (
	"bytes"
	"fmt"
	"strings"
	"testing"

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
			// At the place the bound is crossed, inside the construct.
			assert.GreaterOrEqual(t, diags[0].Subject.Start.Line, 2)
			assert.GreaterOrEqual(t, diags[0].Subject.Start.Byte, len(h.head)-1)
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
	// What the pre-scan lets through costs the HCL parser: the remaining
	// time of a 4 MiB file.
	var big strings.Builder
	big.WriteString("units = \"si\"\n")
	for k := 0; big.Len() < MaxFileSize-100_000; k++ {
		fmt.Fprintf(&big, "section \"s%d\" {\n  shape = \"points\"\n  roughness = 0.03\n  points = [\n", k)
		for i := range MaxPoints - 1 {
			fmt.Fprintf(&big, "    [%d.5, %d.25],\n", i, 3+i%5)
		}
		big.WriteString("  ]\n}\n")
	}
	big.WriteString("reach \"r\" {\n  from = \"a\"\n  to = \"b\"\n  length = 100\n  section = \"s0\"\n  slope = 0.001\n}\nevent \"e\" {\n  inflow = { r = 1 }\n  outlet = { condition = \"normal\" }\n}\n")
	valid := []byte(big.String())
	b.Run("parse-4MiB-valid-points", func(b *testing.B) {
		b.SetBytes(int64(len(valid)))
		for b.Loop() {
			Parse("p.chan.hcl", valid)
		}
	})
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
