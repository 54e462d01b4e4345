package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"os/exec"
	"path/filepath"
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/report"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
)

func diffCommand() *command {
	return &command{
		name:    "diff",
		summary: "compare two revisions of a model: findings, water surface, no-rise",
		run:     func(a *app, args []string) int { return a.runDiff(args) },
		help:    func(*app) string { return diffUsage() },
	}
}

type diffFlags struct {
	policy string
	git    string
	out    string
	format *choice
	color  *choice
	failOn *choice
}

func newDiffFlags() (*diffFlags, *flag.FlagSet) {
	df := &diffFlags{
		format: newChoice("text", "text", "json", "markdown"),
		color:  newChoice("auto", "auto", "always", "never"),
		failOn: newChoice("error", "error", "warning", "info"),
	}
	fs := newFlagSet("diff")
	fs.StringVar(&df.policy, "policy", "", "policy `FILE` or built-in pack name (default: "+configName+", else the baseline pack)")
	fs.StringVar(&df.git, "git", "", "compare each model under PATH with its version at git revision `REV`")
	fs.Var(df.format, "format", "output format (markdown: for a pull-request comment)")
	fs.StringVar(&df.out, "out", "", "also write the review report of the proposed models, with the revision's changes, to `FILE` (.md: Markdown with SVG plots beside it, else HTML; - for standard output)")
	fs.Var(df.color, "color", "colour text output; auto colours a terminal unless NO_COLOR is set")
	fs.Var(df.failOn, "fail-on", "lowest severity of a new finding that makes the exit status 1")
	return df, fs
}

func diffUsage() string {
	_, fs := newDiffFlags()
	return `usage: chanlint diff OLD NEW [options]
       chanlint diff --git REV [PATH...] [options]

Solves and checks two revisions of a model under one policy and reports
what the revision changed: findings new, fixed and changed (matched as a
baseline matches them), the largest rise and fall of the water surface,
of the velocity and of the freeboard on every reach and event both have,
with their stations, and the reaches added or removed. A policy's no_rise
block is judged here: the proposed water surface may rise no more than its
limit over the existing one.

OLD is the existing model and NEW the proposed one. With --git REV, each
model under PATH (default: the current directory) is compared with the
same file at the git revision REV; a model that did not exist there is
new as a whole.

--out FILE writes the review report of the proposed models as 'chanlint
report' does (HTML, or Markdown with the SVG plots beside it when FILE
ends in .md), each profile also drawing the existing water surface as a
dash-dot-dot line, and a "Revision changes" section per model: findings
new, fixed and changed, the largest rise and fall of the water surface per
reach and event, reaches added or removed, no_rise findings. The
comparison is still printed in --format; with --out - the report goes to
standard output instead.

options:
` + flagUsage(fs) + `
exit status: 0 nothing new at or above --fail-on; 1 a new finding (or a
no_rise finding) at or above it; 2 an unreadable or invalid model or
policy, or a wrong command line.
`
}

// diffPair is one comparison: the existing and the proposed revision.
type diffPair struct {
	old, new *pipeline.Result
}

