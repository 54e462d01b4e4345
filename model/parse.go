package model

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclparse"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// Suffix is the file name suffix of a channel model.
const Suffix = ".chan.hcl"

// Limits for untrusted input. A model beyond any of them is rejected with a
// diagnostic before anything is computed.
const (
	MaxFileSize  = 4 << 20 // bytes
	MaxSections  = 2000
	MaxReaches   = 10000
	MaxPoints    = 5000 // per points section
	MaxEvents    = 200
	MaxSegments  = 1000  // per reach
	MaxStructure = 10000 // gates, basins, bends and exceptions, each
	MaxNesting   = 64    // brackets, braces and parentheses
	// MaxDiagnostics is the number of problems reported for one file; the
	// rest are summed up in one last diagnostic.
	MaxDiagnostics = 1000
)

// Load reads a model file (at most MaxFileSize bytes) and decodes it with
// Parse.
func Load(filename string) (*Model, hcl.Diagnostics) {
	src, diags := ReadFile(filename)
	if diags.HasErrors() {
		return nil, diags
	}
	return Parse(filename, src)
}

// ReadFile reads a model file with the size limit of Load. Callers that
// render diagnostics with source snippets use it with Parse to keep the
// bytes of a file that fails to decode.
func ReadFile(filename string) ([]byte, hcl.Diagnostics) {
	start := hcl.Range{Filename: filepath.ToSlash(filename), Start: hcl.InitialPos, End: hcl.InitialPos}
	var d diagnoser
	src, err := safefile.Read(filename, MaxFileSize)
	if err != nil {
		summary, detail := "Cannot read model", err.Error()
		switch {
		case errors.Is(err, fs.ErrNotExist):
			detail = "The file does not exist; check the path."
		case errors.Is(err, fs.ErrPermission):
			detail = "Permission denied; check the file's permissions."
		case errors.Is(err, safefile.ErrTooLarge):
			summary = "Model file too large"
			detail = fmt.Sprintf("The file is larger than %d MiB; split the network into smaller models.", MaxFileSize>>20)
		case errors.Is(err, safefile.ErrNotRegular):
			// Refused before opening: a FIFO or a device is never read.
			detail = fmt.Sprintf("%s is %s; a model is a regular %s file.", filename, strings.TrimPrefix(err.Error(), safefile.ErrNotRegular.Error()+": "), Suffix)
		default:
			var pe *fs.PathError
			if errors.As(err, &pe) {
				detail = pe.Err.Error()
			}
		}
		d.Errorf(start, summary, "%s", detail)
		return nil, d.Diags
	}
	return src, nil
}

// Parse decodes and validates one model. The model is nil whenever the
// diagnostics hold an error; every problem of the file is reported in one
// call. Warnings may accompany a valid model.
func Parse(filename string, src []byte) (*Model, hcl.Diagnostics) {
	m, diags := parse(filepath.ToSlash(filename), src)
	hclkit.SortByPosition(diags)
	return m, hclkit.Bound(diags, DiagnosticLimits)
}

// Bounds of the text of one file's diagnostics, so that a 4 MiB file
// cannot print gigabytes: each summary and detail is shortened (names
// quoted in a message can be long), and past MaxDiagnosticBytes in all, or
// MaxDiagnostics in number, the rest are counted in one last diagnostic.
const (
	MaxSummaryBytes    = 200
	MaxDetailBytes     = 1000
	MaxDiagnosticBytes = 256 << 10
)

// DiagnosticLimits are the bounds above as hclkit.Bound takes them, for
// the diagnostics of one model or policy file.
var DiagnosticLimits = hclkit.Limits{Count: MaxDiagnostics, Summary: MaxSummaryBytes, Detail: MaxDetailBytes, Bytes: MaxDiagnosticBytes}

func parse(filename string, src []byte) (*Model, hcl.Diagnostics) {
	start := hcl.Range{Filename: filename, Start: hcl.InitialPos, End: hcl.InitialPos}
	var d diagnoser
	if len(src) > MaxFileSize {
		d.Errorf(start, "Model file too large", "The file is larger than %d MiB; split the network into smaller models.", MaxFileSize>>20)
		return nil, d.Diags
	}
	if diags := CheckNesting(filename, src); diags.HasErrors() {
		return nil, diags
	}
	file, diags := hclparse.NewParser().ParseHCL(src, filename)
	if diags.HasErrors() {
		return nil, diags
	}
	d.Diags = diags
	return decode(filename, src, file, &d)
}

