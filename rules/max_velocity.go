package rules

import (
	"strconv"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
)

var maxVelocityRule = &Rule{
	RuleSpec: policies.RuleSpec{
		ID:       "max_velocity",
		Severity: policies.Error,
		Settings: []policies.Setting{
			{Name: "limit", Kind: policies.PerLining, Quantity: policies.Velocity, Bounds: policies.Above(0),
				Required: true, Doc: "the permissible velocity by lining word"},
			{Name: "velocity", Kind: policies.Choice, Choices: []string{"highest_zone", "mean"},
				Doc: "the velocity held to the limit in a points section: the highest zone of the conveyance split, or the section mean Q/A"},
			pointsSetting,
		},
	},
	Title: "Velocity above the permissible velocity of the lining",
	Doc: Doc{
		Checks: `at every computed point, the velocity where it is highest
against the permissible (non-eroding) velocity the policy sets for the
lining word of the section there: the mean velocity Q/A in a section of one
subdivision, and in a points section with overbanks the highest of the
main-channel and overbank velocities from the conveyance split (the main
channel nearly always: the overbanks are shallow and rough, so the section
mean understates the velocity on the channel bed). Contiguous failing
points of one reach and section merge into one span, whose ends are located
between computed points where the velocity crosses the limit; the finding
gives the highest velocity of the span and its limit.`,
		Formula: `    V = Q / A                           one subdivision
    V_i = Q · K_i / (K · A_i)           zone i of a points section
                                        (K_i its conveyance, K = Σ K_i)
    fails where max_i V_i > limit(lining)
limit(lining) is the policy's value for that lining word, else its
"default"; a point whose lining has no value and no default is not checked.
A closed conduit (circle, box) is held only to a value its lining word has
in the table: the default is written for erodible channels, and a pipe or
box barrel has no erosion limit unless the policy names one. With
velocity = "mean" the section mean Q/A is compared everywhere; with
points_sections = "excluded" natural channels are not checked. The zone split is the divided channel method (Chow, Open-Channel
Hydraulics, 1959, ch. 6, from memory).`,
		Basis: `permissible velocities for earth channels after Fortier and Scobey,
"Permissible canal velocities", Trans. ASCE 89 (1926), reproduced in Chow,
Open-Channel Hydraulics (1959), Table 7-3 (e.g. fine sand 2.5 ft/s, stiff
clay 5.0 ft/s with colloidal silts); concrete-lined flood channels are
commonly designed to 20–30 ft/s.`,
		Sources: []string{
			"Fortier and Scobey, \"Permissible canal velocities\", Trans. ASCE 89 (1926)",
			"Chow, Open-Channel Hydraulics (1959), Table 7-3",
			"Chow, Open-Channel Hydraulics (1959), ch. 6, divided channel method (from memory)",
		},
		Remedies: `a lining rated for the velocity (riprap, concrete), a flatter
slope (drop structures), a rougher lining that slows the flow, or a wider
section that carries the flow shallower and slower.`,
	},
	Check: checkMaxVelocity,
}

func checkMaxVelocity(ctx *Context, report func(Finding)) {
	checkVelocity(ctx, report, failAbove)
}

// checkVelocity holds the mean velocity of every wet point to the policy's
// limit for its lining: above it (max_velocity) or below it (min_velocity).
// limitSide says which side of a limit fails: a maximum or a minimum.
type limitSide int

const (
	failAbove limitSide = iota + 1 // a maximum: values above it fail
	failBelow                      // a minimum: values below it fail
)

func checkVelocity(ctx *Context, report func(Finding), side limitSide) {
	upper := side == failAbove
	cfg := ctx.Config
	u := ctx.units()
	w := lower
	if upper {
		w = higher
	}
	limits := newLiningLimits(cfg, side)
	zoned := upper && !meanVelocity(cfg) // the highest subdivision's velocity, not the mean
	ctx.scanPoints(func(rr *solver.ReachResult, r *run) bool {
		lim, ok := limits.of(r.sec)
		if !ok {
			return true
		}
		if !upper {
			return above(r.minVel, lim)
		}
		if zoned {
			return below(r.zonedVelocity(rr), lim)
		}
		return below(r.maxVel, lim)
	}, w, func(rr *solver.ReachResult, p *solver.Point, v *verdict) bool {
		lim, ok := limits.at(rr, p)
		if !ok || p.Area <= 0 {
			return false
		}
		vel := p.Velocity
		if zoned {
			vel, _ = highestVelocity(rr, p)
		}
		short := vel - lim
		if !upper {
			short = -short
		}
		if short <= 0 {
			v.short = short // the margin, for locate
			return false
		}
		*v = verdict{value: vel, limit: lim, short: short}
		return true
	}, func(ev *solver.EventResult, rr *solver.ReachResult, s span) {
		p := &rr.Points[s.worst]
		sec := sectionAt(rr, p)
		where := ""
		if zoned {
			if _, zone := highestVelocity(rr, p); zone != "" {
				where = " in the " + zone + " (conveyance split V = Q·K_i/(K·A_i); section mean " + numfmt.Num(p.Velocity) + " " + u.Velocity() + ")"
			}
		}
		msg, remedy := velocityMessage(cfg, sec, s, u, side, where)
		f := spanFinding(ev, rr, s, msg, remedy)
		f.Unit = u.Velocity()
		f.Focus = sec.At("lining") // the limit is the lining's
		report(f)
	})
}

