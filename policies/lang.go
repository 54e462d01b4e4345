package policies

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/model/suggest"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
	"github.com/zclconf/go-cty/cty"
)

// MaxExtendsDepth bounds the length of an `extends` chain.
const MaxExtendsDepth = 16

var policyFileSchema = &hcl.BodySchema{
	Blocks: []hcl.BlockHeaderSchema{{Type: "policy", LabelNames: []string{"name"}}},
}

// bodySchema is the schema of a policy block: its attributes and one block
// type per rule. Always-on rules are accepted by the schema only to say why
// they cannot be configured.
func (l *Language) bodySchema() *hcl.BodySchema {
	l.schemaOnce.Do(func() {
		s := &hcl.BodySchema{Attributes: []hcl.AttributeSchema{
			{Name: "units", Required: true},
			{Name: "reference"},
			{Name: "version"},
			{Name: "exceptions"},
			{Name: "waive_always_on"},
			{Name: "extends"},
		}}
		for _, r := range l.specs {
			s.Blocks = append(s.Blocks, hcl.BlockHeaderSchema{Type: r.ID})
		}
		l.schema = s
	})
	return l.schema
}

// ruleSchema is the schema of a rule block: the common settings and the
// rule's own.
func ruleSchema(spec *RuleSpec) *hcl.BodySchema {
	s := &hcl.BodySchema{}
	for _, c := range CommonSettings {
		s.Attributes = append(s.Attributes, hcl.AttributeSchema{Name: c.Name})
	}
	for _, c := range SelectorSettings {
		s.Attributes = append(s.Attributes, hcl.AttributeSchema{Name: c.Name})
	}
	for _, a := range spec.Settings {
		s.Attributes = append(s.Attributes, hcl.AttributeSchema{Name: a.Name})
	}
	return s
}

// own is what one policy file says by itself, before `extends`.
type own struct {
	policy        *Policy
	extends       string
	extendsRange  hcl.Range
	hasExtends    bool
	hasReference  bool
	hasVersion    bool
	hasExceptions bool
	hasWaive      bool
	disabled      map[string]bool // rules with a block written with enabled = false
}

// decoder accumulates the diagnostics of one file.
type decoder struct {
	lang *Language
	hclkit.Diagnostics
}

// decodeFile decodes the single policy block of a parsed file. Expressions
// are evaluated without an EvalContext: no variables, no functions.
func (d *decoder) decodeFile(file *hcl.File, name string) *own {
	content, diags := file.Body.Content(policyFileSchema)
	d.Diags = append(d.Diags, diags...)
	if len(content.Blocks) == 0 {
		misspelt := false
		for _, dg := range diags {
			misspelt = misspelt || dg.Summary == "Unsupported block type"
		}
		if !misspelt {
			d.Errorf(file.Body.MissingItemRange(), "Missing policy block",
				`A policy file holds one block: policy "NAME" { units = "si" ... }.`)
		}
		return nil
	}
	for _, extra := range content.Blocks[1:] {
		d.Errorf(extra.DefRange, "More than one policy block",
			"A policy file holds exactly one policy block; the first is at line %d. Put each policy in its own file and join them with extends.",
			content.Blocks[0].DefRange.Start.Line)
	}
	return d.decodePolicy(content.Blocks[0], name)
}

