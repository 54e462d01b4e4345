package main

import (
	"bytes"
	"flag"
	"fmt"
	"path/filepath"
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/checklist"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/report"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
)

func reportCommand() *command {
	return &command{
		name:    "report",
		summary: "write a review report (HTML, or Markdown with SVG plots)",
		run:     func(a *app, args []string) int { return a.runReport(args) },
		help:    func(*app) string { return reportUsage() },
	}
}

type reportFlags struct {
	out       string
	format    *choice
	policy    string
	approvals string
	color     *choice
	jobs      int
	vary      string
}

func newReportFlags() (*reportFlags, *flag.FlagSet) {
	rf := &reportFlags{
		format: newChoice("", "html", "markdown"),
		color:  newChoice("auto", "auto", "always", "never"),
	}
	fs := newFlagSet("report")
	fs.StringVar(&rf.out, "out", "", "write the report to `FILE` (required; - for standard output)")
	fs.Var(rf.format, "format", "report format (default: markdown when FILE ends in .md, else html)")
	fs.StringVar(&rf.policy, "policy", "", "policy `FILE` or built-in pack name (default: "+configName+", else the baseline pack)")
	fs.StringVar(&rf.approvals, "approvals", "", "the reviewer's approved exceptions `FILE`, counted under a policy with exceptions = \"approved\"")
	fs.Var(rf.color, "color", "colour the diagnostics printed on stderr")
	fs.IntVar(&rf.jobs, "jobs", 0, "solve `N` files at once (default: the number of CPUs)")
	fs.IntVar(&rf.jobs, "j", 0, "short for --jobs")
	fs.StringVar(&rf.vary, "vary", "", varyUsage)
	return rf, fs
}

func reportUsage() string {
	_, fs := newReportFlags()
	return `usage: chanlint report [PATH...] --out FILE [options]

Checks the models under each PATH like 'chanlint check' and writes a review
report for a person: per model and event a longitudinal profile (bed, water
surface, critical depth, top of bank, jumps, failing spans), the findings,
the design exceptions claimed and the caution.

With --vary (or a policy's sensitivity block) every event is solved again
over the envelope as in 'chanlint check': each finding shows its verdict,
and the profiles draw the range of the water surface as a hatched band.

  html      one self-contained file (default)
  markdown  FILE, exactly as named, and the SVG plots beside it (for
            review.md: review-1.svg, review-2.svg, ...)

--out - writes the report to standard output (Markdown with its plots
inline, since there is no directory to put them in).

Invalid models are listed in the report and their diagnostics printed on
stderr.

options:
` + flagUsage(fs) + `
exit status: 0 report written (whatever it finds); 2 an unreadable or invalid
model or policy, a report that could not be written, or a wrong command line.
`
}

