package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// chanlint init writes a starter model that passes the baseline packs
// with no finding at any severity, and a .chanlint.hcl that check finds;
// it keeps existing files unless --force.
func TestInit(t *testing.T) {
	dir := t.TempDir()
	code, out, errOut := runIn(dir, runOpts{}, "init", "--config", "baseline")
	require.Equal(t, exitOK, code, errOut)
	assert.Equal(t, "wrote channel.chan.hcl\nwrote .chanlint.hcl\nnext: edit it to your channel, then run 'chanlint check .'\n", out)
	code, out, _ = runIn(dir, runOpts{}, "check", "--fail-on", "info", "--color", "never")
	assert.Equal(t, exitOK, code, out)
	assert.Contains(t, out, "1 file, 0 errors, 0 warnings, 0 info, 0 excepted\n")
	assert.Contains(t, out, "policy: project (.chanlint.hcl)")

	src, err := os.ReadFile(filepath.Join(dir, "channel.chan.hcl"))
	require.NoError(t, err)
	for _, block := range []string{"units", "title", "section", "reach", "event", "exception"} {
		assert.Regexp(t, `(?m)^# `+block+`|^# A design exception`, string(src), "a comment teaches %s", block)
	}

	code, _, errOut = runIn(dir, runOpts{}, "init")
	assert.Equal(t, exitInvalid, code)
	assert.Equal(t, "chanlint init: channel.chan.hcl exists; pass --force to replace it\n", errOut)
	code, _, errOut = runIn(dir, runOpts{}, "init", "--force")
	assert.Equal(t, exitOK, code, errOut)

	code, _, errOut = runIn(dir, runOpts{}, "init", "--config", "baselin")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, `unknown pack "baselin"; did you mean "baseline"?`)
	code, _, errOut = runIn(dir, runOpts{}, "init", "--name", "../x")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "--name must be a file name")
}

// Both starters pass every built-in pack cleanly, and so does each
// clean model of testdata/valid.
func TestStartersAndCleanModelsPass(t *testing.T) {
	dir := t.TempDir()
	for _, u := range []string{"si", "us"} {
		code, _, errOut := runIn(dir, runOpts{}, "init", filepath.Join("starters", u), "--units", u)
		require.Equal(t, exitOK, code, errOut)
	}
	clean, err := filepath.Glob(filepath.Join(repoDir(t), "testdata", "valid", "clean-*.chan.hcl"))
	require.NoError(t, err)
	require.NotEmpty(t, clean)
	for _, f := range clean {
		copyTree(t, f, filepath.Join(dir, "clean", filepath.Base(f)))
	}
	for _, pack := range []string{"baseline", "baseline-us", "strict"} {
		for _, sub := range []string{"starters/si", "starters/us", "clean"} {
			code, out, _ := runIn(dir, runOpts{}, "check", sub, "--policy", pack, "--fail-on", "info", "--color", "never")
			assert.Equal(t, exitOK, code, "%s under %s:\n%s", sub, pack, out)
			assert.True(t, strings.Contains(out, ", 0 errors, 0 warnings, 0 info, 0 excepted\n"), "%s under %s:\n%s", sub, pack, out)
		}
	}
}
