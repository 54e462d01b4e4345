package report

import (
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/rules"
)

// A model compared with its existing revision (Model.Revision, from
// `chanlint diff --out`) has each profile plot draw the existing water
// surface as its own dashed line (addExisting) and a "Revision changes"
// section (revisionView) after its events.

// revisionTolerance is the change below which a rise or fall is not
// listed (half the 0.001 the report prints), as the diff's other outputs.
const revisionTolerance = 0.0005

// revisionView is the "Revision changes" section of a model.
type revisionView struct {
	OldFile, NewFile string
	New, Fixed       []findingRow
	Changed          []changeRow
	Profiles         []riseRow
	Jumps            []jumpRow // hydraulic jumps moved, appeared or gone
	Unchanged        int       // reach and event pairs that moved by less than revisionTolerance, their jumps in place
	Added, Removed   string
	NoRise           []findingRow
	Unit             string
}

// changeRow is a finding failing in both revisions whose value or span
// moved.
type changeRow struct {
	Rule, Reach, Event, Value, Stations, Message string
}

// riseRow is the largest rise and fall of the water surface on one reach
// in one event, each "+0.052 at 410" or "–".
type riseRow struct {
	Reach, Event, Rise, Fall string
}

// jumpRow is a hydraulic jump of one reach and event that moved,
// appeared or disappeared (revdiff.JumpMove.Text).
type jumpRow struct {
	Reach, Event, Move string
}

// revisionSection builds the section from the comparison.
func revisionSection(d *revdiff.Diff, unit string) *revisionView {
	rv := &revisionView{OldFile: d.OldFile, NewFile: d.NewFile, Unit: unit,
		Added: strings.Join(d.Added, ", "), Removed: strings.Join(d.Removed, ", ")}
	rows := func(fs []rules.Finding) []findingRow {
		var out []findingRow
		for i, f := range fs {
			out = append(out, row(i+1, f))
		}
		return out
	}
	rv.New, rv.Fixed, rv.NoRise = rows(d.New), rows(d.Fixed), rows(d.NoRise)
	for _, c := range d.Changed {
		cr := changeRow{Rule: c.New.Rule, Reach: c.New.Reach, Event: c.New.Event, Message: c.New.Text()}
		if c.New.HasValue {
			cr.Value = num(c.Old.Value) + " → " + num(c.New.Value)
			if numfmt.Finite(c.Old.Value, c.New.Value) {
				// A value that moved never reads as unchanged ("30 → 30").
				was, now := numfmt.Pair(c.Old.Value, c.New.Value)
				cr.Value = was + " → " + now
			}
			if c.New.Unit != "" {
				cr.Value += " " + c.New.Unit
			}
		}
		if c.New.HasSpan {
			cr.Stations = stationRange(c.Old.FromStation, c.Old.ToStation) + " → " + stationRange(c.New.FromStation, c.New.ToStation)
		}
		rv.Changed = append(rv.Changed, cr)
	}
	move := func(e revdiff.Extreme, up bool) string {
		switch {
		case up && e.Delta >= revisionTolerance:
			return "+" + num(e.Delta) + " at " + num(e.Station)
		case !up && e.Delta <= -revisionTolerance:
			return "−" + num(-e.Delta) + " at " + num(e.Station)
		}
		return "–"
	}
	for i := range d.Profiles {
		p := &d.Profiles[i]
		for j := range p.Jumps {
			rv.Jumps = append(rv.Jumps, jumpRow{Reach: p.Reach, Event: p.Event, Move: p.Jumps[j].Text(unit)})
		}
		r := riseRow{Reach: p.Reach, Event: p.Event, Rise: move(p.Rise, true), Fall: move(p.Fall, false)}
		if p.Compared == 0 || (r.Rise == "–" && r.Fall == "–") {
			if len(p.Jumps) == 0 {
				rv.Unchanged++
			}
			continue
		}
		rv.Profiles = append(rv.Profiles, r)
	}
	return rv
}