func (a *app) runReport(args []string) int {
	c := findCommand("report")
	rf, fs := newReportFlags()
	paths, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if rf.out == "" {
		return a.usageError(c, "--out FILE is required")
	}
	if rf.jobs < 0 {
		return a.usageError(c, "--jobs must not be negative, got %d", rf.jobs)
	}
	if err := a.setVary(rf.vary); err != nil {
		return a.usageError(c, "--vary: %v", err)
	}
	toStdout := rf.out == "-"
	format := reportFormat(rf.out, rf.format.value)
	errPal := newPalette(a.useColor(rf.color.value, a.stderrTTY))
	pol, ok := a.loadPolicy(rf.policy, errPal)
	if !ok || !a.loadApprovals(rf.approvals, pol, errPal) {
		return exitInvalid
	}
	results := a.checkPaths(paths, pol, rf.jobs, pipeline.Keep{Solved: true, Source: true})

	in, info := a.reportInput(pol, paths)
	status := exitOK
	for _, r := range results {
		if r.Invalid {
			status = exitInvalid
			for i := range r.Findings {
				writeFindingText(a.stderr, &r.Findings[i], r.Src, r.Unit(), errPal)
			}
			if r.Model == nil {
				in.Invalid = append(in.Invalid, r.Findings...)
				continue
			}
			// A valid model the solver could not finish (a size limit):
			// listed with its findings and no profiles.
		}
		m := report.Model{Model: r.Model, Result: r.Solution, Findings: r.Findings, NotEvaluated: r.NotEvaluated,
			Coverage: checklist.Build(r.Model, r.Solution, pol, r.Findings)}
		if r.Src != nil {
			m.SHA256 = checklist.Hash(r.Src)
		}
		if r.Sensitivity.Active() {
			m.Envelope = &report.Envelope{Sizes: r.Sensitivity.String(), Cases: len(r.Cases), Bands: r.Bands}
			in.SensitivitySource = "the policy's sensitivity block"
			if a.vary != nil {
				in.SensitivitySource = "--vary"
			}
		}
		in.Models = append(in.Models, m)
	}

	abs := a.abs(rf.out)
	n := 0
	for _, m := range in.Models {
		n += len(m.Findings)
	}
	if err := a.writeReport(rf.out, format, in, results); err != nil {
		fmt.Fprintf(a.stderr, "chanlint report: cannot write %s: %v\n", a.display(abs), describePathError(err))
		return exitInvalid
	}
	if toStdout {
		// Standard output holds the report: the account goes to stderr.
		fmt.Fprintf(a.stderr, "chanlint report: %s, %s, policy %s\n",
			plural(len(in.Models), "model", "models"), plural(n, "finding", "findings"), pol.Name)
		return status
	}
	fmt.Fprintf(a.stdout, "wrote %s: %s, %s, policy %s\n", a.display(abs),
		plural(len(in.Models), "model", "models"), plural(n, "finding", "findings"), safetext.Text(pol.Name))
	for _, n := range info.NoteTexts() {
		fmt.Fprintln(a.stdout, safetext.Text(n))
	}
	return status
}

// reportFormat is the format of a report written to out: format when
// given, else markdown for a FILE ending in .md or .markdown, else html.
func reportFormat(out, format string) string {
	if format != "" {
		return format
	}
	if ext := strings.ToLower(filepath.Ext(out)); ext == ".md" || ext == ".markdown" {
		return "markdown"
	}
	return "html"
}

// reportInput starts a report's input with the policy as every output
// shows it (its own reference, its printed path) and its notes.
func (a *app) reportInput(pol *policies.Policy, paths []string) (report.Input, policyInfo) {
	info := a.describePolicy(pol, paths)
	shownPol := *pol
	shownPol.Reference, shownPol.File = info.Reference, a.policySource(pol)
	in := report.Input{Policy: &shownPol, Caution: rules.Caution, ToolVersion: toolVersion(),
		PolicyFiles: checklist.PolicyInputs(pol, a.display)}
	for _, n := range info.Notes() {
		in.PolicyNotes = append(in.PolicyNotes, report.PolicyNote{Text: n.Text, Warn: n.Warn})
	}
	return in, info
}

// writeReport writes the report in to out in format ("html" or
// "markdown"): "-" is standard output (Markdown with its plots inline),
// else the file is replaced atomically, never over one of the run's
// input models (results).
func (a *app) writeReport(out, format string, in report.Input, results []*pipeline.Result) error {
	for _, r := range results {
		if r.File.Path != "" {
			in.Protect = append(in.Protect, r.File.Path)
		}
	}
	var buf bytes.Buffer
	var err error
	switch {
	case out == "-" && format == "markdown":
		// One stream cannot hold the page and its SVG files: the page
		// goes out with each plot inline.
		if err = report.MarkdownInline(&buf, in); err == nil {
			_, err = a.stdout.Write(buf.Bytes())
		}
	case out == "-":
		err = report.HTML(a.stdout, in)
	case format == "markdown":
		abs := a.abs(out)
		err = report.Markdown(filepath.Dir(abs), filepath.Base(abs), in)
	default:
		var page [][]byte
		if page, err = report.Page(in); err == nil {
			err = a.writeOutput(a.abs(out), results, page...)
		}
	}
	return err
}
