package policies

import (
	"fmt"
	"path"
	"regexp"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// An approvals file is the reviewer's record of the design exceptions
// accepted for a submittal, in the policy language's HCL:
//
//	approval {
//	  rule         = "max_velocity"
//	  model        = "models/kestrel-ridge.chan.hcl"
//	  reach        = "chute"
//	  from_station = 0
//	  to_station   = 45
//	  event        = "q100"          # or class = "major"; neither: every event
//	  note         = "Slab designed for 7 m/s; memo 12"
//	  date         = "2026-11-30"
//	}
//
// Under a policy with exceptions = "approved", a model's exception block
// covers a finding only when an approval matches that finding. The file
// belongs to the reviewer, like the policy: a submittal cannot approve
// its own exceptions.

// Approval is one accepted design exception.
type Approval struct {
	Rule, Model, Reach     string
	FromStation, ToStation float64 // in the model's length unit
	Event, Class           string  // at most one; "" for every event
	Note, Date             string
	DefRange               hcl.Range
}

// Approved is the exceptions mode in which only approved claims count.
const Approved = "approved"

var (
	approvalsFileSchema = &hcl.BodySchema{Blocks: []hcl.BlockHeaderSchema{{Type: "approval"}}}
	approvalSchema      = &hcl.BodySchema{Attributes: []hcl.AttributeSchema{
		{Name: "rule", Required: true}, {Name: "model", Required: true}, {Name: "reach", Required: true},
		{Name: "from_station", Required: true}, {Name: "to_station", Required: true},
		{Name: "event"}, {Name: "class"}, {Name: "note", Required: true}, {Name: "date", Required: true},
	}}
	dateRe = regexp.MustCompile(`^\d{4}-\d{2}-\d{2}$`)
)

// MaxApprovals bounds the approval blocks of one file.
const MaxApprovals = 10000

// LoadApprovals reads an approvals file (a regular file of at most
// MaxFileSize bytes, literal values only).
func LoadApprovals(filename string) ([]Approval, hcl.Diagnostics) {
	src, err := safefile.Read(filename, MaxFileSize)
	if err != nil {
		return nil, hcl.Diagnostics{{Severity: hcl.DiagError, Summary: "Cannot read approvals file",
			Detail: fmt.Sprintf("%s: %s.", filename, plainError(err))}}
	}
	return ParseApprovals(filename, src)
}

// ParseApprovals decodes the text of an approvals file; the approvals are
// nil when the diagnostics hold an error.
func ParseApprovals(filename string, src []byte) ([]Approval, hcl.Diagnostics) {
	diags := model.CheckNesting(filename, src)
	if diags.HasErrors() {
		return nil, diags
	}
	file, pd := hclsyntax.ParseConfig(src, filename, hcl.InitialPos)
	if pd.HasErrors() {
		return nil, pd
	}
	content, cd := file.Body.Content(approvalsFileSchema)
	d := &decoder{Diagnostics: hclkit.Diagnostics{Diags: cd}}
	var out []Approval
	for i, b := range content.Blocks {
		if i == MaxApprovals {
			d.Errorf(b.DefRange, "Too many approvals", "An approvals file holds at most %d approval blocks.", MaxApprovals)
			break
		}
		if a, ok := d.approval(b); ok {
			out = append(out, a)
		}
	}
	if d.Diags.HasErrors() {
		return nil, d.Diags
	}
	return out, d.Diags
}

func (d *decoder) approval(b *hcl.Block) (Approval, bool) {
	a := Approval{DefRange: b.DefRange}
	content, diags := b.Body.Content(approvalSchema)
	d.Diags = append(d.Diags, diags...)
	if diags.HasErrors() {
		return a, false
	}
	before := len(d.Diags)
	text := func(name string, dst *string) {
		if at := content.Attributes[name]; at != nil {
			if s, ok := d.str(at); ok {
				if strings.TrimSpace(s) == "" {
					d.Errorf(at.Expr.Range(), "Empty "+name, "Write the %s; an approval names what it accepts.", name)
				}
				*dst = s
			}
		}
	}
	for name, dst := range map[string]*string{"rule": &a.Rule, "model": &a.Model, "reach": &a.Reach,
		"event": &a.Event, "class": &a.Class, "note": &a.Note, "date": &a.Date} {
		text(name, dst)
	}
	a.Model = path.Clean(strings.ReplaceAll(a.Model, `\`, "/"))
	for name, dst := range map[string]*float64{"from_station": &a.FromStation, "to_station": &a.ToStation} {
		if at := content.Attributes[name]; at != nil {
			if v, ok := d.number(at.Expr, name); ok {
				if v < 0 {
					d.Errorf(at.Expr.Range(), "Invalid station", "%s is %g; stations run from 0 at the upstream end of the reach.", name, v)
				}
				*dst = v
			}
		}
	}
	if at := content.Attributes["to_station"]; at != nil && a.ToStation < a.FromStation {
		d.Errorf(at.Expr.Range(), "Invalid station span", "to_station %g is before from_station %g.", a.ToStation, a.FromStation)
	}
	if at := content.Attributes["class"]; at != nil && content.Attributes["event"] != nil {
		d.Errorf(at.Expr.Range(), "Both event and class", "An approval names one event or one storm class, not both.")
	}
	if at := content.Attributes["class"]; at != nil && a.Class != "" && !model.IsClassWord(a.Class) {
		d.Errorf(at.Expr.Range(), "Invalid class word", "%q is not a class word (letters, digits, \"-\" or \"_\").", a.Class)
	}
	if at := content.Attributes["date"]; at != nil && a.Date != "" && !dateRe.MatchString(a.Date) {
		d.Errorf(at.Expr.Range(), "Invalid date", "date must be written YYYY-MM-DD, e.g. \"2026-11-30\"; got %q.", a.Date)
	}
	return a, !d.Diags[before:].HasErrors()
}

// ModelMatches reports whether the approval names a model file: the
// same path, or one path ending in the other at a "/" (an approval written
// relative to the repository matches a model checked from a subdirectory,
// and the reverse).
func (a *Approval) ModelMatches(file string) bool {
	f := path.Clean(strings.ReplaceAll(file, `\`, "/"))
	m := a.Model
	return f == m || strings.HasSuffix(f, "/"+m) || strings.HasSuffix(m, "/"+f)
}

// EventMatches reports whether the approval covers an event.
func (a *Approval) EventMatches(ev *model.Event) bool {
	switch {
	case a.Event != "":
		return ev != nil && ev.Name == a.Event
	case a.Class != "":
		return ev != nil && ev.Class == a.Class
	}
	return true
}

// Text describes the approval for messages: "approved 2026-11-30: note".
func (a *Approval) Text() string {
	return "approved " + a.Date + ": " + a.Note
}
