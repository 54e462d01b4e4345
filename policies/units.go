package policies

import (
	"maps"
	"slices"

	"github.com/chanlint/chanlint/model"
)

// Conversion factors from US customary to SI units.
const (
	// MetresPerFoot is exact by definition (international foot, 1959).
	MetresPerFoot = 0.3048
	// PascalsPerPSF converts lbf/ft² to N/m²: 1 lbf = 4.4482216152605 N
	// exactly (0.45359237 kg × 9.80665 m/s²) and 1 ft² = 0.09290304 m²
	// exactly, so 1 lbf/ft² = 47.880259 Pa. Source: NIST SP 811 (2008),
	// Appendix B.
	PascalsPerPSF = 4.4482216152605 / 0.09290304
)

// In returns a deep copy of p with every length, velocity and stress
// expressed in u: lengths ft↔m, velocities ft/s↔m/s, shear stresses
// lb/ft²↔N/m². Froude numbers, fractions and coefficients do not change.
func (p *Policy) In(u model.Units) *Policy {
	c := p.clone()
	if p.Units == u || (u != model.SI && u != model.US) {
		return c
	}
	c.Units = u
	for _, rc := range c.Rules {
		for _, b := range rc.Blocks() {
			b.convert(u)
		}
	}
	return c
}

// convert rescales the values of rc, a deep copy, to u from the other unit
// system, by the quantity of each setting of its spec.
func (rc *RuleConfig) convert(u model.Units) {
	if len(rc.Values) > 0 && rc.Spec == nil {
		panic("policies: a rule config with values but no spec cannot be converted: " + rc.Rule)
	}
	for name, v := range rc.Values {
		s := rc.Spec.Setting(name)
		if s == nil {
			continue
		}
		f := s.Quantity.factor() // SI → US
		if u == model.SI {
			f = 1 / f
		}
		if f == 1 {
			continue
		}
		v.Number *= f
		v.Table.Default *= f
		for k := range v.Table.Values {
			v.Table.Values[k] *= f
		}
		rc.Values[name] = v
	}
}

// clone is a deep copy of p.
func (p *Policy) clone() *Policy {
	c := *p
	c.Chain = slices.Clone(p.Chain)
	c.Approvals = slices.Clone(p.Approvals)
	c.WaiveAlwaysOn = slices.Clone(p.WaiveAlwaysOn)
	c.Rules = make(map[string]*RuleConfig, len(p.Rules))
	for id, rc := range p.Rules {
		c.Rules[id] = rc.clone()
	}
	return &c
}

func (rc *RuleConfig) clone() *RuleConfig {
	c := *rc
	c.More = nil
	for _, b := range rc.More {
		c.More = append(c.More, b.clone())
	}
	c.Events = slices.Clone(rc.Events)
	c.Select.EventClasses = slices.Clone(rc.Select.EventClasses)
	c.Select.ReachClasses = slices.Clone(rc.Select.ReachClasses)
	c.Select.Shapes = slices.Clone(rc.Select.Shapes)
	c.Select.Linings = slices.Clone(rc.Select.Linings)
	c.Attrs = maps.Clone(rc.Attrs)
	c.Values = make(map[string]Value, len(rc.Values))
	for name, v := range rc.Values {
		v.Bands = slices.Clone(v.Bands)
		v.Table.Values = maps.Clone(v.Table.Values)
		v.Table.NoLimit = maps.Clone(v.Table.NoLimit)
		c.Values[name] = v
	}
	return &c
}

// merge applies a child file on top of its effective parent: the parent is
// converted to the child's units, the blocks a child writes for a rule
// replace every block of that rule in the parent (enabled = false removes
// them), and the child's top-level attributes override the parent's where
// written.
func merge(parent *Policy, o *own) *Policy {
	out := parent.In(o.policy.Units)
	child := o.policy
	out.Name, out.Units, out.File, out.DefRange = child.Name, child.Units, child.File, child.DefRange
	if o.hasReference {
		out.Reference = child.Reference
	}
	if o.hasVersion {
		out.Version = child.Version
	}
	if o.hasExceptions {
		out.Exceptions = child.Exceptions
	}
	if o.hasWaive {
		out.WaiveAlwaysOn = slices.Clone(child.WaiveAlwaysOn)
	}
	for id := range o.disabled {
		delete(out.Rules, id)
	}
	for id, rc := range child.Rules {
		out.Rules[id] = rc
	}
	out.Chain = append(slices.Clone(child.Chain), parent.Chain...)
	return out
}
