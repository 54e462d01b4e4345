package rules

import (
	"math"

	"github.com/chanlint/chanlint/model"
)

// piece is a stretch of a reach with one section: the reach's own, or a
// segment's. Geometric rules (side slopes, bottom width, bed slope) judge
// pieces rather than computed points, since nothing of theirs depends on
// the flow.
type piece struct {
	from, to float64
	sec      *model.Section
	src      *model.Src // the block a designer edits: the segment, else the reach
}

// pieces splits a reach into the stretches of its sections, in station
// order; gaps between segments carry the reach's own section.
func pieces(r *model.Reach) []piece {
	var out []piece
	at := 0.0
	for _, s := range r.Segments {
		if s.FromStation > at {
			out = append(out, piece{at, s.FromStation, r.Section, &r.Src})
		}
		out = append(out, piece{s.FromStation, s.ToStation, s.Section, &s.Src})
		at = max(at, s.ToStation)
	}
	if at < r.Length || len(out) == 0 {
		out = append(out, piece{at, r.Length, r.Section, &r.Src})
	}
	return out
}

// selectedReaches calls fn once for every reach of the model that the
// running block applies to for at least one event of the model (a
// geometric criterion does not depend on the event, but a block selects
// reaches and events together).
func (c *Context) selectedReaches(fn func(r *model.Reach)) {
	if c.Model == nil {
		return
	}
	for _, r := range c.Model.Reaches {
		if r == nil {
			continue
		}
		for _, ev := range c.Model.Events {
			if ev != nil && (c.Config == nil || c.eventSelected(ev)) && c.Selects(ev, r) {
				fn(r)
				break
			}
		}
	}
}

// pieceFinding is a finding over a piece of a reach, without an event.
func pieceFinding(r *model.Reach, p piece, value, limit float64, msg, remedy string) Finding {
	return Finding{
		Message: msg, Remedy: remedy,
		Range: p.src.DefRange, Reach: r.Name,
		FromStation: p.from, ToStation: p.to, HasSpan: true,
		Value: value, Limit: limit, HasValue: true,
	}
}

// steepestBank is a section's steepest side as horizontal per vertical
// and the attribute that sets it; ok is false for a closed conduit, which
// has no banks. A rectangle's walls are vertical (0); a points section's
// steepest side is the steepest of its lines between points.
func steepestBank(s *model.Section) (z float64, attr string, ok bool) {
	switch s.Shape {
	case model.Trapezoid, model.Triangle:
		return s.SideSlope, "side_slope", true
	case model.Rectangle:
		return 0, "shape", true
	case model.Points:
		z = math.Inf(1)
		for i := 1; i < len(s.Points); i++ {
			dx, dy := math.Abs(s.Points[i].Offset-s.Points[i-1].Offset), math.Abs(s.Points[i].Elevation-s.Points[i-1].Elevation)
			if dy > 0 {
				z = min(z, dx/dy)
			}
		}
		if math.IsInf(z, 1) {
			return 0, "", false // a flat section has no bank
		}
		return z, "points", true
	}
	return 0, "", false
}
