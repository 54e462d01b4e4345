package policies_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/require"
)

// writeTree writes files (path relative to a new temporary directory →
// content) and returns the directory with symbolic links resolved.
func writeTree(t *testing.T, files map[string]string) string {
	t.Helper()
	dir, err := filepath.EvalSymlinks(t.TempDir())
	require.NoError(t, err)
	for name, src := range files {
		p := filepath.Join(dir, filepath.FromSlash(name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, []byte(src), 0o644))
	}
	return dir
}

// loadSource loads one policy text as root/p.policy.hcl.
func loadSource(t *testing.T, src string) (*policies.Policy, hcl.Diagnostics, string) {
	t.Helper()
	dir := writeTree(t, map[string]string{"p.policy.hcl": src})
	path := filepath.Join(dir, "p.policy.hcl")
	p, diags := rules.Language().NewLoader(dir).Load(path)
	return p, diags, path
}

// span returns the range of the first occurrence of sub in src, counting
// lines and columns from 1 as HCL does (ASCII sources only).
func span(t *testing.T, src, sub string) (start, end hcl.Pos) {
	t.Helper()
	return spanN(t, src, sub, 0)
}

// spanN is span for the occurrence nth (from 0) of sub.
func spanN(t *testing.T, src, sub string, nth int) (start, end hcl.Pos) {
	t.Helper()
	i := -1
	for k := 0; k <= nth; k++ {
		j := strings.Index(src[i+1:], sub)
		require.GreaterOrEqual(t, j, 0, "marker %q (occurrence %d) not in source", sub, nth)
		i += 1 + j
	}
	pos := func(off int) hcl.Pos {
		line := 1 + strings.Count(src[:off], "\n")
		col := off - strings.LastIndex(src[:off], "\n")
		return hcl.Pos{Line: line, Column: col, Byte: off}
	}
	return pos(i), pos(i + len(sub))
}

// errorsOnly keeps the error diagnostics.
func errorsOnly(diags hcl.Diagnostics) hcl.Diagnostics {
	var out hcl.Diagnostics
	for _, d := range diags {
		if d.Severity == hcl.DiagError {
			out = append(out, d)
		}
	}
	return out
}
