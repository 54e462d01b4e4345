// Package pipeline turns model files into findings: it reads and parses a
// model, solves it, checks the solution against a policy (the rules apply
// the model's design exceptions) and hides the findings a baseline
// records. The commands (check, report, solve) call it; so can anything
// else that needs findings: an editor integration, a revision diff or a
// sensitivity run.
//
// The stages are separate so that a caller can parse once and solve and
// check many times:
//
//	parsed := pipeline.Load(pipeline.File{Name: "a.chan.hcl", Path: abs})
//	if parsed.Invalid {
//		// parsed.Diagnostics say why, at file:line:column
//	}
//	for _, opts := range variants {
//		res := parsed.Check(pol, opts) // never panics; res.Findings sorted
//	}
//
// The pipeline never prints: the only output is the stack of a recovered
// panic, written to Options.Stderr for the bug report. Every result holds
// its findings with the fields a renderer needs (rule, severity, message,
// remedy, position, reach, event, span, value and limit, exception); a
// renderer never has to read the message to decide what to print.
package pipeline

import (
	"errors"
	"fmt"
	"io"
	"runtime/debug"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
)

// File names one model file.
type File struct {
	// Name is the file as printed and as findings carry it (relative to
	// the working directory, forward slashes).
	Name string
	// Path is where the file is read from (absolute); "" for a text that
	// is not on disk or a path that could not be searched.
	Path string
}

// Parsed is a model file after reading and parsing, before solving. It is
// not modified by Check, so one Parsed may be checked many times, also
// concurrently.
type Parsed struct {
	File  File
	Src   []byte       // the text; nil when it could not be read
	Model *model.Model // nil when Invalid
	// Diagnostics are the `model` findings of reading and parsing: the
	// errors of an invalid file, or the warnings of a valid one.
	Diagnostics []rules.Finding
	Invalid     bool
}

// Keep says what a Result keeps besides its findings. A large run drops the
// model, its solution and the source as soon as the rules have run.
type Keep struct {
	// Solved keeps the model and its solution (for a report or a plot).
	Solved bool
	// Source keeps the text of a valid model (for SARIF offsets and
	// hashes); an invalid model's text is always kept, for the snippets
	// under its diagnostics.
	Source bool
}

// Options control a check.
type Options struct {
	Solver solver.Options
	Keep   Keep
	// Stderr receives the stack of a recovered panic; nil discards it.
	Stderr io.Writer
	// Vary asks for a sensitivity run of these sizes in place of the
	// policy's sensitivity block; nil: the policy's block, if any, decides
	// (see CheckVaried).
	Vary *Sensitivity
	// jobs is the number of workers of a sensitivity run's cases (set by
	// CheckFiles).
	jobs int
}

// Result is what is learnt about one model file.
type Result struct {
	File     File
	Src      []byte         // see Keep.Source
	Model    *model.Model   // see Keep.Solved
	Solution *solver.Result // see Keep.Solved
	// Units is the model's unit system; "" when there is no model.
	Units model.Units
	// Events are the names of the model's flow events.
	Events []string
	// Findings are sorted by position (see rules.Check): the diagnostics
	// of the file first when it is invalid.
	Findings []rules.Finding
	// Invalid is true when the file could not be read, parsed or solved,
	// or its check failed: the run must exit with status 2.
	Invalid bool
	// Sensitivity is the sensitivity run made, in the model's units; zero
	// when none was.
	Sensitivity Sensitivity
	// Cases are the perturbed cases of the sensitivity run, in order.
	Cases []Case
	// Bands are the water-surface ranges of the sensitivity run (see
	// Keep.Solved); nil without one.
	Bands []Band
	// NotEvaluated says what the check of a solved model did not evaluate
	// (see rules.NotEvaluated); every output states it.
	NotEvaluated []string
}

// Unit is the length unit of the result's model ("m" when unknown).
func (r *Result) Unit() string {
	if r.Units == "" {
		return model.SI.Length()
	}
	return r.Units.Length()
}

// Load reads a model file (at most model.MaxFileSize bytes) and parses it.
func Load(f File) *Parsed {
	src, diags := model.ReadFile(f.Path)
	if diags.HasErrors() {
		// ReadFile names the file by the path it was given.
		for _, d := range diags {
			if d.Subject != nil {
				d.Subject.Filename = f.Name
			}
			d.Detail = strings.ReplaceAll(d.Detail, f.Path, f.Name)
		}
		return &Parsed{File: f, Diagnostics: rules.FromDiagnostics(f.Name, diags), Invalid: true}
	}
	return Parse(f, src)
}

// Parse parses a model text that has been read already (standard input, an
// editor buffer). Parses of all goroutines share a token budget
// (MaxParsingTokens): a dense file waits while others are being parsed.
func Parse(f File, src []byte) *Parsed {
	p := &Parsed{File: f, Src: src}
	m, diags := parseAdmitted(f.Name, src)
	if len(diags) > 0 {
		p.Diagnostics = rules.FromDiagnostics(f.Name, diags)
	}
	if m == nil || diags.HasErrors() {
		if len(p.Diagnostics) == 0 {
			p.Diagnostics = []rules.Finding{InputFinding(f.Name, "not a valid model")}
		}
		p.Invalid = true
		return p
	}
	p.Model = m
	return p
}

