package model

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclparse"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// Suffix is the file name suffix of a channel model.
const Suffix = ".chan.hcl"

// Limits for untrusted input. A model beyond any of them is rejected with a
// diagnostic before anything is computed.
const (
	MaxFileSize  = 4 << 20 // bytes
	MaxSections  = 2000
	MaxReaches   = 10000
	MaxPoints    = 5000 // per points section
	MaxEvents    = 200
	MaxSegments  = 1000              // per reach
	MaxStructure = 10000             // gates, basins, bends and exceptions, each
	MaxNesting   = hclkit.MaxNesting // brackets, braces and parentheses
	// MaxDiagnostics is the number of problems reported for one file; the
	// rest are summed up in one last diagnostic.
	MaxDiagnostics = 1000
)

// Load reads a model file (at most MaxFileSize bytes) and decodes it with
// Parse.
func Load(filename string) (*Model, hcl.Diagnostics) {
	src, diags := ReadFile(filename)
	if diags.HasErrors() {
		return nil, diags
	}
	return Parse(filename, src)
}

// ReadFile reads a model file with the size limit of Load. Callers that
// render diagnostics with source snippets use it with Parse to keep the
// bytes of a file that fails to decode.
func ReadFile(filename string) ([]byte, hcl.Diagnostics) {
	start := hcl.Range{Filename: filepath.ToSlash(filename), Start: hcl.InitialPos, End: hcl.InitialPos}
	var d diagnoser
	src, err := safefile.Read(filename, MaxFileSize)
	if err != nil {
		summary, detail := "Cannot read model", err.Error()
		switch {
		case errors.Is(err, fs.ErrNotExist):
			detail = "The file does not exist; check the path."
		case errors.Is(err, fs.ErrPermission):
			detail = "Permission denied; check the file's permissions."
		case errors.Is(err, safefile.ErrTooLarge):
			summary = "Model file too large"
			detail = fmt.Sprintf("The file is larger than %d MiB; split the network into smaller models.", MaxFileSize>>20)
		case errors.Is(err, safefile.ErrNotRegular):
			// Refused before opening: a FIFO or a device is never read.
			detail = fmt.Sprintf("%s is %s; a model is a regular %s file.", filename, strings.TrimPrefix(err.Error(), safefile.ErrNotRegular.Error()+": "), Suffix)
		default:
			var pe *fs.PathError
			if errors.As(err, &pe) {
				detail = pe.Err.Error()
			}
		}
		d.Errorf(start, summary, "%s", detail)
		return nil, d.Diags
	}
	return src, nil
}

// Parse decodes and validates one model. The model is nil whenever the
// diagnostics hold an error; every problem of the file is reported in one
// call. Warnings may accompany a valid model.
func Parse(filename string, src []byte) (*Model, hcl.Diagnostics) {
	m, diags := parse(filepath.ToSlash(filename), src)
	hclkit.SortByPosition(diags)
	return m, hclkit.Bound(diags, DiagnosticLimits)
}

// Bounds of the text of one file's diagnostics, so that a 4 MiB file
// cannot print gigabytes: each summary and detail is shortened (names
// quoted in a message can be long), and past MaxDiagnosticBytes in all, or
// MaxDiagnostics in number, the rest are counted in one last diagnostic.
const (
	MaxSummaryBytes    = 200
	MaxDetailBytes     = 1000
	MaxDiagnosticBytes = 256 << 10
)

// DiagnosticLimits are the bounds above as hclkit.Bound takes them, for
// the diagnostics of one model or policy file.
var DiagnosticLimits = hclkit.Limits{Count: MaxDiagnostics, Summary: MaxSummaryBytes, Detail: MaxDetailBytes, Bytes: MaxDiagnosticBytes}

func parse(filename string, src []byte) (*Model, hcl.Diagnostics) {
	start := hcl.Range{Filename: filename, Start: hcl.InitialPos, End: hcl.InitialPos}
	var d diagnoser
	if len(src) > MaxFileSize {
		d.Errorf(start, "Model file too large", "The file is larger than %d MiB; split the network into smaller models.", MaxFileSize>>20)
		return nil, d.Diags
	}
	if diags := CheckNesting(filename, src); diags.HasErrors() {
		return nil, diags
	}
	file, diags := hclparse.NewParser().ParseHCL(src, filename)
	if diags.HasErrors() {
		return nil, diags
	}
	d.Diags = diags
	return decode(filename, src, file, &d)
}

// decode runs the passes after the parser over file, the syntax tree of
// src, adding to what d holds.
func decode(filename string, src []byte, file *hcl.File, d *diagnoser) (*Model, hcl.Diagnostics) {
	d.src = src
	m := &Model{File: filename, Source: src}
	dec := &decoder{diagnoser: d, m: m}
	// Decoding and reference checks run together so that one run reports
	// both kinds of problem; the graph needs a clean file.
	dec.root(file.Body)
	dec.resolve()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	dec.network()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	dec.culvertLevels()
	dec.events()
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	return m, d.Diags
}

