package rules

import (
	"fmt"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
)

// Ids the driver and other rules refer to.
const (
	unusedExceptionID = "unused_exception"
	modelID           = "model"
)

// exceptionTolerance is how far, in the model's length unit, a finding's
// span may reach past an exception's span and still be covered by it: a
// millimetre (or a thousandth of a foot), plus a part in a billion of the
// station for rounding in long reaches. Computed points fall on block ends,
// so a failure confined to the excepted span is covered; one that a
// computed point shows reaching beyond it is not.
func exceptionTolerance(station float64) float64 {
	return 1e-3 + 1e-9*max(1, station)
}

// covers reports whether an exception covers a finding: same rule, same
// reach, and the finding's span within the exception's span. Findings
// without a reach or span (an invalid file, a model-wide problem) are never
// covered, nor are the findings of the model and unused_exception rules.
func covers(ex *model.Exception, f *Finding) bool {
	if f.Rule != ex.Rule || f.Reach == "" || f.Reach != ex.ReachName || !f.HasSpan {
		return false
	}
	if f.Rule == modelID || f.Rule == unusedExceptionID {
		return false
	}
	return f.FromStation >= ex.FromStation-exceptionTolerance(ex.FromStation) &&
		f.ToStation <= ex.ToStation+exceptionTolerance(ex.ToStation)
}

// waivable reports whether policy p lets a design exception waive
// findings of rule id: every configurable rule, and an always-on rule
// (capacity, solver) only when the policy lists it in waive_always_on.
func waivable(p *policies.Policy, id string) bool {
	r := Lookup(id)
	return p.Waives(id, r != nil && r.AlwaysOn)
}

// applyExceptions marks the findings a design exception covers. The first
// exception in source order that covers a finding is the one recorded.
// Findings of an always-on rule the policy does not let exceptions waive
// are never covered.
//
// Under exceptions = "approved" an exception covers a finding only when
// one of the reviewer's approvals matches the finding too; the reason then
// carries the approval's date and note.
func applyExceptions(m *model.Model, fs []Finding, p *policies.Policy) {
	approved := p.Exceptions == policies.Approved
	for i := range fs {
		f := &fs[i]
		for _, ex := range m.Exceptions {
			if !covers(ex, f) {
				continue
			}
			if !waivable(p, f.Rule) {
				break // asked of a covered finding only: most findings have no exception
			}
			reason := ex.Reason
			if approved {
				a := approvalFor(m, p, f)
				if a == nil {
					break // claimed, not approved: unused_exception lists it
				}
				reason += " (" + a.Text() + ")"
			}
			f.Excepted = true
			f.ExceptionReason = reason
			f.ExceptionRange = ex.DefRange
			f.Related = append(f.Related, Related{Label: "exception", Range: ex.DefRange})
			break
		}
	}
}

// approvalFor is the first of the policy's approvals that matches a
// finding of model m: same rule, model file, reach and event (or the
// event's class), and the finding's span within the approved span; nil
// when none does.
func approvalFor(m *model.Model, p *policies.Policy, f *Finding) *policies.Approval {
	for i := range p.Approvals {
		a := &p.Approvals[i]
		if a.Rule != f.Rule || a.Reach != f.Reach || !f.HasSpan || !a.ModelMatches(m.File) || !a.EventMatches(eventNamed(m, f.Event)) {
			continue
		}
		if f.FromStation >= a.FromStation-exceptionTolerance(a.FromStation) &&
			f.ToStation <= a.ToStation+exceptionTolerance(a.ToStation) {
			return a
		}
	}
	return nil
}

// eventNamed is the model's event of a name, or nil.
func eventNamed(m *model.Model, name string) *model.Event {
	for _, ev := range m.Events {
		if ev != nil && ev.Name == name {
			return ev
		}
	}
	return nil
}

var unusedExceptionRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       unusedExceptionID,
		Severity: policies.Warning,
		AlwaysOn: true,
	},
	Title: "A design exception covers no finding, or the policy does not accept exceptions",
	Doc: Doc{
		Checks: `every exception block of the model must cover at least
one finding in some event: a finding of the rule it names, on the reach it
names, whose station span lies within the exception's span (within a
millimetre, or a thousandth of a foot). An exception that covers nothing is
reported as a warning at the exception block: it has gone stale (the design
changed and the problem it excused is gone), or its rule, reach or stations
are wrong, and a stale exception would silently excuse a future problem.
When a finding overlaps the exception but reaches beyond it, the message
says so.

An exception for an always-on rule (capacity, solver) is not applied
unless the policy lists that rule in waive_always_on: a submittal cannot
excuse its own overtopping channel. Such an exception is reported here as a
warning saying what it would have covered.

When the policy says exceptions = "deny", no exception is applied: every
finding is reported in full and fails the run as its severity says, and each
exception of the model is listed here as an info finding saying it was not
applied and how many findings it would have covered. A reviewer then sees
the claims without their taking effect.

When the policy says exceptions = "approved" (the review pack does), an
exception covers a finding only when an approval of the reviewer's
--approvals file matches it too: same rule, model file, reach, event (or
the event's class) and a span within the approved one. Each covered finding
without an approval is listed here as an info finding, "claimed, not
approved", and keeps its severity; each approval of the model that matches
no excepted finding is a warning at the approval ("stale approval").`,
		Formula: `none; it compares station spans.`,
		Basis: `common practice for suppressions in code-review tools: a
suppression must state a reason and one that matches nothing is reported
(no published source).`,
		Sources: []string{
			"common practice for suppressions in code-review tools (no published source)",
		},
		Remedies: `delete the exception if the problem it excused is gone; otherwise
correct its rule id, reach or stations so that it covers the failing span
the reviewer accepted.`,
	},
	Check: checkExceptions,
}

