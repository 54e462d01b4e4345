package main

import (
	"bytes"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/fatih/color"
	"github.com/hashicorp/hcl/v2"
)

// palette holds the colours of text output. Every colour is switched on or
// off explicitly, so concurrent runs never depend on fatih/color's global
// switch.
type palette struct {
	place, rule, dim, bold *color.Color
	err, warn, info        *color.Color
	caret                  *color.Color
}

func newPalette(on bool) *palette {
	mk := func(attrs ...color.Attribute) *color.Color {
		c := color.New(attrs...)
		if on {
			c.EnableColor()
		} else {
			c.DisableColor()
		}
		return c
	}
	return &palette{
		place: mk(color.Bold),
		rule:  mk(color.FgMagenta),
		dim:   mk(color.Faint),
		bold:  mk(color.Bold),
		err:   mk(color.FgRed, color.Bold),
		warn:  mk(color.FgYellow, color.Bold),
		info:  mk(color.FgCyan, color.Bold),
		caret: mk(color.FgGreen, color.Bold),
	}
}

// severity colours a severity word.
func (p *palette) severity(s policies.Severity) string {
	switch s {
	case policies.Error:
		return p.err.Sprint(string(s))
	case policies.Warning:
		return p.warn.Sprint(string(s))
	case policies.Info:
		return p.info.Sprint(string(s))
	}
	return string(s)
}

// useColor resolves --color: the flag when it is "always" or "never", else
// NO_COLOR (set and not empty turns colour off), else whether the output
// is a terminal.
func (a *app) useColor(flagValue string, tty bool) bool {
	switch flagValue {
	case "always":
		return true
	case "never":
		return false
	}
	if a.getenv("NO_COLOR") != "" {
		return false
	}
	return tty
}

// gnuPrefix is the FILE:LINE:COLUMN: prefix of a position; the line and
// column are left out when the range has none.
func gnuPrefix(file string, r hcl.Range) string {
	if r.Start.Line <= 0 {
		return file + ":"
	}
	col := max(r.Start.Column, 1)
	return fmt.Sprintf("%s:%d:%d:", file, r.Start.Line, col)
}

// snippet renders the source line of r with a caret line under the range:
//
//	12 |   widht = 3
//	   |   ^^^^^
//
// It returns "" when the source or the line is not available. Columns are
// counted in runes on the printed line, so carets stay under multi-byte
// text; a range that runs over several lines is underlined to the end of
// its first line.
func snippet(src []byte, r hcl.Range, p *palette) string {
	if len(src) == 0 || r.Start.Line <= 0 {
		return ""
	}
	line, lineStart, ok := sourceLine(src, r.Start.Line)
	if !ok {
		return ""
	}
	line = strings.ReplaceAll(line, "\t", " ")
	startByte := r.Start.Byte - lineStart
	if startByte < 0 || startByte > len(line) || r.Start.Byte == 0 && r.Start.Line > 1 {
		// No byte offset recorded: fall back to the column.
		startByte = byteOfColumn(line, r.Start.Column)
	}
	endByte := len(line)
	if r.End.Line == r.Start.Line && r.End.Byte > r.Start.Byte {
		endByte = min(len(line), startByte+(r.End.Byte-r.Start.Byte))
	}
	// The line is a submittal's text: control characters, escapes and
	// bidi overrides are made visible, and a long line is cut to an
	// excerpt around the range, so the carets stay under what they mark.
	pre := []rune(safetext.Text(line[:startByte]))
	mid := []rune(safetext.Text(line[startByte:endByte]))
	post := []rune(safetext.Text(line[endByte:]))
	pre, mid, post = excerpt(pre, mid, post)
	lead := len(pre)
	width := max(1, len(mid))
	num := fmt.Sprintf("%d", r.Start.Line)
	pad := strings.Repeat(" ", len(num))
	var b strings.Builder
	fmt.Fprintf(&b, "  %s | %s%s%s\n", p.dim.Sprint(num), string(pre), string(mid), string(post))
	fmt.Fprintf(&b, "  %s | %s%s\n", pad, strings.Repeat(" ", lead), p.caret.Sprint(strings.Repeat("^", width)))
	return b.String()
}