func (d *decoder) decodePolicy(block *hcl.Block, name string) *own {
	o := &own{policy: &Policy{
		Name:       block.Labels[0],
		Exceptions: "report",
		File:       name,
		Rules:      map[string]*RuleConfig{},
		DefRange:   block.DefRange,
	}, disabled: map[string]bool{}}
	if strings.TrimSpace(o.policy.Name) == "" {
		d.Errorf(block.LabelRanges[0], "Empty policy name", "Give the policy a name, e.g. policy \"county-drainage\".")
	}
	content, diags := block.Body.Content(d.lang.bodySchema())
	d.Diags = append(d.Diags, diags...)

	if a := content.Attributes["units"]; a != nil {
		if s, ok := d.enum(a, "units", []string{string(model.SI), string(model.US)}); ok {
			o.policy.Units = model.Units(s)
		}
	}
	if a := content.Attributes["reference"]; a != nil {
		if s, ok := d.str(a); ok {
			o.policy.Reference = s
			o.hasReference = true
		}
	}
	if a := content.Attributes["version"]; a != nil {
		if s, ok := d.str(a); ok {
			o.policy.Version = strings.TrimSpace(s)
			o.hasVersion = true
		}
	}
	if a := content.Attributes["exceptions"]; a != nil {
		if s, ok := d.enum(a, "exceptions", []string{"report", "deny", Approved}); ok {
			o.policy.Exceptions = s
			o.hasExceptions = true
		}
	}
	if a := content.Attributes["waive_always_on"]; a != nil {
		isAlwaysOn := func(w string) bool { spec := d.lang.Spec(w); return spec != nil && spec.AlwaysOn }
		o.policy.WaiveAlwaysOn = d.words(a, "always-on rule id", `["capacity"]`, isAlwaysOn)
		o.hasWaive = true
	}
	if a := content.Attributes["extends"]; a != nil {
		if s, ok := d.str(a); ok {
			if strings.TrimSpace(s) == "" {
				d.Errorf(a.Expr.Range(), "Empty extends", "Name a built-in pack (%s) or a policy file path relative to this file.", strings.Join(PackNames(), ", "))
			} else {
				o.extends, o.hasExtends = s, true
			}
		}
		o.extendsRange = a.Expr.Range()
	}

	seen := map[string][]*RuleConfig{}
	for _, b := range content.Blocks {
		spec := d.lang.Spec(b.Type)
		if spec == nil || spec.AlwaysOn {
			d.Errorf(b.DefRange, "Rule is always on",
				"The %q rule always runs and cannot be configured or switched off; remove this block.", b.Type)
			continue
		}
		rc, enabled := d.decodeRule(spec, b, name) // a duplicate too, for its own problems
		if prev := sameAs(seen[b.Type], rc); prev != nil {
			d.Errorf(b.DefRange, "Duplicate rule block",
				"The %s rule is already configured at line %d for %s; a policy file configures each rule once per selection (give this block a selector, e.g. reach_classes, to apply it to part of the model).",
				b.Type, prev.DefRange.Start.Line, rc.SelectorText())
			continue
		}
		seen[b.Type] = append(seen[b.Type], rc)
		if enabled {
			o.policy.Rules[b.Type] = o.policy.Rules[b.Type].with(rc)
		} else {
			o.disabled[b.Type] = true
		}
	}
	return o
}

// sameAs returns the block of blocks with the same selector as rc, or nil.
func sameAs(blocks []*RuleConfig, rc *RuleConfig) *RuleConfig {
	for _, b := range blocks {
		if sameSelector(b, rc) {
			return b
		}
	}
	return nil
}

// with returns the rule's blocks with rc added (rc itself when c is nil).
func (c *RuleConfig) with(rc *RuleConfig) *RuleConfig {
	if c == nil {
		return rc
	}
	c.More = append(c.More, rc)
	return c
}

