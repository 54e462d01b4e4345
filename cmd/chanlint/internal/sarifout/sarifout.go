// Package sarifout renders findings as a SARIF 2.1.0 log that code-scanning
// services accept (OASIS, Static Analysis Results Interchange Format
// Version 2.1.0, 2020).
//
// The log has one run. Its tool driver lists every rule of the registry
// with a short description (the rule's title), a full description (the
// first paragraph of its documentation), help in text and Markdown and the
// default level. Each finding is a result with the rule id and index, a
// level (info becomes "note"), its message, a physical location in a
// relative artifact URI with the base id SRCROOT, a region with start and
// end line and column, a partial fingerprint that does not depend on line
// numbers, and the reach, event, stations, value and limit as properties.
// A finding covered by a design exception carries an "inSource"
// suppression whose justification is the exception's reason. The
// licensed-review caution is a notification of the run's invocation.
//
// Columns: HCL counts columns in grapheme clusters, which no SARIF
// consumer does. The region columns and character offsets are therefore
// recomputed from the byte offsets of the range in the model source and
// are stated as UTF-16 code units (columnKind "utf16CodeUnits", the SARIF
// default and what editors built on UTF-16 strings use). When the source of
// a file is not given, the HCL columns are used as they are, which is exact
// for ASCII files.
package sarifout

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"path/filepath"
	"strings"
	"unicode/utf16"
	"unicode/utf8"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/owenrumney/go-sarif/v3/pkg/report/v210/sarif"
)

// Input is what Write renders.
type Input struct {
	Findings []rules.Finding
	Rules    []*rules.Rule
	// Root is the directory artifact URIs are relative to (normally the
	// repository root). When it is absolute, the run maps the base id
	// SRCROOT to it in originalUriBaseIds; when empty, file names are used
	// as given (relative to the working directory).
	Root    string
	Sources map[string][]byte // file (as in Finding.File) → bytes, for byte-offset columns
	// Units maps a file (as in Finding.File) to its model's length unit,
	// for the stations in result messages ("m" when missing).
	Units       map[string]string
	ToolVersion string
	// BaselineStates, when not nil, holds the SARIF baselineState of each
	// finding ("new", "unchanged"), parallel to Findings.
	BaselineStates []string
	// Problems are what kept the run from checking everything: an invalid
	// policy, baseline or model. Each becomes an error-level tool
	// execution notification, and the invocation is marked unsuccessful,
	// so that a code-scanning upload shows the cause.
	Problems []Problem
}

// Problem is one cause of an unsuccessful run: a message and, when known,
// the file and range it is about.
type Problem struct {
	Message string
	File    string
	Range   hcl.Range
}

// BaseID is the uriBaseId of every relative artifact URI.
const BaseID = "SRCROOT"

// FingerprintKey names the partialFingerprints entry of each result.
const FingerprintKey = "chanlintFinding/v1"

// ColumnKind is the unit of every column and character offset in the log.
const ColumnKind = "utf16CodeUnits"

// InformationURI is the tool's home page written in the log.
const InformationURI = "https://github.com/chanlint/chanlint"

// Level maps a severity to a SARIF level: error and warning keep their
// names, info becomes note, anything else none.
func Level(s policies.Severity) string {
	switch s {
	case policies.Error:
		return sarif.LevelError
	case policies.Warning:
		return sarif.LevelWarning
	case policies.Info:
		return sarif.LevelNote
	}
	return sarif.LevelNone
}

// Write renders in as an indented SARIF 2.1.0 log followed by a newline.
// The output depends only on in (and, for a relative Root or file name, on
// the working directory): the same findings give byte-identical logs.
func Write(w io.Writer, in Input) error {
	rep, err := Build(in)
	if err != nil {
		return err
	}
	raw, err := json.Marshal(rep)
	if err != nil {
		return fmt.Errorf("sarif: %w", err)
	}
	// The library writes every optional array, empty or not; a log
	// without them is smaller and what readers expect.
	compact, _, err := pruneEmptyArrays(raw)
	if err != nil {
		return fmt.Errorf("sarif: %w", err)
	}
	var out bytes.Buffer
	if err := json.Indent(&out, compact, "", "  "); err != nil {
		return fmt.Errorf("sarif: %w", err)
	}
	out.WriteByte('\n')
	_, err = w.Write(out.Bytes())
	return err
}

