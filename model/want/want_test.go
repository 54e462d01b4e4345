package want

import (
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestParse(t *testing.T) {
	src := []byte(`# a comment
# want freeboard q100 305..350 "below the required"
# want:us max_velocity q10 0..12.5 excepted
reach "a" {
  length = -1 # want model "Invalid value" "length"
}

# want unused_exception - -..-
exception "x" {}
# Prose: "# want RULE" is how it is written.
x = 1 # want model "a" # want model "b"
`)
	ws, err := Parse(src)
	require.NoError(t, err)
	require.Len(t, ws, 6)
	assert.Equal(t, Want{Rule: "freeboard", Event: "q100", From: "305", To: "350", Line: 4, CommentLine: 2, Patterns: ws[0].Patterns}, ws[0])
	assert.True(t, ws[0].Matches("freeboard 0.1 m is below the required 0.3 m"))
	assert.Equal(t, "us", ws[1].Label)
	assert.True(t, ws[1].Excepted)
	assert.Equal(t, 4, ws[1].Line)
	assert.Equal(t, "model", ws[2].Rule)
	assert.Equal(t, 5, ws[2].Line, "a trailing comment is about its own line")
	assert.False(t, ws[2].HasSpan())
	assert.True(t, ws[2].Matches("Invalid value for length; must be positive"))
	assert.False(t, ws[2].Matches("Invalid value for width"))
	assert.Equal(t, 9, ws[3].Line)
	assert.Equal(t, 11, ws[4].Line)
	assert.Equal(t, 11, ws[5].Line)
	assert.True(t, ws[5].Matches("b"))
}

func TestParseErrors(t *testing.T) {
	for _, src := range []string{
		"# want\nx\n",
		"# want a b\nx\n",
		"# want a b c\nx\n",
		"# want a \"(\"\nx\n",
		"# want a \"x\" b\nx\n",
		"# want freeboard q 1..2\n",
		"# want: a\nx\n",
	} {
		_, err := Parse([]byte(src))
		assert.Error(t, err, "%q", src)
	}
}

// TestDiagnostics: an expected error passes; an unexpected error, an
// unmet want and a diagnostic without a position are each reported.
//
// Source: common practice (no published source): the analysistest
// convention of failing on both unexpected and missing diagnostics.
func TestDiagnostics(t *testing.T) {
	wants, err := Parse([]byte("a = 1 # want model \"Bad value\"\nb = 2\n# want model \"Missing\"\nc = 3\n"))
	if err != nil {
		t.Fatal(err)
	}
	at := func(line int) *hcl.Range { return &hcl.Range{Start: hcl.Pos{Line: line}, End: hcl.Pos{Line: line}} }
	diags := hcl.Diagnostics{
		{Severity: hcl.DiagError, Summary: "Bad value", Subject: at(1)},
		{Severity: hcl.DiagError, Summary: "Other", Subject: at(2)},
		{Severity: hcl.DiagWarning, Summary: "Loose"},
	}
	got := Diagnostics(wants, "model", diags)
	wantProblems := []string{"unexpected error at line 2: Other; ", "Loose has no position", `no error for model "Missing"`}
	if len(got) != len(wantProblems) {
		t.Fatalf("got %q, want %q", got, wantProblems)
	}
	for i := range got {
		if !strings.Contains(got[i], wantProblems[i]) {
			t.Errorf("problem %d: %q does not contain %q", i, got[i], wantProblems[i])
		}
	}
	if p := Diagnostics(wants[:1], "model", diags[:1]); len(p) != 0 {
		t.Errorf("an expected error reported %q", p)
	}
}
