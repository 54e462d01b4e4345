package rules

import (
	"cmp"
	"fmt"
	"slices"
	"sort"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var solverRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "solver",
		Severity: policies.Warning,
		AlwaysOn: true,
	},
	Title: "The solver fell back, did not converge, could not apply a control, or made an assumption",
	Doc: Doc{
		Checks: `(always on) the notes the solver records while
computing each reach, which mean the results near them are less certain
than elsewhere, or the assumptions they rest on. Every note becomes a
finding at the reach, at its station; notes of one kind at contiguous
computed points merge into one span. Warnings:
  - critical_fallback: the energy equation had no solution between two
    computed points and critical depth was taken there (an abrupt change of
    section or slope, or a control the flow cannot meet).
  - no_convergence: the iteration did not close within its tolerance.
  - control: a boundary condition could not act as written (an outlet depth
    that cannot control supercritical flow, a gate that does not touch the
    water, a drowned entrance depth, supercritical inflow below the
    critical energy of the reach it enters, a jump the solver had to place
    at a junction).
Information (severity info):
  - assumption: the results rest on a simplification of the method, not
    on a failure: supercritical flows meeting at a junction (the depth
    below it is taken from the discharge-weighted energy, without the
    shock waves), a reach that carries no discharge in the event, a
    jump held at a change of section, whose depths are those of the two
    profiles there rather than a sequent pair, a drowned outlet or change
    of section where the water level carries across (Borda–Carnot), a
    submerged gate, a jump drowned against a drop face, a jump on a steep
    reach placed by the horizontal-bed relation, or a jump in a points
    section that balances in force but not in energy.
A reach of an event with no computed point, and a computed point with a
number that is not finite, are also reported as warnings: the other rules
could not check them.`,
		Formula: `none; the standard-step energy balance
    z1 + y1 + α1V1²/2g = z2 + y2 + α2V2²/2g + hf
is the solver's (Chow, Open-Channel Hydraulics, 1959, ch. 10). Local
losses at nodes and section changes (loss blocks) add
    h = k·|α₂V₂²/2g − α₁V₁²/2g|
with k the contraction coefficient where the velocity head rises
downstream and the expansion coefficient where it falls. Published
coefficients by type of transition (Hinds 1928 and USBR, tabulated in
Chow 1959, Table 17-1; recalled): warped 0.10 / 0.20, cylinder quadrant
0.15 / 0.25, simplified straight line 0.20 / 0.30, straight line
0.30 / 0.50, square-ended 0.30 / 0.75 (contraction / expansion); a conduit
into a pool, expansion 1.0 (FHWA HDS-5). Without loss blocks no local
losses are modelled, and solve says so.`,
		Basis: `common practice (no published source): a screening tool states
where its own computation is uncertain rather than passing it silently.`,
		Sources: []string{
			"common practice (no published source)",
			"Chow, Open-Channel Hydraulics (1959), ch. 10: the standard-step method",
			"Chow, Open-Channel Hydraulics (1959), ch. 17, Table 17-1: transition loss coefficients after Hinds (1928) and USBR",
		},
		Remedies: `add computed points (max_spacing), smooth abrupt section or slope
changes with a transition, check the outlet condition and the gate
openings, and review the profile with "chanlint solve".`,
	},
	Check: checkSolver,
}

func checkSolver(ctx *Context, report func(Finding)) {
	ctx.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		r := rr.Reach
		base := Finding{Range: r.DefRange, Reach: r.Name, Event: ev.Event.Name}
		if len(rr.Points) == 0 {
			f := base
			f.Message = fmt.Sprintf("no computed point on reach %q in event %q: nothing on it was checked", r.Name, ev.Event.Name)
			report(f)
			return
		}
		for _, g := range noteGroups(rr) {
			f := base
			f.FromStation, f.ToStation, f.HasSpan = g.from, g.to, true
			f.Message, f.Remedy = noteMessage(g)
			if g.kind == solver.NoteInfo {
				f.Severity = policies.Info
			}
			report(f)
		}
		var bad []float64
		for _, run := range ctx.runsOf(rr) {
			for i := run.first; !run.usable && i <= run.last; i++ {
				if !usable(&rr.Points[i]) {
					bad = append(bad, rr.Points[i].Station)
				}
			}
		}
		if len(bad) > 0 {
			f := base
			if numfmt.Finite(bad[0], bad[len(bad)-1]) {
				f.FromStation, f.ToStation, f.HasSpan = bad[0], bad[len(bad)-1], true
			}
			f.Message = fmt.Sprintf("the solver returned numbers that are not finite at %s of reach %q; "+
				"no rule checked them", plural(len(bad), "computed point"), r.Name)
			report(f)
		}
	})
}

// noteGroup is a run of notes of one kind at contiguous computed points.
type noteGroup struct {
	kind     solver.NoteKind
	from, to float64
	first    string // the first note's message
	n        int
}

// noteGroups merges the notes of a reach result: notes of the same kind
// join when no computed point lies strictly between their stations.
func noteGroups(rr *solver.ReachResult) []noteGroup {
	notes := make([]solver.Note, 0, len(rr.Notes))
	for _, n := range rr.Notes {
		if numfmt.Finite(n.Station) {
			notes = append(notes, n)
		}
	}
	slices.SortStableFunc(notes, func(a, b solver.Note) int { return cmp.Compare(a.Station, b.Station) })
	var out []noteGroup
	for _, n := range notes {
		if k := len(out) - 1; k >= 0 && out[k].kind == n.Kind && pointsStrictlyBetween(rr, out[k].to, n.Station) == 0 {
			out[k].to = n.Station
			out[k].n++
			continue
		}
		out = append(out, noteGroup{kind: n.Kind, from: n.Station, to: n.Station, first: n.Message, n: 1})
	}
	return out
}

// pointsStrictlyBetween counts computed points with a < station < b.
func pointsStrictlyBetween(rr *solver.ReachResult, a, b float64) int {
	i := sort.Search(len(rr.Points), func(k int) bool { return rr.Points[k].Station > a })
	j := sort.Search(len(rr.Points), func(k int) bool { return rr.Points[k].Station >= b })
	return max(0, j-i)
}

// noteMessage is the message and the remedy of a group of notes; the
// stations are the finding's span.
func noteMessage(g noteGroup) (msg, remedy string) {
	detail := ""
	if g.first != "" {
		detail = " (" + g.first + ")"
	}
	switch g.kind {
	case solver.NoteCriticalFallback:
		return "critical depth was taken because the energy equation had no solution" + detail +
				": depths and checks near this span are approximate",
			"look for an abrupt change of section or slope, or a control the flow cannot meet"
	case solver.NoteNoConvergence:
		return "the water-surface iteration did not converge" + detail + ": results there are uncertain",
			"add computed points (max_spacing) or review the section"
	case solver.NoteControl:
		return "a boundary condition could not act as written" + detail,
			"check the outlet, gate and entrance conditions against the flow regime"
	case solver.NoteInfo:
		return "the solution rests on an assumption of the method" + detail,
			"review the results there with that in mind"
	}
	return fmt.Sprintf("the solver noted %s%s", g.kind, detail), ""
}