// decodeRule decodes one rule block generically from its spec; enabled is
// false for enabled = false.
func (d *decoder) decodeRule(spec *RuleSpec, block *hcl.Block, file string) (rc *RuleConfig, enabled bool) {
	before := len(d.Diags)
	content, diags := block.Body.Content(ruleSchema(spec))
	d.Diags = append(d.Diags, diags...)
	rc = &RuleConfig{
		Rule:     spec.ID,
		Spec:     spec,
		Severity: spec.Severity,
		File:     file,
		DefRange: block.DefRange,
		Attrs:    map[string]hcl.Range{},
		Values:   map[string]Value{},
	}
	enabled = true
	for name, a := range content.Attributes {
		rc.Attrs[name] = a.Expr.Range()
	}
	if a := content.Attributes["enabled"]; a != nil {
		v, ok := d.value(a, cty.Bool, "true or false")
		if ok {
			enabled = v.True()
		}
	}
	if a := content.Attributes["severity"]; a != nil {
		if s, ok := d.enum(a, "severity", []string{string(Error), string(Warning), string(Info)}); ok {
			rc.Severity = Severity(s)
		}
	}
	if a := content.Attributes["events"]; a != nil {
		rc.Events = d.events(a)
	}
	d.selector(content, &rc.Select)
	if a := content.Attributes["section"]; a != nil {
		if s, ok := d.str(a); ok {
			rc.Section = strings.TrimSpace(s)
		}
	}
	for i := range spec.Settings {
		s := &spec.Settings[i]
		a := content.Attributes[s.Name]
		if a == nil {
			switch s.Kind {
			case Number:
				rc.Values[s.Name] = Value{Number: s.Default}
			case Choice:
				rc.Values[s.Name] = Value{Word: s.Choices[0]}
			}
			continue
		}
		var v Value
		switch s.Kind {
		case Number:
			v.Number, _ = d.bounded(a, s)
		case PerLining:
			v.Table = d.byLining(a, s)
		case FroudeBands:
			v.Bands = d.bands(a, s)
		case Choice:
			v.Word, _ = d.enum(a, s.Name, s.Choices)
			if v.Word == "" {
				v.Word = s.Choices[0]
			}
		}
		rc.Values[s.Name] = v
	}
	if enabled && !diags.HasErrors() {
		d.required(spec, content)
		if spec.NeedsEvents && !d.Diags[before:].HasErrors() && rc.Events == nil && !rc.Select.HasReturnPeriod && rc.Select.EventClasses == nil {
			d.Errorf(block.DefRange, fmt.Sprintf("Missing %s events", spec.ID),
				"The %s rule applies only to the events the policy names: write events = [...], return_period = [low, high] or event_classes = [...], e.g. return_period = [null, 2] for frequent flows.", spec.ID)
		}
	}
	return rc, enabled
}

// required reports the settings an enabled block lacks: a required one,
// or every one of a group of which at least one is needed, or some of a
// group whose settings go together. The caller skips it after an unknown
// or malformed argument (likely a misspelt setting): a second message about
// a missing setting would only repeat it.
func (d *decoder) required(spec *RuleSpec, content *hcl.BodyContent) {
	missing := content.MissingItemRange
	for i := range spec.Settings {
		s := &spec.Settings[i]
		if s.Required && content.Attributes[s.Name] == nil {
			d.Errorf(missing, fmt.Sprintf("Missing argument %q", s.Name),
				"The %s rule needs %s.", spec.ID, s.Usage())
		}
	}
	for _, g := range spec.Together {
		var have, lack []string
		for _, n := range g.Settings {
			if content.Attributes[n] != nil {
				have = append(have, n)
			} else {
				lack = append(lack, n)
			}
		}
		switch {
		case g.Need == AtLeastOne && len(have) == 0:
			parts := make([]string, len(g.Settings))
			for i, n := range g.Settings {
				parts[i] = n + " (" + spec.Setting(n).Doc + ")"
			}
			detail := "Set at least one of " + joinWords(parts, "and")
			if len(parts) == 2 {
				detail = "Set " + parts[0] + ", " + parts[1] + " or both"
			}
			if g.Note != "" {
				detail += "; " + g.Note
			}
			d.Errorf(missing, fmt.Sprintf("Missing %s setting", spec.ID), "%s.", detail)
		case g.Need == AllOrNone && len(have) > 0 && len(lack) > 0:
			d.Errorf(missing, fmt.Sprintf("Missing %s setting", spec.ID),
				"%s go together: with %s also set %s.", joinWords(g.Settings, "and"), joinWords(have, "and"), joinWords(lack, "and"))
		}
	}
}

