package rules

import (
	"strconv"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// eachCulvert calls fn for every culvert result with flow in the events
// the rule runs on.
func (c *Context) eachCulvert(fn func(ev *solver.EventResult, cr *solver.CulvertResult)) {
	for ev := range c.events() {
		for _, cr := range ev.Culverts {
			if cr == nil || cr.Culvert == nil || cr.OutletMethod == solver.OutletNoFlow ||
				!numfmt.Finite(cr.Headwater, cr.HWD, cr.BarrelFlow, cr.RoadFlow, cr.RoadDepth, cr.OutletVelocity) {
				continue
			}
			fn(ev, cr)
		}
	}
}

// culvertFinding starts a finding at a culvert block for one event, at a
// station of its barrel (0 at the inlet, the length at the outlet).
func culvertFinding(ev *solver.EventResult, cr *solver.CulvertResult, station float64) Finding {
	c := cr.Culvert
	return Finding{Range: c.DefRange, Reach: c.ReachName, Event: ev.Event.Name,
		FromStation: station, ToStation: station, HasSpan: true, HasValue: true}
}

// culvertName is `culvert "NAME"` for messages.
func culvertName(c *model.Culvert) string {
	var buf [80]byte
	return "culvert " + string(strconv.AppendQuote(buf[:0], c.Name))
}
