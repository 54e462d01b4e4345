// Package report writes the review report of `chanlint report`: a single
// self-contained HTML page (inline CSS and inline SVG, no scripts, fonts or
// external resources), or Markdown with the SVG plots in files beside it,
// for a person who reviews a submittal.
//
// The page holds: the policy applied (name, reference, source), a summary
// per model, and for each model and event a longitudinal profile plot —
// bed, water surface, critical-depth line (invert + yc), energy grade, top
// of bank or lining (invert + section height), hydraulic jumps with F₁ and
// type, basins, bends, gates, and the failing spans of the findings
// numbered as in the findings table. A network is drawn as its main stem
// (the longest headwater-to-outlet path, stations accumulated along it,
// reach boundaries named) followed by a smaller plot of every other reach.
// Then the findings table, the design exceptions claimed (with their
// reasons and whether each covered a finding), the files that are not
// valid models with their diagnostics, and the caution. A model checked
// over a sensitivity envelope (Model.Envelope) adds the run's account
// under the policy, each finding's verdict under its message, and on each
// profile the range of the water surface over the cases as a hatched band.
//
// Every string that comes from a model or a policy is escaped, so a
// submittal cannot inject markup into the page: by html/template in the
// page around the models (templates/page.html.tmpl), and in the models'
// sections and plots, which are written in Go (section.go, plotsvg.go),
// by appendEscaped, which escapes exactly as html/template does. The
// output depends only on the input: no dates, no machine names.
package report

import (
	"bytes"
	"embed"
	"encoding/base64"
	"fmt"
	"html/template"
	"io"
	"math"
	"path/filepath"
	"regexp"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/checklist"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
)

// Model is one valid model with its solution and its findings.
type Model struct {
	Model    *model.Model
	Result   *solver.Result // nil when the model could not be solved
	Findings []rules.Finding
	// SHA256 is the hash of the model file's text ("" when not known).
	SHA256 string
	// Coverage is the model's reach × event × criterion matrix
	// (checklist.Build).
	Coverage []checklist.Row
	// Envelope is the sensitivity run the model was checked over; nil
	// without one.
	Envelope *Envelope
	// Revision is the comparison with the model's existing revision
	// (`chanlint diff --out`): the plots draw the existing water surface
	// and the page adds a "Revision changes" section; nil without one.
	Revision *revdiff.Diff
	// NotEvaluated says what the check did not evaluate (see
	// rules.NotEvaluated); the model's section lists it.
	NotEvaluated []string
}

// Envelope describes a model's sensitivity run (pipeline.CheckVaried):
// the findings carry their verdicts (rules.Finding.Envelope), the plots
// draw the range of the water surface.
type Envelope struct {
	Sizes string // pipeline.Sensitivity.String(), in the model's units
	Cases int    // perturbed cases solved per event (the nominal not counted)
	// Bands are the water surface's range per event and reach
	// (pipeline.Result.Bands).
	Bands []pipeline.Band
}

// Input is what a report shows.
type Input struct {
	Models []Model
	Policy *policies.Policy
	// Protect lists the paths a report must never replace: the run's
	// input models.
	Protect []string
	// PolicyNotes say where the policy came from and what it turns off;
	// shown under "Policy applied", a Warn note as a warning.
	PolicyNotes []PolicyNote
	Caution     string // normally rules.Caution
	// SensitivitySource says who asked for the models' sensitivity runs
	// ("--vary", "the policy's sensitivity block");
	// shown with the run's sizes under "Policy applied".
	SensitivitySource string
	Invalid           []rules.Finding // diagnostics of files that are not valid models
	ToolVersion       string
	// PolicyFiles are the files and packs of the policy's extends chain
	// with their SHA-256, child first.
	PolicyFiles []checklist.Input
}

//go:embed templates/*.tmpl
var templateFS embed.FS

var tmpl = template.Must(template.ParseFS(templateFS, "templates/*.tmpl"))

// HTML writes the report as one self-contained HTML page.
func HTML(w io.Writer, in Input) error {
	parts, err := Page(in)
	if err != nil {
		return err
	}
	for _, b := range parts {
		if _, err := w.Write(b); err != nil {
			return err
		}
	}
	return nil
}

