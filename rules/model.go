package rules

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
)

var modelRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       modelID,
		Severity: policies.Error,
		AlwaysOn: true,
	},
	Title: "The model file is invalid or inconsistent",
	Doc: Doc{
		Checks: `(always on) that the model file can be checked at
all. Every diagnostic of reading and validating a *.chan.hcl file becomes a
finding at the narrowest range it names (errors as errors, warnings as
warnings); a file with an error is not solved and no other rule runs on it.
On a valid model it also reports, against the registry and the solved
flow:
  - an exception whose label is not a rule id (error, with the nearest id
    as a hint), or that names the model or unused_exception rule, which
    cannot be excepted (error);
  - a bend whose centreline radius is less than half the computed top
    width in it (warning): the inner bank would have a negative radius, and
    the superelevation formula does not apply.`,
		Formula: `none (rc < T/2 for the bend check).`,
		Basis:   `common practice (no published source).`,
		Sources: []string{
			"common practice (no published source)",
		},
		Remedies: `correct the file at the position given; the message says what
was expected there.`,
	},
	Check: checkModel,
}

// FromDiagnostics turns the diagnostics of reading or validating a model
// file into findings of the model rule: errors as errors, warnings as
// warnings, at the diagnostic's subject range (else its context range,
// else the start of the file), in file whatever file name the range
// carries. The message is the summary, followed by the detail when there
// is one.
func FromDiagnostics(file string, diags hcl.Diagnostics) []Finding {
	out := make([]Finding, 0, len(diags))
	for _, d := range diags {
		if d == nil {
			continue
		}
		f := Finding{Rule: modelID, Severity: policies.Error}
		if d.Severity == hcl.DiagWarning {
			f.Severity = policies.Warning
		}
		switch {
		case d.Subject != nil:
			f.Range = InFile(file, *d.Subject)
		case d.Context != nil:
			f.Range = InFile(file, *d.Context)
		default:
			f.Range = hcl.Range{Filename: file, Start: hcl.InitialPos, End: hcl.InitialPos}
		}
		f.Message = d.Summary
		if d.Detail != "" {
			if f.Message != "" {
				f.Message += ": "
			}
			f.Message += d.Detail
		}
		out = append(out, f)
	}
	return sortFindings(out)
}

func checkModel(ctx *Context, report func(Finding)) {
	m := ctx.Model
	for _, ex := range m.Exceptions {
		r := Lookup(ex.Rule)
		switch {
		case r == nil:
			msg := fmt.Sprintf("exception names %q, which is not a rule id", ex.Rule)
			if s := suggest(ex.Rule); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			} else {
				msg += "; `chanlint explain` lists the rules"
			}
			report(Finding{Range: ex.LabelRange, Message: msg})
		case r.ID == modelID || r.ID == unusedExceptionID:
			report(Finding{Range: ex.LabelRange, Message: fmt.Sprintf(
				"the %s rule cannot be excepted: an exception applies to a design rule over a station span", r.ID)})
		}
	}
	u := ctx.units()
	for _, bend := range m.Bends {
		if bend.Reach == nil || bend.Radius <= 0 {
			continue
		}
		widest, at := 0.0, 0.0
		for ev := range ctx.events() {
			for _, rr := range ev.Reaches {
				if rr != nil && rr.Reach == bend.Reach {
					if w, x := widestInBend(rr, bend); w > widest {
						widest, at = w, x
					}
				}
			}
		}
		if bend.Radius < widest/2 {
			rad, half := numfmt.Pair(bend.Radius, widest/2)
			report(Finding{
				Severity: policies.Warning,
				Range:    bend.Src.At("radius"),
				Reach:    bend.ReachName,
				Message: fmt.Sprintf("bend %q has a centreline radius of %s %s, less than half the top width "+
					"of the flow (%s %s at station %s %s): the curve is tighter than the channel is wide; "+
					"check the radius", bend.Name, rad, u.Length(), half, u.Length(), numfmt.Num(at), u.Length()),
				Value: bend.Radius, Limit: widest / 2, HasValue: true,
			})
		}
	}
}

// widestInBend is the widest top width of the flow in a bend and its
// station, over the computed points of one reach result (0 when none).
func widestInBend(rr *solver.ReachResult, bend *model.Bend) (widest, at float64) {
	sub, _ := pointsBetween(rr, bend.FromStation, bend.ToStation)
	for i := range sub.Points {
		p := &sub.Points[i]
		if usable(p) && p.TopWidth > widest {
			widest, at = p.TopWidth, p.Station
		}
	}
	return widest, at
}