// zoneNames are the subdivisions of a points section, by solver zone.
var zoneNames = [3]string{"left overbank", "main channel", "right overbank"}

// highestVelocity is the velocity a permissible-velocity limit is held to
// at a point: in a points section the highest of its subdivisions by the
// conveyance split V_i = Q·K_i/(K·A_i) (divided channel method, Chow 1959,
// ch. 6), with the zone's name; elsewhere the mean velocity Q/A and "".
func highestVelocity(rr *solver.ReachResult, p *solver.Point) (float64, string) {
	z, ok := rr.Zones(p)
	if !ok {
		return p.Velocity, ""
	}
	v, at := z.Max()
	return v, zoneNames[at]
}

// meanVelocity reports whether the policy holds max_velocity to the
// section mean velocity instead of the highest subdivision's.
func meanVelocity(cfg *policies.RuleConfig) bool { return cfg.Word("velocity") == "mean" }

// pointsSetting lets a policy keep natural channels (points sections) out
// of a lining table written for built channels.
var pointsSetting = policies.Setting{Name: "points_sections", Kind: policies.Choice, Choices: []string{"checked", "excluded"},
	Doc: "whether points sections (natural channels) are held to the lining table"}

// liningLimits looks up the policy's by-lining limit of computed points,
// remembering the last section's limit: consecutive points nearly always
// share a section, so the map is consulted once per section run.
//
// Two kinds of section get no limit from the table's default: closed
// conduits, for an erosion limit (max_velocity, shear_stress), unless the
// table names their lining (a pipe or box is not the erodible soil a
// default is written for); and points sections when the policy excludes
// them (points_sections = "excluded").
type liningLimits struct {
	table        policies.ByLining
	conduitNamed bool // closed conduits only by a named lining
	noPoints     bool // points sections are not checked
	// vegetatedNamed: grass and natural linings only by a named lining
	// (min_velocity: a default never applies to them).
	vegetatedNamed bool
	sec            *model.Section
	lim            float64
	ok             bool
}

// newLiningLimits reads the limit table of a rule block; failAbove for
// the rules that limit erosion (max_velocity, shear_stress), failBelow for
// the self-cleansing minimum.
func newLiningLimits(cfg *policies.RuleConfig, side limitSide) *liningLimits {
	erosion := side == failAbove
	return &liningLimits{table: cfg.Table("limit"), conduitNamed: erosion,
		noPoints: cfg.Word("points_sections") == "excluded", vegetatedNamed: !erosion}
}

// at is the limit at a wet computed point; false where the point is dry or
// no limit applies to its lining.
func (l *liningLimits) at(rr *solver.ReachResult, p *solver.Point) (float64, bool) {
	if p.Depth <= 0 {
		return 0, false
	}
	return l.of(sectionAt(rr, p))
}

// of is the limit in a section; false where none applies to its lining
// (or there is no section).
func (l *liningLimits) of(sec *model.Section) (float64, bool) {
	if sec == nil {
		return 0, false
	}
	if sec != l.sec {
		l.sec = sec
		l.lim, l.ok = l.table.For(sec.Lining)
		if _, named := l.table.Values[sec.Lining]; !named &&
			(l.conduitNamed && sec.Closed() || l.vegetatedNamed && vegetated(sec.Lining)) {
			l.ok = false
		}
		if l.noPoints && sec.Shape == model.Points {
			l.ok = false
		}
	}
	return l.lim, l.ok
}

// vegetated reports whether a lining word names a grassed or natural
// channel, where deposits and growth are the channel's nature and a
// self-cleansing velocity applies only where the policy names the lining.
func vegetated(lining string) bool { return lining == "grass" || lining == "natural" }

func velocityMessage(cfg *policies.RuleConfig, sec *model.Section, s span, u model.Units, side limitSide, where string) (msg, remedy string) {
	upper := side == failAbove
	vu := u.Velocity()
	val, lim := numfmt.Pair(s.value, s.limit)
	for_ := liningText(cfg, sec)
	if upper {
		return "velocity " + val + " " + vu + where + " exceeds " + lim + " " + vu + " for " + for_,
			"a lining rated for at least " + practicalUp(s.value, velocityStep, u) + " " + vu + " would meet the limit, " +
				"or reduce velocity (flatter slope, rougher or wider section)"
	}
	return "velocity " + val + " " + vu + " is below the self-cleansing " + lim + " " + vu + " for " + for_,
		"sediment may deposit here: raise the velocity at this flow (steeper grade, narrower or smoother section, a low-flow channel) " +
			"or plan for cleaning"
}

// liningText names what a by-lining limit was taken for: the lining word
// when the policy lists it, else the policy's default.
func liningText(cfg *policies.RuleConfig, sec *model.Section) string {
	if _, ok := cfg.Table("limit").Values[sec.Lining]; ok {
		var buf [64]byte
		return "lining " + string(strconv.AppendQuote(buf[:0], sec.Lining))
	}
	if sec.Lining != "" {
		var buf [64]byte
		return "lining " + string(strconv.AppendQuote(buf[:0], sec.Lining)) + " (unlisted: the policy's default applied)"
	}
	return "a section without a lining word (the policy's default applied)"
}