// Page is the report as one self-contained HTML page, in parts to be
// written one after another: the head, each model's section and the
// foot. A page of 100 models is some 15 MB, and copying the sections into
// one buffer cost a tenth of the report.
func Page(in Input) ([][]byte, error) {
	pg := build(in, renderer{model: sectionHTML})
	var head, foot bytes.Buffer
	if err := tmpl.ExecuteTemplate(&head, "head", pg); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	if err := tmpl.ExecuteTemplate(&foot, "foot", pg); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	parts := make([][]byte, 0, len(pg.Models)+2)
	parts = append(parts, head.Bytes())
	for _, mv := range pg.Models {
		parts = append(parts, mv.html)
	}
	return append(parts, foot.Bytes()), nil
}

// Markdown writes the page to the file named file in dir, exactly as
// named, with each profile plot as an SVG file beside it (for review.md:
// review-1.svg, review-2.svg, ...) linked relatively. file is used as a
// file name only (any directory part is dropped).
func Markdown(dir, file string, in Input) error {
	file = filepath.Base(file)
	if file == "" || file == "." || file == string(filepath.Separator) {
		file = "chanlint-report.md"
	}
	// The plots are named after the page without its extension:
	// review.md → review-1.svg.
	name := strings.TrimSuffix(file, filepath.Ext(file))
	if name == "" {
		name = file
	}
	pg := build(in, renderer{plot: fileSVG})
	var files []safefile.File
	k := 0
	for _, m := range pg.Models {
		for _, ev := range m.Events {
			for _, p := range ev.Plots {
				k++
				p.File = fmt.Sprintf("%s-%d.svg", name, k)
				files = append(files, safefile.File{Path: filepath.Join(dir, p.File), Data: p.svg})
			}
		}
	}
	var md bytes.Buffer
	writeMarkdown(&md, pg)
	files = append(files, safefile.File{Path: filepath.Join(dir, file), Data: md.Bytes()})
	for _, f := range files {
		for _, p := range in.Protect {
			if safefile.SameFile(f.Path, p) {
				return fmt.Errorf("report: %s: %w", filepath.Base(f.Path), safefile.ErrInput)
			}
		}
	}
	// The page and its plots are replaced together: nothing is renamed
	// into place before every file is written.
	if err := safefile.WriteAll(files); err != nil {
		return fmt.Errorf("report: %w", err)
	}
	return nil
}

// MarkdownInline writes the Markdown page to w with each plot inline, as
// an SVG data URI, for a report sent to standard output.
func MarkdownInline(w io.Writer, in Input) error {
	pg := build(in, renderer{plot: fileSVG})
	for _, m := range pg.Models {
		for _, ev := range m.Events {
			for _, p := range ev.Plots {
				p.File = "data:image/svg+xml;base64," + base64.StdEncoding.EncodeToString(p.svg)
			}
		}
	}
	var md bytes.Buffer
	writeMarkdown(&md, pg)
	_, err := w.Write(md.Bytes())
	return err
}

// page is the view the templates render.
type page struct {
	Title       string
	ToolVersion string
	Caution     string
	Policy      *policyView
	Totals      counts
	Models      []*modelView
	Invalid     []findingRow
	InvalidN    int // distinct invalid files
	// Sensitivity accounts for the sensitivity runs made, a line for
	// each size of run (see sensitivityLines).
	Sensitivity []string
}

// PolicyNote is one line about the policy.
type PolicyNote struct {
	Text string
	Warn bool
}

type policyView struct {
	Notes                                      []PolicyNote
	Name, Reference, Source, Units, Exceptions string
	Chain                                      []string
	Files                                      []checklist.Input // the chain with SHA-256
	Rules                                      []ruleRow
}

type ruleRow struct {
	ID, Severity, Events, Settings string
}

type counts struct {
	Errors, Warnings, Infos, Excepted int
}

// Verdict is the one-line state of a set of counts.
func (c counts) Verdict() string {
	switch {
	case c.Errors > 0:
		return plural(c.Errors, "error") + " to resolve"
	case c.Warnings > 0:
		return "no errors; " + plural(c.Warnings, "warning") + " to review"
	default:
		return "no errors or warnings against the policy"
	}
}

