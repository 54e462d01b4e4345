package rules

import (
	"fmt"
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// toeShift is how far a jump's toe moves when the subcritical depth at the
// toe is 1 % higher or lower (a tailwater or a roughness known to about
// that), to first order. The toe is where the specific forces of the two
// profiles are equal, D(x) = M(y1(x)) − M(y2(x)) = 0; with dM/dy = A(1 − F²)
// and dy/dx = (S0 − Sf)/(1 − F²) along each profile,
//
//	dD/dx = A1·(S0 − Sf1) − A2·(S0 − Sf2),
//	δx    = A2·(1 − F2²)·δy2 / |dD/dx|,  δy2 = 0.01·y2.
//
// Near critical flow (an undular jump, a slope close to critical) the two
// forces run nearly parallel and δx is metres: the solver places the toe
// to centimetres (it is converged), but where it stands depends on inputs
// known to a per cent. ok is false where the two points at the toe are not
// found or the figures are not finite.
func toeShift(rr *solver.ReachResult, j solver.Jump) (float64, bool) {
	var sup, sub *solver.Point
	for i := range rr.Points {
		p := &rr.Points[i]
		if p.Station != j.Station {
			continue
		}
		switch p.Depth {
		case j.UpstreamDepth:
			sup = p
		case j.DownstreamDepth:
			sub = p
		}
	}
	if sup == nil || sub == nil || rr.Reach == nil {
		return 0, false
	}
	s0 := rr.Reach.Slope
	dd := sup.Area*(s0-sup.FrictionSlope) - sub.Area*(s0-sub.FrictionSlope)
	dx := sub.Area * (1 - sub.Froude*sub.Froude) * 0.01 * sub.Depth / math.Abs(dd)
	if !numfmt.Finite(dx) || !(dx > 0) {
		return 0, false
	}
	return dx, true
}

// toeSensitivity is the sentence a jump_containment verdict gets where the
// toe's shift for 1 % of the depth below it is at least the margin the
// verdict rests on (how far the jump escapes, or stays inside, its basin);
// "" otherwise.
func toeSensitivity(rr *solver.ReachResult, j solver.Jump, margin float64, u model.Units) string {
	dx, ok := toeShift(rr, j)
	if !ok || !(dx >= margin) {
		return ""
	}
	return fmt.Sprintf("; the verdict is sensitive: 1 %% more or less depth below the toe moves it about %s %s, more than the %s %s it rests on "+
		"(near critical flow the forces of the two profiles run nearly parallel), so check it against the uncertainty of the tailwater and the roughness",
		numfmt.Num(dx), u.Length(), numfmt.Num(margin), u.Length())
}