// pruneEmptyArrays returns the JSON value raw without the object members
// whose value is an empty array or an empty object, keeping the order of
// the members and the bytes of every scalar; keep is false when raw itself
// is empty. A run's "results" stays even when empty: SARIF reads an empty
// array as "checked, nothing found" and a missing one as "not checked".
func pruneEmptyArrays(raw json.RawMessage) (out []byte, keep bool, err error) {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 {
		return raw, true, nil
	}
	switch raw[0] {
	case '[':
		var items []json.RawMessage
		if err := json.Unmarshal(raw, &items); err != nil {
			return nil, false, err
		}
		if len(items) == 0 {
			return nil, false, nil
		}
		buf := []byte{'['}
		for i, it := range items {
			p, _, err := pruneEmptyArrays(it)
			if err != nil {
				return nil, false, err
			}
			if i > 0 {
				buf = append(buf, ',')
			}
			buf = append(buf, p...)
		}
		return append(buf, ']'), true, nil
	case '{':
		dec := json.NewDecoder(bytes.NewReader(raw))
		if _, err := dec.Token(); err != nil {
			return nil, false, err
		}
		buf := []byte{'{'}
		first := true
		for dec.More() {
			tok, err := dec.Token()
			if err != nil {
				return nil, false, err
			}
			var v json.RawMessage
			if err := dec.Decode(&v); err != nil {
				return nil, false, err
			}
			p, keep, err := pruneEmptyArrays(v)
			if err != nil {
				return nil, false, err
			}
			if !keep && tok != "results" {
				continue
			}
			if !keep {
				p = []byte("[]")
			}
			key, _ := json.Marshal(tok.(string))
			if !first {
				buf = append(buf, ',')
			}
			first = false
			buf = append(append(append(buf, key...), ':'), p...)
		}
		return append(buf, '}'), !first, nil
	}
	return raw, true, nil
}

// Build assembles the SARIF report without writing it, for callers that
// want to validate or merge it.
func Build(in Input) (*sarif.Report, error) {
	b := &builder{
		in:        in,
		ruleIndex: map[string]int{},
		artifacts: map[string]int{},
		lines:     map[string]*lineIndex{},
		seen:      map[string]int{},
	}
	if in.Root != "" {
		abs, err := filepath.Abs(in.Root)
		if err != nil {
			return nil, fmt.Errorf("sarif: root %s: %w", in.Root, err)
		}
		b.root = abs
	}
	run := sarif.NewRunWithInformationURI("chanlint", InformationURI)
	run.WithColumnKind(ColumnKind)
	driver := run.Tool.Driver
	driver.WithFullName("chanlint open-channel design-rule checker")
	if in.ToolVersion != "" {
		driver.WithVersion(in.ToolVersion)
	}
	if b.root != "" && filepath.IsAbs(in.Root) {
		u := fileURI(b.root)
		if !strings.HasSuffix(u, "/") {
			u += "/"
		}
		loc := sarif.NewArtifactLocation().WithURI(u)
		loc.Index = -1
		run.WithOriginalUriBaseIds(map[string]sarif.ArtifactLocation{BaseID: *loc})
	}
	b.run = run

	for _, r := range in.Rules {
		b.addRule(r)
	}
	for _, f := range in.Findings {
		if _, ok := b.ruleIndex[f.Rule]; !ok {
			b.addRule(&rules.Rule{RuleSpec: policies.RuleSpec{ID: f.Rule, Severity: f.Severity}, Title: f.Rule})
		}
	}
	cautionDesc := sarif.NewReportingDescriptor().
		WithID("caution").
		WithShortDescription(sarif.NewMultiformatMessageString().WithText("Scope of the checks")).
		WithDefaultConfiguration(sarif.NewReportingConfiguration().WithLevel(sarif.LevelNote))
	driver.AddNotification(cautionDesc)

	problemDesc := sarif.NewReportingDescriptor().
		WithID("input").
		WithShortDescription(sarif.NewMultiformatMessageString().WithText("An input could not be used")).
		WithDefaultConfiguration(sarif.NewReportingConfiguration().WithLevel(sarif.LevelError))
	driver.AddNotification(problemDesc)

	for i, f := range in.Findings {
		res := b.result(f)
		if in.BaselineStates != nil && in.BaselineStates[i] != "" {
			res.WithBaselineState(in.BaselineStates[i])
		}
		run.AddResult(res)
	}

	ref := sarif.NewReportingDescriptorReference().WithID("caution")
	ref.Index = 0
	inv := sarif.NewInvocation().WithExecutionSuccessful(len(in.Problems) == 0)
	for _, p := range in.Problems {
		pref := sarif.NewReportingDescriptorReference().WithID("input")
		pref.Index = 1
		n := sarif.NewNotification().WithLevel(sarif.LevelError).WithDescriptor(pref).
			WithMessage(sarif.NewTextMessage(p.Message))
		if p.File != "" {
			loc, _ := b.location(p.File, p.Range)
			n.WithLocations([]*sarif.Location{loc})
		}
		inv.AddToolExecutionNotification(n)
	}
	inv.AddToolExecutionNotification(sarif.NewNotification().
		WithLevel(sarif.LevelNote).
		WithDescriptor(ref).
		WithMessage(sarif.NewTextMessage(rules.Caution)))
	run.AddInvocation(inv)

	rep := sarif.NewReport()
	rep.AddRun(run)
	return rep, nil
}