// Class is the CSS state class of a set of counts.
func (c counts) Class() string {
	switch {
	case c.Errors > 0:
		return "error"
	case c.Warnings > 0:
		return "warning"
	}
	return "clear"
}

type modelView struct {
	Anchor, File, Title, Units string
	UnitsLong                  string
	Reaches, EventsN           int
	Counts                     counts
	Events                     []*eventView
	Findings                   []findingRow
	Exceptions                 []exceptionRow
	Unsolved                   string
	Assumptions                []string        // model-wide statements of the solution (solver.Result.Assumptions)
	Revision                   *revisionView   // what the revision changed; nil without a comparison
	SHA256                     string          // of the model file
	Coverage                   []checklist.Row // reach × event × criterion
	NotEvaluated               []string        // what the check did not evaluate
	html                       []byte          // the section of the page (sectionHTML); nil for Markdown
}

type eventView struct {
	Name     string
	Anchor   string
	Reaches  []reachRow
	Culverts []culvertRow
	Plots    []*plotView
}

// culvertRow is the performance of one culvert in one event.
type culvertRow struct {
	Name, Headwater, HWD, Control, Inlet, Outlet, Barrel, Road, OverRoad, OutletVelocity string
}

type plotView struct {
	*Plot
	File string // Markdown: the SVG file name
	svg  []byte // Markdown: the file's markup (the page draws its plots in place, section.go)
}

type reachRow struct {
	Name, Discharge, Slope, Profiles, Velocity, Froude, Freeboard, Jumps, Notes string
}

type findingRow struct {
	N                               int
	Anchor                          string // id of the row, which the plot's #N tags link to
	Severity, Rule, Reach, Event    string
	Stations, Value, Limit, Message string
	Envelope                        string // the verdict over a sensitivity run in words; "" without one
	Verdict                         string // rules.RobustFail, KnifeEdge, Sensitivity or ""
	Where                           string // file:line:col
	Short                           string // line:col
	Excepted                        bool
	Reason                          string
	Class                           string
	// Related are the places that explain the finding, "LABEL at
	// FILE:LINE:COL" each (the policy settings of its limit, its
	// exception).
	Related []string
}

type exceptionRow struct {
	Rule, Reach, Stations, Reason, Where string
	Short                                string
	Covered                              int
	State                                string
}

// renderer is what the views are rendered to while they are built: for
// Markdown each plot's markup (a standalone SVG file), for the page each
// model's section with its plots inline.
type renderer struct {
	plot  func(*Plot) []byte
	model func(*markup, *modelView) // nil: no HTML section
}

// build makes the page's view of the input.
func build(in Input, r renderer) *page {
	pg := &page{Title: "Channel design review", ToolVersion: in.ToolVersion, Caution: in.Caution}
	if pg.Caution == "" {
		pg.Caution = rules.Caution
	}
	if p := in.Policy; p != nil {
		pv := &policyView{Name: p.Title(), Reference: p.Reference, Source: p.File, Units: string(p.Units), Exceptions: p.Exceptions, Notes: in.PolicyNotes, Files: in.PolicyFiles}
		if pv.Exceptions == "" {
			pv.Exceptions = "report"
		}
		if len(p.Chain) > 1 {
			pv.Chain = p.Chain
		}
		ids := make([]string, 0, len(p.Rules))
		for id := range p.Rules {
			ids = append(ids, id)
		}
		sort.Strings(ids)
		for _, id := range ids {
			rc := p.Rules[id]
			ev := "all"
			if rc.Events != nil {
				ev = strings.Join(rc.Events, ", ")
			}
			pv.Rules = append(pv.Rules, ruleRow{ID: id, Severity: string(rc.Severity), Events: ev, Settings: settings(rc, p.Units)})
		}
		pg.Policy = pv
	}
	for _, mv := range buildModels(in.Models, r) {
		pg.Models = append(pg.Models, mv)
		pg.Totals.Errors += mv.Counts.Errors
		pg.Totals.Warnings += mv.Counts.Warnings
		pg.Totals.Infos += mv.Counts.Infos
		pg.Totals.Excepted += mv.Counts.Excepted
	}
	files := map[string]bool{}
	for i, f := range in.Invalid {
		pg.Invalid = append(pg.Invalid, row(i+1, f))
		files[f.File()] = true
		if !f.Excepted {
			countInto(&pg.Totals, f)
		}
	}
	pg.InvalidN = len(files)
	pg.Sensitivity = sensitivityLines(in)
	return pg
}

