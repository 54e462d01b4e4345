package main

import (
	"fmt"
	"sort"
	"strings"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
)

func policyCommand() *command {
	return &command{
		name:    "policy",
		summary: "list the built-in policy packs, or show an effective policy",
		run:     func(a *app, args []string) int { return a.runPolicy(args) },
		help: func(*app) string {
			return `usage: chanlint policy list
       chanlint policy show [FILE|PACK]

list  prints the policy packs built into chanlint, one per line, with their
      units, the rules they switch on and their reference.
show  prints the effective policy after every 'extends' is merged, as
      policy-language HCL. Without an argument it shows the policy that
      'chanlint check' would use here: the nearest ` + configName + ` up to
      the repository root, else the baseline pack.

exit status: 0; 2 for an unknown pack, an invalid policy file or a wrong
command line.
`
		},
	}
}

func (a *app) runPolicy(args []string) int {
	c := findCommand("policy")
	fs := newFlagSet("policy")
	colorFlag := newChoice("auto", "auto", "always", "never")
	fs.Var(colorFlag, "color", "colour the diagnostics of an invalid policy")
	pos, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if len(pos) == 0 {
		return a.usageError(c, "expected 'list' or 'show'")
	}
	switch pos[0] {
	case "list":
		if len(pos) > 1 {
			return a.usageError(c, "'policy list' takes no argument, got %q", pos[1])
		}
		return a.listPacks()
	case "show":
		if len(pos) > 2 {
			return a.usageError(c, "'policy show' takes at most one FILE or PACK")
		}
		arg := ""
		if len(pos) == 2 {
			arg = pos[1]
		}
		pol, ok := a.loadPolicy(arg, newPalette(a.useColor(colorFlag.value, a.stderrTTY)))
		if !ok {
			return exitInvalid
		}
		out := policies.Format(pol)
		a.stdout.Write(out)
		if len(out) > 0 && out[len(out)-1] != '\n' {
			fmt.Fprintln(a.stdout)
		}
		return exitOK
	}
	msg := fmt.Sprintf("unknown subcommand %q", pos[0])
	if s := suggest(pos[0], []string{"list", "show"}); s != "" {
		msg += fmt.Sprintf("; did you mean %q?", s)
	}
	return a.usageError(c, "%s", msg)
}

func (a *app) listPacks() int {
	names := policies.PackNames()
	width := 0
	for _, n := range names {
		width = max(width, len(n))
	}
	status := exitOK
	fmt.Fprintln(a.stdout, "built-in policy packs (use with --policy NAME, or extends = \"NAME\" in a policy):")
	for _, n := range names {
		p, diags := rules.Language().Pack(n)
		if p == nil || diags.HasErrors() {
			fmt.Fprintf(a.stdout, "  %-*s  (does not load: %s)\n", width, n, diags.Error())
			status = exitInvalid
			continue
		}
		var ids []string
		for id := range p.Rules {
			ids = append(ids, id)
		}
		sort.Strings(ids)
		desc := p.Reference
		if desc == "" {
			desc = p.Name
		}
		fmt.Fprintf(a.stdout, "  %-*s  %s  %s\n", width, n, p.Units, desc)
		if len(ids) > 0 {
			fmt.Fprintf(a.stdout, "  %-*s      rules: %s\n", width, "", strings.Join(ids, ", "))
		}
	}
	return status
}
