package rules

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	wantpkg "github.com/chanlint/chanlint/model/want"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

const goldenDir = "../testdata/rules"

// want is one expected finding of a golden model, written as
// "# want[:LABEL] RULE EVENT FROM..TO [excepted] ["REGEXP" ...]" (see
// model/want) above the header of the responsible block. EVENT "-"
// means no event; FROM..TO may be "toe..end" (the jump's span, checked
// separately), "~..~" (a located span, checked separately against an
// independent computation) or "-..-" (no span); each REGEXP must match the message.
type want = wantpkg.Want

func parseWants(t *testing.T, src []byte) []want {
	t.Helper()
	ws, err := wantpkg.Parse(src)
	require.NoError(t, err)
	for _, w := range ws {
		require.True(t, w.HasSpan(), "line %d: a rules golden names EVENT and FROM..TO", w.CommentLine)
	}
	return ws
}

// golden loads a model and a policy from testdata and checks it.
func golden(t testing.TB, modelFile, policyFile string) (*model.Model, *solver.Result, []Finding) {
	m, diags := model.Load(filepath.Join(goldenDir, modelFile))
	require.False(t, diags.HasErrors(), "%s: %v", modelFile, diags)
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	p, pd := Language().NewLoader("..").Load(filepath.Join(goldenDir, policyFile))
	require.False(t, pd.HasErrors(), "%s: %v", policyFile, pd)
	return m, res, Check(m, res, p)
}

func stationOf(s string) float64 {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return math.NaN()
	}
	return v
}

// matchWants fails on every expected finding that is missing and every
// finding that is not expected, comparing line, rule, event, span (to a
// part in 10⁹ of the reach length) and the excepted flag.
func matchWants(t *testing.T, src []byte, label string, fs []Finding) map[*want]Finding {
	t.Helper()
	ws := parseWants(t, src)
	got := map[*want]Finding{}
	used := make([]bool, len(fs))
	for i := range ws {
		w := &ws[i]
		if w.Label != "" && w.Label != label {
			continue
		}
		found := false
		for j, f := range fs {
			ev := f.Event
			if ev == "" {
				ev = "-"
			}
			if used[j] || f.Range.Start.Line != w.Line || f.Rule != w.Rule || ev != w.Event || f.Excepted != w.Excepted || !w.Matches(f.Message) {
				continue
			}
			switch {
			case w.From == "toe" || w.From == "~":
			case w.From == "-":
				if f.HasSpan {
					continue
				}
			case !f.HasSpan || !(scalar.EqualWithinAbsOrRel(f.FromStation, stationOf(w.From), 1e-9, 1e-9) &&
				scalar.EqualWithinAbsOrRel(f.ToStation, stationOf(w.To), 1e-9, 1e-9)):
				continue
			}
			used[j], found = true, true
			got[w] = f
			break
		}
		assert.True(t, found, "missing finding: %s", w)
	}
	for j, f := range fs {
		if !used[j] {
			t.Errorf("unexpected finding at line %d: %s %s %s %g..%g excepted=%v: %s",
				f.Range.Start.Line, f.Rule, f.Reach, f.Event, f.FromStation, f.ToStation, f.Excepted, f.Message)
		}
	}
	return got
}

func assertFinite(t *testing.T, fs []Finding) {
	t.Helper()
	for _, f := range fs {
		require.True(t, numfmt.Finite(f.FromStation, f.ToStation, f.Value, f.Limit), "%+v", f)
		for _, bad := range []string{"NaN", "Inf", "n/a"} {
			assert.NotContains(t, f.Message, bad)
		}
	}
}

// uniformUnits are the constants of a unit system, written here from their
// definitions rather than taken from the model package.
type uniformUnits struct {
	g, k, gamma float64 // gravity, Manning's constant, unit weight of water
	length      float64 // model length unit in metres
	stress      float64 // model stress unit in N/m²
}