// sensitivityLines account for the models' sensitivity runs, one line for
// each size of run, in model order: "Sensitivity run, asked by --vary:
// each event solved in 14 more cases, roughness ±20 %, ..., each lowered
// and raised alone and together in every corner; 1 robust fail, 2
// knife-edge, 3 sensitivity findings."
func sensitivityLines(in Input) []string {
	type run struct {
		sizes string
		cases int
		pipeline.Tally
	}
	var runs []*run
	for _, m := range in.Models {
		e := m.Envelope
		if e == nil {
			continue
		}
		i := slices.IndexFunc(runs, func(r *run) bool { return r.sizes == e.Sizes && r.cases == e.Cases })
		if i < 0 {
			i = len(runs)
			runs = append(runs, &run{sizes: e.Sizes, cases: e.Cases})
		}
		for j := range m.Findings {
			runs[i].Add(&m.Findings[j])
		}
	}
	from := ""
	if in.SensitivitySource != "" {
		from = ", asked by " + in.SensitivitySource
	}
	var lines []string
	for _, t := range runs {
		how := "each lowered and raised"
		if t.cases > 2 {
			how += " alone and together in every corner"
		}
		lines = append(lines, fmt.Sprintf("Sensitivity run%s: each event solved in %d more cases, %s, %s; %d robust fail, %d knife-edge, %s.",
			from, t.cases, t.sizes, how, t.RobustFail, t.KnifeEdge, plural(t.Sensitivity, "sensitivity finding")))
	}
	return lines
}

func countInto(c *counts, f rules.Finding) {
	if f.Excepted {
		c.Excepted++
		return
	}
	switch f.Severity {
	case policies.Error:
		c.Errors++
	case policies.Warning:
		c.Warnings++
	default:
		c.Infos++
	}
}

// buildModels lays out the models' views and renders them on as many
// goroutines as there are CPUs: the models are independent, and their
// plots and sections are most of a report's work. Entries without a model
// are skipped; the order is the input's.
func buildModels(ms []Model, r renderer) []*modelView {
	views := make([]*modelView, len(ms))
	next := atomic.Int64{}
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), len(ms)) {
		wg.Go(func() {
			// Each section is written into the worker's scratch buffer,
			// which grows to the largest section once, and kept at its
			// exact size.
			var scratch markup
			for {
				i := int(next.Add(1)) - 1
				if i >= len(ms) {
					return
				}
				if ms[i].Model == nil {
					continue
				}
				mv := buildModel(ms[i], i, r.plot)
				if r.model != nil {
					scratch.b = scratch.b[:0]
					r.model(&scratch, mv)
					mv.html = slices.Clone(scratch.b)
				}
				views[i] = mv
			}
		})
	}
	wg.Wait()
	return slices.DeleteFunc(views, func(mv *modelView) bool { return mv == nil })
}

