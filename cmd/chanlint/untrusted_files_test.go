package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// hostileTree is a repository with one good model (overtop, which has
// findings) and room for hostile entries beside it; secret is a file
// outside the repository that no run may read or show.
func hostileTree(t *testing.T) (repo, secret string) {
	t.Helper()
	outside := t.TempDir()
	secret = filepath.Join(outside, "secret.chan.hcl")
	require.NoError(t, os.WriteFile(secret, []byte("units = \"si\"\n# TOP-SECRET reviewer notes\n"), 0o600))
	repo = t.TempDir()
	require.NoError(t, os.Mkdir(filepath.Join(repo, ".git"), 0o755))
	copyTree(t, filepath.Join("testdata", "models"), filepath.Join(repo, "models"))
	require.NoError(t, os.Remove(filepath.Join(repo, "models", "broken.chan.hcl")))
	return repo, secret
}

func fifo(t *testing.T, path string) {
	t.Helper()
	if err := syscall.Mkfifo(path, 0o600); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
}

// Explicit model paths (as a shell glob expands them): a link that leads
// outside the tree and a FIFO are refused, unread, and the good models are
// still checked and reported.
func TestExplicitModelPathsHostile(t *testing.T) {
	repo, secret := hostileTree(t)
	require.NoError(t, os.Symlink(secret, filepath.Join(repo, "models", "leak.chan.hcl")))
	fifo(t, filepath.Join(repo, "models", "pipe.chan.hcl"))
	code, out, errOut := runIn(repo, runOpts{}, "check", "--color", "never",
		"models/leak.chan.hcl", "models/pipe.chan.hcl", "models/overtop.chan.hcl", "models/clean.chan.hcl")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, out, "models/leak.chan.hcl: error: [model] cannot read: a symbolic link that leads outside the checked directory")
	assert.Contains(t, out, "models/pipe.chan.hcl: error: [model] cannot read: is a FIFO")
	assert.Contains(t, out, "models/overtop.chan.hcl:", "the other files are still reported")
	assert.Contains(t, out, "4 files (2 invalid)")
	assert.NotContains(t, out+errOut, "TOP-SECRET")
	assert.NotContains(t, out+errOut, filepath.Dir(secret), "the link's target is never named")

	// Found by a directory walk, the FIFO is not a model (not regular) and
	// the link is not followed.
	code, out, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitFindings, code)
	assert.Contains(t, out, "3 files,")
	assert.NotContains(t, out+errOut, "TOP-SECRET")
}

// --policy: a bare name is the built-in pack even when a file of that name
// sits in the working directory; a file needs a path, and a linked or
// non-regular policy or baseline is refused without reading it.
func TestPolicyAndBaselineHostile(t *testing.T) {
	repo, secret := hostileTree(t)
	// A submittal's "strict" file that switches everything off.
	require.NoError(t, os.WriteFile(filepath.Join(repo, "strict"), []byte("policy \"lax\" {\n  units = \"si\"\n}\n"), 0o644))
	code, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "strict", "models")
	assert.Equal(t, exitFindings, code)
	assert.Contains(t, out, "policy: strict (built-in pack)")

	code, _, errOut := runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "nosuchpack", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, `unknown policy pack "nosuchpack"`)

	require.NoError(t, os.Symlink(secret, filepath.Join(repo, "linked.policy.hcl")))
	code, out, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "./linked.policy.hcl", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "a symbolic link that leads outside the checked directory")
	assert.NotContains(t, out+errOut, "TOP-SECRET")

	fifo(t, filepath.Join(repo, "pipe.policy.hcl"))
	code, _, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "pipe.policy.hcl", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "is a FIFO")

	fifo(t, filepath.Join(repo, "pipe.json"))
	code, _, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "--baseline", "pipe.json", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "cannot read baseline pipe.json: is a FIFO")
	require.NoError(t, os.Symlink(secret, filepath.Join(repo, "leak.json")))
	code, out, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "--baseline", "leak.json", "models")
	assert.Equal(t, exitInvalid, code)
	assert.NotContains(t, out+errOut, "TOP-SECRET")

	// extends of a FIFO inside the tree: refused, no hang.
	require.NoError(t, os.WriteFile(filepath.Join(repo, "child.policy.hcl"), []byte("policy \"c\" {\n  extends = \"./pipe.policy.hcl\"\n}\n"), 0o644))
	code, _, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "--policy", "./child.policy.hcl", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "not a regular file")
}

// A discovered .chanlint.hcl that links outside the repository, or is a
// FIFO, is refused with a message; it never silently falls back.
func TestDiscoveredPolicyHostile(t *testing.T) {
	repo, secret := hostileTree(t)
	cfg := filepath.Join(repo, configName)
	require.NoError(t, os.Symlink(secret, cfg))
	code, out, errOut := runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, ".chanlint.hcl: error: cannot read discovered policy: a symbolic link that leads outside the checked directory")
	assert.NotContains(t, out+errOut, "TOP-SECRET")

	require.NoError(t, os.Remove(cfg))
	fifo(t, cfg)
	code, _, errOut = runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "is a FIFO")
}