func (a *app) runDiff(args []string) int {
	c := findCommand("diff")
	df, fs := newDiffFlags()
	paths, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if df.git == "" && len(paths) != 2 {
		return a.usageError(c, "give the existing and the proposed model (OLD NEW), or --git REV")
	}
	if df.git != "" && (strings.HasPrefix(df.git, "-") || strings.ContainsAny(df.git, " \t\n\r\x00")) {
		return a.usageError(c, "--git: %q is not a revision", df.git)
	}
	errPal := newPalette(a.useColor(df.color.value, a.stderrTTY))
	pal := newPalette(a.useColor(df.color.value, a.stdoutTTY))
	pol, ok := a.loadPolicy(df.policy, errPal)
	if !ok {
		return exitInvalid
	}
	opts := pipeline.Options{Keep: pipeline.Keep{Solved: true, Source: true}, Stderr: a.stderr, Solver: solveOptions}
	var pairs []diffPair
	if df.git == "" {
		files := make([]pipeline.File, 2)
		for i, p := range paths {
			abs := a.abs(p)
			if err := confineInput(abs); err != nil {
				fmt.Fprintf(a.stderr, "chanlint diff: cannot read %s: %v\n", p, err)
				return exitInvalid
			}
			files[i] = pipeline.File{Name: filepath.ToSlash(p), Path: abs}
		}
		pairs = append(pairs, diffPair{pipeline.CheckFile(files[0], pol, opts), pipeline.CheckFile(files[1], pol, opts)})
	} else {
		found, problems := a.discover(orDot(paths))
		for _, p := range problems {
			fmt.Fprintf(a.stderr, "chanlint diff: cannot read %s: %v\n", p.display, p.err)
		}
		if len(problems) > 0 {
			return exitInvalid
		}
		if len(found) == 0 {
			fmt.Fprintf(a.stderr, "chanlint diff: no *%s files found under %s; nothing was compared\n", model.Suffix, strings.Join(orDot(paths), ", "))
			return exitInvalid
		}
		for _, f := range found {
			pf := f.pipelineFile()
			proposed := pipeline.CheckFile(pf, pol, opts)
			src, err := a.gitShow(df.git, pf.Path)
			if err != nil {
				fmt.Fprintf(a.stderr, "chanlint diff: %s at %s: %v\n", pf.Name, df.git, err)
				return exitInvalid
			}
			var existing *pipeline.Result
			if src != nil {
				existing = pipeline.Parse(pipeline.File{Name: pf.Name + "@" + df.git}, src).Check(pol, opts)
			}
			pairs = append(pairs, diffPair{existing, proposed})
		}
	}

	diffs := make([]*revdiff.Diff, len(pairs))
	invalid := false
	for i, p := range pairs {
		if p.old == nil { // a model new at this revision
			diffs[i] = newModelDiff(p.new)
		} else {
			diffs[i] = revdiff.Compare(p.old, p.new, pol)
		}
		invalid = invalid || diffs[i].Invalid
		for _, r := range []*pipeline.Result{p.old, p.new} {
			if r != nil && r.Invalid {
				for j := range r.Findings {
					writeFindingText(a.stderr, &r.Findings[j], r.Src, r.Unit(), errPal)
				}
			}
		}
	}
	if df.out != "" {
		if err := a.writeDiffReport(df.out, pol, paths, pairs, diffs); err != nil {
			fmt.Fprintf(a.stderr, "chanlint diff: cannot write %s: %v\n", a.display(a.abs(df.out)), describePathError(err))
			return exitInvalid
		}
		if df.out == "-" {
			return a.diffStatus(diffs, invalid, policies.Severity(df.failOn.value))
		}
		fmt.Fprintf(a.stderr, "chanlint diff: wrote %s\n", a.display(a.abs(df.out)))
	}
	out := bufio.NewWriter(a.stdout)
	switch df.format.value {
	case "json":
		err = writeDiffJSON(out, diffs)
	case "markdown":
		writeDiffMarkdown(out, diffs, a.policyLine(pol, a.describePolicy(pol, paths)))
	default:
		a.writeDiffText(out, diffs, pol, paths, pal)
	}
	if err == nil {
		err = out.Flush()
	}
	if err != nil {
		return exitInvalid
	}
	return a.diffStatus(diffs, invalid, policies.Severity(df.failOn.value))
}

// diffStatus is the exit status of a comparison: invalid, a new finding
// at or above failOn, or none.
func (a *app) diffStatus(diffs []*revdiff.Diff, invalid bool, failOn policies.Severity) int {
	if invalid {
		return exitInvalid
	}
	for _, d := range diffs {
		for _, f := range d.New {
			if !f.Excepted && f.Severity.Rank() >= failOn.Rank() {
				return exitFindings
			}
		}
	}
	return exitOK
}

