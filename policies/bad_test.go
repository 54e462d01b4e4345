package policies_test

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/want"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var update = flag.Bool("update", false, "rewrite the golden files of testdata/policies/bad")

const badDir = "../testdata/policies/bad"

// TestBadPolicies checks every broken policy of testdata/policies/bad (one
// mistake per file, NN-name.policy.hcl): it must give no policy, every
// error in it must be expected by a `# want policy "REGEXP" ...` comment of
// its line (see model/want; the patterns match "Summary; Detail"),
// every expectation must be met, and all its diagnostics, with their full
// ranges, must equal its .golden file (go test ./policies -update).
func TestBadPolicies(t *testing.T) {
	files, err := filepath.Glob(filepath.Join(badDir, "*.policy.hcl"))
	require.NoError(t, err)
	require.GreaterOrEqual(t, len(files), 40)
	for _, path := range files {
		name := strings.TrimSuffix(filepath.Base(path), ".policy.hcl")
		t.Run(name, func(t *testing.T) {
			src, err := os.ReadFile(path)
			require.NoError(t, err)
			p, diags := rules.Language().NewLoader(badDir).Load(path)
			assert.Nil(t, p, "no policy from a file with errors")
			require.True(t, diags.HasErrors(), "no error reported")

			wants, err := want.Parse(src)
			require.NoError(t, err)
			require.NotEmpty(t, wants, "the file has no # want comment")
			for _, p := range want.Diagnostics(wants, "policy", diags) {
				t.Error(p)
			}

			got := formatDiagnostics(diags)
			golden := strings.TrimSuffix(path, ".policy.hcl") + ".golden"
			if *update {
				require.NoError(t, os.WriteFile(golden, []byte(got), 0o644))
			}
			want, err := os.ReadFile(golden)
			require.NoError(t, err, "missing golden file; run go test ./policies -update")
			assert.Equal(t, string(want), got)
		})
	}
}

// formatDiagnostics renders diagnostics one per line as
// FILE:LINE:COL-LINE:COL: SEVERITY: SUMMARY; DETAIL with the file's base
// name.
func formatDiagnostics(diags hcl.Diagnostics) string {
	var b strings.Builder
	for _, d := range diags {
		sev := "error"
		if d.Severity == hcl.DiagWarning {
			sev = "warning"
		}
		where := "?"
		if r := d.Subject; r != nil {
			where = fmt.Sprintf("%s:%d:%d-%d:%d", filepath.Base(r.Filename), r.Start.Line, r.Start.Column, r.End.Line, r.End.Column)
		}
		fmt.Fprintf(&b, "%s: %s: %s; %s\n", where, sev, d.Summary, d.Detail)
	}
	return b.String()
}