// Bounds of the pre-scan (see CheckNesting), those of model/hclkit and
// the ones set from the model's limits. A model holds only literals, so
// no valid file comes near them.
const (
	MaxChain          = hclkit.MaxChain
	MaxInterpolations = hclkit.MaxInterpolations
	MaxAdjacent       = hclkit.MaxAdjacent
	MaxTokens         = hclkit.MaxTokens
	MaxStringPieces   = hclkit.MaxStringPieces
	MaxNumberBytes    = hclkit.MaxNumberBytes
	MaxTextBytes      = hclkit.MaxTextBytes
	// MaxItems bounds the elements of one list, object, block body or
	// argument list: more than any limit of the model allows (points,
	// inflow entries, segments). The top level is bounded by the block
	// limits instead.
	MaxItems = 2 * MaxReaches
	// MaxTopItems bounds the lines of the top level (blocks and
	// arguments): more than every block limit together allows.
	MaxTopItems = MaxSections + MaxReaches + MaxEvents + 6*MaxStructure + 64
	// MaxInvalid bounds the characters, escape sequences and unterminated
	// strings of one file that are not valid HCL. The parser reports
	// each of them; past MaxDiagnostics none would be shown anyway.
	MaxInvalid = MaxDiagnostics
)

// ScanBounds are the pre-scan's bounds that the model's limits set; a
// policy file is scanned with them too.
var ScanBounds = hclkit.ScanBounds{Items: MaxItems, TopItems: MaxTopItems, Invalid: MaxInvalid}

// CheckNesting is hclkit.CheckNesting with ScanBounds: the pre-scan that
// runs before the HCL parser on every untrusted file (models, policies,
// approvals). It returns an error diagnostic at the first construct
// beyond a bound, and nothing otherwise.
func CheckNesting(filename string, src []byte) hcl.Diagnostics {
	return hclkit.CheckNesting(filename, src, ScanBounds)
}

// Tokens is the number of tokens the pre-scan counts in src (see
// hclkit.Tokens): what parsing src costs in time and memory grows with it.
func Tokens(src []byte) int {
	return hclkit.Tokens(src, ScanBounds)
}

// decoder turns the HCL body into the model, then resolves references and
// builds the network.
type decoder struct {
	*diagnoser
	m *Model

	sections map[string]*Section
	reaches  map[string]*Reach

	names       map[string][]string // sorted defined names by kind, for suggestions
	suggestions int                 // suggestions searched so far
	cells       int                 // edit-distance work left for suggestions
}

var rootSchema = &hcl.BodySchema{
	Attributes: []hcl.AttributeSchema{
		{Name: "units", Required: true},
		{Name: "title"},
	},
	Blocks: []hcl.BlockHeaderSchema{
		{Type: "section", LabelNames: []string{"name"}},
		{Type: "reach", LabelNames: []string{"name"}},
		{Type: "gate", LabelNames: []string{"name"}},
		{Type: "culvert", LabelNames: []string{"name"}},
		{Type: "basin", LabelNames: []string{"name"}},
		{Type: "bend", LabelNames: []string{"name"}},
		{Type: "event", LabelNames: []string{"name"}},
		{Type: "exception", LabelNames: []string{"rule"}},
		{Type: "loss", LabelNames: []string{"name"}},
	},
}

// blockLimits caps the number of blocks of each type.
var blockLimits = map[string]int{
	"section": MaxSections, "reach": MaxReaches, "event": MaxEvents,
	"gate": MaxStructure, "culvert": MaxStructure, "basin": MaxStructure, "bend": MaxStructure, "exception": MaxStructure,
	"loss": MaxStructure,
}

