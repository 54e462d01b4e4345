package baseline

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// finding builds a finding at a line; the numbers are fixture values, not
// checks of any computation.
func finding(rule, reach, event string, from, to float64, line int, msg string) rules.Finding {
	return rules.Finding{
		Rule: rule, Severity: policies.Error, Message: msg,
		Range: hcl.Range{Filename: "models/alder.chan.hcl", Start: hcl.Pos{Line: line, Column: 1}, End: hcl.Pos{Line: line, Column: 9}},
		Reach: reach, Event: event, FromStation: from, ToStation: to, HasSpan: true,
		Value: 0.18, Limit: 0.30, HasValue: true,
	}
}

func sample() []rules.Finding {
	return []rules.Finding{
		finding("freeboard", "main", "q100", 120, 180, 12, "freeboard 0.18 m is below the required 0.30 m"),
		finding("max_velocity", "chute", "q100", 0, 45.25, 30, "velocity 6.2 m/s exceeds 4.5 m/s for riprap"),
		// Two identical findings (same key): need two entries.
		finding("froude_band", "main", "q10", 300, 380, 40, "Froude number 0.95 inside the avoided band 0.86–1.13"),
		finding("froude_band", "main", "q10", 300, 380, 40, "Froude number 0.95 inside the avoided band 0.86–1.13"),
		{Rule: "model", Severity: policies.Error, Message: "unknown section \"lined\"",
			Range: hcl.Range{Filename: "models/alder.chan.hcl", Start: hcl.Pos{Line: 3, Column: 5}}},
	}
}

func roundTrip(t *testing.T, fs []rules.Finding) *Baseline {
	t.Helper()
	var buf bytes.Buffer
	_, err := Write(&buf, fs)
	require.NoError(t, err)
	p := filepath.Join(t.TempDir(), "chanlint-baseline.json")
	require.NoError(t, os.WriteFile(p, buf.Bytes(), 0o644))
	b, err := Read(p)
	require.NoError(t, err)
	return b
}

// Filter splits findings into those the baseline does not hide (in their
// order) and the number it hides.
func (b *Baseline) Filter(findings []rules.Finding) (fresh []rules.Finding, known int) {
	ms, _ := b.Compare(findings)
	for i, m := range ms {
		if m.State.Known() {
			known++
			continue
		}
		fresh = append(fresh, findings[i])
	}
	return fresh, known
}

func TestRoundTripAllKnown(t *testing.T) {
	fs := sample()
	b := roundTrip(t, fs)
	fresh, known := b.Filter(fs)
	assert.Empty(t, fresh)
	assert.Equal(t, len(fs), known)
}

func TestShiftedLinesStillKnown(t *testing.T) {
	fs := sample()
	b := roundTrip(t, fs)
	shifted := sample()
	for i := range shifted {
		shifted[i].Range.Start.Line += 7
		shifted[i].Range.End.Line += 7
		shifted[i].Range.Start.Column += 2
	}
	fresh, known := b.Filter(shifted)
	assert.Empty(t, fresh)
	assert.Equal(t, len(fs), known)
}

func TestChangedValueInMessageStillKnown(t *testing.T) {
	b := roundTrip(t, sample())
	f := sample()[0]
	f.Message = "freeboard 0.17 m is below the required 0.30 m"
	f.Value = 0.17
	fresh, known := b.Filter([]rules.Finding{f})
	assert.Empty(t, fresh)
	assert.Equal(t, 1, known)
}

func TestNewViolationIsFresh(t *testing.T) {
	b := roundTrip(t, sample())
	fs := append(sample(), finding("jump_containment", "chute", "q100", 49.5, 55, 50, "jump not contained"))
	fresh, known := b.Filter(fs)
	require.Len(t, fresh, 1)
	assert.Equal(t, "jump_containment", fresh[0].Rule)
	assert.Equal(t, len(fs)-1, known)
}

func TestChangedSpanIsFresh(t *testing.T) {
	b := roundTrip(t, sample())
	fs := sample()
	fs[0].ToStation = 200 // the failing span 120–180 grew by 20, past max(2, 6)
	fresh, known := b.Filter(fs)
	require.Len(t, fresh, 1)
	assert.Equal(t, 200.0, fresh[0].ToStation)
	assert.Equal(t, len(fs)-1, known)
}

func TestSpanRoundingAbsorbsNoise(t *testing.T) {
	b := roundTrip(t, sample())
	fs := sample()
	fs[1].ToStation = 45.2500001 // re-solve noise far below 0.1
	fresh, _ := b.Filter(fs)
	assert.Empty(t, fresh)
}

