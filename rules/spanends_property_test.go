package rules

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
	"pgregory.net/rapid"
)

// valueAt is the flow at station x of rr: a computed point there, or one
// standard step from the point before (Between); ok is false where
// neither applies (a station off the reach, a result built by hand).
func valueAt(rr *solver.ReachResult, x float64) (solver.Point, bool) {
	pts := rr.Points
	for i := 0; i+1 < len(pts); i++ {
		if x > pts[i].Station && x < pts[i+1].Station {
			p, _, ok := rr.Between(i, x)
			return p, ok
		}
	}
	return solver.Point{}, false
}

// TestSpanEndsAtTheirCrossing: every span of every finding lies within its
// reach, and where a max_velocity or freeboard span ends between two
// computed points, the limit is crossed there: the flow 2 mm inside the
// span fails and 2 mm outside it passes (the ends are bracketed to 1 mm).
//
// Source: common practice (no published source): a span reports where a
// limit is exceeded; the velocity V = Q/A (continuity) and the freeboard
// invert + height − WSE against max(minimum, fraction × depth) are
// recomputed here from the flow at the station.
func TestSpanEndsAtTheirCrossing(t *testing.T) {
	pol := baselinePack(t)
	vlim := pol.Rules["max_velocity"].Table("limit")
	fb := pol.Rules["freeboard"]
	minimum, fraction := fb.Number("minimum"), fb.Number("fraction")
	rapid.Check(t, func(t *rapid.T) {
		c := drawUnitCase(t)
		src := c.text(model.SI)
		res, fs := checkText(t, src, pol)
		for _, f := range fs {
			if !f.HasSpan || f.Reach == "" {
				continue
			}
			rrs := reachesOf(res, findingKey{f.Rule, f.Reach, f.Event})
			if len(rrs) == 0 {
				continue
			}
			rr := rrs[0]
			l := rr.Reach.Length
			if f.FromStation < -1e-9*l || f.ToStation > l*(1+1e-9) || f.FromStation > f.ToStation {
				t.Fatalf("%s %s %s: span %v..%v outside the reach 0..%v\n%s", f.Rule, f.Reach, f.Event, f.FromStation, f.ToStation, l, src)
			}
			var fails func(p solver.Point) (bool, bool) // fails, judged
			switch f.Rule {
			case "max_velocity":
				fails = func(p solver.Point) (bool, bool) {
					if p.Section == nil {
						return false, false
					}
					lim, ok := vlim.For(p.Section.Lining)
					return p.Velocity > lim, ok
				}
			case "freeboard":
				fails = func(p solver.Point) (bool, bool) {
					sec := p.Section
					if sec == nil || sec.Closed() {
						return false, false
					}
					avail := p.Invert + sec.Height - p.WSE
					if avail < 0 {
						return false, false // capacity's
					}
					return avail < max(minimum, fraction*p.Depth), true
				}
			default:
				continue
			}
			const d = 2e-3
			for _, end := range []struct {
				x    float64
				sign float64 // +1: the span lies above x
			}{{f.FromStation, 1}, {f.ToStation, -1}} {
				if end.x < 10*d || end.x > l-10*d || atComputedPoint(rr, end.x) {
					continue
				}
				in, ok1 := valueAt(rr, end.x+end.sign*d)
				out, ok2 := valueAt(rr, end.x-end.sign*d)
				if !ok1 || !ok2 || in.Section != out.Section || in.Section == nil {
					continue
				}
				fin, jin := fails(in)
				fout, jout := fails(out)
				if !jin || !jout {
					continue
				}
				if !fin || fout {
					t.Fatalf("%s %s %s: span end %v is not where the limit is crossed: %v m inside fails %v, outside fails %v (V %v / %v, WSE %v / %v)\n%s",
						f.Rule, f.Reach, f.Event, end.x, d, fin, fout, in.Velocity, out.Velocity, in.WSE, out.WSE, src)
				}
			}
		}
	})
}

// atComputedPoint reports whether x is within 1e-9 of the reach length of
// a computed point (a span may end there: a section change, a bend end).
func atComputedPoint(rr *solver.ReachResult, x float64) bool {
	for i := range rr.Points {
		if math.Abs(rr.Points[i].Station-x) <= 1e-9*max(1, rr.Reach.Length) {
			return true
		}
	}
	return false
}
