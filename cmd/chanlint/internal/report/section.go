package report

import "strconv"

// A model's section of the page (its events with their plots and tables,
// the revision changes, the findings, the exceptions claimed and the
// coverage) is written in Go rather than by html/template: a page of 100
// models holds some 20,000 table rows, and walking them through the
// template's reflection cost more than checking the models did. The page
// around the sections (head, summary, policy, invalid files, footer)
// stays in templates/page.html.tmpl.
//
// Every string from a model or a policy goes through markup.text or
// markup.attrValue, which escape exactly as html/template escapes HTML text
// and quoted attribute values (TestAppendEscapedMatchesHTMLTemplate), so a
// submittal cannot inject markup here either. Ids and links are the
// view's own anchors ("m1", "m1-f3", "m1-ev-" + slug, see eventAnchors),
// letters, digits and '-' only, so they need no URL escaping
// (TestPageIdsUniqueAndLinked).

// sectionHTML writes a model's section of the page, its plots drawn in
// place (a plot's markup is written once, into the section).
func sectionHTML(w *markup, mv *modelView) {
	w.raw("\n<section class=\"model\" id=\"").attrValue(mv.Anchor).raw("\">\n<h2><bdi>").text(mv.name()).raw("</bdi></h2>")
	w.raw("\n<div class=\"model-head\">\n<p><span class=\"mono\">").text(mv.File).raw("</span> · ").text(mv.UnitsLong).raw(" · ")
	w.int(mv.Reaches).raw(" reach")
	if mv.Reaches != 1 {
		w.raw("es")
	}
	w.raw(", ").int(mv.EventsN).raw(" event")
	if mv.EventsN != 1 {
		w.raw("s")
	}
	w.raw("</p>")
	if mv.SHA256 != "" {
		w.raw("<p class=\"mono\">SHA-256 ").text(mv.SHA256).raw("</p>")
	}
	w.raw("\n<p class=\"verdict ").attrValue(mv.Counts.Class()).raw("\">").text(mv.Counts.Verdict())
	if mv.Counts.Excepted != 0 {
		w.raw("; ").int(mv.Counts.Excepted).raw(" covered by exceptions")
	}
	w.raw("</p>\n</div>")
	if mv.Unsolved != "" {
		w.raw("<p class=\"note\">").text(mv.Unsolved).raw("</p>")
	}
	for _, a := range mv.Assumptions {
		w.raw("<p class=\"note\">").text(a).raw("</p>")
	}
	if len(mv.NotEvaluated) > 0 {
		w.raw("\n<details class=\"not-evaluated\" open><summary>Not evaluated</summary>\n<ul>")
		for _, s := range mv.NotEvaluated {
			w.raw("<li>").text(s).raw("</li>")
		}
		w.raw("</ul>\n</details>")
	}
	for _, ev := range mv.Events {
		w.event(ev, mv.Units == "us")
	}
	if mv.Revision != nil {
		w.raw("\n")
		w.revision(mv.Revision)
	}
	w.findings(mv)
	w.exceptions(mv.Exceptions)
	w.coverage(mv)
	w.raw("\n</section>")
}

// name is the model's heading: its title, else its file.
func (mv *modelView) name() string {
	if mv.Title != "" {
		return mv.Title
	}
	return mv.File
}