var (
	// Source: standard gravity 9.80665 m/s² (CGPM 1901); Manning k = 1
	// (SI); γ = 1000 kg/m³ × g (common practice).
	siUnits = uniformUnits{g: 9.80665, k: 1, gamma: 9806.65, length: 1, stress: 1}
	// Source: g = 32.174 ft/s², k = 1.486 (3.2808^(1/3)) (common practice);
	// γ = 9806.65 N/m³ in lb/ft³ = 62.428; 1 ft = 0.3048 m and
	// 1 lbf = 4.4482216152605 N exactly (NIST SP 811), so
	// 1 lbf/ft² = 47.880259 N/m².
	usUnits = uniformUnits{g: 32.174, k: 1.486, gamma: 9806.65 * 0.3048 * 0.09290304 / 4.4482216152605, length: 0.3048, stress: 4.4482216152605 / 0.09290304}
)

// manningNormalDepth solves Q = (k/n)·A·R^(2/3)·√S for a rectangle of
// width b by bisection: the test's own iteration, independent of the
// solver's NormalDepth. Source: Manning's equation (Chow 1959, ch. 5).
func manningNormalDepth(u uniformUnits, q, b, n, s float64) float64 {
	lo, hi := 0.0, 1000.0
	for range 200 {
		y := (lo + hi) / 2
		a, p := b*y, b+2*y
		if u.k/n*a*math.Pow(a/p, 2.0/3)*math.Sqrt(s) > q {
			hi = y
		} else {
			lo = y
		}
	}
	return (lo + hi) / 2
}

// uniformExpect is the value and limit every rule must report on the
// uniform-flow model (rectangle b, height h, slope s, n; bend radius rc),
// computed from the normal depth by the formulas the rules document, with
// the golden policy's criteria converted to the model's units. inBend: the
// finding's span lies in the bend (800–1000 m).
func uniformExpect(u uniformUnits, rule string, q float64, inBend bool) (value, limit float64) {
	L := 1 / u.length // metres → model length
	b, h, n, s, rc := 3.0*L, 1.45*L, 0.015, 0.001, 12.0*L
	y := manningNormalDepth(u, q, b, n, s)
	v := q / (b * y)
	switch rule {
	case "freeboard":
		// Source: common practice (no published source): available =
		// height − depth; required = max(minimum, fraction·depth).
		return h - y, max(0.3*L, 0.2*y)
	case "max_velocity":
		return v, 1.5 * L
	case "min_velocity":
		return v, 0.6 * L
	case "froude_band":
		// Source: Froude number of a rectangle F = V/√(g·y) (Chow 1959, ch. 3).
		f := v / math.Sqrt(u.g*y)
		edge := 0.44
		if 0.5-f < f-0.44 {
			edge = 0.5
		}
		return f, edge
	case "shear_stress":
		// Source: Kilgore and Cotton, FHWA HEC-15, 3rd ed. (2005), eq. 2.3
		// and 3.8 (from memory): τd = γ·d·S on the bed, in uniform flow
		// with S = S0, times Kb = 2.38 − 0.206·(rc/T) + 0.0073·(rc/T)² in
		// the bend (rc/T = 4 here), whose span is its own.
		kb := 1.0
		if inBend {
			x := rc / b
			kb = 2.38 - 0.206*x + 0.0073*x*x
		}
		return kb * u.gamma * y * s, 6.0 / u.stress
	case "superelevation":
		// Source: Δy = C·V²·T/(g·rc), C = 0.5 subcritical, USACE EM
		// 1110-2-1601 (from memory).
		return h - y - 0.5*v*v*b/(u.g*rc), 0.3 * L
	case "capacity":
		return y, h
	}
	panic("no expectation for " + rule)
}

var uniformFlows = map[string]float64{"q-low": 0.25, "q-design": 6.0, "q-flood": 14.0} // m³/s

