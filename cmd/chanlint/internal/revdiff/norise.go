package revdiff

import (
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// noRise judges the no_rise criterion of pol on the compared profiles:
// one finding per reach and event whose proposed water surface rises more
// than the limit over the existing one, over the span where it does.
func noRise(m *model.Model, profiles []Profile, old, new *solver.Result, pol *policies.Policy) []rules.Finding {
	pol = rules.PolicyFor(m, pol)
	head := pol.Rules[rules.NoRiseID]
	if head == nil {
		return nil
	}
	events := map[string]*model.Event{}
	for _, ev := range m.Events {
		events[ev.Name] = ev
	}
	reaches := map[string]*model.Reach{}
	for _, r := range m.Reaches {
		reaches[r.Name] = r
	}
	var out []rules.Finding
	for i := range profiles {
		p := &profiles[i]
		ev, r := events[p.Event], reaches[p.Reach]
		if ev == nil || r == nil || p.Compared == 0 {
			continue
		}
		block := head.Resolve(ev, r)
		if block == nil {
			continue
		}
		limit := block.Number("limit")
		from, to, worst, at, found := riseSpan(p, limit)
		if !found {
			continue
		}
		u := m.Units.Length()
		msg := "the water surface rises " + numfmt.Num(worst) + " " + u + " over the existing model's (most at station " +
			numfmt.Num(at) + " " + u + "), more than the " + numfmt.Num(limit) + " " + u + " allowed"
		for j := range p.Jumps {
			mv := &p.Jumps[j]
			if lo, hi := mv.Span(); mv.Kind == JumpMoved && !mv.Numerical && mv.Distance < 0 && mv.Surface.Delta > limit && lo <= to && hi >= from {
				msg += "; over " + numfmt.Span(lo, hi) + " " + u + " the rise is the hydraulic jump's move " + numfmt.Num(-mv.Distance) + " " + u +
					" upstream (its toe from " + numfmt.Num(mv.From) + " to " + numfmt.Num(mv.To) + " " + u + "), beyond the solver's toe-location tolerance of " +
					numfmt.Num(mv.Tolerance) + " " + u
			}
		}
		out = append(out, rules.Finding{
			Rule:     rules.NoRiseID,
			Severity: block.Severity,
			Range:    r.DefRange,
			Reach:    r.Name,
			Event:    ev.Name,
			HasSpan:  true, FromStation: from, ToStation: to,
			HasValue: true, Value: worst, Limit: limit, Unit: u,
			Message:   msg,
			Remedy:    "restore the conveyance where the surface rises, or compensate elsewhere, until the rise is at most " + numfmt.Num(limit) + " " + u,
			Reference: policies.Cite(pol, block),
		})
	}
	return out
}

// riseSpan is the span over which the rise exceeds limit, its ends
// interpolated linearly between the compared points, the largest rise
// and its station. A reach that exceeds the limit in several stretches
// gets one span from the first crossing to the last. The points between
// the toes of a jump whose move is within the solver's toe-location
// tolerance (JumpMove.Numerical) are left out, as if not computed: the
// difference there is a move of the computation; those of a larger move
// count, since the surface there does rise.
func riseSpan(p *Profile, limit float64) (from, to, worst, at float64, found bool) {
	var xs, rs []float64
	var ms []int
	for i := range p.Stations {
		a := -1
		if i < len(p.Across) {
			a = p.Across[i]
		}
		if a >= 0 && p.Jumps[a].Numerical {
			continue
		}
		xs, rs, ms = append(xs, p.Stations[i]), append(rs, p.NewWSE[i]-p.OldWSE[i]), append(ms, a)
	}
	// The end of the span between points i and i+1: at the toe between
	// them where one lies across a moved jump and the other does not (the
	// surface steps there), else where the rise interpolates to limit.
	end := func(i int) float64 {
		if ms[i] != ms[i+1] {
			for _, k := range []int{ms[i], ms[i+1]} {
				if k < 0 {
					continue
				}
				for _, t := range []float64{p.Jumps[k].From, p.Jumps[k].To} {
					if t >= xs[i] && t <= xs[i+1] {
						return t
					}
				}
			}
		}
		return cross(xs[i], rs[i], xs[i+1], rs[i+1], limit)
	}
	for i, x := range xs {
		r := rs[i]
		if !(r > limit) {
			continue
		}
		if !found {
			from = x
			if i > 0 {
				from = end(i - 1)
			}
			found, worst, at = true, r, x
		}
		to = x
		if i+1 < len(xs) && !(rs[i+1] > limit) {
			to = end(i)
		}
		if r > worst {
			worst, at = r, x
		}
	}
	return from, to, worst, at, found
}

// cross is the station between (x0, r0) and (x1, r1) where the linear
// interpolation of the rise equals limit.
func cross(x0, r0, x1, r1, limit float64) float64 {
	if r1 == r0 || x1 == x0 {
		return x1
	}
	t := (limit - r0) / (r1 - r0)
	return x0 + math.Min(1, math.Max(0, t))*(x1-x0)
}
