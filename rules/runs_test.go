package rules

import (
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// unscreened is Check with every point judged (no run passed by its
// screen).
func unscreened(m *model.Model, res *solver.Result, p *policies.Policy) []Finding {
	return check(m, res, p, true)
}

// TestScreensChangeNoFinding: on every model of the test corpus under every
// pack and test policy, Check finds the same findings, field for field,
// whether the screens pass runs or every point is judged.
func TestScreensChangeNoFinding(t *testing.T) {
	var models []string
	for _, g := range []string{"../testdata/demo/*.chan.hcl", goldenDir + "/*.chan.hcl", "../testdata/valid/*.chan.hcl"} {
		ms, err := filepath.Glob(g)
		require.NoError(t, err)
		models = append(models, ms...)
	}
	var pols []*policies.Policy
	for _, name := range policies.PackNames() {
		p, diags := Language().Pack(name)
		require.False(t, diags.HasErrors(), "%v", diags)
		pols = append(pols, p)
	}
	files, err := filepath.Glob(goldenDir + "/*.policy.hcl")
	require.NoError(t, err)
	more, err := filepath.Glob("../testdata/policies/*.policy.hcl")
	require.NoError(t, err)
	for _, f := range append(files, more...) {
		p, diags := Language().NewLoader("..").Load(f)
		require.False(t, diags.HasErrors(), "%s: %v", f, diags)
		pols = append(pols, p)
	}
	compared := 0
	for _, mf := range models {
		m, diags := model.Load(mf)
		if diags.HasErrors() {
			continue // the corpus's invalid model
		}
		res, err := solver.Solve(m, solver.Options{})
		require.NoError(t, err, mf)
		for _, p := range pols {
			fs := Check(m, res, p)
			require.Equal(t, unscreened(m, res, p), fs, "%s under %s", mf, p.Name)
			compared += len(fs)
		}
	}
	require.Greater(t, compared, 500, "the corpus gave too few findings to compare")

	// A points section, whose highest zone velocity the max_velocity
	// screen bounds: limits swept across the zone and mean velocities.
	m, res := solveSource(t, compoundSource)
	pts := res.Events[0].Reaches[0].Points
	lo, hi := pts[0].Velocity, pts[0].Velocity
	for i := range pts {
		v, _ := highestVelocity(res.Events[0].Reaches[0], &pts[i])
		lo, hi = min(lo, pts[i].Velocity), max(hi, v)
	}
	failing := 0
	for k := range 41 {
		p := &policies.Policy{Units: model.SI, Rules: map[string]*policies.RuleConfig{"max_velocity": {Rule: "max_velocity",
			Spec: &maxVelocityRule.RuleSpec, Values: map[string]policies.Value{"limit": {Table: policies.ByLining{
				Default: lo*0.9 + (hi*1.1-lo*0.9)*float64(k)/40, HasDefault: true}}}}}}
		fs := Check(m, res, p)
		require.Equal(t, unscreened(m, res, p), fs, "limit %d of 40", k)
		for _, f := range fs {
			if f.Rule == "max_velocity" {
				failing++
			}
		}
	}
	require.Greater(t, failing, 5, "no limit of the sweep failed the points section")
}

// TestScreensChangeNoFindingOnRandomProfiles: the same on smooth random
// profiles of the hand-built reach (open and closed sections, a bend),
// against limits drawn close to the profile's own values, so that runs
// pass or fail their screens by small margins.
func TestScreensChangeNoFindingOnRandomProfiles(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		m, r := handModel()
		pipe := &model.Section{Name: "pipe", Shape: model.Circle, Diameter: 1, Height: 1, Lining: "concrete"}
		bend := &model.Bend{Src: model.Src{DefRange: rng(25)}, Name: "elbow", ReachName: "main", Reach: r,
			FromStation: rapid.Float64Range(0, 500).Draw(t, "bend"), ToStation: 600, Radius: rapid.Float64Range(1, 60).Draw(t, "radius")}
		r.Bends, m.Bends = []*model.Bend{bend}, []*model.Bend{bend}
		n := rapid.IntRange(1, 60).Draw(t, "points")
		pts := make([]solver.Point, n)
		d0, dd := rapid.Float64Range(0.2, 1.2).Draw(t, "d0"), rapid.Float64Range(-0.03, 0.03).Draw(t, "dd")
		v0, dv := rapid.Float64Range(0.3, 4).Draw(t, "v0"), rapid.Float64Range(-0.1, 0.1).Draw(t, "dv")
		closedFrom := rapid.IntRange(0, n).Draw(t, "closed")
		for i := range pts {
			d, v := max(0.01, d0+dd*float64(i)), max(0.01, v0+dv*float64(i))
			p := pt(r, 10*float64(i), d, v)
			if i >= closedFrom {
				p.Section = pipe
				p.Full = d >= 1
			}
			pts[i] = p
		}
		res := result(m, r, pts, nil, nil)
		// Limits near the profile's values: the middle point's.
		mid := pts[n/2]
		near := func(label string, x float64) float64 { return x * rapid.Float64Range(0.9, 1.1).Draw(t, label) }
		lim := func(label string, x float64) policies.Value {
			return policies.Value{Table: policies.ByLining{Default: near(label, x), HasDefault: true}}
		}
		f := mid.Froude
		p := &policies.Policy{Units: model.SI, Rules: map[string]*policies.RuleConfig{
			"freeboard": {Values: map[string]policies.Value{"minimum": {Number: near("fb", 1-mid.Depth)}, "fraction": {Number: 0.1}}},
			"max_velocity": {Values: map[string]policies.Value{"limit": lim("vmax", mid.Velocity),
				"velocity": {Word: rapid.SampledFrom([]string{"highest_zone", "mean"}).Draw(t, "vword")}}},
			"min_velocity": {Values: map[string]policies.Value{"limit": lim("vmin", mid.Velocity)}},
			"froude_band":  {Values: map[string]policies.Value{"avoid": {Bands: []policies.Band{{Low: near("flo", f), High: near("fhi", 1.2*f)}}}}},
			"shear_stress": {Values: map[string]policies.Value{"limit": lim("tau", 9810*mid.Depth*mid.FrictionSlope),
				"quantity": {Word: rapid.SampledFrom([]string{"maximum", "mean"}).Draw(t, "tword")}}},
			"public_safety":  {Values: map[string]policies.Value{"depth": {Number: near("pd", mid.Depth)}, "depth_velocity": {Number: near("pdv", mid.Depth*mid.Velocity)}}},
			"superelevation": {Values: map[string]policies.Value{"minimum": {Number: 0.3}}},
		}}
		for id, cfg := range p.Rules {
			cfg.Rule, cfg.Spec = id, &Lookup(id).RuleSpec
		}
		if got, want := Check(m, res, p), unscreened(m, res, p); !equalFindings(got, want) {
			t.Fatalf("screened:\n%v\nevery point judged:\n%v", got, want)
		}
	})
}

func equalFindings(a, b []Finding) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if !a[i].Equal(&b[i]) {
			return false
		}
	}
	return true
}
