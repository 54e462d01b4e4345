package rules

import (
	"testing"
	"time"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

func demo(b *testing.B) (*model.Model, *policies.Policy) {
	m, diags := model.Load("../testdata/demo/kestrel-ridge.chan.hcl")
	if diags.HasErrors() {
		b.Fatal(diags)
	}
	p, pd := Language().Pack("baseline")
	if pd.HasErrors() {
		b.Fatal(pd)
	}
	return m, p
}

// BenchmarkSolveDemo is the reference the rules are measured against:
// solving every event of the demo model.
func BenchmarkSolveDemo(b *testing.B) {
	m, _ := demo(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := solver.Solve(m, solver.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCheckDemo checks the solved demo model against the baseline
// pack (policy conversion, every rule, spans, exceptions, sorting).
func BenchmarkCheckDemo(b *testing.B) {
	m, p := demo(b)
	res, err := solver.Solve(m, solver.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		Check(m, res, p)
	}
}

// BenchmarkCheckLong checks a long reach of 20,000 computed points whose
// depth rises smoothly along it (as in a backwater curve), against every
// rule of the baseline pack: most points pass and a few long spans fail,
// which is what real profiles look like. The cost per point is ns/op
// divided by 20,000.
func BenchmarkCheckLong(b *testing.B) {
	m, r := handModel()
	r.Length = 20000
	pts := make([]solver.Point, 20000)
	for i := range pts {
		d := 0.5 + 0.7*float64(i)/float64(len(pts))
		pts[i] = pt(r, float64(i), d, 4/(4*d))
	}
	res := result(m, r, pts, nil, nil)
	_, p := demo(b)
	b.ReportAllocs()
	for b.Loop() {
		Check(m, res, p)
	}
}

// BenchmarkRulesShare solves and checks the demo model in turns and
// reports the rules' time as a percentage of the solving time (the
// `rules-%` metric; issue target: under 10). Taking the two in turns, in
// one loop, keeps a busy machine from favouring one of them.
func BenchmarkRulesShare(b *testing.B) {
	m, p := demo(b)
	var solving, checking time.Duration
	for b.Loop() {
		t0 := time.Now()
		res, err := solver.Solve(m, solver.Options{})
		if err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		Check(m, res, p)
		t2 := time.Now()
		solving += t1.Sub(t0)
		checking += t2.Sub(t1)
	}
	b.ReportMetric(100*checking.Seconds()/solving.Seconds(), "rules-%")
}
