package model

// Hardening tests: a model is untrusted input (a submittal). These tests
// check that decoding evaluates no function and no variable, that a model
// cannot name the policy it is checked against, and that every size limit
// ends in one clear, positioned diagnostic. Big inputs are generated here,
// not stored in testdata.

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// hardModel is a small valid model (oneReach of decode_test.go); %s stands for the value of the
// section's `lining` attribute, so that an expression can be substituted
// at a known place (line 7, column 16).
var hardModel = oneReach(`section "s" {
  shape        = "rectangle"
  bottom_width = 2
  height       = 1
  roughness    = 0.014
  lining     = %s
}`)

// hardErrors parses src and returns its error diagnostics; it requires
// the model to be rejected.
func hardErrors(t *testing.T, src string) hcl.Diagnostics {
	t.Helper()
	m, diags := Parse("hard.chan.hcl", []byte(src))
	require.True(t, diags.HasErrors(), "the model must be rejected")
	require.Nil(t, m)
	var errs hcl.Diagnostics
	for _, d := range diags {
		require.NotNil(t, d.Subject, "diagnostic %q has no position", d.Summary)
		if d.Severity == hcl.DiagError {
			errs = append(errs, d)
		}
	}
	return errs
}

func TestHardeningValidBaseModel(t *testing.T) {
	m, diags := Parse("hard.chan.hcl", []byte(fmt.Sprintf(hardModel, `"concrete"`)))
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	require.NotNil(t, m)
	assert.Equal(t, "concrete", m.Sections[0].Lining)
}

// TestUntrustedExpressionsAreNotEvaluated writes a secret into a file and
// into the environment, then refers to both from a model in every way HCL
// offers: no diagnostic and no decoded value may contain the secret, and
// each construct gets its own diagnostic at the expression.
func TestUntrustedExpressionsAreNotEvaluated(t *testing.T) {
	// Source: common practice (no published source): an untrusted input
	// language must not read files or the environment.
	const secret = "s3cr3t-hardening-canary"
	dir := t.TempDir()
	secretFile := filepath.ToSlash(filepath.Join(dir, "secret.txt"))
	require.NoError(t, os.WriteFile(secretFile, []byte(secret), 0o600))
	t.Setenv("CHANLINT_HARDENING_CANARY", secret)

	cases := []struct {
		name, expr, summary string
	}{
		{"file", fmt.Sprintf(`file(%q)`, secretFile), "Function calls not allowed"},
		{"templatefile", fmt.Sprintf(`templatefile(%q, {})`, secretFile), "Function calls not allowed"},
		{"env function", `env("CHANLINT_HARDENING_CANARY")`, "Function calls not allowed"},
		{"env variable", `env.CHANLINT_HARDENING_CANARY`, "Variables not allowed"},
		{"var template", `"${var.lining}"`, "Variables not allowed"},
		{"file in template", fmt.Sprintf(`"lined-${file(%q)}"`, secretFile), "Function calls not allowed"},
		{"bare variable", `var.lining`, "Variables not allowed"},
		{"path", `path.module`, "Variables not allowed"},
		{"for directive", `"%{ for x in ["a"] }${x}%{ endfor }"`, "Expression not allowed"},
		{"for expression", `[for x in ["a"] : x][0]`, "Expression not allowed"},
		{"conditional", `true ? "a" : "b"`, "Expression not allowed"},
		{"provider function", `provider::x::read("y")`, "Function calls not allowed"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			src := fmt.Sprintf(hardModel, c.expr)
			errs := hardErrors(t, src)
			require.NotEmpty(t, errs)
			var summaries []string
			for _, d := range errs {
				summaries = append(summaries, d.Summary)
				assert.NotContains(t, d.Summary+d.Detail, secret, "a diagnostic leaks the secret")
			}
			assert.Contains(t, summaries, c.summary)
			first := errs[0]
			// The expression starts at line 7, column 16 of hardModel.
			assert.Equal(t, 7, first.Subject.Start.Line, "%s", first.Summary)
			assert.GreaterOrEqual(t, first.Subject.Start.Column, 16)
		})
	}
}

