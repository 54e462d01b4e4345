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
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net/url"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"unicode/utf16"
	"unicode/utf8"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/model/numfmt"
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
	Sources map[string][]byte // file (as in Finding.File()) → bytes, for byte-offset columns
	// Units holds the length unit of each finding's model, parallel to
	// Findings, for the stations in result messages ("m" when missing or
	// ""): a finding in another file than its model (a stale approval)
	// still speaks of the model's stations.
	Units       []string
	ToolVersion string
	// BaselineStates, when not nil, holds the SARIF baselineState of each
	// finding ("new", "unchanged"), parallel to Findings.
	BaselineStates []string
	// Problems are what kept the run from checking everything: an invalid
	// policy, baseline or model. Each becomes an error-level tool
	// execution notification, and the invocation is marked unsuccessful,
	// so that a code-scanning upload shows the cause.
	Problems []Problem
	// PolicyNotes say where the policy came from and what it turns off
	// (a discovered file, criteria chosen by the checked tree, rules
	// off); each becomes a notification of the invocation, a warning when
	// Warn is set.
	PolicyNotes []Note
	// NotEvaluated says per model file what the check did not evaluate;
	// each becomes a note notification of the invocation at that file.
	NotEvaluated []FileNote
}

// FileNote is one statement about a model file (File as in Findings).
type FileNote struct {
	File string
	Text string
}

// Note is one policy notification.
type Note struct {
	Text string
	Warn bool
}

// Problem is one cause of an unsuccessful run: a message and, when known,
// the place it is about, in the one file of Range.Filename (named as in
// Sources); a Range without a Filename locates nothing, and a Range with
// a Filename and no line names the whole file.
type Problem struct {
	Message string
	Range   hcl.Range
}

// File is the file the problem is about, "" when it names none.
func (p *Problem) File() string { return p.Range.Filename }

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
//
// The log is streamed: everything but the results is encoded first, then
// the results follow in chunks, each chunk's results encoded on GOMAXPROCS
// goroutines by appendResult, so that a run of many findings neither holds
// the whole document nor encodes it on one core. The bytes are those of
// json.MarshalIndent over the report Build returns (a test holds them
// equal).
func Write(w io.Writer, in Input) error {
	b, err := newBuilder(in)
	if err != nil {
		return err
	}
	head, err := encodeFrame(b.report())
	if err != nil {
		return fmt.Errorf("sarif: %w", err)
	}
	// The run's results are the only "results" key at this depth: split
	// the document there.
	i := bytes.Index(head, []byte(resultsKey+"[]"))
	if i < 0 {
		return fmt.Errorf("sarif: %w", errNoResults)
	}
	bw := bufio.NewWriterSize(w, 64<<10)
	bw.Write(head[:i+len(resultsKey)+1])
	fps := b.fingerprints()
	const chunk = 512
	enc := make([][]byte, chunk)
	for start := 0; start < len(in.Findings); start += chunk {
		n := min(chunk, len(in.Findings)-start)
		parallel(n, func(j int) {
			k := start + j
			enc[j] = b.appendResult(enc[j][:0], &in.Findings[k], k, fps[k])
		})
		for j := range n {
			if start+j > 0 {
				bw.WriteByte(',')
			}
			bw.WriteString("\n" + resultIndent)
			bw.Write(enc[j])
		}
	}
	if len(in.Findings) > 0 {
		bw.WriteString("\n" + resultIndent[:len(resultIndent)-2])
	}
	bw.Write(head[i+len(resultsKey)+1:])
	bw.WriteByte('\n')
	return bw.Flush()
}

