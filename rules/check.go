package rules

import (
	"cmp"
	"iter"
	"slices"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// PolicyFor is p with its numbers in the units of m, or for a nil p an
// empty policy (the always-on rules only) in those units.
func PolicyFor(m *model.Model, p *policies.Policy) *policies.Policy {
	if p == nil {
		return &policies.Policy{Units: m.Units}
	}
	if p.Units != "" && p.Units != m.Units {
		return p.In(m.Units)
	}
	return p
}

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
	return check(m, res, p, false)
}

// check is Check, with every computed point judged when judgeAll is true
// (no run passed by a screen).
func check(m *model.Model, res *solver.Result, p *policies.Policy, judgeAll bool) []Finding {
	if m == nil {
		return nil
	}
	p = PolicyFor(m, p)
	// One runner serves every rule: its report method is bound once, and
	// the findings slice starts large enough for a typical model.
	rn := &runner{m: m, res: res, p: p, out: make([]Finding, 0, 16), shared: getShared()}
	defer putShared(rn.shared)
	rn.shared.judgeAll = judgeAll
	rn.bound = rn.report
	var last *Rule
	for _, r := range All() {
		if r.ID == unusedExceptionID {
			last = r
			continue
		}
		rn.run(r, nil)
	}
	// The exception rule judges the other rules' findings, so it runs last
	// and exceptions are applied after it has seen them unapplied.
	rn.run(last, rn.out)
	found := rn.out
	if p.Exceptions != "deny" {
		applyExceptions(m, found, p)
	}
	return sortFindings(found)
}

// runner executes the rules of one Check in turn and collects their
// findings. It belongs to that call alone, so concurrent Checks share
// nothing.
type runner struct {
	m      *model.Model
	res    *solver.Result
	p      *policies.Policy
	ctx    Context
	rule   *Rule
	cfg    *policies.RuleConfig
	out    []Finding
	bound  func(Finding) // report, bound once
	shared *shared       // the runs of the reach results, shared by the rules
	// The citation and policy places of the block that reported last.
	citedCfg *policies.RuleConfig
	cite     string
	related  []Related
}

// run executes one rule and appends its findings (see report).
func (rn *runner) run(r *Rule, prior []Finding) {
	cfg := rn.p.Rules[r.ID]
	if !r.AlwaysOn && cfg == nil {
		return
	}
	// A rule with several blocks runs once per block, each run on the
	// events and reaches for which that block is the most specific match.
	for _, b := range cfg.Blocks() {
		rn.rule, rn.cfg = r, b
		var head *policies.RuleConfig
		if len(cfg.More) > 0 || b.Selective() {
			head = cfg
		}
		// The span buffer is kept from rule to rule: each rule uses it only
		// while it walks one reach.
		rn.ctx = Context{Model: rn.m, Result: rn.res, Policy: rn.p, Config: b, Findings: prior, spans: rn.ctx.spans[:0], head: head, shared: rn.shared}
		r.Check(&rn.ctx, rn.bound)
	}
	if r.AlwaysOn && cfg == nil {
		rn.rule, rn.cfg = r, nil
		rn.ctx = Context{Model: rn.m, Result: rn.res, Policy: rn.p, Findings: prior, spans: rn.ctx.spans[:0], shared: rn.shared}
		r.Check(&rn.ctx, rn.bound)
	}
}

// Selects reports whether the running block is the one that applies to
// an event on a reach: always for a rule with a single block without
// selectors (and for always-on rules), else when it is the most specific
// matching block of the rule.
func (c *Context) Selects(ev *model.Event, r *model.Reach) bool {
	if c.Config == nil {
		return true
	}
	if c.head == nil {
		return c.Config.AppliesTo(ev.Name)
	}
	return c.head.Resolve(ev, r) == c.Config
}

