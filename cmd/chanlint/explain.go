package main

import (
	"fmt"
	"strings"

	"github.com/chanlint/chanlint/rules"
)

func explainCommand() *command {
	return &command{
		name:    "explain",
		summary: "describe a rule: what it checks, its formula, basis and remedies",
		run:     func(a *app, args []string) int { return a.runExplain(args) },
		help: func(*app) string {
			return `usage: chanlint explain [RULE]

With a rule id, prints the rule's title, default severity and documentation:
what it checks, the formula, its published basis and the usual remedies.
Without one, lists every rule.

exit status: 0; 2 for an unknown rule.
`
		},
	}
}

func (a *app) runExplain(args []string) int {
	c := findCommand("explain")
	fs := newFlagSet("explain")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	switch len(pos) {
	case 0:
		a.listRules()
		return exitOK
	case 1:
	default:
		return a.usageError(c, "expected at most one RULE, got %d arguments", len(pos))
	}
	r := rules.Lookup(pos[0])
	if r == nil {
		var ids []string
		for _, r := range rules.All() {
			ids = append(ids, r.ID)
		}
		fmt.Fprintf(a.stderr, "chanlint explain: no rule %q", pos[0])
		if s := suggest(pos[0], ids); s != "" {
			fmt.Fprintf(a.stderr, "; did you mean %q?", s)
		}
		fmt.Fprintf(a.stderr, "\nthe rules are: %s\n", strings.Join(ids, ", "))
		return exitInvalid
	}
	fmt.Fprintf(a.stdout, "%s — %s\n\n", r.ID, r.Title)
	if r.AlwaysOn {
		fmt.Fprintf(a.stdout, "default severity: %s; always on (cannot be switched off by a policy)\n\n", r.Severity)
	} else {
		fmt.Fprintf(a.stdout, "default severity: %s; on when the policy has a %q block\n\n", r.Severity, r.ID)
	}
	fmt.Fprintln(a.stdout, strings.TrimRight(r.Text(), "\n"))
	return exitOK
}

func (a *app) listRules() {
	all := rules.All()
	width := 0
	for _, r := range all {
		width = max(width, len(r.ID))
	}
	fmt.Fprintln(a.stdout, "rules (chanlint explain RULE for the details):")
	for _, r := range all {
		mode := "policy"
		if r.AlwaysOn {
			mode = "always"
		}
		fmt.Fprintf(a.stdout, "  %-*s  %-7s  %-6s  %s\n", width, r.ID, r.Severity, mode, r.Title)
	}
	fmt.Fprintln(a.stdout, "\n'always' rules run on every model; 'policy' rules run when the policy configures them.")
}
