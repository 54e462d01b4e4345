// Package checklist builds the reviewer's coverage matrix of a check: per
// model, one row for every reach × event × criterion of the policy, with
// its status (pass, fail, excepted, not evaluated and why, not
// applicable), the policy reference and section it comes from, and the
// SHA-256 of every input, and writes it as Markdown or CSV.
package checklist

import (
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"fmt"
	"io"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// Statuses of a row.
const (
	Pass             = "pass"
	Fail             = "fail"
	ExceptedApproved = "excepted (approved)"
	ExceptedClaimed  = "excepted (claimed)"
	NotEvaluated     = "not evaluated"
	NotApplicable    = "not applicable"
)

// Row is one reach × event × criterion.
type Row struct {
	Reach, Event, Criterion string
	Status                  string
	Detail                  string // why not evaluated or not applicable; the finding's message on a fail
	Reference               string // the policy's reference, version and the block's section
}

// Model is the matrix of one model file.
type Model struct {
	File    string
	SHA256  string // of the file's bytes; "" when it could not be read
	Invalid bool   // the file is not a valid model: no matrix
	Rows    []Row
}

// Input is one policy file of the extends chain (or a built-in pack) and
// the SHA-256 of its text.
type Input struct{ Name, SHA256 string }

// Doc is a whole checklist.
type Doc struct {
	Policy     string // name and version
	Reference  string
	Exceptions string
	Policies   []Input // the extends chain, child first
	Models     []Model
}

// Hash is the hex SHA-256 of b.
func Hash(b []byte) string {
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

// PolicyInputs hashes every file and pack of the policy's extends chain;
// a file that cannot be read again gets "" (the run read it once). display
// names a file as the outputs print it.
func PolicyInputs(p *policies.Policy, display func(string) string) []Input {
	var out []Input
	for _, name := range p.Chain {
		var src []byte
		if pack, ok := strings.CutPrefix(name, "pack:"); ok {
			src, _ = policies.PackSource(pack)
		} else {
			src, _ = safefile.Read(name, policies.MaxFileSize)
		}
		in := Input{Name: name}
		if !strings.HasPrefix(name, "pack:") {
			in.Name = display(name)
		}
		if src != nil {
			in.SHA256 = Hash(src)
		}
		out = append(out, in)
	}
	return out
}

// criteria are the rules a checklist has rows for: the policy's enabled
// design criteria (opt-in blocks such as sensitivity are not criteria)
// and the always-on capacity check, sorted by id.
func criteria(p *policies.Policy) []string {
	ids := []string{"capacity"}
	for id, rc := range p.Rules {
		if rc.Spec != nil && rc.Spec.OptIn {
			continue
		}
		ids = append(ids, id)
	}
	slices.Sort(ids)
	return slices.Compact(ids)
}

// Build is the matrix of one checked model; res may be nil when the model
// was not solved, and then every criterion that needs the flow is not
// evaluated.
func Build(m *model.Model, res *solver.Result, p *policies.Policy, fs []rules.Finding) []Row {
	if m == nil {
		return nil
	}
	pol := rules.PolicyFor(m, p)
	var rows []Row
	for _, r := range m.Reaches {
		for _, ev := range m.Events {
			for _, id := range criteria(pol) {
				rows = append(rows, row(m, res, pol, fs, r, ev, id))
			}
		}
	}
	return rows
}

// geometric rules judge the model's geometry, not a flow: their findings
// carry no event.
var geometric = map[string]bool{"side_slope": true, "bottom_width": true, "bed_slope": true}

func row(m *model.Model, res *solver.Result, p *policies.Policy, fs []rules.Finding, r *model.Reach, ev *model.Event, id string) Row {
	out := Row{Reach: r.Name, Event: ev.Name, Criterion: id}
	var block *policies.RuleConfig
	if id != "capacity" {
		block = p.Rules[id].Resolve(ev, r)
		if block == nil {
			out.Status, out.Detail = NotEvaluated, "event not selected: no block of the rule applies to this event on this reach"
			out.Reference = policies.Cite(p, p.Rules[id])
			return out
		}
		out.Reference = policies.Cite(p, block)
	} else {
		out.Reference = policies.Cite(p, nil)
	}
	if why := notApplicable(r, res, ev, id); why != "" {
		out.Status, out.Detail = NotApplicable, why
		return out
	}
	if why := notEvaluated(r, block, id); why != "" {
		out.Status, out.Detail = NotEvaluated, why
		return out
	}
	var failing, excepted []rules.Finding
	for _, f := range fs {
		if f.Rule != id || f.Reach != r.Name || (f.Event != ev.Name && !(geometric[id] && f.Event == "")) {
			continue
		}
		if f.Excepted {
			excepted = append(excepted, f)
		} else {
			failing = append(failing, f)
		}
	}
	switch {
	case len(failing) > 0:
		out.Status, out.Detail = Fail, failing[0].Text()
		if len(failing) > 1 {
			out.Detail += fmt.Sprintf(" (and %d more spans)", len(failing)-1)
		}
		if p.Exceptions == policies.Approved && claimed(m, &failing[0]) {
			out.Detail = "claimed, not approved: " + out.Detail
		}
	case len(excepted) > 0:
		out.Status, out.Detail = ExceptedClaimed, excepted[0].ExceptionReason
		if p.Exceptions == policies.Approved {
			out.Status = ExceptedApproved
		}
	case res == nil && !geometric[id]:
		out.Status, out.Detail = NotEvaluated, "the model was not solved"
	default:
		out.Status = Pass
	}
	return out
}

// claimed reports whether one of the model's exceptions claims the
// finding (same rule and reach, the finding's span inside the
// exception's, to a millimetre): under exceptions = "approved" such a
// failure is a claim the reviewer has not approved.
func claimed(m *model.Model, f *rules.Finding) bool {
	for _, ex := range m.Exceptions {
		if ex.Rule == f.Rule && ex.ReachName == f.Reach && f.HasSpan &&
			f.FromStation >= ex.FromStation-1e-3 && f.ToStation <= ex.ToStation+1e-3 {
			return true
		}
	}
	return false
}

// notApplicable says why a criterion does not concern a reach in an
// event: the structure or feature it judges is not there.
func notApplicable(r *model.Reach, res *solver.Result, ev *model.Event, id string) string {
	closed := r.Section != nil && r.Section.Closed()
	switch id {
	case "superelevation", "bend_radius":
		if len(r.Bends) == 0 {
			return "no bend on the reach"
		}
	case "headwater", "overtopping", "outlet_velocity":
		if r.Culvert == nil && !closed {
			return "no culvert on the reach"
		}
	case "jump_containment", "jump_type":
		if rr := reachResult(res, ev, r); rr != nil && len(rr.Jumps) == 0 {
			return "no hydraulic jump on the reach in this event"
		}
	case "freeboard", "side_slope":
		if closed {
			return "closed conduit"
		}
	case "bottom_width":
		if r.Section != nil && (closed || r.Section.Shape == model.Points) {
			return "no single bottom width (" + string(r.Section.Shape) + " section)"
		}
	}
	return ""
}

// notEvaluated says why a criterion that concerns the reach was not
// judged: the block sets no limit for the reach's linings.
func notEvaluated(r *model.Reach, block *policies.RuleConfig, id string) string {
	if block == nil {
		return ""
	}
	if r.Culvert == nil && (id == "headwater" || id == "overtopping" || id == "outlet_velocity") {
		return "structure not modelled: a closed conduit without a culvert block"
	}
	var table policies.ByLining
	switch id {
	case "max_velocity", "min_velocity", "shear_stress", "outlet_velocity":
		table = block.Table("limit")
	default:
		return ""
	}
	linings := []string{}
	for _, s := range sections(r) {
		if _, ok := table.For(s.Lining); ok && !(id == "min_velocity" && unnamedVegetated(table, s.Lining)) {
			return ""
		}
		linings = append(linings, fmt.Sprintf("%q", s.Lining))
	}
	return "no limit for the lining " + strings.Join(slices.Compact(linings), ", ")
}

// unnamedVegetated mirrors min_velocity: a default never applies to grass
// or natural linings.
func unnamedVegetated(t policies.ByLining, lining string) bool {
	_, named := t.Values[lining]
	return !named && (lining == "grass" || lining == "natural")
}

// sections are the reach's own section and its segments'.
func sections(r *model.Reach) []*model.Section {
	out := []*model.Section{}
	if r.Section != nil {
		out = append(out, r.Section)
	}
	for _, s := range r.Segments {
		if s.Section != nil {
			out = append(out, s.Section)
		}
	}
	return out
}

func reachResult(res *solver.Result, ev *model.Event, r *model.Reach) *solver.ReachResult {
	if res == nil {
		return nil
	}
	for _, er := range res.Events {
		if er == nil || er.Event != ev {
			continue
		}
		for _, rr := range er.Reaches {
			if rr != nil && rr.Reach == r {
				return rr
			}
		}
	}
	return nil
}

// WriteMarkdown writes the checklist as Markdown: a header with the
// policy and the hashes of every input, then one table per model. Every
// text from a model or a policy is neutralised for Markdown.
func WriteMarkdown(w io.Writer, d *Doc) error {
	md := safetext.Markdown
	var b strings.Builder
	b.WriteString("# Review checklist\n\n")
	fmt.Fprintf(&b, "- Policy: %s\n", md(d.Policy))
	if d.Reference != "" {
		fmt.Fprintf(&b, "- Reference: %s\n", md(d.Reference))
	}
	fmt.Fprintf(&b, "- Exceptions: %s\n", md(d.Exceptions))
	b.WriteString("- Policy files (child first), SHA-256:\n")
	for _, in := range d.Policies {
		fmt.Fprintf(&b, "  - %s `%s`\n", md(in.Name), hashText(in.SHA256))
	}
	for _, m := range d.Models {
		fmt.Fprintf(&b, "\n## %s\n\n- SHA-256: `%s`\n", md(m.File), hashText(m.SHA256))
		if m.Invalid {
			b.WriteString("- Not a valid model: nothing was evaluated (see the check's diagnostics).\n")
			continue
		}
		b.WriteString("\n| Reach | Event | Criterion | Status | Detail | Reference |\n|---|---|---|---|---|---|\n")
		for _, r := range m.Rows {
			fmt.Fprintf(&b, "| %s | %s | %s | %s | %s | %s |\n", md(r.Reach), md(r.Event), md(r.Criterion), r.Status, md(r.Detail), md(r.Reference))
		}
	}
	fmt.Fprintf(&b, "\n%s\n", md(rules.Caution))
	_, err := io.WriteString(w, b.String())
	return err
}

func hashText(h string) string {
	if h == "" {
		return "unreadable"
	}
	return h
}

// CSVHeader is the first record of the CSV checklist.
var CSVHeader = []string{"kind", "file", "sha256", "reach", "event", "criterion", "status", "detail", "reference"}

// WriteCSV writes the checklist as CSV: one "policy" record per file of
// the extends chain, one "model" record per model with its hash, then one
// "check" record per row. Every cell is neutralised against formula
// injection (a cell starting with =, +, -, @ is quoted as text).
func WriteCSV(w io.Writer, d *Doc) error {
	cw := csv.NewWriter(w)
	cell := func(s string) string { return safetext.CSVCell(safetext.Text(s)) }
	rec := func(fields ...string) {
		for i := range fields {
			fields[i] = cell(fields[i])
		}
		_ = cw.Write(fields)
	}
	rec(slices.Clone(CSVHeader)...)
	for _, in := range d.Policies {
		rec("policy", in.Name, in.SHA256, "", "", "", "", d.Policy, d.Reference)
	}
	for _, m := range d.Models {
		status := ""
		if m.Invalid {
			status = "invalid"
		}
		rec("model", m.File, m.SHA256, "", "", "", status, "", "")
		for _, r := range m.Rows {
			rec("check", m.File, "", r.Reach, r.Event, r.Criterion, r.Status, r.Detail, r.Reference)
		}
	}
	cw.Flush()
	return cw.Error()
}
