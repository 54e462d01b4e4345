package report

import (
	"bytes"
	"fmt"
	"net/url"
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
)

// md escapes a string for Markdown text and table cells (see
// safetext.Markdown: control and bidi characters made visible, HTML and
// Markdown syntax escaped, autolinks defanged).
func md(s string) string { return safetext.Markdown(s) }

// writeMarkdown renders the page as GitHub-flavoured Markdown; plots are
// image links to the SVG files named in plotView.File.
func writeMarkdown(b *bytes.Buffer, pg *page) {
	p := func(format string, a ...any) { fmt.Fprintf(b, format, a...) }
	p("# %s\n\n", md(pg.Title))
	if pg.ToolVersion != "" {
		p("chanlint review report, version %s\n\n", md(pg.ToolVersion))
	}
	p("> **Caution.** %s\n\n", md(pg.Caution))

	p("## Summary\n\n")
	t := pg.Totals
	p("**Overall: %s.** %d errors, %d warnings, %d info, %d covered by exceptions, %d invalid files.\n\n",
		md(t.Verdict()), t.Errors, t.Warnings, t.Infos, t.Excepted, pg.InvalidN)
	if len(pg.Models) > 0 {
		p("| Model | File | Units | Reaches | Events | Errors | Warnings | Info | Excepted | Status |\n")
		p("|---|---|---|--:|--:|--:|--:|--:|--:|---|\n")
		for _, m := range pg.Models {
			p("| %s | `%s` | %s | %d | %d | %d | %d | %d | %d | %s |\n", md(orFile(m.Title, m.File)), code(m.File), md(m.Units),
				m.Reaches, m.EventsN, m.Counts.Errors, m.Counts.Warnings, m.Counts.Infos, m.Counts.Excepted, md(m.Counts.Verdict()))
		}
		p("\n")
	}
	if pv := pg.Policy; pv != nil {
		p("### Policy applied\n\n")
		for _, n := range pv.Notes {
			if n.Warn {
				p("**Warning: %s**\n\n", md(n.Text))
			} else {
				p("%s\n\n", md(n.Text))
			}
		}
		p("- Policy: %s\n", md(pv.Name))
		if pv.Reference != "" {
			p("- Reference: %s\n", md(pv.Reference))
		}
		p("- Source: `%s`\n", code(pv.Source))
		if len(pv.Chain) > 0 {
			cs := make([]string, len(pv.Chain))
			for i, c := range pv.Chain {
				cs[i] = "`" + code(c) + "`"
			}
			p("- Merged from: %s\n", strings.Join(cs, " ← "))
		}
		for _, f := range pv.Files {
			h := f.SHA256
			if h == "" {
				h = "unreadable"
			}
			p("- SHA-256 of `%s`: `%s`\n", code(f.Name), h)
		}
		p("- Units of its numbers: %s (converted to each model's units)\n", md(pv.Units))
		p("- Design exceptions: %s\n\n", md(pv.Exceptions))
		if len(pv.Rules) > 0 {
			p("| Criterion | Severity | Events | Settings |\n|---|---|---|---|\n")
			for _, r := range pv.Rules {
				p("| `%s` | %s | %s | %s |\n", code(r.ID), md(r.Severity), md(r.Events), md(r.Settings))
			}
			p("\n")
		}
	}
	for _, s := range pg.Sensitivity {
		p("**%s**\n\n", md(s))
	}

	for _, m := range pg.Models {
		p("## %s\n\n", md(orFile(m.Title, m.File)))
		p("`%s` · %s · %d reaches, %d events. **%s.**\n\n", code(m.File), md(m.UnitsLong), m.Reaches, m.EventsN, md(m.Counts.Verdict()))
		if m.SHA256 != "" {
			p("SHA-256 `%s`\n\n", m.SHA256)
		}
		if m.Unsolved != "" {
			p("_%s_\n\n", md(m.Unsolved))
		}
		for _, a := range m.Assumptions {
			p("_%s_\n\n", md(a))
		}
		if len(m.NotEvaluated) > 0 {
			p("**Not evaluated:**\n\n")
			for _, ne := range m.NotEvaluated {
				p("- %s\n", md(ne))
			}
			p("\n")
		}
		q := "m³/s"
		if m.Units == "us" {
			q = "ft³/s"
		}
		for _, ev := range m.Events {
			p("### Event %s\n\n", md(ev.Name))
			for _, pl := range ev.Plots {
				if pl.File == "" {
					continue
				}
				p("![%s](%s)\n\n", md(pl.Title), (&url.URL{Path: pl.File}).EscapedPath())
				if pl.Caption != "" {
					p("_%s_\n\n", md(pl.Caption))
				}
			}
			if len(ev.Reaches) > 0 {
				p("| Reach | Discharge (%s) | Slope | Profiles | Max velocity | Froude range | Least freeboard | Jumps | Solver |\n", q)
				p("|---|--:|---|---|--:|--:|--:|---|---|\n")
				for _, r := range ev.Reaches {
					p("| %s | %s | %s | %s | %s | %s | %s | %s | %s |\n", md(r.Name), r.Discharge, md(r.Slope), md(r.Profiles),
						md(r.Velocity), md(r.Froude), md(r.Freeboard), md(r.Jumps), md(r.Notes))
				}
				p("\n")
			}
			if len(ev.Culverts) > 0 {
				p("Culvert performance (FHWA HDS-5):\n\n")
				p("| Culvert | Headwater | HW/D | Governing | Inlet control | Outlet control | Barrel flow | Road flow | Depth over road | Outlet velocity |\n")
				p("|---|--:|--:|---|--:|--:|--:|--:|--:|--:|\n")
				for _, c := range ev.Culverts {
					p("| %s | %s | %s | %s | %s | %s | %s | %s | %s | %s |\n", md(c.Name), c.Headwater, c.HWD, md(c.Control),
						c.Inlet, c.Outlet, c.Barrel, c.Road, c.OverRoad, c.OutletVelocity)
				}
				p("\n")
			}
		}
		if rv := m.Revision; rv != nil {
			writeRevisionMarkdown(p, rv)
		}
		p("### Findings\n\n")
		if len(m.Findings) == 0 {
			p("No findings.\n\n")
		} else {
			p("| # | Severity | Rule | Reach | Event | Stations | Value | Limit | Message | Location |\n")
			p("|--:|---|---|---|---|--:|--:|--:|---|---|\n")
			for _, f := range m.Findings {
				sev := md(f.Severity)
				msg := md(f.Message)
				if f.Envelope != "" {
					msg += " — envelope: _" + md(f.Envelope) + "_"
				}
				if f.Excepted {
					sev = "excepted (" + sev + ")"
					msg += " — _exception: " + md(f.Reason) + "_"
				}
				for _, rel := range f.Related {
					msg += " — see: " + md(rel)
				}
				p("| %d | %s | `%s` | %s | %s | %s | %s | %s | %s | `%s` |\n", f.N, sev, code(f.Rule), md(f.Reach), md(f.Event),
					md(f.Stations), md(f.Value), md(f.Limit), msg, code(f.Where))
			}
			p("\n")
		}
		p("### Design exceptions claimed\n\n")
		if len(m.Exceptions) == 0 {
			p("None.\n\n")
		} else {
			p("| Rule | Reach | Stations | Reason given | Location | Effect |\n|---|---|--:|---|---|---|\n")
			for _, e := range m.Exceptions {
				p("| `%s` | %s | %s | %s | `%s` | %s |\n", code(e.Rule), md(e.Reach), md(e.Stations), md(e.Reason), code(e.Where), md(e.State))
			}
			p("\n")
		}
		if len(m.Coverage) > 0 {
			p("### Coverage\n\n| Reach | Event | Criterion | Status | Detail | Reference |\n|---|---|---|---|---|---|\n")
			for _, c := range m.Coverage {
				p("| %s | %s | `%s` | %s | %s | %s |\n", md(c.Reach), md(c.Event), code(c.Criterion), md(c.Status), md(c.Detail), md(c.Reference))
			}
			p("\n")
		}
	}
	if len(pg.Invalid) > 0 {
		p("## Invalid files\n\nThese files are not valid models and were not checked.\n\n")
		p("| Location | Severity | Message |\n|---|---|---|\n")
		for _, f := range pg.Invalid {
			p("| `%s` | %s | %s |\n", code(f.Where), md(f.Severity), md(f.Message))
		}
		p("\n")
	}
	p("---\n\n**Caution.** %s\n", md(pg.Caution))
}

// code makes a string safe inside a Markdown code span in a table: no
// backticks (which would end the span), no pipes, no line breaks.
func code(s string) string {
	return strings.NewReplacer("`", "'", "|", "¦", "\r", " ", "\n", " ").Replace(s)
}

func orFile(title, file string) string {
	if title != "" {
		return title
	}
	return file
}
