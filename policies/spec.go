package policies

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"sync"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/hashicorp/hcl/v2"
)

// This file holds the types by which a rule describes its policy block.
// The rules package owns the values (each rule file declares its own
// RuleSpec); the policy language only interprets them, in the way a flag
// set interprets the flags an analyzer declares. policies therefore never
// imports rules: NewLanguage receives the specs.

// Kind is the shape of a setting's value in a policy.
type Kind int

const (
	// Number is a single number: minimum = 0.3.
	Number Kind = iota + 1
	// PerLining is a number, or an object of lining word = number (null:
	// no limit for that lining) with an optional default key:
	// limit = { concrete = 6.0, default = 1.5 }.
	PerLining
	// FroudeBands is a list of [low, high] Froude-number pairs with
	// 0 ≤ low < high: avoid = [[0.86, 1.13]].
	FroudeBands
	// Choice is one word of a fixed list (Setting.Choices, the first the
	// default): quantity = "mean". It has no quantity and no bounds.
	Choice
)

// Quantity says what a number of a setting measures, and so how it is
// converted between unit systems and which unit it is printed with.
type Quantity int

const (
	// Length is in m (si) or ft (us).
	Length Quantity = iota + 1
	// Velocity is in m/s or ft/s.
	Velocity
	// Stress is a shear stress in N/m² or lb/ft².
	Stress
	// Ratio is a dimensionless share (0.2 means 20 %).
	Ratio
	// Coefficient is a dimensionless factor of a formula.
	Coefficient
	// Froude is a Froude number.
	Froude
	// Grade is a longitudinal bed slope, rise over run (0.005 is 0.5 %).
	Grade
	// SideSlope is a bank's slope as horizontal per unit vertical (3 is
	// 3H:1V); a larger number is a flatter bank.
	SideSlope
	// UnitDischarge is a depth × velocity product, in m²/s or ft²/s.
	UnitDischarge
)

// noun is the quantity as messages name it: "a length".
func (q Quantity) noun() string {
	switch q {
	case Length:
		return "a length"
	case Velocity:
		return "a velocity"
	case Stress:
		return "a shear stress"
	case Ratio:
		return "a ratio"
	case Coefficient:
		return "a coefficient"
	case Froude:
		return "a Froude number"
	case Grade:
		return "a grade"
	case SideSlope:
		return "a side slope"
	case UnitDischarge:
		return "a depth × velocity product"
	}
	return "a number"
}

// Word is the quantity as documentation names it: "length".
func (q Quantity) Word() string { return strings.TrimPrefix(strings.TrimPrefix(q.noun(), "a "), "an ") }

// Unit is the unit a number of the quantity is written in under u; "" for
// a dimensionless quantity.
func (q Quantity) Unit(u model.Units) string {
	switch q {
	case Length:
		return u.Length()
	case Velocity:
		return u.Velocity()
	case Stress:
		return u.Stress()
	case UnitDischarge:
		return u.Length() + "²/s"
	}
	return ""
}

// factor converts a value of the quantity from SI to US customary units
// (divide to go back); 1 for a dimensionless quantity.
func (q Quantity) factor() float64 {
	switch q {
	case Length, Velocity: // velocities scale as lengths (per second)
		return 1 / MetresPerFoot
	case Stress:
		return 1 / PascalsPerPSF
	case UnitDischarge: // a length times a velocity
		return 1 / (MetresPerFoot * MetresPerFoot)
	}
	return 1
}

// Bounds is the admissible interval of a number: [Min, Max], with Min
// itself excluded when MinOpen. A table value and each end of a band are
// held to the same bounds.
type Bounds struct {
	Min, Max float64
	MinOpen  bool
}

// AtLeast is [lo, +∞).
func AtLeast(lo float64) Bounds { return Bounds{Min: lo, Max: math.Inf(1)} }

// Above is (lo, +∞).
func Above(lo float64) Bounds { return Bounds{Min: lo, Max: math.Inf(1), MinOpen: true} }

// Within is [lo, hi].
func Within(lo, hi float64) Bounds { return Bounds{Min: lo, Max: hi} }

