package hclkit

import (
	"bytes"
	"fmt"
	"unicode"
	"unicode/utf8"

	"github.com/hashicorp/hcl/v2"
)

// Bounds of the pre-scan (see CheckNesting) that every file shares; those
// that depend on the language are a ScanBounds. A model or a policy holds
// only literals, so no valid file comes near them; they stop a file that
// would drive the HCL parser into deep recursion, large memory or time
// out of proportion to its size.
const (
	// MaxNesting bounds brackets, braces, parentheses, strings, signs and
	// conditionals nested in one another.
	MaxNesting = 64
	// MaxChain bounds a run of traversal, index and splat steps
	// (a.b[0].*…) and of binary operators in one expression.
	MaxChain = 64
	// MaxInterpolations bounds the ${…} and %{…} of one string.
	MaxInterpolations = 64
	// MaxAdjacent bounds names, numbers and strings that follow one
	// another with nothing between them but spaces (a block type and its
	// labels are the only valid case: two or three of them).
	MaxAdjacent = 8
	// MaxTokens is the token budget of one file. The HCL parser spends
	// about a microsecond and 1.5 KB of memory on each token (a name, a
	// number, a punctuation mark, a line end, a comment, a string counts
	// three), whatever the file holds, so a file within the budget is
	// parsed in well under a second. An [offset, elevation] pair of a
	// points list costs 6 tokens, 7 on a line of its own.
	MaxTokens = 400_000
	// MaxStringPieces bounds the literal pieces of one string. The
	// parser joins the pieces of a string by copying it once per piece,
	// which is quadratic in their number: each line of a heredoc is a
	// piece, and so are a $ or % sign that starts no interpolation and
	// the text after it (two).
	MaxStringPieces = 128
	// MaxNumberBytes bounds the length of a number literal: the parser's
	// decimal conversion is quadratic in it.
	MaxNumberBytes = 64
	// MaxTextBytes bounds the text of all strings and heredocs of one
	// file together. The parser spends on every byte of a string (it
	// measures columns in grapheme clusters, then normalises the text),
	// whatever the token count: 4 MiB of text in one string costs more
	// than a file at the token budget. Names, titles and reasons need a
	// small part of it.
	MaxTextBytes = 1 << 20
)

// ScanBounds are the bounds of the pre-scan that a language sets from its
// own limits.
type ScanBounds struct {
	// Items bounds the elements of one list, object, block body or
	// argument list: more than any limit of the language allows.
	Items int
	// TopItems bounds the lines of the top level (blocks and
	// arguments): more than every block limit together allows.
	TopItems int
	// Invalid bounds the characters, escape sequences and unterminated
	// strings of one file that are not valid HCL. The parser reports
	// each of them; past the diagnostics shown none would be.
	Invalid int
}

// Problem is what the pre-scan found beyond a bound.
type Problem int

// Problems found by the pre-scan.
const (
	ScanOK Problem = iota
	ScanNested
	ScanChain
	ScanItems
	ScanTemplate
	ScanAdjacent
	ScanTokens
	ScanPieces
	ScanNumber
	ScanInvalid
	ScanEncoding
	ScanHeredoc
	ScanText
)