// Unreadable is the result of a file or path that could not be read or
// searched at all.
func Unreadable(name string, err error) *Result {
	return &Result{
		File:     File{Name: name},
		Invalid:  true,
		Findings: []rules.Finding{InputFinding(name, "cannot read: "+err.Error())},
	}
}

// InputFinding is the `model` finding of a file that could not be read or
// parsed, with a message of its own.
func InputFinding(file, msg string) rules.Finding {
	return rules.Finding{Rule: "model", Severity: policies.Error, Message: msg, Range: hcl.Range{Filename: file}}
}

// checkRules is the rules stage; a variable so that a test can make the
// stage fail.
var checkRules = rules.Check

// Check solves the parsed model with opts and checks the solution against
// pol (nil: the always-on rules only). It never panics: a failure of a
// stage is reported as a finding of the file with a fixed message, so that
// the output stays deterministic, and the stack goes to opts.Stderr.
func (p *Parsed) Check(pol *policies.Policy, opts Options) (r *Result) {
	r = &Result{File: p.File, Src: p.Src, Model: p.Model, Invalid: p.Invalid}
	r.Findings = append(r.Findings, p.Diagnostics...)
	defer func() {
		if v := recover(); v != nil {
			r.recovered(v, opts.Stderr)
		}
		opts.Keep.trim(r)
	}()
	if p.Invalid || p.Model == nil {
		r.Invalid = true
		return r
	}
	r.Units = p.Model.Units
	for _, ev := range p.Model.Events {
		r.Events = append(r.Events, ev.Name)
	}
	res, err := solver.Solve(p.Model, opts.Solver)
	if err != nil {
		r.Invalid = true
		r.Findings = append(r.Findings, LimitFinding(p.Model, err))
		return r
	}
	r.Solution = res
	r.Findings = append(r.Findings, checkRules(p.Model, res, pol)...)
	r.NotEvaluated = rules.NotEvaluated(p.Model, res, pol)
	return r
}

// recovered records the panic v of r's check: the stack goes to stderr,
// a finding with a fixed message to r.
func (r *Result) recovered(v any, stderr io.Writer) {
	if stderr != nil {
		fmt.Fprintf(stderr, "chanlint: internal error while checking %s: %v\n%s", r.File.Name, v, debug.Stack())
	}
	r.Invalid = true
	r.Findings = append(r.Findings, panicFinding(r.File.Name, v))
}

// trim drops what k does not keep.
func (k Keep) trim(r *Result) {
	if !k.Solved {
		r.Model, r.Solution = nil, nil
	}
	if !k.Source && !r.Invalid {
		r.Src = nil
	}
}

// CheckFile loads, solves and checks one model file (see Check). Like
// Check it never panics.
func CheckFile(f File, pol *policies.Policy, opts Options) (r *Result) {
	defer func() {
		if v := recover(); v != nil { // while reading or parsing
			r = &Result{File: f}
			r.recovered(v, opts.Stderr)
		}
	}()
	return Load(f).CheckVaried(pol, opts, opts.jobs)
}

// CheckFiles checks files on up to jobs goroutines (at least one) and
// returns the results in the order of files, whatever the number of
// workers. done, when not nil, is called after each file (from the
// worker, so it must be safe for concurrent use); opts.Stderr is shared by
// the workers and serialised.
func CheckFiles(files []File, pol *policies.Policy, opts Options, jobs int, done func()) []*Result {
	out := make([]*Result, len(files))
	opts.jobs = jobs
	if opts.Stderr != nil {
		opts.Stderr = &lockedWriter{w: opts.Stderr}
	}
	Parallel(len(files), jobs, func(i int) {
		out[i] = CheckFile(files[i], pol, opts)
		if done != nil {
			done()
		}
	})
	return out
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

// Parallel calls fn(i) for every i in [0, n) on at most jobs goroutines.
func Parallel(n, jobs int, fn func(i int)) {
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

// panicFinding is the finding of a file whose check ended in a recovered
// panic v. The message holds v (a fixed text or a runtime error, the same
// on every run) but never the stack, whose addresses and goroutine
// numbers vary between runs.
func panicFinding(file string, v any) rules.Finding {
	return rules.Finding{
		Rule: "solver", Severity: policies.Error, Range: hcl.Range{Filename: file},
		Message: fmt.Sprintf("internal error while checking this model: %v; please report it with the model file and the stack printed on stderr", v),
	}
}

// LimitFinding reports a model the solver refused to finish because it
// exceeds a size limit.
func LimitFinding(m *model.Model, err error) rules.Finding {
	msg := "cannot solve the model: " + err.Error()
	switch {
	case errors.Is(err, solver.ErrTooManyPoints):
		msg += "; shorten the reaches, raise max_spacing or split the model"
	case errors.Is(err, solver.ErrWorkBudget):
		msg += "; split the model or its events; nothing of this model was checked"
	}
	return rules.Finding{
		Rule: "solver", Severity: policies.Error,
		Range: rules.InFile(m.File, m.UnitsRange), Message: msg,
	}
}
