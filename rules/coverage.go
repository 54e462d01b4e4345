package rules

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// NotEvaluated lists, in plain sentences, what a check of the model under
// the policy did not evaluate, so that a run without findings is never
// read as "everything passed": the configurable rules the policy does not
// enable; the events and reaches an enabled rule's blocks do not select;
// the sections whose lining has no limit under a lining rule (and why);
// the stretches next to critical-depth controls froude_band leaves
// unchecked; the jumps a threshold exempts from needing a basin; the jumps
// a basin holds by less than their toe's sensitivity (toeShift); reaches
// that carry no discharge in an event; what the solver approximated or
// assumed (its notes and model-wide assumptions); and what the enabled
// rules never compute. The order is fixed; a nil result or model gives
// the rules part only.
func NotEvaluated(m *model.Model, res *solver.Result, p *policies.Policy) []string {
	if m == nil {
		return nil
	}
	p = PolicyFor(m, p)
	var out []string
	var off []string
	for _, r := range All() {
		if !r.AlwaysOn && p.Rules[r.ID] == nil {
			off = append(off, r.ID)
		}
	}
	if len(off) > 0 {
		out = append(out, "rules the policy does not enable (not checked): "+strings.Join(off, ", "))
	}
	if res == nil {
		return out
	}
	cv := coverage{m: m, res: res, p: p, u: unitsOf(m)}
	out = append(out, cv.unselected()...)
	out = append(out, cv.unlimited()...)
	out = append(out, cv.buffered()...)
	out = append(out, cv.exemptJumps()...)
	out = append(out, cv.marginalJumps()...)
	out = append(out, cv.dry()...)
	out = append(out, cv.solverNotes()...)
	out = append(out, cv.neverComputed()...)
	return out
}

// coverage works out NotEvaluated for one model.
type coverage struct {
	m   *model.Model
	res *solver.Result
	p   *policies.Policy
	u   model.Units
}

func unitsOf(m *model.Model) model.Units {
	if m.Units == model.US {
		return model.US
	}
	return model.SI
}

// blockFor is the block of a rule that applies to an event on a reach (as
// Check runs it), nil when none does.
func blockFor(cfg *policies.RuleConfig, ev *model.Event, r *model.Reach) *policies.RuleConfig {
	if cfg == nil {
		return nil
	}
	if len(cfg.More) == 0 && !cfg.Selective() {
		if cfg.AppliesTo(ev.Name) {
			return cfg
		}
		return nil
	}
	return cfg.Resolve(ev, r)
}

// each calls fn for every reach result of every event.
func (cv *coverage) each(fn func(ev *solver.EventResult, rr *solver.ReachResult)) {
	for _, ev := range cv.res.Events {
		if ev == nil || ev.Event == nil {
			continue
		}
		for _, rr := range ev.Reaches {
			if rr != nil && rr.Reach != nil {
				fn(ev, rr)
			}
		}
	}
}

// configurable are the enabled configurable rules, by id.
func (cv *coverage) configurable() []*Rule {
	var out []*Rule
	for _, r := range All() {
		if !r.AlwaysOn && cv.p.Rules[r.ID] != nil {
			out = append(out, r)
		}
	}
	return out
}

// unselected: per enabled rule, the events (or reaches of an event) none
// of its blocks selects.
func (cv *coverage) unselected() []string {
	var out []string
	for _, r := range cv.configurable() {
		cfg := cv.p.Rules[r.ID]
		var events, partial []string
		for _, ev := range cv.res.Events {
			if ev == nil || ev.Event == nil {
				continue
			}
			var missed []string
			n := 0
			for _, rr := range ev.Reaches {
				if rr == nil || rr.Reach == nil {
					continue
				}
				n++
				if blockFor(cfg, ev.Event, rr.Reach) == nil {
					missed = append(missed, rr.Reach.Name)
				}
			}
			switch {
			case n > 0 && len(missed) == n:
				events = append(events, strconv.Quote(ev.Event.Name))
			case len(missed) > 0:
				partial = append(partial, fmt.Sprintf("reaches %s in event %q", listOf(quoted(missed), 6), ev.Event.Name))
			}
		}
		if len(events) > 0 {
			out = append(out, fmt.Sprintf("%s: not applied to event %s (its blocks select other events)", r.ID, strings.Join(events, ", ")))
		}
		if len(partial) > 0 {
			out = append(out, fmt.Sprintf("%s: not applied to %s (its blocks select other reaches)", r.ID, strings.Join(partial, "; ")))
		}
	}
	return out
}