func (w *markup) event(ev *eventView, us bool) {
	w.raw("\n<section class=\"event\" id=\"").attrValue(ev.Anchor).raw("\">\n<h3>Event <bdi>").text(ev.Name).raw("</bdi></h3>")
	for _, p := range ev.Plots {
		if p.Small {
			continue
		}
		w.raw("\n<figure>\n").plot(p)
		w.raw("\n<figcaption>Stations run downstream. Shaded bands mark spans that fail a criterion; the number is the row of the findings table.")
		if p.Caption != "" {
			w.raw(" ").text(p.Caption)
		}
		w.raw("</figcaption>\n</figure>")
	}
	w.raw("\n<div class=\"small-plots\">")
	for _, p := range ev.Plots {
		if !p.Small {
			continue
		}
		w.raw("\n<figure>\n").plot(p)
		if p.Caption != "" {
			w.raw("<figcaption>").text(p.Caption).raw("</figcaption>")
		}
		w.raw("\n</figure>")
	}
	w.raw("\n</div>")
	length, flow, speed := "m", "m³/s", "m/s"
	if us {
		length, flow, speed = "ft", "ft³/s", "ft/s"
	}
	if len(ev.Reaches) > 0 {
		w.raw("\n<table>\n<thead><tr><th>Reach</th><th class=\"num\">Discharge (").raw(flow)
		w.raw(")</th><th>Slope</th><th>Profiles</th><th class=\"num\">Max velocity</th><th class=\"num\">Froude range</th><th class=\"num\">Least freeboard</th><th>Jumps</th><th>Solver</th></tr></thead>\n<tbody>")
		for i := range ev.Reaches {
			r := &ev.Reaches[i]
			w.raw("\n<tr>").cell(tdName, r.Name).cell(tdNum, r.Discharge).cell(td, r.Slope).cell(td, r.Profiles).
				cell(tdNum, r.Velocity).cell(tdNum, r.Froude).cell(tdNum, r.Freeboard).cell(td, r.Jumps).cell(td, r.Notes).raw("</tr>")
		}
		w.raw("\n</tbody>\n</table>")
	}
	if len(ev.Culverts) > 0 {
		w.raw("\n<table>\n<caption>Culvert performance (FHWA HDS-5; levels in ").raw(length).raw(", flows in ").raw(flow).
			raw(", velocity in ").raw(speed).raw(")</caption>")
		w.raw("\n<thead><tr><th>Culvert</th><th class=\"num\">Headwater</th><th class=\"num\">HW/D</th><th>Governing</th><th class=\"num\">Inlet control</th><th class=\"num\">Outlet control</th><th class=\"num\">Barrel flow</th><th class=\"num\">Road flow</th><th class=\"num\">Depth over road</th><th class=\"num\">Outlet velocity</th></tr></thead>\n<tbody>")
		for i := range ev.Culverts {
			c := &ev.Culverts[i]
			w.raw("\n<tr>").cell(tdAuto, c.Name).cell(tdNum, c.Headwater).cell(tdNum, c.HWD).cell(td, c.Control).
				cell(tdNum, c.Inlet).cell(tdNum, c.Outlet).cell(tdNum, c.Barrel).cell(tdNum, c.Road).
				cell(tdNum, c.OverRoad).cell(tdNum, c.OutletVelocity).raw("</tr>")
		}
		w.raw("\n</tbody>\n</table>")
	}
	w.raw("\n</section>")
}

func (w *markup) findings(mv *modelView) {
	w.raw("\n\n<h3 id=\"").attrValue(mv.Anchor).raw("-findings\">Findings</h3>")
	if len(mv.Findings) == 0 {
		w.raw("\n<p class=\"note\">No findings.</p>")
		return
	}
	w.raw("\n<table>\n<thead><tr><th class=\"num\">#</th><th>Severity</th><th>Rule</th><th>Reach</th><th>Event</th><th class=\"num\">Stations</th><th class=\"num\">Value</th><th class=\"num\">Limit</th><th>Message</th><th>Line:col</th></tr></thead>\n<tbody>")
	for i := range mv.Findings {
		f := &mv.Findings[i]
		w.raw("\n<tr class=\"").attrValue(f.Class).raw("\" id=\"").attrValue(f.Anchor).raw("\">")
		w.raw("<td class=\"num\"><a href=\"#").attrValue(f.Anchor).raw("\">").int(f.N).raw("</a></td>")
		w.raw("<td class=\"nowrap\"><span class=\"sev ").attrValue(f.Class).raw("\">")
		if f.Excepted {
			w.raw("excepted")
		} else {
			w.text(f.Severity)
		}
		w.raw("</span></td>").cell(tdMono, f.Rule).cell(tdName, f.Reach).cell(tdName, f.Event).
			cell(tdNum, f.Stations).cell(tdNum, f.Value).cell(tdNum, f.Limit)
		// The message's cell: the message, then its verdict over a
		// sensitivity run, its exception and the places that explain it.
		w.raw(tdName).raw("<bdi>").text(f.Message).raw("</bdi>")
		if f.Envelope != "" {
			w.raw("<br><span class=\"envelope ").attrValue(f.Verdict).raw("\">Envelope: ").text(f.Envelope).raw("</span>")
		}
		if f.Excepted {
			w.raw("<br><em>Exception (").text(f.Severity).raw("): <bdi>").text(f.Reason).raw("</bdi></em>")
		}
		for _, r := range f.Related {
			w.raw("<br><span class=\"related\">See: <bdi>").text(r).raw("</bdi></span>")
		}
		w.raw("</td>")
		w.raw("<td class=\"mono nowrap\" title=\"").attrValue(f.Where).raw("\">").text(f.Short).raw("</td></tr>")
	}
	w.raw("\n</tbody>\n</table>")
}

