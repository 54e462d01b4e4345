package pipeline

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/model/suggest"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// Sensitivity is the size of a sensitivity run: each parameter that is
// not zero is lowered and raised by it, alone and in every corner with
// the others (see Cases).
type Sensitivity struct {
	Roughness float64 // share of Manning's n: 0.2 varies n by ±20 %
	Discharge float64 // share of every discharge: 0.1 varies Q by ±10 %
	Tailwater float64 // offset of the outlet level, in Units' length unit
	// Units is the unit system of Tailwater; "" for the model's own.
	Units model.Units
	// Severity of the findings that only a perturbed case shows; "" for
	// the sensitivity rule's default (warning).
	Severity policies.Severity
}

// Active reports whether s varies anything.
func (s Sensitivity) Active() bool {
	return s.Roughness > 0 || s.Discharge > 0 || s.Tailwater > 0
}

// String names the sizes: "roughness ±20 %, tailwater ±0.3 m, discharge
// ±10 %" (Units must be set).
func (s Sensitivity) String() string {
	var parts []string
	if s.Roughness > 0 {
		parts = append(parts, "roughness ±"+num(100*s.Roughness)+" %")
	}
	if s.Tailwater > 0 {
		parts = append(parts, "tailwater ±"+num(s.Tailwater)+" "+s.Units.Length())
	}
	if s.Discharge > 0 {
		parts = append(parts, "discharge ±"+num(100*s.Discharge)+" %")
	}
	return strings.Join(parts, ", ")
}

// In is s with Tailwater in the length unit of u.
func (s Sensitivity) In(u model.Units) Sensitivity {
	if s.Units != "" && s.Units != u {
		if u == model.US {
			s.Tailwater /= policies.MetresPerFoot
		} else {
			s.Tailwater *= policies.MetresPerFoot
		}
	}
	s.Units = u
	return s
}

// PolicySensitivity is the sensitivity block of pol, if it has one, in
// the policy's units.
func PolicySensitivity(pol *policies.Policy) (Sensitivity, bool) {
	if pol == nil {
		return Sensitivity{}, false
	}
	rc := pol.Rules[rules.SensitivityID]
	if rc == nil {
		return Sensitivity{}, false
	}
	s := Sensitivity{
		Roughness: rc.Number("roughness"),
		Discharge: rc.Number("discharge"),
		Tailwater: rc.Number("tailwater"),
		Units:     pol.Units,
		Severity:  rc.Severity,
	}
	return s, s.Active()
}

// ParseSensitivity reads the command line's form of a sensitivity run:
// "roughness=0.2,tailwater=0.3,discharge=0.1", each part optional, shares
// as fractions or percentages ("20%"), the tailwater in the model's
// length unit or with "m" or "ft" after the number.
func ParseSensitivity(spec string) (Sensitivity, error) {
	var s Sensitivity
	seen := map[string]bool{}
	for part := range strings.SplitSeq(spec, ",") {
		part = strings.TrimSpace(part)
		if part == "" {
			continue
		}
		name, val, ok := strings.Cut(part, "=")
		name, val = strings.TrimSpace(name), strings.TrimSpace(val)
		if !ok || val == "" {
			return s, fmt.Errorf("%q is not NAME=VALUE (for example roughness=0.2)", part)
		}
		if seen[name] {
			return s, fmt.Errorf("%s is given twice", name)
		}
		seen[name] = true
		switch name {
		case "roughness", "discharge":
			v, err := share(val)
			if err != nil {
				return s, fmt.Errorf("%s: %v", name, err)
			}
			if name == "roughness" {
				s.Roughness = v
			} else {
				s.Discharge = v
			}
		case "tailwater":
			num, unit := val, model.Units("")
			switch {
			case strings.HasSuffix(val, "ft"):
				num, unit = strings.TrimSuffix(val, "ft"), model.US
			case strings.HasSuffix(val, "m"):
				num, unit = strings.TrimSuffix(val, "m"), model.SI
			}
			v, err := strconv.ParseFloat(strings.TrimSpace(num), 64)
			if err != nil || math.IsNaN(v) || v < 0 || v > 100 {
				return s, fmt.Errorf("tailwater: %q is not an offset from 0 to 100 (a length, with m or ft after it, or in the model's unit)", val)
			}
			s.Tailwater, s.Units = v, unit
		default:
			hint := ""
			if d := suggest.Closest(name, []string{"roughness", "tailwater", "discharge"}, len(name)/3+1, nil); d != "" {
				hint = fmt.Sprintf("; did you mean %q?", d)
			}
			return s, fmt.Errorf("unknown parameter %q (roughness, tailwater or discharge)%s", name, hint)
		}
	}
	if !s.Active() {
		return s, fmt.Errorf("%q varies nothing: give roughness, tailwater or discharge above 0", spec)
	}
	return s, nil
}