// value evaluates an attribute without variables or functions and checks
// its type; what names the expected value in the message.
func (d *decoder) value(a *hcl.Attribute, want cty.Type, what string) (cty.Value, bool) {
	return d.exprValue(a.Expr, a.Name, want, what)
}

func (d *decoder) exprValue(expr hcl.Expression, name string, want cty.Type, what string) (cty.Value, bool) {
	if !d.literal(expr) {
		return cty.NilVal, false
	}
	v, diags := expr.Value(nil)
	d.Diags = append(d.Diags, diags...)
	if diags.HasErrors() {
		return cty.NilVal, false
	}
	if v.IsNull() || !v.IsWhollyKnown() || !v.Type().Equals(want) {
		d.Errorf(expr.Range(), fmt.Sprintf("Invalid value for %q", name), "%s must be %s; got %s.", name, what, describe(v))
		return cty.NilVal, false
	}
	return v, true
}

// literal reports whether expr is made of literal values only: numbers,
// strings without interpolation, true, false, null, negation, parentheses,
// lists and objects (with bare or quoted keys). Anything else is reported
// at its own range. Evaluation is then bounded by the size of the text: a
// policy may come from the repository under review, and for-expressions or
// template directives could otherwise expand a short file into gigabytes.
func (d *decoder) literal(expr hcl.Expression) bool {
	return hclkit.Literal(expr, hclkit.Allow{}, d.rejectConstruct)
}

// rejectConstruct words the diagnostic of a construct literal found.
func (d *decoder) rejectConstruct(c hclkit.Construct, e hcl.Expression) {
	const only = "A policy holds literal values only: numbers, strings, true, false, null, lists [...] and objects { ... }."
	switch c {
	case hclkit.Interpolation:
		d.Errorf(e.Range(), "Templates not allowed", "Write the text itself; ${...} interpolation is not evaluated in a policy.")
	case hclkit.LoneInterpolation:
		d.Errorf(e.Range(), "Templates not allowed", "Write the value itself; ${...} interpolation is not evaluated in a policy.")
	case hclkit.Directive:
		d.Errorf(e.Range(), "Templates not allowed", "Template directives (%%{for}, %%{if}) are not evaluated in a policy; write the text itself.")
	case hclkit.Call:
		d.Errorf(e.Range(), "Function calls not allowed", "Functions may not be called in a policy. %s", only)
	case hclkit.Variable:
		d.Errorf(e.(*hclsyntax.ScopeTraversalExpr).Traversal.SourceRange(), "Variables not allowed", "Variables may not be used in a policy; quote a text value. %s", only)
	case hclkit.For:
		d.Errorf(e.Range(), "For expressions not allowed", "%s", only)
	default:
		d.Errorf(e.Range(), "Expressions not allowed", "%s", only)
	}
}

// describe names a value's kind for messages.
func describe(v cty.Value) string {
	switch {
	case v.IsNull():
		return "null"
	case !v.IsWhollyKnown():
		return "an unknown value"
	case v.Type() == cty.String:
		return fmt.Sprintf("the string %q", v.AsString())
	case v.Type() == cty.Number:
		return "a number"
	case v.Type() == cty.Bool:
		return "a bool"
	case v.Type().IsTupleType() || v.Type().IsListType():
		return "a list"
	case v.Type().IsObjectType() || v.Type().IsMapType():
		return "an object"
	}
	return v.Type().FriendlyName()
}

func (d *decoder) str(a *hcl.Attribute) (string, bool) {
	v, ok := d.value(a, cty.String, "a string")
	if !ok {
		return "", false
	}
	return v.AsString(), true
}