func buildModel(m Model, mi int, render func(*Plot) []byte) *modelView {
	md := m.Model
	mv := &modelView{
		Anchor: "m" + strconv.Itoa(mi+1), File: md.File, Title: md.Title, Units: string(md.Units),
		Reaches: len(md.Reaches), EventsN: len(md.Events), SHA256: m.SHA256, Coverage: m.Coverage,
		NotEvaluated: m.NotEvaluated,
	}
	mv.UnitsLong = "SI: lengths in m, discharges in m³/s"
	if md.Units == model.US {
		mv.UnitsLong = "US customary: lengths in ft, discharges in ft³/s"
	}
	var nums []numbered
	for i, f := range m.Findings {
		r := row(i+1, f)
		r.Anchor = mv.Anchor + "-f" + strconv.Itoa(i+1)
		mv.Findings = append(mv.Findings, r)
		nums = append(nums, numbered{N: i + 1, F: f, Anchor: r.Anchor})
		countInto(&mv.Counts, f)
	}
	for _, ex := range md.Exceptions {
		er := exceptionRow{Rule: ex.Rule, Reach: ex.ReachName, Stations: stationRange(ex.FromStation, ex.ToStation),
			Reason: ex.Reason, Where: where(ex.DefRange), Short: lineCol(ex.DefRange)}
		for _, f := range m.Findings {
			if f.Excepted && f.ExceptionRange.Start == ex.DefRange.Start && f.ExceptionRange.Filename == ex.DefRange.Filename {
				er.Covered++
			}
		}
		switch {
		case er.Covered > 0:
			er.State = "covers " + plural(er.Covered, "finding")
		default:
			er.State = "covers no finding"
		}
		mv.Exceptions = append(mv.Exceptions, er)
	}
	if m.Revision != nil {
		mv.Revision = revisionSection(m.Revision, md.Units.Length())
	}
	if m.Result == nil {
		mv.Unsolved = "The model was not solved, so no profiles are shown."
		return mv
	}
	for _, a := range m.Result.Assumptions() {
		mv.Assumptions = append(mv.Assumptions, "Solved on this assumption: "+a+".")
	}
	plotN := 0
	plot := func(in plotInput) *plotView {
		plotN++
		in.envelope = m.Envelope
		if m.Revision != nil {
			in.oldFile = m.Revision.OldFile
		}
		in.id = mv.Anchor + "-plot" + strconv.Itoa(plotN)
		p := buildPlot(in)
		pv := &plotView{Plot: p}
		if render != nil {
			pv.svg = render(p)
		}
		return pv
	}
	anchors := eventAnchors{}
	stem := mainStem(md)
	onStem := map[*model.Reach]bool{}
	for _, r := range stem {
		onStem[r] = true
	}
	for _, er := range m.Result.Events {
		if er == nil || er.Event == nil {
			continue
		}
		ev := &eventView{Name: er.Event.Name, Anchor: anchors.event(mv.Anchor, er.Event.Name)}
		byReach := map[*model.Reach]*solver.ReachResult{}
		for _, rr := range er.Reaches {
			if rr != nil && rr.Reach != nil {
				byReach[rr.Reach] = rr
				ev.Reaches = append(ev.Reaches, reachSummary(rr, md.Units))
			}
		}
		bands := map[string]*pipeline.Band{} // by reach name
		if m.Envelope != nil {
			for i := range m.Envelope.Bands {
				if b := &m.Envelope.Bands[i]; b.Event == er.Event.Name {
					bands[b.Reach] = b
				}
			}
		}
		olds := map[string]*revdiff.Profile{} // by reach name
		if m.Revision != nil {
			for i := range m.Revision.Profiles {
				if o := &m.Revision.Profiles[i]; o.Event == er.Event.Name {
					olds[o.Reach] = o
				}
			}
		}
		newPiece := func(r *model.Reach, off float64) piece {
			return piece{reach: r, rr: byReach[r], offset: off, band: bands[r.Name], old: olds[r.Name]}
		}
		culverts := map[*model.Reach]*solver.CulvertResult{}
		for _, cr := range er.Culverts {
			if cr != nil && cr.Culvert != nil && cr.Culvert.Reach != nil {
				culverts[cr.Culvert.Reach] = cr
				ev.Culverts = append(ev.Culverts, culvertSummary(cr))
			}
		}
		// Main stem.
		var pieces []piece
		off := 0.0
		for _, r := range stem {
			pieces = append(pieces, newPiece(r, off))
			off += r.Length
		}
		if len(pieces) > 0 {
			title := ev.Name + " — " + reachPath(stem)
			if len(stem) > 1 {
				title = ev.Name + " — main stem: " + reachPath(stem)
			}
			ev.Plots = append(ev.Plots, plot(plotInput{title: title, units: md.Units, pieces: pieces,
				event: ev.Name, findings: nums, w: mainW, h: mainH, stem: true, culverts: culverts}))
		}
		// Details of short structure reaches (gates, basins, jumps) that
		// the main stem's scale squeezes.
		for _, run := range detailRuns(stem, byReach) {
			var ps []piece
			off := 0.0
			for _, r := range run {
				ps = append(ps, newPiece(r, off))
				off += r.Length
			}
			ev.Plots = append(ev.Plots, plot(plotInput{title: ev.Name + " — detail: " + reachPath(run),
				units: md.Units, pieces: ps, event: ev.Name, findings: nums, w: smallW, h: smallH, stem: true, small: true, culverts: culverts,
				xlabel: "Distance downstream from the head of " + run[0].Name + " (" + md.Units.Length() + ")"}))
		}
		// Other reaches, in model order.
		for _, r := range md.Reaches {
			if onStem[r] {
				continue
			}
			ev.Plots = append(ev.Plots, plot(plotInput{title: ev.Name + " — reach " + r.Name + " (to " + r.To + ")",
				units: md.Units, pieces: []piece{newPiece(r, 0)}, event: ev.Name, findings: nums, w: smallW, h: smallH, small: true,
				culverts: culverts}))
		}
		mv.Events = append(mv.Events, ev)
	}
	return mv
}

