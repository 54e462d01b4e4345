package rules

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
)

// rng is a source range on a line of the hand-built model file.
func rng(line int) hcl.Range {
	return hcl.Range{Filename: "hand.chan.hcl",
		Start: hcl.Pos{Line: line, Column: 1, Byte: 0},
		End:   hcl.Pos{Line: line, Column: 10, Byte: 9}}
}

// handModel is one SI reach "main" (1000 m, slope 0.001) of a rectangle 4 m
// wide and 1.0 m high, lined "grass", with one event "q".
func handModel() (*model.Model, *model.Reach) {
	sec := &model.Section{Src: model.Src{DefRange: rng(1)}, Name: "rect", Shape: model.Rectangle,
		BottomWidth: 4, Height: 1.0, Roughness: [3]float64{0.03, 0.03, 0.03}, Lining: "grass"}
	r := &model.Reach{Src: model.Src{DefRange: rng(10)}, Name: "main", From: "a", To: "b",
		Length: 1000, SectionName: "rect", Section: sec, InvertUp: 11, InvertDown: 10, Slope: 0.001}
	ev := &model.Event{Src: model.Src{DefRange: rng(30)}, Name: "q"}
	m := &model.Model{File: "hand.chan.hcl", Units: model.SI, Sections: []*model.Section{sec},
		Reaches: []*model.Reach{r}, Events: []*model.Event{ev}}
	return m, r
}

// pt is a computed point of the rectangle at a station with a depth and a
// velocity; the other fields follow from the rectangle's geometry.
func pt(r *model.Reach, station, depth, velocity float64) solver.Point {
	b := r.Section.BottomWidth
	inv := r.InvertAt(station)
	g := 9.80665
	return solver.Point{
		Station: station, Invert: inv, Depth: depth, WSE: inv + depth, Velocity: velocity,
		Froude: velocity / math.Sqrt(g*depth), Energy: inv + depth + velocity*velocity/(2*g),
		Regime: solver.Subcritical, Section: r.SectionAt(station), Area: b * depth, TopWidth: b,
		HydraulicRadius: b * depth / (b + 2*depth), FrictionSlope: r.Slope, Alpha: 1,
	}
}

// result wraps points (and jumps, notes) of reach r into a one-event result.
func result(m *model.Model, r *model.Reach, pts []solver.Point, jumps []solver.Jump, notes []solver.Note) *solver.Result {
	rr := &solver.ReachResult{Reach: r, Discharge: 10, SlopeClass: solver.Mild, Points: pts, Jumps: jumps, Notes: notes}
	return &solver.Result{Model: m, Events: []*solver.EventResult{{Event: m.Events[0], Reaches: []*solver.ReachResult{rr}}}}
}

// runRule calls one rule's Check directly on a context, as Check would.
func runRule(t *testing.T, id string, m *model.Model, res *solver.Result, cfg *policies.RuleConfig) []Finding {
	t.Helper()
	r := Lookup(id)
	if r == nil {
		t.Fatalf("no rule %q", id)
	}
	p := &policies.Policy{Units: m.Units, Rules: map[string]*policies.RuleConfig{}}
	if cfg != nil {
		cfg.Rule = id
		if cfg.Spec == nil {
			cfg.Spec = &r.RuleSpec
		}
		p.Rules[id] = cfg
	}
	var out []Finding
	r.Check(&Context{Model: m, Result: res, Policy: p, Config: cfg}, func(f Finding) { out = append(out, f) })
	return out
}