// CheckNesting is the cheap pre-scan that runs before the HCL parser on
// every untrusted file (models and policies alike). It returns an error
// diagnostic at the first construct beyond a bound, and nothing otherwise:
// nesting deeper than MaxNesting, a chain of traversals, splats, index
// expressions or binary operators longer than MaxChain, a list, object or
// body of more than bounds.Items elements, a string of more than
// MaxInterpolations interpolations or MaxStringPieces pieces, a number
// literal longer than MaxNumberBytes, more than bounds.Invalid invalid
// characters, the byte where the text of its strings exceeds
// MaxTextBytes, and the token where the file exceeds MaxTokens. The scan is
// linear in the size of the file and allocates only its bracket stack.
func CheckNesting(filename string, src []byte, bounds ScanBounds) hcl.Diagnostics {
	pos, problem, _ := Scan(src, bounds)
	if problem == ScanOK {
		return nil
	}
	p := PosAt(src, pos)
	var summary, detail string
	switch problem {
	case ScanNested:
		summary = "Too deeply nested"
		detail = fmt.Sprintf("Brackets, strings, signs or conditionals nest more than %d deep here; a file needs only a few levels.", MaxNesting)
	case ScanChain:
		summary = "Expression too long"
		detail = fmt.Sprintf("More than %d attribute, index or splat steps or operators follow one another here; a file holds only literal values (numbers, strings, lists, objects).", MaxChain)
	case ScanItems:
		summary = "Too many items"
		detail = fmt.Sprintf("A list, object or block here holds more than %d elements (the top level more than %d blocks and arguments), more than any limit allows; split the model.", bounds.Items, bounds.TopItems)
	case ScanAdjacent:
		summary = "Not a model"
		detail = fmt.Sprintf("More than %d names, numbers or strings follow one another here with nothing between them; this is not HCL a model or policy can hold.", MaxAdjacent)
	case ScanTokens:
		summary = "File too dense"
		detail = fmt.Sprintf("The file reaches its budget of %d tokens (names, numbers, punctuation, line ends, comments; a string counts three) here. Split it into several files, or use fewer points per section: each [offset, elevation] pair costs 6 tokens, 7 on a line of its own.", MaxTokens)
	case ScanPieces:
		summary = "String in too many pieces"
		detail = fmt.Sprintf("A string here has more than %d pieces (each heredoc line is one, each $ or %% sign that starts no interpolation two); keep a title or reason to a few lines.", MaxStringPieces)
	case ScanNumber:
		summary = "Number too long"
		detail = fmt.Sprintf("A number here is written with more than %d characters; write it with fewer digits or an exponent (1.5e-3).", MaxNumberBytes)
	case ScanEncoding:
		summary = "Not UTF-8 text"
		detail = "The byte here is not UTF-8; a model or policy file is UTF-8 text (save it as UTF-8)."
	case ScanHeredoc:
		summary = "Unsupported heredoc"
		detail = "The marker of this heredoc is not a plain ASCII name, or not followed by the line end; write it as <<EOT (or <<-EOT) at the end of the line."
	case ScanText:
		summary = "Too much text"
		detail = fmt.Sprintf("The strings and heredocs of the file hold more than %d MiB of text up to here; names, titles and reasons need far less. Shorten the long texts, or keep notes in comments.", MaxTextBytes>>20)
	case ScanInvalid:
		summary = "Too many invalid characters"
		detail = fmt.Sprintf("More than %d characters, escape sequences or unterminated strings of the file up to here are not valid HCL; this is not a model or policy file.", bounds.Invalid)
	default:
		summary = "Too many interpolations"
		detail = fmt.Sprintf("A string here holds more than %d ${…} or %%{…} sequences; a file holds only literal text.", MaxInterpolations)
	}
	return hcl.Diagnostics{{
		Severity: hcl.DiagError,
		Summary:  summary,
		Detail:   detail,
		Subject:  &hcl.Range{Filename: filename, Start: p, End: p},
	}}
}

// Tokens is the number of tokens the pre-scan counts in src: at least the
// HCL lexer's, up to the first construct CheckNesting rejects, so at most
// MaxTokens+1. What parsing src costs in time and memory grows with it.
func Tokens(src []byte, bounds ScanBounds) int {
	_, _, n := Scan(src, bounds)
	return n
}

