// Package rules checks solved models against a policy. Each rule is a small
// value (id, title, default severity, documentation, Check function) in its
// own file; Check merges contiguous failing points into station spans,
// applies design exceptions and sorts the findings. Rules read solved
// results and settings; they never solve, read files or print.
//
// A finding points at the block a designer edits to fix it: the reach, or
// the segment whose section is in force at the failing span; the bend for
// superelevation; the basin a jump escapes or starts in. Its value and limit
// are in the model's units, whatever units the policy was written in. A
// computed point whose numbers are not finite is never judged (the solver
// rule reports it), so no finding carries NaN or Inf.
package rules

import (
	"fmt"
	"path"
	"slices"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/hashicorp/hcl/v2"
)

// Caution closes every output of chanlint.
const Caution = "chanlint screens a model against the configured design criteria; " +
	"it does not replace review and sealing by a licensed professional engineer under local codes."

// Finding is one result of a rule.
type Finding struct {
	Rule     string
	Severity policies.Severity
	// Message states what was measured against which limit, in the
	// model's units, without the reach, event and station span (the
	// renderers print those from the fields below).
	Message string
	// Remedy is what to change, where the rule can compute it: printed on
	// its own line in text, as `remedy` in JSON, after the message in
	// SARIF and the report. "" when there is none.
	Remedy string
	// Range is the block a designer edits to fix the finding (the reach,
	// segment, bend or basin); findings sort by it, and exceptions and the
	// rule goldens refer to it. Its Filename is the one file the finding
	// is in (File), forward slashes, as given: the model file, the
	// approvals file for a stale approval; a finding without a position
	// (an unreadable file) has a Range with only the Filename.
	Range hcl.Range
	// Focus is the value of the attribute that matters most when there is
	// one (the section's height for freeboard, its lining for velocity),
	// a range in the finding's file; outputs print their line and column
	// from Pos. Zero when the block itself is the place.
	Focus hcl.Range
	Reach string // "" when the finding is not about a reach
	Event string // "" when not about an event
	// Station span; HasSpan is false for findings without one.
	FromStation, ToStation float64
	HasSpan                bool
	// Worst measured value and the limit, in the model's units, and the
	// symbol of their unit ("m", "m/s", "N/m²"; "" for a pure number
	// such as the Froude number).
	Value, Limit float64
	HasValue     bool
	Unit         string
	Reference    string // the policy's reference, version and the block's section (policies.Cite)
	// Section is the policy block's reference into its manual
	// (`section`); "" when the block gives none.
	Section  string
	Excepted bool
	// The exception that covers this finding, when Excepted.
	ExceptionReason string
	ExceptionRange  hcl.Range
	// Envelope is the finding's verdict over a sensitivity run; nil when
	// none was made or the finding does not depend on the flow.
	Envelope *Envelope
	// Related are the other places that explain the finding, each with a
	// short label: the policy settings that set its limit, the design
	// exception that covers it. Their ranges may lie in a policy file
	// ("pack:NAME" for a built-in pack).
	Related []Related
}

// Related is a place that explains a finding.
type Related struct {
	Label string // "limit freeboard.minimum", "policy block jump_containment", "exception"
	Range hcl.Range
}

// Equal reports whether f and g are the same finding, field by field
// (TestFindingEqualCoversEveryField keeps the list complete).
func (f *Finding) Equal(g *Finding) bool {
	return f.Rule == g.Rule && f.Severity == g.Severity && f.Message == g.Message && f.Remedy == g.Remedy &&
		f.Range == g.Range && f.Focus == g.Focus && f.Reach == g.Reach && f.Event == g.Event &&
		f.FromStation == g.FromStation && f.ToStation == g.ToStation && f.HasSpan == g.HasSpan &&
		f.Value == g.Value && f.Limit == g.Limit && f.HasValue == g.HasValue && f.Unit == g.Unit &&
		f.Reference == g.Reference && f.Section == g.Section && f.Excepted == g.Excepted && f.ExceptionReason == g.ExceptionReason &&
		f.ExceptionRange == g.ExceptionRange && sameEnvelope(f.Envelope, g.Envelope) && slices.Equal(f.Related, g.Related)
}

