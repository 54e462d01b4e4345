package rules

import "strings"

// Doc is a rule's documentation in parts. Each part is prose that may hold
// several paragraphs; Formula's lines indented by four spaces are printed
// as they are. The settings are not written here: Text renders them from
// the rule's spec.
type Doc struct {
	// Checks is what the rule checks and where a finding points.
	Checks string
	// Formula is the computation, with its symbols; "none" and why for a
	// rule that computes nothing.
	Formula string
	// SettingsNote completes the generated settings paragraph (optional).
	SettingsNote string
	// Basis is why the limit is what it is, naming its published sources
	// in the prose.
	Basis string
	// Sources are the citations of Basis, one per line: a published source,
	// "common practice (no published source)", or a citation marked
	// "(from memory)".
	Sources []string
	// Remedies are the usual ways of fixing a finding.
	Remedies string
}

// Text is the documentation of r as `chanlint explain` prints it: the
// parts in order, each introduced by its name, the settings generated from
// the spec; an empty part is left out.
func (r *Rule) Text() string {
	var parts []string
	add := func(name, text string) {
		if text = strings.TrimSpace(text); text != "" {
			parts = append(parts, name+": "+text)
		}
	}
	add("What it checks", r.Doc.Checks)
	if f := strings.TrimRight(r.Doc.Formula, " \n"); strings.HasPrefix(f, "    ") {
		parts = append(parts, "Formula:\n"+f)
	} else {
		add("Formula", f)
	}
	parts = append(parts, r.SettingsText())
	add("Basis", r.Doc.Basis)
	if len(r.Doc.Sources) > 0 {
		parts = append(parts, "Sources:\n  - "+strings.Join(r.Doc.Sources, "\n  - "))
	}
	add("Remedies", r.Doc.Remedies)
	return strings.Join(parts, "\n\n") + "\n"
}

// SettingsText is the paragraph on the rule's policy settings, from its
// spec.
func (r *Rule) SettingsText() string {
	var b strings.Builder
	switch {
	case r.AlwaysOn:
		b.WriteString("Settings: none; the rule cannot be turned off.")
	case len(r.Settings) == 0:
		b.WriteString("Settings: none besides severity, events and enabled.")
	default:
		b.WriteString("Settings (besides severity, events and enabled):")
		for i := range r.Settings {
			b.WriteString("\n  - " + r.Settings[i].Line())
		}
		for _, g := range r.Together {
			b.WriteString("\n  - " + g.String())
		}
	}
	if r.Doc.SettingsNote != "" {
		b.WriteString("\n" + r.Doc.SettingsNote)
	}
	return b.String()
}
