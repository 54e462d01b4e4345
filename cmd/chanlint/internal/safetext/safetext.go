// Package safetext neutralises untrusted text (names, titles, reasons and
// source lines of a model or a policy) before it reaches a terminal, a log,
// a Markdown page or a spreadsheet. A submittal must not be able to move
// the cursor, rewrite a line, reorder what a reviewer reads or run a
// formula through the strings it chooses.
package safetext

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// unsafeRune reports whether r must be made visible in text output: C0
// controls (tab, CR and LF included) and DEL, C1 controls (U+0080–U+009F,
// among them the 8-bit CSI), the bidirectional formatting characters
// (embeddings, overrides, isolates and marks), the line and paragraph
// separators, and the Unicode non-characters.
func unsafeRune(r rune) bool {
	switch {
	case r < 0x20, r == 0x7f, 0x80 <= r && r <= 0x9f:
		return true
	case r == 0x061c, r == 0x200e, r == 0x200f, 0x202a <= r && r <= 0x202e, 0x2066 <= r && r <= 0x2069:
		return true // bidi marks, embeddings, overrides, isolates
	case r == 0x2028, r == 0x2029:
		return true // line and paragraph separators
	case 0xfdd0 <= r && r <= 0xfdef, r&0xfffe == 0xfffe:
		return true // non-characters
	}
	return false
}

// Text returns s with every unsafe rune (see unsafeRune) and every byte
// that is not UTF-8 written as a visible escape: \n, \r, \t, \xNN for other
// bytes below 0x80 and invalid bytes, \uNNNN above. Text without them is
// returned as it is, without allocating.
func Text(s string) string {
	i := firstUnsafe(s)
	if i < 0 {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 16)
	b.WriteString(s[:i])
	for i < len(s) {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x80 && unsafeRune(r):
			fmt.Fprintf(&b, `\x%02x`, r)
		case unsafeRune(r):
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}

// Safe reports whether s holds nothing Text would escape.
func Safe(s string) bool { return firstUnsafe(s) < 0 }

func firstUnsafe(s string) int {
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c < 0x20 || c == 0x7f {
				return i
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 || unsafeRune(r) {
			return i
		}
		i += size
	}
	return -1
}

// Clip shortens s to at most n runes, the cut marked with "…" in the
// middle so that both the start and the end of a long name stay visible.
func Clip(s string, n int) string {
	count := utf8.RuneCountInString(s)
	if count <= n || n < 3 {
		return s
	}
	head := (n - 1) / 2
	tail := n - 1 - head
	runes := []rune(s)
	return string(runes[:head]) + "…" + string(runes[count-tail:])
}

// mdReplacer makes text inert in Markdown: HTML is escaped (a renderer
// passes raw HTML through), the characters that start emphasis, code,
// links, images, headings, lists or table cells are backslash-escaped, and
// the starts of autolinks (a URL scheme's "://", "www.", an e-mail's "@")
// are defanged visibly, as "[:]//", "www[.]" and "[@]", since a renderer
// may link them whatever the escapes around them.
var mdReplacer = strings.NewReplacer(
	"&", "&amp;", "<", "&lt;", ">", "&gt;",
	`\`, `\\`, "`", "\\`", "*", `\*`, "_", `\_`, "[", `\[`, "]", `\]`,
	"(", `\(`, ")", `\)`, "|", `\|`, "#", `\#`, "!", `\!`, "~", `\~`,
	"://", `\[:\]//`, "www.", `www\[.\]`, "WWW.", `WWW\[.\]`, "@", `\[@\]`,
)

// Markdown escapes s for the text of a Markdown paragraph or table cell:
// first neutralised by Text (so a line break cannot end a table row), then
// made inert by mdReplacer.
func Markdown(s string) string { return mdReplacer.Replace(Text(s)) }

// CSVCell neutralises a spreadsheet cell: text that begins with '=', '+',
// '-', '@', a tab or a carriage return would run as a formula when the
// file is opened in a spreadsheet, so it is prefixed with an apostrophe.
// A number written by the program (e.g. "-1.5") is not untrusted text and
// does not go through here.
func CSVCell(s string) string {
	if s == "" {
		return s
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		return "'" + s
	}
	return s
}
