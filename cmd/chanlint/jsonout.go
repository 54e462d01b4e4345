package main

import (
	"encoding/json"
	"io"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/rules"
)

// checkJSON is the document of `check --format json` (outputs.md). The
// field names of the first release are fixed; fields may be added.
type checkJSON struct {
	Findings []findingJSON `json:"findings"`
	Summary  summaryJSON   `json:"summary"`
	Policy   policyJSON    `json:"policy"`
	Tool     toolJSON      `json:"tool"`
	// StaleEntries are the baseline entries no finding matched, as
	// recorded (only with --baseline).
	StaleEntries []baseline.Entry `json:"stale_entries,omitempty"`
	// NotEvaluated says per checked model what the check did not
	// evaluate (always a list; a file with nothing to say is left out).
	NotEvaluated []notEvaluatedJSON `json:"not_evaluated"`
	Caution      string             `json:"caution"` // last, as in every output
}

// notEvaluatedJSON is what the check of one model did not evaluate.
type notEvaluatedJSON struct {
	File  string   `json:"file"`
	Items []string `json:"items"`
}

// findingJSON is one finding. Numbers that a finding does not have (a
// station span, a measured value) are null.
type findingJSON struct {
	Rule        string   `json:"rule"`
	Severity    string   `json:"severity"`
	Message     string   `json:"message"`
	Remedy      string   `json:"remedy,omitempty"`
	File        string   `json:"file"`
	Line        int      `json:"line"`
	Column      int      `json:"column"`
	EndLine     int      `json:"end_line"`
	EndColumn   int      `json:"end_column"`
	Reach       string   `json:"reach"`
	Event       string   `json:"event"`
	FromStation *float64 `json:"from_station"`
	ToStation   *float64 `json:"to_station"`
	Value       *float64 `json:"value"`
	Limit       *float64 `json:"limit"`
	// Units is the unit of value and limit ("m", "m/s", "N/m²"; "" for a
	// pure number such as the Froude number); null without a value.
	Units           *string `json:"units"`
	Excepted        bool    `json:"excepted"`
	ExceptionReason string  `json:"exception_reason,omitempty"`
	Reference       string  `json:"reference,omitempty"`
	// Baseline is "new" or "worse" (recorded, but much worse) when a
	// --baseline was given; known findings are not listed.
	Baseline string `json:"baseline,omitempty"`
	// Related are the other places that explain the finding: the policy
	// settings that set its limit, the exception that covers it.
	Related []relatedJSON `json:"related,omitempty"`
	// Envelope is the verdict over a sensitivity run (--vary or the
	// policy's sensitivity block); omitted without one and for findings
	// that do not depend on the flow.
	Envelope *envelopeJSON `json:"envelope,omitempty"`
}

// envelopeJSON is rules.Envelope.
type envelopeJSON struct {
	Verdict string `json:"verdict"` // robust_fail, knife_edge or sensitivity
	Cases   int    `json:"cases"`
	Failing int    `json:"failing"`
	Driver  string `json:"driver,omitempty"`
	Case    string `json:"case,omitempty"`
}

// relatedJSON is one related place: its label and range ("pack:NAME" as
// the file of a built-in pack).
type relatedJSON struct {
	Label     string `json:"label"`
	File      string `json:"file"`
	Line      int    `json:"line"`
	Column    int    `json:"column"`
	EndLine   int    `json:"end_line"`
	EndColumn int    `json:"end_column"`
}

// summaryJSON counts the findings shown; excepted findings are counted
// apart from the severities, as in the text summary.
type summaryJSON struct {
	Files    int `json:"files"`
	Invalid  int `json:"invalid"`
	Errors   int `json:"errors"`
	Warnings int `json:"warnings"`
	Infos    int `json:"infos"`
	Excepted int `json:"excepted"`
	// Known is the number of findings a --baseline file hid (omitted
	// without a baseline).
	Known *int `json:"known,omitempty"`
	// Stale is the number of baseline entries no finding matched
	// (omitted without a baseline); they are listed in stale_entries.
	Stale *int `json:"stale,omitempty"`
}

