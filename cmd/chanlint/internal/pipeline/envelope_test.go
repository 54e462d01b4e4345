package pipeline

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// rectNormalDepth is Manning's normal depth of a rectangle b wide by
// bisection, sharing no code with the solver.
func rectNormalDepth(k, n, q, b, s0 float64) float64 {
	lo, hi := 1e-6, 100.0
	for range 200 {
		y := (lo + hi) / 2
		a, p := b*y, b+2*y
		if k/n*a*math.Pow(a/p, 2.0/3)*math.Sqrt(s0) < q {
			lo = y
		} else {
			hi = y
		}
	}
	return (lo + hi) / 2
}

// envelopeCase is one system of units of TestEnvelopeVerdicts.
type envelopeCase struct {
	units        model.Units
	k            float64 // Manning's constant
	q, b, n, s0  float64
	required     float64 // freeboard minimum, in the model's length unit
	policyLength string  // the policy's freeboard minimum as written
}

// TestEnvelopeVerdicts builds three reaches in uniform flow whose banks
// stand where the freeboard verdict holds in every case (robust fail),
// flips when n or Q is lowered (knife-edge), or fails only when they are
// raised (a sensitivity finding), and checks the verdict and the number of
// failing cases against the freeboard computed from independent normal
// depths of every case. Uniform flow holds because the reaches share one
// section shape and slope and the outlet is at normal depth.
//
// Source: Manning's equation for uniform flow, Q = (k/n)·A·R^(2/3)·√S0
// (Chow, Open-Channel Hydraulics, 1959, ch. 6); k = 1.486 in US units
// (references.md).
func TestEnvelopeVerdicts(t *testing.T) {
	for _, ec := range []envelopeCase{
		{units: model.SI, k: 1.0, q: 2, b: 3, n: 0.02, s0: 0.001, required: 0.3, policyLength: "0.3"},
		{units: model.US, k: 1.486, q: 70, b: 10, n: 0.02, s0: 0.001, required: 1, policyLength: "1.0"},
	} {
		t.Run(string(ec.units), func(t *testing.T) { testEnvelope(t, ec) })
	}
}