// writeDiffReport writes the review report of the proposed models to out,
// each with its comparison (report.Model.Revision). A proposed revision
// that is not a valid model is listed with its diagnostics.
func (a *app) writeDiffReport(out string, pol *policies.Policy, paths []string, pairs []diffPair, diffs []*revdiff.Diff) error {
	in, _ := a.reportInput(pol, paths)
	var inputs []*pipeline.Result
	for i, p := range pairs {
		for _, r := range []*pipeline.Result{p.old, p.new} {
			if r != nil {
				inputs = append(inputs, r)
			}
		}
		if p.new.Model == nil {
			in.Invalid = append(in.Invalid, p.new.Findings...)
			continue
		}
		in.Models = append(in.Models, report.Model{Model: p.new.Model, Result: p.new.Solution, Findings: p.new.Findings, Revision: diffs[i]})
	}
	return a.writeReport(out, reportFormat(out, ""), in, inputs)
}

// newModelDiff is the comparison of a model that did not exist at the
// revision: every reach added, every failing finding new.
func newModelDiff(r *pipeline.Result) *revdiff.Diff {
	d := &revdiff.Diff{OldFile: "(none)", NewFile: r.File.Name, Units: r.Units, Invalid: r.Invalid}
	for _, f := range r.Findings {
		if !f.Excepted {
			d.New = append(d.New, f)
		}
	}
	if r.Model != nil {
		for _, rc := range r.Model.Reaches {
			d.Added = append(d.Added, rc.Name)
		}
	}
	return d
}

// gitShow reads file abs as it was at revision rev of its repository; nil
// and no error when the file did not exist there. The revision comes from
// the command line (never from a model) and is passed after
// --end-of-options, so it cannot be read as an option.
func (a *app) gitShow(rev, abs string) ([]byte, error) {
	root := repoRoot(filepath.Dir(abs))
	if root == "" {
		return nil, fmt.Errorf("not inside a git repository")
	}
	rel, err := filepath.Rel(root, abs)
	if err != nil {
		return nil, err
	}
	spec := rev + ":" + filepath.ToSlash(rel)
	exists := exec.Command("git", "-C", root, "cat-file", "-e", "--end-of-options", spec)
	if exists.Run() != nil {
		check := exec.Command("git", "-C", root, "rev-parse", "--verify", "--quiet", "--end-of-options", rev+"^{commit}")
		if check.Run() != nil {
			return nil, fmt.Errorf("unknown revision %q", rev)
		}
		return nil, nil
	}
	cmd := exec.Command("git", "-C", root, "cat-file", "blob", "--end-of-options", spec)
	var buf bytes.Buffer
	var stderr strings.Builder
	cmd.Stdout = &limitedBuffer{buf: &buf, max: model.MaxFileSize}
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		return nil, fmt.Errorf("git: %s", safetext.Text(strings.TrimSpace(stderr.String())))
	}
	return buf.Bytes(), nil
}

// limitedBuffer keeps at most max bytes and fails the write beyond them.
type limitedBuffer struct {
	buf *bytes.Buffer
	max int
}

func (l *limitedBuffer) Write(p []byte) (int, error) {
	if l.buf.Len()+len(p) > l.max {
		return 0, fmt.Errorf("the file at that revision is larger than %d bytes", l.max)
	}
	return l.buf.Write(p)
}