// share parses "0.2" or "20%" as a share from 0 to 0.9.
func share(val string) (float64, error) {
	pct := strings.HasSuffix(val, "%")
	v, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(val, "%")), 64)
	if err == nil && pct {
		v /= 100
	}
	if err != nil || math.IsNaN(v) || v < 0 || v > 0.9 {
		return 0, fmt.Errorf("%q is not a share from 0 to 0.9 (0.2 or 20%%)", val)
	}
	return v, nil
}

// Case is one perturbed solve of a sensitivity run.
type Case struct {
	// Name says what is varied: "roughness +20 %", or for a corner every
	// parameter, "roughness −20 %, tailwater +0.3 m".
	Name string
	Vary solver.Vary
	// Alone is the parameter varied alone; "" for a corner.
	Alone string
}

// Cases lists the cases of s, in a fixed order: each parameter given
// lowered then raised alone (roughness, tailwater, discharge), then, when
// two or more are given, every corner with each of them lowered or raised.
// unit is the length unit that Tailwater is in.
func Cases(s Sensitivity, unit string) []Case {
	type param struct {
		name string
		size float64
		set  func(v *solver.Vary, sign float64)
		text func(sign float64) string
	}
	pct := func(name string, f float64) func(float64) string {
		return func(sign float64) string { return name + " " + signed(sign, num(100*f)) + " %" }
	}
	all := []param{
		{"roughness", s.Roughness, func(v *solver.Vary, sign float64) { v.Roughness = 1 + sign*s.Roughness }, pct("roughness", s.Roughness)},
		{"tailwater", s.Tailwater, func(v *solver.Vary, sign float64) { v.Tailwater = sign * s.Tailwater },
			func(sign float64) string { return "tailwater " + signed(sign, num(s.Tailwater)) + " " + unit }},
		{"discharge", s.Discharge, func(v *solver.Vary, sign float64) { v.Discharge = 1 + sign*s.Discharge }, pct("discharge", s.Discharge)},
	}
	var ps []param
	for _, p := range all {
		if p.size > 0 && !math.IsInf(p.size, 0) {
			ps = append(ps, p)
		}
	}
	var cases []Case
	for _, p := range ps {
		for _, sign := range []float64{-1, 1} {
			c := Case{Name: p.text(sign), Alone: p.name}
			p.set(&c.Vary, sign)
			cases = append(cases, c)
		}
	}
	if len(ps) < 2 {
		return cases
	}
	for corner := range 1 << len(ps) {
		var c Case
		var names []string
		for i, p := range ps {
			sign := -1.0
			if corner&(1<<(len(ps)-1-i)) != 0 {
				sign = 1
			}
			p.set(&c.Vary, sign)
			names = append(names, p.text(sign))
		}
		c.Name = strings.Join(names, ", ")
		cases = append(cases, c)
	}
	return cases
}

// signed is "+x" or "−x" (a true minus sign) by the sign.
func signed(sign float64, x string) string {
	if sign < 0 {
		return "−" + x
	}
	return "+" + x
}

// num formats a size for a case name: at most three decimals, no
// trailing zeros.
func num(x float64) string { return numfmt.Decimals(x, 3) }

// sensitivityFor is the sensitivity run that applies to a model in units
// u: the command line's when given, else the policy's block, else none.
func sensitivityFor(pol *policies.Policy, cli *Sensitivity, u model.Units) (Sensitivity, bool) {
	s, ok := PolicySensitivity(pol)
	if cli != nil {
		sev := s.Severity
		s, ok = *cli, cli.Active()
		if s.Severity == "" {
			s.Severity = sev
		}
	}
	if !ok {
		return Sensitivity{}, false
	}
	if s.Severity == "" {
		s.Severity = rules.Lookup(rules.SensitivityID).Severity
	}
	return s.In(u), true
}

// Band is the range of the water surface over the cases of a sensitivity
// run (the nominal one included) at the nominal solution's computed
// points of one reach in one event.
type Band struct {
	Event, Reach string
	Station      []float64
	Low, High    []float64 // lowest and highest water-surface elevation
}