func (w *markup) exceptions(rows []exceptionRow) {
	w.raw("\n\n<h3>Design exceptions claimed</h3>")
	if len(rows) == 0 {
		w.raw("\n<p class=\"note\">None.</p>")
		return
	}
	w.raw("\n<table>\n<thead><tr><th>Rule</th><th>Reach</th><th class=\"num\">Stations</th><th>Reason given</th><th>Line:col</th><th>Effect</th></tr></thead>\n<tbody>")
	for i := range rows {
		e := &rows[i]
		w.raw("\n<tr>").cell(tdMono, e.Rule).cell(tdAuto, e.Reach).cell(tdNum, e.Stations).isolated(td, e.Reason).
			raw("<td class=\"mono nowrap\" title=\"").attrValue(e.Where).raw("\">").text(e.Short).raw("</td>")
		state := `<td class="state-none">`
		if e.Covered != 0 {
			state = `<td class="state-ok">`
		}
		w.cell(state, e.State).raw("</tr>")
	}
	w.raw("\n</tbody>\n</table>")
}

func (w *markup) coverage(mv *modelView) {
	if len(mv.Coverage) == 0 {
		return
	}
	w.raw("\n\n<h3>Coverage</h3>\n<table>\n<thead><tr><th>Reach</th><th>Event</th><th>Criterion</th><th>Status</th><th>Detail</th><th>Reference</th></tr></thead>\n<tbody>")
	for i := range mv.Coverage {
		c := &mv.Coverage[i]
		w.raw("\n<tr>").cell(tdAuto, c.Reach).cell(tdAuto, c.Event).cell(tdMono, c.Criterion).cell(tdNowrap, c.Status).
			isolated(td, c.Detail).isolated(td, c.Reference).raw("</tr>")
	}
	w.raw("\n</tbody>\n</table>")
}

// revision writes the "Revision changes" section (revisionView).
func (w *markup) revision(rv *revisionView) {
	w.raw("\n<section class=\"revision\">\n<h3>Revision changes</h3>\n<p>Existing revision <span class=\"mono\"><bdi>").text(rv.OldFile).
		raw("</bdi></span>, proposed <span class=\"mono\"><bdi>").text(rv.NewFile).
		raw("</bdi></span>; findings matched as a baseline matches them. The profiles above draw the existing water surface as a dash-dot-dot line.</p>")
	w.revFindings("New findings", rv.New)
	w.revFindings("Fixed findings", rv.Fixed)
	if len(rv.Changed) > 0 {
		w.raw("\n<table>\n<caption>Changed findings (").int(len(rv.Changed)).raw(")</caption>")
		w.raw("\n<thead><tr><th>Rule</th><th>Reach</th><th>Event</th><th class=\"num\">Value, existing → proposed</th><th class=\"num\">Stations, existing → proposed</th><th>Message</th></tr></thead>\n<tbody>")
		for i := range rv.Changed {
			c := &rv.Changed[i]
			w.raw("\n<tr>").cell(tdMono, c.Rule).cell(tdName, c.Reach).cell(tdName, c.Event).cell(tdNum, c.Value).
				cell(tdNum, c.Stations).isolated(tdName, c.Message).raw("</tr>")
		}
		w.raw("\n</tbody>\n</table>")
	}
	if len(rv.New)+len(rv.Fixed)+len(rv.Changed) == 0 {
		w.raw("\n<p class=\"note\">No finding is new, fixed or changed.</p>")
	}
	if len(rv.Profiles) > 0 {
		w.raw("\n<table>\n<caption>Water surface, proposed minus existing: the largest rise and fall in ").text(rv.Unit).
			raw(", at their station in ").text(rv.Unit).raw("</caption>")
		w.raw("\n<thead><tr><th>Reach</th><th>Event</th><th class=\"num\">Largest rise</th><th class=\"num\">Largest fall</th></tr></thead>\n<tbody>")
		for i := range rv.Profiles {
			p := &rv.Profiles[i]
			w.raw("\n<tr>").cell(tdName, p.Reach).cell(tdName, p.Event).cell(tdNum, p.Rise).cell(tdNum, p.Fall).raw("</tr>")
		}
		w.raw("\n</tbody>\n</table>")
	}
	if len(rv.Jumps) > 0 {
		w.raw("\n<table>\n<caption>").text(jumpsTitle).raw(" (").int(len(rv.Jumps)).raw(")</caption>")
		w.raw("\n<thead><tr><th>Reach</th><th>Event</th><th>Jump</th></tr></thead>\n<tbody>")
		for i := range rv.Jumps {
			j := &rv.Jumps[i]
			w.raw("\n<tr>").cell(tdName, j.Reach).cell(tdName, j.Event).isolated(td, j.Move).raw("</tr>")
		}
		w.raw("\n</tbody>\n</table>\n<p class=\"note\">").text(jumpsNote).raw("</p>")
	}
	if rv.Unchanged != 0 {
		w.raw("\n<p class=\"note\">").int(rv.Unchanged).raw(" pair")
		if rv.Unchanged != 1 {
			w.raw("s")
		}
		w.raw(" of reach and event with the water surface unchanged (within 0.0005 ").text(rv.Unit).raw(").</p>")
	}
	w.raw("\n<p>Reaches added: <bdi>").text(orNone(rv.Added)).raw("</bdi>. Reaches removed: <bdi>").text(orNone(rv.Removed)).raw("</bdi>.</p>")
	if len(rv.NoRise) > 0 {
		w.revFindings("No-rise findings", rv.NoRise)
	} else {
		w.raw("\n<p class=\"note\">No no_rise finding.</p>")
	}
	w.raw("\n</section>")
}