// sameEnvelope reports whether two verdicts are equal (both nil, or equal
// values).
func sameEnvelope(a, b *Envelope) bool {
	if a == nil || b == nil {
		return a == b
	}
	return *a == *b
}

// Verdicts of a finding over a sensitivity run.
const (
	RobustFail  = "robust_fail" // fails in the nominal case and every perturbed one
	KnifeEdge   = "knife_edge"  // fails in the nominal case, passes in some perturbed one
	Sensitivity = "sensitivity" // passes in the nominal case, fails in some perturbed one
)

// Envelope is a finding's verdict over the cases of a sensitivity run.
type Envelope struct {
	Verdict string // RobustFail, KnifeEdge or Sensitivity
	Cases   int    // perturbed cases solved (the nominal one not counted)
	Failing int    // of those, the cases in which the finding fails
	// Driver names what flips the verdict: the parameter ("roughness",
	// "tailwater", "discharge") whose own cases flip it, several joined by
	// " and ", or "combined" when only a corner flips it; "" for a
	// robust fail.
	Driver string
	// Case is the first case, in case order, that flips the verdict (for
	// a knife edge the first that passes, for a sensitivity finding the
	// first that fails): "roughness +20 %", or a corner
	// "roughness +20 %, discharge −10 %". "" for a robust fail.
	Case string
}

// Context is what a rule's Check reads.
type Context struct {
	Model  *model.Model
	Result *solver.Result
	Policy *policies.Policy
	Config *policies.RuleConfig // nil for always-on rules without a block
	// Findings holds the other rules' findings, before exceptions are
	// applied, for a rule that judges them (unused_exception); nil for the
	// others.
	Findings []Finding

	// head is the rule's first block when it has several or a selector
	// (Selects resolves against it); nil otherwise.
	head *policies.RuleConfig

	verdict verdict      // scratch space of scan
	spans   []span       // scratch space of scan: the spans of one reach, reused
	trial   solver.Point // scratch space of locate: the flow at a trial station
	shared  *shared      // what the rules of one check share (runs.go); nil: nothing
}

// Rule is one check of the registry. Its embedded spec (id, default
// severity, always-on flag, settings and the settings that go together) is
// what the policy language decodes its block from; its Doc is what
// `chanlint explain`, the README, SARIF and the report print.
type Rule struct {
	policies.RuleSpec
	Title string // one line
	Doc   Doc
	// Check reports findings through report; it never prints.
	Check func(ctx *Context, report func(Finding))
}

// Text is the message followed by the remedy, for outputs that have one
// line of text per finding (SARIF, the report's tables).
func (f *Finding) Text() string {
	if f.Remedy == "" {
		return f.Message
	}
	return f.Message + "; " + f.Remedy
}

// File is the file the finding is in: the file of its Range. Every
// output names this file, with the line and column of Pos.
func (f *Finding) File() string { return f.Range.Filename }

// Pos is the position outputs print: Focus when set, else Range, in the
// finding's File.
func (f *Finding) Pos() hcl.Range {
	if f.Focus.Start.Line > 0 {
		p := f.Focus
		p.Filename = f.Range.Filename
		return p
	}
	return f.Range
}

// InFile is the range r in file: the Range of a finding whose place has
// no position of its own (r zero) or comes from a source that names the
// file otherwise.
func InFile(file string, r hcl.Range) hcl.Range {
	r.Filename = file
	return r
}

// RenameFiles renames the file of every range of f through name: its
// place (Range and Focus), the exception and the related places; a
// positioned range without a file name is in f's file. Zero ranges stay
// zero.
//
// A caller that names files otherwise than the rules (absolute for SARIF,
// relative to a baseline, a revision's proposed name) renames them all
// at once, so that the finding keeps one file and its related places in
// the same file keep its name.
func (f *Finding) RenameFiles(name func(file string) string) {
	own := f.Range.Filename
	rename := func(r *hcl.Range) {
		switch {
		case r.Filename != "":
			r.Filename = name(r.Filename)
		case r.Start.Line > 0 && own != "":
			r.Filename = name(own)
		}
	}
	rename(&f.Range)
	rename(&f.Focus)
	rename(&f.ExceptionRange)
	// Copies of a finding share their related places: copy them before
	// the first change, and only then.
	shared := true
	for i := range f.Related {
		r := f.Related[i].Range
		if rename(&r); r == f.Related[i].Range {
			continue
		}
		if shared {
			f.Related, shared = slices.Clone(f.Related), false
		}
		f.Related[i].Range = r
	}
}