type builder struct {
	in        Input
	root      string // absolute, or "" for none
	run       *sarif.Run
	ruleIndex map[string]int
	artifacts map[string]int // artifact URI → index
	lines     map[string]*lineIndex
	seen      map[string]int // fingerprint → occurrences so far
}

func (b *builder) addRule(r *rules.Rule) {
	if r == nil {
		return
	}
	if _, dup := b.ruleIndex[r.ID]; dup {
		return
	}
	title := r.Title
	if title == "" {
		title = r.ID
	}
	doc := ""
	if r.Doc.Checks != "" {
		doc = strings.TrimSpace(r.Text())
	}
	full := firstParagraph(doc)
	if full == "" {
		full = title
	}
	helpText := title
	helpMD := "**" + markdownEscape(title) + "**"
	if doc != "" {
		helpText += "\n\n" + doc
		helpMD += "\n\n" + doc
	}
	d := sarif.NewReportingDescriptor().
		WithID(r.ID).
		WithName(RuleName(r.ID)).
		WithHelpURI(HelpURI(r)).
		WithShortDescription(sarif.NewMultiformatMessageString().WithText(title)).
		WithFullDescription(sarif.NewMultiformatMessageString().WithText(full)).
		WithHelp(sarif.NewMultiformatMessageString().WithText(helpText).WithMarkdown(helpMD)).
		WithDefaultConfiguration(sarif.NewReportingConfiguration().WithLevel(Level(r.Severity)))
	props := sarif.NewPropertyBag()
	props.Add("always_on", r.AlwaysOn)
	props.AddTag("hydraulics")
	d.WithProperties(props)
	b.ruleIndex[r.ID] = len(b.run.Tool.Driver.Rules)
	b.run.Tool.Driver.AddRule(d)
}

func (b *builder) result(f rules.Finding) *sarif.Result {
	res := sarif.NewResult().
		WithRuleID(f.Rule).
		WithRuleIndex(b.ruleIndex[f.Rule]).
		WithLevel(Level(f.Severity)).
		WithMessage(sarif.NewTextMessage(b.message(&f)))
	uri := ""
	if f.File != "" {
		loc, u := b.location(f.File, f.Pos())
		uri = u
		res.AddLocation(loc)
	}
	fp := fingerprint(f, uri)
	b.seen[fp]++
	res.WithPartialFingerprints(map[string]string{FingerprintKey: fmt.Sprintf("%s:%d", fp, b.seen[fp])})

	props := sarif.NewPropertyBag()
	if f.Reach != "" {
		props.Add("reach", f.Reach)
	}
	if f.Event != "" {
		props.Add("event", f.Event)
	}
	if f.HasSpan {
		props.Add("from_station", finite(f.FromStation))
		props.Add("to_station", finite(f.ToStation))
	}
	if f.HasValue {
		props.Add("value", finite(f.Value))
		props.Add("limit", finite(f.Limit))
	}
	if f.Reference != "" {
		props.Add("reference", f.Reference)
	}
	props.Add("severity", string(f.Severity))
	res.WithProperties(props)

	if f.Excepted {
		s := sarif.NewSuppression().WithKind("inSource").WithStatus("accepted").
			WithJustification(f.ExceptionReason)
		if r := f.ExceptionRange; r.Start.Line > 0 {
			file := f.File
			if r.Filename != "" && baseline.CleanPath(r.Filename) != baseline.CleanPath(f.File) {
				file = r.Filename
			}
			loc, _ := b.location(file, r)
			s.WithLocation(loc)
		}
		res.AddSuppression(s)
	}
	return res
}