func checkExceptions(ctx *Context, report func(Finding)) {
	if ctx.Model == nil {
		return
	}
	u := ctx.units()
	deny := ctx.Policy != nil && ctx.Policy.Exceptions == "deny"
	approved := ctx.Policy != nil && ctx.Policy.Exceptions == policies.Approved
	used := map[*policies.Approval]bool{}
	for _, ex := range ctx.Model.Exceptions {
		n := 0
		var partial *Finding
		var claimed []*Finding // covered, but no approval matches (approved mode)
		for i := range ctx.Findings {
			f := &ctx.Findings[i]
			if covers(ex, f) {
				n++
				if approved {
					if a := approvalFor(ctx.Model, ctx.Policy, f); a != nil {
						used[a] = true
					} else {
						claimed = append(claimed, f)
					}
				}
			} else if partial == nil && f.Rule == ex.Rule && f.Reach == ex.ReachName && f.HasSpan &&
				f.FromStation <= ex.ToStation && f.ToStation >= ex.FromStation {
				partial = f
			}
		}
		locked := !waivable(ctx.Policy, ex.Rule) && Lookup(ex.Rule) != nil
		if !deny && !locked && n > 0 {
			for _, c := range claimed {
				report(Finding{
					Severity: policies.Info, Range: ex.DefRange, Reach: ex.ReachName, Event: c.Event,
					FromStation: c.FromStation, ToStation: c.ToStation, HasSpan: true,
					Message: fmt.Sprintf("claimed, not approved: the exception for rule %q on reach %q covers the %s finding %s, "+
						"but no approval %smatches it (exceptions = \"approved\"), so the finding stands", ex.Rule, ex.ReachName,
						c.Rule, stations(c.FromStation, c.ToStation, u), approvalsIn(ctx.Policy)),
				})
			}
			continue // covered: nothing else to report
		}
		what := fmt.Sprintf("the exception for rule %q on reach %q", ex.Rule, ex.ReachName)
		f := Finding{Range: ex.DefRange, Reach: ex.ReachName}
		if numfmt.Finite(ex.FromStation, ex.ToStation) { // the model guarantees it; never print NaN
			what += " " + stations(ex.FromStation, ex.ToStation, u)
			f.FromStation, f.ToStation, f.HasSpan = ex.FromStation, ex.ToStation, true
		}
		switch {
		case locked && !deny:
			f.Severity = policies.Warning
			f.Message = fmt.Sprintf("%s was not applied: %s is always on and the policy does not let design exceptions waive it "+
				"(waive_always_on); %s", what, ex.Rule, wouldCover(n))
		case deny:
			f.Severity = policies.Info
			f.Message = fmt.Sprintf("%s was not applied: the policy does not accept design exceptions "+
				"(exceptions = \"deny\"); %s", what, wouldCover(n))
		default:
			var why []string
			switch {
			case Lookup(ex.Rule) == nil:
				why = append(why, "no rule has that id (the model rule reports it)")
			case !Lookup(ex.Rule).AlwaysOn && (ctx.Policy == nil || ctx.Policy.Rules[ex.Rule] == nil):
				why = append(why, "the policy does not enable that rule")
			case partial != nil:
				why = append(why, fmt.Sprintf("a %s finding in event %q %s extends beyond it; "+
					"widen the exception if the reviewer accepted that whole span",
					partial.Rule, partial.Event, stations(partial.FromStation, partial.ToStation, u)))
			default:
				why = append(why, "remove it, or correct its rule, reach or stations")
			}
			f.Message = fmt.Sprintf("%s covers no finding in any event: %s", what, strings.Join(why, "; "))
		}
		report(f)
	}
	if approved {
		staleApprovals(ctx, used, report)
	}
}

// approvalsIn names the approvals file for messages: "in FILE ", or "" .
func approvalsIn(p *policies.Policy) string {
	if p == nil || p.ApprovalsFile == "" {
		return "(none was given with --approvals) "
	}
	return "in " + p.ApprovalsFile + " "
}

// staleApprovals reports the approvals for this model that matched no
// claimed finding: the design changed, or the approval's rule, reach,
// stations or event are wrong. The finding points at the approval block.
func staleApprovals(ctx *Context, used map[*policies.Approval]bool, report func(Finding)) {
	u := ctx.units()
	for i := range ctx.Policy.Approvals {
		a := &ctx.Policy.Approvals[i]
		if used[a] || !a.ModelMatches(ctx.Model.File) {
			continue
		}
		report(Finding{
			Severity: policies.Warning, Range: a.DefRange, Reach: a.Reach,
			FromStation: a.FromStation, ToStation: a.ToStation, HasSpan: true,
			Message: fmt.Sprintf("stale approval: the approval of %q on reach %q %s (%s) matches no excepted finding of %s; "+
				"remove it, or correct its rule, reach, stations or event", a.Rule, a.Reach, stations(a.FromStation, a.ToStation, u), a.Text(), ctx.Model.File),
		})
	}
}

// plural writes "1 finding" or "3 findings".
func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// wouldCover says what a denied exception would have covered.
func wouldCover(n int) string {
	switch n {
	case 0:
		return "it would cover no finding"
	case 1:
		return "the 1 finding it would cover is reported in full"
	}
	return fmt.Sprintf("the %d findings it would cover are reported in full", n)
}
