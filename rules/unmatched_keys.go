package rules

import (
	"fmt"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model"
	suggestpkg "github.com/chanlint/chanlint/model/suggest"
	"github.com/chanlint/chanlint/policies"
)

// The unmatched_selector rule also compares the names a policy block
// writes with the names of the model: the events of an `events` list and
// the lining keys of a per-lining table. A key that names nothing of the
// model while a model event it resembles goes unchecked, or a model lining
// it resembles falls through to the table's default (or to no limit), is
// the silent skip of a renamed event or lining ("Q100" for "q100",
// "Concrete" for "concrete", "concret" for "concrete"): it is reported
// with the unmatched keys, the model's names, and the names that differ
// only in case. Keys that resemble nothing of the model are a policy
// written for other models too, and stay silent.

// eventKeys describes the names of b's events list that match no event of
// m ("" when every name matches), and whether one of them resembles a
// model event that the block then leaves unchecked (a likely rename).
func eventKeys(b *policies.RuleConfig, m *model.Model) (detail string, renamed bool) {
	if b.Events == nil {
		return "", false
	}
	names := make([]string, 0, len(m.Events))
	for _, ev := range m.Events {
		names = append(names, ev.Name)
	}
	var unmatched, unchecked []string
	for _, e := range b.Events {
		if !slices.Contains(names, e) {
			unmatched = append(unmatched, e)
		}
	}
	for _, n := range names {
		if !slices.Contains(b.Events, n) {
			unchecked = append(unchecked, n)
		}
	}
	if len(unmatched) == 0 {
		return "", false
	}
	detail = fmt.Sprintf("its events %s match no event of this model (its events: %s)%s",
		quotedList(unmatched), quotedList(names), caseNotes(unmatched, names))
	if len(unchecked) > 0 {
		detail += fmt.Sprintf("; %s %s not checked by this block", quotedList(unchecked), isAre(len(unchecked)))
	}
	return detail, resembles(unmatched, unchecked)
}

// resembles reports whether some key is a likely misspelling or renaming
// of some name: equal but for case, or within a third of its letters.
func resembles(keys, names []string) bool {
	for _, k := range keys {
		for _, n := range names {
			if strings.EqualFold(k, n) || suggestpkg.Distance(strings.ToLower(k), strings.ToLower(n)) <= max(1, len(n)/3) {
				return true
			}
		}
	}
	return false
}

// liningKeys describes, for each per-lining table of b, the keys that
// match no lining of m when one of them resembles a lining of m that then
// falls through to the table's default (or to no limit).
func liningKeys(b *policies.RuleConfig, linings []string) []string {
	if b.Spec == nil {
		return nil
	}
	var out []string
	for _, set := range b.Spec.Settings {
		if set.Kind != policies.PerLining {
			continue
		}
		t := b.Table(set.Name)
		if !fallsThrough(t, linings) {
			// Every lining of the model has its key: no lining falls
			// through to the default, so there is nothing to report and
			// no need to list the keys.
			continue
		}
		var keys []string
		for k := range t.Values {
			keys = append(keys, k)
		}
		for k := range t.NoLimit {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		var unmatched, fallen []string
		for _, k := range keys {
			if !slices.Contains(linings, k) {
				unmatched = append(unmatched, k)
			}
		}
		for _, l := range linings {
			if !slices.Contains(keys, l) {
				fallen = append(fallen, l)
			}
		}
		if !resembles(unmatched, fallen) {
			continue
		}
		fallback := "the default " + set.Name
		if !t.HasDefault {
			fallback = "no " + set.Name
		}
		out = append(out, fmt.Sprintf("its %s keys %s match no lining of this model (its linings: %s)%s; %s %s %s",
			set.Name, quotedList(unmatched), quotedList(linings), caseNotes(unmatched, linings),
			quotedList(fallen), map[bool]string{true: "gets", false: "get"}[len(fallen) == 1], fallback))
	}
	return out
}

// fallsThrough reports whether some lining of the model has no key in
// the table (neither a value nor null), and so takes its default.
func fallsThrough(t policies.ByLining, linings []string) bool {
	for _, l := range linings {
		_, valued := t.Values[l]
		_, exempt := t.NoLimit[l]
		if !valued && !exempt {
			return true
		}
	}
	return false
}

// caseNotes calls out keys that differ from a model name only in case.
func caseNotes(keys, names []string) string {
	var notes []string
	for _, k := range keys {
		for _, n := range names {
			if k != n && strings.EqualFold(k, n) {
				notes = append(notes, fmt.Sprintf("%q differs from %q only in case", k, n))
			}
		}
	}
	if len(notes) == 0 {
		return ""
	}
	return "; " + strings.Join(notes, ", ") + " (names are case-sensitive)"
}

// quotedList is `"a", "b"`, or "none".
func quotedList(ws []string) string {
	if len(ws) == 0 {
		return "none"
	}
	q := make([]string, len(ws))
	for i, w := range ws {
		q[i] = fmt.Sprintf("%q", w)
	}
	return strings.Join(q, ", ")
}

func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}

// modelLinings are the lining words of a model's sections, sorted, each
// once.
func modelLinings(m *model.Model) []string {
	var linings []string
	for _, s := range m.Sections {
		if s.Lining != "" && !slices.Contains(linings, s.Lining) {
			linings = append(linings, s.Lining)
		}
	}
	slices.Sort(linings)
	return linings
}