// Scan scans src for constructs that the HCL parser handles by
// recursion, or with memory or time out of proportion to a literal-only
// file, and reports the offset of the first one beyond a bound (see
// CheckNesting): brackets, braces and parentheses, quoted strings and
// heredocs with the template interpolations inside them, runs of prefix
// operators (- and !), conditional operators (?), chains of traversal,
// index and splat steps and of binary operators, the elements of one
// bracket, the interpolations and literal pieces of one string, number
// literals, invalid characters and escapes, and the tokens of the file.
// The parser's recursion, and so its stack, then stays bounded: a file of
// a million "[" or ".*" would otherwise overflow the stack, which no
// recover() can catch; and its time and memory stay linear in a bounded
// number of tokens.
//
// The scan follows HCL's lexical rules for comments, strings, escapes,
// numbers and heredocs, so that brackets written inside text or comments
// do not count. It counts tokens as the HCL lexer makes them, or a few
// more (a two-character operator counts two, an empty string three), and
// returns their number (up to the problem, if any).
func Scan(src []byte, bounds ScanBounds) (off int, problem Problem, tokens int) {
	const (
		bracket = iota
		quoted
		interp
		heredoc
	)
	type frame struct {
		kind   int
		marker []byte // closing marker of a heredoc
		items  int    // separators seen in a bracket
		interp int    // interpolations of a string
		pieces int    // literal pieces of a string
		brace  bool   // a { } (newlines separate items), not [ ] or ( )
		open   byte   // the opening bracket: '[', '(' or '{'
	}
	stack := []frame{{kind: bracket, brace: true}} // the file's top-level body
	prefix, questions := 0, 0
	// chain counts the steps and operators of the current expression;
	// value is true when the last token ends a value (a name, a number,
	// a closing bracket or quote), so that "." and "[" after it are steps;
	// item is true when something was written since the last separator.
	chain, value, item := 0, false, false
	adjacent := 0 // names, numbers and strings in a row
	invalid := 0
	text := 0  // bytes inside strings and heredocs
	tokens = 1 // the end of the file
	// lineComment is true after a # or // comment: the line end belongs
	// to the comment's token.
	lineComment := false
	n := len(src)
	if !utf8.Valid(src) {
		// The lexer's reading of broken UTF-8 follows no rule this scan
		// could keep in step with (a bad byte can swallow a quote).
		i := 0
		for !badUTF8(src[i:]) {
			_, size := utf8.DecodeRune(src[i:])
			i += size
		}
		return i, ScanEncoding, tokens
	}
	for i := 0; i < n; i++ {
		c := src[i]
		top := &stack[len(stack)-1]
		if top.kind == quoted || top.kind == heredoc {
			text++
			if top.kind == heredoc && (i == 0 || src[i-1] == '\n') {
				tokens++ // a line, or the closing marker
				end := i + bytes.IndexByte(src[i:], '\n')
				if end < i {
					end = n
				}
				if bytes.Equal(bytes.TrimSpace(src[i:end]), top.marker) {
					stack = stack[:len(stack)-1]
					value = true
					i = end - 1
					if tokens > MaxTokens {
						return i, ScanTokens, tokens
					}
					continue
				}
				top.pieces++
			}
			switch {
			case top.kind == quoted && c == '\\':
				if !validEscape(src, i) {
					invalid++
				}
				if i+1 < n && src[i+1] != '\n' && src[i+1] != '\r' {
					_, size := utf8.DecodeRune(src[i+1:])
					i += size // the escaped character (a line end is not escaped)
				}
			case top.kind == quoted && c == '"':
				tokens++
				stack = stack[:len(stack)-1]
				value = true
			case top.kind == quoted && c == '\n':
				// A line end in a quoted string is an error of its own; as
				// for the lexer, the string goes on to the next quote.
				invalid++
				tokens += 2 // the line end, and the text after it
			case (c == '$' || c == '%') && i+2 < n && src[i+1] == c && src[i+2] == '{':
				tokens += 2 // $${ and %%{ are literal text: a piece, and the text after it
				top.pieces += 2
				i += 2
			case (c == '$' || c == '%') && i+1 < n && src[i+1] == '{':
				if top.interp++; top.interp > MaxInterpolations {
					return i, ScanTemplate, tokens
				}
				tokens++
				top.pieces++
				stack = append(stack, frame{kind: interp, brace: true})
				chain, value, adjacent = 0, false, 0
				i++
			case c == '$' || c == '%':
				tokens += 2 // the sign and the text after it
				top.pieces += 2
			case c == '\r':
				tokens += 2 // a token of its own, and the text after it
				top.pieces += 2
			}
			switch {
			case len(stack) > MaxNesting+1:
				return i, ScanNested, tokens
			case top.pieces > MaxStringPieces:
				return i, ScanPieces, tokens
			case text > MaxTextBytes:
				return i, ScanText, tokens
			case tokens > MaxTokens:
				return i, ScanTokens, tokens
			case invalid > bounds.Invalid:
				return i, ScanInvalid, tokens
			}
			continue
		}
		switch c {
		case ' ', '\t', '\r':
			continue
		case '-', '!':
			prefix++
		default:
			prefix = 0
		}
		if c != '\n' || !lineComment {
			tokens++
		}
		lineComment = false
		wasValue := value
		value = false
		if comment := c == '#' || c == '/' && i+1 < n && (src[i+1] == '/' || src[i+1] == '*'); c != '\n' && !comment {
			item = true // a comment alone makes no item
		}
		if c == '"' || '0' <= c && c <= '9' || isIdentByte(c) || c >= 0x80 {
			if adjacent++; adjacent > MaxAdjacent {
				return i, ScanAdjacent, tokens
			}
		} else {
			adjacent = 0
		}
		switch c {
		case '\n':
			if top.brace {
				chain = 0
				if item {
					item = false
					limit := bounds.Items
					if len(stack) == 1 {
						limit = bounds.TopItems // the top level: blocks and arguments
					}
					if top.items++; top.items > limit {
						return i, ScanItems, tokens
					}
				}
			}
			value = wasValue && !top.brace
		case ',':
			chain, item = 0, false
			if top.items++; top.items > bounds.Items {
				return i, ScanItems, tokens
			}
		case '=', ':':
			if i+1 < n && src[i+1] == '=' || c == '=' && i > 0 && (src[i-1] == '!' || src[i-1] == '<' || src[i-1] == '>' || src[i-1] == '=') {
				chain++ // ==, !=, <=, >=
				break
			}
			chain = 0
		case '+', '*', '/', '%', '>', '&', '|', '-':
			if c == '/' && i+1 < n && (src[i+1] == '/' || src[i+1] == '*') {
				break // a comment, below
			}
			if c == '*' && i > 0 && src[i-1] == '.' {
				value = true // a splat step, counted at the "."
				break
			}
			if c == '-' && !wasValue {
				break // a sign, counted in prefix
			}
			chain++
		case '.':
			if wasValue {
				chain++ // a traversal or splat step
			}
		case '"':
			tokens++ // the text of the string
			stack = append(stack, frame{kind: quoted, pieces: 1})
		case '#':
			for i < n && src[i] != '\n' {
				i++
			}
			i--
			lineComment = true
		case '?':
			questions++
		case '[', '{', '(':
			if c == '[' && wasValue {
				chain++ // an index or splat step
			}
			stack = append(stack, frame{kind: bracket, brace: c == '{', open: c})
		case ']', ')':
			// Only its own bracket: a stray one closes nothing (the
			// count stays on the safe side).
			if top.kind == bracket && (top.open == '[') == (c == ']') && !top.brace && len(stack) > 1 {
				stack = stack[:len(stack)-1]
			}
			value = true
		case '}':
			// As for the lexer, which counts braces only: a } closes the
			// innermost { or interpolation, and the [ and ( left open
			// inside it. The scan then leaves an interpolation where the
			// lexer does, and so reads strings where it does.
			j := len(stack) - 1
			for j > 0 && stack[j].kind == bracket && !stack[j].brace {
				j--
			}
			if j > 0 {
				if stack[j].kind == interp {
					tokens++ // the text after the interpolation
				}
				stack = stack[:j]
			}
			value = true
		case '@', '$', '\\', 0x7f:
			invalid++
		default:
			switch {
			case '0' <= c && c <= '9':
				end := skipNumber(src, i)
				if end-i > MaxNumberBytes {
					return i, ScanNumber, tokens
				}
				i = end - 1
				value = true
			case isIdentByte(c) || c >= 0x80:
				end := skipName(src, i)
				if end == i {
					invalid++ // a character that starts no name
					_, size := utf8.DecodeRune(src[i:])
					end = i + size
				}
				// Each other character of a name counts as a token: the
				// lexer's Unicode tables may end a name earlier than this
				// scan's and make the rest tokens of their own.
				for _, b := range src[i+1 : end] {
					if utf8.RuneStart(b) && b >= 0x80 {
						tokens++
					}
				}
				i = end - 1
				value = true
			case c < 0x20:
				invalid++ // a control character
			}
		}
		if c == '/' && i+1 < n && src[i+1] == '/' {
			for i < n && src[i] != '\n' {
				i++
			}
			i--
			lineComment = true
		} else if c == '/' && i+1 < n && src[i+1] == '*' {
			// An unclosed /* is no comment for the lexer but a / and a *:
			// what follows is read as code.
			if end := bytes.Index(src[i+2:], []byte("*/")); end >= 0 {
				i += 2 + end + 1
			}
		} else if c == '<' {
			marker, next, ok := heredocStart(src, i)
			switch {
			case ok && marker == nil:
				return i, ScanHeredoc, tokens
			case ok:
				stack = append(stack, frame{kind: heredoc, marker: marker})
				i = next - 1
			default:
				chain++
			}
		}
		switch {
		case len(stack) > MaxNesting+1 || prefix > MaxNesting || questions > MaxNesting:
			return i, ScanNested, tokens
		case chain > MaxChain:
			return i, ScanChain, tokens
		case tokens > MaxTokens:
			return i, ScanTokens, tokens
		case invalid > bounds.Invalid:
			return i, ScanInvalid, tokens
		}
	}
	return 0, ScanOK, tokens
}