func checkUniform(t *testing.T, u uniformUnits, got map[*want]Finding) {
	t.Helper()
	for w, f := range got {
		if w.Rule == unusedExceptionID || w.Rule == unmatchedSelectorID {
			continue
		}
		q := uniformFlows[w.Event] / math.Pow(u.length, 3)
		bendFrom := 800 / u.length
		inBend := f.HasSpan && f.FromStation >= bendFrom*(1-1e-9) && f.ToStation <= 1000/u.length*(1+1e-9)
		value, limit := uniformExpect(u, w.Rule, q, inBend)
		// Tolerance: every point of uniform flow sits at the normal depth,
		// which a bracketed root finder closes to far below a micrometre;
		// 1e-6 (absolute in model units, or relative) leaves room for that
		// closure and nothing else. A misplaced formula or a wrong unit
		// constant is off by orders of magnitude more.
		const tolAbs, tolRel = 1e-6, 1e-6
		assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, value, tolAbs, tolRel),
			"%s %s value %.6g, want %.6g", w.Rule, w.Event, f.Value, value)
		if os.Getenv("GOLDEN_DEBUG") != "" {
			t.Logf("%s %s value %.9g want %.9g (diff %.2g)", w.Rule, w.Event, f.Value, value, f.Value-value)
		}
		limAbs, limRel := 1e-9, 1e-9
		if w.Rule == "freeboard" { // fraction·depth may govern
			limAbs, limRel = tolAbs, tolRel
		}
		assert.True(t, scalar.EqualWithinAbsOrRel(f.Limit, limit, limAbs, limRel),
			"%s %s limit %.9g, want %.9g", w.Rule, w.Event, f.Limit, limit)
	}
}

func TestGoldenUniform(t *testing.T) {
	for _, tc := range []struct {
		model, policy string
		u             uniformUnits
	}{
		{"uniform.chan.hcl", "golden.policy.hcl", siUnits},
		{"uniform.chan.hcl", "golden-us.policy.hcl", siUnits},
		{"uniform-us.chan.hcl", "golden-us.policy.hcl", usUnits},
		{"uniform-us.chan.hcl", "golden.policy.hcl", usUnits},
	} {
		t.Run(tc.model+"+"+tc.policy, func(t *testing.T) {
			m, _, fs := golden(t, tc.model, tc.policy)
			assertFinite(t, fs)
			got := matchWants(t, m.Source, "", fs)
			checkUniform(t, tc.u, got)
		})
	}
}

// TestGoldenPolicyUnits: criteria written in US units check an SI model as
// the same criteria in SI do, and the reverse: identical findings, values
// to rounding.
func TestGoldenPolicyUnits(t *testing.T) {
	for _, file := range []string{"uniform.chan.hcl", "uniform-us.chan.hcl", "jump-escapes.chan.hcl"} {
		_, _, a := golden(t, file, "golden.policy.hcl")
		_, _, b := golden(t, file, "golden-us.policy.hcl")
		require.Equal(t, len(a), len(b), file)
		require.NotEmpty(t, a)
		for i := range a {
			assert.Equal(t, a[i].Rule, b[i].Rule)
			assert.Equal(t, a[i].Range, b[i].Range)
			assert.Equal(t, a[i].Event, b[i].Event)
			assert.Equal(t, a[i].FromStation, b[i].FromStation)
			assert.Equal(t, a[i].ToStation, b[i].ToStation)
			assert.True(t, scalar.EqualWithinAbsOrRel(a[i].Value, b[i].Value, 1e-12, 1e-12))
			assert.True(t, scalar.EqualWithinAbsOrRel(a[i].Limit, b[i].Limit, 1e-12, 1e-9))
			if a[i].Rule != unmatchedSelectorID { // it names the policy file
				assert.Equal(t, a[i].Message, b[i].Message)
			}
		}
	}
}

