// Package want reads the expectations written in the test files of the
// model, rules and policy goldens: one comment syntax for all three.
//
//	# want[:LABEL] RULE [EVENT FROM..TO] [excepted] ["REGEXP" ...]
//
// A comment that follows code or other text on its line is about that
// line; a comment alone on its line is about the next line that is neither
// blank nor a comment (the header of the block a finding points at).
// Several comments may name the same line, also on one line:
// `# want model "a" # want model "b"` expects two diagnostics. A quoted
// "# want" is prose, not an expectation.
//
//   - RULE is the rule id of the finding; "model" and "policy" for the
//     diagnostics of a model or a policy file.
//   - EVENT FROM..TO, for a finding of a solved model: the event ("-" for
//     none) and the station span ("-..-" for none, "toe..end" for a
//     jump's, which the test checks apart).
//   - excepted: the finding is covered by a design exception.
//   - each "REGEXP" (Go syntax, in double quotes, no escaped quotes) must
//     match the message: a finding's Message, a diagnostic's
//     "Summary; Detail".
//   - LABEL restricts the expectation to the test run of that name (the
//     same model checked under several policies).
//
// The package is for tests only.
package want

import (
	"bufio"
	"bytes"
	"fmt"
	"regexp"
	"strings"

	"github.com/hashicorp/hcl/v2"
)

// Want is one expectation.
type Want struct {
	Label    string
	Rule     string
	Event    string // "" when not given
	From, To string // "" when not given
	Excepted bool
	Patterns []*regexp.Regexp
	// Line is the line the expectation is about; CommentLine the line of
	// the comment.
	Line, CommentLine int
}

// HasSpan reports whether the expectation names an event and a span.
func (w *Want) HasSpan() bool { return w.Event != "" }

// Matches reports whether every pattern matches msg.
func (w *Want) Matches(msg string) bool {
	for _, re := range w.Patterns {
		if !re.MatchString(msg) {
			return false
		}
	}
	return true
}

// String is the expectation as written, for failure messages.
func (w *Want) String() string {
	s := w.Rule
	if w.HasSpan() {
		s += " " + w.Event + " " + w.From + ".." + w.To
	}
	if w.Excepted {
		s += " excepted"
	}
	for _, re := range w.Patterns {
		s += fmt.Sprintf(" %q", re.String())
	}
	return fmt.Sprintf("%s (line %d, comment on line %d)", s, w.Line, w.CommentLine)
}

var (
	comment = regexp.MustCompile(`#\s*want\b`)
	field   = regexp.MustCompile(`"[^"]*"|\S+`)
)

// wantComments are the positions of the want comments of a line: every
// "# want" that is not quoted (prose that shows the syntax quotes it).
func wantComments(line string) [][]int {
	var out [][]int
	for _, loc := range comment.FindAllStringIndex(line, -1) {
		if loc[0] > 0 && line[loc[0]-1] == '"' {
			continue
		}
		out = append(out, loc)
	}
	return out
}

// Parse reads every expectation of src. A malformed comment is an error,
// so that a typing mistake cannot silently drop an expectation.
func Parse(src []byte) ([]Want, error) {
	var out, pending []Want
	sc := bufio.NewScanner(bytes.NewReader(src))
	sc.Buffer(make([]byte, 64<<10), 1<<20)
	n := 0
	for sc.Scan() {
		n++
		line := sc.Text()
		trim := strings.TrimSpace(line)
		if locs := wantComments(line); len(locs) > 0 {
			for i, loc := range locs {
				end := len(line)
				if i+1 < len(locs) {
					end = locs[i+1][0]
				}
				w, err := parseComment(line[loc[1]:end], n)
				if err != nil {
					return nil, err
				}
				if strings.TrimSpace(line[:locs[0][0]]) != "" {
					w.Line = n // after code or prose: about its own line
					out = append(out, w)
				} else {
					pending = append(pending, w)
				}
			}
			continue
		}
		if trim == "" || strings.HasPrefix(trim, "#") || strings.HasPrefix(trim, "//") {
			continue
		}
		for _, w := range pending {
			w.Line = n
			out = append(out, w)
		}
		pending = nil
	}
	if len(pending) > 0 {
		return nil, fmt.Errorf("line %d: a want comment with no line after it", pending[0].CommentLine)
	}
	return out, sc.Err()
}