// enum reads a string attribute that must be one of allowed.
func (d *decoder) enum(a *hcl.Attribute, name string, allowed []string) (string, bool) {
	s, ok := d.str(a)
	if !ok {
		return "", false
	}
	for _, w := range allowed {
		if s == w {
			return s, true
		}
	}
	detail := fmt.Sprintf("%s must be one of %s; got %q.", name, quoteList(allowed), s) + hclkit.DidYouMean(suggestWord(s, allowed))
	d.Errorf(a.Expr.Range(), fmt.Sprintf("Invalid %s", name), "%s", detail)
	return "", false
}

// unitAliases maps words people write for a unit system to its name.
var unitAliases = map[string]string{
	"metric": "si", "m": "si", "metres": "si", "meters": "si",
	"imperial": "us", "english": "us", "customary": "us", "ft": "us", "feet": "us", "usc": "us",
}

// suggestWord returns the allowed word that s probably meant (an alias of
// a unit system, an abbreviation, or a word within two edits), or "".
func suggestWord(s string, allowed []string) string {
	low := strings.ToLower(strings.TrimSpace(s))
	if alias, ok := unitAliases[low]; ok {
		low = alias
	}
	if slices.Contains(allowed, low) {
		return low
	}
	if w := suggest.Prefix(low, allowed); w != "" {
		return w
	}
	return suggest.Closest(low, allowed, 2, nil)
}

func quoteList(ws []string) string {
	q := make([]string, len(ws))
	for i, w := range ws {
		q[i] = fmt.Sprintf("%q", w)
	}
	return strings.Join(q, ", ")
}

// number converts an evaluated number to a finite float64.
func (d *decoder) number(expr hcl.Expression, name string) (float64, bool) {
	v, ok := d.exprValue(expr, name, cty.Number, "a number")
	if !ok {
		return 0, false
	}
	f, _ := v.AsBigFloat().Float64()
	if math.IsInf(f, 0) {
		d.Errorf(expr.Range(), fmt.Sprintf("Invalid value for %q", name), "%s is too large to be a finite number.", name)
		return 0, false
	}
	if f == 0 {
		f = 0 // -0 as written is zero, which no output prints with a sign
	}
	return f, true
}

// bounded reads a Number setting within its bounds.
func (d *decoder) bounded(a *hcl.Attribute, s *Setting) (float64, bool) {
	f, ok := d.number(a.Expr, a.Name)
	if !ok {
		return 0, false
	}
	if !s.Bounds.Admits(f) {
		d.Errorf(a.Expr.Range(), fmt.Sprintf("Invalid value for %q", a.Name), "%s must be %s; got %g.", a.Name, s.must(), f)
		return 0, false
	}
	return f, true
}

// events reads a non-empty list of event names.
func (d *decoder) events(a *hcl.Attribute) []string {
	if !d.literal(a.Expr) {
		return nil
	}
	elems, diags := hcl.ExprList(a.Expr)
	if diags.HasErrors() {
		d.Errorf(a.Expr.Range(), `Invalid value for "events"`, `events must be a list of event names, e.g. ["q100"].`)
		return nil
	}
	if len(elems) == 0 {
		d.Errorf(a.Expr.Range(), `Empty "events"`, "An empty list would apply the rule to no event; remove events to apply it to every event, or write enabled = false.")
		return nil
	}
	out := make([]string, 0, len(elems))
	seen := map[string]bool{}
	for _, e := range elems {
		v, ok := d.exprValue(e, "events", cty.String, "a list of event names (strings)")
		if !ok {
			continue
		}
		s := v.AsString()
		switch {
		case strings.TrimSpace(s) == "":
			d.Errorf(e.Range(), "Empty event name", "Name an event of the model, e.g. \"q100\".")
		case seen[s]:
			d.Warnf(e.Range(), "Event listed twice", "The event %q is already in this list.", s)
		default:
			seen[s] = true
			out = append(out, s)
		}
	}
	return out
}

