package rules

import (
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var jumpTypeRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "jump_type",
		Severity: policies.Warning,
		Settings: []policies.Setting{
			{Name: "avoid", Kind: policies.FroudeBands, Quantity: policies.Froude, Bounds: policies.AtLeast(0),
				Required: true, Doc: "the bands of upstream Froude number F1 to flag"},
		},
	},
	Title: "Hydraulic jump of a type the policy avoids (by upstream Froude number)",
	Doc: Doc{
		Checks: `the upstream Froude number F1 of every hydraulic jump
against the bands the policy avoids. Oscillating jumps (F1 about 2.5–4.5)
send an irregular wave train downstream that erodes banks and is hard to
damp; weak and undular jumps dissipate little energy. The finding is at the
basin the toe lies in, else at the reach, over the jump's span.`,
		Formula: `    F1 = V1 / √(g · y1)  (rectangle; the solver's F1 for any shape)
    fails where low ≤ F1 ≤ high for some avoided band; the limit reported
    is the band edge nearest to F1
Jump types by F1: undular 1–1.7, weak 1.7–2.5, oscillating 2.5–4.5,
steady 4.5–9, strong > 9.`,
		Basis: `Peterka, Hydraulic Design of Stilling Basins and Energy
Dissipators, USBR Engineering Monograph 25 (1958); Chow, Open-Channel
Hydraulics (1959), ch. 15.`,
		Sources: []string{
			"Peterka, Hydraulic Design of Stilling Basins and Energy Dissipators, USBR Engineering Monograph 25 (1958)",
			"Chow, Open-Channel Hydraulics (1959), ch. 15",
		},
		Remedies: `move F1 out of the band by changing the gate opening or the
approach slope (a deeper, slower approach lowers F1; a shallower, faster
one raises it), or use a basin designed for that range with wave
suppressors.`,
	},
	Check: checkJumpType,
}

func checkJumpType(ctx *Context, report func(Finding)) {
	avoid := ctx.Config.Bands("avoid")
	ctx.eachReach(func(ev *solver.EventResult, rr *solver.ReachResult) {
		for _, j := range rr.Jumps {
			if !usableJump(j) || !numfmt.Finite(j.Froude) {
				continue
			}
			b, in := bandOf(avoid, j.Froude)
			if !in {
				continue
			}
			edge, _ := nearestEdge(b, j.Froude)
			lo, hi := numfmt.Pair(b.Low, b.High)
			kind := ""
			if j.Type != "" {
				kind = " (" + string(j.Type) + ")"
			}
			blk := jumpBlock(rr.Reach, j)
			jr := clipJump(rr.Reach, j)
			report(Finding{
				Range: blk.DefRange, Reach: rr.Reach.Name, Event: ev.Event.Name,
				FromStation: jr.toe, ToStation: jr.end, HasSpan: true,
				Value: j.Froude, Limit: edge, HasValue: true,
				Message: "the hydraulic jump has upstream Froude number " +
					numfmt.Num(j.Froude) + kind + ", in the avoided band " + lo + "–" + hi + jr.continues(rr.Reach, ctx.units()),
				Remedy: jumpHazard(j.Froude) + "; bring F1 out of the band by changing the gate opening or the approach slope, " +
					"or provide a basin designed for it",
			})
		}
	})
}

// jumpHazard says what a jump of that upstream Froude number does.
func jumpHazard(f1 float64) string {
	switch {
	case f1 < 1.7:
		return "an undular jump dissipates little energy and its standing waves travel downstream"
	case f1 < 2.5:
		return "a weak jump dissipates little energy"
	case f1 <= 4.5:
		return "an oscillating jump sends irregular waves downstream that erode the banks"
	default:
		return "a jump of that strength needs a basin designed for it"
	}
}
