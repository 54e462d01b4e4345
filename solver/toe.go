package solver

import (
	"cmp"
	"math"
	"slices"

	"github.com/chanlint/chanlint/model/numfmt"
)

// ToeDepthAccuracy is the accuracy, relative to the depth, that
// ToeTolerance takes for each of the two depths a toe is balanced from:
// three times the step control's local error per step (stepRelTol), the
// global error of the depths against an independent quadrature of the
// varied-flow equation (within 3e-4, see Solve). The local error alone
// is too little: on the gate releases of the diff's tests
// (cmd/chanlint/internal/revdiff, TestToeToleranceCoversTheToeError)
// the toe lies 2.3–4.5 cm from the converged one, 1.2–2.2 times what
// stepRelTol gives and 0.41–0.73 of what this gives.
const ToeDepthAccuracy = 3 * stepRelTol

// ToeTolerance is how far the toe of jump j (an index into r.Jumps) may
// lie from its computed station because of the accuracy of the two
// profiles it balances. locateJump puts the toe where the supercritical
// and the subcritical profile have equal specific force,
//
//	D(x) = M(y₁(x)) − M(y₂(x)) = 0,
//
// by Brent's method to 1e-10 of the reach, far finer than the profiles
// themselves: each depth is held to ToeDepthAccuracy of itself, which
// moves D by up to |dM/dy|·δy on each side, and the root by that over
// |dD/dx|. Along a profile of a prismatic section dM/dy = A·(1 − F²) and
// dM/dx = A·(S0 − Sf) (the momentum equation), so
//
//	δx = ε·(A₁·|1 − F₁²|·y₁ + A₂·|1 − F₂²|·y₂) / |A₁·(S0 − Sf₁) − A₂·(S0 − Sf₂)|
//
// with ε = ToeDepthAccuracy and the values of the two points at the toe
// (for a points section, whose energy coefficient varies with depth, the
// same formula is an approximation). The result is at least Brent's
// station tolerance and at most the reach's length; ok is false where
// the profile does not hold the two points of the jump at its toe (a
// result built by hand).
func (r *ReachResult) ToeTolerance(j int) (tol float64, ok bool) {
	if r == nil || r.Reach == nil || j < 0 || j >= len(r.Jumps) {
		return 0, false
	}
	x := r.Jumps[j].Station
	i, found := slices.BinarySearchFunc(r.Points, x, func(p Point, x float64) int { return cmp.Compare(p.Station, x) })
	if !found || i+1 >= len(r.Points) || r.Points[i+1].Station != x {
		return 0, false
	}
	p1, p2 := &r.Points[i], &r.Points[i+1]
	s0 := r.Reach.Slope
	num := p1.Area*math.Abs(1-p1.Froude*p1.Froude)*p1.Depth + p2.Area*math.Abs(1-p2.Froude*p2.Froude)*p2.Depth
	den := math.Abs(p1.Area*(s0-p1.FrictionSlope) - p2.Area*(s0-p2.FrictionSlope))
	length := math.Max(r.Reach.Length, 0)
	floor := 1e-10 * math.Max(length, 1) // locateJump's station tolerance
	tol = length
	if den > 0 {
		tol = ToeDepthAccuracy * num / den
	}
	if !numfmt.Finite(tol) || tol > length {
		tol = length
	}
	return math.Max(tol, floor), true
}
