package want

import (
	"testing"

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
