package hclkit

import (
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func at(off int) hcl.Range {
	p := hcl.Pos{Line: 1, Column: off + 1, Byte: off}
	return hcl.Range{Filename: "f.hcl", Start: p, End: p}
}

func TestDiagnostics(t *testing.T) {
	var d Diagnostics
	assert.False(t, d.HasErrors())
	d.Warnf(at(3), "W", "%d%%", 5)
	assert.False(t, d.HasErrors(), "a warning is not an error")
	d.Errorf(at(1), "E", "plain %s", "text")
	require.True(t, d.HasErrors())
	require.Len(t, d.Diags, 2)
	assert.Equal(t, hcl.DiagWarning, d.Diags[0].Severity)
	assert.Equal(t, "5%", d.Diags[0].Detail)
	assert.Equal(t, "plain text", d.Diags[1].Detail)
	assert.Equal(t, 1, d.Diags[1].Subject.Start.Byte)

	var e Diagnostics
	assert.False(t, e.Append(hcl.Diagnostics{{Severity: hcl.DiagWarning}}))
	assert.True(t, e.Append(hcl.Diagnostics{{Severity: hcl.DiagError}}))
	assert.Len(t, e.Diags, 2)
}

func TestSortByPosition(t *testing.T) {
	r5a, r5b, r2 := at(5), at(5), at(2)
	diags := hcl.Diagnostics{
		{Summary: "5a", Subject: &r5a},
		{Summary: "none1"},
		{Summary: "2", Subject: &r2},
		{Summary: "5b", Subject: &r5b},
		{Summary: "none2"},
	}
	SortByPosition(diags)
	var got []string
	for _, d := range diags {
		got = append(got, d.Summary)
	}
	assert.Equal(t, []string{"none1", "none2", "2", "5a", "5b"}, got)
}

func TestBound(t *testing.T) {
	lim := Limits{Count: 3, Summary: 50, Detail: 60, Bytes: 1000}
	mk := func(n int, detail string) hcl.Diagnostics {
		var out hcl.Diagnostics
		for i := range n {
			r := at(i)
			out = append(out, &hcl.Diagnostic{Severity: hcl.DiagWarning, Summary: "s", Detail: detail, Subject: &r})
		}
		return out
	}
	assert.Len(t, Bound(mk(3, "d"), lim), 3, "at the count nothing is cut")

	got := Bound(mk(5, "d"), lim)
	require.Len(t, got, 4)
	last := got[3]
	assert.Equal(t, hcl.DiagWarning, last.Severity, "only warnings are hidden: the file stays valid")
	assert.Equal(t, "Too many problems", last.Summary)
	assert.Equal(t, "2 more problems from here on are not shown; fix the ones above and check again.", last.Detail)
	assert.Equal(t, 3, last.Subject.Start.Byte, "at the first one left out")

	// An error among the hidden problems makes the note an error.
	withError := mk(5, "d")
	withError[4].Severity = hcl.DiagError
	got = Bound(withError, lim)
	require.Len(t, got, 4)
	assert.Equal(t, hcl.DiagError, got[3].Severity, "an error is hidden")
	assert.True(t, got.HasErrors())

	// Details are clipped, and the byte bound cuts before the count.
	long := strings.Repeat("x", 100)
	got = Bound(mk(3, long), Limits{Count: 10, Summary: 50, Detail: 60, Bytes: 70})
	require.Len(t, got, 2)
	assert.LessOrEqual(t, len(got[0].Detail), 60)
	assert.Equal(t, "2 more problems from here on are not shown; fix the ones above and check again.", got[1].Detail)
}

func TestClip(t *testing.T) {
	assert.Equal(t, "short", Clip("short", 50))
	s := strings.Repeat("é", 100) // 200 bytes
	c := Clip(s, 60)
	assert.LessOrEqual(t, len(c), 60)
	assert.True(t, utf8.ValidString(c), "cut on a rune boundary")
	assert.Equal(t, strings.Repeat("é", 10)+"… (180 more bytes)", c)
}

func TestDidYouMean(t *testing.T) {
	assert.Equal(t, "", DidYouMean(""))
	assert.Equal(t, ` Did you mean "concrete"?`, DidYouMean("concrete"))
	assert.Equal(t, ` Did you mean "a\"b"?`, DidYouMean(`a"b`))
}
