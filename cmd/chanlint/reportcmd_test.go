package main

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The report command writes a file and says so; an invalid model makes it
// exit 2 but the report is still written.
func TestReport(t *testing.T) {
	dir := workspace(t, 1)
	code, out, errOut := runIn(dir, runOpts{}, "report", "set00/demo", "--out", "review.html")
	require.Equal(t, exitOK, code, errOut)
	assert.Regexp(t, `^wrote review\.html: 1 model, \d+ findings?, policy baseline\n$`, out)
	data, err := os.ReadFile(filepath.Join(dir, "review.html"))
	require.NoError(t, err)
	assert.NotEmpty(t, data)

	code, _, errOut = runIn(dir, runOpts{}, "report", "set00/models", "--out", "review.md")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "broken.chan.hcl:4:3: error: [model]")
	_, err = os.Stat(filepath.Join(dir, "review.md"))
	assert.NoError(t, err)

	code, _, errOut = runIn(dir, runOpts{}, "report", "set00/demo")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "--out FILE is required")

	// --format markdown writes the file as named, its plots beside it.
	code, out, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--out", "notes.txt", "--format", "markdown")
	require.Equal(t, exitOK, code, errOut)
	assert.Regexp(t, `^wrote notes\.txt: `, out)
	_, err = os.Stat(filepath.Join(dir, "notes.txt"))
	assert.NoError(t, err)
	_, err = os.Stat(filepath.Join(dir, "notes.md"))
	assert.True(t, os.IsNotExist(err), "no other name")
	_, err = os.Stat(filepath.Join(dir, "notes-1.svg"))
	assert.NoError(t, err)
	code, out, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--out", "review.markdown")
	require.Equal(t, exitOK, code, errOut)
	assert.Regexp(t, `^wrote review\.markdown: `, out)

	// --out - writes the report to standard output, the account to stderr.
	code, out, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--out", "-")
	require.Equal(t, exitOK, code, errOut)
	assert.True(t, strings.HasPrefix(out, "<!DOCTYPE html>"), out[:min(len(out), 80)])
	assert.Regexp(t, `^chanlint report: 1 model, \d+ findings?, policy baseline\n$`, errOut)
	_, err = os.Stat(filepath.Join(dir, "-"))
	assert.True(t, os.IsNotExist(err))
	code, out, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--out", "-", "--format", "markdown")
	require.Equal(t, exitOK, code, errOut)
	assert.Contains(t, out, "# Channel design review")
	assert.Contains(t, out, "](data:image/svg+xml;base64,")
}

// report --vary runs the sensitivity envelope as check does, and so does a
// policy's sensitivity block: the findings carry their verdicts, the run
// is stated and the plots draw the band.
func TestReportVary(t *testing.T) {
	dir := workspace(t, 1)
	code, _, errOut := runIn(dir, runOpts{}, "report", "set00/demo", "--vary", "roughness=0.2", "--out", "review.html")
	require.Equal(t, exitOK, code, errOut)
	data, err := os.ReadFile(filepath.Join(dir, "review.html"))
	require.NoError(t, err)
	page := string(data)
	assert.Contains(t, page, `<p class="run">Sensitivity run, asked by --vary: each event solved in 2 more cases, roughness ±20 %, each lowered and raised; `)
	assert.Contains(t, page, `<span class="envelope knife_edge">Envelope: knife-edge: fails in 1 of 2 cases; passes under roughness `)
	assert.Contains(t, page, `<g class="envelope"><title>Water-surface envelope over 2 sensitivity cases (roughness ±20 %)`)

	require.NoError(t, os.WriteFile(filepath.Join(dir, "vary.policy.hcl"), []byte(`policy "vary" {
  units   = "si"
  extends = "baseline"
  sensitivity {
    discharge = 0.1
  }
}
`), 0o644))
	code, _, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--policy", "vary.policy.hcl", "--out", "review.md")
	require.Equal(t, exitOK, code, errOut)
	data, err = os.ReadFile(filepath.Join(dir, "review.md"))
	require.NoError(t, err)
	assert.Contains(t, string(data), "**Sensitivity run, asked by the policy's sensitivity block: each event solved in 2 more cases, discharge ±10 %, each lowered and raised; ")
	assert.Contains(t, string(data), " — envelope: _")
	svg, err := os.ReadFile(filepath.Join(dir, "review-1.svg"))
	require.NoError(t, err)
	assert.Contains(t, string(svg), `<g class="envelope">`)

	code, _, errOut = runIn(dir, runOpts{}, "report", "set00/demo", "--vary", "roughnes=0.2", "--out", "review.html")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, `--vary: unknown parameter "roughnes"`)
}

// The report carries the coverage matrix of every model and the SHA-256
// of each model and each file of the policy's extends chain.
func TestReportCoverageAndHashes(t *testing.T) {
	dir := workspace(t, 1)
	code, _, errOut := runIn(dir, runOpts{}, "report", "set00/demo", "--out", "review.md", "--policy", "review")
	require.Equal(t, exitOK, code, errOut)
	data, err := os.ReadFile(filepath.Join(dir, "review.md"))
	require.NoError(t, err)
	text := string(data)
	assert.Contains(t, text, "### Coverage")
	assert.Regexp(t, "(?m)^\\| north-swale \\| q100 \\| `freeboard` \\| fail \\|", text)
	assert.Regexp(t, "(?m)^\\| north-swale \\| q10 \\| `superelevation` \\| not applicable \\| no bend on the reach \\|", text)
	assert.Regexp(t, "(?m)^- SHA-256 of `pack:review`: `[0-9a-f]{64}`$", text)
	src, err := os.ReadFile(filepath.Join(dir, "set00", "demo", "kestrel-ridge.chan.hcl"))
	require.NoError(t, err)
	sum := sha256.Sum256(src) // Source: FIPS 180-4 SHA-256, through the standard library
	assert.Contains(t, text, "SHA-256 `"+hex.EncodeToString(sum[:])+"`")
}