// writeDiffText prints each comparison, then the policy and the caution.
func (a *app) writeDiffText(w io.Writer, diffs []*revdiff.Diff, pol *policies.Policy, paths []string, p *palette) {
	var newN, fixedN, changedN int
	for _, d := range diffs {
		unit := d.Units.Length()
		fmt.Fprintf(w, "%s\n", p.bold.Sprintf("%s → %s", safetext.Text(d.OldFile), safetext.Text(d.NewFile)))
		section := func(title string, fs []rules.Finding) {
			if len(fs) == 0 {
				return
			}
			fmt.Fprintf(w, "%s (%d):\n", title, len(fs))
			for i := range fs {
				writeFindingText(w, &fs[i], nil, unit, p)
			}
		}
		section("new findings", d.New)
		section("fixed findings", d.Fixed)
		if len(d.Changed) > 0 {
			fmt.Fprintf(w, "changed findings (%d):\n", len(d.Changed))
			for _, c := range d.Changed {
				fmt.Fprintf(w, "%s %s\n", p.rule.Sprint("["+c.New.Rule+"]"), safetext.Text(changeText(&c, unit)))
			}
		}
		if len(d.Added) > 0 {
			fmt.Fprintf(w, "reaches added: %s\n", safetext.Text(strings.Join(d.Added, ", ")))
		}
		if len(d.Removed) > 0 {
			fmt.Fprintf(w, "reaches removed: %s\n", safetext.Text(strings.Join(d.Removed, ", ")))
		}
		same := 0
		for i := range d.Profiles {
			pr := &d.Profiles[i]
			if unchanged(pr) {
				same++
				continue
			}
			head := "reach " + safetext.Text(pr.Reach) + ", event " + safetext.Text(pr.Event) + ": "
			if !flat(pr) {
				fmt.Fprintf(w, "%s%s\n", head, profileText(pr, unit))
			}
			for j := range pr.Jumps {
				fmt.Fprintf(w, "%s%s\n", head, pr.Jumps[j].Text(unit))
			}
		}
		if same > 0 {
			fmt.Fprintf(w, "%s of reach and event unchanged (water surface, velocity and freeboard within %s %s)\n",
				plural(same, "pair", "pairs"), numfmt.Num(profileTolerance), unit)
		}
		newN, fixedN, changedN = newN+len(d.New), fixedN+len(d.Fixed), changedN+len(d.Changed)
		fmt.Fprintln(w)
	}
	fmt.Fprintf(w, "%s\n", p.bold.Sprintf("%s, %d new, %d fixed, %d changed", plural(len(diffs), "comparison", "comparisons"), newN, fixedN, changedN))
	fmt.Fprintln(w, a.policyLine(pol, a.describePolicy(pol, paths)))
	fmt.Fprintln(w, p.dim.Sprint(rules.Caution))
}

// profileTolerance is the change below which a profile counts as the same
// (half the 0.001 the outputs print).
const profileTolerance = 0.0005

// unchanged reports whether a compared profile moved by less than
// profileTolerance everywhere and none of its jumps moved, appeared or
// disappeared.
func unchanged(p *revdiff.Profile) bool {
	return flat(p) && len(p.Jumps) == 0
}

// flat reports whether the extremes of a compared profile (outside the
// spans of its jumps' moves) are all below profileTolerance.
func flat(p *revdiff.Profile) bool {
	small := func(e revdiff.Extreme) bool { return math.Abs(e.Delta) < profileTolerance }
	return p.Compared == 0 || (small(p.Rise) && small(p.Fall) && small(p.Faster) && small(p.Slower) &&
		(!p.HasFreeboard || (small(p.LessFree) && small(p.MoreFree))))
}

// profileText is "water surface +0.052 m at 410 m, −0.010 m at 20 m;
// velocity ...; freeboard ...": the largest increase and decrease of each
// quantity, each only where it moved by profileTolerance or more.
func profileText(p *revdiff.Profile, unit string) string {
	quantity := func(name, u string, up, down revdiff.Extreme) string {
		var moves []string
		if up.Delta >= profileTolerance {
			moves = append(moves, signedNum(up.Delta)+" "+u+" at "+numfmt.Num(up.Station)+" "+unit)
		}
		if down.Delta <= -profileTolerance {
			moves = append(moves, signedNum(down.Delta)+" "+u+" at "+numfmt.Num(down.Station)+" "+unit)
		}
		if len(moves) == 0 {
			return ""
		}
		return name + " " + strings.Join(moves, ", ")
	}
	var parts []string
	for _, q := range []string{
		quantity("water surface", unit, p.Rise, p.Fall),
		quantity("velocity", unit+"/s", p.Faster, p.Slower),
	} {
		if q != "" {
			parts = append(parts, q)
		}
	}
	if p.HasFreeboard {
		if q := quantity("freeboard", unit, p.MoreFree, p.LessFree); q != "" {
			parts = append(parts, q)
		}
	}
	return strings.Join(parts, "; ")
}