// CheckPlaces reports a finding that could name two files for one place:
// no file, a Focus in another file than Range, or a related place (the
// exception, a Related range) with a position but no file name, or in
// the finding's file under another spelling of its path. Tests run it
// over every finding a check produces; nil when f names its places one
// way.
func (f *Finding) CheckPlaces() error {
	file := f.File()
	if file == "" {
		return fmt.Errorf("%s finding %q names no file", f.Rule, f.Message)
	}
	if f.Focus.Filename != "" && f.Focus.Filename != file {
		return fmt.Errorf("%s finding in %s has its focus in %s", f.Rule, file, f.Focus.Filename)
	}
	check := func(what string, r hcl.Range) error {
		switch {
		case r.Start.Line <= 0:
			return nil
		case r.Filename == "":
			return fmt.Errorf("%s finding in %s: %s at line %d names no file", f.Rule, file, what, r.Start.Line)
		case r.Filename != file && path.Clean(r.Filename) == path.Clean(file):
			return fmt.Errorf("%s finding in %s: %s names the same file as %s", f.Rule, file, what, r.Filename)
		}
		return nil
	}
	if f.Excepted {
		if err := check("the exception", f.ExceptionRange); err != nil {
			return err
		}
	}
	for _, r := range f.Related {
		if err := check("related place "+strconv.Quote(r.Label), r.Range); err != nil {
			return err
		}
	}
	return nil
}

// Rename moves f to file: every range of f in f's file names file
// instead; ranges in other files (a policy) keep theirs.
func (f *Finding) Rename(file string) {
	own := f.Range.Filename
	f.RenameFiles(func(n string) string {
		if n == own {
			return file
		}
		return n
	})
}

// Where names the place of a finding for a one-line output: "reach R,
// event E, stations a–b m" (each part only when the finding has it), with
// unit the model's length unit; "" when the finding has none of them.
func (f *Finding) Where(unit string) string {
	var parts []string
	if f.Reach != "" {
		parts = append(parts, "reach "+f.Reach)
	}
	if f.Event != "" {
		parts = append(parts, "event "+f.Event)
	}
	if f.HasSpan {
		s := numfmt.Span(f.FromStation, f.ToStation)
		word := "stations "
		if !strings.Contains(s, "–") {
			word = "station "
		}
		if unit != "" {
			s += " " + unit
		}
		parts = append(parts, word+s)
	}
	return strings.Join(parts, ", ")
}

// Text is the verdict in words for an output line: "robust fail: fails in
// all 14 cases", "knife-edge: fails in 9 of 14 cases; passes under
// roughness −20 % (driven by roughness)", "sensitivity: passes as
// designed, fails in 3 of 14 cases, first under discharge +10 % (driven by
// discharge)".
func (e *Envelope) Text() string {
	if e == nil {
		return ""
	}
	driven := ""
	switch e.Driver {
	case "":
	case "combined":
		driven = " (no parameter flips it alone, only several varied together)"
	default:
		driven = " (driven by " + e.Driver + ")"
	}
	of := strconv.Itoa(e.Failing) + " of " + strconv.Itoa(e.Cases) + " cases"
	switch e.Verdict {
	case RobustFail:
		return "robust fail: fails in all " + strconv.Itoa(e.Cases) + " perturbed cases"
	case KnifeEdge:
		return "knife-edge: fails in " + of + "; passes under " + e.Case + driven
	case Sensitivity:
		return "sensitivity finding: passes as designed, fails in " + of + ", first under " + e.Case + driven
	}
	return e.Verdict
}