// Admits reports whether x lies within the bounds.
func (b Bounds) Admits(x float64) bool {
	return x >= b.Min && x <= b.Max && !(b.MinOpen && x == b.Min)
}

// String is the bounds in words: "at least 0", "greater than 0", "from 0
// to 1".
func (b Bounds) String() string {
	switch {
	case math.IsInf(b.Max, 1) && b.MinOpen:
		return "greater than " + numfmt.Written(b.Min)
	case math.IsInf(b.Max, 1):
		return "at least " + numfmt.Written(b.Min)
	case b.MinOpen:
		return "greater than " + numfmt.Written(b.Min) + " and at most " + numfmt.Written(b.Max)
	}
	return "from " + numfmt.Written(b.Min) + " to " + numfmt.Written(b.Max)
}

// Setting describes one attribute of a rule block besides the settings
// every block takes (severity, events, enabled).
type Setting struct {
	Name     string
	Kind     Kind
	Quantity Quantity // of the number, of each table value, of each band end
	Bounds   Bounds
	// Default is the value of a Number setting that is not written.
	Default float64
	// Required: an enabled block must write the setting.
	Required bool
	// Doc says in a few words what the setting is, for `explain`, the
	// README and the report: "freeboard required at every point".
	Doc string
	// Below names another rule's PerLining setting, "RULE.SETTING", that
	// this PerLining setting must stay below lining by lining; the loader
	// warns where it does not ("" for none).
	Below string
	// Must overrides what messages say the value must be; empty: the
	// quantity and the bounds ("a length of at least 0").
	Must string
	// Choices are the words a Choice setting takes; the first is its
	// default.
	Choices []string
}

// quotedChoices is the choices as prose: "a" or "b".
func (s *Setting) quotedChoices() string {
	q := make([]string, len(s.Choices))
	for i, c := range s.Choices {
		q[i] = fmt.Sprintf("%q", c)
	}
	return joinWords(q, "or")
}

// must is what a value of the setting must be, for messages.
func (s *Setting) must() string {
	if s.Must != "" {
		return s.Must
	}
	if s.Kind == Choice {
		return s.quotedChoices()
	}
	return s.Quantity.noun() + " " + s.Bounds.String()
}

// Usage is how the setting is written, for messages and documentation.
func (s *Setting) Usage() string {
	switch s.Kind {
	case PerLining:
		return s.Name + " = NUMBER or " + s.Name + " = { LINING = NUMBER, ..., default = NUMBER }"
	case FroudeBands:
		return s.Name + " = [[low, high], ...], the Froude-number bands to flag"
	case Choice:
		return s.Name + " = " + s.quotedChoices()
	}
	return s.Name + " = NUMBER"
}

// Line describes the setting in one line for documentation: its name,
// what it is, its form, quantity, units and bounds, and its default or that
// it is required.
func (s *Setting) Line() string {
	q := s.Quantity.Word()
	if si, us := s.Quantity.Unit(model.SI), s.Quantity.Unit(model.US); si != "" {
		q += " (" + si + " or " + us + ")"
	}
	form := "a " + q + " " + s.Bounds.String()
	switch s.Kind {
	case PerLining:
		form += ", or { LINING = value or null, ..., default = value }"
	case FroudeBands:
		form = "[[low, high], ...], " + q + "s " + s.Bounds.String() + ", low < high"
	case Choice:
		form = s.quotedChoices()
	}
	line := s.Name + ": " + s.Doc + "; " + form
	switch {
	case s.Required:
		line += "; required"
	case s.Kind == Number:
		line += "; default " + numfmt.Written(s.Default)
	case s.Kind == Choice:
		line += fmt.Sprintf("; default %q", s.Choices[0])
	}
	return line
}

// Need says how the settings of a Group must be given.
type Need int

const (
	// AtLeastOne of the group's settings must be written.
	AtLeastOne Need = iota + 1
	// AllOrNone: writing one of the group's settings requires the others.
	AllOrNone
)