// liningRules are the rules whose limit is a table by lining word, and
// whether the limit is an erosion limit (see newLiningLimits).
var liningRules = []struct {
	id      string
	erosion bool
}{{"max_velocity", true}, {"min_velocity", false}, {"shear_stress", true}}

// unlimited: per lining rule, the sections of the model's reaches that no
// limit applies to, with the reason.
func (cv *coverage) unlimited() []string {
	var out []string
	for _, lr := range liningRules {
		cfg := cv.p.Rules[lr.id]
		if cfg == nil {
			continue
		}
		seen := map[*model.Section]bool{}
		var reasons []string              // in order of first use
		sections := map[string][]string{} // by reason
		cv.each(func(ev *solver.EventResult, rr *solver.ReachResult) {
			b := blockFor(cfg, ev.Event, rr.Reach)
			if b == nil {
				return
			}
			for _, sec := range reachSections(rr.Reach) {
				if seen[sec] {
					continue
				}
				seen[sec] = true
				if why := noLimitReason(b, sec, lr.erosion); why != "" {
					if sections[why] == nil {
						reasons = append(reasons, why)
					}
					sections[why] = append(sections[why], strconv.Quote(sec.Name))
				}
			}
		})
		for _, why := range reasons {
			out = append(out, fmt.Sprintf("%s: no limit for sections %s (%s)", lr.id, listOf(sections[why], 8), why))
		}
	}
	return out
}

// reachSections are the sections in force on a reach: its own and its
// segments', in order, without repeats.
func reachSections(r *model.Reach) []*model.Section {
	var out []*model.Section
	add := func(s *model.Section) {
		if s != nil && !slices.Contains(out, s) {
			out = append(out, s)
		}
	}
	add(r.Section)
	for _, seg := range r.Segments {
		add(seg.Section)
	}
	return out
}

// noLimitReason says why a lining rule's block holds a section to no
// limit, "" when it does.
func noLimitReason(cfg *policies.RuleConfig, sec *model.Section, erosion bool) string {
	side := failBelow
	if erosion {
		side = failAbove
	}
	l := newLiningLimits(cfg, side)
	lining := strconv.Quote(sec.Lining)
	if sec.Lining == "" {
		lining = "no lining word"
	}
	_, named := l.table.Values[sec.Lining]
	switch {
	case l.noPoints && sec.Shape == model.Points:
		return "a points section, excluded by points_sections"
	case erosion && sec.Closed() && !named:
		return "a closed conduit, " + lining + " not in the table: no erosion limit"
	case l.vegetatedNamed && vegetated(sec.Lining) && !named:
		return "a vegetated or natural lining not named in the table"
	case l.table.NoLimit[sec.Lining]:
		return lining + " set to no limit"
	}
	if _, ok := l.table.For(sec.Lining); !ok {
		return lining + " not in the table and no default"
	}
	return ""
}

// buffered: the stretches next to critical-depth controls froude_band
// leaves unchecked.
func (cv *coverage) buffered() []string {
	cfg := cv.p.Rules["froude_band"]
	if cfg == nil {
		return nil
	}
	var items []string
	var ctrl controls
	cv.each(func(ev *solver.EventResult, rr *solver.ReachResult) {
		b := blockFor(cfg, ev.Event, rr.Reach)
		if b == nil {
			return
		}
		buffer := b.Number("control_buffer")
		if buffer <= 0 {
			return
		}
		ctrl.near(rr, -1, buffer) // fills the controls of rr
		for i, x := range ctrl.at[:ctrl.own] {
			items = append(items, fmt.Sprintf("reach %q at %s %s (%s %s, event %q)", rr.Reach.Name, numfmt.Num(x), cv.u.Length(),
				numfmt.Num(ctrl.len[i]), cv.u.Length(), ev.Event.Name))
		}
	})
	if len(items) == 0 {
		return nil
	}
	return []string{"froude_band: not checked within control_buffer critical depths of the critical-depth controls the solver imposed: " +
		listOf(items, 6)}
}

// eachJump calls fn for every usable jump of a reach and event that a
// jump_containment block selects, with the block.
func (cv *coverage) eachJump(fn func(ev *solver.EventResult, rr *solver.ReachResult, b *policies.RuleConfig, j solver.Jump)) {
	cfg := cv.p.Rules["jump_containment"]
	if cfg == nil {
		return
	}
	cv.each(func(ev *solver.EventResult, rr *solver.ReachResult) {
		b := blockFor(cfg, ev.Event, rr.Reach)
		if b == nil {
			return
		}
		for _, j := range rr.Jumps {
			if usableJump(j) {
				fn(ev, rr, b, j)
			}
		}
	})
}

