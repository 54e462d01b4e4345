package rules

import (
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"pgregory.net/rapid"
)

// anyFloat draws ordinary numbers most of the time and, now and then, the
// values a broken result could carry: zero, negative, huge, NaN, ±Inf.
func anyFloat(t *rapid.T, label string) float64 {
	switch rapid.IntRange(0, 9).Draw(t, label+"-kind") {
	case 0:
		return rapid.SampledFrom([]float64{0, -1, 1e308, -1e308, math.NaN(), math.Inf(1), math.Inf(-1), 5e-324}).Draw(t, label)
	default:
		return rapid.Float64Range(0, 50).Draw(t, label)
	}
}

// TestCheckNeverPanicsOrLeaksNaN: whatever numbers a result carries, Check
// returns sorted findings with finite numbers and no NaN or Inf in any
// message, and every span runs forward.
func TestCheckNeverPanicsOrLeaksNaN(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		m, r := handModel()
		pipe := &model.Section{Name: "pipe", Shape: model.Circle, Diameter: 1, Height: 1, Lining: "concrete"}
		b := &model.Basin{Src: model.Src{DefRange: rng(20)}, Name: "pool", ReachName: "main", Reach: r,
			FromStation: 10, ToStation: 40}
		bend := &model.Bend{Src: model.Src{DefRange: rng(25)}, Name: "elbow", ReachName: "main", Reach: r,
			FromStation: 100, ToStation: 300, Radius: rapid.Float64Range(0, 100).Draw(t, "radius")}
		r.Basins, r.Bends = []*model.Basin{b}, []*model.Bend{bend}
		m.Basins, m.Bends = r.Basins, r.Bends
		m.Exceptions = []*model.Exception{{Src: model.Src{DefRange: rng(50)}, Rule: rapid.SampledFrom(
			[]string{"freeboard", "capacity", "bogus", "model"}).Draw(t, "exrule"), ReachName: "main", Reach: r,
			FromStation: anyFloat(t, "exfrom"), ToStation: anyFloat(t, "exto")}}
		n := rapid.IntRange(0, 30).Draw(t, "points")
		pts := make([]solver.Point, n)
		st := 0.0
		for i := range pts {
			st += rapid.Float64Range(0, 80).Draw(t, "step")
			p := pt(r, st, anyFloat(t, "depth"), anyFloat(t, "v"))
			p.Froude = anyFloat(t, "froude")
			p.HydraulicRadius = anyFloat(t, "r")
			p.FrictionSlope = anyFloat(t, "sf")
			p.TopWidth = anyFloat(t, "t")
			p.Full = rapid.Bool().Draw(t, "full")
			if rapid.Bool().Draw(t, "pipe") {
				p.Section = pipe
			}
			pts[i] = p
		}
		var jumps []solver.Jump
		for range rapid.IntRange(0, 3).Draw(t, "jumps") {
			jumps = append(jumps, solver.Jump{Station: anyFloat(t, "toe"), Length: anyFloat(t, "len"), Froude: anyFloat(t, "f1")})
		}
		var notes []solver.Note
		for range rapid.IntRange(0, 3).Draw(t, "notes") {
			notes = append(notes, solver.Note{Kind: rapid.SampledFrom([]solver.NoteKind{
				solver.NoteControl, solver.NoteCriticalFallback, solver.NoteNoConvergence}).Draw(t, "kind"),
				Station: anyFloat(t, "nst")})
		}
		res := result(m, r, pts, jumps, notes)
		lim := policies.ByLining{Default: anyFloat(t, "lim"), HasDefault: true}
		band := []policies.Band{{Low: 0.5, High: 1.5}}
		p := &policies.Policy{Units: model.SI, Exceptions: rapid.SampledFrom([]string{"", "report", "deny"}).Draw(t, "mode"),
			Rules: map[string]*policies.RuleConfig{
				"freeboard":        {Values: map[string]policies.Value{"minimum": {Number: anyFloat(t, "min")}, "fraction": {Number: 0.2}}},
				"max_velocity":     {Values: map[string]policies.Value{"limit": {Table: lim}}},
				"min_velocity":     {Values: map[string]policies.Value{"limit": {Table: lim}}},
				"froude_band":      {Values: map[string]policies.Value{"avoid": {Bands: band}}},
				"jump_containment": {},
				"jump_type":        {Values: map[string]policies.Value{"avoid": {Bands: band}}},
				"superelevation":   {Values: map[string]policies.Value{"minimum": {Number: 0.3}}},
				"shear_stress":     {Values: map[string]policies.Value{"limit": {Table: lim}}},
			}}
		fs := Check(m, res, p)
		if !slices.IsSortedFunc(fs, cmpFindings) {
			t.Fatal("findings not sorted")
		}
		for _, f := range fs {
			if !numfmt.Finite(f.FromStation, f.ToStation, f.Value, f.Limit) {
				t.Fatalf("non-finite number in %+v", f)
			}
			if f.HasSpan && f.FromStation > f.ToStation && f.Rule != unusedExceptionID {
				t.Fatalf("backward span in %+v", f)
			}
			for _, bad := range []string{"NaN", "Inf", "n/a"} {
				if strings.Contains(f.Message, bad) {
					t.Fatalf("%q in message %q", bad, f.Message)
				}
			}
		}
	})
}