// CheckVaried is Check, followed by a sensitivity run when one applies
// (opts.Vary, else the policy's sensitivity block): the model is solved
// and checked again in every case of the run, the cases spread over up to
// jobs workers, and each finding of the nominal result carries its
// verdict over them (rules.Envelope). The output does not depend on jobs.
func (p *Parsed) CheckVaried(pol *policies.Policy, opts Options, jobs int) *Result {
	if p.Invalid || p.Model == nil {
		return p.Check(pol, opts)
	}
	s, ok := sensitivityFor(pol, opts.Vary, p.Model.Units)
	if !ok {
		return p.Check(pol, opts)
	}
	cases := Cases(s, p.Model.Units.Length())
	runs := make([]*Result, len(cases)+1)
	caseOpts := opts
	caseOpts.Keep = Keep{Solved: opts.Keep.Solved} // the bands need the solutions
	Parallel(len(runs), jobs, func(i int) {
		if i == 0 {
			runs[0] = p.Check(pol, opts)
			return
		}
		o := caseOpts
		o.Solver.Vary = cases[i-1].Vary
		runs[i] = p.Check(pol, o)
	})
	r := combine(runs[0], cases, runs[1:], s.Severity, opts.Keep.Solved)
	r.Sensitivity, r.Cases = s, cases
	return r
}

// combine gives each finding of nominal its verdict over the cases, adds
// the findings that only some case shows, and (when bands is true) the
// water-surface bands.
func combine(nominal *Result, cases []Case, runs []*Result, sev policies.Severity, bands bool) *Result {
	if nominal.Invalid {
		return nominal
	}
	groups := map[groupKey]int{}
	for i := range nominal.Findings {
		if f := &nominal.Findings[i]; flowDependent(f) {
			groups[keyOf(f)]++
		}
	}
	caseGroups := make([]map[groupKey]int, len(runs))
	for c, run := range runs {
		caseGroups[c] = map[groupKey]int{}
		for i := range run.Findings {
			if f := &run.Findings[i]; flowDependent(f) {
				caseGroups[c][keyOf(f)]++
			}
		}
	}
	matches := func(nom *rules.Finding, c int, g *rules.Finding) bool {
		k := keyOf(nom)
		if keyOf(g) != k {
			return false
		}
		return overlap(nom, g) || (groups[k] == 1 && caseGroups[c][k] == 1)
	}
	var failedCase []bool
	for i := range nominal.Findings {
		f := &nominal.Findings[i]
		if !flowDependent(f) {
			continue
		}
		failedCase = failedCase[:0]
		for c, run := range runs {
			failed := run.Invalid // an unsolved case counts as failing (see below)
			for j := range run.Findings {
				if !failed && matches(f, c, &run.Findings[j]) {
					failed = true
				}
			}
			failedCase = append(failedCase, failed)
		}
		f.Envelope = verdict(cases, failedCase, false)
	}
	// Findings that only perturbed cases show, merged across cases: the
	// message is the first failing case's, the span covers every case's.
	type extra struct {
		f      rules.Finding
		failed []bool
	}
	var extras []*extra
	for c, run := range runs {
		if run.Invalid {
			continue
		}
	next:
		for j := range run.Findings {
			g := &run.Findings[j]
			if !flowDependent(g) {
				continue
			}
			for i := range nominal.Findings {
				if f := &nominal.Findings[i]; flowDependent(f) && matches(f, c, g) {
					continue next
				}
			}
			for _, e := range extras {
				if keyOf(&e.f) == keyOf(g) {
					// One sensitivity finding per rule, block, reach and
					// event: the first case's, over every case's span.
					e.failed[c] = true
					if g.HasSpan && e.f.HasSpan {
						e.f.FromStation = math.Min(e.f.FromStation, g.FromStation)
						e.f.ToStation = math.Max(e.f.ToStation, g.ToStation)
					}
					continue next
				}
			}
			e := &extra{f: *g, failed: make([]bool, len(runs))}
			e.failed[c] = true
			extras = append(extras, e)
		}
	}
	for _, e := range extras {
		f := e.f
		f.Envelope = verdict(cases, e.failed, true)
		f.Message = "under " + f.Envelope.Case + ": " + f.Message
		if !f.Excepted {
			f.Severity = sev
		}
		nominal.Findings = append(nominal.Findings, f)
	}
	// A case the solver could not finish (a size limit) is counted as
	// failing every nominal finding, the cautious reading, and said so.
	for c, run := range runs {
		if !run.Invalid {
			continue
		}
		for i := range run.Findings {
			if f := &run.Findings[i]; f.Rule == "solver" && f.Event == "" {
				nominal.Findings = append(nominal.Findings, rules.Finding{
					Rule: "solver", Severity: policies.Info, Range: rules.InFile(nominal.File.Name, f.Range),
					Message: "sensitivity case " + cases[c].Name + " could not be solved, so the verdicts count it as failing: " + f.Message,
				})
			}
		}
	}
	slices.SortStableFunc(nominal.Findings, func(a, b rules.Finding) int { return rules.Compare(&a, &b) })
	if bands {
		nominal.Bands = surfaceBands(nominal.Solution, runs)
	}
	return nominal
}

