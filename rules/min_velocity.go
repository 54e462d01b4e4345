package rules

import "github.com/chanlint/chanlint/policies"

var minVelocityRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:          "min_velocity",
		Severity:    policies.Warning,
		NeedsEvents: true,
		Settings: []policies.Setting{
			{Name: "limit", Kind: policies.PerLining, Quantity: policies.Velocity, Bounds: policies.Above(0),
				Required: true, Doc: "the self-cleansing mean velocity by lining word", Below: "max_velocity.limit"},
			pointsSetting,
		},
	},
	Title: "Mean velocity below the self-cleansing velocity",
	Doc: Doc{
		Checks: `at every wet computed point, the mean velocity V = Q/A
against the minimum (self-cleansing) velocity the policy sets for the
lining word of the section there. Contiguous failing points of one reach
and section merge into one span; the finding gives the lowest velocity of
the span and its limit.`,
		Formula: `    V = Q / A;  fails where V < limit(lining)
A point whose lining has no value and no default is not checked; nor is a
dry point (depth or flow area zero).

Partly full conduits: the actual mean velocity of the event is checked,
in open channels and in closed conduits alike, whether the conduit runs
partly full or full. The event's discharge is the flow whose deposits
matter, and below half depth a circular conduit runs slower than full, so
the full-bore velocity would flatter it. A policy that wants the full-bore
criterion sets its limit for that design flow event only (events = [...]).`,
		Basis: `2 ft/s (0.6 m/s) flowing full is the usual self-cleansing
minimum for sewers (ASCE Manual of Practice 37, with WEF; from memory);
Chow, Open-Channel Hydraulics (1959), §7-3, gives 2–3 ft/s where the silt
load is small and about 2.5 ft/s to keep vegetation down (from memory);
storm drains are often held to 3 ft/s (0.9 m/s) (FHWA HEC-22, from
memory).`,
		Sources: []string{
			"ASCE Manual of Practice 37 / WEF, Design and Construction of Sanitary and Storm Sewers (from memory)",
			"Chow, Open-Channel Hydraulics (1959), §7-3 (from memory)",
			"FHWA HEC-22, Urban Drainage Design Manual (from memory)",
		},
		Remedies: `a steeper grade, a narrower or smoother section, a low-flow
channel (trickle channel) inside a wide section, or a maintenance plan for
removing deposits.`,
	},
	Check: func(ctx *Context, report func(Finding)) { checkVelocity(ctx, report, failBelow) },
}