// exemptJumps: the jumps a jump_containment threshold exempts.
func (cv *coverage) exemptJumps() []string {
	var items []string
	cv.eachJump(func(ev *solver.EventResult, rr *solver.ReachResult, b *policies.RuleConfig, j solver.Jump) {
		if exemptJump(b, j) {
			items = append(items, fmt.Sprintf("reach %q at %s %s (event %q, F1 %s, head loss %s %s)", rr.Reach.Name,
				numfmt.Num(j.Station), cv.u.Length(), ev.Event.Name, numfmt.Num(j.Froude), numfmt.Num(j.EnergyLoss), cv.u.Length()))
		}
	})
	if len(items) == 0 {
		return nil
	}
	return []string{"jump_containment: jumps below the policy's min_froude or min_energy_loss, not required to lie in a basin: " +
		listOf(items, 6)}
}

// marginalJumps: the jumps jump_containment passes inside a basin by a
// margin smaller than the toe's shift for 1 % of the depth below it
// (toeShift): the pass rests on a toe position the inputs do not fix.
func (cv *coverage) marginalJumps() []string {
	var items []string
	cv.eachJump(func(ev *solver.EventResult, rr *solver.ReachResult, b *policies.RuleConfig, j solver.Jump) {
		if exemptJump(b, j) {
			return
		}
		jr := clipJump(rr.Reach, j)
		basin, up, down := bestBasin(rr.Reach, jr.toe, jr.end)
		if basin == nil || jr.over > 0 || up > 0 || down > 0 {
			return // not contained: jump_containment reports it
		}
		margin := min(-up, -down)
		if dx, ok := toeShift(rr, j); ok && dx >= margin {
			items = append(items, fmt.Sprintf("reach %q at %s %s in basin %q (event %q, F1 %s, margin %s %s, toe shift %s %s)",
				rr.Reach.Name, numfmt.Num(j.Station), cv.u.Length(), basin.Name, ev.Event.Name, numfmt.Num(j.Froude),
				numfmt.Num(margin), cv.u.Length(), numfmt.Num(dx), cv.u.Length()))
		}
	})
	if len(items) == 0 {
		return nil
	}
	return []string{"jump_containment: jumps inside their basin by less than their toe moves for 1 % more or less depth below it " +
		"(near critical flow), a pass the tailwater's and the roughness's uncertainty can overturn: " + listOf(items, 6)}
}

// dry: reaches that carry no discharge in an event.
func (cv *coverage) dry() []string {
	var items []string
	cv.each(func(ev *solver.EventResult, rr *solver.ReachResult) {
		if !(rr.Discharge > 0) {
			items = append(items, fmt.Sprintf("reach %q in event %q", rr.Reach.Name, ev.Event.Name))
		}
	})
	if len(items) == 0 {
		return nil
	}
	return []string{"no discharge, nothing computed or checked: " + listOf(items, 6)}
}

// solverNotes: the solver's notes (reported by the solver rule) and its
// model-wide assumptions.
func (cv *coverage) solverNotes() []string {
	n := 0
	cv.each(func(_ *solver.EventResult, rr *solver.ReachResult) { n += len(rr.Notes) })
	var out []string
	if n > 0 {
		out = append(out, fmt.Sprintf("the solver approximated, assumed or could not apply a control at %s (see the solver findings): "+
			"results there rest on those notes", plural(n, "place")))
	}
	for _, a := range cv.res.Assumptions() {
		out = append(out, "assumed: "+a)
	}
	return out
}

// neverComputed: what enabled rules do not compute at all.
func (cv *coverage) neverComputed() []string {
	var out []string
	if cv.p.Rules["shear_stress"] != nil {
		out = append(out, "shear_stress: the raised shear downstream of bends and the shear on side slopes are not computed")
	}
	if cv.p.Rules["superelevation"] != nil && hasBends(cv.m) {
		out = append(out, "superelevation: cross waves of supercritical flow in bends are not computed")
	}
	return out
}

func hasBends(m *model.Model) bool {
	for _, r := range m.Reaches {
		if r != nil && len(r.Bends) > 0 {
			return true
		}
	}
	return false
}

// quoted quotes each word.
func quoted(ws []string) []string {
	out := make([]string, len(ws))
	for i, w := range ws {
		out[i] = strconv.Quote(w)
	}
	return out
}

// listOf joins items, at most max of them, with how many more there are.
func listOf(items []string, limit int) string {
	if len(items) <= limit {
		return strings.Join(items, ", ")
	}
	return strings.Join(items[:limit], ", ") + fmt.Sprintf(" and %d more", len(items)-limit)
}
