package model

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// BenchmarkParseDemo measures decoding, validation and the network pass of
// the demo model, and reports the cost per section.
func BenchmarkParseDemo(b *testing.B) {
	src, err := os.ReadFile(demoFile)
	if err != nil {
		b.Fatal(err)
	}
	m, diags := Parse(demoFile, src)
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	sections := len(m.Sections)
	b.ReportAllocs()
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		Parse(demoFile, src)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(sections), "ns/section")
}

// BenchmarkParseChain measures a long generated network (one section and
// one reach per step), to show that the cost grows linearly with size.
func BenchmarkParseChain(b *testing.B) {
	for _, n := range []int{100, 1000} {
		var s strings.Builder
		s.WriteString("units = \"si\"\n")
		for i := range n {
			fmt.Fprintf(&s, "section \"s%d\" {\n shape = \"trapezoid\"\n bottom_width = 2\n side_slope = 1.5\n height = 1.5\n roughness = 0.015\n}\n", i)
			fmt.Fprintf(&s, "reach \"r%d\" {\n from = \"n%d\"\n to = \"n%d\"\n length = 100\n section = \"s%d\"\n slope = 0.001\n}\n", i, i+1, i, i)
		}
		fmt.Fprintf(&s, "event \"e\" {\n inflow = { r%d = 1 }\n outlet = { depth = 1 }\n}\n", n-1)
		src := []byte(s.String())
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			if _, diags := Parse("chain.chan.hcl", src); diags.HasErrors() {
				b.Fatal(diags.Error())
			}
			b.ReportAllocs()
			for b.Loop() {
				Parse("chain.chan.hcl", src)
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/section")
		})
	}
}

// BenchmarkDecodeShare: the project's own work on top of the HCL parser
// for a 1,000-reach chain of 3 km reaches in one section (the shape of
// cmd/chanlint's BenchmarkScaleChain): hclsyntax.ParseConfig alone, then
// Parse (the parser plus pre-scan, decoding, validation and the network
// pass), in the same iterations; decode-share is Parse's time beyond the
// parser's over the parser's, from the least wall time of each.
// decode-share-cpu is the same ratio from the process's CPU time summed
// over the iterations, which a busy machine disturbs far less: waiting
// for a core is not counted, the collector's work is.
func BenchmarkDecodeShare(b *testing.B) {
	src := chainSrc()
	if _, diags := Parse("trunk.chan.hcl", src); diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	b.ReportAllocs()
	// The least time of each over the iterations: on a shared machine the
	// minimum is what the code costs, the mean what the neighbours cost.
	parser, full := time.Duration(math.MaxInt64), time.Duration(math.MaxInt64)
	var parserCPU, fullCPU time.Duration
	for b.Loop() {
		c0 := processCPU()
		t0 := time.Now()
		if _, diags := hclsyntax.ParseConfig(src, "trunk.chan.hcl", hcl.InitialPos); diags.HasErrors() {
			b.Fatal(diags.Error())
		}
		t1, c1 := time.Now(), processCPU()
		Parse("trunk.chan.hcl", src)
		parser, full = min(parser, t1.Sub(t0)), min(full, time.Since(t1))
		c2 := processCPU()
		parserCPU, fullCPU = parserCPU+c1-c0, fullCPU+c2-c1
	}
	b.ReportMetric(float64(parser.Microseconds()), "parser-min-µs")
	b.ReportMetric(float64(full.Microseconds()), "parse-min-µs")
	b.ReportMetric(float64(full-parser)/float64(parser), "decode-share")
	if parserCPU > 0 {
		b.ReportMetric(float64(fullCPU-parserCPU)/float64(parserCPU), "decode-share-cpu")
	}
}

// chainSrc is the 1,000-reach chain of BenchmarkDecodeShare.
func chainSrc() []byte {
	var s strings.Builder
	s.WriteString("units = \"si\"\ntitle = \"Scale test trunk (generated)\"\nsection \"trunk\" {\n  shape        = \"trapezoid\"\n  bottom_width = 4.0\n  side_slope   = 2.0\n  height       = 3.0\n  roughness    = 0.015\n  lining       = \"concrete\"\n}\n")
	for i := range 1000 {
		slope := 0.0008
		if i%2 == 1 {
			slope = 0.0012
		}
		fmt.Fprintf(&s, "reach \"r%04d\" {\n  from    = \"n%04d\"\n  to      = \"n%04d\"\n  length  = 3000\n  section = \"trunk\"\n  slope   = %g\n}\n", i, i, i+1, slope)
	}
	s.WriteString("event \"q10\" {\n  inflow = {")
	for i := 0; i < 1000; i += 10 {
		if i > 0 {
			s.WriteString(",")
		}
		fmt.Fprintf(&s, " r%04d = 0.5", i)
	}
	s.WriteString(" }\n  outlet = { condition = \"normal\" }\n}\n")
	return []byte(s.String())
}

// BenchmarkDecodeOwn is the numerator of BenchmarkDecodeShare alone: the
// project's passes (pre-scan, decoding, validation, references, network,
// events) over the chain's syntax tree parsed once beforehand, whose
// allocs/op are the project's own.
func BenchmarkDecodeOwn(b *testing.B) {
	src := chainSrc()
	file, diags := hclsyntax.ParseConfig(src, "trunk.chan.hcl", hcl.InitialPos)
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	b.ReportAllocs()
	for b.Loop() {
		CheckNesting("trunk.chan.hcl", src)
		if m, diags := decode("trunk.chan.hcl", src, file, &diagnoser{}); m == nil {
			b.Fatal(diags.Error())
		}
	}
}