// encodeFrame encodes the log as it is (without results) the way Write
// writes it: indented, without the empty arrays the library writes for
// every optional member (readers expect a log without them).
func encodeFrame(rep *sarif.Report) ([]byte, error) {
	raw, err := json.Marshal(rep)
	if err != nil {
		return nil, err
	}
	compact, _, err := pruneEmptyArrays(raw)
	if err != nil {
		return nil, err
	}
	var out bytes.Buffer
	if err := json.Indent(&out, compact, "", "  "); err != nil {
		return nil, err
	}
	return out.Bytes(), nil
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

// resultsKey and resultIndent are the run's results key and the
// indentation of a result in the document json.MarshalIndent writes:
// report → runs → run → results → result.
const (
	resultsKey   = "\n      \"results\": "
	resultIndent = "        "
)

// errNoResults is a programmer's error: the run encoded without its
// results array.
var errNoResults = errors.New("encoded run has no results array")

// Build assembles the SARIF report without writing it, for callers that
// want to validate or merge it. Write streams the same report.
func Build(in Input) (*sarif.Report, error) {
	b, err := newBuilder(in)
	if err != nil {
		return nil, err
	}
	rep := b.report()
	fps := b.fingerprints()
	for i := range in.Findings {
		b.run.AddResult(b.result(&in.Findings[i], i, fps[i]))
	}
	return rep, nil
}

// newBuilder prepares everything the results refer to, in the order the
// results need it: the driver's rules, the artifacts in the order of first
// use, and a line index of each source. After it, the builder is only read,
// so results can be built concurrently.
func newBuilder(in Input) (*builder, error) {
	b := &builder{
		in:        in,
		ruleIndex: map[string]int{},
		artifacts: map[string]artifactRef{},
		byURI:     map[string]int{},
		lines:     map[string]*lineIndex{},
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
	for i := range in.Findings {
		f := &in.Findings[i]
		if _, ok := b.ruleIndex[f.Rule]; !ok {
			b.addRule(&rules.Rule{RuleSpec: policies.RuleSpec{ID: f.Rule, Severity: f.Severity}, Title: f.Rule})
		}
		if f.File() != "" {
			b.addArtifact(f.File())
		}
		if file, ok := b.exceptionFile(f); ok {
			b.addArtifact(file)
		}
		for _, r := range f.Related {
			if file, ok := relatedFile(f, r); ok {
				b.addArtifact(file)
			}
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

	ref := sarif.NewReportingDescriptorReference().WithID("caution")
	ref.Index = 0
	inv := sarif.NewInvocation().WithExecutionSuccessful(len(in.Problems) == 0)
	for _, p := range in.Problems {
		pref := sarif.NewReportingDescriptorReference().WithID("input")
		pref.Index = 1
		n := sarif.NewNotification().WithLevel(sarif.LevelError).WithDescriptor(pref).
			WithMessage(sarif.NewTextMessage(p.Message))
		if file := p.File(); file != "" {
			b.addArtifact(file)
			n.WithLocations([]*sarif.Location{b.location(file, p.Range)})
		}
		inv.AddToolExecutionNotification(n)
	}
	if len(in.PolicyNotes) > 0 {
		driver.AddNotification(sarif.NewReportingDescriptor().
			WithID("policy").
			WithShortDescription(sarif.NewMultiformatMessageString().WithText("Where the policy came from")).
			WithDefaultConfiguration(sarif.NewReportingConfiguration().WithLevel(sarif.LevelNote)))
	}
	for _, pn := range in.PolicyNotes {
		nref := sarif.NewReportingDescriptorReference().WithID("policy")
		nref.Index = 2
		level := sarif.LevelNote
		if pn.Warn {
			level = sarif.LevelWarning
		}
		inv.AddToolExecutionNotification(sarif.NewNotification().WithLevel(level).
			WithDescriptor(nref).WithMessage(sarif.NewTextMessage(pn.Text)))
	}
	if len(in.NotEvaluated) > 0 {
		driver.AddNotification(sarif.NewReportingDescriptor().
			WithID("not-evaluated").
			WithShortDescription(sarif.NewMultiformatMessageString().WithText("What the check did not evaluate")).
			WithDefaultConfiguration(sarif.NewReportingConfiguration().WithLevel(sarif.LevelNote)))
		index := len(driver.Notifications) - 1
		for _, ne := range in.NotEvaluated {
			nref := sarif.NewReportingDescriptorReference().WithID("not-evaluated")
			nref.Index = index
			n := sarif.NewNotification().WithLevel(sarif.LevelNote).WithDescriptor(nref).
				WithMessage(sarif.NewTextMessage("not evaluated: " + ne.Text))
			if ne.File != "" {
				b.addArtifact(ne.File)
				n.WithLocations([]*sarif.Location{b.location(ne.File, hcl.Range{})})
			}
			inv.AddToolExecutionNotification(n)
		}
	}
	inv.AddToolExecutionNotification(sarif.NewNotification().
		WithLevel(sarif.LevelNote).
		WithDescriptor(ref).
		WithMessage(sarif.NewTextMessage(rules.Caution)))
	run.AddInvocation(inv)
	return b, nil
}

// report is the log with the run as prepared (no results yet).
func (b *builder) report() *sarif.Report {
	rep := sarif.NewReport()
	rep.AddRun(b.run)
	return rep
}

// fingerprints computes the partial fingerprint of every finding: the
// hashes on GOMAXPROCS goroutines, then the occurrence numbers that tell
// identical findings apart, in order.
func (b *builder) fingerprints() []string {
	fs := b.in.Findings
	fps := make([]string, len(fs))
	parallel(len(fs), func(i int) {
		uri := ""
		if fs[i].File() != "" {
			uri = b.artifacts[fs[i].File()].uri
		}
		fps[i] = fingerprint(&fs[i], uri)
	})
	seen := make(map[string]int, len(fs))
	for i, fp := range fps {
		seen[fp]++
		fps[i] = fp + ":" + strconv.Itoa(seen[fp])
	}
	return fps
}

// parallel calls fn(i) for every i in [0, n) on at most GOMAXPROCS
// goroutines.
func parallel(n int, fn func(i int)) {
	workers := min(runtime.GOMAXPROCS(0), n)
	if workers <= 1 {
		for i := range n {
			fn(i)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for i := int(next.Add(1)) - 1; i < n; i = int(next.Add(1)) - 1 {
				fn(i)
			}
		})
	}
	wg.Wait()
}

type builder struct {
	in        Input
	root      string // absolute, or "" for none
	run       *sarif.Run
	ruleIndex map[string]int
	artifacts map[string]artifactRef // file as given → its artifact
	byURI     map[string]int         // artifact URI → index: each artifact once, however its file is spelt
	lines     map[string]*lineIndex
}

// artifactRef is a file's entry in run.artifacts.
type artifactRef struct {
	index int
	uri   string
	base  bool // the URI is relative to SRCROOT
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

// result is the SARIF result of a finding with its partial fingerprint.
// It only reads the builder.
func (b *builder) result(f *rules.Finding, i int, fp string) *sarif.Result {
	res := sarif.NewResult().
		WithRuleID(f.Rule).
		WithRuleIndex(b.ruleIndex[f.Rule]).
		WithLevel(Level(f.Severity)).
		WithMessage(sarif.NewTextMessage(b.message(f, i)))
	if f.File() != "" {
		res.AddLocation(b.location(f.File(), f.Pos()))
	}
	res.WithPartialFingerprints(map[string]string{FingerprintKey: fp})
	if st := b.baselineState(i); st != "" {
		res.WithBaselineState(st)
	}

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
	if e := f.Envelope; e != nil {
		env := map[string]any{"verdict": e.Verdict, "cases": e.Cases, "failing": e.Failing}
		if e.Driver != "" {
			env["driver"] = e.Driver
		}
		if e.Case != "" {
			env["case"] = e.Case
		}
		props.Add("envelope", env)
	}
	res.WithProperties(props)

	for i, r := range f.Related {
		if file, ok := relatedFile(f, r); ok {
			loc := b.location(file, r.Range).WithMessage(sarif.NewTextMessage(r.Label))
			loc.ID = i
			res.AddRelatedLocation(loc)
		}
	}

	if f.Excepted {
		s := sarif.NewSuppression().WithKind("inSource").WithStatus("accepted").
			WithJustification(f.ExceptionReason)
		if file, ok := b.exceptionFile(f); ok {
			s.WithLocation(b.location(file, f.ExceptionRange))
		}
		res.AddSuppression(s)
	}
	return res
}

// baselineState is the SARIF baselineState of the i-th finding ("" for
// none).
func (b *builder) baselineState(i int) string {
	if i < len(b.in.BaselineStates) {
		return b.in.BaselineStates[i]
	}
	return ""
}

// exceptionFile is the file of the design exception that covers f, when
// the exception has a position.
func (b *builder) exceptionFile(f *rules.Finding) (string, bool) {
	r := f.ExceptionRange
	if !f.Excepted || r.Start.Line < 1 {
		return "", false
	}
	if r.Filename == "" {
		return f.File(), f.File() != ""
	}
	return r.Filename, true
}

// relatedFile is the file of a related place of f when it can be a SARIF
// location: a range in a file, not in a built-in pack (which has no
// artifact). A range without a file name is in f's file.
func relatedFile(f *rules.Finding, r rules.Related) (string, bool) {
	if r.Range.Start.Line < 1 || strings.HasPrefix(r.Range.Filename, "pack:") {
		return "", false
	}
	if r.Range.Filename == "" {
		return f.File(), f.File() != ""
	}
	return r.Range.Filename, true
}

// location is the physical location of a range in a file (an artifact
// added by newBuilder).
func (b *builder) location(file string, r hcl.Range) *sarif.Location {
	art := b.artifacts[file]
	al := sarif.NewArtifactLocation().WithURI(art.uri).WithIndex(art.index)
	if art.base {
		al.WithURIBaseID(BaseID)
	}
	pl := sarif.NewPhysicalLocation().WithArtifactLocation(al)
	if reg := b.region(file, r); reg != nil {
		pl.WithRegion(reg)
	}
	return sarif.NewLocationWithPhysicalLocation(pl)
}

// addArtifact adds a file's entry to run.artifacts on its first use, and
// the line index of its source.
func (b *builder) addArtifact(file string) {
	if _, ok := b.artifacts[file]; ok {
		return
	}
	uri, base := b.uri(file)
	b.lines[file] = newLineIndex(b.in.Sources[file])
	if i, ok := b.byURI[uri]; ok {
		b.artifacts[file] = artifactRef{index: i, uri: uri, base: base}
		return
	}
	al := sarif.NewArtifactLocation().WithURI(uri)
	if base {
		al.WithURIBaseID(BaseID)
	}
	a := sarif.NewArtifact().WithLocation(al).AddRole("analysisTarget")
	src, ok := b.in.Sources[file]
	if ok {
		a.WithLength(len(src))
		sum := sha256.Sum256(src)
		a.WithHashes(map[string]string{"sha-256": hex.EncodeToString(sum[:])})
	}
	b.artifacts[file] = artifactRef{index: len(b.run.Artifacts), uri: uri, base: base}
	b.byURI[uri] = len(b.run.Artifacts)
	b.run.AddArtifact(a)
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
	start, end, ok := b.span(file, r)
	if !ok {
		return nil
	}
	reg := sarif.NewRegion().WithStartLine(start.line).WithStartColumn(start.col)
	reg.WithEndLine(end.line).WithEndColumn(end.col)
	if start.exact && end.exact {
		reg.WithByteOffset(r.Start.Byte).WithByteLength(r.End.Byte - r.Start.Byte)
		reg.WithCharOffset(start.char).WithCharLength(end.char - start.char)
	}
	return reg
}

// span is the start and end of a range in SARIF terms; ok is false for a
// zero range (no region).
func (b *builder) span(file string, r hcl.Range) (start, end sarifPos, ok bool) {
	if r.Start.Line < 1 {
		return start, end, false
	}
	idx := b.lines[file]
	if idx == nil {
		idx = &lineIndex{}
	}
	start = idx.pos(r.Start)
	end = start
	if r.End.Line > r.Start.Line || (r.End.Line == r.Start.Line && r.End.Byte >= r.Start.Byte && r.End.Column >= r.Start.Column) {
		end = idx.pos(r.End)
	}
	return start, end, true
}

// lineIndex locates byte offsets in one source: for each line its start,
// and the UTF-16 length of the text before it and whether that text is
// valid UTF-8, so that a position costs only the bytes of its own line.
type lineIndex struct {
	src    []byte
	starts []int  // byte offset of each line start
	u16    []int  // UTF-16 code units before each line start
	valid  []bool // the text before each line start is valid UTF-8
}

// newLineIndex indexes src in one pass. A line break is ASCII and never
// inside a multi-byte sequence, so the text before a line start is valid
// exactly when every earlier line is.
func newLineIndex(src []byte) *lineIndex {
	li := &lineIndex{src: src}
	if src == nil {
		return li
	}
	n := bytes.Count(src, []byte{'\n'}) + 1
	li.starts, li.u16, li.valid = make([]int, 1, n), make([]int, 1, n), make([]bool, 1, n)
	li.valid[0] = true
	u16, valid, from := 0, true, 0
	for {
		i := bytes.IndexByte(src[from:], '\n')
		if i < 0 {
			break
		}
		line := src[from : from+i+1]
		if valid {
			valid = utf8.Valid(line)
			u16 += utf16Len(line)
		}
		from += i + 1
		li.starts, li.u16, li.valid = append(li.starts, from), append(li.u16, u16), append(li.valid, valid)
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
// not match) it keeps HCL's line and column, as it does when the text
// before the position is not valid UTF-8.
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
	seg := li.src[ls:p.Byte]
	if !li.valid[p.Line-1] || !utf8.Valid(seg) {
		return fallback
	}
	col := utf16Len(seg)
	return sarifPos{
		line:  p.Line,
		col:   col + 1,
		char:  li.u16[p.Line-1] + col,
		exact: true,
	}
}

// utf16Len counts the UTF-16 code units of UTF-8 text.
func utf16Len(b []byte) int {
	n := 0
	for len(b) > 0 {
		if b[0] < utf8.RuneSelf {
			n++
			b = b[1:]
			continue
		}
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
func (b *builder) message(f *rules.Finding, i int) string {
	unit := ""
	if i < len(b.in.Units) {
		unit = b.in.Units[i]
	}
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
func fingerprint(f *rules.Finding, uri string) string {
	key := f.Rule + "\x00" + uri + "\x00" + f.Reach + "\x00" + f.Event + "\x00" + baseline.MessageFingerprint(f.Message)
	sum := sha256.Sum256([]byte(key))
	return hex.EncodeToString(sum[:16])
}

// finite keeps JSON valid should a non-finite number ever reach the
// renderer: SARIF property values must be JSON numbers.
func finite(x float64) any {
	if !numfmt.Finite(x) {
		return nil
	}
	if x == 0 {
		return 0.0 // also -0: no output prints "-0"
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