// Tally counts the verdicts of findings over a sensitivity run.
type Tally struct{ RobustFail, KnifeEdge, Sensitivity int }

// Add counts the verdict of f, if it has one.
func (t *Tally) Add(f *rules.Finding) {
	if f.Envelope == nil {
		return
	}
	switch f.Envelope.Verdict {
	case rules.RobustFail:
		t.RobustFail++
	case rules.KnifeEdge:
		t.KnifeEdge++
	case rules.Sensitivity:
		t.Sensitivity++
	}
}

// verdict is the envelope of a finding that fails in the cases marked
// failed; extra is true for a finding the nominal case does not show.
func verdict(cases []Case, failed []bool, extra bool) *rules.Envelope {
	e := &rules.Envelope{Cases: len(cases)}
	flips := func(c int) bool { return failed[c] == extra } // passes a nominal failure, or fails a nominal pass
	var drivers []string
	for c, cs := range cases {
		if failed[c] {
			e.Failing++
		}
		if !flips(c) {
			continue
		}
		if e.Case == "" {
			e.Case = cs.Name
		}
		if cs.Alone != "" && !slices.Contains(drivers, cs.Alone) {
			drivers = append(drivers, cs.Alone)
		}
	}
	switch {
	case extra:
		e.Verdict = rules.Sensitivity
	case e.Failing == len(cases):
		e.Verdict = rules.RobustFail
		return e
	default:
		e.Verdict = rules.KnifeEdge
	}
	e.Driver = strings.Join(drivers, " and ")
	if e.Driver == "" {
		e.Driver = "combined"
	}
	return e
}

// groupKey identifies what a finding is about, whatever its span and
// values: the same rule on the same block, reach and event.
type groupKey struct {
	rule, file, reach, event string
	line, col                int
}

func keyOf(f *rules.Finding) groupKey {
	return groupKey{f.Rule, f.File(), f.Reach, f.Event, f.Range.Start.Line, f.Range.Start.Column}
}

// flowDependent reports whether a finding judges a solution of an event
// (and so can change with the flow).
func flowDependent(f *rules.Finding) bool {
	return f.Event != "" && f.Rule != rules.SensitivityID
}

// overlap reports whether the station spans of a and b overlap (touching
// counts); two findings without spans overlap.
func overlap(a, b *rules.Finding) bool {
	if !a.HasSpan || !b.HasSpan {
		return a.HasSpan == b.HasSpan
	}
	return a.FromStation <= b.ToStation && b.FromStation <= a.ToStation
}

// surfaceBands is the water-surface range over the runs at the nominal
// points.
func surfaceBands(nominal *solver.Result, runs []*Result) []Band {
	if nominal == nil {
		return nil
	}
	var out []Band
	for ei, ev := range nominal.Events {
		for ri, rr := range ev.Reaches {
			if rr == nil || len(rr.Points) == 0 {
				continue
			}
			b := Band{Event: ev.Event.Name, Reach: rr.Reach.Name}
			for _, p := range rr.Points {
				b.Station = append(b.Station, p.Station)
				b.Low = append(b.Low, p.WSE)
				b.High = append(b.High, p.WSE)
			}
			for _, run := range runs {
				if run.Solution == nil || ei >= len(run.Solution.Events) || ri >= len(run.Solution.Events[ei].Reaches) {
					continue
				}
				other := run.Solution.Events[ei].Reaches[ri]
				if other == nil || len(other.Points) == 0 {
					continue
				}
				for i, x := range b.Station {
					w := solver.AtStation(other.Points, x, func(p *solver.Point) float64 { return p.WSE })
					b.Low[i] = math.Min(b.Low[i], w)
					b.High[i] = math.Max(b.High[i], w)
				}
			}
			out = append(out, b)
		}
	}
	return out
}
