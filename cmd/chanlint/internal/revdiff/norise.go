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
		out = append(out, rules.Finding{
			Rule:     rules.NoRiseID,
			Severity: block.Severity,
			Range:    r.DefRange,
			Reach:    r.Name,
			Event:    ev.Name,
			HasSpan:  true, FromStation: from, ToStation: to,
			HasValue: true, Value: worst, Limit: limit, Unit: u,
			Message: "the water surface rises " + numfmt.Num(worst) + " " + u + " over the existing model's (most at station " +
				numfmt.Num(at) + " " + u + "), more than the " + numfmt.Num(limit) + " " + u + " allowed",
			Remedy:    "restore the conveyance where the surface rises, or compensate elsewhere, until the rise is at most " + numfmt.Num(limit) + " " + u,
			Reference: policies.Cite(pol, block),
		})
	}
	return out
}

// riseSpan is the span over which the rise exceeds limit, its ends
// interpolated linearly between the compared points, the largest rise
// and its station. A reach that exceeds the limit in several stretches
// gets one span from the first crossing to the last.
func riseSpan(p *Profile, limit float64) (from, to, worst, at float64, found bool) {
	rise := func(i int) float64 { return p.NewWSE[i] - p.OldWSE[i] }
	for i := range p.Stations {
		r := rise(i)
		if !(r > limit) {
			continue
		}
		x := p.Stations[i]
		if !found {
			from = x
			if i > 0 {
				from = cross(p.Stations[i-1], rise(i-1), x, r, limit)
			}
			found, worst, at = true, r, x
		}
		to = x
		if i+1 < len(p.Stations) && !(rise(i+1) > limit) {
			to = cross(x, r, p.Stations[i+1], rise(i+1), limit)
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
