package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// check - reads one model from standard input, printed as <stdin> or the
// --stdin-name given; other paths are still checked.
func TestCheckStdin(t *testing.T) {
	dir := workspace(t, 1)
	src, err := os.ReadFile(filepath.Join("testdata", "models", "overtop.chan.hcl"))
	require.NoError(t, err)
	code, out, errOut := runIn(dir, runOpts{stdin: string(src)}, "check", "-", "--color", "never")
	assert.Equal(t, exitFindings, code, errOut)
	assert.Regexp(t, `(?m)^<stdin>:10:18: error: \[capacity\] reach lane, event q25`, out)
	assert.Contains(t, out, "1 file, 1 error,") // capacity; freeboard does not repeat the overtopping

	code, out, _ = runIn(dir, runOpts{stdin: string(src)}, "check", "--stdin-name", "models/lane.chan.hcl", "-", "set00/demo", "--color", "never")
	assert.Equal(t, exitFindings, code)
	assert.Regexp(t, `(?m)^models/lane\.chan\.hcl:10:18: error: \[capacity\]`, out)
	assert.Contains(t, out, "set00/demo/kestrel-ridge.chan.hcl:")
	assert.Contains(t, out, "2 files,")

	code, out, _ = runIn(dir, runOpts{stdin: "units = \"si\"\nsection \"x\" {\n  botom = 1\n}\n"}, "check", "-", "--color", "never")
	assert.Equal(t, exitInvalid, code)
	assert.Regexp(t, `(?m)^<stdin>:3:3: error: \[model\] `, out)
	assert.Contains(t, out, "  3 |   botom = 1")
}

// --rule and --event narrow the findings shown and judged; an unknown
// rule is a command-line error with a suggestion, an unknown event a
// warning; --write-baseline refuses them.
func TestCheckRuleEventFilters(t *testing.T) {
	dir := workspace(t, 1)
	code, out, _ := runIn(dir, runOpts{}, "check", "set00/demo", "--rule", "jump_type,froude_band", "--color", "never")
	assert.Equal(t, exitOK, code, "only warnings left")
	assert.Regexp(t, `(?m)^\S+: warning: \[jump_type\] `, out)
	assert.Regexp(t, `(?m)^\S+: warning: \[froude_band\] `, out)
	assert.NotContains(t, out, "[freeboard]")

	code, out, _ = runIn(dir, runOpts{}, "check", "set00/demo", "--event", "q10", "--rule", "jump_type", "--rule", "shear_stress", "--color", "never")
	assert.Equal(t, exitFindings, code)
	assert.NotContains(t, out, "event q100")
	assert.Contains(t, out, "[shear_stress] reach merrow-brook, event q10")

	code, _, errOut := runIn(dir, runOpts{}, "check", "set00/demo", "--rule", "frebord")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, `--rule: unknown rule "frebord"; did you mean "freeboard"?`)

	_, _, errOut = runIn(dir, runOpts{}, "check", "set00/demo", "--event", "q1000")
	assert.Contains(t, errOut, `warning: no checked model has an event named "q1000"; did you mean "q100"?`)

	code, _, errOut = runIn(dir, runOpts{}, "check", "set00/demo", "--event", "q10", "--write-baseline", "b.json")
	assert.Equal(t, exitInvalid, code)
	assert.Contains(t, errOut, "cannot be combined with --rule or --event")
}

// --format annotations writes GitHub Actions workflow commands with the
// position, a title and an escaped message; excepted findings are notices.
func TestCheckAnnotations(t *testing.T) {
	dir := workspace(t, 1)
	require.NoError(t, os.Mkdir(filepath.Join(dir, ".git"), 0o755))
	code, out, _ := runIn(filepath.Join(dir, "set00"), runOpts{}, "check", "demo", "--format", "annotations")
	assert.Equal(t, exitFindings, code)
	assert.Regexp(t, `(?m)^::error file=set00/demo/kestrel-ridge\.chan\.hcl,line=15,col=18,endLine=15,endColumn=\d+,title=chanlint freeboard::reach north-swale, event q100, stations [0-9.]+–350 m: freeboard [0-9.]+ m is below the required 0\.300 m%0Aremedy: raise the top of bank`, out)
	assert.Regexp(t, `(?m)^::notice file=\S+,title=chanlint max_velocity \(excepted error\)::.*%0Aexception: Chute slab`, out)
	assert.Regexp(t, `(?m)^1 file, \d+ errors?, `, out)
	assert.NotContains(t, out, "\u001b[")

	assert.Equal(t, "a%25b%0Ac", annotationData("a%b\nc"))
	assert.Equal(t, "x%3Ay%2Cz", annotationProperty("x:y,z"))
}

// A workflow command carries a submittal's names and reasons made
// visible as every text output makes them: the Actions log renders
// escape sequences, and bidi overrides would reorder what a reviewer
// reads.
func TestAnnotationUntrustedText(t *testing.T) {
	f := rules.Finding{
		Rule: "freeboard", Severity: policies.Error, Message: "freeboard \u202e0.1 m",
		Remedy: "raise \u001b[2Kit", Reach: "r\u202e1", Excepted: true, ExceptionReason: "ok\u001b[31m\u2066",
		Range: hcl.Range{Filename: "m.chan.hcl", Start: hcl.Pos{Line: 1, Column: 1}, End: hcl.Pos{Line: 1, Column: 2}},
	}
	var b strings.Builder
	writeAnnotation(&b, "a\u202eb.chan.hcl", &f, "m")
	out := b.String()
	for _, bad := range []string{"\u001b", "\u202e", "\u2066"} {
		assert.NotContains(t, out, bad)
	}
	assert.Contains(t, out, `file=a\u202Eb.chan.hcl`)
	assert.Contains(t, out, `reach r\u202E1`)
	assert.Contains(t, out, `%0Aexception: ok\x1b[31m\u2066%0Aremedy: raise \x1b[2Kit`)
}

// Command-line errors spell options with two dashes and suggest the one
// meant; help -h shows the help of help.
func TestFlagErrorsAndHelp(t *testing.T) {
	dir := t.TempDir()
	code, _, errOut := runIn(dir, runOpts{}, "check", "--formt", "json")
	assert.Equal(t, exitInvalid, code)
	assert.Equal(t, "chanlint check: unknown option --formt; did you mean --format?\nrun 'chanlint help check' for its usage\n", errOut)
	_, _, errOut = runIn(dir, runOpts{}, "solve", "--event")
	assert.Contains(t, errOut, "option needs a value: --event")
	_, _, errOut = runIn(dir, runOpts{}, "check", "-j", "x")
	assert.Contains(t, errOut, `invalid value "x" for -j: not a whole number`)
	for _, h := range []string{"-h", "--help"} {
		code, out, _ := runIn(dir, runOpts{}, "help", h)
		assert.Equal(t, exitOK, code)
		assert.Contains(t, out, "usage: chanlint help [COMMAND]")
	}
}