// byLining reads a limit: a number, or an object of lining = number (or
// null for no limit), with an optional default key.
func (d *decoder) byLining(a *hcl.Attribute, s *Setting) ByLining {
	var b ByLining
	name := s.Name
	what := "a number " + s.Bounds.String() + ", or an object such as { concrete = 6.0, default = 1.0 }"
	pairs, mdiags := hcl.ExprMap(a.Expr)
	if mdiags.HasErrors() {
		if f, ok := d.inBounds(a.Expr, s, name+" must be "+what); ok {
			b.Default, b.HasDefault = f, true
		}
		return b
	}
	if len(pairs) == 0 {
		d.Errorf(a.Expr.Range(), fmt.Sprintf("Empty %q", name), "Give at least one lining = %s pair or a default.", name)
		return b
	}
	seen := map[string]hcl.Range{}
	before := len(d.Diags)
	defer func() {
		if b.Values == nil && !b.HasDefault && len(d.Diags) == before {
			d.Errorf(a.Expr.Range(), fmt.Sprintf("No number in %q", name), "Give at least one lining a number, or a default; null alone limits nothing.")
		}
	}()
	for _, kv := range pairs {
		kval, ok := d.exprValue(kv.Key, name, cty.String, "an object whose keys are lining words")
		if !ok {
			continue
		}
		key := kval.AsString()
		if strings.TrimSpace(key) == "" {
			d.Errorf(kv.Key.Range(), "Empty lining word", "Name a lining word used by the model's sections, e.g. concrete, or default.")
			continue
		}
		if prev, dup := seen[key]; dup {
			d.Errorf(kv.Key.Range(), "Duplicate lining in "+name, "%q already has a %s at line %d, column %d.", key, name, prev.Start.Line, prev.Start.Column)
			continue
		}
		seen[key] = kv.Key.Range()
		if !d.literal(kv.Value) {
			continue
		}
		if v, diags := kv.Value.Value(nil); !diags.HasErrors() && v.IsNull() {
			if key == "default" {
				continue // no default: unlisted linings are not checked
			}
			if b.NoLimit == nil {
				b.NoLimit = map[string]bool{}
			}
			b.NoLimit[key] = true
			continue
		}
		f, ok := d.inBounds(kv.Value, s, fmt.Sprintf("The %s for %s must be a number %s, or null for no %s", name, key, s.Bounds, name))
		if !ok {
			continue
		}
		if key == "default" {
			b.Default, b.HasDefault = f, true
			continue
		}
		if b.Values == nil {
			b.Values = map[string]float64{}
		}
		b.Values[key] = f
	}
	return b
}

// inBounds reads a number within the setting's bounds; must says what it
// must be.
func (d *decoder) inBounds(expr hcl.Expression, s *Setting, must string) (float64, bool) {
	f, ok := d.number(expr, s.Name)
	if !ok {
		return 0, false
	}
	if !s.Bounds.Admits(f) {
		d.Errorf(expr.Range(), fmt.Sprintf("Invalid value for %q", s.Name),
			"%s; got %g. To switch the rule off write enabled = false.", must, f)
		return 0, false
	}
	return f, true
}

