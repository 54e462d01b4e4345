package rules

import (
	"reflect"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// freeboardCase is the hand model with freeboard failing over 100–200
// (0.15 m left against 0.3 m) and at 400, and a policy enabling freeboard.
func freeboardCase() (*model.Model, *model.Reach, *solver.Result, *policies.Policy) {
	m, r := handModel()
	pts := depthsPoints(r, []float64{0, 100, 200, 300, 400}, []float64{0.5, 0.8, 0.85, 0.6, 0.9}, []float64{1, 1, 1, 1, 1})
	p := &policies.Policy{Name: "t", Units: model.SI, Reference: "Manual ch. 5", Rules: map[string]*policies.RuleConfig{
		"freeboard": {Rule: "freeboard", Spec: &Lookup("freeboard").RuleSpec, Values: map[string]policies.Value{"minimum": {Number: 0.3}}, Severity: policies.Warning},
	}}
	return m, r, result(m, r, pts, nil, nil), p
}

func byRule(fs []Finding, id string) []Finding {
	var out []Finding
	for _, f := range fs {
		if f.Rule == id {
			out = append(out, f)
		}
	}
	return out
}

func TestCheckFillsRegistryFields(t *testing.T) {
	m, _, res, p := freeboardCase()
	fs := Check(m, res, p)
	require.Len(t, fs, 2)
	for _, f := range fs {
		assert.Equal(t, "freeboard", f.Rule)
		assert.Equal(t, policies.Warning, f.Severity, "the policy's severity wins over the default")
		assert.Equal(t, "hand.chan.hcl", f.File())
		assert.Equal(t, "Manual ch. 5", f.Reference)
		assert.False(t, f.Excepted)
	}
	p.Rules["freeboard"].Severity = ""
	assert.Equal(t, policies.Error, Check(m, res, p)[0].Severity, "else the rule's default")
}

func TestCheckEventFilterAndDisabledRules(t *testing.T) {
	m, _, res, p := freeboardCase()
	p.Rules["freeboard"].Events = []string{"q500"}
	fs := Check(m, res, p)
	require.Len(t, fs, 1, "no freeboard finding, and a warning that the block matches no event")
	assert.Equal(t, unmatchedSelectorID, fs[0].Rule)
	assert.Equal(t, policies.Warning, fs[0].Severity)
	p.Rules["freeboard"].Events = []string{"q"}
	assert.Len(t, Check(m, res, p), 2)
	delete(p.Rules, "freeboard")
	assert.Empty(t, Check(m, res, p), "an absent block turns the rule off")
	assert.Empty(t, Check(m, res, nil), "a nil policy runs the always-on rules only")
}

func TestCheckExceptionCovers(t *testing.T) {
	m, r, res, p := freeboardCase()
	ex := &model.Exception{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r,
		FromStation: 100, ToStation: 200, Reason: "reviewed"}
	m.Exceptions = []*model.Exception{ex}
	fs := Check(m, res, p)
	require.Len(t, fs, 2)
	assert.True(t, fs[0].Excepted)
	assert.Equal(t, "reviewed", fs[0].ExceptionReason)
	assert.Equal(t, ex.DefRange, fs[0].ExceptionRange)
	assert.False(t, fs[1].Excepted, "400 lies outside 100–200")
	assert.Empty(t, byRule(fs, "unused_exception"))

	// Within the tolerance (a part of a millimetre) still covers.
	ex.ToStation = 199.9995
	assert.True(t, Check(m, res, p)[0].Excepted)
}

func TestCheckExceptionCoversNothing(t *testing.T) {
	m, r, res, p := freeboardCase()
	m.Exceptions = []*model.Exception{
		{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 600, ToStation: 700, Reason: "old"},
		{Src: model.Src{DefRange: rng(52)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 150, ToStation: 200, Reason: "too short"},
		{Src: model.Src{DefRange: rng(54)}, Rule: "max_velocity", ReachName: "main", Reach: r, FromStation: 0, ToStation: 100, Reason: "off"},
	}
	fs := Check(m, res, p)
	un := byRule(fs, "unused_exception")
	require.Len(t, un, 3)
	for _, f := range un {
		assert.Equal(t, policies.Warning, f.Severity)
	}
	assert.Equal(t, rng(50), un[0].Range)
	assert.Contains(t, un[0].Message, `the exception for rule "freeboard" on reach "main" over stations 600–700 m covers no finding in any event`)
	assert.Contains(t, un[1].Message, `a freeboard finding in event "q" over stations 100–200 m extends beyond it`)
	assert.Contains(t, un[2].Message, "the policy does not enable that rule")
	for _, f := range byRule(fs, "freeboard") {
		assert.False(t, f.Excepted)
	}
}

func TestCheckExceptionsDenied(t *testing.T) {
	m, r, res, p := freeboardCase()
	p.Exceptions = "deny"
	m.Exceptions = []*model.Exception{
		{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 0, ToStation: 1000, Reason: "all"},
	}
	fs := Check(m, res, p)
	for _, f := range byRule(fs, "freeboard") {
		assert.False(t, f.Excepted, "deny ignores exceptions")
	}
	un := byRule(fs, "unused_exception")
	require.Len(t, un, 1)
	assert.Equal(t, policies.Info, un[0].Severity)
	assert.Contains(t, un[0].Message, `was not applied: the policy does not accept design exceptions (exceptions = "deny"); the 2 findings it would cover are reported in full`)
}

func TestSortAndDedupe(t *testing.T) {
	a := Finding{Rule: "b", Range: InFile("x", rng(5))}
	b := Finding{Rule: "a", Range: InFile("x", rng(5))}
	c := Finding{Rule: "a", Range: InFile("x", rng(3))}
	d := Finding{Rule: "a", Range: InFile("w", rng(9))}
	e := Finding{Rule: "a", Range: InFile("x", rng(5)), Event: "q", FromStation: 10}
	f := Finding{Rule: "a", Range: InFile("x", rng(5)), Event: "q", FromStation: 5}
	got := sortFindings([]Finding{a, b, c, d, e, f, a, c})
	assert.Equal(t, []Finding{d, c, b, f, e, a}, got)
}

// TestPolicyUnitsConverted: the same criteria written in US units check an
// SI model exactly like the SI policy. Source: 1 ft = 0.3048 m exactly
// (international foot, 1959).
func TestPolicyUnitsConverted(t *testing.T) {
	m, _, res, si := freeboardCase()
	si.Rules["max_velocity"] = &policies.RuleConfig{Rule: "max_velocity",
		Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": 0.9}, Default: 2, HasDefault: true}}}}
	us := &policies.Policy{Name: "t", Units: model.US, Reference: si.Reference, Rules: map[string]*policies.RuleConfig{
		"freeboard":    {Rule: "freeboard", Spec: &Lookup("freeboard").RuleSpec, Values: map[string]policies.Value{"minimum": {Number: 0.3 / 0.3048}}, Severity: policies.Warning},
		"max_velocity": {Rule: "max_velocity", Spec: &Lookup("max_velocity").RuleSpec, Values: map[string]policies.Value{"limit": {Table: policies.ByLining{Values: map[string]float64{"grass": 0.9 / 0.3048}, Default: 2 / 0.3048, HasDefault: true}}}},
	}}
	a, b := Check(m, res, si), Check(m, res, us)
	require.Len(t, a, 3)
	require.Equal(t, len(a), len(b))
	for i := range a {
		assert.Equal(t, a[i].Rule, b[i].Rule)
		assert.Equal(t, a[i].FromStation, b[i].FromStation)
		assert.Equal(t, a[i].ToStation, b[i].ToStation)
		assert.InDelta(t, a[i].Value, b[i].Value, 1e-12)
		assert.InDelta(t, a[i].Limit, b[i].Limit, 1e-12)
		assert.Equal(t, a[i].Message, b[i].Message)
	}
}

// TestFindingEqualCoversEveryField changes each field of a finding in turn
// and requires Equal to see the difference, so that a new field cannot be
// forgotten in the comparison that removes duplicates.
func TestFindingEqualCoversEveryField(t *testing.T) {
	var base Finding
	v := reflect.ValueOf(&base).Elem()
	for i := range v.NumField() {
		other := base
		field := reflect.ValueOf(&other).Elem().Field(i)
		switch field.Kind() {
		case reflect.String:
			field.SetString("x")
		case reflect.Float64:
			field.SetFloat(1)
		case reflect.Bool:
			field.SetBool(true)
		case reflect.Struct: // hcl.Range
			field.FieldByName("Filename").SetString("x")
		case reflect.Slice:
			field.Set(reflect.ValueOf([]Related{{Label: "x"}}))
		case reflect.Pointer: // *Envelope
			field.Set(reflect.ValueOf(&Envelope{Verdict: "x"}))
		default:
			t.Fatalf("field %s of kind %s: extend this test", v.Type().Field(i).Name, field.Kind())
		}
		assert.False(t, base.Equal(&other), "Equal ignores %s", v.Type().Field(i).Name)
		assert.True(t, other.Equal(&other))
	}
}
