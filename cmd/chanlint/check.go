package main

import (
	"bufio"
	"bytes"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/sarifout"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// progressThreshold is the number of files from which `check` and
// `report` print a progress line on a terminal's stderr.
const progressThreshold = 20

func checkCommand() *command {
	return &command{
		name:    "check",
		summary: "solve every model under PATH and check it against a policy",
		run:     func(a *app, args []string) int { return a.runCheck(args) },
		help:    func(*app) string { return checkUsage() },
	}
}

// checkFlags are the options of `check`.
type checkFlags struct {
	policy        string
	approvals     string
	rules, events listFlag
	stdinName     string
	vary          string
	format        *choice
	color         *choice
	failOn        *choice
	baseline      string
	writeBaseline string
	jobs          int
}

func newCheckFlags() (*checkFlags, *flag.FlagSet) {
	cf := &checkFlags{
		format: newChoice("text", "text", "json", "sarif", "annotations", "checklist", "checklist-csv"),
		color:  newChoice("auto", "auto", "always", "never"),
		failOn: newChoice("error", "error", "warning", "info"),
	}
	fs := newFlagSet("check")
	fs.StringVar(&cf.policy, "policy", "", "policy `FILE` or built-in pack name (default: "+configName+", else the baseline pack)")
	fs.StringVar(&cf.approvals, "approvals", "", "the reviewer's approved exceptions `FILE`, counted under a policy with exceptions = \"approved\"")
	fs.Var(cf.format, "format", "output format (annotations: workflow commands for GitHub Actions; checklist, checklist-csv: the reviewer's coverage matrix in Markdown or CSV)")
	fs.Var(&cf.rules, "rule", "show only findings of rule `ID` (repeatable, or a comma-separated list)")
	fs.Var(&cf.events, "event", "show only findings of flow event `NAME` and those of no event (repeatable, or comma-separated)")
	fs.StringVar(&cf.vary, "vary", "", varyUsage)
	fs.StringVar(&cf.stdinName, "stdin-name", "", "the `NAME` a model read from standard input (PATH -) is printed with (default "+stdinName+")")
	fs.Var(cf.color, "color", "colour text output; auto colours a terminal unless NO_COLOR is set")
	fs.Var(cf.failOn, "fail-on", "lowest severity that makes the exit status 1")
	fs.StringVar(&cf.baseline, "baseline", "", "fail only on findings not recorded in this baseline `FILE`")
	fs.StringVar(&cf.writeBaseline, "write-baseline", "", "record the current findings in baseline `FILE` (exit status 0 unless input is invalid)")
	fs.IntVar(&cf.jobs, "jobs", 0, "check `N` files at once (default: the number of CPUs)")
	fs.IntVar(&cf.jobs, "j", 0, "short for --jobs")
	return cf, fs
}

func checkUsage() string {
	_, fs := newCheckFlags()
	return `usage: chanlint check [PATH...] [options]

Finds every *` + model.Suffix + ` model under each PATH (default: the current
directory), solves each flow event, checks the solved profiles against the
policy and prints each finding:

  FILE:LINE:COLUMN: SEVERITY: [rule] reach R, event E, stations a–b m: message
      remedy: what to change

A PATH may be a model file (checked whatever its name) or a directory,
searched recursively; .git, .hg, .svn, vendor and node_modules directories
are skipped, and symbolic links are followed only when they stay inside the
directory being searched; a file named on the command line that is a link
leading out of its repository (else its directory), a FIFO, a socket or a
device is refused unread. An invalid model is reported with its diagnostics
and the other files are still checked. Finding no model at all is an error
(exit status 2): nothing checked is never a pass.

The policy is --policy, else the nearest ` + configName + ` in the current
directory or a parent up to the repository root (the directory holding
.git), else the built-in baseline pack.

options:
` + flagUsage(fs) + `
exit status: 0 nothing at or above --fail-on; 1 findings at or above it that
no design exception covers; 2 an unreadable or invalid model, policy or
baseline, or a wrong command line.
`
}

func (a *app) runCheck(args []string) int {
	c := findCommand("check")
	cf, fs := newCheckFlags()
	paths, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if cf.jobs < 0 {
		return a.usageError(c, "--jobs must not be negative, got %d", cf.jobs)
	}
	for _, id := range cf.rules {
		if rules.Lookup(id) == nil {
			var ids []string
			for _, r := range rules.All() {
				ids = append(ids, r.ID)
			}
			msg := fmt.Sprintf("--rule: unknown rule %q", id)
			if s := suggest(id, ids); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			return a.usageError(c, "%s (chanlint explain lists the rules)", msg)
		}
	}
	if cf.writeBaseline != "" && (len(cf.rules) > 0 || len(cf.events) > 0) {
		return a.usageError(c, "--write-baseline records every finding; it cannot be combined with --rule or --event")
	}
	a.stdinName = cf.stdinName
	if err := a.setVary(cf.vary); err != nil {
		return a.usageError(c, "--vary: %v", err)
	}
	pal := newPalette(a.useColor(cf.color.value, a.stdoutTTY))
	errPal := newPalette(a.useColor(cf.color.value, a.stderrTTY))

	// A SARIF log is written whatever happens: when the baseline or the
	// policy cannot be used, the log carries what was said on stderr as
	// notifications, so that a code-scanning upload shows the cause.
	var setup *setupLog
	if cf.format.value == "sarif" {
		setup = &setupLog{w: a.stderr}
		stderr := a.stderr
		a.stderr = setup
		defer func() { a.stderr = stderr }()
	}
	failSetup := func() int {
		if setup != nil {
			a.stderr = setup.w
			run := checkRun{app: a, problems: setup.problems(a)}
			out := bufio.NewWriter(a.stdout)
			if err := run.writeSARIF(out); err == nil {
				out.Flush()
			}
		}
		return exitInvalid
	}

	var known *baseline.Baseline
	if cf.baseline != "" {
		abs := a.abs(cf.baseline)
		if err := confineInput(abs); err != nil {
			fmt.Fprintf(a.stderr, "chanlint check: cannot read baseline %s: %v\n", cf.baseline, err)
			return failSetup()
		}
		b, err := baseline.Read(abs)
		if err != nil {
			// The error names the file by the absolute path it was read
			// from; print the path as the user wrote it.
			msg := strings.ReplaceAll(err.Error(), abs, a.display(abs))
			fmt.Fprintf(a.stderr, "chanlint check: %s\n", msg)
			return failSetup()
		}
		known = b
	}

	pol, ok := a.loadPolicy(cf.policy, errPal)
	if ok {
		ok = a.loadApprovals(cf.approvals, pol, errPal)
	}
	if !ok {
		return failSetup()
	}
	if setup != nil {
		a.stderr = setup.w
	}

	// Only SARIF needs the source of a valid model (artifact lengths,
	// hashes and character offsets).
	checklistOut := strings.HasPrefix(cf.format.value, "checklist")
	results := a.checkPaths(paths, pol, cf.jobs, pipeline.Keep{Source: cf.format.value == "sarif" || checklistOut, Solved: checklistOut})
	if len(results) == 0 {
		// Nothing checked is never a pass: a renamed or misplaced model
		// must not turn a failing design into a clean run.
		fmt.Fprintf(a.stderr, "chanlint check: no *%s files found under %s; nothing was checked\n", model.Suffix, strings.Join(orDot(paths), ", "))
	}

	// --rule and --event narrow what is shown (and judged); invalid files
	// always show their diagnostics.
	keepFinding := findingFilter(cf.rules, cf.events)
	for _, r := range results {
		if !r.Invalid {
			r.Findings = slices.DeleteFunc(r.Findings, func(f rules.Finding) bool { return !keepFinding(f.Rule, f.Event) })
		}
	}
	a.warnUnknownEvents(cf.events, results)

	// The findings to show: a baseline hides those it records.
	view := pipeline.ApplyBaseline(results, known, a.cwd)
	view.Stale = slices.DeleteFunc(view.Stale, func(e baseline.Entry) bool { return !keepFinding(e.Rule, e.Event) })

	run := checkRun{
		app: a, results: results, shown: view.Shown, policy: pol,
		view: view, baselinePath: cf.baseline, info: a.describePolicy(pol, paths),
	}
	// The output goes straight to stdout, not through a buffer of its
	// own: a large run's JSON or SARIF document is tens of megabytes. The
	// JSON encoder marshals the whole document before it writes; the SARIF
	// writer streams its results in chunks.
	out := bufio.NewWriterSize(a.stdout, 64<<10)
	switch cf.format.value {
	case "json":
		err = run.writeJSON(out)
	case "sarif":
		err = run.writeSARIF(out)
	case "annotations":
		run.writeAnnotations(out)
	case "checklist", "checklist-csv":
		err = run.writeChecklist(out, cf.format.value == "checklist-csv")
	default:
		run.writeText(out, pal)
	}
	if err != nil {
		fmt.Fprintf(a.stderr, "chanlint check: cannot write %s output: %v\n", cf.format.value, err)
		return exitInvalid
	}
	if err := out.Flush(); err != nil {
		return exitInvalid
	}

	if cf.writeBaseline != "" {
		n, excepted, err := a.writeBaselineFile(cf.writeBaseline, results)
		if err != nil {
			fmt.Fprintf(a.stderr, "chanlint check: cannot write baseline %s: %v\n", cf.writeBaseline, err)
			return exitInvalid
		}
		msg := fmt.Sprintf("chanlint check: recorded %s in baseline %s", plural(n, "finding", "findings"), cf.writeBaseline)
		if excepted > 0 {
			msg += fmt.Sprintf("; %s covered by design exceptions not recorded", plural(excepted, "finding", "findings"))
		}
		fmt.Fprintln(a.stderr, msg)
	}
	if len(results) == 0 {
		return exitInvalid
	}
	return run.exitCode(policies.Severity(cf.failOn.value), cf.writeBaseline != "")
}

// checkPaths discovers the models under paths and checks them with up to
// jobs workers (0: the default). Path problems become invalid results; the
// results are in discovery order, whatever the number of workers; k says
// what each keeps besides its findings.
func (a *app) checkPaths(paths []string, pol *policies.Policy, jobs int, k pipeline.Keep) []*pipeline.Result {
	var rest []string
	for _, p := range paths {
		if p != "-" {
			rest = append(rest, p)
		}
	}
	var results []*pipeline.Result
	if len(rest) < len(paths) {
		// "-": one model from standard input, first; the other paths as usual.
		name := a.stdinDisplay()
		if src, err := a.readStdin(); err != nil {
			results = append(results, pipeline.Unreadable(name, err))
		} else {
			results = append(results, pipeline.Parse(pipeline.File{Name: name}, src).CheckVaried(pol, a.pipelineOptions(k), max(jobs, a.defaultJobs)))
		}
		if len(rest) == 0 {
			a.displayPlaces(results)
			return results
		}
	}
	found, problems := a.discover(rest)
	for _, p := range problems {
		results = append(results, pipeline.Unreadable(p.display, p.err))
	}
	files := make([]pipeline.File, len(found))
	for i, f := range found {
		files[i] = f.pipelineFile()
	}
	if jobs == 0 {
		jobs = a.defaultJobs
	}
	scaleMemoryLimit(heldBytes(found, jobs, k))
	prog := a.newProgress(len(files))
	checked := pipeline.CheckFiles(files, pol, a.pipelineOptions(k), jobs, prog.step)
	prog.done()
	results = append(results, checked...)
	a.displayPlaces(results)
	return results
}

// displayPlaces prints the places of findings in another file than
// their model, found by absolute path (the related places in a
// discovered .chanlint.hcl or a --policy given as a path, a stale
// approval in an --approvals file given so), relative to the working
// directory, as every other path of the output. Each finding is renamed
// as a whole (rules.Finding.RenameFiles), so its places keep one name per
// file.
func (a *app) displayPlaces(results []*pipeline.Result) {
	for _, r := range results {
		for i := range r.Findings {
			r.Findings[i].RenameFiles(func(fn string) string {
				if fn != r.File.Name && filepath.IsAbs(fn) {
					return a.display(fn)
				}
				return fn
			})
		}
	}
}

// varyUsage is the help of --vary (check and report).
const varyUsage = "solve each event again over a sensitivity envelope `SPEC`, e.g. roughness=0.2,tailwater=0.3,discharge=0.1 (replaces the policy's sensitivity block)"

// setVary reads the --vary SPEC of check or report into a.vary; an empty
// spec leaves it nil (the policy's sensitivity block, if any, decides).
func (a *app) setVary(spec string) error {
	if spec == "" {
		return nil
	}
	s, err := pipeline.ParseSensitivity(spec)
	if err != nil {
		return err
	}
	a.vary = &s
	return nil
}

// pipelineOptions are the options of every check of this run.
func (a *app) pipelineOptions(k pipeline.Keep) pipeline.Options {
	return pipeline.Options{Keep: k, Stderr: a.stderr, Solver: solveOptions, Vary: a.vary}
}

// heldBytes estimates what a run holds in memory at once, for the soft
// memory limit: the model text being decoded and solved (every file when
// the models and solutions are kept, as by report, else the largest files
// the workers have in flight at a time) and the sources kept as they are
// (SARIF's artifacts).
func heldBytes(found []modelFile, jobs int, k pipeline.Keep) (solving, kept int64) {
	sizes := make([]int64, 0, len(found))
	var total int64
	for _, f := range found {
		if fi, err := os.Stat(f.abs); err == nil && fi.Mode().IsRegular() {
			sizes = append(sizes, fi.Size())
			total += fi.Size()
		}
	}
	if k.Source {
		kept = total
	}
	if k.Solved {
		return total, kept
	}
	slices.Sort(sizes)
	for i := len(sizes) - 1; i >= 0 && i >= len(sizes)-max(jobs, 1); i-- {
		solving += sizes[i]
	}
	return solving, kept
}

// stdinName is the name a model read from standard input is printed with
// when --stdin-name does not give one.
const stdinName = "<stdin>"

// stdinDisplay is the printed name of the model on standard input.
func (a *app) stdinDisplay() string {
	if a.stdinName != "" {
		return filepath.ToSlash(a.stdinName)
	}
	return stdinName
}

// readStdin reads the model of PATH "-", at most model.MaxFileSize bytes.
func (a *app) readStdin() ([]byte, error) {
	if a.stdin == nil {
		return nil, errors.New("no standard input")
	}
	data, err := io.ReadAll(io.LimitReader(a.stdin, model.MaxFileSize+1))
	if err != nil {
		return nil, err
	}
	if len(data) > model.MaxFileSize {
		return nil, fmt.Errorf("standard input is larger than %d MiB", model.MaxFileSize>>20)
	}
	return data, nil
}

// pipelineFile is the file as the pipeline names it.
func (f modelFile) pipelineFile() pipeline.File { return pipeline.File{Name: f.display, Path: f.abs} }

// orDot is paths, or "." when there are none.
func orDot(paths []string) []string {
	if len(paths) == 0 {
		return []string{"."}
	}
	return paths
}

// solveOptions are the solver's options for every file: the defaults, a
// variable so that a test can lower the work budget.
var solveOptions = solver.Options{}

// progress prints "checked 120/1000 files" on stderr while a long run
// goes on: only when stderr is a terminal and there are many files.
type progress struct {
	w     io.Writer
	total int
	mu    sync.Mutex
	count int
	last  time.Time
	shown bool
}

func (a *app) newProgress(total int) *progress {
	if !a.stderrTTY || total < progressThreshold {
		return nil
	}
	return &progress{w: a.stderr, total: total}
}

func (p *progress) step() {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.count++
	if now := time.Now(); p.count == p.total || now.Sub(p.last) >= 100*time.Millisecond {
		p.last = now
		p.shown = true
		fmt.Fprintf(p.w, "\rchecked %d/%d files", p.count, p.total)
	}
}

// done erases the progress line.
func (p *progress) done() {
	if p == nil || !p.shown {
		return
	}
	fmt.Fprint(p.w, "\r\033[K")
}

// writeBaselineFile records the findings of the valid files in path, with
// file names relative to the baseline's directory, replacing it atomically.
// It returns how many it recorded and how many it left out because a
// design exception covers them.
func (a *app) writeBaselineFile(path string, results []*pipeline.Result) (n, excepted int, err error) {
	abs := a.abs(path)
	all := pipeline.BaselineFindings(results, abs, a.cwd)
	var buf bytes.Buffer
	n, err = baseline.Write(&buf, all)
	if err != nil {
		return 0, 0, err
	}
	return n, len(all) - n, a.writeOutput(abs, results, buf.Bytes())
}

// writeOutput replaces the file at abs with the parts, one after another
// (see safefile.WriteParts): a failed write leaves the previous file
// intact, a target that is not a regular file is refused, and so is one
// of the run's input models.
func (a *app) writeOutput(abs string, inputs []*pipeline.Result, parts ...[]byte) error {
	for _, r := range inputs {
		if r.File.Path != "" && safefile.SameFile(abs, r.File.Path) {
			return fmt.Errorf("%w (%s)", safefile.ErrInput, r.File.Name)
		}
	}
	return describePathError(safefile.WriteParts(abs, parts))
}

// checkRun is one finished check, ready to render.
type checkRun struct {
	app          *app
	results      []*pipeline.Result
	shown        map[string][]rules.Finding // by display path
	policy       *policies.Policy
	info         policyInfo
	view         pipeline.View
	baselinePath string
	problems     []sarifout.Problem // why the setup failed (SARIF only)
}

// tally counts the shown findings.
type tally struct {
	files, invalid                    int
	errors, warnings, infos, excepted int
}

func (c *checkRun) tally() tally {
	var t tally
	for _, r := range c.results {
		t.files++
		if r.Invalid {
			t.invalid++
		}
		for _, f := range c.shown[r.File.Name] {
			switch {
			case f.Excepted:
				t.excepted++
			case f.Severity == policies.Error:
				t.errors++
			case f.Severity == policies.Warning:
				t.warnings++
			case f.Severity == policies.Info:
				t.infos++
			}
		}
	}
	return t
}

// exitCode is 2 for invalid input, else 1 when a shown finding that is not
// excepted is at or above failOn, else 0. Writing a baseline accepts
// today's findings, so it exits 0 unless input is invalid.
func (c *checkRun) exitCode(failOn policies.Severity, writingBaseline bool) int {
	for _, r := range c.results {
		if r.Invalid {
			return exitInvalid
		}
	}
	if writingBaseline {
		return exitOK
	}
	for _, fs := range c.shown {
		for _, f := range fs {
			if !f.Excepted && f.Severity.Rank() >= failOn.Rank() {
				return exitFindings
			}
		}
	}
	return exitOK
}

func (c *checkRun) writeText(w io.Writer, p *palette) {
	any := false
	for _, r := range c.results {
		d := r.File.Name
		for i := range c.shown[d] {
			writeFindingText(w, &c.shown[d][i], r.Src, r.Unit(), p)
			if c.view.Marks != nil && c.view.Marks[d][i].State == baseline.Worse {
				writeContinuation(w, "baseline", worseText(&c.shown[d][i], c.view.Marks[d][i].Entry), p)
			}
			any = true
		}
	}
	if any {
		fmt.Fprintln(w)
	}
	c.writeClosing(w, p)
}

// writeClosing prints the lines that end the text output: the summary,
// the baseline's account, the policy and the caution.
func (c *checkRun) writeClosing(w io.Writer, p *palette) {
	t := c.tally()
	files := plural(t.files, "file", "files")
	if t.invalid > 0 {
		files += fmt.Sprintf(" (%d invalid)", t.invalid)
	}
	fmt.Fprintf(w, "%s\n", p.bold.Sprintf("%s, %s, %s, %s, %d excepted", files,
		plural(t.errors, "error", "errors"), plural(t.warnings, "warning", "warnings"),
		plural(t.infos, "info", "info"), t.excepted))
	if c.baselinePath != "" {
		fmt.Fprintf(w, "baseline: %s recorded in %s not shown\n",
			plural(c.view.Known, "known finding", "known findings"), c.baselinePath)
		if n := len(c.view.Stale); n > 0 {
			fmt.Fprintf(w, "baseline: %s no longer found (write the baseline again to drop %s):\n",
				plural(n, "entry", "entries"), map[bool]string{true: "it", false: "them"}[n == 1])
			for _, e := range c.view.Stale {
				fmt.Fprintf(w, "    %s\n", staleText(e))
			}
		}
	}
	for _, line := range c.sensitivityLines() {
		fmt.Fprintln(w, line)
	}
	fmt.Fprintln(w, c.app.policyLine(c.policy, c.info))
	for _, n := range c.info.Notes() {
		if n.Warn {
			fmt.Fprintln(w, p.severity(policies.Warning)+": "+safetext.Text(n.Text))
			continue
		}
		fmt.Fprintln(w, safetext.Text(n.Text))
	}
	for _, r := range c.results {
		if len(r.NotEvaluated) == 0 {
			continue
		}
		fmt.Fprintf(w, "not evaluated (%s):\n", safetext.Text(r.File.Name))
		for _, item := range r.NotEvaluated {
			for i, line := range wrapWords(safetext.Text(item), textWidth-6) {
				lead := "  - "
				if i > 0 {
					lead = "    "
				}
				fmt.Fprintln(w, lead+line)
			}
		}
	}
	fmt.Fprintln(w, p.dim.Sprint(rules.Caution))
}

// sensitivityLines account for the sensitivity runs made, one line for
// each size of run: "sensitivity: each event solved in 14 more cases
// (roughness ±20 %, ...): 1 robust fail, 2 knife-edge, 3 sensitivity
// findings".
func (c *checkRun) sensitivityLines() []string {
	type tally struct {
		cases int
		pipeline.Tally
	}
	var order []string
	runs := map[string]*tally{}
	for _, r := range c.results {
		if !r.Sensitivity.Active() {
			continue
		}
		desc := r.Sensitivity.String()
		t := runs[desc]
		if t == nil {
			t = &tally{cases: len(r.Cases)}
			runs[desc] = t
			order = append(order, desc)
		}
		for i := range c.shown[r.File.Name] {
			t.Add(&c.shown[r.File.Name][i])
		}
	}
	var lines []string
	for _, desc := range order {
		t := runs[desc]
		lines = append(lines, fmt.Sprintf("sensitivity: each event solved in %d more cases (%s): %d robust fail, %d knife-edge, %s",
			t.cases, desc, t.RobustFail, t.KnifeEdge, plural(t.Sensitivity, "sensitivity finding", "sensitivity findings")))
	}
	return lines
}

// absFiles moves a finding of the model named name to absolute paths, as
// SARIF's artifacts are: its place and every range in the model become
// abs, ranges in another file (a policy, an approvals file) that file's
// absolute path; built-in packs keep their "pack:NAME".
func (c *checkRun) absFiles(f *rules.Finding, name, abs string) {
	f.RenameFiles(func(fn string) string {
		switch {
		case fn == name:
			return abs
		case strings.HasPrefix(fn, "pack:"):
			return fn
		}
		return c.app.abs(filepath.FromSlash(fn))
	})
}

func (c *checkRun) writeSARIF(w io.Writer) error {
	// Artifact URIs are relative to the repository root (else the working
	// directory), as code-scanning services expect. The files are handed
	// over as absolute paths so that the URIs do not depend on the
	// process's own working directory.
	root := repoRoot(c.app.cwd)
	if root == "" {
		root = c.app.cwd
	}
	in := sarifout.Input{
		Rules:       rules.All(),
		Root:        root,
		Sources:     map[string][]byte{},
		ToolVersion: toolVersion(),
	}
	in.Problems = c.problems
	for _, n := range c.info.Notes() {
		in.PolicyNotes = append(in.PolicyNotes, sarifout.Note{Text: n.Text, Warn: n.Warn})
	}
	for _, r := range c.results {
		abs := r.File.Path
		if abs == "" {
			abs = c.app.abs(filepath.FromSlash(r.File.Name))
		}
		for _, item := range r.NotEvaluated {
			in.NotEvaluated = append(in.NotEvaluated, sarifout.FileNote{File: abs, Text: item})
		}
	}
	if c.view.Every != nil {
		in.BaselineStates = []string{}
	}
	for _, r := range c.results {
		abs := r.File.Path
		if abs == "" {
			abs = c.app.abs(filepath.FromSlash(r.File.Name))
		}
		if c.view.Every == nil {
			for _, f := range c.shown[r.File.Name] {
				c.absFiles(&f, r.File.Name, abs)
				in.Findings = append(in.Findings, f)
				in.Units = append(in.Units, r.Unit())
			}
		} else {
			// With a baseline every finding is a result: known ones are
			// "unchanged", the others (much worse ones too) "new".
			for i, f := range r.Findings {
				c.absFiles(&f, r.File.Name, abs)
				in.Findings = append(in.Findings, f)
				in.Units = append(in.Units, r.Unit())
				state := "new"
				if c.view.Every[r.File.Name][i].State.Known() {
					state = "unchanged"
				}
				in.BaselineStates = append(in.BaselineStates, state)
			}
		}
		if r.Invalid && len(r.Findings) > 0 {
			f := r.Findings[0]
			pos := f.Pos()
			pos.Filename = abs // the file as Sources names it
			in.Problems = append(in.Problems, sarifout.Problem{Message: r.File.Name + ": not checked: " + f.Message, Range: pos})
		}
		if r.Src != nil {
			in.Sources[abs] = r.Src
		}
	}
	return sarifout.Write(w, in)
}

// loadPolicy resolves the policy of check, report and policy show: arg
// (a policy file or a built-in pack name) when given, else the nearest
// .chanlint.hcl, else the baseline pack. Diagnostics are printed on stderr;
// ok is false when there is no usable policy.
func (a *app) loadPolicy(arg string, p *palette) (*policies.Policy, bool) {
	target := arg
	isFile := false
	switch {
	case arg == "":
		cfg, err := findConfig(a.cwd)
		switch {
		case err != nil:
			fmt.Fprintf(a.stderr, "%s %s: cannot read discovered policy: %v\n", p.place.Sprint(a.display(cfg)+":"), p.severity(policies.Error), err)
			return nil, false
		case cfg != "":
			target, isFile = cfg, true
			a.discovered = cfg
		default:
			target = "baseline"
		}
	case !looksLikePath(arg):
		// A bare name is always a built-in pack, never a file of that
		// name that a submittal may have put in the working directory.
		if !slices.Contains(policies.PackNames(), arg) {
			msg := fmt.Sprintf("unknown policy pack %q; the built-in packs are %s", arg, strings.Join(policies.PackNames(), ", "))
			if _, err := os.Lstat(a.abs(arg)); err == nil {
				msg += fmt.Sprintf("; to use the file %s, write ./%s", arg, arg)
			}
			fmt.Fprintf(a.stderr, "chanlint: %s\n", msg)
			return nil, false
		}
	default:
		abs := a.abs(arg)
		if err := confineInput(abs); err != nil {
			fmt.Fprintf(a.stderr, "%s %s: cannot read policy file: %v\n", p.place.Sprint(arg+":"), p.severity(policies.Error), err)
			return nil, false
		}
		target, isFile = abs, true
	}
	root := repoRoot(a.cwd)
	if isFile && (root == "" || !within(root, target)) {
		// A policy outside any repository (or outside this one) may
		// extend files beside it and below.
		root = filepath.Dir(target)
	}
	if root == "" {
		root = a.cwd
	}
	loader := rules.Language().NewLoader(root)
	pol, diags := loader.Resolve(target)
	if len(diags) > 0 {
		a.writeDiagnostics(a.stderr, diags, loader.Files(), p)
	}
	if pol == nil || diags.HasErrors() {
		if !isFile && len(diags) == 0 {
			fmt.Fprintf(a.stderr, "chanlint: unknown policy %q\n", arg)
		}
		return nil, false
	}
	return pol, true
}

// loadApprovals reads the approvals file onto the policy ("" for none); a
// file that does not load is a diagnostic and exit status 2.
func (a *app) loadApprovals(path string, pol *policies.Policy, p *palette) bool {
	if path == "" {
		return true
	}
	abs := a.abs(path)
	if err := confineInput(abs); err != nil {
		fmt.Fprintf(a.stderr, "%s %s: cannot read approvals file: %v\n", p.place.Sprint(path+":"), p.severity(policies.Error), err)
		return false
	}
	src, err := safefile.Read(abs, policies.MaxFileSize)
	if err != nil {
		fmt.Fprintf(a.stderr, "%s %s: cannot read approvals file: %v\n", p.place.Sprint(path+":"), p.severity(policies.Error), err)
		return false
	}
	name := filepath.ToSlash(path)
	approvals, diags := policies.ParseApprovals(name, src)
	if len(diags) > 0 {
		files := map[string]*hcl.File{}
		if f, _ := hclsyntax.ParseConfig(src, name, hcl.InitialPos); f != nil {
			files[name] = f
		}
		a.writeDiagnostics(a.stderr, diags, files, p)
	}
	if diags.HasErrors() {
		return false
	}
	pol.Approvals, pol.ApprovalsFile = approvals, name
	if pol.Exceptions != policies.Approved {
		fmt.Fprintf(a.stderr, "chanlint: %s: the policy's exceptions mode is %q, so the approvals do not decide which exceptions count; use a policy with exceptions = \"approved\"\n", name, pol.Exceptions)
	}
	return true
}

// looksLikePath tells a policy argument meant as a file from a pack name:
// a file is named with a path ("./strict", "ci/strict.policy.hcl") or a
// .hcl name; a bare word is a pack.
func looksLikePath(arg string) bool {
	return filepath.Ext(arg) == ".hcl" || strings.ContainsAny(arg, `/`+string(filepath.Separator)) || arg == "." || arg == ".."
}

// worseText says why a finding the baseline records counts as new.
func worseText(f *rules.Finding, e *baseline.Entry) string {
	was, _ := e.Shortfall()
	now := math.Abs(f.Value - f.Limit)
	unit := ""
	if f.Unit != "" {
		unit = " " + f.Unit
	}
	return fmt.Sprintf("new: much worse than recorded, %s%s past the limit where the baseline has %s%s (more than %d %% worse)",
		numfmt.Num(now), unit, numfmt.Num(was), unit, int(baseline.WorseShare*100))
}

// staleText describes a baseline entry that no finding matched.
func staleText(e baseline.Entry) string {
	f := rules.Finding{Reach: e.Reach, Event: e.Event}
	if e.FromStation != nil && e.ToStation != nil {
		f.FromStation, f.ToStation, f.HasSpan = *e.FromStation, *e.ToStation, true
	}
	text := e.File
	if e.Line > 0 {
		text += fmt.Sprintf(":%d", e.Line)
	}
	text += ": " + e.Severity + " [" + e.Rule + "]"
	if where := f.Where(""); where != "" {
		text += " " + where
	}
	return text
}

// setupLog passes on what the setup of a check (baseline, policy) prints
// on stderr and keeps a copy, so that a SARIF log can carry it when the
// setup fails.
type setupLog struct {
	w   io.Writer
	buf bytes.Buffer
}

func (s *setupLog) Write(p []byte) (int, error) {
	s.buf.Write(p)
	return s.w.Write(p)
}

var (
	ansiEscape = regexp.MustCompile(`\x1b\[[0-9;]*m`)
	gnuLine    = regexp.MustCompile(`^(.+?):(\d+):(\d+): (?:error|warning): `)
)

// problems turns the recorded lines into SARIF problems: one per line
// that is not a source snippet or a usage hint, with the file and
// position of its GNU prefix when it has one.
func (s *setupLog) problems(a *app) []sarifout.Problem {
	var out []sarifout.Problem
	for _, line := range strings.Split(ansiEscape.ReplaceAllString(s.buf.String(), ""), "\n") {
		if strings.TrimSpace(line) == "" || strings.HasPrefix(line, " ") || strings.HasPrefix(line, "run 'chanlint") {
			continue
		}
		p := sarifout.Problem{Message: line}
		if m := gnuLine.FindStringSubmatch(line); m != nil {
			ln, _ := strconv.Atoi(m[2])
			col, _ := strconv.Atoi(m[3])
			p.Range = hcl.Range{Filename: a.abs(filepath.FromSlash(m[1])),
				Start: hcl.Pos{Line: ln, Column: col, Byte: -1}, End: hcl.Pos{Line: ln, Column: col + 1, Byte: -1}}
		}
		out = append(out, p)
	}
	if len(out) == 0 {
		out = append(out, sarifout.Problem{Message: "chanlint check: the policy or baseline could not be used"})
	}
	return out
}

// listFlag is a flag that may be repeated, each value a comma-separated
// list.
type listFlag []string

func (l *listFlag) String() string { return strings.Join(*l, ",") }

func (l *listFlag) Set(s string) error {
	for _, v := range strings.Split(s, ",") {
		if v = strings.TrimSpace(v); v != "" {
			*l = append(*l, v)
		}
	}
	return nil
}

// findingFilter says whether a finding of rule and event passes --rule and
// --event: any rule when none is given, and any event, or no event, when
// none is given. A finding of no event (about the model itself) passes an
// --event filter.
func findingFilter(ruleIDs, events []string) func(rule, event string) bool {
	return func(rule, event string) bool {
		if len(ruleIDs) > 0 && !slices.Contains(ruleIDs, rule) {
			return false
		}
		return len(events) == 0 || event == "" || slices.Contains(events, event)
	}
}

// warnUnknownEvents says on stderr which --event names no checked model
// has, since a misspelt event would otherwise show a clean run.
func (a *app) warnUnknownEvents(events []string, results []*pipeline.Result) {
	if len(events) == 0 {
		return
	}
	var all []string
	for _, r := range results {
		all = append(all, r.Events...)
	}
	for _, ev := range events {
		if slices.Contains(all, ev) {
			continue
		}
		msg := fmt.Sprintf("chanlint check: warning: no checked model has an event named %q", ev)
		if s := suggest(ev, all); s != "" {
			msg += fmt.Sprintf("; did you mean %q?", s)
		}
		fmt.Fprintln(a.stderr, msg)
	}
}