// A small hydraulic change moves span ends a little and values a little:
// the findings stay known. 120–180 may move each end by max(2, 10 % of 60).
func TestSmallHydraulicChangeStaysKnown(t *testing.T) {
	b := roundTrip(t, sample())
	fs := sample()
	fs[0].FromStation, fs[0].ToStation = 114.5, 185.9
	fs[0].Value = 0.16 // shortfall 0.14, was 0.12: +17 %
	fs[1].ToStation = 46.9
	fresh, known := b.Filter(fs)
	assert.Empty(t, fresh)
	assert.Equal(t, len(fs), known)

	fs[0].FromStation = 113.9 // 6.1 away
	fresh, _ = b.Filter(fs)
	require.Len(t, fresh, 1)
}

// A shortfall grown by more than WorseShare makes the finding new, and
// its match says so; an escalation of severity is new too.
func TestMuchWorseAndEscalationAreNew(t *testing.T) {
	b := roundTrip(t, sample())
	fs := sample()[:1]
	fs[0].Value = 0.10 // shortfall 0.20 against 0.12 recorded: +67 %
	ms, stale := b.Compare(fs)
	assert.Equal(t, Worse, ms[0].State)
	require.NotNil(t, ms[0].Entry)
	was, ok := ms[0].Entry.Shortfall()
	require.True(t, ok)
	assert.InDelta(t, 0.12, was, 1e-9)
	assert.Len(t, stale, len(sample())-1, "the worse finding still uses its entry")

	fs = sample()[:1]
	fs[0].Severity = policies.Warning
	b = roundTrip(t, fs)
	fs[0].Severity = policies.Error
	fresh, known := b.Filter(fs)
	assert.Len(t, fresh, 1, "warning → error is new")
	assert.Zero(t, known)
}

// Excepted findings are not recorded, so removing the exception re-opens
// the finding; entries no finding matches are stale.
func TestExceptedNotRecordedAndStale(t *testing.T) {
	fs := sample()
	fs[0].Excepted = true
	var buf bytes.Buffer
	n, err := Write(&buf, fs)
	require.NoError(t, err)
	assert.Equal(t, len(fs)-1, n)
	b := roundTrip(t, fs)
	reopened := sample()
	fresh, _ := b.Filter(reopened)
	require.Len(t, fresh, 1)
	assert.Equal(t, "freeboard", fresh[0].Rule)

	ms, stale := b.Compare(sample()[1:2])
	assert.Equal(t, Unchanged, ms[0].State)
	assert.Len(t, stale, len(fs)-2)
	ms, _ = b.Compare(fs[:1])
	assert.Equal(t, Excepted, ms[0].State, "an excepted finding never takes an entry")
}

func TestMultiset(t *testing.T) {
	one := sample()[:3] // only one of the two identical froude_band findings
	b := roundTrip(t, one)
	fresh, known := b.Filter(sample())
	require.Len(t, fresh, 2, "the second identical finding and the model finding")
	assert.Equal(t, "froude_band", fresh[0].Rule)
	assert.Equal(t, "model", fresh[1].Rule)
	assert.Equal(t, 3, known)
	// Filter does not consume the baseline.
	_, again := b.Filter(sample())
	assert.Equal(t, 3, again)
}

func TestOtherReachEventOrFileIsFresh(t *testing.T) {
	b := roundTrip(t, sample())
	for _, mut := range []func(*rules.Finding){
		func(f *rules.Finding) { f.Reach = "west-ditch" },
		func(f *rules.Finding) { f.Event = "q10" },
		func(f *rules.Finding) { f.Rename("models/birch.chan.hcl") },
		func(f *rules.Finding) { f.Rule = "min_velocity" },
		func(f *rules.Finding) { f.Message = "water surface above the lining" },
	} {
		f := sample()[0]
		mut(&f)
		fresh, known := b.Filter([]rules.Finding{f})
		assert.Len(t, fresh, 1)
		assert.Zero(t, known)
	}
}

func TestPathSpellings(t *testing.T) {
	b := roundTrip(t, sample()[:1])
	f := sample()[0]
	f.Rename("./models/../models/alder.chan.hcl")
	_, known := b.Filter([]rules.Finding{f})
	assert.Equal(t, 1, known)
}

func TestWriteDeterministic(t *testing.T) {
	fs := sample()
	rev := make([]rules.Finding, len(fs))
	for i := range fs {
		rev[len(fs)-1-i] = fs[i]
	}
	var a, b bytes.Buffer
	_, err := Write(&a, fs)
	require.NoError(t, err)
	_, err = Write(&b, rev)
	require.NoError(t, err)
	assert.Equal(t, a.String(), b.String())
	assert.Contains(t, a.String(), `"version": 2`)
	assert.Contains(t, a.String(), `"severity": "error"`)
	assert.Contains(t, a.String(), `"line": 12`, "the line is kept as information")
}

