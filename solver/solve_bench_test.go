package solver

import (
	"fmt"
	"runtime"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
)

// chainModel is n reaches of 3 km of lined trapezoid in a chain, each on
// a mild slope, with a high tailwater at the outlet: the downstream
// reaches carry an M1 backwater that dies out upstream.
func chainModel(b testing.TB, n int) *model.Model {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	specs := make([]netReach, n)
	for i := range specs {
		specs[i] = netReach{name: fmt.Sprintf("r%04d", i), from: fmt.Sprintf("n%04d", i), to: fmt.Sprintf("n%04d", i+1),
			length: 3000, slope: 0.001, sec: sec}
	}
	specs[0].inflow = 10
	return buildNet(b, model.SI, specs, model.Outlet{Kind: model.OutletDepth, Value: 2.5})
}

// BenchmarkChain1000 solves a 1,000-reach chain of 3 km trapezoid reaches
// (one event). Target: under 20 ms on one core (-cpu 1).
func BenchmarkChain1000(b *testing.B) {
	m := chainModel(b, 1000)
	b.ReportAllocs()
	b.ResetTimer()
	var res *Result
	for b.Loop() {
		var err error
		if res, err = Solve(m, Options{}); err != nil {
			b.Fatal(err)
		}
	}
	reportWork(b, res)
}

// BenchmarkStep is one adaptive double step of the standard-step
// integrator (three energy-equation solutions and the error estimate) on
// an M1 backwater: it must not allocate.
func BenchmarkStep(b *testing.B) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	g := NewGeometry(sec, model.SI)
	f := flowCtx{q: 10, zUp: 3, s0: 0.001, length: 3000, tol: DefaultTolerance}
	p := piece{from: 0, to: 3000, geo: g}
	p.yc, _ = CriticalDepth(g, 10)
	p.yn, _ = NormalDepth(g, 10, 0.001)
	p.hasN, p.class = true, Mild
	var st stepper
	var out [2]pt
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		st.init(&f, &p, 0, false, 3000, 2.0, false, 0)
		st.dx = 5
		if st.step(0, &out) != 2 {
			b.Fatal("step not taken")
		}
	}
}

// BenchmarkJumpReach solves one mild reach with a gate, an M3 curve, a
// jump and an M1 backwater.
func BenchmarkJumpReach(b *testing.B) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	gate := &model.Gate{Name: "head", Opening: 0.3, Contraction: 0.61}
	m := buildNet(b, model.SI, []netReach{{name: "r", from: "a", to: "b", length: 400, slope: 0.001, sec: sec, inflow: 10, gate: gate}},
		model.Outlet{Kind: model.OutletDepth, Value: 1.6})
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if _, err := Solve(m, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkChain1000Varied is the chain with slopes alternating between
// 0.001 and 0.0025 and an inflow every tenth reach, so that no two
// neighbouring reaches share discharge and slope: each reach solves its own
// normal and critical depths and a profile from a changing control.
func BenchmarkChain1000Varied(b *testing.B) {
	m := chainModel(b, 1000)
	for i, r := range m.Reaches {
		if i%2 == 1 {
			r.Slope = 0.0025
		}
	}
	down := 0.0
	for i := len(m.Reaches) - 1; i >= 0; i-- {
		r := m.Reaches[i]
		r.InvertDown, r.InvertUp = down, down+r.Slope*r.Length
		down = r.InvertUp
	}
	ev := m.Events[0]
	q := 0.0
	for i := range ev.Discharge {
		if i%10 == 0 {
			q += 1
		}
		ev.Discharge[i] = q
	}
	b.ReportAllocs()
	b.ResetTimer()
	var res *Result
	for b.Loop() {
		var err error
		if res, err = Solve(m, Options{}); err != nil {
			b.Fatal(err)
		}
	}
	reportWork(b, res)
}

// reportWork reports the section evaluations per computed point and the
// time per point of the benchmark's Solve calls. The evaluations are
// those the profiles cost (the standard steps, their root finding and
// error control, the transitions and jumps), not the normal and critical
// depths of each reach.
func reportWork(b *testing.B, res *Result) {
	evals, points := 0, 0
	for _, er := range res.Events {
		for _, rr := range er.Reaches {
			evals += rr.evaluations()
			points += len(rr.Points)
		}
	}
	b.ReportMetric(float64(evals), "evals/op")
	b.ReportMetric(float64(points), "points/op")
	b.ReportMetric(float64(evals)/float64(points), "evals/point")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(points), "ns/point")
}

// BenchmarkPointMemory measures the memory a computed point costs, the
// figure behind DefaultMaxPoints: one event of one 24 km reach at
// max_spacing 0.25 m (96,001 points). B/point is the memory allocated per
// point kept in the result (the Point itself and the work buffers grown
// for it); heapB/point is the live heap per point after Solve while the
// result is held.
func BenchmarkPointMemory(b *testing.B) {
	src := strings.Replace(hostileEvents(1), "length = 240000", "length = 24000", 1)
	m, diags := model.Parse("mem.chan.hcl", []byte(src))
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	b.ReportAllocs()
	points := 0
	var heap uint64
	for b.Loop() {
		var before, after runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&before)
		res, err := Solve(m, Options{})
		if err != nil {
			b.Fatal(err)
		}
		runtime.GC()
		runtime.ReadMemStats(&after)
		points = len(res.Events[0].Reaches[0].Points)
		heap = after.HeapAlloc - min(before.HeapAlloc, after.HeapAlloc)
		runtime.KeepAlive(res)
	}
	b.ReportMetric(float64(points), "points/op")
	b.ReportMetric(float64(heap)/float64(points), "heapB/point")
}

// BenchmarkStepPredicted is a run of steps on an M1 backwater after the
// first (doubled) one: each a predicted depth corrected by Newton's
// method. It must not allocate; evals/step is the section evaluations of
// one accepted step.
func BenchmarkStepPredicted(b *testing.B) {
	sec := trapezoid("lined", 3, 2, 0.015, 4)
	g := NewGeometry(sec, model.SI)
	f := flowCtx{q: 10, zUp: 3, s0: 0.001, length: 3000, tol: DefaultTolerance}
	p := piece{from: 0, to: 3000, geo: g}
	p.yc, _ = CriticalDepth(g, 10)
	p.yn, _ = NormalDepth(g, 10, 0.001)
	p.hasN, p.class = true, Mild
	var st stepper
	var out [2]pt
	steps := 0
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		st.init(&f, &p, 0, false, 3000, 2.0, false, 0)
		st.dx = 5
		for range 10 {
			steps += st.step(0, &out)
		}
	}
	b.ReportMetric(float64(f.evals)/float64(steps), "evals/point")
}
