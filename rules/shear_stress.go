package rules

import (
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

// unitWeight is the unit weight of water γ = ρ·g: 1000 kg/m³ × 9.80665
// m/s² = 9806.65 N/m³ in SI, and the same weight in US customary units,
// 9806.65 N/m³ × 0.3048 m/ft ÷ 47.880259 (N/m²)/(lb/ft²) = 62.428 lb/ft³
// (the textbook 62.4 rounded), so that an SI and a US model of one
// channel give the same findings.
// Source: common practice (no published source).
func unitWeight(u model.Units) float64 {
	if u == model.US {
		return 9806.65 * policies.MetresPerFoot / policies.PascalsPerPSF
	}
	return 9806.65
}

var shearStressRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "shear_stress",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "limit", Kind: policies.PerLining, Quantity: policies.Stress, Bounds: policies.Above(0),
				Required: true, Doc: "the permissible mean boundary shear stress by lining word"},
		},
	},
	Title: "Boundary shear (tractive) stress above the permissible stress of the lining",
	Doc: Doc{
		Checks: `at every wet computed point, the mean boundary shear
stress of the flow against the permissible shear stress the policy sets for
the lining word of the section there. Contiguous failing points of one
reach and section merge into one span.`,
		Formula: `    τ = γ · R · Sf
γ unit weight of water (9806.65 N/m³; 62.428 lb/ft³), R hydraulic radius,
Sf the friction slope of the computed point (Manning): in uniform flow it
equals the bed slope, and in varied flow it is the slope that actually
drags on the boundary, so it is used rather than the bed slope.
τ is the mean over the wetted perimeter; the local maximum on the bed of a
trapezoid is about γ·y·Sf (larger in bends), so a policy should set its
limits for the mean stress, or with that margin.`,
		SettingsNote: "A point whose lining has no value and no default is not checked.",
		Basis: `the tractive force method (Lane, "Design of stable channels",
Trans. ASCE 120, 1955; Chow, Open-Channel Hydraulics, 1959, ch. 7, from
memory); permissible shear stresses of linings are tabulated in FHWA
HEC-15 (from memory).`,
		Sources: []string{
			"Lane, \"Design of stable channels\", Trans. ASCE 120 (1955) (from memory)",
			"Chow, Open-Channel Hydraulics (1959), ch. 7 (from memory)",
			"FHWA HEC-15, permissible shear stresses of linings (from memory)",
		},
		Remedies: `a lining rated for the stress (riprap of a larger size, turf
reinforcement, concrete), a flatter slope, or a wider and shallower section
(smaller R).`,
	},
	Check: checkShearStress,
}

func checkShearStress(ctx *Context, report func(Finding)) {
	cfg := ctx.Config
	u := ctx.units()
	gamma := unitWeight(u)
	su := stressUnit(u)
	limits := &liningLimits{table: cfg.Table("limit")}
	ctx.scanPoints(higher, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		lim, ok := limits.at(rr, p)
		if !ok || p.HydraulicRadius <= 0 {
			return false
		}
		tau := gamma * p.HydraulicRadius * math.Abs(p.FrictionSlope)
		if tau <= lim {
			return false
		}
		*v = verdict{value: tau, limit: lim, short: tau - lim}
		return true
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		sec := sectionAt(rr, &rr.Points[s.worst])
		val, lim := numPair(s.value, s.limit)
		msg := "boundary shear stress " + val + " " + su + " (γ·R·Sf) exceeds " + lim + " " + su +
			" for " + liningText(cfg, sec)
		f := spanFinding(ev, rr, s, msg, "a lining rated for at least "+numUp(s.value)+" "+su+
			" is needed, or reduce the stress (flatter slope, wider and shallower section)")
		f.Focus = sec.At("lining") // the limit is the lining's
		f.Unit = su
		report(f)
	})
}
