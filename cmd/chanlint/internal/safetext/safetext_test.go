package safetext

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestText(t *testing.T) {
	cases := map[string]string{
		"plain name – ü ß 水路":      "plain name – ü ß 水路",
		"a\x1b[2Jb":                `a\x1b[2Jb`,
		"line\r\nnext\tcol":        `line\r\nnext\tcol`,
		"del\x7f":                  `del\x7f`,
		"c1 \u009b31m \u0085":      `c1 \u009B31m \u0085`,
		"rlo \u202e lri \u2066":    `rlo \u202E lri \u2066`,
		"marks \u200e\u200f\u061c": `marks \u200E\u200F\u061C`,
		"sep \u2028\u2029":         `sep \u2028\u2029`,
		"nonchar \ufdd0 \uffff":    `nonchar \uFDD0 \uFFFF`,
		"plane1 \U0001FFFE":        `plane1 \u1FFFE`,
		"bad \xff utf8":            `bad \xff utf8`,
	}
	for in, want := range cases {
		assert.Equal(t, want, Text(in), "%q", in)
		assert.True(t, Safe(Text(in)), "%q stays safe once escaped", in)
	}
	assert.True(t, Safe("ordinary"))
	assert.False(t, Safe("\x1b"))
}

func TestClip(t *testing.T) {
	assert.Equal(t, "short", Clip("short", 10))
	assert.Equal(t, "abcd…wxyz", Clip("abcdefghijklmnopqrstuvwxyz", 9))
	assert.Equal(t, 9, len([]rune(Clip("水路水路水路水路水路水路", 9))))
}

func TestMarkdown(t *testing.T) {
	assert.Equal(t, `\[click\]\(http\[:\]//evil\)`, Markdown("[click](http://evil)"))
	assert.Equal(t, `&lt;https\[:\]//evil&gt;`, Markdown("<https://evil>"))
	assert.Equal(t, `www\[.\]evil.com`, Markdown("www.evil.com"))
	assert.Equal(t, `a\[@\]b.com`, Markdown("a@b.com"))
	assert.Equal(t, `\!\[x\]\(y\) \| \*b\* \_i\_ \`+"`"+`c\`+"`", Markdown("![x](y) | *b* _i_ `c`"))
	assert.Equal(t, `\\x1b\[2J`, Markdown("\x1b[2J"), "renders as the visible escape")
	assert.Equal(t, `row\\nbreak \| cell`, Markdown("row\nbreak | cell"), "a line break cannot end a table row")
	assert.Equal(t, `&amp;lt; &lt;b&gt;`, Markdown("&lt; <b>"))
}

func TestCSVCell(t *testing.T) {
	for _, s := range []string{"=HYPERLINK(\"x\")", "+1+1", "-2+3", "@SUM(A1)", "\tx", "\rx"} {
		assert.Equal(t, "'"+s, CSVCell(s))
	}
	assert.Equal(t, "main", CSVCell("main"))
	assert.Equal(t, "", CSVCell(""))
}