// detailShare is the share of the main stem's length under which a reach
// is drawn again in a detail plot when it holds a gate, a basin or a jump.
const detailShare = 0.12

// detailRuns returns the runs of consecutive short main-stem reaches that
// hold a gate, a basin or a jump in the event.
func detailRuns(stem []*model.Reach, byReach map[*model.Reach]*solver.ReachResult) [][]*model.Reach {
	if len(stem) < 2 {
		return nil
	}
	total := 0.0
	for _, r := range stem {
		total += r.Length
	}
	var runs [][]*model.Reach
	var cur []*model.Reach
	feature := false
	flush := func() {
		if feature && len(cur) > 0 {
			runs = append(runs, cur)
		}
		cur, feature = nil, false
	}
	for _, r := range stem {
		if r.Length >= detailShare*total {
			flush()
			continue
		}
		cur = append(cur, r)
		if r.Gate != nil || len(r.Basins) > 0 || (byReach[r] != nil && len(byReach[r].Jumps) > 0) {
			feature = true
		}
	}
	flush()
	return runs
}

func reachPath(rs []*model.Reach) string {
	names := make([]string, len(rs))
	for i, r := range rs {
		names[i] = r.Name
	}
	return strings.Join(names, " → ")
}

func reachSummary(rr *solver.ReachResult, u model.Units) reachRow {
	lu := u.Length()
	row := reachRow{Name: rr.Reach.Name, Discharge: num(rr.Discharge), Slope: string(rr.SlopeClass),
		Profiles: strings.Join(rr.ProfileTypes(), ", ")}
	vmax, fmin, fmax, fbmin := math.Inf(-1), math.Inf(1), math.Inf(-1), math.Inf(1)
	for _, pt := range rr.Points {
		if numfmt.Finite(pt.Velocity) {
			vmax = math.Max(vmax, pt.Velocity)
		}
		if numfmt.Finite(pt.Froude) {
			fmin, fmax = math.Min(fmin, pt.Froude), math.Max(fmax, pt.Froude)
		}
		if h := sectionHeight(pt.Section); h > 0 && numfmt.Finite(pt.Depth) {
			fbmin = math.Min(fbmin, h-pt.Depth)
		}
	}
	if numfmt.Finite(vmax) {
		row.Velocity = num(vmax) + " " + lu + "/s"
	}
	if numfmt.Finite(fmin) {
		row.Froude = num2(fmin) + " – " + num2(fmax)
	}
	if numfmt.Finite(fbmin) {
		row.Freeboard = num(fbmin) + " " + lu
	}
	var js []string
	for _, j := range rr.Jumps {
		js = append(js, fmt.Sprintf("at %s, F₁ %s (%s)", num(j.Station), num2(j.Froude), j.Type))
	}
	row.Jumps = strings.Join(js, "; ")
	if n := len(rr.Notes); n > 0 {
		row.Notes = plural(n, "solver note")
	}
	return row
}