func (d *decoder) root(body hcl.Body) {
	content, diags := bodyContent(body, rootSchema)
	d.Diags = append(d.Diags, diags...)
	m := d.m
	if a, ok := content.Attributes["units"]; ok {
		m.UnitsRange = a.Expr.Range()
		if s, ok := d.text(a.Expr, plain("units")); ok {
			switch Units(s) {
			case SI, US:
				m.Units = Units(s)
			default:
				d.Errorf(a.Expr.Range(), "Unknown units",
					"units must be \"si\" (metres, m³/s) or \"us\" (feet, ft³/s), not %q.", s)
			}
		}
	}
	if a, ok := content.Attributes["title"]; ok {
		m.Title, _ = d.text(a.Expr, plain("title"))
	}
	count := map[string]int{}
	for _, b := range content.Blocks {
		count[b.Type]++
		if limit := blockLimits[b.Type]; count[b.Type] > limit {
			if count[b.Type] == limit+1 {
				d.Errorf(b.DefRange, "Too many blocks",
					"A model may hold at most %d %s blocks; split the network into several models.", limit, b.Type)
			}
			continue
		}
		switch b.Type {
		case "section":
			m.Sections = append(m.Sections, d.section(b))
		case "reach":
			r := d.reach(b)
			r.Index = len(m.Reaches)
			m.Reaches = append(m.Reaches, r)
		case "gate":
			m.Gates = append(m.Gates, d.gate(b))
		case "culvert":
			m.Culverts = append(m.Culverts, d.culvert(b))
		case "basin":
			m.Basins = append(m.Basins, d.basin(b))
		case "bend":
			m.Bends = append(m.Bends, d.bend(b))
		case "event":
			m.Events = append(m.Events, d.event(b))
		case "exception":
			m.Exceptions = append(m.Exceptions, d.exception(b))
		case "loss":
			m.Losses = append(m.Losses, d.loss(b))
		}
	}
	if count["reach"] == 0 {
		d.Errorf(body.MissingItemRange(), "No reach", "A model needs at least one reach block; add one, e.g. reach \"main\" { from = \"a\" ... }.")
	}
	if count["event"] == 0 {
		d.Errorf(body.MissingItemRange(), "No event", "A model needs at least one event block with the inflows and the outlet control; add one.")
	}
}

// newSrc starts the Src of a block.
func newSrc(b *hcl.Block) Src {
	s := Src{DefRange: b.DefRange, LabelRange: b.DefRange}
	if len(b.LabelRanges) > 0 {
		s.LabelRange = b.LabelRanges[0]
	}
	return s
}

// nameLabels names the name of each labelled block in messages, built
// once rather than for every block.
var nameLabels = func() map[string]label {
	m := map[string]label{}
	for _, b := range rootSchema.Blocks {
		m[b.Type] = plain("The name of a " + b.Type)
	}
	return m
}()

// blockName returns the first label of b, checked.
func (d *decoder) blockName(b *hcl.Block) string {
	if len(b.Labels) == 0 {
		return ""
	}
	what, ok := nameLabels[b.Type]
	if !ok {
		what = plain("The name of a " + b.Type)
	}
	d.checkName(b.Labels[0], b.LabelRanges[0], what)
	return b.Labels[0]
}

// attrSet wraps the attributes of one block for typed access; src keeps
// them for the attributes' value ranges (Src.At).
type attrSet struct {
	d    *decoder
	m    hclsyntax.Attributes // the block's own when it fits its schema (see attrs)
	src  *Src
	what owner // e.g. reach "main"
}

// unitSuffix is " m" or " ft", the length unit as a message puts it
// after a number; a constant, so that decoding builds no string for it.
func (d *decoder) unitSuffix() string {
	if d.m.Units.Length() == "ft" {
		return " ft"
	}
	return " m"
}

// bodyContent is body.Content(schema). A syntax body that holds only
// attributes and blocks the schema names, with the labels it asks for (a
// valid model), is read straight from the syntax tree: the result is the
// same, without the bookkeeping Content does to find what is left over.
// Any other body goes through Content for its diagnostics.
func bodyContent(body hcl.Body, schema *hcl.BodySchema) (*hcl.BodyContent, hcl.Diagnostics) {
	sb, ok := body.(*hclsyntax.Body)
	if !ok || !fits(sb, schema) {
		return body.Content(schema)
	}
	// One allocation for the body's attributes, not one each.
	attrs := make(hcl.Attributes, len(sb.Attributes))
	vals := make([]hcl.Attribute, 0, len(sb.Attributes))
	for name, a := range sb.Attributes {
		vals = append(vals, hcl.Attribute{Name: a.Name, Expr: a.Expr, Range: a.SrcRange, NameRange: a.NameRange})
		attrs[name] = &vals[len(vals)-1]
	}
	return &hcl.BodyContent{Attributes: attrs, Blocks: syntaxBlocks(sb), MissingItemRange: sb.MissingItemRange()}, nil
}

// fits reports whether every attribute and block of sb is one the schema
// names, with as many labels as it asks for, and every attribute the
// schema requires is there (Content would report one that is missing).
func fits(sb *hclsyntax.Body, schema *hcl.BodySchema) bool {
	for _, as := range schema.Attributes {
		if as.Required && sb.Attributes[as.Name] == nil {
			return false
		}
	}
	for name := range sb.Attributes {
		if !slices.ContainsFunc(schema.Attributes, func(as hcl.AttributeSchema) bool { return as.Name == name }) {
			return false
		}
	}
	i := 0 // blocks of one type usually follow one another
	for _, b := range sb.Blocks {
		if i >= len(schema.Blocks) || schema.Blocks[i].Type != b.Type {
			if i = slices.IndexFunc(schema.Blocks, func(bs hcl.BlockHeaderSchema) bool { return bs.Type == b.Type }); i < 0 {
				return false
			}
		}
		if len(b.Labels) != len(schema.Blocks[i].LabelNames) {
			return false
		}
	}
	return true
}