// decode runs the passes after the parser over file, the syntax tree of
// src, adding to what d holds.
func decode(filename string, src []byte, file *hcl.File, d *diagnoser) (*Model, hcl.Diagnostics) {
	d.src = src
	m := &Model{File: filename, Source: src}
	dec := &decoder{diagnoser: d, m: m}
	// Decoding and reference checks run together so that one run reports
	// both kinds of problem; the graph needs a clean file.
	dec.root(file.Body)
	dec.resolve()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	dec.network()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	dec.culvertLevels()
	dec.events()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	return m, d.Diags
}

// Bounds of the pre-scan (see CheckNesting) besides MaxNesting. A model
// holds only literals, so no valid file comes near them; they stop a file
// that would drive the HCL parser into deep recursion, large memory or
// time out of proportion to its size.
const (
	// MaxChain bounds a run of traversal, index and splat steps
	// (a.b[0].*…) and of binary operators in one expression.
	MaxChain = 64
	// MaxItems bounds the elements of one list, object, block body or
	// argument list: more than any limit of the model allows (points,
	// inflow entries, segments). The top level is bounded by the block
	// limits instead.
	MaxItems = 2 * MaxReaches
	// MaxInterpolations bounds the ${…} and %{…} of one string.
	MaxInterpolations = 64
	// MaxAdjacent bounds names, numbers and strings that follow one
	// another with nothing between them but spaces (a block type and its
	// labels are the only valid case: two or three of them).
	MaxAdjacent = 8
	// MaxTopItems bounds the lines of the top level (blocks and
	// arguments): more than every block limit together allows.
	MaxTopItems = MaxSections + MaxReaches + MaxEvents + 6*MaxStructure + 64
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
	// MaxInvalid bounds the characters, escape sequences and unterminated
	// strings of one file that are not valid HCL. The parser reports
	// each of them; past MaxDiagnostics none would be shown anyway.
	MaxInvalid = MaxDiagnostics
)

// Problems found by the pre-scan.
const (
	scanOK = iota
	scanNested
	scanChain
	scanItems
	scanTemplate
	scanAdjacent
	scanTokens
	scanPieces
	scanNumber
	scanInvalid
)

