package model

import (
	"fmt"
	"os"
	"strings"
	"testing"
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