// revFindings writes a titled table of findings of the revision section;
// nothing without rows.
func (w *markup) revFindings(title string, rows []findingRow) {
	if len(rows) == 0 {
		return
	}
	w.raw("\n<table>\n<caption>").text(title).raw(" (").int(len(rows)).raw(")</caption>")
	w.raw("\n<thead><tr><th>Severity</th><th>Rule</th><th>Reach</th><th>Event</th><th class=\"num\">Stations</th><th class=\"num\">Value</th><th class=\"num\">Limit</th><th>Message</th></tr></thead>\n<tbody>")
	for i := range rows {
		f := &rows[i]
		w.raw("\n<tr class=\"").attrValue(f.Class).raw("\"><td class=\"nowrap\"><span class=\"sev ").attrValue(f.Class).raw("\">").text(f.Severity).
			raw("</span></td>").cell(tdMono, f.Rule).cell(tdName, f.Reach).cell(tdName, f.Event).
			cell(tdNum, f.Stations).cell(tdNum, f.Value).cell(tdNum, f.Limit).isolated(tdName, f.Message).raw("</tr>")
	}
	w.raw("\n</tbody>\n</table>")
}

// The table cells' start tags.
const (
	td       = "<td>"
	tdNum    = `<td class="num">`
	tdName   = `<td class="name" dir="auto">` // a name from the model, which may be a long word or right to left
	tdAuto   = `<td dir="auto">`
	tdMono   = `<td class="mono">`
	tdNowrap = `<td class="nowrap">`
)

// cell writes a table cell of escaped text.
func (w *markup) cell(start, s string) *markup {
	return w.raw(start).text(s).raw("</td>")
}

// isolated writes a table cell of escaped text isolated for the
// bidirectional algorithm (<bdi>), for free text from a model or a policy.
func (w *markup) isolated(start, s string) *markup {
	return w.raw(start).raw("<bdi>").text(s).raw("</bdi></td>")
}

// attrValue writes a quoted attribute's value; html/template escapes it as it
// escapes text.
func (w *markup) attrValue(s string) *markup { return w.text(s) }

// plot writes a plot of the section.
func (w *markup) plot(p *plotView) *markup { w.inlineSVG(p.Plot); return w }

// int writes a count.
func (w *markup) int(n int) *markup { w.b = strconv.AppendInt(w.b, int64(n), 10); return w }
