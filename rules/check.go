package rules

import (
	"cmp"
	"slices"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// Check runs the registry over a solved model: the policy is converted to
// the model's units, every configurable rule whose block the policy enables
// runs on the events its `events` filter admits, the always-on rules run on
// every event, contiguous failing points merge into station spans, design
// exceptions are applied (unless the policy denies them) and the findings
// are sorted by file, line, column, rule, reach, event and station, with
// exact duplicates removed.
//
// A nil policy checks only the always-on rules. A nil result (nothing was
// solved) still checks the model's own consistency and its exceptions.
func Check(m *model.Model, res *solver.Result, p *policies.Policy) []Finding {
	if m == nil {
		return nil
	}
	if p == nil {
		p = &policies.Policy{Units: m.Units}
	} else if p.Units != "" && p.Units != m.Units {
		p = p.In(m.Units)
	}
	var found []Finding
	var last *Rule
	for _, r := range All() {
		if r.ID == unusedExceptionID {
			last = r
			continue
		}
		found = run(r, m, res, p, nil, found)
	}
	// The exception rule judges the other rules' findings, so it runs last
	// and exceptions are applied after it has seen them unapplied.
	found = run(last, m, res, p, found, found)
	if p.Exceptions != "deny" {
		applyExceptions(m, found)
	}
	return sortFindings(found)
}

// run executes one rule and appends its findings, filling in what the rule
// leaves to the registry: its id, the severity the policy sets (else the
// rule's default), the model file and the policy reference.
func run(r *Rule, m *model.Model, res *solver.Result, p *policies.Policy, prior, out []Finding) []Finding {
	cfg := p.Rules[r.ID]
	if !r.AlwaysOn && cfg == nil {
		return out
	}
	ctx := &Context{Model: m, Result: res, Policy: p, Config: cfg, Findings: prior}
	r.Check(ctx, func(f Finding) {
		f.Rule = r.ID
		if f.Severity.Rank() == 0 {
			f.Severity = r.Severity
			if cfg != nil && cfg.Severity.Rank() > 0 {
				f.Severity = cfg.Severity
			}
		}
		if f.File == "" {
			f.File = m.File
		}
		if cfg != nil && f.Reference == "" {
			f.Reference = p.Reference
		}
		out = append(out, f)
	})
	return out
}

// events are the event results a rule runs on: all of them for an
// always-on rule, those its block's `events` filter admits otherwise.
func (c *Context) events() []*solver.EventResult {
	if c.Result == nil {
		return nil
	}
	var out []*solver.EventResult
	for _, ev := range c.Result.Events {
		if ev == nil || ev.Event == nil {
			continue
		}
		if c.Config == nil || c.Config.AppliesTo(ev.Event.Name) {
			out = append(out, ev)
		}
	}
	return out
}

// reaches are the reach results of an event that carry a reach.
func reaches(ev *solver.EventResult) []*solver.ReachResult {
	out := make([]*solver.ReachResult, 0, len(ev.Reaches))
	for _, rr := range ev.Reaches {
		if rr != nil && rr.Reach != nil {
			out = append(out, rr)
		}
	}
	return out
}

// units is the model's unit system (SI when unset).
func (c *Context) units() model.Units {
	if c.Model != nil && c.Model.Units == model.US {
		return model.US
	}
	return model.SI
}

// cmpFindings orders findings by file, line, column, rule, reach, event,
// station span and message.
func cmpFindings(a, b Finding) int {
	return cmp.Or(
		cmp.Compare(a.File, b.File),
		cmp.Compare(a.Range.Start.Line, b.Range.Start.Line),
		cmp.Compare(a.Range.Start.Column, b.Range.Start.Column),
		cmp.Compare(a.Rule, b.Rule),
		cmp.Compare(a.Reach, b.Reach),
		cmp.Compare(a.Event, b.Event),
		cmp.Compare(a.FromStation, b.FromStation),
		cmp.Compare(a.ToStation, b.ToStation),
		cmp.Compare(a.Message, b.Message),
	)
}

// sortFindings orders findings by file, line, column, rule, reach, event
// and station span (then message, so that the order is total) and removes
// exact duplicates.
func sortFindings(fs []Finding) []Finding {
	if len(fs) < 2 {
		return fs
	}
	// Sort pointers rather than the findings themselves: a Finding is a few
	// hundred bytes, and a stable sort moves elements many times.
	order := make([]*Finding, len(fs))
	for i := range fs {
		order[i] = &fs[i]
	}
	slices.SortStableFunc(order, func(a, b *Finding) int { return cmpFindings(*a, *b) })
	out := make([]Finding, 0, len(fs))
	for i, f := range order {
		if i == 0 || *f != *order[i-1] { // drop exact duplicates, as slices.Compact does
			out = append(out, *f)
		}
	}
	return out
}

// eachReach calls fn for every reach result of every event the rule runs on.
func (c *Context) eachReach(fn func(ev *solver.EventResult, rr *solver.ReachResult)) {
	if c.Result == nil {
		return
	}
	// The same filters as events and reaches, without building the slices:
	// every rule walks every reach of every event.
	for _, ev := range c.Result.Events {
		if ev == nil || ev.Event == nil || (c.Config != nil && !c.Config.AppliesTo(ev.Event.Name)) {
			continue
		}
		for _, rr := range ev.Reaches {
			if rr != nil && rr.Reach != nil {
				fn(ev, rr)
			}
		}
	}
}

// scanPoints judges every computed point of every reach the rule runs on,
// merges the failing points into spans (see scan) and hands each span to
// emit.
func (c *Context) scanPoints(w worse, judge judgeFunc,
	emit func(ev *solver.EventResult, rr *solver.ReachResult, s span)) {
	c.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		for _, s := range scan(rr, w, judge, reachBlock, &c.verdict) {
			emit(ev, rr, s)
		}
	})
}