type policyJSON struct {
	Name      string `json:"name"`
	Reference string `json:"reference"`
	Version   string `json:"version,omitempty"`
	Source    string `json:"source"`
	// Discovered is the path of the .chanlint.hcl applied when no
	// --policy was given ("" otherwise); InCheckedTree is true when it
	// lies inside a checked directory (the files chose their own
	// criteria). RulesOff are the rules on in the pack the policy extends
	// (else baseline) that it turns off. Notes say the same in words.
	Discovered    string   `json:"discovered"`
	InCheckedTree bool     `json:"in_checked_tree"`
	RulesOff      []string `json:"rules_off"`
	Notes         []string `json:"notes"`
}

type toolJSON struct {
	Name    string `json:"name"`
	Version string `json:"version"`
}

func newFindingJSON(f *rules.Finding) findingJSON {
	pos := f.Pos()
	j := findingJSON{
		Rule:            f.Rule,
		Severity:        string(f.Severity),
		Message:         f.Message,
		Remedy:          f.Remedy,
		File:            f.File(),
		Line:            pos.Start.Line,
		Column:          pos.Start.Column,
		EndLine:         pos.End.Line,
		EndColumn:       pos.End.Column,
		Reach:           f.Reach,
		Event:           f.Event,
		Excepted:        f.Excepted,
		ExceptionReason: f.ExceptionReason,
		Reference:       f.Reference,
	}
	if j.EndLine < j.Line {
		j.EndLine, j.EndColumn = j.Line, j.Column
	}
	for _, r := range f.Related {
		j.Related = append(j.Related, relatedJSON{Label: r.Label, File: r.Range.Filename,
			Line: r.Range.Start.Line, Column: r.Range.Start.Column, EndLine: r.Range.End.Line, EndColumn: r.Range.End.Column})
	}
	if f.HasSpan {
		j.FromStation, j.ToStation = numfmt.JSON(f.FromStation), numfmt.JSON(f.ToStation)
	}
	if e := f.Envelope; e != nil {
		j.Envelope = &envelopeJSON{Verdict: e.Verdict, Cases: e.Cases, Failing: e.Failing, Driver: e.Driver, Case: e.Case}
	}
	if f.HasValue {
		j.Value, j.Limit = numfmt.JSON(f.Value), numfmt.JSON(f.Limit)
		u := f.Unit
		j.Units = &u
	}
	return j
}

func (c *checkRun) writeJSON(w io.Writer) error {
	t := c.tally()
	doc := checkJSON{
		Findings: []findingJSON{},
		Summary: summaryJSON{
			Files: t.files, Invalid: t.invalid, Errors: t.errors,
			Warnings: t.warnings, Infos: t.infos, Excepted: t.excepted,
		},
		Policy: policyJSON{
			Name:          c.policy.Name,
			Reference:     c.info.Reference,
			Version:       c.policy.Version,
			Source:        c.app.policySource(c.policy),
			Discovered:    c.info.Discovered,
			InCheckedTree: c.info.InTree,
			RulesOff:      append([]string{}, c.info.RulesOff...),
			Notes:         append([]string{}, c.info.NoteTexts()...),
		},
		Caution:      rules.Caution,
		Tool:         toolJSON{Name: "chanlint", Version: toolVersion()},
		NotEvaluated: []notEvaluatedJSON{},
	}
	for _, r := range c.results {
		if len(r.NotEvaluated) > 0 {
			doc.NotEvaluated = append(doc.NotEvaluated, notEvaluatedJSON{File: r.File.Name, Items: r.NotEvaluated})
		}
	}
	if c.baselinePath != "" {
		k, s := c.view.Known, len(c.view.Stale)
		doc.Summary.Known, doc.Summary.Stale = &k, &s
		doc.StaleEntries = c.view.Stale
	}
	for _, r := range c.results {
		fs := c.shown[r.File.Name]
		for i := range fs {
			j := newFindingJSON(&fs[i])
			if c.view.Marks != nil {
				switch c.view.Marks[r.File.Name][i].State {
				case baseline.Worse:
					j.Baseline = "worse"
				case baseline.New:
					j.Baseline = "new"
				}
			}
			doc.Findings = append(doc.Findings, j)
		}
	}
	return writeIndentedJSON(w, doc)
}

// writeIndentedJSON writes v as indented JSON without HTML escaping,
// followed by a newline.
func writeIndentedJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
