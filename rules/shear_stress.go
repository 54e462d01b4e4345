package rules

import (
	"math"
	"sort"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
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
				Required: true, Doc: "the permissible shear stress by lining word"},
			{Name: "quantity", Kind: policies.Choice, Choices: []string{"maximum", "mean"},
				Doc: "the stress held to the limit: the maximum on the bed γ·d·S (as HEC-15's lining tables), or the mean boundary shear γ·R·S for limits defined that way"},
			pointsSetting,
		},
	},
	Title: "Shear stress on the bed above the permissible shear stress of the lining",
	Doc: Doc{
		Checks: `at every wet computed point, the shear stress on the
channel bed against the permissible shear stress the policy sets for the
lining word of the section there. Contiguous failing points of one reach
and section merge into one span; its ends are located between computed
points where the stress crosses the limit.`,
		Formula: `    τd = γ · d · Sf                 maximum shear on the bed, straight reach
    τb = Kb · τd                    in a bend
    Kb = 2.00                                    rc/T ≤ 2
    Kb = 2.38 − 0.206·(rc/T) + 0.0073·(rc/T)²    2 < rc/T < 10
    Kb = 1.05                                    rc/T ≥ 10
γ unit weight of water (9806.65 N/m³; 62.428 lb/ft³), d the maximum depth
of the section (the computed depth, measured from its lowest point), Sf the
friction slope of the point (Manning): in uniform flow it equals the bed
slope, and in varied flow it is the slope that actually drags on the bed,
so it is used rather than the bed slope. rc is the bend's centreline radius
and T the top width.

Why the maximum and not the mean: permissible shear stresses of linings
(grass, riprap, turf reinforcement, soils) are compared in FHWA HEC-15 with
the largest shear on the bed, which lies at the deepest point, γ·d·S, and
not with the mean boundary shear γ·R·S: in a trapezoid R is well below d,
so the mean would understate the stress the lining must resist. A policy
whose limits are defined for the mean stress (the tractive-force values of
Lane's method for earth canals, say) writes quantity = "mean"; then γ·R·Sf
is compared, without a bend factor.

A closed conduit is held only to a value its lining word has in the table
(no erosion limit by default); with points_sections = "excluded" natural
channels are not checked.

Not evaluated: the raised shear HEC-15 carries downstream of a bend (over a
protection length after its end) and the shear on the side slopes (a
fraction of τd for the bed).`,
		SettingsNote: "A point whose lining has no value and no default is not checked.",
		Basis: `Kilgore and Cotton, Design of Roadside Channels with Flexible
Linings, FHWA HEC-15, 3rd edition (2005): τd = γ·d·S (eq. 2.3) and the bend
factor Kb (eq. 3.8) (from memory). It superseded Chen and Cotton's 1988
edition, whose permissible stresses some packs still quote; the tractive
force method for earth canals is Lane, "Design of stable channels", Trans.
ASCE 120 (1955), in Chow, Open-Channel Hydraulics (1959), ch. 7 (from
memory).`,
		Sources: []string{
			"Kilgore and Cotton, Design of Roadside Channels with Flexible Linings, FHWA HEC-15, 3rd ed. (2005), eq. 2.3 and 3.8 (from memory); supersedes Chen and Cotton, HEC-15 (1988)",
			"Lane, \"Design of stable channels\", Trans. ASCE 120 (1955) (from memory)",
			"Chow, Open-Channel Hydraulics (1959), ch. 7 (from memory)",
		},
		Remedies: `a lining rated for the stress (riprap of a larger size, turf
reinforcement, concrete), a flatter slope, or a wider and shallower section
(smaller depth).`,
	},
	Check: checkShearStress,
}