// bands reads [[lo, hi], ...] with lo < hi, both within the setting's
// bounds (0 ≤ lo for Froude numbers).
func (d *decoder) bands(a *hcl.Attribute, s *Setting) []Band {
	name := s.Name
	shape := name + " must be a list of [low, high] Froude-number pairs, e.g. [[0.86, 1.13]]"
	if !d.literal(a.Expr) {
		return nil
	}
	outer, diags := hcl.ExprList(a.Expr)
	if diags.HasErrors() {
		d.Errorf(a.Expr.Range(), fmt.Sprintf("Invalid value for %q", name), "%s.", shape)
		return nil
	}
	if len(outer) == 0 {
		d.Errorf(a.Expr.Range(), fmt.Sprintf("Empty %q", name), "%s; to switch the rule off write enabled = false.", shape)
		return nil
	}
	var out []Band
	for _, e := range outer {
		inner, diags := hcl.ExprList(e)
		if diags.HasErrors() || len(inner) != 2 {
			d.Errorf(e.Range(), "Invalid band", "%s; this element is not a pair.", shape)
			continue
		}
		lo, okLo := d.number(inner[0], name)
		hi, okHi := d.number(inner[1], name)
		if !okLo || !okHi {
			continue
		}
		switch {
		case !s.Bounds.Admits(lo):
			d.Errorf(inner[0].Range(), "Invalid band", "%s is %s; got %g.", capitalise(s.Quantity.noun()), s.Bounds, lo)
		case !s.Bounds.Admits(hi):
			d.Errorf(inner[1].Range(), "Invalid band", "%s is %s; got %g.", capitalise(s.Quantity.noun()), s.Bounds, hi)
		case hi <= lo:
			d.Errorf(e.Range(), "Invalid band", "The low end must be below the high end; got [%g, %g].", lo, hi)
		default:
			out = append(out, Band{Low: lo, High: hi})
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Low < out[j].Low })
	return out
}

// capitalise upper-cases the first letter of an ASCII phrase.
func capitalise(s string) string {
	if s == "" || s[0] < 'a' || s[0] > 'z' {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}

// crossCheck warns about settings of the effective policy that contradict
// each other: a PerLining setting whose spec says it must stay Below
// another rule's (a minimum velocity at or above the maximum for a lining
// leaves no velocity that passes both rules).
func crossCheck(p *Policy) hcl.Diagnostics {
	ids := make([]string, 0, len(p.Rules))
	for id := range p.Rules {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	var diags hcl.Diagnostics
	for _, id := range ids {
		lo := p.Rules[id]
		if lo.Spec == nil {
			continue
		}
		for i := range lo.Spec.Settings {
			s := &lo.Spec.Settings[i]
			rule, setting, ok := strings.Cut(s.Below, ".")
			if !ok || s.Kind != PerLining || p.Rules[rule] == nil {
				continue
			}
			diags = append(diags, noRoom(p, lo, s, p.Rules[rule], setting)...)
		}
	}
	return diags
}

// noRoom compares lining by lining the setting s of lo, which must stay
// below the setting named above of hi.
func noRoom(p *Policy, lo *RuleConfig, s *Setting, hi *RuleConfig, above string) hcl.Diagnostics {
	low, high := lo.Table(s.Name), hi.Table(above)
	linings := map[string]bool{"": true} // "": an unlisted lining, the defaults
	for k := range low.Values {
		linings[k] = true
	}
	for k := range high.Values {
		linings[k] = true
	}
	words := make([]string, 0, len(linings))
	for k := range linings {
		words = append(words, k)
	}
	sort.Strings(words)
	var diags hcl.Diagnostics
	for _, w := range words {
		vmin, okMin := low.For(w)
		vmax, okMax := high.For(w)
		if !okMin || !okMax || vmin < vmax {
			continue
		}
		what := fmt.Sprintf("lining %q", w)
		if w == "" {
			what = "linings without a limit of their own"
		}
		rng, ok := lo.Attrs[s.Name]
		if !ok {
			rng = lo.DefRange
		}
		word := s.Quantity.Word()
		diags = append(diags, &hcl.Diagnostic{
			Severity: hcl.DiagWarning,
			Summary:  capitalise(word) + " limits leave no room",
			Detail: fmt.Sprintf("For %s the minimum %s %s is not below the maximum %s %s (%s from %s:%d); every %s fails one of the two rules. Give the lining its own limits, or null for no minimum.",
				what, word, numfmt.Written(vmin), numfmt.Written(vmax), s.Quantity.Unit(p.Units),
				hi.Rule, hi.File, hi.DefRange.Start.Line, word),
			Subject: rng.Ptr(),
		})
	}
	return diags
}