// TestGoldenModelUnits: the same channel written in feet gives the SI
// model's findings with every value converted. Tolerance 0.1 %: US
// Manning's k = 1.486 is rounded (1.48592 exactly).
func TestGoldenModelUnits(t *testing.T) {
	_, _, si := golden(t, "uniform.chan.hcl", "golden.policy.hcl")
	_, _, us := golden(t, "uniform-us.chan.hcl", "golden.policy.hcl")
	require.Equal(t, len(si), len(us))
	for i := range si {
		assert.Equal(t, si[i].Rule, us[i].Rule)
		assert.Equal(t, si[i].Event, us[i].Event)
		scale := 0.3048
		switch si[i].Rule {
		case "froude_band":
			scale = 1
		case "shear_stress":
			scale = usUnits.stress
		}
		assert.True(t, scalar.EqualWithinAbsOrRel(si[i].Value, us[i].Value*scale, 1e-9, 1e-3),
			"%s %s: %g vs %g", si[i].Rule, si[i].Event, si[i].Value, us[i].Value*scale)
		assert.True(t, scalar.EqualWithinAbsOrRel(si[i].ToStation, us[i].ToStation*0.3048, 1e-9, 1e-9))
	}
}

func TestGoldenExceptions(t *testing.T) {
	src, err := os.ReadFile(filepath.Join(goldenDir, "exceptions.chan.hcl"))
	require.NoError(t, err)
	for _, tc := range []struct{ policy, label string }{
		{"golden.policy.hcl", "report"},
		{"golden-deny.policy.hcl", "deny"},
	} {
		t.Run(tc.label, func(t *testing.T) {
			_, _, fs := golden(t, "exceptions.chan.hcl", tc.policy)
			assertFinite(t, fs)
			got := matchWants(t, src, tc.label, fs)
			checkUniform(t, siUnits, got)
			for w, f := range got {
				if w.Rule != unusedExceptionID {
					continue
				}
				if tc.label == "deny" {
					assert.Equal(t, policies.Info, f.Severity)
					assert.Contains(t, f.Message, "was not applied")
				} else {
					assert.Equal(t, policies.Warning, f.Severity)
					assert.Contains(t, f.Message, "covers no finding")
				}
			}
			if tc.label == "report" {
				i := slices.IndexFunc(fs, func(f Finding) bool { return f.Rule == "freeboard" })
				require.GreaterOrEqual(t, i, 0)
				assert.Equal(t, "Bank raised by a parapet wall under a separate contract; reviewed", fs[i].ExceptionReason)
				exLine := 1 + bytes.Count(src[:bytes.Index(src, []byte(`exception "freeboard"`))], []byte("\n"))
				assert.Equal(t, exLine, fs[i].ExceptionRange.Start.Line)
			}
		})
	}
}

// jumpExpect integrates the M3 curve below the gate with a fourth-order
// Runge–Kutta march of dy/dx = (S0 − Sf)/(1 − F²) (the test's own
// integration, independent of the solver's standard step) until the depth
// reaches the Belanger sequent of the normal depth downstream, where the
// jump's toe lies. It returns the toe station, F1 and y2.
// Source: gradually varied flow equation (Chow 1959, ch. 9); Belanger
// y1/y2 = ½(√(1+8F2²) − 1) (Chow 1959, ch. 15); Manning's equation.
func jumpExpect() (toe, f1, y2 float64) {
	const opening, cc = 0.43, 0.61
	return jumpExpectFrom(cc*opening, 0)
}

// jumpExpectFrom is jumpExpect for the jet starting at depth y0 at station
// x0 in the same channel (rectangle 2.5 m, n 0.014, S0 0.0007, 4 m³/s).
func jumpExpectFrom(y0, x0 float64) (toe, f1, y2 float64) {
	const g, b, n, s, q = 9.80665, 2.5, 0.014, 0.0007, 4.0
	y2 = manningNormalDepth(siUnits, q, b, n, s)
	f2 := q / (b * y2) / math.Sqrt(g*y2)
	ys := y2 * 0.5 * (math.Sqrt(1+8*f2*f2) - 1)
	f1 = q / (b * ys) / math.Sqrt(g*ys)
	dydx := func(y float64) float64 {
		a, r := b*y, b*y/(b+2*y)
		v := q / a
		sf := n * n * v * v / math.Pow(r, 4.0/3)
		return (s - sf) / (1 - v*v/(g*y))
	}
	y, x, h := y0, x0, 1e-3
	for range 1_000_000 {
		k1 := dydx(y)
		k2 := dydx(y + h/2*k1)
		k3 := dydx(y + h/2*k2)
		k4 := dydx(y + h*k3)
		next := y + h/6*(k1+2*k2+2*k3+k4)
		if next >= ys {
			return x + h*(ys-y)/(next-y), f1, y2
		}
		y, x = next, x+h
	}
	panic("M3 curve did not reach the sequent depth")
}