// parseComment reads the fields after "# want".
func parseComment(rest string, n int) (Want, error) {
	w := Want{CommentLine: n}
	if label, ok := strings.CutPrefix(rest, ":"); ok {
		i := strings.IndexFunc(label, func(r rune) bool { return r == ' ' || r == '\t' })
		if i <= 0 {
			return w, fmt.Errorf("line %d: want comment with an empty label", n)
		}
		w.Label, rest = label[:i], label[i:]
	}
	fields := field.FindAllString(rest, -1)
	var plain []string
	for _, f := range fields {
		if strings.HasPrefix(f, `"`) {
			if len(f) < 2 || !strings.HasSuffix(f, `"`) {
				return w, fmt.Errorf("line %d: unterminated pattern %s", n, f)
			}
			re, err := regexp.Compile(f[1 : len(f)-1])
			if err != nil {
				return w, fmt.Errorf("line %d: %v", n, err)
			}
			w.Patterns = append(w.Patterns, re)
			continue
		}
		if len(w.Patterns) > 0 {
			return w, fmt.Errorf("line %d: %q after a pattern; patterns come last", n, f)
		}
		plain = append(plain, f)
	}
	if len(plain) > 0 && plain[len(plain)-1] == "excepted" {
		w.Excepted, plain = true, plain[:len(plain)-1]
	}
	switch len(plain) {
	case 0:
		return w, fmt.Errorf(`line %d: a want comment names its rule first: # want model "REGEXP" for a model diagnostic, # want policy "REGEXP" for a policy one, # want RULE EVENT FROM..TO for a finding`, n)
	case 1:
		w.Rule = plain[0]
	case 3:
		w.Rule, w.Event = plain[0], plain[1]
		var ok bool
		if w.From, w.To, ok = strings.Cut(plain[2], ".."); !ok || w.From == "" || w.To == "" {
			return w, fmt.Errorf("line %d: span %q is not FROM..TO", n, plain[2])
		}
	default:
		return w, fmt.Errorf("line %d: want RULE [EVENT FROM..TO] [excepted] [\"REGEXP\" ...], got %q", n, strings.TrimSpace(rest))
	}
	return w, nil
}

// Diagnostics matches the error diagnostics of a corpus file against the
// expectations of rule ("model" or "policy") written in it: each error
// must be expected on its line by a want whose patterns match its
// "Summary; Detail", each want must be met, and every diagnostic must
// have a position. It returns a message for every error that no want
// expects, every diagnostic without a position, and
// every want that no error meets; none when the file is as expected.
func Diagnostics(wants []Want, rule string, diags hcl.Diagnostics) []string {
	var problems []string
	met := make([]bool, len(wants))
	for _, d := range diags {
		if d.Subject == nil { // every diagnostic, warnings too, must point somewhere
			problems = append(problems, fmt.Sprintf("%s has no position", d.Summary))
			continue
		}
		if d.Severity != hcl.DiagError {
			continue
		}
		matched := false
		for i := range wants {
			w := &wants[i]
			if w.Rule == rule && w.Line == d.Subject.Start.Line && w.Matches(d.Summary+"; "+d.Detail) {
				met[i], matched = true, true
			}
		}
		if !matched {
			problems = append(problems, fmt.Sprintf("unexpected error at line %d: %s; %s", d.Subject.Start.Line, d.Summary, d.Detail))
		}
	}
	for i := range wants {
		if !met[i] && wants[i].Rule == rule {
			problems = append(problems, "no error for "+wants[i].String())
		}
	}
	return problems
}
