package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"regexp"
	"strings"

	suggestpkg "github.com/chanlint/chanlint/model/suggest"
)

// choice is a string flag restricted to a fixed set of words; a wrong word
// is a command-line error that names the accepted ones.
type choice struct {
	allowed []string
	value   string
}

func newChoice(def string, allowed ...string) *choice {
	return &choice{allowed: allowed, value: def}
}

func (c *choice) String() string { return c.value }

func (c *choice) Set(s string) error {
	for _, w := range c.allowed {
		if s == w {
			c.value = s
			return nil
		}
	}
	msg := "must be one of " + strings.Join(c.allowed, ", ")
	if hint := suggest(s, c.allowed); hint != "" {
		msg += fmt.Sprintf(" (did you mean %q?)", hint)
	}
	return errors.New(msg)
}

// newFlagSet returns a flag set that reports nothing by itself: parse
// errors and -h are handled by parseFlags.
func newFlagSet(name string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	return fs
}

// parseFlags parses args with fs, allowing flags after positional arguments
// (`chanlint check models --format json`). A lone "--" ends the flags: every
// argument after it is positional.
func parseFlags(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	rest := args
	for {
		if err := fs.Parse(rest); err != nil {
			return nil, err
		}
		left := fs.Args()
		if len(left) == 0 {
			return pos, nil
		}
		consumed := len(rest) - len(left)
		if consumed > 0 && rest[consumed-1] == "--" && !flagTakesValue(fs, rest, consumed-1) {
			return append(pos, left...), nil
		}
		pos = append(pos, left[0])
		rest = left[1:]
	}
}

// flagTakesValue reports whether args[i] is the separate value of the flag
// just before it (as in `--event --`), rather than a "--" terminator.
func flagTakesValue(fs *flag.FlagSet, args []string, i int) bool {
	if i == 0 {
		return false
	}
	prev := args[i-1]
	if !strings.HasPrefix(prev, "-") || strings.Contains(prev, "=") {
		return false
	}
	f := fs.Lookup(strings.TrimLeft(prev, "-"))
	if f == nil {
		return false
	}
	if b, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && b.IsBoolFlag() {
		return false
	}
	return true
}

// flagUsage renders the options of fs, one per line: `--name VALUE  text
// (default: x)`.
func flagUsage(fs *flag.FlagSet) string {
	type row struct{ left, right string }
	var rows []row
	width := 0
	// A one-letter flag whose usage is "short for --NAME" is shown on the
	// row of NAME.
	short := map[string]string{}
	fs.VisitAll(func(f *flag.Flag) {
		if long, ok := strings.CutPrefix(f.Usage, "short for --"); ok && len(f.Name) == 1 {
			short[long] = f.Name
		}
	})
	fs.VisitAll(func(f *flag.Flag) {
		if strings.HasPrefix(f.Usage, "short for --") && len(f.Name) == 1 {
			return
		}
		name, usage := flag.UnquoteUsage(f)
		left := "--" + f.Name
		if s, ok := short[f.Name]; ok {
			left = "-" + s + ", " + left
		}
		if c, ok := f.Value.(*choice); ok {
			left += " " + strings.Join(c.allowed, "|")
		} else if name != "" {
			left += " " + name
		}
		if f.DefValue != "" && f.DefValue != "0" && f.DefValue != "false" {
			usage += " (default " + f.DefValue + ")"
		}
		rows = append(rows, row{left, usage})
		width = max(width, len(left))
	})
	var b strings.Builder
	for _, r := range rows {
		fmt.Fprintf(&b, "  %-*s  %s\n", width, r.left, r.right)
	}
	return b.String()
}

// flagError prints a command-line error of command cmd and returns the exit
// code: 0 after printing the usage for -h, 2 otherwise.
func (a *app) flagError(c *command, fs *flag.FlagSet, err error) int {
	if errors.Is(err, flag.ErrHelp) {
		fmt.Fprint(a.stdout, c.help(a))
		return exitOK
	}
	return a.usageError(c, "%s", flagErrorText(fs, err))
}

// Messages of the flag package, which name flags with one dash.
var (
	flagUndefined = regexp.MustCompile(`^flag provided but not defined: -+(.*)$`)
	flagNamed     = regexp.MustCompile(`(for flag|value:) -+([A-Za-z][\w-]*)`)
)

// flagErrorText rewrites an error of the flag package the way the usage
// spells options, with two dashes ("--format"), and suggests the option
// an unknown one was probably meant to be.
func flagErrorText(fs *flag.FlagSet, err error) string {
	msg := err.Error()
	if m := flagUndefined.FindStringSubmatch(msg); m != nil {
		text := "unknown option " + dashes(m[1])
		if fs != nil {
			var names []string
			fs.VisitAll(func(f *flag.Flag) {
				if len(f.Name) > 1 {
					names = append(names, f.Name)
				}
			})
			if s := suggest(strings.SplitN(m[1], "=", 2)[0], names); s != "" {
				text += "; did you mean " + dashes(s) + "?"
			}
		}
		return text
	}
	msg = strings.Replace(msg, "flag needs an argument: -", "option needs a value: -", 1)
	msg = strings.Replace(msg, ": parse error", ": not a whole number", 1)
	return flagNamed.ReplaceAllStringFunc(msg, func(s string) string {
		m := flagNamed.FindStringSubmatch(s)
		if m[1] == "for flag" {
			return "for " + dashes(m[2])
		}
		return m[1] + " " + dashes(m[2])
	})
}

// dashes is the spelling of an option in messages: "--name", or "-j" for
// a one-letter one.
func dashes(name string) string {
	if len([]rune(name)) == 1 {
		return "-" + name
	}
	return "--" + name
}

// usageError prints a command-line mistake and the hint to the usage.
func (a *app) usageError(c *command, format string, args ...any) int {
	fmt.Fprintf(a.stderr, "chanlint %s: %s\n", c.name, fmt.Sprintf(format, args...))
	fmt.Fprintf(a.stderr, "run 'chanlint help %s' for its usage\n", c.name)
	return exitInvalid
}

// suggest returns the candidate that word abbreviates, else the one closest
// to it by edit distance when that is close enough to be a likely typing
// mistake (at most a third of its letters, at least two, and not all of
// them), else "".
func suggest(word string, candidates []string) string {
	if c := suggestpkg.Prefix(word, candidates); c != "" {
		return c // an abbreviation
	}
	n := len([]rune(word))
	return suggestpkg.Closest(word, candidates, min(max(2, n/3), n-1), nil)
}