// Bounds of a source excerpt under a diagnostic, in runes.
const (
	excerptWidth  = 160 // the whole excerpt
	excerptBefore = 40  // context kept before the marked range
)

// excerpt cuts a line, split into the text before, inside and after the
// marked range, to at most excerptWidth runes around the range; a cut is
// marked with "…".
func excerpt(pre, mid, post []rune) ([]rune, []rune, []rune) {
	if len(pre)+len(mid)+len(post) <= excerptWidth {
		return pre, mid, post
	}
	if len(pre) > excerptBefore {
		pre = append([]rune("…"), pre[len(pre)-excerptBefore+1:]...)
	}
	if room := excerptWidth - len(pre); len(mid) > room {
		mid = append(mid[:room-1:room-1], '…')
		return pre, mid, nil
	}
	if room := excerptWidth - len(pre) - len(mid); len(post) > room {
		post = append(post[:max(0, room-1):max(0, room-1)], '…')
	}
	return pre, mid, post
}

// sourceLine returns line n (1-based) of src without its line ending, and
// the byte offset where it starts.
func sourceLine(src []byte, n int) (string, int, bool) {
	start := 0
	for i := 1; i < n; i++ {
		j := bytes.IndexByte(src[start:], '\n')
		if j < 0 {
			return "", 0, false
		}
		start += j + 1
	}
	end := len(src)
	if j := bytes.IndexByte(src[start:], '\n'); j >= 0 {
		end = start + j
	}
	return strings.TrimRight(string(src[start:end]), "\r"), start, true
}

// byteOfColumn converts a 1-based rune column to a byte offset in line.
func byteOfColumn(line string, col int) int {
	i := 0
	for k := 1; k < col && i < len(line); k++ {
		_, size := utf8.DecodeRuneInString(line[i:])
		i += size
	}
	return i
}

// writeDiagnostics prints HCL diagnostics (of a policy or a command-line
// input) in the GNU layout with a source snippet. files holds the parsed
// files by the name in the diagnostics' ranges; the printed name is made
// relative to the working directory.
func (a *app) writeDiagnostics(w io.Writer, diags hcl.Diagnostics, files map[string]*hcl.File, p *palette) {
	for _, d := range diags {
		sev := policies.Error
		if d.Severity == hcl.DiagWarning {
			sev = policies.Warning
		}
		var r hcl.Range
		file := ""
		if d.Subject != nil {
			r = *d.Subject
			file = r.Filename
		}
		msg := d.Summary
		if d.Detail != "" {
			msg += ": " + d.Detail
		}
		shown := file
		if filepath.IsAbs(file) {
			shown = a.display(file)
		}
		if shown == "" {
			shown = "chanlint"
		}
		fmt.Fprintf(w, "%s %s: %s\n", p.place.Sprint(gnuPrefix(safetext.Text(shown), r)), p.severity(sev), safetext.Text(msg))
		if f := files[file]; f != nil {
			fmt.Fprint(w, snippet(f.Bytes, r, p))
		}
	}
}

// textWidth is the width the text output is laid out for: a finding's
// first line keeps its message short, and continuation lines wrap here.
const textWidth = 120

