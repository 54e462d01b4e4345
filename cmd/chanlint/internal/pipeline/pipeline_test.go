package pipeline

import (
	"bytes"
	"path/filepath"
	"sync/atomic"
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
	f := File{Name: "kestrel-ridge.chan.hcl", Path: filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")}
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
		r := CheckFile(f, nil, Options{Stderr: &stderr})
		require.True(t, r.Invalid)
		require.NotEmpty(t, r.Findings)
		last := r.Findings[len(r.Findings)-1]
		assert.Equal(t, "solver", last.Rule)
		assert.Contains(t, last.Message, "internal error while checking this model")
		assert.NotContains(t, last.Message, "goroutine")
		assert.NotContains(t, last.Message, "\n")
		assert.Contains(t, stderr.String(), "goroutine", "the stack goes to stderr")
		assert.Contains(t, stderr.String(), "kestrel-ridge.chan.hcl")
		assert.Nil(t, r.Model, "check keeps no model")
		assert.Nil(t, r.Solution, "check keeps no solution")
		msgs = append(msgs, last.Message)
	}
	assert.Equal(t, msgs[0], msgs[1])
}

// TestCheckFileKeeps requires CheckFile to keep the model, solution and
// source only when asked, and the length unit always.
//
// Source: common practice (no published source).
func TestCheckFileKeeps(t *testing.T) {
	f := File{Name: "kestrel-ridge.chan.hcl", Path: filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")}
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	var stderr bytes.Buffer

	r := CheckFile(f, pol, Options{Stderr: &stderr})
	require.False(t, r.Invalid)
	assert.Nil(t, r.Model)
	assert.Nil(t, r.Solution)
	assert.Nil(t, r.Src)
	assert.Equal(t, "m", r.Unit())

	r = CheckFile(f, pol, Options{Keep: Keep{Solved: true, Source: true}, Stderr: &stderr})
	require.False(t, r.Invalid)
	assert.NotNil(t, r.Model)
	assert.NotNil(t, r.Solution)
	assert.NotEmpty(t, r.Src)
	assert.Empty(t, stderr.String())
}

// TestParseOnceCheckTwice: one Parsed checked twice (as a sensitivity run
// would) gives the same findings, and Check leaves the Parsed unchanged.
//
// Source: common practice (no published source).
func TestParseOnceCheckTwice(t *testing.T) {
	p := Load(File{Name: "kestrel-ridge.chan.hcl", Path: filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")})
	require.False(t, p.Invalid)
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	a := p.Check(pol, Options{})
	b := p.Check(pol, Options{Keep: Keep{Solved: true}})
	assert.Equal(t, a.Findings, b.Findings)
	assert.NotEmpty(t, a.Findings)
	assert.NotNil(t, p.Model, "Check does not drop the parsed model")
	assert.NotNil(t, b.Solution)
}

// TestUnreadableAndInvalid: a path that cannot be read and a text that
// does not parse are invalid results with a `model` finding.
//
// Source: common practice (no published source).
func TestUnreadableAndInvalid(t *testing.T) {
	r := CheckFile(File{Name: "gone.chan.hcl", Path: filepath.Join(t.TempDir(), "gone.chan.hcl")}, nil, Options{})
	assert.True(t, r.Invalid)
	require.NotEmpty(t, r.Findings)
	assert.Equal(t, "model", r.Findings[0].Rule)
	assert.Equal(t, "gone.chan.hcl", r.Findings[0].File())

	p := Parse(File{Name: "bad.chan.hcl"}, []byte("model {"))
	assert.True(t, p.Invalid)
	assert.Nil(t, p.Model)
	assert.NotEmpty(t, p.Diagnostics)
	assert.True(t, p.Check(nil, Options{}).Invalid)
}

// TestCheckFilesConcurrent checks the same files on one and on four
// workers: the results are in the order of the files and equal, and the
// race detector (go test -race, run by .ci/run) sees the pool share
// nothing unsynchronised.
//
// Source: common practice (no published source).
func TestCheckFilesConcurrent(t *testing.T) {
	demo := File{Name: "kestrel-ridge.chan.hcl", Path: filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")}
	gone := File{Name: "gone.chan.hcl", Path: filepath.Join(t.TempDir(), "gone.chan.hcl")}
	files := []File{demo, gone, demo, demo, gone, demo}
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	var done atomic.Int64
	var stderr bytes.Buffer
	one := CheckFiles(files, pol, Options{Stderr: &stderr}, 1, nil)
	four := CheckFiles(files, pol, Options{Stderr: &stderr}, 4, func() { done.Add(1) })
	require.Len(t, four, len(files))
	assert.EqualValues(t, len(files), done.Load())
	for i := range files {
		assert.Equal(t, files[i].Name, four[i].File.Name)
		assert.Equal(t, one[i].Findings, four[i].Findings)
		assert.Equal(t, one[i].Invalid, four[i].Invalid)
	}
	assert.Empty(t, stderr.String())
}

// TestCorpusFindingsNameOneFile: every finding of every model of the
// corpus (valid, invalid, unreadable, a sensitivity run of the demo) is
// in the file it was checked as and names its places one way
// (rules.Finding.CheckPlaces), also once moved relative to a baseline in
// another directory.
//
// Source: common practice (no published source).
func TestCorpusFindingsNameOneFile(t *testing.T) {
	pol, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	root := filepath.Join("..", "..", "..", "..", "testdata")
	paths, err := filepath.Glob(filepath.Join(root, "*", "*.chan.hcl"))
	require.NoError(t, err)
	require.NotEmpty(t, paths)
	var files []File
	for _, p := range paths {
		rel, err := filepath.Rel(root, p)
		require.NoError(t, err)
		files = append(files, File{Name: filepath.ToSlash(rel), Path: p})
	}
	results := CheckFiles(files, pol, Options{}, 2, nil)
	results = append(results, Unreadable("gone.chan.hcl", assert.AnError))
	demo := Load(File{Name: "demo/kestrel-ridge.chan.hcl", Path: filepath.Join(root, "demo", "kestrel-ridge.chan.hcl")})
	vary := &Sensitivity{Roughness: 0.2, Discharge: 0.1, Tailwater: 0.3}
	results = append(results, demo.CheckVaried(pol, Options{Vary: vary}, 2))
	n := 0
	for _, r := range results {
		for i := range r.Findings {
			f := &r.Findings[i]
			n++
			require.NoError(t, f.CheckPlaces(), "%+v", f)
			assert.Equal(t, r.File.Name, f.File(), "%s finding", f.Rule)
		}
	}
	require.Greater(t, n, len(results), "the corpus has findings")
	for _, f := range BaselineFindings(results, filepath.Join(t.TempDir(), "ci", "baseline.json"), ".") {
		require.NoError(t, f.CheckPlaces(), "%+v", f)
	}
}