func testEnvelope(t *testing.T, ec envelopeCase) {
	sens := Sensitivity{Roughness: 0.2, Discharge: 0.1}
	cases := Cases(sens, ec.units.Length())
	require.Len(t, cases, 8, "two parameters: four alone, four corners")
	yn := func(c Case) float64 {
		return rectNormalDepth(ec.k, ec.n*scaleOr1(c.Vary.Roughness), ec.q*scaleOr1(c.Vary.Discharge), ec.b, ec.s0)
	}
	y0 := rectNormalDepth(ec.k, ec.n, ec.q, ec.b, ec.s0)
	lo, hi := y0, y0
	for _, c := range cases {
		lo, hi = math.Min(lo, yn(c)), math.Max(hi, yn(c))
	}
	heights := map[string]float64{
		"robust":    (hi + lo + ec.required) / 2, // above the water in every case, short of the freeboard
		"knife":     (y0+lo)/2 + ec.required,
		"sensitive": (y0+hi)/2 + ec.required,
	}
	require.Less(t, hi, lo+ec.required, "the spread of depths leaves room for a bank that is never overtopped")
	names := []string{"robust", "knife", "sensitive"}
	var src strings.Builder
	fmt.Fprintf(&src, "units = %q\n", ec.units)
	for i, name := range names {
		fmt.Fprintf(&src, "section %q {\n  shape = \"rectangle\"\n  bottom_width = %g\n  height = %.6f\n  roughness = %g\n}\n", name, ec.b, heights[name], ec.n)
		fmt.Fprintf(&src, "reach %q {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = 400\n  section = %q\n  slope = %g\n}\n", name, i, i+1, name, ec.s0)
	}
	fmt.Fprintf(&src, "event \"design\" {\n  inflow = { robust = %g }\n  outlet = { condition = \"normal\" }\n}\n", ec.q)
	parsed := Parse(File{Name: "envelope.chan.hcl"}, []byte(src.String()))
	require.False(t, parsed.Invalid, "%v", parsed.Diagnostics)

	pol, diags := rules.Language().NewLoader(t.TempDir()).LoadSource("envelope.policy.hcl", []byte(fmt.Sprintf(`
policy "envelope" {
  units = %q
  freeboard {
    minimum  = %s
    fraction = 0
  }
  sensitivity {
    roughness = 0.2
    discharge = 0.1
    severity  = "warning"
  }
}`, ec.units, ec.policyLength)))
	require.False(t, diags.HasErrors(), diags.Error())

	serial := parsed.CheckVaried(pol, Options{Keep: Keep{Solved: true}}, 1)
	if testing.Verbose() {
		for _, f := range serial.Findings {
			t.Logf("%s %s %s %v-%v %s %v", f.Rule, f.Reach, f.Severity, f.FromStation, f.ToStation, f.Message, f.Envelope)
		}
		for _, rr := range serial.Solution.Events[0].Reaches {
			p := rr.Points[len(rr.Points)/2]
			t.Logf("%s depth %v yn %v h %v", rr.Reach.Name, p.Depth, y0, heights[rr.Reach.Name])
		}
	}
	require.False(t, serial.Invalid)
	require.Len(t, serial.Cases, len(cases))

	byReach := map[string]*rules.Finding{}
	for i := range serial.Findings {
		if f := &serial.Findings[i]; f.Rule == "freeboard" {
			require.Nil(t, byReach[f.Reach], "one freeboard finding per reach: %s", f.Message)
			byReach[f.Reach] = f
		}
	}
	for _, name := range names {
		f := byReach[name]
		require.NotNil(t, f, "reach %s has a freeboard finding", name)
		require.NotNil(t, f.Envelope, "reach %s has a verdict", name)
		failing, firstFlip := 0, ""
		var drivers []string
		for _, c := range cases {
			fails := heights[name]-yn(c) < ec.required
			if fails {
				failing++
			}
			if fails == (name == "sensitive") { // flips the nominal verdict
				if firstFlip == "" {
					firstFlip = c.Name
				}
				if c.Alone != "" && !slices.Contains(drivers, c.Alone) {
					drivers = append(drivers, c.Alone)
				}
			}
		}
		assert.Equal(t, failing, f.Envelope.Failing, "reach %s: failing cases", name)
		assert.Equal(t, len(cases), f.Envelope.Cases)
		switch name {
		case "robust":
			assert.Equal(t, rules.RobustFail, f.Envelope.Verdict)
			assert.Equal(t, len(cases), failing)
		case "knife":
			assert.Equal(t, rules.KnifeEdge, f.Envelope.Verdict)
			assert.Equal(t, strings.Join(drivers, " and "), f.Envelope.Driver)
			assert.Equal(t, firstFlip, f.Envelope.Case, "the first case that passes")
			assert.Equal(t, policies.Error, f.Severity)
		case "sensitive":
			assert.Equal(t, rules.Sensitivity, f.Envelope.Verdict)
			assert.Equal(t, strings.Join(drivers, " and "), f.Envelope.Driver)
			assert.Equal(t, firstFlip, f.Envelope.Case, "the first case that fails")
			assert.Equal(t, policies.Warning, f.Severity, "the sensitivity block's severity")
			assert.True(t, strings.HasPrefix(f.Message, "under "+firstFlip+": "), f.Message)
		}
	}

	// The cases run on the worker pool: the output does not depend on it.
	for _, jobs := range []int{2, 7} {
		assert.Equal(t, serial.Findings, parsed.CheckVaried(pol, Options{}, jobs).Findings, "jobs %d", jobs)
	}
}

func scaleOr1(f float64) float64 {
	if f == 0 {
		return 1
	}
	return f
}