// TestModelCannotNamePolicy: the policy belongs to the reviewer, so a
// model that tries to choose or weaken its policy gets an unknown-argument
// (or unknown-block) diagnostic at the offending name.
func TestModelCannotNamePolicy(t *testing.T) {
	// Source: common practice (no published source): policy-format.md,
	// "a model cannot choose or weaken the policy it is checked against".
	valid := fmt.Sprintf(hardModel, `"concrete"`)
	cases := []struct {
		name, insert, summary string
		line                  int
	}{
		{"policy attribute", `policy = "lenient"`, "Unsupported argument", 2},
		{"policy block", "policy \"mine\" {\n  units = \"si\"\n}", "Unsupported block type", 2},
		{"extends attribute", `extends = "lenient"`, "Unsupported argument", 2},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			src := strings.Replace(valid, "units = \"si\"\n", "units = \"si\"\n"+c.insert+"\n", 1)
			errs := hardErrors(t, src)
			require.Len(t, errs, 1, "%s", errs.Error())
			assert.Equal(t, c.summary, errs[0].Summary)
			assert.Equal(t, c.line, errs[0].Subject.Start.Line)
			assert.Equal(t, 1, errs[0].Subject.Start.Column)
		})
	}
	t.Run("policy inside a reach", func(t *testing.T) {
		src := strings.Replace(valid, "  slope = 0.001\n", "  slope = 0.001\n  policy = \"lenient\"\n", 1)
		errs := hardErrors(t, src)
		require.Len(t, errs, 1, "%s", errs.Error())
		assert.Equal(t, "Unsupported argument", errs[0].Summary)
		assert.Equal(t, 15, errs[0].Subject.Start.Line)
	})
}

// padTo pads a valid model with comment lines to exactly n bytes.
func padTo(t *testing.T, src string, n int) []byte {
	t.Helper()
	require.Less(t, len(src), n)
	b := make([]byte, 0, n)
	b = append(b, src...)
	line := "# " + strings.Repeat("x", 77) + "\n" // 80 bytes
	for len(b)+len(line) <= n {
		b = append(b, line...)
	}
	for len(b) < n-1 {
		b = append(b, '#')
	}
	if len(b) < n {
		b = append(b, '\n')
	}
	require.Len(t, b, n)
	return b
}

func TestFileSizeLimit(t *testing.T) {
	valid := fmt.Sprintf(hardModel, `"concrete"`)

	t.Run("at the limit", func(t *testing.T) {
		m, diags := Parse("big.chan.hcl", padTo(t, valid, MaxFileSize))
		require.False(t, diags.HasErrors(), "%s", diags.Error())
		require.NotNil(t, m)
	})
	t.Run("one byte over in Parse", func(t *testing.T) {
		m, diags := Parse("big.chan.hcl", padTo(t, valid, MaxFileSize+1))
		require.Nil(t, m)
		require.Len(t, diags, 1)
		assert.Equal(t, "Model file too large", diags[0].Summary)
		assert.Equal(t, "big.chan.hcl", diags[0].Subject.Filename)
		assert.Equal(t, 1, diags[0].Subject.Start.Line)
	})
	t.Run("on disk through Load", func(t *testing.T) {
		path := filepath.Join(t.TempDir(), "big.chan.hcl")
		require.NoError(t, os.WriteFile(path, padTo(t, valid, 3*MaxFileSize), 0o600))
		m, diags := Load(path)
		require.Nil(t, m)
		require.Len(t, diags, 1)
		assert.Equal(t, "Model file too large", diags[0].Summary)
		assert.Contains(t, diags[0].Detail, "4 MiB")
	})
	t.Run("endless device", func(t *testing.T) {
		// /dev/zero never ends: it is refused as a device, unread.
		if _, err := os.Stat("/dev/zero"); err != nil {
			t.Skip("no /dev/zero on this system")
		}
		m, diags := Load("/dev/zero")
		require.Nil(t, m)
		require.True(t, diags.HasErrors())
		assert.Equal(t, "Cannot read model", diags[0].Summary)
		assert.Contains(t, diags[0].Detail, "is a device")
	})
}

