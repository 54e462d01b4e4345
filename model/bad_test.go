package model

import (
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var update = flag.Bool("update", false, "rewrite the golden files of testdata/bad")

// wantComment is an expectation written in a bad model: `# want "regexp"`
// on the line where an error must be reported, the regexp matching its
// summary.
var wantComment = regexp.MustCompile(`#\s*want\s+"([^"]*)"`)

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
// with no model, every error must sit on a line that carries a matching
// `# want`, every `# want` must be met, and the full diagnostics must equal
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

			wants := map[int][]*regexp.Regexp{}
			for i, line := range strings.Split(string(src), "\n") {
				for _, w := range wantComment.FindAllStringSubmatch(line, -1) {
					wants[i+1] = append(wants[i+1], regexp.MustCompile(w[1]))
				}
			}
			require.NotEmpty(t, wants, "the file has no # want comment")
			met := map[*regexp.Regexp]bool{}
			for _, d := range diags {
				require.NotNil(t, d.Subject, "%s has no position", d.Summary)
				if d.Severity != hcl.DiagError {
					continue
				}
				matched := false
				for _, re := range wants[d.Subject.Start.Line] {
					if re.MatchString(d.Summary) {
						met[re], matched = true, true
					}
				}
				assert.True(t, matched, "unexpected error at line %d: %s; %s", d.Subject.Start.Line, d.Summary, d.Detail)
			}
			for line, res := range wants {
				for _, re := range res {
					assert.True(t, met[re], "line %d: no error matching %q", line, re)
				}
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
