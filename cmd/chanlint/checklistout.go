package main

import (
	"io"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/checklist"
)

// writeChecklist writes the coverage matrix of the run (check --format
// checklist or checklist-csv): every reach × event × criterion of every
// model with its status and citation, and the SHA-256 of each model and
// each policy file of the extends chain.
func (c *checkRun) writeChecklist(w io.Writer, csv bool) error {
	d := c.checklist()
	if csv {
		return checklist.WriteCSV(w, d)
	}
	return checklist.WriteMarkdown(w, d)
}

// checklist builds the document from the run's results (which keep each
// model, its solution and its source for this output).
func (c *checkRun) checklist() *checklist.Doc {
	pol := c.policy
	d := &checklist.Doc{Policy: pol.Title(), Reference: pol.Reference, Exceptions: pol.Exceptions,
		Policies: checklist.PolicyInputs(pol, c.app.display)}
	// A baseline hides known findings from the other outputs, never from
	// the checklist: a known failure is still a failure.
	for _, r := range c.results {
		m := checklist.Model{File: r.File.Name, Invalid: r.Invalid || r.Model == nil}
		if r.Src != nil {
			m.SHA256 = checklist.Hash(r.Src)
		}
		if !m.Invalid {
			m.Rows = checklist.Build(r.Model, r.Solution, pol, r.Findings)
		}
		d.Models = append(d.Models, m)
	}
	return d
}