// location is the physical location of a range in a file, and the URI used.
func (b *builder) location(file string, r hcl.Range) (*sarif.Location, string) {
	art, uri, base := b.artifact(file)
	al := sarif.NewArtifactLocation().WithURI(uri).WithIndex(art)
	if base {
		al.WithURIBaseID(BaseID)
	}
	pl := sarif.NewPhysicalLocation().WithArtifactLocation(al)
	if reg := b.region(file, r); reg != nil {
		pl.WithRegion(reg)
	}
	return sarif.NewLocationWithPhysicalLocation(pl), uri
}

// artifact returns the index of the file's entry in run.artifacts, adding
// it on first use, with its URI and whether the URI is relative to SRCROOT.
func (b *builder) artifact(file string) (int, string, bool) {
	uri, base := b.uri(file)
	if i, ok := b.artifacts[uri]; ok {
		return i, uri, base
	}
	al := sarif.NewArtifactLocation().WithURI(uri)
	if base {
		al.WithURIBaseID(BaseID)
	}
	a := sarif.NewArtifact().WithLocation(al).AddRole("analysisTarget")
	if src, ok := b.in.Sources[file]; ok {
		a.WithLength(len(src))
		sum := sha256.Sum256(src)
		a.WithHashes(map[string]string{"sha-256": hex.EncodeToString(sum[:])})
	}
	i := len(b.run.Artifacts)
	b.run.AddArtifact(a)
	b.artifacts[uri] = i // each artifact once, however its file is spelt
	return i, uri, base
}