// signedNum is a change with its sign: "+0.052", "−0.01", "0".
func signedNum(x float64) string {
	switch {
	case math.Abs(x) < profileTolerance:
		return "0"
	case x > 0:
		return "+" + numfmt.Num(x)
	}
	return "−" + numfmt.Num(-x)
}

// changeText describes a finding that changed: "reach R, event E:
// value 0.162 → 0.201 m, stations 305–350 → 310–350 m: message", the
// two values to the same decimals (numfmt.Pair).
func changeText(c *revdiff.Change, unit string) string {
	var parts []string
	if w := c.New.Where(unit); w != "" {
		parts = append(parts, w)
	}
	if c.New.HasValue {
		// Pair: a value that moved never reads as unchanged ("30 → 30").
		was, now := numfmt.Pair(c.Old.Value, c.New.Value)
		parts = append(parts, "value "+was+" → "+now+" "+c.New.Unit)
	}
	if c.New.HasSpan {
		parts = append(parts, "stations "+numfmt.Span(c.Old.FromStation, c.Old.ToStation)+" → "+numfmt.Span(c.New.FromStation, c.New.ToStation)+" "+unit)
	}
	return strings.Join(parts, ", ") + ": " + c.New.Message
}

// diffJSON is the document of `diff --format json`.
type diffJSON struct {
	Comparisons []comparisonJSON `json:"comparisons"`
	Summary     struct {
		New     int `json:"new"`
		Fixed   int `json:"fixed"`
		Changed int `json:"changed"`
	} `json:"summary"`
	Caution string `json:"caution"`
}

type comparisonJSON struct {
	Old      string        `json:"old"`
	New      string        `json:"new"`
	Units    string        `json:"units"`
	Invalid  bool          `json:"invalid"`
	NewF     []findingJSON `json:"new_findings"`
	Fixed    []findingJSON `json:"fixed_findings"`
	Changed  []changeJSON  `json:"changed_findings"`
	Added    []string      `json:"reaches_added"`
	Removed  []string      `json:"reaches_removed"`
	Profiles []profileJSON `json:"profiles"`
}

type changeJSON struct {
	Old findingJSON `json:"old"`
	New findingJSON `json:"new"`
}

type extremeJSON struct {
	Delta   *float64 `json:"delta"`
	Station *float64 `json:"station"`
}

type profileJSON struct {
	Event        string         `json:"event"`
	Reach        string         `json:"reach"`
	Compared     int            `json:"compared"`
	WSERise      extremeJSON    `json:"wse_rise"`
	WSEFall      extremeJSON    `json:"wse_fall"`
	VelocityUp   extremeJSON    `json:"velocity_increase"`
	VelocityDown extremeJSON    `json:"velocity_decrease"`
	FreeboardOut *extremeJSON   `json:"freeboard_loss"`
	FreeboardIn  *extremeJSON   `json:"freeboard_gain"`
	JumpMoves    []jumpMoveJSON `json:"jump_moves"`
}

// jumpMoveJSON is a revdiff.JumpMove: null where the kind has no such
// value (no existing toe for a jump that appeared, no proposed one for a
// jump gone).
type jumpMoveJSON struct {
	Kind          string       `json:"kind"`
	FromStation   *float64     `json:"from_station"`
	ToStation     *float64     `json:"to_station"`
	Distance      *float64     `json:"distance"`
	Direction     *string      `json:"direction"`
	OldFroude     *float64     `json:"old_froude"`
	NewFroude     *float64     `json:"new_froude"`
	OldType       *string      `json:"old_type"`
	NewType       *string      `json:"new_type"`
	Tolerance     *float64     `json:"tolerance"`
	Numerical     bool         `json:"numerical"`
	Compared      int          `json:"compared"`
	SurfaceDelta  *extremeJSON `json:"wse_difference"`
	VelocityDelta *extremeJSON `json:"velocity_difference"`
	Message       string       `json:"message"`
}