// badUTF8 reports whether src starts with a byte that begins no valid
// UTF-8 encoding.
func badUTF8(src []byte) bool {
	r, size := utf8.DecodeRune(src)
	return r == utf8.RuneError && size == 1
}

// validEscape reports whether the backslash at src[i] of a quoted string
// starts one of HCL's escape sequences: \n, \r, \t, \", \\, \u with four
// hexadecimal digits, \U with eight.
func validEscape(src []byte, i int) bool {
	if i+1 >= len(src) {
		return false
	}
	digits := 0
	switch src[i+1] {
	case 'n', 'r', 't', '"', '\\':
		return true
	case 'u':
		digits = 4
	case 'U':
		digits = 8
	default:
		return false
	}
	if i+2+digits > len(src) {
		return false
	}
	for _, h := range src[i+2 : i+2+digits] {
		if !('0' <= h && h <= '9' || 'a' <= h && h <= 'f' || 'A' <= h && h <= 'F') {
			return false
		}
	}
	return true
}

// skipName returns the offset just past the name at src[i]: letters,
// digits, marks, "_" and "-" (i itself when src[i] starts no name).
func skipName(src []byte, i int) int {
	for j := i; j < len(src); {
		c := src[j]
		if isIdentByte(c) || j > i && (c == '-' || '0' <= c && c <= '9') {
			j++
			continue
		}
		if c < 0x80 {
			return j
		}
		r, size := utf8.DecodeRune(src[j:])
		if !nameRune(r) || j == i && !unicode.IsLetter(r) && !unicode.Is(unicode.Nl, r) {
			return j
		}
		j += size
	}
	return len(src)
}