// report appends a finding of the running rule, filling in what the rule
// leaves to the registry: its id, the severity the policy sets (else the
// rule's default), the model file and the policy reference.
func (rn *runner) report(f Finding) {
	r, cfg := rn.rule, rn.cfg
	f.Rule = r.ID
	if f.Severity.Rank() == 0 {
		f.Severity = r.Severity
		if cfg != nil && cfg.Severity.Rank() > 0 {
			f.Severity = cfg.Severity
		}
	}
	if f.Range.Filename == "" {
		f.Range.Filename = rn.m.File
	}
	if cfg != nil && f.Section == "" {
		f.Section = cfg.Section
	}
	if cfg != nil {
		if rn.citedCfg != cfg {
			// What every finding of the block cites, worked out on its
			// first finding.
			rn.citedCfg, rn.cite, rn.related = cfg, policies.Cite(rn.p, cfg), policyRelated(cfg)
		}
		if f.Reference == "" {
			f.Reference = rn.cite
		}
		if len(f.Related) == 0 && len(rn.related) > 0 {
			// Shared by the block's findings; the capacity is capped, so
			// that a later append (an exception's place) copies it.
			f.Related = rn.related[:len(rn.related):len(rn.related)]
		} else {
			f.Related = append(f.Related, rn.related...)
		}
	}
	rn.out = append(rn.out, f)
}

// policyRelated are the places of the policy that set a finding's limits:
// the settings written in the rule's block, else the block itself (its
// settings are the defaults, or it has none).
func policyRelated(cfg *policies.RuleConfig) []Related {
	var out []Related
	if cfg.Spec != nil {
		for _, s := range cfg.Spec.Settings {
			if rng, ok := cfg.Attrs[s.Name]; ok {
				out = append(out, Related{Label: "limit " + cfg.Rule + "." + s.Name, Range: rng})
			}
		}
	}
	if len(out) == 0 && cfg.DefRange.Start.Line > 0 {
		out = append(out, Related{Label: "policy block " + cfg.Rule, Range: cfg.DefRange})
	}
	return out
}

// events are the event results a rule runs on: all of them for an
// always-on rule, those its block's `events` filter admits otherwise.
// They are ranged over as they are found, without a slice of them.
func (c *Context) events() iter.Seq[*solver.EventResult] {
	return func(yield func(*solver.EventResult) bool) {
		if c.Result == nil {
			return
		}
		for _, ev := range c.Result.Events {
			if ev == nil || ev.Event == nil || (c.Config != nil && !c.eventSelected(ev.Event)) {
				continue
			}
			if !yield(ev) {
				return
			}
		}
	}
}

// eventSelected reports whether the running block may apply to some reach
// in an event: its event selectors admit it.
func (c *Context) eventSelected(ev *model.Event) bool {
	if c.head == nil {
		return c.Config.AppliesTo(ev.Name)
	}
	return c.Config.MatchesEvent(ev)
}

// reaches are the reach results of an event that carry a reach and that
// the running block applies to, ranged over as they are found.
func (c *Context) reaches(ev *solver.EventResult) iter.Seq[*solver.ReachResult] {
	return func(yield func(*solver.ReachResult) bool) {
		for _, rr := range ev.Reaches {
			if rr != nil && rr.Reach != nil && c.Selects(ev.Event, rr.Reach) && !yield(rr) {
				return
			}
		}
	}
}

// units is the model's unit system (SI when unset).
func (c *Context) units() model.Units {
	if c.Model != nil && c.Model.Units == model.US {
		return model.US
	}
	return model.SI
}

// cmpFindings orders findings by file, printed line and column (Pos),
// rule, reach, event, station span and message.
func cmpFindings(a, b Finding) int { return cmpFindingPtrs(&a, &b) }

// Compare orders findings as Check returns them: by file, position, then
// rule and the rest (a caller that adds findings of its own, such as a
// sensitivity run, sorts with it).
func Compare(a, b *Finding) int { return cmpFindingPtrs(a, b) }

