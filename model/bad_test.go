package model

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/want"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var update = flag.Bool("update", false, "rewrite the golden files of testdata/bad")

// formatDiagnostics renders diagnostics one per line as
// FILE:LINE:COL: SEVERITY: SUMMARY; DETAIL with the file's base name.
func formatDiagnostics(diags hcl.Diagnostics) string {
	var b strings.Builder
	for _, d := range diags {
		sev := "error"
		if d.Severity == hcl.DiagWarning {
			sev = "warning"
		}
		file, line, col := "?", 0, 0
		if d.Subject != nil {
			file, line, col = filepath.Base(d.Subject.Filename), d.Subject.Start.Line, d.Subject.Start.Column
		}
		fmt.Fprintf(&b, "%s:%d:%d: %s: %s; %s\n", file, line, col, sev, d.Summary, d.Detail)
	}
	return b.String()
}

// TestBadModels checks every broken model of testdata/bad: it must fail
// with no model, every error must be expected by a `# want model "..."`
// comment of its line, every `# want` must be met, and the full diagnostics must equal
// the golden file (regenerate with go test ./model -update).
func TestBadModels(t *testing.T) {
	files, err := filepath.Glob("../testdata/bad/*" + Suffix)
	require.NoError(t, err)
	require.GreaterOrEqual(t, len(files), 30)
	for _, path := range files {
		name := strings.TrimSuffix(filepath.Base(path), Suffix)
		t.Run(name, func(t *testing.T) {
			src, err := os.ReadFile(path)
			require.NoError(t, err)
			m, diags := Parse(path, src)
			require.Nil(t, m)
			require.True(t, diags.HasErrors(), "no error reported")

			// Expectations: `# want model "REGEXP"` (see model/want) on
			// or above the line of each error, the pattern matching its
			// "Summary; Detail".
			wants, err := want.Parse(src)
			require.NoError(t, err)
			require.NotEmpty(t, wants, "the file has no # want comment")
			for _, p := range want.Diagnostics(wants, "model", diags) {
				t.Error(p)
			}

			got := formatDiagnostics(diags)
			golden := strings.TrimSuffix(path, Suffix) + ".golden"
			if *update {
				require.NoError(t, os.WriteFile(golden, []byte(got), 0o644))
			}
			want, err := os.ReadFile(golden)
			require.NoError(t, err, "missing golden file; run go test ./model -update")
			assert.Equal(t, string(want), got)
		})
	}
}