// bendFactor is HEC-15's factor Kb on the bed shear in a bend of
// centreline radius rc and top width t (Kilgore and Cotton, FHWA HEC-15,
// 3rd ed. 2005, eq. 3.8, from memory).
func bendFactor(rc, t float64) float64 {
	if !(t > 0) || !(rc > 0) {
		return 1
	}
	x := rc / t
	switch {
	case x <= 2:
		return 2
	case x >= 10:
		return 1.05
	}
	return 2.38 - 0.206*x + 0.0073*x*x
}

// bendAt is the bend of the reach whose stations hold x, nil outside any
// bend.
func bendAt(r *model.Reach, x float64) *model.Bend {
	for _, b := range r.Bends {
		if b.Radius > 0 && x >= b.FromStation && x <= b.ToStation {
			return b
		}
	}
	return nil
}

// bedShear is the shear the policy's limits are compared with at a point:
// τd = γ·d·Sf times the bend factor, or γ·R·Sf (mean) when mean is true.
func bedShear(gamma float64, r *model.Reach, p *solver.Point, mean bool) (tau, kb float64) {
	sf := math.Abs(p.FrictionSlope)
	if mean {
		return gamma * p.HydraulicRadius * sf, 1
	}
	kb = 1
	if b := bendAt(r, p.Station); b != nil {
		kb = bendFactor(b.Radius, p.TopWidth)
	}
	return kb * gamma * p.Depth * sf, kb
}

func checkShearStress(ctx *Context, report func(Finding)) {
	cfg := ctx.Config
	u := ctx.units()
	gamma := unitWeight(u)
	su := u.Stress()
	mean := shearMean(cfg)
	limits := newLiningLimits(cfg, failAbove)
	judge := func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		lim, ok := limits.at(rr, p)
		if !ok || p.HydraulicRadius <= 0 {
			return false
		}
		tau, kb := bedShear(gamma, rr.Reach, p, mean)
		if tau <= lim {
			v.short = tau - lim // the margin, for locate
			return false
		}
		*v = verdict{value: tau, limit: lim, short: tau - lim}
		if kb != 1 {
			// In a bend, a kind of its own: Kb steps the stress up at the
			// bend's start, so a failing stretch before a bend and one in
			// it are two spans, each located to where its own criterion is
			// crossed, not one over a passing stretch between them that no
			// computed point may show.
			v.kind = 1
		}
		return true
	}
	emitShear := func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		s.from, s.to = snapToBends(rr.Reach, s.from), snapToBends(rr.Reach, s.to)
		p := &rr.Points[s.worst]
		sec := sectionAt(rr, p)
		val, lim := numfmt.Pair(s.value, s.limit)
		_, kb := bedShear(gamma, rr.Reach, p, mean)
		lu := u.Length()
		var what string
		switch {
		case mean:
			what = "mean boundary shear stress " + val + " " + su + " (γ·R·Sf, as the policy asks)"
		case kb != 1:
			what = "shear stress on the bed in the bend " + val + " " + su + " (τb = Kb·γ·d·Sf, Kb " + numfmt.Num(kb) +
				", d the maximum depth " + numfmt.Num(p.Depth) + " " + lu + ")"
		default:
			what = "shear stress on the bed " + val + " " + su + " (τd = γ·d·Sf, d the maximum depth " + numfmt.Num(p.Depth) + " " + lu + ")"
		}
		msg := what + " exceeds " + lim + " " + su + " for " + liningText(cfg, sec)
		f := spanFinding(ev, rr, s, msg, "a lining rated for at least "+practicalUp(s.value, stressStep, u)+" "+su+
			" would meet the limit, or reduce the stress (flatter slope, wider and shallower section)")
		f.Focus = sec.At("lining") // the limit is the lining's
		f.Unit = su
		report(f)
	}
	ctx.scanPointsThen(func(rr *solver.ReachResult, r *run) bool {
		lim, ok := limits.of(r.sec)
		if !ok {
			return true
		}
		if mean {
			return below(gamma*r.maxRSf, lim)
		}
		kb := 1.0
		if r.inBend {
			kb = 2 // the largest bend factor (bendFactor)
		}
		return below(kb*gamma*r.maxDSf, lim)
	}, higher, judge, func(rr *solver.ReachResult, spans []span) []span {
		if mean {
			return spans // no bend factor: the criterion is continuous
		}
		return bendEdgeSpans(rr, judge, spans, &ctx.verdict, &ctx.trial)
	}, emitShear)
}