// writeFindingText prints one finding: a first line in the GNU layout with
// the place (reach, event, stations) before the message, and the remedy
// on an indented continuation line:
//
//	FILE:LINE:COL: SEVERITY: [rule] reach R, event E, stations a–b m: message
//	    remedy: what to change
//
// LINE and COL are those of the attribute that matters when the rule names
// one (the section's height for freeboard), else of the block. A finding
// covered by a design exception takes the word "excepted" where the
// severity stands, so that editors and CI annotations do not flag it,
// followed by its own severity, and the exception's reason on a
// continuation line:
//
//	FILE:LINE:COL: excepted: [rule] error, reach R, ...: message
//	    exception: reason
//
// Findings of invalid files (rule `model`) are followed by the source
// snippet of their range.
func writeFindingText(w io.Writer, f *rules.Finding, src []byte, unit string, p *palette) {
	head := f.Where(unit)
	if f.Excepted {
		head = strings.TrimSuffix(string(f.Severity)+", "+head, ", ")
	}
	if head != "" {
		head += ": "
	}
	// Names, messages and reasons carry a submittal's text.
	head, msg := safetext.Text(head), safetext.Text(f.Message)
	place := p.place.Sprint(gnuPrefix(safetext.Text(f.File()), f.Pos()))
	rule := p.rule.Sprint("[" + f.Rule + "]")
	if f.Excepted {
		reason := safetext.Text(f.ExceptionReason)
		if reason == "" {
			reason = "covered by a design exception"
		}
		fmt.Fprintf(w, "%s %s: %s %s\n", place, p.dim.Sprint("excepted"), rule, p.dim.Sprint(head+msg))
		writeContinuation(w, "exception", reason, p)
		if f.Remedy != "" {
			writeContinuation(w, "remedy", safetext.Text(f.Remedy), p)
		}
		if f.Envelope != nil {
			writeContinuation(w, "envelope", f.Envelope.Text(), p)
		}
		writeRelated(w, f, p)
		return
	}
	fmt.Fprintf(w, "%s %s: %s %s%s\n", place, p.severity(f.Severity), rule, head, msg)
	if f.Remedy != "" {
		writeContinuation(w, "remedy", safetext.Text(f.Remedy), p)
	}
	if f.Section != "" {
		writeContinuation(w, "criterion", safetext.Text(f.Reference), p)
	}
	if f.Envelope != nil {
		writeContinuation(w, "envelope", f.Envelope.Text(), p)
	}
	writeRelated(w, f, p)
	if f.Rule == "model" {
		fmt.Fprint(w, snippet(src, f.Range, p))
	}
}

// writeRelated prints the related places of a finding as notes, one a
// line: "    see: limit freeboard.minimum at team.policy.hcl:7:13".
func writeRelated(w io.Writer, f *rules.Finding, p *palette) {
	for _, r := range f.Related {
		at := strings.TrimSuffix(gnuPrefix(safetext.Text(r.Range.Filename), r.Range), ":")
		writeContinuation(w, "see", r.Label+" at "+at, p)
	}
}

// writeContinuation prints "    label: text" wrapped at textWidth, the
// lines after the first indented under the text.
func writeContinuation(w io.Writer, label, text string, p *palette) {
	lead := "    " + label + ": "
	indent := strings.Repeat(" ", len(lead))
	for i, line := range wrapWords(text, textWidth-len(lead)) {
		if i == 0 {
			fmt.Fprintf(w, "    %s %s\n", p.dim.Sprint(label+":"), line)
			continue
		}
		fmt.Fprintf(w, "%s%s\n", indent, line)
	}
}

// wrapWords breaks text at spaces into lines of at most width runes; a
// word longer than width gets a line of its own.
func wrapWords(text string, width int) []string {
	var lines []string
	var cur strings.Builder
	n := 0
	for _, word := range strings.Fields(text) {
		wl := utf8.RuneCountInString(word)
		if n > 0 && n+1+wl > width {
			lines = append(lines, cur.String())
			cur.Reset()
			n = 0
		}
		if n > 0 {
			cur.WriteByte(' ')
			n++
		}
		cur.WriteString(word)
		n += wl
	}
	if n > 0 {
		lines = append(lines, cur.String())
	}
	return lines
}

// plural is "1 error", "2 errors".
func plural(n int, one, many string) string {
	if n == 1 {
		return fmt.Sprintf("%d %s", n, one)
	}
	return fmt.Sprintf("%d %s", n, many)
}

// policyLine describes the policy in force for the closing lines of the
// text output.
func (a *app) policyLine(pol *policies.Policy, info policyInfo) string {
	where := a.policySource(pol)
	line := fmt.Sprintf("policy: %s (%s)", pol.Title(), where)
	if info.Reference != "" {
		line += " — " + info.Reference
	} else if !isPack(pol.File) {
		line += " — extends the " + info.Pack + " pack; no reference of its own"
	}
	return safetext.Text(line)
}

// policySource is where a policy came from, as printed: the relative path
// of its file, or "built-in pack".
func (a *app) policySource(pol *policies.Policy) string {
	switch {
	case strings.HasPrefix(pol.File, "pack:"):
		return "built-in pack"
	case filepath.IsAbs(pol.File):
		return a.display(pol.File)
	case pol.File == "":
		return "built-in pack"
	}
	return pol.File
}