func newJumpMoveJSON(m *revdiff.JumpMove, unit string) jumpMoveJSON {
	j := jumpMoveJSON{Kind: string(m.Kind), Message: m.Text(unit)}
	word := func(s string) *string { return &s }
	if m.Kind != revdiff.JumpAppeared {
		j.FromStation, j.OldFroude, j.OldType = numfmt.JSON(m.From), numfmt.JSON(m.OldFroude), word(string(m.OldType))
	}
	if m.Kind != revdiff.JumpGone {
		j.ToStation, j.NewFroude, j.NewType = numfmt.JSON(m.To), numfmt.JSON(m.NewFroude), word(string(m.NewType))
	}
	if m.Kind == revdiff.JumpMoved {
		j.Distance, j.Direction, j.Tolerance = numfmt.JSON(m.Distance), word(m.Direction()), numfmt.JSON(m.Tolerance)
		j.Numerical, j.Compared = m.Numerical, m.Compared
		if m.Compared > 0 {
			s, v := extreme(m.Surface), extreme(m.Velocity)
			j.SurfaceDelta, j.VelocityDelta = &s, &v
		}
	}
	return j
}

func extreme(e revdiff.Extreme) extremeJSON {
	return extremeJSON{Delta: numfmt.JSON(e.Delta), Station: numfmt.JSON(e.Station)}
}

