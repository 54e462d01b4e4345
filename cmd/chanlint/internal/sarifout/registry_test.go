package sarifout

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/owenrumney/go-sarif/v3/pkg/report/v210/sarif"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestRealPipelineLog renders the demo model's findings with the whole
// registry and validates the log against the SARIF 2.1.0 schema.
func TestRealPipelineLog(t *testing.T) {
	path := filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")
	src, err := os.ReadFile(path)
	require.NoError(t, err)
	m, diags := model.Parse(filepath.ToSlash(path), src)
	require.False(t, diags.HasErrors(), diags.Error())
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	p, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	fs := rules.Check(m, res, p)
	require.NotEmpty(t, fs)

	root, err := filepath.Abs(filepath.Join("..", "..", "..", ".."))
	require.NoError(t, err)
	var buf bytes.Buffer
	require.NoError(t, Write(&buf, Input{Findings: fs, Rules: rules.All(), Root: root,
		Sources: map[string][]byte{m.File: src}, ToolVersion: "test"}))
	rep, err := sarif.FromBytes(buf.Bytes())
	require.NoError(t, err)
	require.NoError(t, rep.Validate())

	run := rep.Runs[0]
	require.Len(t, run.Tool.Driver.Rules, len(rules.All()), "every rule of the registry, no extra")
	for _, d := range run.Tool.Driver.Rules {
		assert.NotEmpty(t, *d.ShortDescription.Text, *d.ID)
		assert.NotEmpty(t, *d.FullDescription.Text, *d.ID)
		assert.NotEmpty(t, *d.Help.Markdown, *d.ID)
	}
	for _, r := range run.Results {
		al := r.Locations[0].PhysicalLocation.ArtifactLocation
		assert.Equal(t, "testdata/demo/kestrel-ridge.chan.hcl", *al.URI)
		reg := r.Locations[0].PhysicalLocation.Region
		require.NotNil(t, reg)
		assert.GreaterOrEqual(t, reg.ByteOffset, 0, "byte offsets from the source")
		// ASCII source: UTF-16 offsets equal byte offsets.
		assert.Equal(t, reg.ByteOffset, reg.CharOffset)
	}
}

func BenchmarkWrite(b *testing.B) {
	path := filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl")
	src, err := os.ReadFile(path)
	require.NoError(b, err)
	m, _ := model.Parse(filepath.ToSlash(path), src)
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(b, err)
	p, _ := rules.Language().Pack("baseline")
	fs := rules.Check(m, res, p)
	in := Input{Findings: fs, Rules: rules.All(), Root: "/srv", Sources: map[string][]byte{m.File: src}}
	var buf bytes.Buffer
	b.ReportAllocs()
	for b.Loop() {
		buf.Reset()
		if err := Write(&buf, in); err != nil {
			b.Fatal(err)
		}
	}
}