// Outputs never replace an input model, a link or a FIFO, and a refused
// write leaves the previous file as it was.
func TestOutputTargetsHostile(t *testing.T) {
	repo, secret := hostileTree(t)
	model := filepath.Join(repo, "models", "clean.chan.hcl")
	before, err := os.ReadFile(model)
	require.NoError(t, err)

	code, _, errOut := runIn(repo, runOpts{}, "report", "--out", "models/clean.chan.hcl", "--format", "html", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "an input of this run")
	code, _, errOut = runIn(repo, runOpts{}, "check", "--write-baseline", "models/clean.chan.hcl", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "an input of this run")
	after, _ := os.ReadFile(model)
	assert.Equal(t, before, after)

	require.NoError(t, os.Symlink(secret, filepath.Join(repo, "out.html")))
	code, _, errOut = runIn(repo, runOpts{}, "report", "--out", "out.html", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "refusing to replace a symbolic link")
	s, _ := os.ReadFile(secret)
	assert.Contains(t, string(s), "TOP-SECRET", "the link's target is untouched")

	fifo(t, filepath.Join(repo, "out.md"))
	code, _, errOut = runIn(repo, runOpts{}, "report", "--out", "out.md", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "refusing to replace a FIFO")
	entries, _ := os.ReadDir(repo)
	for _, e := range entries {
		assert.NotRegexp(t, `\.svg$`, e.Name(), "no plot is written when the page cannot be")
	}
}

// 4 MiB files that would overflow the HCL parser's stack or exhaust memory
// are rejected by the pre-scan with a diagnostic at the place; the other
// files of the run are still checked, at any number of workers.
func TestHostileExpressionsLoseNoOtherFile(t *testing.T) {
	t.Parallel()
	repo, _ := hostileTree(t)
	write := func(name, head, unit string) {
		var b strings.Builder
		b.WriteString(head)
		for b.Len()+len(unit) < 4<<20-16 {
			b.WriteString(unit)
		}
		b.WriteString("\n")
		require.NoError(t, os.WriteFile(filepath.Join(repo, "models", name), []byte(b.String()), 0o644))
	}
	write("splat.chan.hcl", "units = \"si\"\nx = a", "[*]")
	write("sum.chan.hcl", "units = \"si\"\nx = 1", "+1")
	write("list.chan.hcl", "units = \"si\"\nx = [", "1,")
	// What the parser handles in quadratic time or per token: a heredoc
	// of many lines (minutes), escapes it reports one by one, a file of
	// valid points sections beyond the token budget.
	write("heredoc.chan.hcl", "units = \"si\"\ntitle = <<-EOT\n", "  12.2 1.03\n")
	write("escapes.chan.hcl", "units = \"si\"\ntitle = \"", `\q`)
	var section strings.Builder
	section.WriteString("section \"s\" {\n  shape = \"points\"\n  roughness = 0.03\n  points = [\n")
	for i := range model.MaxPoints {
		fmt.Fprintf(&section, "    [%d.5, %d.25],\n", i, 3+i%5)
	}
	section.WriteString("  ]\n}\n")
	write("dense.chan.hcl", "units = \"si\"\n", section.String())
	for _, jobs := range []string{"1", "2"} {
		code, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "-j", jobs, "models")
		assert.Equal(t, exitInvalid, code)
		assert.Contains(t, out, "models/splat.chan.hcl:2:")
		assert.Contains(t, out, "Expression too long")
		assert.Contains(t, out, "Too many items")
		assert.Contains(t, out, "models/heredoc.chan.hcl:")
		assert.Contains(t, out, "String in too many pieces")
		assert.Contains(t, out, "models/escapes.chan.hcl:2:")
		assert.Contains(t, out, "Too many invalid characters")
		assert.Contains(t, out, "models/dense.chan.hcl:")
		assert.Contains(t, out, "File too dense")
		assert.Contains(t, out, "models/overtop.chan.hcl:", "the other files are still reported")
		assert.Contains(t, out, "9 files (6 invalid)")
		assert.Less(t, len(out), 64<<10, "a bounded excerpt, not the 4 MiB line")
	}
}

// A model beyond the work budget ends in a `solver` finding that says so,
// not a kill or a hang; the other files are still checked.
func TestWorkBudgetFinding(t *testing.T) {
	repo, _ := hostileTree(t)
	var b strings.Builder
	b.WriteString("units = \"si\"\nsection \"v\" {\n  shape = \"points\"\n  roughness = 0.03\n  points = [")
	for i := range 2000 {
		fmt.Fprintf(&b, "[%d, %g], ", i, 3-3*float64(i%1000)/1000*float64(1-i/1000)+3*float64(i/1000)*float64(i%1000)/1000)
	}
	b.WriteString("]\n}\n")
	for r := range 40 {
		fmt.Fprintf(&b, "reach \"r%d\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = 40\n  section = \"v\"\n  slope = 0.001\n}\n", r, r, r+1)
	}
	for e := range 50 {
		fmt.Fprintf(&b, "event \"e%d\" {\n  inflow = {", e)
		for r := range 40 {
			fmt.Fprintf(&b, " r%d = %g,", r, 0.5+0.1*float64(e))
		}
		b.WriteString(" }\n  outlet = { condition = \"normal\" }\n}\n")
	}
	require.NoError(t, os.WriteFile(filepath.Join(repo, "models", "heavy.chan.hcl"), []byte(b.String()), 0o644))
	defer func(o solver.Options) { solveOptions = o }(solveOptions)
	solveOptions.MaxWork = 200_000
	code, out, _ := runIn(repo, runOpts{}, "check", "--color", "never", "models")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, out, "work budget exceeded")
	assert.Contains(t, out, "split the model or its events")
	assert.Contains(t, out, "models/overtop.chan.hcl:", "the other files are still reported")
	assert.Contains(t, out, "4 files (1 invalid)")
}