// Group is a set of settings that go together.
type Group struct {
	Settings []string
	Need     Need
	// Note completes the message and the documentation: how the settings
	// combine ("the larger of minimum and fraction × depth governs").
	Note string
}

// String describes the group for documentation: "at least one of
// minimum, fraction; the larger ... governs".
func (g Group) String() string {
	var s string
	switch g.Need {
	case AtLeastOne:
		s = "at least one of " + strings.Join(g.Settings, ", ")
	case AllOrNone:
		s = strings.Join(g.Settings, ", ") + ": all or none"
	}
	if g.Note != "" {
		s += "; " + g.Note
	}
	return s
}

// joinWords joins words as prose: "a", "a and b", "a, b and c".
func joinWords(ws []string, conj string) string {
	if len(ws) < 2 {
		return strings.Join(ws, "")
	}
	return strings.Join(ws[:len(ws)-1], ", ") + " " + conj + " " + ws[len(ws)-1]
}

// RuleSpec is what the policy language knows of a rule: its id, whether a
// policy can configure it, its default severity and its settings.
type RuleSpec struct {
	ID       string
	Severity Severity // default severity
	// AlwaysOn rules run whatever the policy says; a block for one is an
	// error (a submittal's policy cannot switch them off).
	AlwaysOn bool
	// OptIn marks a block that is not a design criterion of its own but
	// asks for more work (a sensitivity run): the built-in packs leave it
	// out, and a policy that does not write it turns nothing off.
	OptIn bool
	// NeedsEvents: a block applies only to the events it names, so an
	// enabled block must select events (events, return_period or
	// event_classes); the loader refuses one that does not.
	NeedsEvents bool
	Settings    []Setting
	Together    []Group
}

// Setting returns the setting of the spec named name, or nil.
func (r *RuleSpec) Setting(name string) *Setting {
	for i := range r.Settings {
		if r.Settings[i].Name == name {
			return &r.Settings[i]
		}
	}
	return nil
}

// Validate reports the first inconsistency of a spec: an empty or
// malformed id, a missing default severity, an always-on rule with
// settings, a setting without a kind, quantity, bounds or doc, a default
// outside its bounds, a name used twice or reserved, a group naming an
// unknown setting.
func (r *RuleSpec) Validate() error {
	if r.ID == "" || strings.Trim(r.ID, "abcdefghijklmnopqrstuvwxyz_") != "" {
		return fmt.Errorf("rule id %q: lower-case letters and underscores only", r.ID)
	}
	if r.Severity.Rank() == 0 {
		return fmt.Errorf("rule %s: no default severity", r.ID)
	}
	if r.AlwaysOn && (len(r.Settings) > 0 || len(r.Together) > 0) {
		return fmt.Errorf("rule %s: an always-on rule has no policy block, so no settings", r.ID)
	}
	seen := map[string]bool{}
	for _, c := range slices.Concat(CommonSettings, SelectorSettings) {
		seen[c.Name] = true
	}
	for i := range r.Settings {
		s := &r.Settings[i]
		switch {
		case s.Name == "" || seen[s.Name]:
			return fmt.Errorf("rule %s: setting %q is empty, repeated or reserved", r.ID, s.Name)
		case s.Kind < Number || s.Kind > Choice:
			return fmt.Errorf("rule %s: setting %s has no kind", r.ID, s.Name)
		case s.Kind == Choice && (len(s.Choices) < 2 || s.Required || s.Quantity != 0 || s.Bounds != (Bounds{})):
			return fmt.Errorf("rule %s: choice %s needs two words or more, the first its default, and no quantity or bounds", r.ID, s.Name)
		case s.Kind == Choice:
		case s.Quantity < Length || s.Quantity > UnitDischarge:
			return fmt.Errorf("rule %s: setting %s has no quantity", r.ID, s.Name)
		case s.Bounds == (Bounds{}):
			return fmt.Errorf("rule %s: setting %s has no bounds", r.ID, s.Name)
		case strings.TrimSpace(s.Doc) == "":
			return fmt.Errorf("rule %s: setting %s has no doc", r.ID, s.Name)
		case s.Kind == Number && !s.Required && !s.Bounds.Admits(s.Default):
			return fmt.Errorf("rule %s: default %g of %s is outside %s", r.ID, s.Default, s.Name, s.Bounds)
		}
		seen[s.Name] = true
	}
	for _, g := range r.Together {
		if len(g.Settings) < 2 || (g.Need != AtLeastOne && g.Need != AllOrNone) {
			return fmt.Errorf("rule %s: a group needs two settings or more and a Need", r.ID)
		}
		for _, n := range g.Settings {
			if r.Setting(n) == nil {
				return fmt.Errorf("rule %s: group names unknown setting %q", r.ID, n)
			}
		}
	}
	return nil
}

