package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// hostileNamesModel is the overtop model with a reach and an event whose
// names carry a bidi override, an isolate and a non-character, and a
// broken line whose text holds an ESC sequence that would clear a
// terminal.
func hostileNamesModel(reach, event string) string {
	src, _ := os.ReadFile(filepath.Join("testdata", "models", "overtop.chan.hcl"))
	s := strings.ReplaceAll(string(src), `"lane"`, `"`+reach+`"`)
	return strings.ReplaceAll(s, `"q25"`, `"`+event+`"`)
}

// Untrusted names reach the text output only as visible escapes; the other
// files of the run are reported as before.
func TestTextOutputNeutralisesUntrustedText(t *testing.T) {
	repo, _ := hostileTree(t)
	// HCL escapes write the hostile runes into the names.
	model := hostileNamesModel(`lane\u202Eevil\u2066`, `q25\uFDD0`)
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "names.chan.hcl"), []byte(model), 0o644))
	// A broken file whose source line (shown in the snippet) holds ESC
	// sequences, a CR that would rewrite the line and a C1 CSI.
	broken := "units = \"si\"\nwidth = 1 # \x1b[2J\x1b]0;owned\x07\rall clear \u009b31m\u202e\n"
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "esc.chan.hcl"), []byte(broken), 0o644))

	code, out, errOut := runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	all := out + errOut
	for _, bad := range []string{"\x1b", "\r", "\u009b", "\u202e", "\u2066", "\ufdd0", "\x07"} {
		assert.NotContains(t, all, bad, "raw %q in the output", bad)
	}
	assert.Contains(t, out, `lane\u202Eevil\u2066`)
	assert.Contains(t, out, `q25\uFDD0`)
	assert.Contains(t, out, `\x1b[2J`)
	assert.Contains(t, out, `\rall clear \u009B31m`)
	assert.Contains(t, out, "models/overtop.chan.hcl:", "the other files are still reported")
}

// CSV cells that a spreadsheet would run as formulas are neutralised, and
// a very long name is shortened in the solve table so that its values stay
// on screen.
func TestSolveOutputsNeutraliseNames(t *testing.T) {
	dir := t.TempDir()
	long := strings.Repeat("very-long-reach-name-", 20)
	model := hostileNamesModel(`=HYPERLINK(\"http://evil\")`, `@SUM(A1)`)
	require.NoError(t, os.WriteFile(filepath.Join(dir, "f.chan.hcl"), []byte(model), 0o644))
	code, out, _ := runIn(dir, runOpts{}, "solve", "--format", "csv", "f.chan.hcl")
	assert.Equal(t, exitOK, code)
	assert.Contains(t, out, "\n'@SUM(A1),\"'=HYPERLINK(\"\"http://evil\"\")\",")
	assert.NotContains(t, out, "\n@SUM")

	require.NoError(t, os.WriteFile(filepath.Join(dir, "g.chan.hcl"), []byte(hostileNamesModel(long+`\u202e`, "q25")), 0o644))
	code, out, _ = runIn(dir, runOpts{}, "solve", "g.chan.hcl")
	assert.Equal(t, exitOK, code)
	assert.NotContains(t, out, long, "shortened")
	assert.Contains(t, out, `  reach very-long-reach-nam…ng-reach-name-\u202E: Q =`)
	assert.NotContains(t, out, "\u202e")
}