// cmpFindingPtrs is cmpFindings without copying the findings. Each key
// is compared only when the ones before it are equal (cmp.Or would
// evaluate them all, the messages included, for every comparison).
func cmpFindingPtrs(a, b *Finding) int {
	if c := cmp.Compare(a.File(), b.File()); c != 0 {
		return c
	}
	pa, pb := a.Pos(), b.Pos()
	if c := cmp.Compare(pa.Start.Line, pb.Start.Line); c != 0 {
		return c
	}
	if c := cmp.Compare(pa.Start.Column, pb.Start.Column); c != 0 {
		return c
	}
	if c := cmp.Compare(a.Rule, b.Rule); c != 0 {
		return c
	}
	if c := cmp.Compare(a.Reach, b.Reach); c != 0 {
		return c
	}
	if c := cmp.Compare(a.Event, b.Event); c != 0 {
		return c
	}
	if c := cmp.Compare(a.FromStation, b.FromStation); c != 0 {
		return c
	}
	if c := cmp.Compare(a.ToStation, b.ToStation); c != 0 {
		return c
	}
	return cmp.Compare(a.Message, b.Message)
}

// sortFindings orders findings by file, line, column, rule, reach, event
// and station span (then message, so that the order is total) and removes
// exact duplicates. It reorders fs in place and returns its sorted,
// deduplicated prefix.
func sortFindings(fs []Finding) []Finding {
	if len(fs) < 2 {
		return fs
	}
	// Sort indices rather than the findings themselves: a Finding is a few
	// hundred bytes, and a stable sort moves elements many times. The
	// permutation is then applied in place, one move per finding.
	var buf [32]int
	order := buf[:0]
	for i := range fs {
		order = append(order, i)
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmpFindingPtrs(&fs[a], &fs[b]) })
	for i := range order {
		if order[i] < 0 {
			continue
		}
		// Follow the cycle that starts at i: position j receives the
		// finding at order[j].
		tmp := fs[i]
		j := i
		for {
			k := order[j]
			order[j] = -1
			if k == i {
				fs[j] = tmp
				break
			}
			fs[j] = fs[k]
			j = k
		}
	}
	n := 1
	for i := 1; i < len(fs); i++ {
		if !fs[i].Equal(&fs[n-1]) { // drop exact duplicates, as slices.Compact does
			fs[n] = fs[i]
			n++
		}
	}
	return fs[:n]
}

// eachReach calls fn for every reach result of every event the rule runs on.
func (c *Context) eachReach(fn func(ev *solver.EventResult, rr *solver.ReachResult)) {
	for ev := range c.events() {
		for rr := range c.reaches(ev) {
			fn(ev, rr)
		}
	}
}

// scanPoints judges every computed point of every reach the rule runs on
// (except in the runs its screen passes), merges the failing points into
// spans (see scan) and hands each span to emit.
func (c *Context) scanPoints(screen screenFunc, w worse, judge judgeFunc,
	emit func(ev *solver.EventResult, rr *solver.ReachResult, s span)) {
	c.scanPointsThen(screen, w, judge, nil, emit)
}

// scanPointsThen is scanPoints with a pass, more (unless nil), between
// locating the spans of a reach and emitting them, which may append spans
// that scan cannot see (a failing stretch between two computed points
// neither of which fails); the spans are then emitted in station order.
func (c *Context) scanPointsThen(screen screenFunc, w worse, judge judgeFunc,
	more func(rr *solver.ReachResult, spans []span) []span,
	emit func(ev *solver.EventResult, rr *solver.ReachResult, s span)) {
	c.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		c.spans = scan(rr, c.runsOf(rr), c.screened(screen), w, judge, reachBlock, &c.verdict, c.spans[:0])
		locate(rr, w, judge, reachBlock, &c.verdict, &c.trial, c.spans)
		if more != nil {
			n := len(c.spans)
			c.spans = more(rr, c.spans)
			if len(c.spans) > n {
				slices.SortStableFunc(c.spans, func(a, b span) int { return cmp.Compare(a.from, b.from) })
			}
		}
		for _, s := range c.spans {
			emit(ev, rr, s)
		}
	})
}
