package solver

import (
	"testing"

	"github.com/chanlint/chanlint/model"
)

// BenchmarkCulvert solves an approach channel and a culvert: with a road
// that overtops (the barrel's profile is recomputed for every trial split)
// and, for comparison in the same run, the same culvert without a road.
func BenchmarkCulvert(b *testing.B) {
	for _, tc := range []struct{ name, road string }{
		{"no-road", ""},
		{"overtopping", "road  = { crest = 12.5, length = 30, width = 10 }"},
	} {
		b.Run(tc.name, func(b *testing.B) {
			src := culvertNet(pipe12, "culvert \"c\" {\n reach = \"barrel\"\n inlet = \"square-edge-headwall\"\n "+tc.road+"\n}", 12, 1.0)
			m, diags := model.Parse("b.chan.hcl", []byte(src))
			if diags.HasErrors() {
				b.Fatal(diags.Error())
			}
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Solve(m, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
