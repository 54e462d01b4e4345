package rules

import "github.com/chanlint/chanlint/policies"

// SensitivityID is the id of the sensitivity block. Its settings drive the
// envelope run of the pipeline (the same model solved over perturbed
// roughness, tailwater and discharge); no single solution can judge it, so
// its Check reports nothing.
const SensitivityID = "sensitivity"

var sensitivityRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       SensitivityID,
		Severity: policies.Warning,
		OptIn:    true,
		Settings: []policies.Setting{
			{Name: "roughness", Kind: policies.Number, Quantity: policies.Ratio, Bounds: policies.Within(0, 0.9),
				Doc: "the share by which every Manning's n is raised and lowered (0.2: n × 0.8 and n × 1.2)"},
			{Name: "tailwater", Kind: policies.Number, Quantity: policies.Length, Bounds: policies.Within(0, 100),
				Doc: "the offset by which the outlet's depth, elevation or normal depth is raised and lowered"},
			{Name: "discharge", Kind: policies.Number, Quantity: policies.Ratio, Bounds: policies.Within(0, 0.9),
				Doc: "the share by which every discharge is raised and lowered (0.1: Q × 0.9 and Q × 1.1)"},
		},
		Together: []policies.Group{{Settings: []string{"roughness", "tailwater", "discharge"}, Need: policies.AtLeastOne,
			Note: "each one given is varied down and up alone, and all of them together in every corner"}},
	},
	Title: "Verdicts that hold when n, the tailwater or the flow is a little off",
	Doc: Doc{
		Checks: `whether each verdict of the other rules holds over a stated
uncertainty of the inputs. The model is solved again for every case of the
envelope: each parameter given is lowered and raised alone (two cases per
parameter), and all of them together in every corner (2^k cases for k
parameters; none when only one is given). Each finding of the nominal
solution then carries a verdict: robust_fail (it fails in every case),
knife_edge (some case passes it; the finding names the parameter that
drives it and the first case that flips it). A criterion that passes in
the nominal solution but fails in some case is reported as a new finding
of its own rule, marked as a sensitivity finding, at this block's
severity. Findings that do not depend on the flow (a model or policy
problem, an unused exception) get no verdict.`,
		Formula: `    n' = n·(1 ± roughness)    Q' = Q·(1 ± discharge)
    outlet' = outlet ± tailwater   (depth, elevation or normal depth;
                                    never below critical depth)
A free outfall (critical-depth outlet) has no tailwater to vary. A finding
of a case matches a nominal finding of the same rule, block, reach and
event when their station spans overlap, or when that rule, block, reach
and event has a single finding in the nominal solution.`,
		Basis: `Manning's n of a lining is known to perhaps ±20 % (Chow,
Open-Channel Hydraulics, 1959, ch. 5 lists ranges of that width for every
lining; from memory), design discharges carry the uncertainty of their
hydrology, and a tailwater is often an assumed stage. A verdict that flips
inside such a range is a judgement for the reviewer, not a pass or fail;
the sizes of the ranges are the reviewer's to choose (common practice, no
published source).`,
		Sources: []string{
			"Chow, Open-Channel Hydraulics (1959), ch. 5, ranges of Manning's n (from memory)",
			"common practice (no published source)",
		},
		Remedies: `for a knife-edge or sensitivity finding, margin: raise the
bank or the lining rating until the finding fails in no case, or settle
the uncertain input (survey the tailwater, calibrate n, confirm the
hydrology).`,
	},
	Check: func(*Context, func(Finding)) {},
}
