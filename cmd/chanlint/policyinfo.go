package main

import (
	"fmt"
	"path/filepath"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
)

// policyInfo is what every output says about where the policy came from
// besides its name: a reviewer must see at a glance when the criteria
// were not the ones chosen on the command line, and when they switch off
// rules of the pack they build on.
type policyInfo struct {
	// Discovered is the printed path of the .chanlint.hcl in force when
	// --policy was not given ("" otherwise).
	Discovered string
	// InTree is true when that file lies inside a checked directory: the
	// files checked chose their own criteria.
	InTree bool
	// Pack is the built-in pack the policy is compared with: the one it
	// extends, else baseline. RulesOff are the rules that pack has on and
	// the policy has off.
	Pack     string
	RulesOff []string
	// Reference is the reference to show: the policy's own, never a
	// pack's reference for a policy that is not that pack.
	Reference string
}

// describePolicy works out the policyInfo of pol, loaded by loadPolicy
// (a.discovered holds a discovered file's path), for a check of paths.
func (a *app) describePolicy(pol *policies.Policy, paths []string) policyInfo {
	info := policyInfo{Reference: pol.Reference}
	if a.discovered != "" {
		info.Discovered = a.display(a.discovered)
		real := a.discovered
		if r, err := filepath.EvalSymlinks(real); err == nil {
			real = r
		}
		for _, p := range orDot(paths) {
			dir := a.abs(p)
			if r, err := filepath.EvalSymlinks(dir); err == nil {
				dir = r
			}
			if within(dir, real) {
				info.InTree = true
			}
		}
	}
	if isPack(pol.File) {
		return info // a pack is its own reference
	}
	info.Pack = "baseline"
	for _, c := range pol.Chain {
		if name, ok := strings.CutPrefix(c, packPrefix); ok {
			info.Pack = name
			break
		}
	}
	pack, diags := rules.Language().NewLoader("").Resolve(packPrefix + info.Pack)
	if pack == nil || diags.HasErrors() {
		return info
	}
	for id := range pack.Rules {
		if _, on := pol.Rules[id]; !on {
			info.RulesOff = append(info.RulesOff, id)
		}
	}
	slices.Sort(info.RulesOff)
	if pol.Reference == pack.Reference {
		info.Reference = "" // inherited: the pack's reference is not this policy's
	}
	return info
}

const packPrefix = "pack:"

func isPack(file string) bool { return file == "" || strings.HasPrefix(file, packPrefix) }

// policyNote is one line about the policy; Warn marks the one a reviewer
// must not miss.
type policyNote struct {
	Text string
	Warn bool
}

// Notes are the lines every output adds under the policy line, in order.
func (p policyInfo) Notes() []policyNote {
	var out []policyNote
	if p.Discovered != "" {
		out = append(out, policyNote{Text: fmt.Sprintf("policy file %s was discovered (no --policy given)", p.Discovered)})
	}
	if p.InTree {
		out = append(out, policyNote{Warn: true, Text: fmt.Sprintf("the checked tree holds its own policy file %s: the files checked chose their own criteria; to screen a submittal against yours, pass --policy", p.Discovered)})
	}
	if len(p.RulesOff) > 0 {
		out = append(out, policyNote{Text: fmt.Sprintf("rules off: %s (on in the %s pack)", strings.Join(p.RulesOff, ", "), p.Pack)})
	}
	return out
}

// NoteTexts are the Notes as plain lines, a warning prefixed "warning: ".
func (p policyInfo) NoteTexts() []string {
	var out []string
	for _, n := range p.Notes() {
		if n.Warn {
			out = append(out, "warning: "+n.Text)
		} else {
			out = append(out, n.Text)
		}
	}
	return out
}
