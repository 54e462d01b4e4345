package main

import (
	"bytes"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestPanicFindingDeterministic makes the rules stage panic and requires a finding whose message is the same on every run, with
// the stack on stderr instead of in the message.
//
// Source: common practice (no published source): ARCHITECTURE.md, "the
// same input gives byte-identical output".
func TestPanicFindingDeterministic(t *testing.T) {
	abs := filepath.Join(repoDir(t), "testdata", "demo", "kestrel-ridge.chan.hcl")
	f := modelFile{abs: abs, display: "kestrel-ridge.chan.hcl"}
	saved := checkRules
	t.Cleanup(func() { checkRules = saved })
	checkRules = func(m *model.Model, res *solver.Result, p *policies.Policy) []rules.Finding {
		var reaches []*model.Reach
		_ = reaches[len(m.Reaches)] // index out of range: a runtime error
		return nil
	}
	var msgs []string
	for range 2 {
		var stderr bytes.Buffer
		r := checkFile(f, nil, keep{}, &stderr)
		require.True(t, r.invalid)
		require.NotEmpty(t, r.findings)
		last := r.findings[len(r.findings)-1]
		assert.Equal(t, "solver", last.Rule)
		assert.Contains(t, last.Message, "internal error while checking this model")
		assert.NotContains(t, last.Message, "goroutine")
		assert.NotContains(t, last.Message, "\n")
		assert.Contains(t, stderr.String(), "goroutine", "the stack goes to stderr")
		assert.Contains(t, stderr.String(), "kestrel-ridge.chan.hcl")
		assert.Nil(t, r.model, "check keeps no model")
		assert.Nil(t, r.result, "check keeps no solution")
		msgs = append(msgs, last.Message)
	}
	assert.Equal(t, msgs[0], msgs[1])
}

// TestCheckFileKeeps requires checkFile to keep the model, solution and
// source only when asked, and the length unit always.
//
// Source: common practice (no published source).
func TestCheckFileKeeps(t *testing.T) {
	abs := filepath.Join(repoDir(t), "testdata", "demo", "kestrel-ridge.chan.hcl")
	f := modelFile{abs: abs, display: "kestrel-ridge.chan.hcl"}
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	var stderr bytes.Buffer

	r := checkFile(f, pol, keep{}, &stderr)
	require.False(t, r.invalid)
	assert.Nil(t, r.model)
	assert.Nil(t, r.result)
	assert.Nil(t, r.src)
	assert.Equal(t, "m", r.unit())

	r = checkFile(f, pol, keep{solved: true, source: true}, &stderr)
	require.False(t, r.invalid)
	assert.NotNil(t, r.model)
	assert.NotNil(t, r.result)
	assert.NotEmpty(t, r.src)
	assert.Empty(t, stderr.String())
}
