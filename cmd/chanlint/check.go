package main

import (
	"bufio"
	"bytes"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/sarifout"
	"github.com/chanlint/chanlint/internal/safefile"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
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
	format        *choice
	color         *choice
	failOn        *choice
	baseline      string
	writeBaseline string
	jobs          int
}

func newCheckFlags() (*checkFlags, *flag.FlagSet) {
	cf := &checkFlags{
		format: newChoice("text", "text", "json", "sarif"),
		color:  newChoice("auto", "auto", "always", "never"),
		failOn: newChoice("error", "error", "warning", "info"),
	}
	fs := newFlagSet("check")
	fs.StringVar(&cf.policy, "policy", "", "policy `FILE` or built-in pack name (default: "+configName+", else the baseline pack)")
	fs.Var(cf.format, "format", "output format")
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

// fileResult is what is learnt about one model file and kept for the
// output. The model and its solution are kept only when asked for (by
// `report`): `check` needs only the findings, the length unit and, for
// snippets and SARIF, the source bytes, and dropping the rest as soon as
// the rules have run bounds the memory of a large run.
type fileResult struct {
	file     modelFile
	src      []byte
	model    *model.Model
	result   *solver.Result
	units    string // the model's length unit; "" when there is no model
	findings []rules.Finding
	invalid  bool
}

// keep says what checkFile keeps of a file besides its findings.
type keep struct {
	// solved keeps the model and its solution.
	solved bool
	// source keeps the source bytes of a valid model; an invalid model's
	// source is always kept, for the snippets under its diagnostics.
	source bool
}

func (a *app) runCheck(args []string) int {
	c := findCommand("check")
	cf, fs := newCheckFlags()
	paths, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, err)
	}
	if cf.jobs < 0 {
		return a.usageError(c, "--jobs must not be negative, got %d", cf.jobs)
	}
	pal := newPalette(a.useColor(cf.color.value, a.stdoutTTY))
	errPal := newPalette(a.useColor(cf.color.value, a.stderrTTY))

	var known *baseline.Baseline
	if cf.baseline != "" {
		abs := a.abs(cf.baseline)
		if err := confineInput(abs); err != nil {
			fmt.Fprintf(a.stderr, "chanlint check: cannot read baseline %s: %v\n", cf.baseline, err)
			return exitInvalid
		}
		b, err := baseline.Read(abs)
		if err != nil {
			// The error names the file by the absolute path it was read
			// from; print the path as the user wrote it.
			msg := strings.ReplaceAll(err.Error(), abs, a.display(abs))
			fmt.Fprintf(a.stderr, "chanlint check: %s\n", msg)
			return exitInvalid
		}
		known = b
	}

	pol, ok := a.loadPolicy(cf.policy, errPal)
	if !ok {
		return exitInvalid
	}

	// Only SARIF needs the source of a valid model (artifact lengths,
	// hashes and character offsets).
	results := a.checkPaths(paths, pol, cf.jobs, keep{source: cf.format.value == "sarif"})
	if len(results) == 0 {
		// Nothing checked is never a pass: a renamed or misplaced model
		// must not turn a failing design into a clean run.
		fmt.Fprintf(a.stderr, "chanlint check: no *%s files found under %s; nothing was checked\n", model.Suffix, strings.Join(orDot(paths), ", "))
	}

	// The findings to show: a baseline hides those it records.
	shown, knownCount := a.applyBaseline(results, known)

	run := checkRun{
		app: a, results: results, shown: shown, policy: pol,
		knownCount: knownCount, baselinePath: cf.baseline,
	}
	// The output goes straight to stdout, not through a buffer of its
	// own: a large run's JSON or SARIF document is tens of megabytes. The
	// encoders marshal the whole document before they write, so a
	// document that cannot be encoded writes nothing.
	out := bufio.NewWriterSize(a.stdout, 64<<10)
	switch cf.format.value {
	case "json":
		err = run.writeJSON(out)
	case "sarif":
		err = run.writeSARIF(out)
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
		if err := a.writeBaselineFile(cf.writeBaseline, results); err != nil {
			fmt.Fprintf(a.stderr, "chanlint check: cannot write baseline %s: %v\n", cf.writeBaseline, err)
			return exitInvalid
		}
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
func (a *app) checkPaths(paths []string, pol *policies.Policy, jobs int, k keep) []*fileResult {
	files, problems := a.discover(paths)
	results := make([]*fileResult, 0, len(problems)+len(files))
	for _, p := range problems {
		results = append(results, &fileResult{
			file:     modelFile{display: p.display},
			invalid:  true,
			findings: []rules.Finding{inputFinding(p.display, "cannot read: "+p.err.Error())},
		})
	}
	checked := make([]*fileResult, len(files))
	if jobs == 0 {
		jobs = a.defaultJobs
	}
	prog := a.newProgress(len(files))
	stderr := &lockedWriter{w: a.stderr}
	parallel(len(files), jobs, func(i int) {
		checked[i] = checkFile(files[i], pol, k, stderr)
		prog.step()
	})
	prog.done()
	return append(results, checked...)
}

// lockedWriter serialises the writes of the workers to one stream.
type lockedWriter struct {
	mu sync.Mutex
	w  io.Writer
}

func (l *lockedWriter) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.w.Write(p)
}