// CommonSetting is a setting every rule block takes.
type CommonSetting struct {
	Name, Doc string
}

// CommonSettings are the settings of every rule block, in the order
// `policy show` writes them.
var CommonSettings = []CommonSetting{
	{"severity", `"error", "warning" or "info"; default: the rule's own`},
	{"events", "a list of event names; default: every event"},
	{"enabled", "true (default) or false, which switches off a rule that an extended policy turns on"},
	{"section", "the block's reference into the policy's manual, e.g. \"5.3.2\"; printed with every finding"},
}

// Language is the policy language for one set of rules. It is safe for
// concurrent use.
type Language struct {
	specs      []*RuleSpec // sorted by id
	schemaOnce sync.Once
	schema     *hcl.BodySchema
	// packs holds the effective policy of each built-in pack once it has
	// loaded without diagnostics: the packs are embedded and never change,
	// and decoding one costs about a third of checking a small model.
	// Callers get a deep copy.
	packs sync.Map // pack name → *Policy
}

// ErrSpec is wrapped by NewLanguage's error for an invalid rule spec.
var ErrSpec = errors.New("invalid rule spec")

// NewLanguage returns the policy language of the given rules. The specs
// are shared, not copied: they must not change afterwards.
func NewLanguage(specs []*RuleSpec) (*Language, error) {
	l := &Language{specs: slices.Clone(specs)}
	slices.SortFunc(l.specs, func(a, b *RuleSpec) int { return strings.Compare(a.ID, b.ID) })
	for i, s := range l.specs {
		if err := s.Validate(); err != nil {
			return nil, fmt.Errorf("%w: %w", ErrSpec, err)
		}
		if i > 0 && l.specs[i-1].ID == s.ID {
			return nil, fmt.Errorf("%w: rule %s declared twice", ErrSpec, s.ID)
		}
	}
	for _, r := range l.specs {
		for _, s := range r.Settings {
			if s.Below == "" {
				continue
			}
			rule, setting, _ := strings.Cut(s.Below, ".")
			other := l.Spec(rule)
			if s.Kind != PerLining || other == nil || other.Setting(setting) == nil ||
				other.Setting(setting).Kind != PerLining || other.Setting(setting).Quantity != s.Quantity {
				return nil, fmt.Errorf("%w: rule %s: %s must stay below %q, which is not a PerLining setting of the same quantity", ErrSpec, r.ID, s.Name, s.Below)
			}
		}
	}
	return l, nil
}

// Spec returns the spec of a rule id, or nil.
func (l *Language) Spec(id string) *RuleSpec {
	i, ok := slices.BinarySearchFunc(l.specs, id, func(s *RuleSpec, id string) int { return strings.Compare(s.ID, id) })
	if !ok {
		return nil
	}
	return l.specs[i]
}

// Configurable returns the ids of the rules the policy language accepts
// as blocks, sorted.
// Criteria are the configurable rules that are design criteria: every
// configurable rule but the opt-in blocks. The built-in packs turn on all
// of them.
func (l *Language) Criteria() []string {
	var ids []string
	for _, s := range l.specs {
		if !s.AlwaysOn && !s.OptIn {
			ids = append(ids, s.ID)
		}
	}
	return ids
}

func (l *Language) Configurable() []string {
	var ids []string
	for _, s := range l.specs {
		if !s.AlwaysOn {
			ids = append(ids, s.ID)
		}
	}
	return ids
}