func TestGoldenJumps(t *testing.T) {
	toe, f1, y2 := jumpExpect()
	for _, tc := range []struct {
		file     string
		basinEnd float64
	}{
		{"jump-contained.chan.hcl", 30},
		{"jump-escapes.chan.hcl", 12},
	} {
		t.Run(tc.file, func(t *testing.T) {
			m, _, fs := golden(t, tc.file, "jumps.policy.hcl")
			assertFinite(t, fs)
			got := matchWants(t, m.Source, "", fs)
			for w, f := range got {
				// The toe within 0.5 m of the independent M3 integration
				// (the solver's profile is accurate to 0.2 % of depth; at
				// the toe the curve rises 4 mm per metre).
				assert.InDelta(t, toe, f.FromStation, 0.5, "toe")
				// Source: Peterka, USBR Engineering Monograph 25 (1958): L/y2
				// runs from about 5 near F1 = 3 to about 6.1 for F1 > 4.5
				// (from memory).
				length := f.ToStation - f.FromStation
				assert.True(t, length >= 4.8*y2 && length <= 6.3*y2, "jump length %g = %g·y2", length, length/y2)
				switch w.Rule {
				case "jump_type":
					assert.InDelta(t, f1, f.Value, 0.01*f1, "F1")
					assert.Equal(t, 2.5, f.Limit)
					assert.Contains(t, f.Message, "oscillating")
				case "jump_containment":
					assert.InDelta(t, f.ToStation-tc.basinEnd, f.Value, 1e-9)
					assert.Contains(t, f.Message, "downstream may scour")
				}
			}
		})
	}
}

// TestGoldenDropJump: the jump below a straight drop is checked by the
// jump rules like any other; its toe lies where the M3 curve from Rand's
// toe depth, at Rand's drop length, reaches the sequent of the normal
// depth.
func TestGoldenDropJump(t *testing.T) {
	const g, q, b, h = 9.80665, 4.0, 2.5, 1.5
	// Source: Rand (1955), as given in Chow 1959 ch. 15 (from memory):
	// y1/h = 0.54·D^0.425, Ld/h = 4.30·D^0.27, D = q²/(g·h³).
	d := (q / b) * (q / b) / (g * h * h * h)
	toe, f1, _ := jumpExpectFrom(0.54*math.Pow(d, 0.425)*h, 4.30*math.Pow(d, 0.27)*h)
	m, _, fs := golden(t, "drop-basin.chan.hcl", "jumps.policy.hcl")
	assertFinite(t, fs)
	got := matchWants(t, m.Source, "", fs)
	require.Len(t, got, 2)
	for w, f := range got {
		assert.InDelta(t, toe, f.FromStation, 0.5, "toe")
		if w.Rule == "jump_type" {
			assert.InDelta(t, f1, f.Value, 0.01*f1, "F1")
		}
	}
}

func TestGoldenNoNaNOnDemo(t *testing.T) {
	m, diags := model.Load("../testdata/demo/kestrel-ridge.chan.hcl")
	require.False(t, diags.HasErrors(), fmt.Sprint(diags))
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	p, pd := Language().Pack("baseline")
	require.False(t, pd.HasErrors())
	fs := Check(m, res, p)
	assertFinite(t, fs)
	assert.True(t, slices.IsSortedFunc(fs, func(a, b Finding) int {
		return cmpFindings(a, b)
	}))
}