// uri is the artifact URI of a file: relative to Root with forward slashes
// when the file lies under it, else an absolute file: URI.
func (b *builder) uri(file string) (string, bool) {
	p := filepath.FromSlash(strings.ReplaceAll(file, `\`, "/"))
	if b.root == "" {
		if filepath.IsAbs(p) {
			return fileURI(p), false
		}
		return relURI(filepath.ToSlash(filepath.Clean(p))), true
	}
	abs, err := filepath.Abs(p)
	if err != nil {
		return relURI(filepath.ToSlash(filepath.Clean(p))), true
	}
	rel, err := filepath.Rel(b.root, abs)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return fileURI(abs), false
	}
	return relURI(filepath.ToSlash(rel)), true
}

// relURI percent-encodes a relative slash path as a URI reference.
func relURI(p string) string {
	u := (&url.URL{Path: p}).String()
	// A first segment with a colon would read as a scheme.
	if i := strings.IndexByte(u, ':'); i >= 0 && !strings.Contains(u[:i], "/") {
		u = "./" + u
	}
	return u
}

// fileURI is the file: URI of an absolute path.
func fileURI(abs string) string {
	p := filepath.ToSlash(abs)
	if !strings.HasPrefix(p, "/") {
		p = "/" + p // a Windows drive letter
	}
	return (&url.URL{Scheme: "file", Path: p}).String()
}

// region converts an HCL range (1-based lines, grapheme columns, byte
// offsets, end exclusive) to a SARIF region (1-based lines, UTF-16
// columns, end column exclusive). A zero range gives no region.
func (b *builder) region(file string, r hcl.Range) *sarif.Region {
	if r.Start.Line < 1 {
		return nil
	}
	idx := b.lineIndex(file)
	start := idx.pos(r.Start)
	reg := sarif.NewRegion().WithStartLine(start.line).WithStartColumn(start.col)
	end := start
	if r.End.Line > r.Start.Line || (r.End.Line == r.Start.Line && r.End.Byte >= r.Start.Byte && r.End.Column >= r.Start.Column) {
		end = idx.pos(r.End)
	}
	reg.WithEndLine(end.line).WithEndColumn(end.col)
	if start.exact && end.exact {
		reg.WithByteOffset(r.Start.Byte).WithByteLength(r.End.Byte - r.Start.Byte)
		reg.WithCharOffset(start.char).WithCharLength(end.char - start.char)
	}
	return reg
}

func (b *builder) lineIndex(file string) *lineIndex {
	if li, ok := b.lines[file]; ok {
		return li
	}
	li := newLineIndex(b.in.Sources[file])
	b.lines[file] = li
	return li
}

// lineIndex locates byte offsets in one source.
type lineIndex struct {
	src    []byte
	starts []int // byte offset of each line start
}

func newLineIndex(src []byte) *lineIndex {
	li := &lineIndex{src: src}
	if src == nil {
		return li
	}
	li.starts = append(li.starts, 0)
	for i, c := range src {
		if c == '\n' {
			li.starts = append(li.starts, i+1)
		}
	}
	return li
}

type sarifPos struct {
	line, col int
	char      int  // UTF-16 offset from the start of the file
	exact     bool // derived from the source bytes
}

// pos converts an HCL position. It trusts the byte offset when it lies on
// the line the position names; otherwise (no source, or a source that does
// not match) it keeps HCL's line and column.
func (li *lineIndex) pos(p hcl.Pos) sarifPos {
	fallback := sarifPos{line: p.Line, col: max(p.Column, 1)}
	if li.src == nil || p.Byte < 0 || p.Byte > len(li.src) || p.Line < 1 || p.Line > len(li.starts) {
		return fallback
	}
	ls := li.starts[p.Line-1]
	next := len(li.src) + 1
	if p.Line < len(li.starts) {
		next = li.starts[p.Line]
	}
	if p.Byte < ls || p.Byte >= next {
		return fallback
	}
	if !utf8.Valid(li.src[:p.Byte]) {
		return fallback
	}
	return sarifPos{
		line:  p.Line,
		col:   utf16Len(li.src[ls:p.Byte]) + 1,
		char:  utf16Len(li.src[:p.Byte]),
		exact: true,
	}
}

// utf16Len counts the UTF-16 code units of UTF-8 text.
func utf16Len(b []byte) int {
	n := 0
	for len(b) > 0 {
		r, size := utf8.DecodeRune(b)
		b = b[size:]
		if l := utf16.RuneLen(r); l > 0 {
			n += l
		} else {
			n++
		}
	}
	return n
}

// message is a result's text: the place (reach, event, stations), the
// message and the remedy, so that a code-scanning alert reads on its own.
func (b *builder) message(f *rules.Finding) string {
	unit := b.in.Units[f.File]
	if unit == "" {
		unit = "m"
	}
	if where := f.Where(unit); where != "" {
		return where + ": " + f.Text()
	}
	return f.Text()
}

// RuleName is the SARIF name of a rule: its id in upper camel case
// ("max_velocity" → "MaxVelocity"), as SARIF asks of reportingDescriptor.name.
func RuleName(id string) string {
	var b strings.Builder
	for _, part := range strings.FieldsFunc(id, func(r rune) bool { return r == '_' || r == '-' }) {
		b.WriteString(strings.ToUpper(part[:1]) + part[1:])
	}
	return b.String()
}

// HelpURI is where a rule is documented: its section of the README on the
// project's home page (the heading "`id`", with " (always on)" for the
// always-on rules, as the README spells them).
func HelpURI(r *rules.Rule) string {
	anchor := r.ID
	if r.AlwaysOn {
		anchor += "-always-on"
	}
	return InformationURI + "#" + anchor
}

// fingerprint hashes what identifies a finding regardless of where its
// block sits in the file and of small hydraulic changes: rule, artifact
// URI, reach, event and the number-free message. The station span is left
// out, since a 1 % change of inflow moves span ends; findings that share
// all of these are told apart by their occurrence count, in station order.
func fingerprint(f rules.Finding, uri string) string {
	key := strings.Join([]string{f.Rule, uri, f.Reach, f.Event, baseline.MessageFingerprint(f.Message)}, "\x00")
	sum := sha256.Sum256([]byte(key))
	return hex.EncodeToString(sum[:16])
}

// finite keeps JSON valid should a non-finite number ever reach the
// renderer: SARIF property values must be JSON numbers.
func finite(x float64) any {
	if x != x || x > 1.7976931348623157e308 || x < -1.7976931348623157e308 {
		return nil
	}
	return x
}

func firstParagraph(doc string) string {
	if i := strings.Index(doc, "\n\n"); i >= 0 {
		doc = doc[:i]
	}
	return strings.Join(strings.Fields(doc), " ")
}

func markdownEscape(s string) string {
	r := strings.NewReplacer(`\`, `\\`, `*`, `\*`, `_`, `\_`, "`", "\\`", `[`, `\[`, `]`, `\]`, `<`, `&lt;`)
	return r.Replace(s)
}