// CheckNesting is the cheap pre-scan that runs before the HCL parser on
// every untrusted file (models and policies alike). It returns an error
// diagnostic at the first construct beyond a bound, and nothing otherwise:
// nesting deeper than MaxNesting, a chain of traversals, splats, index
// expressions or binary operators longer than MaxChain, a list, object or
// body of more than MaxItems elements, a string of more than
// MaxInterpolations interpolations or MaxStringPieces pieces, a number
// literal longer than MaxNumberBytes, more than MaxInvalid invalid
// characters, and the token where the file exceeds MaxTokens. The scan is
// linear in the size of the file and allocates only its bracket stack.
func CheckNesting(filename string, src []byte) hcl.Diagnostics {
	pos, problem, _ := preScan(src)
	if problem == scanOK {
		return nil
	}
	p := posAt(src, pos)
	var summary, detail string
	switch problem {
	case scanNested:
		summary = "Too deeply nested"
		detail = fmt.Sprintf("Brackets, strings, signs or conditionals nest more than %d deep here; a file needs only a few levels.", MaxNesting)
	case scanChain:
		summary = "Expression too long"
		detail = fmt.Sprintf("More than %d attribute, index or splat steps or operators follow one another here; a file holds only literal values (numbers, strings, lists, objects).", MaxChain)
	case scanItems:
		summary = "Too many items"
		detail = fmt.Sprintf("A list, object or block here holds more than %d elements (the top level more than %d blocks and arguments), more than any limit allows; split the model.", MaxItems, MaxTopItems)
	case scanAdjacent:
		summary = "Not a model"
		detail = fmt.Sprintf("More than %d names, numbers or strings follow one another here with nothing between them; this is not HCL a model or policy can hold.", MaxAdjacent)
	case scanTokens:
		summary = "File too dense"
		detail = fmt.Sprintf("The file reaches its budget of %d tokens (names, numbers, punctuation, line ends, comments; a string counts three) here. Split it into several files, or use fewer points per section: each [offset, elevation] pair costs 6 tokens, 7 on a line of its own.", MaxTokens)
	case scanPieces:
		summary = "String in too many pieces"
		detail = fmt.Sprintf("A string here has more than %d pieces (each heredoc line is one, each $ or %% sign that starts no interpolation two); keep a title or reason to a few lines.", MaxStringPieces)
	case scanNumber:
		summary = "Number too long"
		detail = fmt.Sprintf("A number here is written with more than %d characters; write it with fewer digits or an exponent (1.5e-3).", MaxNumberBytes)
	case scanInvalid:
		summary = "Too many invalid characters"
		detail = fmt.Sprintf("More than %d characters, escape sequences or unterminated strings of the file up to here are not valid HCL; this is not a model or policy file.", MaxInvalid)
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
func Tokens(src []byte) int {
	_, _, n := preScan(src)
	return n
}

// preScan scans src for constructs that the HCL parser handles by
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
func preScan(src []byte) (off, problem, tokens int) {
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
	tokens = 1 // the end of the file
	// lineComment is true after a # or // comment: the line end belongs
	// to the comment's token.
	lineComment := false
	n := len(src)
	for i := 0; i < n; i++ {
		c := src[i]
		top := &stack[len(stack)-1]
		if top.kind == quoted || top.kind == heredoc {
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
						return i, scanTokens, tokens
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
				i++
			case top.kind == quoted && (c == '"' || c == '\n'):
				if c == '\n' {
					invalid++ // an unterminated string
				}
				tokens++
				stack = stack[:len(stack)-1]
				value = true
			case (c == '$' || c == '%') && i+2 < n && src[i+1] == c && src[i+2] == '{':
				tokens += 2 // $${ and %%{ are literal text: a piece, and the text after it
				top.pieces += 2
				i += 2
			case (c == '$' || c == '%') && i+1 < n && src[i+1] == '{':
				if top.interp++; top.interp > MaxInterpolations {
					return i, scanTemplate, tokens
				}
				tokens++
				top.pieces++
				stack = append(stack, frame{kind: interp, brace: true})
				chain, value, adjacent = 0, false, 0
				i++
			case c == '$' || c == '%':
				tokens += 2 // the sign and the text after it
				top.pieces += 2
			}
			switch {
			case len(stack) > MaxNesting+1:
				return i, scanNested, tokens
			case top.pieces > MaxStringPieces:
				return i, scanPieces, tokens
			case tokens > MaxTokens:
				return i, scanTokens, tokens
			case invalid > MaxInvalid:
				return i, scanInvalid, tokens
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
				return i, scanAdjacent, tokens
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
					limit := MaxItems
					if len(stack) == 1 {
						limit = MaxTopItems // the top level: blocks and arguments
					}
					if top.items++; top.items > limit {
						return i, scanItems, tokens
					}
				}
			}
			value = wasValue && !top.brace
		case ',':
			chain, item = 0, false
			if top.items++; top.items > MaxItems {
				return i, scanItems, tokens
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
			stack = append(stack, frame{kind: bracket, brace: c == '{'})
		case ']', ')':
			if top.kind == bracket && len(stack) > 1 {
				stack = stack[:len(stack)-1]
			}
			value = true
		case '}':
			if top.kind == interp {
				tokens++ // the text after the interpolation
			}
			if (top.kind == bracket || top.kind == interp) && len(stack) > 1 {
				stack = stack[:len(stack)-1]
			}
			value = true
		case '@', '$', '\\', 0x7f:
			invalid++
		default:
			switch {
			case '0' <= c && c <= '9':
				end := skipNumber(src, i)
				if end-i > MaxNumberBytes {
					return i, scanNumber, tokens
				}
				i = end - 1
				value = true
			case isIdentByte(c) || c >= 0x80:
				end := skipName(src, i)
				if end == i {
					// A character that starts no name (bad UTF-8 is
					// reported once by the parser, not counted).
					r, size := utf8.DecodeRune(src[i:])
					if r != utf8.RuneError || size != 1 {
						invalid++
					}
					end = i + size
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
			for i += 2; i+1 < n && !(src[i] == '*' && src[i+1] == '/'); i++ {
			}
			i++
		} else if c == '<' {
			if marker, next, ok := heredocStart(src, i); ok {
				stack = append(stack, frame{kind: heredoc, marker: marker})
				i = next - 1
			} else {
				chain++
			}
		}
		switch {
		case len(stack) > MaxNesting+1 || prefix > MaxNesting || questions > MaxNesting:
			return i, scanNested, tokens
		case chain > MaxChain:
			return i, scanChain, tokens
		case tokens > MaxTokens:
			return i, scanTokens, tokens
		case invalid > MaxInvalid:
			return i, scanInvalid, tokens
		}
	}
	return 0, scanOK, tokens
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
// a line end, and returns the marker and the offset of the line end.
func heredocStart(src []byte, i int) ([]byte, int, bool) {
	j := i + 2
	if j > len(src) || src[i+1] != '<' {
		return nil, 0, false
	}
	if j < len(src) && src[j] == '-' {
		j++
	}
	// Only ASCII identifiers are recognised: where this scan does not see
	// a heredoc it counts brackets as code, which can only over-count.
	start := j
	for j < len(src) && (isIdentByte(src[j]) || (j > start && (src[j] == '-' || '0' <= src[j] && src[j] <= '9'))) {
		j++
	}
	if j == start || j >= len(src) || (src[j] != '\n' && src[j] != '\r') {
		return nil, 0, false
	}
	return src[start:j], j, true
}

func isIdentByte(c byte) bool {
	return c == '_' || 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z'
}

// posAt converts a byte offset to a position (columns count bytes, which is
// exact for the ASCII punctuation this is used on).
func posAt(src []byte, off int) hcl.Pos {
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

// decoder turns the HCL body into the model, then resolves references and
// builds the network.
type decoder struct {
	*diagnoser
	m *Model

	sections map[string]*Section
	reaches  map[string]*Reach

	names       map[string][]string // sorted defined names by kind, for suggestions
	suggestions int                 // suggestions searched so far
	cells       int                 // edit-distance work left for suggestions
}

var rootSchema = &hcl.BodySchema{
	Attributes: []hcl.AttributeSchema{
		{Name: "units", Required: true},
		{Name: "title"},
	},
	Blocks: []hcl.BlockHeaderSchema{
		{Type: "section", LabelNames: []string{"name"}},
		{Type: "reach", LabelNames: []string{"name"}},
		{Type: "gate", LabelNames: []string{"name"}},
		{Type: "culvert", LabelNames: []string{"name"}},
		{Type: "basin", LabelNames: []string{"name"}},
		{Type: "bend", LabelNames: []string{"name"}},
		{Type: "event", LabelNames: []string{"name"}},
		{Type: "exception", LabelNames: []string{"rule"}},
		{Type: "loss", LabelNames: []string{"name"}},
	},
}

// blockLimits caps the number of blocks of each type.
var blockLimits = map[string]int{
	"section": MaxSections, "reach": MaxReaches, "event": MaxEvents,
	"gate": MaxStructure, "culvert": MaxStructure, "basin": MaxStructure, "bend": MaxStructure, "exception": MaxStructure,
	"loss": MaxStructure,
}

func (d *decoder) root(body hcl.Body) {
	content, diags := bodyContent(body, rootSchema)
	d.Diags = append(d.Diags, diags...)
	m := d.m
	if a, ok := content.Attributes["units"]; ok {
		m.UnitsRange = a.Expr.Range()
		if s, ok := d.text(a.Expr, plain("units")); ok {
			switch Units(s) {
			case SI, US:
				m.Units = Units(s)
			default:
				d.Errorf(a.Expr.Range(), "Unknown units",
					"units must be \"si\" (metres, m³/s) or \"us\" (feet, ft³/s), not %q.", s)
			}
		}
	}
	if a, ok := content.Attributes["title"]; ok {
		m.Title, _ = d.text(a.Expr, plain("title"))
	}
	count := map[string]int{}
	for _, b := range content.Blocks {
		count[b.Type]++
		if limit := blockLimits[b.Type]; count[b.Type] > limit {
			if count[b.Type] == limit+1 {
				d.Errorf(b.DefRange, "Too many blocks",
					"A model may hold at most %d %s blocks; split the network into several models.", limit, b.Type)
			}
			continue
		}
		switch b.Type {
		case "section":
			m.Sections = append(m.Sections, d.section(b))
		case "reach":
			r := d.reach(b)
			r.Index = len(m.Reaches)
			m.Reaches = append(m.Reaches, r)
		case "gate":
			m.Gates = append(m.Gates, d.gate(b))
		case "culvert":
			m.Culverts = append(m.Culverts, d.culvert(b))
		case "basin":
			m.Basins = append(m.Basins, d.basin(b))
		case "bend":
			m.Bends = append(m.Bends, d.bend(b))
		case "event":
			m.Events = append(m.Events, d.event(b))
		case "exception":
			m.Exceptions = append(m.Exceptions, d.exception(b))
		case "loss":
			m.Losses = append(m.Losses, d.loss(b))
		}
	}
	if count["reach"] == 0 {
		d.Errorf(body.MissingItemRange(), "No reach", "A model needs at least one reach block; add one, e.g. reach \"main\" { from = \"a\" ... }.")
	}
	if count["event"] == 0 {
		d.Errorf(body.MissingItemRange(), "No event", "A model needs at least one event block with the inflows and the outlet control; add one.")
	}
}

// newSrc starts the Src of a block.
func newSrc(b *hcl.Block) Src {
	s := Src{DefRange: b.DefRange, LabelRange: b.DefRange}
	if len(b.LabelRanges) > 0 {
		s.LabelRange = b.LabelRanges[0]
	}
	return s
}

// nameLabels names the name of each labelled block in messages, built
// once rather than for every block.
var nameLabels = func() map[string]label {
	m := map[string]label{}
	for _, b := range rootSchema.Blocks {
		m[b.Type] = plain("The name of a " + b.Type)
	}
	return m
}()

// blockName returns the first label of b, checked.
func (d *decoder) blockName(b *hcl.Block) string {
	if len(b.Labels) == 0 {
		return ""
	}
	what, ok := nameLabels[b.Type]
	if !ok {
		what = plain("The name of a " + b.Type)
	}
	d.checkName(b.Labels[0], b.LabelRanges[0], what)
	return b.Labels[0]
}

// attrSet wraps the attributes of one block for typed access; src keeps
// them for the attributes' value ranges (Src.At).
type attrSet struct {
	d    *decoder
	m    hclsyntax.Attributes // the block's own when it fits its schema (see attrs)
	src  *Src
	what owner // e.g. reach "main"
}

// unitSuffix is " m" or " ft", the length unit as a message puts it
// after a number; a constant, so that decoding builds no string for it.
func (d *decoder) unitSuffix() string {
	if d.m.Units.Length() == "ft" {
		return " ft"
	}
	return " m"
}

// bodyContent is body.Content(schema). A syntax body that holds only
// attributes and blocks the schema names, with the labels it asks for (a
// valid model), is read straight from the syntax tree: the result is the
// same, without the bookkeeping Content does to find what is left over.
// Any other body goes through Content for its diagnostics.
func bodyContent(body hcl.Body, schema *hcl.BodySchema) (*hcl.BodyContent, hcl.Diagnostics) {
	sb, ok := body.(*hclsyntax.Body)
	if !ok || !fits(sb, schema) {
		return body.Content(schema)
	}
	// One allocation for the body's attributes, not one each.
	attrs := make(hcl.Attributes, len(sb.Attributes))
	vals := make([]hcl.Attribute, 0, len(sb.Attributes))
	for name, a := range sb.Attributes {
		vals = append(vals, hcl.Attribute{Name: a.Name, Expr: a.Expr, Range: a.SrcRange, NameRange: a.NameRange})
		attrs[name] = &vals[len(vals)-1]
	}
	return &hcl.BodyContent{Attributes: attrs, Blocks: syntaxBlocks(sb), MissingItemRange: sb.MissingItemRange()}, nil
}

// fits reports whether every attribute and block of sb is one the schema
// names, with as many labels as it asks for, and every attribute the
// schema requires is there (Content would report one that is missing).
func fits(sb *hclsyntax.Body, schema *hcl.BodySchema) bool {
	for _, as := range schema.Attributes {
		if as.Required && sb.Attributes[as.Name] == nil {
			return false
		}
	}
	for name := range sb.Attributes {
		if !slices.ContainsFunc(schema.Attributes, func(as hcl.AttributeSchema) bool { return as.Name == name }) {
			return false
		}
	}
	i := 0 // blocks of one type usually follow one another
	for _, b := range sb.Blocks {
		if i >= len(schema.Blocks) || schema.Blocks[i].Type != b.Type {
			if i = slices.IndexFunc(schema.Blocks, func(bs hcl.BlockHeaderSchema) bool { return bs.Type == b.Type }); i < 0 {
				return false
			}
		}
		if len(b.Labels) != len(schema.Blocks[i].LabelNames) {
			return false
		}
	}
	return true
}

// attrs decodes a block's body against its schema. A body that fits the
// schema (a valid model's) is read from the syntax tree without copying its
// attributes: the attribute set is the body's own map, and only the
// nested blocks are converted (see bodyContent). Any other body goes
// through Content for its diagnostics, and its attributes are taken back
// to their syntax nodes.
func (d *decoder) attrs(b *hcl.Block, schema *hcl.BodySchema, src *Src) (attrSet, *hcl.BodyContent) {
	var m hclsyntax.Attributes
	var content *hcl.BodyContent
	if sb, ok := b.Body.(*hclsyntax.Body); ok && fits(sb, schema) {
		m = sb.Attributes
		content = &hcl.BodyContent{Blocks: syntaxBlocks(sb), MissingItemRange: sb.MissingItemRange()}
	} else {
		var diags hcl.Diagnostics
		content, diags = b.Body.Content(schema)
		d.Diags = append(d.Diags, diags...)
		m = make(hclsyntax.Attributes, len(content.Attributes))
		for name, a := range content.Attributes {
			m[name] = syntaxAttr(a)
		}
	}
	src.syn = m
	what := owner{kind: b.Type}
	if len(b.Labels) > 0 {
		what = ownerOf(b.Type, b.Labels[0])
	}
	return attrSet{d: d, m: m, src: src, what: what}, content
}

// syntaxAttr is the syntax node of an attribute Content returned. A model
// is parsed as native HCL syntax only, so every expression is a syntax
// node; anything else is a programmer's error.
func syntaxAttr(a *hcl.Attribute) *hclsyntax.Attribute {
	expr, ok := a.Expr.(hclsyntax.Expression)
	if !ok {
		panic("model: attribute " + a.Name + " is not native HCL syntax")
	}
	return &hclsyntax.Attribute{Name: a.Name, Expr: expr, SrcRange: a.Range, NameRange: a.NameRange}
}

// syntaxBlocks converts the nested blocks of a syntax body (nil for none)
// as AsHCLBlock does, all in one allocation.
func syntaxBlocks(sb *hclsyntax.Body) hcl.Blocks {
	if len(sb.Blocks) == 0 {
		return nil
	}
	blocks := make(hcl.Blocks, len(sb.Blocks))
	vals := make([]hcl.Block, len(sb.Blocks))
	for i, b := range sb.Blocks {
		vals[i] = hcl.Block{Type: b.Type, Labels: b.Labels, Body: b.Body, DefRange: b.DefRange(), TypeRange: b.TypeRange, LabelRanges: b.LabelRanges}
		blocks[i] = &vals[i]
	}
	return blocks
}

func (a attrSet) has(name string) bool { _, ok := a.m[name]; return ok }

func (a attrSet) number(name string) (float64, bool) {
	at, ok := a.m[name]
	if !ok {
		return 0, false
	}
	return a.d.number(at.Expr, label{attr: name, owner: a.what})
}

func (a attrSet) text(name string) (string, bool) {
	at, ok := a.m[name]
	if !ok {
		return "", false
	}
	return a.d.text(at.Expr, label{attr: name, owner: a.what})
}

func (a attrSet) name(name string) (string, bool) {
	at, ok := a.m[name]
	if !ok {
		return "", false
	}
	return a.d.name(at.Expr, label{attr: name, owner: a.what})
}

// positive decodes a number that must be > 0.
func (a attrSet) positive(name, unit string) (float64, bool) {
	v, ok := a.number(name)
	if !ok {
		return 0, false
	}
	if v <= 0 {
		a.d.Errorf(a.m[name].Expr.Range(), "Value must be positive",
			"%s of %s is %g; it must be greater than 0%s.", name, a.what, v, unit)
		return 0, false
	}
	return v, true
}

// station decodes a station that must be ≥ 0 (the upper bound, the reach
// length, is checked when references are resolved).
func (a attrSet) station(name string) (float64, bool) {
	v, ok := a.number(name)
	if !ok {
		return 0, false
	}
	if v < 0 {
		a.d.Errorf(a.m[name].Expr.Range(), "Station outside the reach",
			"%s of %s is %g; stations run from 0 at the upstream end of the reach to its length.", name, a.what, v)
		return 0, false
	}
	return v, true
}

// missing reports required attributes that were not written.
func (a attrSet) require(body hcl.Body, names ...string) {
	for _, n := range names {
		if !a.has(n) {
			a.d.Errorf(body.MissingItemRange(), "Missing required argument",
				"%s needs %s; add it to the block.", a.what, n)
		}
	}
}