func TestTooManyReaches(t *testing.T) {
	var b strings.Builder
	b.WriteString("units = \"si\"\nsection \"s\" {\n  shape = \"rectangle\"\n  bottom_width = 2\n  height = 1\n  roughness = 0.014\n}\n")
	header := strings.Count(b.String(), "\n")
	for i := range MaxReaches + 3 {
		fmt.Fprintf(&b, "reach \"r%d\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = 10\n  section = \"s\"\n  slope = 0.001\n}\n", i, i+1, i)
	}
	b.WriteString("event \"e\" {\n  inflow = { r0 = 1 }\n  outlet = { depth = 1 }\n}\n")
	errs := hardErrors(t, b.String())
	require.Len(t, errs, 1, "%s", errs.Error())
	assert.Equal(t, "Too many blocks", errs[0].Summary)
	assert.Contains(t, errs[0].Detail, fmt.Sprintf("at most %d reach blocks", MaxReaches))
	// Each reach block is 7 lines; the first one beyond the limit is named.
	assert.Equal(t, header+1+7*MaxReaches, errs[0].Subject.Start.Line)
}

func TestTooManySegments(t *testing.T) {
	var segs strings.Builder
	for i := range MaxSegments + 1 {
		fmt.Fprintf(&segs, "  segment {\n    from_station = %d\n    to_station = %d.5\n    section = \"s\"\n  }\n", i, i)
	}
	src := strings.Replace(fmt.Sprintf(hardModel, `"concrete"`), "  length = 100\n", fmt.Sprintf("  length = %d\n", MaxSegments+10), 1)
	src = strings.Replace(src, "  slope = 0.001\n", "  slope = 0.001\n"+segs.String(), 1)
	errs := hardErrors(t, src)
	require.Len(t, errs, 1, "%s", errs.Error())
	assert.Equal(t, "Too many segments", errs[0].Summary)
	assert.Equal(t, 15+5*MaxSegments, errs[0].Subject.Start.Line, "the first segment beyond the limit")
}

func TestNestingLimit(t *testing.T) {
	t.Run("just beyond", func(t *testing.T) {
		expr := strings.Repeat("[", MaxNesting) + "1" + strings.Repeat("]", MaxNesting)
		errs := hardErrors(t, fmt.Sprintf(hardModel, expr))
		require.Len(t, errs, 1)
		assert.Equal(t, "Too deeply nested", errs[0].Summary)
		assert.Equal(t, 7, errs[0].Subject.Start.Line)
		// Section block brace (1) plus MaxNesting−1 brackets reach the
		// limit; the next bracket is the one reported.
		assert.Equal(t, 16+MaxNesting-1, errs[0].Subject.Start.Column)
	})
	t.Run("a file of open brackets", func(t *testing.T) {
		src := "units = \"si\"\nx = " + strings.Repeat("[", MaxFileSize-20)
		errs := hardErrors(t, src)
		require.Len(t, errs, 1)
		assert.Equal(t, "Too deeply nested", errs[0].Summary)
	})
	t.Run("brackets in strings and comments do not count", func(t *testing.T) {
		deep := strings.Repeat("[", 2*MaxNesting)
		src := fmt.Sprintf(hardModel, fmt.Sprintf("%q # %s", deep, deep)) + "/* " + deep + " */\n// " + deep + "\n"
		m, diags := Parse("hard.chan.hcl", []byte(src))
		require.False(t, diags.HasErrors(), "%s", diags.Error())
		assert.Equal(t, deep, m.Sections[0].Lining)
	})
}

// TestHostileNamesAreBounded: a very long name or thousands of unknown
// references decode in bounded work and still point at each problem.
func TestHostileNamesAreBounded(t *testing.T) {
	long := strings.Repeat("n", 1<<20)
	src := strings.Replace(fmt.Sprintf(hardModel, `"concrete"`), `section = "s"`, fmt.Sprintf("section = %q", long), 1)
	errs := hardErrors(t, src)
	require.Len(t, errs, 1, "%s", errs.Error())
	assert.Equal(t, 13, errs[0].Subject.Start.Line)
}