func TestGoldenAlwaysOn(t *testing.T) {
	m, _, fs := golden(t, "notes.chan.hcl", "jumps.policy.hcl")
	assertFinite(t, fs)
	got := matchWants(t, m.Source, "", fs)
	for w, f := range got {
		switch {
		case w.Rule == "solver":
			assert.Equal(t, policies.Warning, f.Severity)
			assert.Contains(t, f.Message, "boundary condition could not act as written")
		case w.Rule == "model" && f.Severity == policies.Warning:
			// Source: common practice (no published source): rc = 1.0 m is
			// less than half the 3.0 m top width of the rectangle.
			assert.Equal(t, 1.0, f.Value)
			assert.Equal(t, 1.5, f.Limit)
		case w.Rule == "model":
			assert.Equal(t, policies.Error, f.Severity)
			assert.Contains(t, f.Message, `did you mean "freeboard"?`)
		case w.Rule == unusedExceptionID:
			assert.Contains(t, f.Message, "no rule has that id")
		}
	}
}

func TestGoldenFromDiagnostics(t *testing.T) {
	path := filepath.Join(goldenDir, "invalid.chan.hcl")
	src, err := os.ReadFile(path)
	require.NoError(t, err)
	m, diags := model.Parse(path, src)
	require.Nil(t, m)
	require.True(t, diags.HasErrors())
	fs := FromDiagnostics(path, diags)
	assertFinite(t, fs)
	got := matchWants(t, src, "", fs)
	require.Len(t, got, 2)
	for _, f := range got {
		assert.Equal(t, policies.Error, f.Severity)
		assert.Equal(t, path, f.File())
	}
	assert.Contains(t, fs[0].Message, "bottom_width", "the section lacks its width")
	assert.Contains(t, fs[1].Message, "widht", "the misspelt attribute, at its own line")
	assert.Equal(t, 3, fs[1].Range.Start.Column, "at the attribute name")
}

func TestGoldenCulvertFull(t *testing.T) {
	m, _, fs := golden(t, "culvert.chan.hcl", "jumps.policy.hcl")
	assertFinite(t, fs)
	got := matchWants(t, m.Source, "", fs)
	for _, f := range got {
		// Source: common practice (no published source): with the outlet
		// depth 1.4 m above the 1.0 m crown the pipe is full at the outlet,
		// and the pressure grade only rises upstream of it.
		assert.Equal(t, 1.0, f.Limit)
		assert.GreaterOrEqual(t, f.Value, 1.4)
		assert.Contains(t, f.Message, "flows full")
		assert.Contains(t, f.Message, "above its crown")
	}
}

// TestGoldenSupercritical: uniform rapid flow in a chute; the bend takes
// C = 1.0 (Source: USACE EM 1110-2-1601, from memory).
func TestGoldenSupercritical(t *testing.T) {
	const g, b, h, n, s, q, rc = 9.80665, 2.0, 1.0, 0.013, 0.02, 5.0, 20.0
	m, _, fs := golden(t, "chute.chan.hcl", "golden.policy.hcl")
	y := manningNormalDepth(siUnits, q, b, n, s)
	require.InDelta(t, y, m.Events[0].Entrances[0].Depth, 1e-12, "the file enters at normal depth")
	v := q / (b * y)
	require.Greater(t, v/math.Sqrt(g*y), 1.0, "rapid flow")
	assertFinite(t, fs)
	got := matchWants(t, m.Source, "", fs)
	for w, f := range got {
		switch w.Rule {
		case "superelevation":
			assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, h-y-1.0*v*v*b/(g*rc), 1e-6, 1e-6), "remaining %g", f.Value)
			assert.Equal(t, 0.3, f.Limit)
			assert.Contains(t, f.Message, "C = 1,")
		case "max_velocity":
			assert.True(t, scalar.EqualWithinAbsOrRel(f.Value, v, 1e-6, 1e-6), "velocity %g", f.Value)
			assert.Equal(t, 3.0, f.Limit)
			assert.Contains(t, f.Message, `lining "concrete" (unlisted: the policy's default applied)`)
		}
	}
}
