// Package policies is the policy language of chanlint: local design
// criteria in HCL (*.policy.hcl), the built-in packs embedded in the binary,
// `extends` merging and conversion of every setting to a model's units.
package policies

import (
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

// RuleConfig is one rule block of the effective policy. Which settings are
// meaningful depends on the rule; lengths, velocities and stresses are in
// the units of Policy.Units.
type RuleConfig struct {
	Rule     string
	Severity Severity // as written, else the rule's default
	Events   []string // nil: every event
	File     string   // policy file (or "pack:NAME") the block came from
	DefRange hcl.Range
	// Attrs holds the value range of every attribute written in the block,
	// by attribute name, so a report can point at the limit it applied.
	Attrs map[string]hcl.Range

	Minimum  float64  // freeboard.minimum, superelevation.minimum (length)
	Fraction float64  // freeboard.fraction (of flow depth)
	Limit    ByLining // max_velocity, min_velocity (velocity); shear_stress (stress)
	Avoid    []Band   // froude_band, jump_type (Froude numbers)
	// superelevation: coefficient C in Δy = C·V²·T/(g·rc), for subcritical
	// and for supercritical flow.
	SubcriticalCoefficient   float64
	SupercriticalCoefficient float64
}

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
	Name       string
	Units      model.Units
	Reference  string
	Exceptions string                 // "report" (default) or "deny"
	File       string                 // where it was loaded from ("pack:NAME" for a built-in)
	Chain      []string               // the files and packs merged, child first
	Rules      map[string]*RuleConfig // enabled configurable rules by id
	DefRange   hcl.Range
}