// addExisting draws the existing revision's water surface through the
// points the comparison interpolated it at (the proposed model's computed
// points within the existing reach), thinned as the water surface is.
func (p *Plot) addExisting(pieces []piece, sc *scale, oldFile string) {
	var path pathBuilder
	for _, pc := range pieces {
		o := pc.old
		if o == nil || len(o.Stations) < 2 || len(o.OldWSE) != len(o.Stations) {
			continue
		}
		keep := make([]bool, len(o.Stations))
		if len(o.Stations) > maxPlotPoints {
			wse := func(i int) float64 { return o.OldWSE[i] }
			keep = thinKeep(len(o.Stations), func(i int) float64 { return o.Stations[i] }, wse, wse)
		} else {
			for i := range keep {
				keep[i] = true
			}
		}
		path.start()
		for i, k := range keep {
			if k {
				path.to(sc.x(pc.offset+o.Stations[i]), sc.y(o.OldWSE[i])) // a gap where it is not finite
			}
		}
	}
	p.Existing = path.String()
	if p.Existing != "" {
		p.ExistingTitle = "Water surface of the existing revision " + oldFile
		p.addNote("The dash-dot-dot line is the water surface of the existing revision (" + oldFile +
			"), at the proposed model's computed points.")
	}
}

// writeRevisionMarkdown writes the "Revision changes" section of a model,
// every name and message escaped (md, code).
func writeRevisionMarkdown(p func(string, ...any), rv *revisionView) {
	p("### Revision changes\n\n")
	p("Existing revision `%s`, proposed `%s`; findings matched as a baseline matches them. "+
		"The profiles above draw the existing water surface as a dash-dot-dot line.\n\n", code(rv.OldFile), code(rv.NewFile))
	findings := func(title string, rows []findingRow) {
		if len(rows) == 0 {
			return
		}
		p("**%s (%d)**\n\n| Severity | Rule | Reach | Event | Stations | Value | Limit | Message |\n|---|---|---|---|--:|--:|--:|---|\n", title, len(rows))
		for _, f := range rows {
			p("| %s | `%s` | %s | %s | %s | %s | %s | %s |\n", md(f.Severity), code(f.Rule), md(f.Reach), md(f.Event),
				md(f.Stations), md(f.Value), md(f.Limit), md(f.Message))
		}
		p("\n")
	}
	findings("New findings", rv.New)
	findings("Fixed findings", rv.Fixed)
	if len(rv.Changed) > 0 {
		p("**Changed findings (%d)**\n\n| Rule | Reach | Event | Value, existing → proposed | Stations, existing → proposed | Message |\n|---|---|---|--:|--:|---|\n", len(rv.Changed))
		for _, c := range rv.Changed {
			p("| `%s` | %s | %s | %s | %s | %s |\n", code(c.Rule), md(c.Reach), md(c.Event), md(c.Value), md(c.Stations), md(c.Message))
		}
		p("\n")
	}
	if len(rv.New)+len(rv.Fixed)+len(rv.Changed) == 0 {
		p("No finding is new, fixed or changed.\n\n")
	}
	if len(rv.Profiles) > 0 {
		p("| Reach | Event | Largest rise (%s, at station) | Largest fall |\n|---|---|--:|--:|\n", rv.Unit)
		for _, r := range rv.Profiles {
			p("| %s | %s | %s | %s |\n", md(r.Reach), md(r.Event), r.Rise, r.Fall)
		}
		p("\n")
	}
	if len(rv.Jumps) > 0 {
		p("**%s (%d)**\n\n%s\n\n| Reach | Event | Jump |\n|---|---|---|\n", jumpsTitle, len(rv.Jumps), jumpsNote)
		for _, j := range rv.Jumps {
			p("| %s | %s | %s |\n", md(j.Reach), md(j.Event), md(j.Move))
		}
		p("\n")
	}
	if rv.Unchanged > 0 {
		p("%s of reach and event with the water surface unchanged (within 0.0005 %s).\n\n", plural(rv.Unchanged, "pair"), rv.Unit)
	}
	p("Reaches added: %s. Reaches removed: %s.\n\n", md(orNone(rv.Added)), md(orNone(rv.Removed)))
	if len(rv.NoRise) > 0 {
		findings("No-rise findings", rv.NoRise)
	} else {
		p("No no_rise finding.\n\n")
	}
}

// The title and the note of the table of jump moves.
const (
	jumpsTitle = "Hydraulic jumps moved, appeared or gone"
	jumpsNote  = "Between the two toes of a moved jump one revision is on each side of the jump: the difference of the water surface there is the jump's move, kept out of the largest rise and fall above."
)

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}