// attrs decodes a block's body against its schema. A body that fits the
// schema (a valid model's) is read from the syntax tree without copying its
// attributes: the attribute set is the body's own map, and only the
// nested blocks are converted (see bodyContent). Any other body goes
// through Content for its diagnostics, and its attributes are taken back
// to their syntax nodes.
func (d *decoder) attrs(b *hcl.Block, schema *hcl.BodySchema, src *Src) (attrSet, *hcl.BodyContent) {
	var m hclsyntax.Attributes
	var content *hcl.BodyContent
	if sb, ok := b.Body.(*hclsyntax.Body); ok && fits(sb, schema) {
		m = sb.Attributes
		content = &hcl.BodyContent{Blocks: syntaxBlocks(sb), MissingItemRange: sb.MissingItemRange()}
	} else {
		var diags hcl.Diagnostics
		content, diags = b.Body.Content(schema)
		d.Diags = append(d.Diags, diags...)
		m = make(hclsyntax.Attributes, len(content.Attributes))
		for name, a := range content.Attributes {
			m[name] = syntaxAttr(a)
		}
	}
	src.syn = m
	what := owner{kind: b.Type}
	if len(b.Labels) > 0 {
		what = ownerOf(b.Type, b.Labels[0])
	}
	return attrSet{d: d, m: m, src: src, what: what}, content
}

// syntaxAttr is the syntax node of an attribute Content returned. A model
// is parsed as native HCL syntax only, so every expression is a syntax
// node; anything else is a programmer's error.
func syntaxAttr(a *hcl.Attribute) *hclsyntax.Attribute {
	expr, ok := a.Expr.(hclsyntax.Expression)
	if !ok {
		panic("model: attribute " + a.Name + " is not native HCL syntax")
	}
	return &hclsyntax.Attribute{Name: a.Name, Expr: expr, SrcRange: a.Range, NameRange: a.NameRange}
}

// syntaxBlocks converts the nested blocks of a syntax body (nil for none)
// as AsHCLBlock does, all in one allocation.
func syntaxBlocks(sb *hclsyntax.Body) hcl.Blocks {
	if len(sb.Blocks) == 0 {
		return nil
	}
	blocks := make(hcl.Blocks, len(sb.Blocks))
	vals := make([]hcl.Block, len(sb.Blocks))
	for i, b := range sb.Blocks {
		vals[i] = hcl.Block{Type: b.Type, Labels: b.Labels, Body: b.Body, DefRange: b.DefRange(), TypeRange: b.TypeRange, LabelRanges: b.LabelRanges}
		blocks[i] = &vals[i]
	}
	return blocks
}

func (a attrSet) has(name string) bool { _, ok := a.m[name]; return ok }

func (a attrSet) number(name string) (float64, bool) {
	at, ok := a.m[name]
	if !ok {
		return 0, false
	}
	return a.d.number(at.Expr, label{attr: name, owner: a.what})
}

func (a attrSet) text(name string) (string, bool) {
	at, ok := a.m[name]
	if !ok {
		return "", false
	}
	return a.d.text(at.Expr, label{attr: name, owner: a.what})
}

func (a attrSet) name(name string) (string, bool) {
	at, ok := a.m[name]
	if !ok {
		return "", false
	}
	return a.d.name(at.Expr, label{attr: name, owner: a.what})
}

// positive decodes a number that must be > 0.
func (a attrSet) positive(name, unit string) (float64, bool) {
	v, ok := a.number(name)
	if !ok {
		return 0, false
	}
	if v <= 0 {
		a.d.Errorf(a.m[name].Expr.Range(), "Value must be positive",
			"%s of %s is %g; it must be greater than 0%s.", name, a.what, v, unit)
		return 0, false
	}
	return v, true
}

// station decodes a station that must be ≥ 0 (the upper bound, the reach
// length, is checked when references are resolved).
func (a attrSet) station(name string) (float64, bool) {
	v, ok := a.number(name)
	if !ok {
		return 0, false
	}
	if v < 0 {
		a.d.Errorf(a.m[name].Expr.Range(), "Station outside the reach",
			"%s of %s is %g; stations run from 0 at the upstream end of the reach to its length.", name, a.what, v)
		return 0, false
	}
	return v, true
}

// missing reports required attributes that were not written.
func (a attrSet) require(body hcl.Body, names ...string) {
	for _, n := range names {
		if !a.has(n) {
			a.d.Errorf(body.MissingItemRange(), "Missing required argument",
				"%s needs %s; add it to the block.", a.what, n)
		}
	}
}