// culvertSummary is a culvert's performance row: levels and depths with
// three decimals, the governing control with its method.
func culvertSummary(cr *solver.CulvertResult) culvertRow {
	r := culvertRow{Name: cr.Culvert.Name, Headwater: num(cr.Headwater), HWD: num2(cr.HWD), Control: cr.Method(),
		Inlet: num(cr.InletHeadwater), Outlet: num(cr.OutletHeadwater), Barrel: num(cr.BarrelFlow),
		Road: "—", OverRoad: "—", OutletVelocity: num(cr.OutletVelocity)}
	if cr.Culvert.Road != nil {
		r.Road, r.OverRoad = num(cr.RoadFlow), num(cr.RoadDepth)
	}
	return r
}

func row(n int, f rules.Finding) findingRow {
	r := findingRow{N: n, Severity: string(f.Severity), Rule: f.Rule, Reach: f.Reach, Event: f.Event,
		Message: f.Text(), Where: where(f.Pos()), Short: lineCol(f.Pos()), Excepted: f.Excepted, Reason: f.ExceptionReason,
		Class: string(f.Severity)}
	if f.Excepted {
		r.Class = "excepted"
	}
	for _, rel := range f.Related {
		r.Related = append(r.Related, rel.Label+" at "+where(rel.Range))
	}
	if f.HasSpan {
		r.Stations = stationRange(f.FromStation, f.ToStation)
	}
	if f.Envelope != nil {
		r.Envelope, r.Verdict = f.Envelope.Text(), f.Envelope.Verdict
	}
	if f.HasValue {
		r.Value, r.Limit = num(f.Value), num(f.Limit)
		if f.Unit != "" {
			r.Value += " " + f.Unit
			r.Limit += " " + f.Unit
		}
	}
	return r
}

// where is the GNU-style position "file:line:col" of a range in the file
// it names (a finding's Pos, a related place); "file" alone when the range
// has no position.
func where(r hcl.Range) string {
	if r.Start.Line < 1 {
		return r.Filename
	}
	return fmt.Sprintf("%s:%d:%d", r.Filename, r.Start.Line, r.Start.Column)
}

// lineCol is "line:col" of a range's start ("" when unknown).
func lineCol(r hcl.Range) string {
	if r.Start.Line < 1 {
		return ""
	}
	return fmt.Sprintf("%d:%d", r.Start.Line, r.Start.Column)
}

// settings summarises the numbers of a rule block in the policy's units,
// from the rule's spec.
func settings(rc *policies.RuleConfig, u model.Units) string {
	return rc.Summary(u, num)
}

// eventAnchors gives each event of a model its own id. An event's id is
// "mN-ev-" and a slug of its name, so it never meets the model's other ids
// (mN-fK of a findings row, mN-plotK of a plot, mN-findings); two names of
// one slug ("Q100" and "q100", or two names in another script) get "-2",
// "-3", ... in event order.
type eventAnchors map[string]bool

func (used eventAnchors) event(model, name string) string {
	base := model + "-ev-" + slug(name)
	a := base
	for k := 2; used[a]; k++ {
		a = base + "-" + strconv.Itoa(k)
	}
	used[a] = true
	return a
}

var slugRE = regexp.MustCompile(`[^a-z0-9]+`)

// slug makes an id fragment from a name (letters, digits and '-').
func slug(s string) string {
	s = strings.Trim(slugRE.ReplaceAllString(strings.ToLower(s), "-"), "-")
	if s == "" {
		return "x"
	}
	return s
}

// num prints a measured value as every output of chanlint does
// (numfmt.Num); "–", an empty cell, for a number that is not finite.
func num(x float64) string {
	if !numfmt.Finite(x) {
		return "–"
	}
	return numfmt.Num(x)
}

// num2 prints a dimensionless number with two decimals (numfmt.Fixed);
// "–" for a number that is not finite.
func num2(x float64) string {
	if !numfmt.Finite(x) {
		return "–"
	}
	return numfmt.Fixed(x, 2)
}

// stationRange is a station span as the text output prints it (both ends
// to the same decimals).
func stationRange(from, to float64) string {
	if !numfmt.Finite(from, to) {
		return num(from) + " – " + num(to)
	}
	return strings.Replace(numfmt.Span(from, to), "–", " – ", 1)
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return strconv.Itoa(n) + " " + word + "s"
}