// nameRune reports whether r may continue a name (Unicode's identifier
// characters, approximately: letters, digits, marks, connectors).
func nameRune(r rune) bool {
	return unicode.In(r, unicode.L, unicode.Nd, unicode.Nl, unicode.Mn, unicode.Mc, unicode.Pc)
}

// skipNumber returns the offset just past the number literal at src[i]
// (digits, a fraction, an exponent with its sign).
func skipNumber(src []byte, i int) int {
	digits := func(i int) int {
		for i < len(src) && '0' <= src[i] && src[i] <= '9' {
			i++
		}
		return i
	}
	i = digits(i)
	if i+1 < len(src) && src[i] == '.' && '0' <= src[i+1] && src[i+1] <= '9' {
		i = digits(i + 1)
	}
	if i < len(src) && (src[i] == 'e' || src[i] == 'E') {
		j := i + 1
		if j < len(src) && (src[j] == '+' || src[j] == '-') {
			j++
		}
		if j < len(src) && '0' <= src[j] && src[j] <= '9' {
			i = digits(j)
		}
	}
	return i
}

// heredocStart recognises `<<MARKER` or `<<-MARKER` at src[i] followed by
// a line end (LF or CR LF), and returns the marker and the offset of the
// line end. A marker that holds a non-ASCII character is reported as a
// heredoc with a nil marker: the lexer's Unicode names may or may not
// make it one, and this scan must not guess differently.
func heredocStart(src []byte, i int) ([]byte, int, bool) {
	j := i + 2
	if j > len(src) || src[i+1] != '<' {
		return nil, 0, false
	}
	if j < len(src) && src[j] == '-' {
		j++
	}
	start := j
	for j < len(src) && (isIdentByte(src[j]) || (j > start && (src[j] == '-' || '0' <= src[j] && src[j] <= '9'))) {
		j++
	}
	if j < len(src) && src[j] >= 0x80 {
		return nil, j, true
	}
	if j == start || j >= len(src) {
		return nil, 0, false
	}
	if src[j] == '\n' || src[j] == '\r' && j+1 < len(src) && src[j+1] == '\n' {
		return src[start:j], j, true
	}
	return nil, 0, false
}

func isIdentByte(c byte) bool {
	return c == '_' || 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z'
}

// PosAt converts a byte offset to a position (columns count bytes, which is
// exact for the ASCII punctuation this is used on).
func PosAt(src []byte, off int) hcl.Pos {
	p := hcl.Pos{Line: 1, Column: 1, Byte: off}
	for _, c := range src[:off] {
		if c == '\n' {
			p.Line++
			p.Column = 1
		} else if c&0xC0 != 0x80 {
			p.Column++
		}
	}
	return p
}