func writeDiffJSON(w io.Writer, diffs []*revdiff.Diff) error {
	doc := diffJSON{Comparisons: []comparisonJSON{}, Caution: rules.Caution}
	list := func(fs []rules.Finding) []findingJSON {
		out := []findingJSON{}
		for i := range fs {
			out = append(out, newFindingJSON(&fs[i]))
		}
		return out
	}
	for _, d := range diffs {
		c := comparisonJSON{
			Old: d.OldFile, New: d.NewFile, Units: string(d.Units), Invalid: d.Invalid,
			NewF: list(d.New), Fixed: list(d.Fixed), Changed: []changeJSON{},
			Added: append([]string{}, d.Added...), Removed: append([]string{}, d.Removed...), Profiles: []profileJSON{},
		}
		for i := range d.Changed {
			c.Changed = append(c.Changed, changeJSON{Old: newFindingJSON(&d.Changed[i].Old), New: newFindingJSON(&d.Changed[i].New)})
		}
		for _, p := range d.Profiles {
			pj := profileJSON{Event: p.Event, Reach: p.Reach, Compared: p.Compared,
				WSERise: extreme(p.Rise), WSEFall: extreme(p.Fall), VelocityUp: extreme(p.Faster), VelocityDown: extreme(p.Slower),
				JumpMoves: []jumpMoveJSON{}}
			for j := range p.Jumps {
				pj.JumpMoves = append(pj.JumpMoves, newJumpMoveJSON(&p.Jumps[j], d.Units.Length()))
			}
			if p.HasFreeboard {
				lo, hi := extreme(p.LessFree), extreme(p.MoreFree)
				pj.FreeboardOut, pj.FreeboardIn = &lo, &hi
			}
			c.Profiles = append(c.Profiles, pj)
		}
		doc.Summary.New += len(d.New)
		doc.Summary.Fixed += len(d.Fixed)
		doc.Summary.Changed += len(d.Changed)
		doc.Comparisons = append(doc.Comparisons, c)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}

// writeDiffMarkdown writes the comparison for a pull-request comment.
// Every name and message is escaped (safetext.Markdown).
func writeDiffMarkdown(w io.Writer, diffs []*revdiff.Diff, policyLine string) {
	md := safetext.Markdown
	cell := func(s string) string { return strings.ReplaceAll(md(s), "|", `\|`) }
	fmt.Fprintln(w, "## chanlint: what this revision changes")
	fmt.Fprintln(w)
	for _, d := range diffs {
		unit := d.Units.Length()
		fmt.Fprintf(w, "### %s → %s\n\n", md(d.OldFile), md(d.NewFile))
		table := func(title string, fs []rules.Finding) {
			if len(fs) == 0 {
				return
			}
			fmt.Fprintf(w, "**%s (%d)**\n\n| rule | severity | where | message |\n| --- | --- | --- | --- |\n", title, len(fs))
			for i := range fs {
				f := &fs[i]
				fmt.Fprintf(w, "| `%s` | %s | %s | %s |\n", f.Rule, f.Severity, cell(f.Where(unit)), cell(f.Message))
			}
			fmt.Fprintln(w)
		}
		table("New findings", d.New)
		table("Fixed findings", d.Fixed)
		if len(d.Changed) > 0 {
			fmt.Fprintf(w, "**Changed findings (%d)**\n\n| rule | change |\n| --- | --- |\n", len(d.Changed))
			for i := range d.Changed {
				fmt.Fprintf(w, "| `%s` | %s |\n", d.Changed[i].New.Rule, cell(changeText(&d.Changed[i], unit)))
			}
			fmt.Fprintln(w)
		}
		if len(d.Added)+len(d.Removed) > 0 {
			fmt.Fprintf(w, "Reaches added: %s. Reaches removed: %s.\n\n", orNone(md(strings.Join(d.Added, ", "))), orNone(md(strings.Join(d.Removed, ", "))))
		}
		var rows, moves []string
		for i := range d.Profiles {
			p := &d.Profiles[i]
			for j := range p.Jumps {
				moves = append(moves, fmt.Sprintf("| %s | %s | %s |", cell(p.Reach), cell(p.Event), cell(p.Jumps[j].Text(unit))))
			}
			if flat(p) {
				continue
			}
			free := "–"
			if p.HasFreeboard {
				free = moveCell(p.LessFree, false)
			}
			rows = append(rows, fmt.Sprintf("| %s | %s | %s | %s | %s |", cell(p.Reach), cell(p.Event),
				moveCell(p.Rise, true), moveCell(p.Fall, false), free))
		}
		if len(rows) > 0 {
			fmt.Fprintf(w, "| reach | event | largest rise (%s, at station) | largest fall | freeboard lost |\n| --- | --- | --- | --- | --- |\n", unit)
			fmt.Fprintln(w, strings.Join(rows, "\n"))
			fmt.Fprintln(w)
		}
		if len(moves) > 0 {
			fmt.Fprintf(w, "**Hydraulic jumps moved, appeared or gone (%d)**: between the two toes of a moved jump the difference of the water surface is the jump's, not in the table of rises and falls.\n\n| reach | event | jump |\n| --- | --- | --- |\n", len(moves))
			fmt.Fprintln(w, strings.Join(moves, "\n"))
			fmt.Fprintln(w)
		}
		if len(rows)+len(moves) == 0 && len(d.Profiles) > 0 {
			fmt.Fprintf(w, "The water surface, velocity and freeboard are unchanged on every reach and event (within %s %s).\n\n", numfmt.Num(profileTolerance), unit)
		}
	}
	fmt.Fprintln(w, md(policyLine))
	fmt.Fprintln(w)
	fmt.Fprintf(w, "_%s_\n", md(rules.Caution))
}

// moveCell is "+0.114 at 570" for an increase (up) or a decrease of at
// least profileTolerance, else "–".
func moveCell(e revdiff.Extreme, up bool) string {
	if (up && e.Delta >= profileTolerance) || (!up && e.Delta <= -profileTolerance) {
		return signedNum(e.Delta) + " at " + numfmt.Num(e.Station)
	}
	return "–"
}

func orNone(s string) string {
	if s == "" {
		return "none"
	}
	return s
}