// TestCasesOrder pins the order and names of the cases: each parameter
// down then up alone, then the corners.
//
// Source: common practice (no published source): a one-at-a-time and a
// two-level full-factorial design.
func TestCasesOrder(t *testing.T) {
	cs := Cases(Sensitivity{Roughness: 0.2, Tailwater: 0.3, Discharge: 0.1}, "m")
	require.Len(t, cs, 6+8)
	var names []string
	for _, c := range cs {
		names = append(names, c.Name)
	}
	assert.Equal(t, []string{
		"roughness −20 %", "roughness +20 %", "tailwater −0.3 m", "tailwater +0.3 m", "discharge −10 %", "discharge +10 %",
		"roughness −20 %, tailwater −0.3 m, discharge −10 %", "roughness −20 %, tailwater −0.3 m, discharge +10 %",
		"roughness −20 %, tailwater +0.3 m, discharge −10 %", "roughness −20 %, tailwater +0.3 m, discharge +10 %",
		"roughness +20 %, tailwater −0.3 m, discharge −10 %", "roughness +20 %, tailwater −0.3 m, discharge +10 %",
		"roughness +20 %, tailwater +0.3 m, discharge −10 %", "roughness +20 %, tailwater +0.3 m, discharge +10 %",
	}, names)
	assert.InDelta(t, 1.2, cs[13].Vary.Roughness, 1e-12)
	assert.InDelta(t, -0.3, cs[2].Vary.Tailwater, 1e-12)
	assert.Len(t, Cases(Sensitivity{Discharge: 0.1}, "m"), 2, "one parameter: no corners")
}

// TestParseSensitivity covers the command line's form.
//
// Source: common practice (no published source).
func TestParseSensitivity(t *testing.T) {
	s, err := ParseSensitivity("roughness=20%, tailwater=1ft,discharge=0.1")
	require.NoError(t, err)
	assert.InDelta(t, 0.2, s.Roughness, 1e-12)
	assert.InDelta(t, 0.1, s.Discharge, 1e-12)
	assert.Equal(t, model.US, s.Units)
	assert.InDelta(t, 0.3048, s.In(model.SI).Tailwater, 1e-12)
	for spec, want := range map[string]string{
		"roughnes=0.2":                `did you mean "roughness"`,
		"roughness":                   "NAME=VALUE",
		"roughness=2":                 "share from 0 to 0.9",
		"tailwater=-1":                "offset from 0 to 100",
		"discharge=0":                 "varies nothing",
		"roughness=0.1,roughness=0.2": "given twice",
	} {
		_, err := ParseSensitivity(spec)
		require.Error(t, err, spec)
		assert.Contains(t, err.Error(), want, spec)
	}
}

// TestUnsolvedCase: a case the solver could not finish counts as failing
// the nominal findings (the cautious reading) and is named in an info
// finding, which sorts with the others.
//
// Source: common practice (no published source).
func TestUnsolvedCase(t *testing.T) {
	at := func(line int) hcl.Range {
		return hcl.Range{Filename: "m.chan.hcl", Start: hcl.Pos{Line: line}, End: hcl.Pos{Line: line}}
	}
	nominal := &Result{File: File{Name: "m.chan.hcl"}, Findings: []rules.Finding{
		{Rule: "freeboard", Severity: policies.Error, Range: at(9), Reach: "r", Event: "e", HasSpan: true, FromStation: 1, ToStation: 2},
	}}
	cases := []Case{{Name: "discharge +10 %", Alone: "discharge"}}
	runs := []*Result{{Invalid: true, Findings: []rules.Finding{{Rule: "solver", Severity: policies.Error, Range: at(1), Message: "too many points"}}}}
	r := combine(nominal, cases, runs, policies.Warning, false)
	require.Len(t, r.Findings, 2)
	assert.Equal(t, "solver", r.Findings[0].Rule, "sorted by position: the units line first")
	assert.Contains(t, r.Findings[0].Message, "sensitivity case discharge +10 % could not be solved")
	assert.Equal(t, policies.Info, r.Findings[0].Severity)
	require.NotNil(t, r.Findings[1].Envelope)
	assert.Equal(t, rules.RobustFail, r.Findings[1].Envelope.Verdict)
}