// orDot is paths, or "." when there are none.
func orDot(paths []string) []string {
	if len(paths) == 0 {
		return []string{"."}
	}
	return paths
}

// parallel calls fn(i) for every i in [0, n) on at most jobs goroutines.
func parallel(n, jobs int, fn func(i int)) {
	jobs = max(1, min(jobs, n))
	if jobs == 1 {
		for i := range n {
			fn(i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range jobs {
		wg.Go(func() {
			for {
				i := int(next.Add(1)) - 1
				if i >= n {
					return
				}
				fn(i)
			}
		})
	}
	wg.Wait()
}

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

// inputFinding is the `model` finding of a file that could not be read.
func inputFinding(file, msg string) rules.Finding {
	return rules.Finding{Rule: "model", Severity: policies.Error, Message: msg, File: file}
}

// checkFile loads, solves and checks one model, keeping what k asks for.
// It never panics: a failure of a later stage is reported as a finding of
// the file, with a fixed message so that the output stays deterministic;
// the stack goes to stderr for the bug report.
func checkFile(f modelFile, pol *policies.Policy, k keep, stderr io.Writer) (r *fileResult) {
	r = &fileResult{file: f}
	defer func() {
		if v := recover(); v != nil {
			fmt.Fprintf(stderr, "chanlint: internal error while checking %s: %v\n%s", f.display, v, debug.Stack())
			r.invalid = true
			r.findings = append(r.findings, panicFinding(f.display, v))
		}
		if !k.solved {
			r.model, r.result = nil, nil
		}
		if !k.source && !r.invalid {
			r.src = nil
		}
	}()
	r.src, r.model, r.findings, r.invalid = loadModel(f)
	if r.invalid {
		return r
	}
	r.units = r.model.Units.Length()
	res, err := solver.Solve(r.model, solver.Options{})
	if err != nil {
		r.invalid = true
		r.findings = append(r.findings, solverLimitFinding(r.model, err))
		return r
	}
	r.result = res
	r.findings = append(r.findings, checkRules(r.model, res, pol)...)
	return r
}

// checkRules is the rules stage of checkFile; a variable so that a test
// can make the stage fail.
var checkRules = rules.Check

// panicFinding is the finding of a file whose check ended in a recovered
// panic v. The message holds v (a fixed text or a runtime error, the same
// on every run) but never the stack, whose addresses and goroutine
// numbers vary between runs.
func panicFinding(file string, v any) rules.Finding {
	return rules.Finding{
		Rule: "solver", Severity: policies.Error, File: file,
		Message: fmt.Sprintf("internal error while checking this model: %v; please report it with the model file and the stack printed on stderr", v),
	}
}

// loadModel reads and parses one model file. invalid is true when there
// is no usable model; findings hold the diagnostics (errors, or warnings
// of a valid model).
func loadModel(f modelFile) (src []byte, m *model.Model, findings []rules.Finding, invalid bool) {
	src, diags := model.ReadFile(f.abs)
	if diags.HasErrors() {
		// ReadFile names the file by the absolute path it was given.
		for _, d := range diags {
			if d.Subject != nil {
				d.Subject.Filename = f.display
			}
			d.Detail = strings.ReplaceAll(d.Detail, f.abs, f.display)
		}
		return nil, nil, rules.FromDiagnostics(f.display, diags), true
	}
	m, diags = model.Parse(f.display, src)
	if len(diags) > 0 {
		findings = rules.FromDiagnostics(f.display, diags)
	}
	if m == nil || diags.HasErrors() {
		if len(findings) == 0 {
			findings = []rules.Finding{inputFinding(f.display, "not a valid model")}
		}
		return src, nil, findings, true
	}
	return src, m, findings, false
}

// solverLimitFinding reports a model the solver refused to finish because
// it exceeds a size limit.
func solverLimitFinding(m *model.Model, err error) rules.Finding {
	msg := "cannot solve the model: " + err.Error()
	if errors.Is(err, solver.ErrTooManyPoints) {
		msg += "; shorten the reaches, raise max_spacing or split the model"
	}
	return rules.Finding{
		Rule: "solver", Severity: policies.Error, File: m.File,
		Range: m.UnitsRange, Message: msg,
	}
}

// applyBaseline returns the findings to show for each valid file (by
// display path) once a baseline hides those it records, and how many it
// hid. Invalid files are never filtered: their diagnostics always show.
func (a *app) applyBaseline(results []*fileResult, b *baseline.Baseline) (map[string][]rules.Finding, int) {
	shown := map[string][]rules.Finding{}
	if b == nil {
		for _, r := range results {
			shown[r.file.display] = r.findings
		}
		return shown, 0
	}
	var all []rules.Finding
	for _, r := range results {
		if r.invalid {
			shown[r.file.display] = r.findings
			continue
		}
		all = append(all, r.findings...)
	}
	rebased, back := a.rebase(all, filepath.Dir(a.abs(b.Path)))
	fresh, known := b.Filter(rebased)
	for _, f := range fresh {
		f.File = back[f.File]
		shown[f.File] = append(shown[f.File], f)
	}
	return shown, known
}

// rebase returns copies of findings whose File is relative to dir (the
// directory of the baseline file), so that a baseline matches whatever
// directory chanlint runs in, and the map back to the printed paths.
func (a *app) rebase(findings []rules.Finding, dir string) ([]rules.Finding, map[string]string) {
	out := make([]rules.Finding, len(findings))
	back := map[string]string{}
	for i, f := range findings {
		rel, err := filepath.Rel(dir, a.abs(filepath.FromSlash(f.File)))
		if err == nil {
			back[filepath.ToSlash(rel)] = f.File
			f.File = filepath.ToSlash(rel)
		} else {
			back[f.File] = f.File
		}
		out[i] = f
	}
	return out, back
}

// writeBaselineFile records the findings of the valid files in path, with
// file names relative to the baseline's directory, replacing it atomically.
func (a *app) writeBaselineFile(path string, results []*fileResult) error {
	var all []rules.Finding
	for _, r := range results {
		if !r.invalid {
			all = append(all, r.findings...)
		}
	}
	abs := a.abs(path)
	all, _ = a.rebase(all, filepath.Dir(abs))
	var buf bytes.Buffer
	if err := baseline.Write(&buf, all); err != nil {
		return err
	}
	return a.writeOutput(abs, buf.Bytes(), results)
}

// writeOutput replaces the file at abs with data (see safefile.Write): a
// failed write leaves the previous file intact, a target that is not a
// regular file is refused, and so is one of the run's input models.
func (a *app) writeOutput(abs string, data []byte, inputs []*fileResult) error {
	for _, r := range inputs {
		if r.file.abs != "" && safefile.SameFile(abs, r.file.abs) {
			return fmt.Errorf("%w (%s)", safefile.ErrInput, r.file.display)
		}
	}
	return describePathError(safefile.Write(abs, data))
}

// checkRun is one finished check, ready to render.
type checkRun struct {
	app          *app
	results      []*fileResult
	shown        map[string][]rules.Finding // by display path
	policy       *policies.Policy
	knownCount   int
	baselinePath string
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
		if r.invalid {
			t.invalid++
		}
		for _, f := range c.shown[r.file.display] {
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
		if r.invalid {
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

// unit is the length unit of a file's model ("m" when unknown).
func (r *fileResult) unit() string {
	if r.units != "" {
		return r.units
	}
	return "m"
}

func (c *checkRun) writeText(w io.Writer, p *palette) {
	any := false
	for _, r := range c.results {
		for i := range c.shown[r.file.display] {
			writeFindingText(w, &c.shown[r.file.display][i], r.src, r.unit(), p)
			any = true
		}
	}
	if any {
		fmt.Fprintln(w)
	}
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
			plural(c.knownCount, "known finding", "known findings"), c.baselinePath)
	}
	fmt.Fprintln(w, c.app.policyLine(c.policy))
	fmt.Fprintln(w, p.dim.Sprint(rules.Caution))
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
		Units:       map[string]string{},
		ToolVersion: toolVersion(),
	}
	for _, r := range c.results {
		abs := r.file.abs
		if abs == "" {
			abs = c.app.abs(filepath.FromSlash(r.file.display))
		}
		for _, f := range c.shown[r.file.display] {
			f.File = abs
			in.Findings = append(in.Findings, f)
		}
		if r.src != nil {
			in.Sources[abs] = r.src
		}
		in.Units[abs] = r.unit()
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

// looksLikePath tells a policy argument meant as a file from a pack name:
// a file is named with a path ("./strict", "ci/strict.policy.hcl") or a
// .hcl name; a bare word is a pack.
func looksLikePath(arg string) bool {
	return filepath.Ext(arg) == ".hcl" || strings.ContainsAny(arg, `/`+string(filepath.Separator)) || arg == "." || arg == ".."
}
