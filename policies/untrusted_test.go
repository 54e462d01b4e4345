package policies_test

// A policy file may come from the repository under review (its
// .chanlint.hcl), so the policy language is treated as untrusted input like
// a model: no functions, no variables, bounded size and nesting.

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// untrustedPolicy has one value (the reference) replaced by %s, at line 3
// column 15.
const untrustedPolicy = `policy "p" {
  units     = "si"
  reference = %s
  jump_containment {}
}
`

// TestPolicyUntrustedExpressionsAreNotEvaluated writes a secret into a
// file and into the environment and refers to both from a policy: every
// construct is a diagnostic at the expression, and nothing leaks.
func TestPolicyUntrustedExpressionsAreNotEvaluated(t *testing.T) {
	// Source: common practice (no published source): an untrusted input
	// language must not read files or the environment.
	const secret = "s3cr3t-policy-canary"
	dir := writeTree(t, map[string]string{"secret.txt": secret})
	secretFile := filepath.ToSlash(filepath.Join(dir, "secret.txt"))
	t.Setenv("CHANLINT_POLICY_CANARY", secret)
	cases := []struct{ name, expr, summary string }{
		{"file", fmt.Sprintf("file(%q)", secretFile), "Function calls not allowed"},
		{"templatefile", fmt.Sprintf("templatefile(%q, {})", secretFile), "Function calls not allowed"},
		{"env function", `env("CHANLINT_POLICY_CANARY")`, "Function calls not allowed"},
		{"env variable", "env.CHANLINT_POLICY_CANARY", "Variables not allowed"},
		{"var template", `"${var.reference}"`, "Variables not allowed"},
		{"file in template", fmt.Sprintf(`"see ${file(%q)}"`, secretFile), "Function calls not allowed"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, diags, _ := loadSource(t, fmt.Sprintf(untrustedPolicy, c.expr))
			require.Nil(t, p, "the policy must be rejected")
			errs := errorsOnly(diags)
			require.NotEmpty(t, errs)
			for _, d := range diags {
				assert.NotContains(t, d.Summary+d.Detail, secret)
				require.NotNil(t, d.Subject)
			}
			if c.summary != "" {
				assert.Contains(t, diagSummaries(errs), c.summary)
			}
			assert.Equal(t, 3, errs[0].Subject.Start.Line)
			assert.GreaterOrEqual(t, errs[0].Subject.Start.Column, 15)
		})
	}
}

func TestPolicyFileSizeLimit(t *testing.T) {
	src := fmt.Sprintf(untrustedPolicy, `"ok"`)
	big := src + strings.Repeat("# "+strings.Repeat("x", 77)+"\n", policies.MaxFileSize/80+1)
	dir := writeTree(t, map[string]string{"big.policy.hcl": big, "fine.policy.hcl": src})
	_, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "fine.policy.hcl"))
	require.False(t, diags.HasErrors(), "%s", diags.Error())

	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "big.policy.hcl"))
	require.Nil(t, p)
	require.Len(t, diags, 1)
	assert.Equal(t, "Cannot read policy file", diags[0].Summary)
	assert.Contains(t, diags[0].Detail, "larger than the limit")

	// The same file reached through extends is refused at the extends value.
	child := "policy \"c\" {\n  units   = \"si\"\n  extends = \"big.policy.hcl\"\n}\n"
	require.NoError(t, os.WriteFile(filepath.Join(dir, "child.policy.hcl"), []byte(child), 0o644))
	p, diags = rules.Language().NewLoader(dir).Load(filepath.Join(dir, "child.policy.hcl"))
	require.Nil(t, p)
	require.Len(t, diags, 1)
	require.NotNil(t, diags[0].Subject)
	assert.Equal(t, 3, diags[0].Subject.Start.Line)
}

func TestPolicyNotARegularFile(t *testing.T) {
	if _, err := os.Stat("/dev/zero"); err != nil {
		t.Skip("no /dev/zero on this system")
	}
	p, diags := rules.Language().NewLoader("").Load("/dev/zero")
	require.Nil(t, p)
	require.True(t, diags.HasErrors())
	assert.Equal(t, "Cannot read policy file", diags[0].Summary)
}

// TestPolicyNestingIsBounded: a policy of many open brackets ends in a
// diagnostic. hclsyntax recurses once per bracket, and at about 100,000
// levels the Go stack limit is reached: the process dies with "fatal error:
// stack overflow", which no recover can catch, so without the bound one
// policy file could crash a whole check.
func TestPolicyNestingIsBounded(t *testing.T) {
	src := fmt.Sprintf(untrustedPolicy, strings.Repeat("[", 200_000))
	p, diags, _ := loadSource(t, src)
	require.Nil(t, p)
	require.True(t, diags.HasErrors())
	assert.Equal(t, 3, diags[0].Subject.Start.Line)
}

// TestPolicyTemplateLoopsAreRejected: template for-directives and for
// expressions over literal lists multiply: five nested loops over 40 items
// in a 618-byte reference string would build a 1 GB string (measured
// before they were rejected: 7 minutes and 8.3 GB of memory). They are a
// diagnostic at the template, as in a model.
func TestPolicyTemplateLoopsAreRejected(t *testing.T) {
	items := "[" + strings.TrimSuffix(strings.Repeat("1,", 40), ",") + "]"
	expr := "xxxxxxxxxx"
	for i := range 5 {
		expr = fmt.Sprintf("%%{ for x%d in %s }%s%%{ endfor }", i, items, expr)
	}
	p, diags, _ := loadSource(t, fmt.Sprintf(untrustedPolicy, `"`+expr+`"`))
	require.Nil(t, p)
	require.True(t, diags.HasErrors())
	assert.Equal(t, 3, diags[0].Subject.Start.Line)
}

// TestPolicyForExpressionRejected: a for expression is a diagnostic at the
// expression, not evaluated.
func TestPolicyForExpressionRejected(t *testing.T) {
	src := strings.Replace(fmt.Sprintf(untrustedPolicy, `"r"`), "jump_containment {}",
		"froude_band {\n    avoid = [for x in [1, 2] : [x, x]]\n  }", 1)
	p, diags, _ := loadSource(t, src)
	require.Nil(t, p)
	errs := errorsOnly(diags)
	require.Len(t, errs, 1, "%s", diags.Error())
	assert.Equal(t, 5, errs[0].Subject.Start.Line)
}

// TestPolicyDiagnosticsBounded: a policy with thousands of problems
// reports model.MaxDiagnostics of them and counts the rest in one last
// diagnostic, as a model does.
func TestPolicyDiagnosticsBounded(t *testing.T) {
	var b strings.Builder
	b.WriteString("policy \"x\" {\n  units = \"si\"\n")
	for i := range 3000 {
		fmt.Fprintf(&b, "  unknown_%d = 1\n", i)
	}
	b.WriteString("}\n")
	p, diags, _ := loadSource(t, b.String())
	require.Nil(t, p)
	require.Len(t, diags, model.MaxDiagnostics+1)
	last := diags[model.MaxDiagnostics]
	assert.Equal(t, "Too many problems", last.Summary)
	assert.Contains(t, last.Detail, "2000 more problems")
	assert.Equal(t, model.MaxDiagnostics+3, last.Subject.Start.Line, "at the first one left out")
}
