// Package policies is the policy language of chanlint: local design
// criteria in HCL (*.policy.hcl), the built-in packs embedded in the binary,
// `extends` merging and conversion of every setting to a model's units.
package policies

import (
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/hashicorp/hcl/v2"
)

// Severity of a finding.
type Severity string

const (
	Error   Severity = "error"
	Warning Severity = "warning"
	Info    Severity = "info"
)

// Rank orders severities: info 1, warning 2, error 3; anything else 0.
func (s Severity) Rank() int {
	switch s {
	case Info:
		return 1
	case Warning:
		return 2
	case Error:
		return 3
	}
	return 0
}

// ByLining is a limit that may depend on a section's lining word.
// A bare number in the policy sets Default only. A lining written as
// `null` in the policy has no limit (NoLimit), whatever the default.
type ByLining struct {
	Values     map[string]float64 // lining word → limit
	Default    float64
	HasDefault bool
	NoLimit    map[string]bool // lining words exempt from the limit
}

// For returns the limit for a lining and whether one applies.
func (b ByLining) For(lining string) (float64, bool) {
	if v, ok := b.Values[lining]; ok {
		return v, true
	}
	if b.NoLimit[lining] {
		return 0, false
	}
	return b.Default, b.HasDefault
}

// Band is a closed interval [Low, High].
type Band struct{ Low, High float64 }

// Contains reports whether Low ≤ x ≤ High.
func (b Band) Contains(x float64) bool { return x >= b.Low && x <= b.High }

// RuleConfig is one rule block of the effective policy. Its settings are
// those its Spec declares, by name; lengths, velocities and stresses are in
// the units of Policy.Units.
type RuleConfig struct {
	Rule     string
	Spec     *RuleSpec // the rule's spec; nil only in hand-made configs
	Severity Severity  // as written, else the rule's default
	Events   []string  // nil: every event
	// Select is the block's selector on events and reaches besides names.
	Select Selector
	// Section is the block's reference into the policy's manual
	// (`section`, e.g. "5.3.2"); "" when not written.
	Section string
	// More holds the rule's other blocks, each with its own selector;
	// Blocks lists them all and Resolve picks the one that applies. Set
	// on the block held in Policy.Rules only.
	More     []*RuleConfig
	File     string // policy file (or "pack:NAME") the block came from
	DefRange hcl.Range
	// Attrs holds the value range of every attribute written in the block,
	// by attribute name, so a report can point at the limit it applied.
	Attrs map[string]hcl.Range
	// Values holds the settings by name: every Number setting (written or
	// defaulted) and the PerLining and FroudeBands settings written.
	Values map[string]Value
}

// Value is the value of one setting; the field its Kind names is set.
type Value struct {
	Number float64  // Number
	Table  ByLining // PerLining
	Bands  []Band   // FroudeBands, sorted by Low
	Word   string   // Choice
}

// Number is the value of a Number setting: as written, else the spec's
// default (0 without a spec).
func (c *RuleConfig) Number(name string) float64 {
	if v, ok := c.Values[name]; ok {
		return v.Number
	}
	if c.Spec != nil {
		if s := c.Spec.Setting(name); s != nil {
			return s.Default
		}
	}
	return 0
}

// Word is the value of a Choice setting: as written, else the spec's
// default (its first choice; "" without a spec).
func (c *RuleConfig) Word(name string) string {
	if v, ok := c.Values[name]; ok && v.Word != "" {
		return v.Word
	}
	if c.Spec != nil {
		if s := c.Spec.Setting(name); s != nil && s.Kind == Choice {
			return s.Choices[0]
		}
	}
	return ""
}

// Table is the value of a PerLining setting (empty when not written).
func (c *RuleConfig) Table(name string) ByLining { return c.Values[name].Table }

// Bands is the value of a FroudeBands setting (nil when not written).
func (c *RuleConfig) Bands(name string) []Band { return c.Values[name].Bands }

// AppliesTo reports whether the block applies to an event.
func (c *RuleConfig) AppliesTo(event string) bool {
	if c.Events == nil {
		return true
	}
	for _, e := range c.Events {
		if e == event {
			return true
		}
	}
	return false
}

// Policy is an effective policy after `extends`.
type Policy struct {
	Name      string
	Units     model.Units
	Reference string
	// Version is the version of the manual or pack (`version`); "" when
	// not written.
	Version    string
	Exceptions string // "report" (default), "deny" or "approved"
	// WaiveAlwaysOn lists the always-on rules (e.g. "capacity") whose
	// findings a model's design exception may waive (`waive_always_on`);
	// by default none: a submittal cannot excuse an overtopping channel.
	WaiveAlwaysOn []string
	File          string                 // where it was loaded from ("pack:NAME" for a built-in)
	Chain         []string               // the files and packs merged, child first
	Rules         map[string]*RuleConfig // enabled configurable rules by id
	DefRange      hcl.Range
	// Approvals are the reviewer's accepted exceptions (--approvals), which
	// count under exceptions = "approved"; ApprovalsFile is where they
	// were read from ("" for none).
	Approvals     []Approval
	ApprovalsFile string
}

// Waives reports whether a design exception may waive findings of the
// rule: every configurable rule, and the always-on rules the policy lists
// in WaiveAlwaysOn.
func (p *Policy) Waives(rule string, alwaysOn bool) bool {
	return !alwaysOn || p != nil && slices.Contains(p.WaiveAlwaysOn, rule)
}

// Cite is what a finding from block rc of p cites: the policy's reference,
// its version and the block's section, each where written ("County
// Drainage Criteria Manual, ch. 5 (version 2026.1), section 5.3.2").
func Cite(p *Policy, rc *RuleConfig) string {
	s := p.Reference
	if p.Version != "" {
		s = strings.TrimSpace(s + " (version " + p.Version + ")")
	}
	if rc != nil && rc.Section != "" {
		if s != "" {
			s += ", "
		}
		s += "section " + rc.Section
	}
	return s
}

// Title names the policy with its version: "county-drainage version 2026.1".
func (p *Policy) Title() string {
	if p.Version == "" {
		return p.Name
	}
	return p.Name + " version " + p.Version
}
