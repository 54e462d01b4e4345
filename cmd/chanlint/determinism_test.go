package main

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// determinismTree is a tree with the demo, the test models (one broken),
// the repository's valid models and part of the bad corpus, three times
// over, so that the worker pool interleaves files of every kind.
func determinismTree(t *testing.T) string {
	t.Helper()
	dir := workspace(t, 3)
	repo := repoDir(t)
	copyTree(t, filepath.Join(repo, "testdata", "valid"), filepath.Join(dir, "valid"))
	bad, err := filepath.Glob(filepath.Join(repo, "testdata", "bad", "4*.chan.hcl"))
	require.NoError(t, err)
	for _, b := range bad {
		copyTree(t, b, filepath.Join(dir, "bad", filepath.Base(b)))
	}
	return dir
}

// TestOutputDeterministicAcrossCores runs the built binary as a
// subprocess with GOMAXPROCS=1 and GOMAXPROCS=2 (and the default worker
// count each gives), twice each, and requires byte-identical stdout,
// stderr and exit code in every output format.
//
// Source: common practice (no published source): ARCHITECTURE.md, "the
// same input gives byte-identical output whatever the number of cores".
func TestOutputDeterministicAcrossCores(t *testing.T) {
	bin := cliBinary(t)
	dir := determinismTree(t)
	for _, format := range []string{"text", "json", "sarif"} {
		t.Run(format, func(t *testing.T) {
			type run struct {
				stdout, stderr []byte
				code           int
			}
			var runs []run
			for _, procs := range []string{"1", "2", "1", "2"} {
				cmd := exec.Command(bin, "check", "--format", format, "--color", "never", ".")
				cmd.Dir = dir
				cmd.Env = append(os.Environ(), "GOMAXPROCS="+procs, "NO_COLOR=")
				var stdout, stderr bytes.Buffer
				cmd.Stdout, cmd.Stderr = &stdout, &stderr
				err := cmd.Run()
				code := 0
				if ee, ok := err.(*exec.ExitError); ok {
					code = ee.ExitCode()
				} else {
					require.NoError(t, err)
				}
				runs = append(runs, run{stdout.Bytes(), stderr.Bytes(), code})
			}
			require.NotEmpty(t, runs[0].stdout)
			assert.Equal(t, exitInvalid, runs[0].code, "the broken models make the run invalid")
			for i, r := range runs[1:] {
				assert.Equal(t, runs[0].code, r.code, "run %d", i+1)
				assert.True(t, bytes.Equal(runs[0].stdout, r.stdout), "run %d: stdout differs", i+1)
				assert.True(t, bytes.Equal(runs[0].stderr, r.stderr), "run %d: stderr differs", i+1)
			}
		})
	}
}

// TestOutputDeterministicAcrossWorkers: in-process, with GOMAXPROCS 1 and
// 2 and worker counts 1, 2 and 7, the output of check is the same bytes.
func TestOutputDeterministicAcrossWorkers(t *testing.T) {
	dir := determinismTree(t)
	prev := runtime.GOMAXPROCS(0)
	t.Cleanup(func() { runtime.GOMAXPROCS(prev) })
	for _, format := range []string{"text", "json", "sarif"} {
		var want string
		for _, procs := range []int{1, 2} {
			runtime.GOMAXPROCS(procs)
			for _, jobs := range []int{1, 2, 7} {
				_, out, _ := runIn(dir, runOpts{jobs: jobs}, "check", "--format", format, "--color", "never")
				if want == "" {
					want = out
					require.NotEmpty(t, want)
					continue
				}
				require.Equal(t, want, out, "%s with GOMAXPROCS=%d and %d workers", format, procs, jobs)
			}
		}
	}
}

// TestDiscoveryStaysInTree: a model reached through a symbolic link that
// leaves the checked tree is never read (its content, a canary, appears in
// no output), directory link loops end, and the files inside are checked.
func TestDiscoveryStaysInTree(t *testing.T) {
	base := t.TempDir()
	tree := filepath.Join(base, "tree")
	outside := filepath.Join(base, "outside")
	clean, err := os.ReadFile(filepath.Join("testdata", "models", "clean.chan.hcl"))
	require.NoError(t, err)
	require.NoError(t, os.MkdirAll(filepath.Join(tree, "a", "b"), 0o755))
	require.NoError(t, os.MkdirAll(outside, 0o755))
	require.NoError(t, os.WriteFile(filepath.Join(tree, "a", "inside.chan.hcl"), clean, 0o644))
	// An outside model that would fail loudly if it were read.
	canary := "units = \"si\"\ntitle = \"outside-canary\"\nbroken {\n"
	require.NoError(t, os.WriteFile(filepath.Join(outside, "secret.chan.hcl"), []byte(canary), 0o644))
	require.NoError(t, os.Symlink(filepath.Join(outside, "secret.chan.hcl"), filepath.Join(tree, "a", "leak.chan.hcl")))
	require.NoError(t, os.Symlink(outside, filepath.Join(tree, "outdir")))
	require.NoError(t, os.Symlink("..", filepath.Join(tree, "a", "b", "up")))         // loop back to a
	require.NoError(t, os.Symlink(tree, filepath.Join(tree, "a", "b", "root")))       // loop back to the root
	require.NoError(t, os.Symlink("self", filepath.Join(tree, "self")))               // a link to itself
	require.NoError(t, os.Symlink("/dev/zero", filepath.Join(tree, "zero.chan.hcl"))) // not a regular file

	done := make(chan struct{})
	var code int
	var out, errOut string
	go func() {
		defer close(done)
		code, out, errOut = runIn(tree, runOpts{}, "check", "--format", "json", "--color", "never")
	}()
	select {
	case <-done:
	case <-time.After(2 * time.Minute):
		t.Fatal("check did not finish: a link loop?")
	}
	assert.NotContains(t, out+errOut, "outside-canary")
	assert.NotContains(t, out+errOut, "secret.chan.hcl")
	assert.NotContains(t, out, "zero.chan.hcl")
	assert.NotEqual(t, exitInvalid, code, "%s%s", out, errOut)
	// Only a/inside.chan.hcl is checked (it has no findings).
	assert.Equal(t, 1, strings.Count(out, `"files": 1,`), "%s", out)

	t.Run("notice", func(t *testing.T) {
		// The notice names the link, on stderr so outputs stay parseable.
		assert.Contains(t, errOut, "leak.chan.hcl")
		assert.NotContains(t, out, "leak.chan.hcl")
	})
}