// shearMean reports whether the policy compares its limits with the mean
// boundary shear γ·R·Sf instead of the maximum on the bed.
func shearMean(cfg *policies.RuleConfig) bool { return cfg.Word("quantity") == "mean" }

// snapToBends puts a span end that locate bracketed to within locateTol of
// a bend's end exactly on it: where the straight channel and the bend
// both fail, the two spans meet at the bend end, which the bracketing
// finds only to its tolerance.
func snapToBends(r *model.Reach, x float64) float64 {
	for _, b := range r.Bends {
		for _, e := range [2]float64{b.FromStation, b.ToStation} {
			if math.Abs(x-e) <= locateTol(e) {
				return e
			}
		}
	}
	return x
}

// bendEdgeSpans appends to spans the failing stretches next to a bend end
// that no computed point shows: the bend factor steps the stress at a bend
// end, so a stretch on one side of it may fail while the computed points
// on that side pass (the nearest one is beyond the stretch) and the span
// on the other side, a kind of its own, stops at the end. Each side of
// every bend end inside the reach is judged 2·locateTol from the end; a
// failing side that no span covers becomes a span from the end to where
// its criterion is crossed, bracketed by bisection.
func bendEdgeSpans(rr *solver.ReachResult, judge judgeFunc, spans []span, v *verdict, trial *solver.Point) []span {
	pts := rr.Points
	if len(rr.Reach.Bends) == 0 || len(pts) < 2 {
		return spans
	}
	found := len(spans)
	coveredAt := func(x float64, kind int) bool {
		for _, s := range spans[:found] {
			if s.kind == kind && x >= s.from-locateTol(x) && x <= s.to+locateTol(x) {
				return true
			}
		}
		return false
	}
	for _, b := range rr.Reach.Bends {
		for _, e := range [2]float64{b.FromStation, b.ToStation} {
			d := 2 * locateTol(e)
			for _, side := range [2]float64{-1, 1} {
				x := e + side*d
				// The computed points around x (a bend end is often a
				// computed point itself, judged with the bend's side).
				i := sort.Search(len(pts), func(j int) bool { return pts[j].Station > x }) - 1
				if i < 0 || i+1 >= len(pts) || !(x > pts[i].Station && x < pts[i+1].Station) {
					continue // a computed point lies that close: scan judged it
				}
				p, _, ok := rr.Between(i, x)
				if !ok {
					continue
				}
				*trial = p
				if !judge(rr, trial, v) {
					continue
				}
				kind, first := v.kind, *v
				if coveredAt(x, kind) {
					continue
				}
				// Bisect from x away from the end, toward the computed point
				// on that side, for the crossing.
				o := i
				if side > 0 {
					o = i + 1
				}
				fail, pass := x, pts[o].Station
				worst := first
				for n := 0; n < locateMaxIter && math.Abs(fail-pass) > locateTol(pass); n++ {
					m := fail + (pass-fail)/2
					q, _, ok := rr.Between(i, m)
					if !ok {
						break
					}
					*trial = q
					if judge(rr, trial, v) && v.kind == kind {
						fail = m
						if v.short > worst.short {
							worst = *v
						}
					} else {
						pass = m
					}
				}
				s := span{first: o, last: o, worst: o, value: worst.value, limit: worst.limit, short: worst.short,
					kind: kind, block: reachBlock(rr, &p)}
				if side > 0 {
					s.from, s.to = e, max(e, fail)
				} else {
					s.from, s.to = min(e, fail), e
				}
				spans = append(spans, s)
			}
		}
	}
	return spans
}