func TestNormalizeMessage(t *testing.T) {
	// Source: common practice (no published source) — number-free message
	// identity, as the module's own contract defines it.
	assert.Equal(t, "freeboard # m is below #", normalizeMessage("Freeboard  0.18 m is below 1.2e-3"))
	assert.Equal(t, "v=# ft/s", normalizeMessage("V=1,250.5 ft/s"))
}

func TestRoundStation(t *testing.T) {
	// Source: common practice (no published source) — decimal rounding.
	assert.Equal(t, 45.3, RoundStation(45.25))
	assert.Equal(t, 0.3, RoundStation(0.1+0.2))
	assert.Equal(t, 0.0, RoundStation(-0.01))
	assert.False(t, RoundStation(-0.01) != 0 || 1/RoundStation(-0.01) < 0, "no negative zero")
}

func TestReadErrors(t *testing.T) {
	dir := t.TempDir()
	cases := map[string]string{
		"notjson":  "{",
		"version":  `{"version": 7, "entries": []}`,
		"old":      `{"version": 1, "entries": []}`,
		"norule":   `{"version": 2, "entries": [{"file": "a.chan.hcl", "fingerprint": "ab", "severity": "error"}]}`,
		"nosev":    `{"version": 2, "entries": [{"rule": "x", "file": "a.chan.hcl", "fingerprint": "ab"}]}`,
		"halfspan": `{"version": 2, "entries": [{"rule": "x", "file": "a.chan.hcl", "fingerprint": "ab", "severity": "error", "from_station": 1}]}`,
		"nofile":   "",
	}
	for name, body := range cases {
		p := filepath.Join(dir, name+".json")
		if name != "nofile" {
			require.NoError(t, os.WriteFile(p, []byte(body), 0o644))
		}
		_, err := Read(p)
		require.Error(t, err, name)
		assert.Contains(t, err.Error(), "baseline", name)
	}
}

// numberRE is the regular expression hashNumbers replaced: a decimal
// number with optional grouping and exponent.
var numberRE = regexp.MustCompile(`(?:\d+(?:[.,]\d+)*|\.\d+)(?:[eE][-+]?\d+)?`)

// TestHashNumbersMatchesRegexp: the scanner replaces exactly what the
// regular expression matches (leftmost-first, as Go's regexp does), so
// fingerprints of existing baselines and SARIF logs do not change.
//
// Source: common practice (no published source) — Go's regexp package as
// the reference matcher.
func TestHashNumbersMatchesRegexp(t *testing.T) {
	for _, s := range []string{"", "no numbers", "0.18 m below 0.30 m", "1,234.5e-3x", ".5.6", "1.", "1e", "1e+", "e5", "a1b22c",
		"v 3.2 m/s > 2.5", "..5", "1,,2", "F₁ 4.50–9.00", "x1.2.3,4e10", "9e-", "3E+7y"} {
		assert.Equal(t, numberRE.ReplaceAllString(s, "#"), hashNumbers(s), "%q", s)
	}
	rapid.Check(t, func(t *rapid.T) {
		s := rapid.StringOf(rapid.SampledFrom([]rune("0123456789.,eE+- a–"))).Draw(t, "s")
		if want, got := numberRE.ReplaceAllString(s, "#"), hashNumbers(s); got != want {
			t.Fatalf("hashNumbers(%q) = %q, want %q", s, got, want)
		}
	})
}

func BenchmarkMessageFingerprint(b *testing.B) {
	msg := "freeboard 0.18 m is below the required 0.30 m (0.2 × depth 0.9 m)"
	b.ReportAllocs()
	for b.Loop() {
		_ = MessageFingerprint(msg)
	}
}

// TestNormalizeMessageMatchesReference: the one-pass ASCII normalisation
// equals numbers → '#', strings.ToLower, strings.Fields joined by spaces.
//
// Source: common practice (no published source) — the standard library's
// case mapping and field splitting as the reference.
func TestNormalizeMessageMatchesReference(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := rapid.StringOf(rapid.SampledFrom([]rune("aZq09 .,e-\t\n\v\f\r\u00a0\u0085É–"))).Draw(t, "s")
		want := strings.Join(strings.Fields(strings.ToLower(numberRE.ReplaceAllString(s, "#"))), " ")
		if got := normalizeMessage(s); got != want {
			t.Fatalf("normalizeMessage(%q) = %q, want %q", s, got, want)
		}
	})
}
