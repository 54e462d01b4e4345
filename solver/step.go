package solver

import (
	"errors"
	"math"
)

// This file holds the standard-step energy equation and the adaptive step
// control that drives it. Nothing here allocates: the root-finder closures
// do not escape (Brent does not retain them), and the stepper works on
// values.

// Step-control constants.
const (
	// stepRelTol is the local error allowed per step (per double step when
	// doubling), relative to the depth, as the step control estimates it
	// (see stepper). With the stable marching
	// directions used here (subcritical profiles upstream, supercritical
	// profiles downstream) the global error stays of the order of the local
	// one; TestProfileAgainstQuadrature checks it against an independent
	// integration.
	stepRelTol = 1e-4
	// s1RelTol replaces stepRelTol on the subcritical branch of a steep
	// reach (an S1 backwater). Marched upstream, S1 profiles diverge from
	// one another as they fall toward critical depth, so local errors grow
	// instead of staying of their own order: with stepRelTol an S1 curve
	// reaching F ≈ 0.93 at its head was 0.32 % off against quadrature
	// (TestNearCriticalS1AgainstQuadrature), past the 0.2 % target.
	s1RelTol = stepRelTol / 10
	// predictSafety multiplies the predictor's error estimate (Milne's
	// device, see stepper). The estimate takes y‴ for −Sf″/(1 − F²), which
	// holds where F² changes slowly; below a gate, where it does not, the
	// plain estimate let the M3 curve of TestGateJumpOnMildReach drift
	// 0.3 % by its toe, past the 0.2 % target; with 4 the toe it locates
	// is within 60 % of the station tolerance that target gives.
	predictSafety = 4
	// stepMaxDepthChange caps the relative depth change of one double step.
	stepMaxDepthChange = 0.25
	// stepMinFraction: the smallest step is this fraction of the reach
	// length (or stepMinAbs, whichever is larger). A step that still fails
	// at this size ends the profile at critical depth.
	stepMinFraction = 1e-7
	stepMinAbs      = 1e-9
	// stepMaxShrinks bounds the retries of one step.
	stepMaxShrinks = 40
	// branchExpand bounds the doublings and halvings used to bracket a
	// depth on one branch of the energy curve.
	branchExpand = 80
)

// piece is a run of a reach with one cross-section, [from, to], with the
// depths of its discharge.
type piece struct {
	from, to float64
	geo      *Geometry
	// yc is the control depth that bounds the two branches of the energy
	// equation and is taken where it has no solution: the depth of least
	// specific energy. It equals the critical depth ycF (Froude number 1)
	// except in points sections, where the energy coefficient α changes
	// with depth and the two part (see energyMinDepth).
	yc    float64
	ycF   float64 // critical depth, α·Q²·T/(g·A³) = 1, as reported
	ec    float64 // specific energy at yc
	yn    float64 // normal depth, valid when hasN
	hasN  bool
	class SlopeClass
}

// hydraulics of one piece at one depth, as the energy equation needs them.
type stepState struct {
	e   float64 // specific energy y + αQ²/(2gA²)
	sf  float64 // friction slope (Q/K)²
	f2  float64 // αQ²T/(gA³), the squared Froude number
	dsf float64 // dSf/dy where the section gives it in closed form, else NaN
	m   float64 // specific force Q²/(gA) + A·z̄ (see force)
	a   float64 // flow area
	// y is the depth of e, sf, f2 and m: the one the section was
	// evaluated at, or the depth a last Newton correction (newtonStep)
	// carried them to, to first order. dsf stays that of the evaluated
	// depth, next to it (it only guides Newton's method).
	y float64
}

// flowCtx is the part of a reach the energy equation needs: discharge,
// bed line and solver tolerance.
type flowCtx struct {
	q      float64
	zUp    float64 // invert at station 0
	s0     float64 // bed slope (positive downhill)
	length float64
	tol    float64 // absolute depth tolerance of the root finder
	noConv int     // roots taken from a root finder that ran out of iterations
	evals  int     // section evaluations (eval, force, slope of the profile), for the benchmarks
}

// invert is the bed elevation at station x (linear along the reach, the
// same rule as model.Reach.InvertAt).
func (f *flowCtx) invert(x float64) float64 {
	return f.zUp - f.s0*x
}

// eval returns specific energy and friction slope at depth y.
//
//	E = y + α·Q²/(2·g·A²)      Sf = (Q/K)²      (Chow 1959, ch. 3 and 10)
//
// A prismatic section, the usual one, is evaluated here with the same
// expressions as Props but only the area and conveyance, which saves the
// call and the other properties in the innermost loop of the solver.
//
// It also gives the specific force (as force computes it), the squared
// Froude number F² = αQ²T/(gA³) and, for a
// prismatic section, dSf/dy = −2·Sf·K′/K with K′/K = T/A + (2/3)·R′/R and
// R′ = (T − R·P′)/P (K = (k/n)·A·R^(2/3), P′ = 2√(1+z²)): what the
// predicted depth and the Newton iteration of a standard step need.
func (f *flowCtx) eval(p *piece, y float64) stepState {
	f.evals++
	g := p.geo
	if g.kind != kindPrismatic {
		pr := g.Props(y)
		v := f.q / pr.Area
		c := f.q / pr.Conveyance
		return stepState{e: y + pr.Alpha*v*v/(2*g.g), sf: c * c,
			f2: pr.Alpha * v * v * pr.TopWidth / (g.g * pr.Area), dsf: math.NaN(),
			m: f.q*f.q/(g.g*pr.Area) + pr.FirstMoment, a: pr.Area, y: y}
	}
	yy := clampDepth(y)
	a := (g.b + g.z*yy) * yy
	per := g.b + 2*yy*g.sideLen
	r := a / per
	v := f.q / a
	c := f.q / (g.kn * a * math.Cbrt(r*r))
	sf := c * c
	t := g.b + 2*g.z*yy
	dr := (t - r*2*g.sideLen) / per
	return stepState{e: y + v*v/(2*g.g), sf: sf, f2: v * v * t / (g.g * a),
		dsf: -2 * sf * (t/a + (2.0/3)*dr/r),
		m:   f.q*f.q/(g.g*a) + (g.b*yy*yy/2 + g.z*yy*yy*yy/3), a: a, y: y}
}

// f2Slope is dF²/dy at depth y of a prismatic section (rectangle,
// trapezoid, triangle), from its state there: with F² = Q²T/(gA³),
// dA/dy = T and dT/dy = 2z,
//
//	dF²/dy = F²·(2z/T − 3T/A).
func f2Slope(g *Geometry, y float64, st stepState) float64 {
	t := g.b + 2*g.z*clampDepth(y)
	return st.f2 * (2*g.z/t - 3*t/st.a)
}

// gvfSlope is dy/dx = (S0 − Sf)/(1 − F²) at a state, the differential
// equation of gradually varied flow (Chow 1959, eq. 9-13); NaN within 2 %
// of F = 1, where the profile is nearly vertical and a slope predicts
// nothing.
func (f *flowCtx) gvfSlope(k stepState) float64 {
	den := 1 - k.f2
	if !(math.Abs(den) > 0.02) {
		return math.NaN()
	}
	return (f.s0 - k.sf) / den
}

// force is the specific force Q²/(gA) + A·z̄ at depth y.
func (f *flowCtx) force(p *piece, y float64) float64 {
	f.evals++
	pr := p.geo.Props(y)
	return f.q*f.q/(p.geo.g*pr.Area) + pr.FirstMoment
}

// solveBranch finds the depth y in piece p at bed elevation z with
//
//	z + E(y) + w·Sf(y) = target
//
// on the subcritical branch (y ≥ yc) or the supercritical branch (y ≤ yc).
// The standard step between a known point k and an unknown point u, Δx
// apart, is the energy equation with the average friction slope
// (Chow 1959, §10-3):
//
//	z_u + E_u ± (Δx/2)·Sf_u = z_k + E_k ∓ (Δx/2)·Sf_k
//
// where the unknown point lies upstream (subcritical, w = −Δx/2) or
// downstream (supercritical, w = +Δx/2); w = 0 is a transition without
// friction loss. On either branch the left side minus the target is
// monotone in y (E rises with y above yc and falls below it; w·Sf moves the
// same way), so a root exists exactly when it is ≤ 0 at critical depth (a
// points section with more than one critical depth can break that
// monotony above the overbanks; the bracketed root found is used). ok
// is false when there is none: the energy available is below what the
// branch needs, and the caller takes critical depth. guess (0: none) is a
// predicted depth; a narrow bracket next to it is tried first, which saves
// most of the bracketing work inside a profile.
func (f *flowCtx) solveBranch(p *piece, z, w, target float64, super bool, guess, spread float64) (float64, bool) {
	y, ok, _, _ := f.branchRoot(p, z, w, target, super, guess, spread)
	return y, ok
}

// branchRoot is solveBranch that also returns the energy and friction
// slope at the depth found when the root finder evaluated them there
// (known), so that the next step need not evaluate them again.
func (f *flowCtx) branchRoot(p *piece, z, w, target float64, super bool, guess, spread float64) (y float64, ok bool, st stepState, known bool) {
	// The evaluation of least |h| is remembered: Brent returns one of the
	// depths it evaluated, nearly always that one.
	bestY, bestH := math.NaN(), math.Inf(1)
	var best stepState
	h := func(y float64) float64 {
		s := f.eval(p, y)
		v := z + s.e + w*s.sf - target
		if math.Abs(v) <= bestH {
			bestY, bestH, best = y, math.Abs(v), s
		}
		return v
	}
	y, ok = f.solveH(h, p.yc, super, target-z, guess, spread)
	if ok && y == bestY {
		return y, true, best, true
	}
	return y, ok, stepState{}, false
}

// solveH finds the root of h on one branch of the energy curve; hTarget
// is target − z, which bounds a subcritical depth from above.
func (f *flowCtx) solveH(h func(float64) float64, yc float64, super bool, hTarget, guess, spread float64) (float64, bool) {
	y, ok, noRoot := f.nearGuess(h, yc, super, guess, spread)
	if ok {
		return y, true
	}
	if noRoot {
		return yc, false
	}
	hc := h(yc)
	if !(hc <= 0) {
		return yc, false
	}
	if hc == 0 {
		return yc, true
	}
	var a, b float64
	if super {
		b = yc
		a = yc / 2
		for i := 0; i < branchExpand && !(h(a) > 0); i++ {
			a /= 2
			if a < minDepth {
				return yc, false
			}
		}
	} else {
		a = yc
		// z + E(y) ≥ z + y, and w·Sf ≥ w·Sf(yc) when w ≤ 0 and Sf falls
		// with depth, so this is nearly always already above the root.
		b = math.Max(hTarget, yc) * 1.01
		for i := 0; i < branchExpand && !(h(b) > 0); i++ {
			b *= 2
			if b > maxDepth {
				return yc, false
			}
		}
	}
	y, err := Brent(h, a, b, f.tol)
	return f.accept(y, err, yc)
}

// accept checks a root from Brent. A root finder that ran out of
// iterations still returns the best estimate inside the bracket; it is
// used and counted (finish turns the count into a NoteNoConvergence).
func (f *flowCtx) accept(y float64, err error, yc float64) (float64, bool) {
	if !(y > 0) || math.IsInf(y, 0) {
		return yc, false
	}
	if err != nil {
		if !errors.Is(err, ErrNoConvergence) {
			return yc, false
		}
		f.noConv++
	}
	return y, true
}

// guessExpand bounds the widenings of the bracket next to a guess; each
// makes the bracket four times as long as the last, so together they reach
// about 5,000 times the first width before the full bracketing takes over.
const guessExpand = 6

// nearGuess brackets the root next to the guess, which is moved onto the
// branch (to critical depth when it lies on the other side). h at the
// guess tells the side of the root, as h is monotone on the branch: it
// rises with the depth on the subcritical branch and falls on the
// supercritical one. The bracket [guess, guess ± δ], δ = spread plus 1e-6
// of the depth, is tried and, while it holds no sign change, moved on and
// widened. Only a bracket that holds a sign change is used, so on the
// monotone branch the root it finds is the root. One end of the bracket is
// the guess, which is close to the root, so Brent's interpolation closes
// in a few steps. noRoot reports that the search reached critical depth
// without a sign change: h(yc) > 0 there, so the branch has no root (the
// test solveH would make next, already made).
func (f *flowCtx) nearGuess(h func(float64) float64, yc float64, super bool, guess, spread float64) (y float64, ok, noRoot bool) {
	if !(guess > 0) || math.IsInf(guess, 0) || !(spread >= 0) || !(yc > 0) {
		return 0, false, false
	}
	d := spread + 1e-6*guess + 10*f.tol
	a := guess
	if super {
		a = math.Min(a, yc)
	} else {
		a = math.Max(a, yc)
	}
	fa := h(a)
	if math.IsNaN(fa) {
		return 0, false, false
	}
	if fa == 0 {
		return a, true, false
	}
	up := (fa < 0) != super // the root lies at greater depths
	for range guessExpand {
		b, last := a-d, false
		if up {
			b = a + d
		}
		switch {
		case super && b >= yc, !super && b <= yc:
			b, last = yc, true
		case b <= 0:
			b, last = a/2, true
		}
		if b == a {
			return 0, false, false
		}
		fb := h(b)
		if math.IsNaN(fb) {
			return 0, false, false
		}
		if fb == 0 {
			return b, true, false
		}
		if (fb > 0) != (fa > 0) {
			lo, hi, flo, fhi := a, b, fa, fb
			if lo > hi {
				lo, hi, flo, fhi = b, a, fb, fa
			}
			y, err := brentFrom(h, lo, hi, flo, fhi, f.tol)
			if err != nil && !errors.Is(err, ErrNoConvergence) {
				return 0, false, false
			}
			y, ok = f.accept(y, err, yc)
			return y, ok, false
		}
		if last {
			// At critical depth without a sign change: h(yc) has the sign
			// of h at the guess, which is > 0 when the search moved toward
			// critical depth (the root would lie beyond it).
			return 0, false, b == yc && fb > 0
		}
		a, fa = b, fb
		d *= 4
	}
	return 0, false, false
}

// standardStep computes the depth at station xu from the known depth yk at
// station xk on the given branch. Subcritical steps go upstream
// (xu < xk), supercritical steps downstream. guess (0: none) is a
// predicted depth at xu, taken to be good to a tenth of the change it
// predicts. Without one the search starts next to yk itself when yk lies
// on the branch: a step changes the depth little, and a bracket widened
// from there costs fewer evaluations than one from critical depth.
func (f *flowCtx) standardStep(p *piece, xk, yk, xu float64, super bool, guess float64) (float64, bool) {
	k := f.eval(p, yk)
	if guess == 0 && yk > 0 && (yk <= p.yc) == super {
		half := math.Abs(xu-xk) / 2
		zk, zu := f.invert(xk), f.invert(xu)
		w, target := -half, zk+k.e+half*k.sf
		if super {
			w, target = half, zk+k.e-half*k.sf
		}
		y, ok, _, _ := f.branchRoot(p, zu, w, target, super, yk, noGuessSpread*yk)
		return y, ok
	}
	y, ok, _, _ := f.stepFrom(p, xk, yk, k, xu, super, guess)
	return y, ok
}

// noGuessSpread is the first half-width of the bracket next to the known
// depth, relative to it, for a step without a predicted depth; widened
// six times by four it spans more than the depth itself.
const noGuessSpread = 1e-3

// stepFrom is standardStep with the state k at the known depth given; it
// also returns the state at the new depth when it is known (see
// branchRoot).
func (f *flowCtx) stepFrom(p *piece, xk, yk float64, k stepState, xu float64, super bool, guess float64) (float64, bool, stepState, bool) {
	half := math.Abs(xu-xk) / 2
	spread := 0.1 * math.Abs(guess-yk)
	zk, zu := f.invert(xk), f.invert(xu)
	if super {
		return f.branchRoot(p, zu, half, zk+k.e-half*k.sf, true, guess, spread)
	}
	return f.branchRoot(p, zu, -half, zk+k.e+half*k.sf, false, guess, spread)
}

// slopeOfProfile is dy/dx = (S0 − Sf)/(1 − F²), the differential equation
// of gradually varied flow (Chow 1959, eq. 9-13), at a state, used only to
// size the first step (unlike gvfSlope it is taken up to 1e-6 of F = 1).
func (f *flowCtx) slopeOfProfile(k stepState) float64 {
	den := 1 - k.f2
	if math.Abs(den) < 1e-6 {
		return math.Inf(1)
	}
	return (f.s0 - k.sf) / den
}

// pt is a computed point while profiles are built.
type pt struct {
	x, y     float64
	piece    int32
	super    bool // computed on the supercritical branch
	fallback bool // critical depth taken because the energy equation had no solution
}

// stepper marches one profile through one piece with automatic step
// control. A step is one standard step from the current point, solved by
// a Newton iteration from a predicted depth, and its error is estimated
// from the predictor, so that an accepted step costs one solution of the
// energy equation and, typically, one or two section evaluations:
//
//   - Predictor: the second-order Adams–Bashforth formula on the
//     differential equation of gradually varied flow, with the slopes
//     dy/dx = (S0 − Sf)/(1 − F²) at the current and the previous point
//     (variable step, ratio r = h/h_prev):
//     y_p = y_n + h·((1 + r/2)·y′_n − (r/2)·y′_(n−1)).
//   - Corrector: the standard step itself, the trapezoidal rule on the
//     energy line (Chow 1959, §10-3), solved for the depth by Newton's
//     method from y_p (safeguarded: it falls back to bracketing and
//     Brent's method when an iterate leaves the branch or does not close).
//   - Error: the local error of the trapezoidal rule is −h³y‴/12 and that
//     of the predictor h³y‴·(1/6 + 1/(4r)), so the corrector's error is
//     about r/(3(r+1)) of the difference between the two (Milne's device;
//     Hairer, Nørsett and Wanner, Solving Ordinary Differential Equations
//     I, 1993, §III.1). The step is accepted when that is below stepRelTol
//     of the depth and the next one sized by the cube root of the ratio,
//     so points gather where the profile curves.
//
// Next to critical depth, where dy/dx is unbounded, the step is taken in
// depth instead (direct), and where the profile stays at critical depth
// (no branch leaves it, staysCritical) without evaluating the section.
// Where the predictor has no history — the first step of a run — or the
// corrector fails, the step is taken by step doubling: once whole and once
// as two halves, the difference estimating the error of the halves (the
// method is second order, so about a third of the difference), both
// half-step points kept.
// Either way the energy equation holds between every pair of neighbouring
// points.
type stepper struct {
	f      *flowCtx
	p      *piece
	pi     int32
	super  bool // marching downstream on the supercritical branch
	x, y   float64
	dx     float64 // proposed next step length
	dxMax  float64 // largest distance between two points; 0: no cap
	dxMin  float64
	atCrit bool    // the current point is at critical depth
	slope  float64 // dy/dx over the last accepted half step, for the depth guess of a doubled step
	// k is the energy and friction slope at the current depth when hasK.
	k    stepState
	hasK bool
	// The slope dy/dx at the previous point and the length of the step
	// from it, for the predictor; prevH = 0 when there is none.
	prevSlope, prevH float64
	// dyDirect is the next depth step of the direct-step method next to
	// critical depth (0: not yet sized).
	dyDirect float64
	// relTol is the local error allowed per step, relative to the depth:
	// stepRelTol, or s1RelTol on an S1 profile (see there).
	relTol float64
	// outK holds the states at the points the last step wrote, where
	// outKnown says they are known (see force).
	outK     [2]stepState
	outKnown [2]bool
}

// force is the specific force at the i-th point the last step wrote (at
// depth y): from the state the step left there, else evaluated.
func (s *stepper) force(i int, y float64) float64 {
	if s.outKnown[i] {
		return s.outK[i].m
	}
	return s.f.force(s.p, y)
}

// wrote records the states at the points a step wrote.
func (s *stepper) wrote(k0 stepState, known0 bool, k1 stepState, known1 bool) {
	s.outK[0], s.outKnown[0], s.outK[1], s.outKnown[1] = k0, known0, k1, known1
}

// init prepares the stepper at (x, y).
func (s *stepper) init(f *flowCtx, p *piece, pi int, super bool, x, y float64, atCrit bool, maxSpacing float64) {
	s.f, s.p, s.pi, s.super, s.x, s.y, s.atCrit = f, p, int32(pi), super, x, y, atCrit
	s.dxMin = math.Max(stepMinFraction*f.length, stepMinAbs)
	s.dxMax = 0
	if maxSpacing > 0 {
		s.dxMax = maxSpacing
	}
	s.dx, s.slope = 0, 0
	s.hasK = false
	s.prevH, s.dyDirect = 0, 0
	s.relTol = stepRelTol
	if !super && p.hasN && p.yn < p.yc {
		s.relTol = s1RelTol
	}
}

// step advances toward xEnd and writes one or two new points to out,
// returning how many. It returns 0 when the stepper is already at xEnd.
func (s *stepper) step(xEnd float64, out *[2]pt) int {
	remaining := math.Abs(xEnd - s.x)
	if remaining <= 0 {
		return 0
	}
	if !s.hasK {
		s.k, s.hasK = s.f.eval(s.p, s.y), true
	}
	if s.dx <= 0 {
		s.dx = s.firstStep(remaining)
	}
	yk := s.f.gvfSlope(s.k)
	if !s.atCrit && s.prevH > 0 && !math.IsNaN(yk) && !math.IsNaN(s.prevSlope) {
		if n, ok := s.predicted(xEnd, remaining, yk, out); ok {
			return n
		}
	}
	if s.atCrit && s.staysCritical(xEnd, remaining) {
		return s.critical(xEnd, remaining, out)
	}
	if s.atCrit || math.IsNaN(yk) {
		if n, ok := s.direct(xEnd, remaining, out); ok {
			return n
		}
	}
	return s.doubled(xEnd, remaining, out)
}

// staysCritical reports, without evaluating the section again, that no
// profile leaves critical depth over the next step: the standard step from
// critical depth has no root on the branch for the whole step nor for its
// half (doubled would try both), and no direct step leaves it. At critical
// depth the energy equation's residual is
//
//	h(yc) = z_u − z_k ∓ Δx·Sf(yc) = Δx·(S0 − Sf(yc))   (subcritical, upstream)
//	h(yc) = Δx·(Sf(yc) − S0)                           (supercritical, downstream)
//
// whose sign does not depend on the step: on a steep piece no subcritical
// profile leaves critical depth upstream, on a mild one no supercritical
// profile leaves it downstream. The residuals are computed as the root
// finder computes them, from the state at critical depth the stepper
// holds, so that the outcome is the one doubled would reach. Only a
// prismatic section is taken this way: its friction slope falls with the
// depth, so that a direct step from critical depth has the same sign as
// h(yc) (a closed or points section can break that).
func (s *stepper) staysCritical(xEnd, remaining float64) bool {
	f, p := s.f, s.p
	if p.geo.kind != kindPrismatic || s.y != p.yc || !s.hasK {
		return false
	}
	if s.super == (s.k.sf <= f.s0) {
		return false
	}
	_, xFull, xHalf := s.critStep(xEnd, remaining)
	return s.noRootAtCrit(xFull) && s.noRootAtCrit(xHalf)
}

// critStep is the length of the next step from critical depth, as doubled
// sizes it, with the stations of its end and of its middle.
func (s *stepper) critStep(xEnd, remaining float64) (h, xu, xMid float64) {
	dir := 1.0
	if !s.super {
		dir = -1
	}
	h = s.stepLength(remaining, 2*s.dxMax)
	xu = s.x + dir*h
	if h == remaining {
		xu = xEnd
	}
	return h, xu, s.x + dir*h/2
}

// noRootAtCrit is the test solveH makes first on a step from critical
// depth without a guess: the residual at critical depth is not ≤ 0.
func (s *stepper) noRootAtCrit(xu float64) bool {
	f, k := s.f, s.k
	half := math.Abs(xu-s.x) / 2
	zk, zu := f.invert(s.x), f.invert(xu)
	w, target := -half, zk+k.e+half*k.sf
	if s.super {
		w, target = half, zk+k.e-half*k.sf
	}
	return !(zu+k.e+w*k.sf-target <= 0)
}

// critical writes the point at critical depth at the end of the step that
// doubled would write when no profile leaves critical depth
// (staysCritical); the state there is that at critical depth, kept.
func (s *stepper) critical(xEnd, remaining float64, out *[2]pt) int {
	h, xu, _ := s.critStep(xEnd, remaining)
	out[0] = pt{x: xu, y: s.p.yc, piece: s.pi, super: s.super, fallback: true}
	s.wrote(s.k, true, stepState{}, false)
	s.x, s.slope, s.prevH = xu, 0, 0
	s.dx = h * 4
	return 1
}

// direct takes one step next to critical depth by the direct-step method
// (Chow 1959, §10-2): it chooses the depth of the next point and solves
// the same energy equation for the distance, which is explicit,
//
//	Δx = (E_u − E_k)/(S̄f − S0)   upstream (subcritical),
//	Δx = (E_u − E_k)/(S0 − S̄f)   downstream (supercritical),
//
// with S̄f the mean of the friction slopes at the two depths. Next to
// critical depth the profile is nearly vertical, so a step in distance
// needs a root of an energy equation that hardly changes with depth and
// many rejected steps, while a step in depth costs one section evaluation.
// It is used where the profile leaves critical depth onto its branch
// (deeper upstream on the subcritical one, shallower downstream on the
// supercritical one) and where it approaches critical depth within about
// 1 % of F = 1 (an S1 curve upstream, an M3 curve downstream): there a
// step in distance is rejected again and again because the energy
// equation has no root over it, while the depth steps toward critical
// depth and the last one lands on it, where the branch ends (the profile
// reaches critical depth there; the points beyond it are the fallbacks).
// ok is false when the energy gives no positive distance.
//
// The local error of the distance is that of the trapezoidal rule with
// depth as the variable: for Sf and dx/dy = (1 − F²)/(S0 − Sf) varying
// linearly over the step it is Sf′·(dx/dy)′·Δy³/(12·S̄f), as a depth error
// that times dy/dx at the new point (toward critical depth, where dy/dx is
// unbounded, the mean slope of the step, |Δy/Δx|); the step is accepted
// when that is below stepRelTol of the depth, and the next depth step
// sized by its cube root. A step that would pass xEnd is replaced by a
// standard step to xEnd from a depth interpolated on it.
func (s *stepper) direct(xEnd, remaining float64, out *[2]pt) (int, bool) {
	f, p := s.f, s.p
	away := 1.0 // the depth moves away from critical depth onto the branch
	if s.super {
		away = -1
	}
	toward := false // the depth moves toward critical depth instead
	if !s.atCrit {
		// Moving away from critical depth? dy/dx in the marching direction.
		den := 1 - s.k.f2
		if den == 0 {
			return 0, false
		}
		dydx := (f.s0 - s.k.sf) / den
		if !s.super {
			dydx = -dydx
		}
		if dydx*away == 0 {
			return 0, false
		}
		toward = dydx*away < 0
	}
	gap := math.Abs(s.y - p.yc) // what is left to critical depth, toward it
	if toward && !(gap > 0) {
		return 0, false
	}
	if !(s.dyDirect > 0) {
		s.dyDirect = 1e-3 * p.yc
	}
	gk := dxdy(f.s0, s.k)
	for range stepMaxShrinks {
		dy := s.dyDirect
		yu := s.y + away*dy
		last := false // the step lands on critical depth
		if toward {
			dy = math.Min(dy, gap)
			yu = s.y - away*dy
			if last = dy >= 0.8*gap; last {
				dy, yu = gap, p.yc
			}
		}
		if !(yu > 0) || yu >= maxDepth {
			return 0, false
		}
		st := f.eval(p, yu)
		sfm := (st.sf + s.k.sf) / 2
		dx := (st.e - s.k.e) / (sfm - f.s0)
		if s.super {
			dx = -dx
		}
		if !(dx > s.dxMin) || math.IsInf(dx, 0) {
			// The energy does not carry the profile that way (or only by
			// rounding): a smaller depth step would not change the sign.
			return 0, false
		}
		gu := dxdy(f.s0, st)
		errX := math.Abs((st.sf-s.k.sf)*(gu-gk)) * dy / (12 * sfm)
		errY := math.Inf(1)
		switch {
		case toward:
			errY = errX * dy / dx
		case gu != 0:
			errY = errX / math.Abs(gu)
		}
		allowed := math.Max(s.relTol*yu, 4*f.tol)
		capped := s.dxMax > 0 && dx > s.dxMax
		if errY > allowed || capped {
			fac := 0.25
			if errY > allowed {
				fac = math.Max(0.1, 0.9*math.Cbrt(allowed/errY))
			}
			s.dyDirect = dy * fac
			continue
		}
		dir := 1.0
		if !s.super {
			dir = -1
		}
		if dx >= remaining*0.999 {
			// The step would pass the end of the run: a standard step to
			// it from the depth interpolated on this one.
			guess := s.y + (yu-s.y)*remaining/dx
			y, ok, st2 := f.newtonStep(p, s.x, s.k, xEnd, s.super, guess, s.y)
			if !ok {
				return 0, false
			}
			out[0] = pt{x: xEnd, y: y, piece: s.pi, super: s.super}
			s.wrote(st2, true, stepState{}, false)
			s.slope = (y - s.y) / (xEnd - s.x)
			s.x, s.y, s.k, s.atCrit, s.prevH = xEnd, y, st2, false, 0
			s.dx = remaining
			return 1, true
		}
		xu := s.x + dir*dx
		out[0] = pt{x: xu, y: yu, piece: s.pi, super: s.super}
		s.wrote(st, true, stepState{}, false)
		s.slope = (yu - s.y) / (xu - s.x)
		s.x, s.y, s.k, s.atCrit, s.prevH = xu, yu, st, last, 0
		s.dyDirect = dy * growFactor(errY, allowed)
		s.dx = dx * 2
		return 1, true
	}
	return 0, false
}

// dxdy is the inverse slope of the profile, (1 − F²)/(S0 − Sf), at a
// state: zero at critical depth, where dy/dx is unbounded.
func dxdy(s0 float64, k stepState) float64 {
	return (1 - k.f2) / (s0 - k.sf)
}

// stepLength is the next step: the proposed one within [dxMin, maxLen],
// or the whole remaining run when that is within 0.1 % of it (or would
// leave less than the smallest step).
func (s *stepper) stepLength(remaining, maxLen float64) float64 {
	h := s.dx
	if maxLen > 0 && h > maxLen {
		h = maxLen
	}
	if h < s.dxMin {
		h = s.dxMin
	}
	if h >= remaining*0.999 || remaining-h < s.dxMin {
		h = remaining
	}
	return h
}

// predicted takes one step by prediction and Newton correction (see
// stepper). yk is dy/dx at the current point. ok is false when the step
// could not be taken this way (the corrector found no depth on the
// branch); the caller then doubles.
func (s *stepper) predicted(xEnd, remaining, yk float64, out *[2]pt) (int, bool) {
	dir := 1.0
	if !s.super {
		dir = -1
	}
	h := s.stepLength(remaining, s.dxMax)
	for try := 0; ; try++ {
		xNew := s.x + dir*h
		if h == remaining {
			xNew = xEnd
		}
		r := h / s.prevH
		yp := s.y + dir*h*((1+r/2)*yk-(r/2)*s.prevSlope)
		y, ok, st := s.f.newtonStep(s.p, s.x, s.k, xNew, s.super, yp, s.y)
		if !ok {
			return 0, false
		}
		small := h <= s.dxMin || try >= stepMaxShrinks
		errEst := predictSafety * math.Abs(y-yp) * r / (3 * (r + 1))
		allowed := math.Max(s.relTol*y, 4*s.f.tol)
		change := math.Abs(y-s.y) / s.y
		if (errEst <= allowed && change <= stepMaxDepthChange) || small {
			out[0] = pt{x: xNew, y: y, piece: s.pi, super: s.super}
			s.wrote(st, true, stepState{}, false)
			s.prevSlope, s.prevH = yk, h
			s.slope = (y - s.y) / (xNew - s.x)
			s.x, s.y, s.k = xNew, y, st
			s.dx = h * growFactor(errEst, allowed)
			return 1, true
		}
		fac := 0.25
		if errEst > allowed {
			fac = math.Max(0.1, 0.9*math.Cbrt(allowed/errEst))
		}
		h *= fac
	}
}

// newtonLast is a correction, relative to the depth, below which
// newtonStep applies it without evaluating the section again whatever the
// curvature of the residual; newtonLastMax the largest it applies so,
// where the curvature allows (see lastCorrection).
const (
	newtonLast    = 1e-5
	newtonLastMax = 1e-4
)

// lastCorrection reports whether the Newton correction corr at depth y
// (state st, residual h = E + w·Sf + const with derivative d) is the last
// one needed: corr is below newtonLast of the depth, or below
// newtonLastMax of it and what the first order leaves out is below the
// tolerance. With E″ = −dF²/dy in closed form (f2Slope; the shortcut
// serves prismatic sections only) and Sf″ from the secant of dSf/dy
// between y and the depth where the state of the previous iterate or known
// depth (prev) was evaluated, at least |corr| away, the energy and the
// friction term of the state carried to y − corr are off by at most
// (|E″| + |w|·|Sf″|)·corr²/2, and so is the residual there, which moves the
// depth by that over |h′| (the next correction of Newton's method). (A
// secant of F² underestimated E″ where F² is large and steep: a state at
// 0.375 of critical depth, F² = 24, was carried with its energy 1.005e-7
// off at a tolerance of 1e-7.)
func (f *flowCtx) lastCorrection(g *Geometry, y, corr, d, w float64, st, prev stepState) bool {
	c := math.Abs(corr)
	if c <= newtonLast*y {
		return true
	}
	dy := y - prev.y
	if c > newtonLastMax*y || math.IsNaN(prev.dsf) || !(math.Abs(dy) >= c) {
		return false
	}
	e2 := f2Slope(g, y, st)
	sf2 := (st.dsf - prev.dsf) / dy
	off := (math.Abs(e2) + math.Abs(w*sf2)) * c * c / 2
	return off <= f.tol*math.Min(1, math.Abs(d))
}

// newtonIter bounds the Newton iterations of one standard step before the
// bracketing root finder takes over.
const newtonIter = 8

// newtonStep solves the standard step from the known point (xk, state k)
// to xu on one branch by Newton's method from the predicted depth yp, and
// returns the depth with its state. The derivative of the residual
//
//	h(y) = z_u + E(y) + w·Sf(y) − target,   h′(y) = 1 − F² + w·dSf/dy
//
// is taken in closed form where the section gives dSf/dy, else with dSf/dy
// from the secant between the known depth yk and the iterate. An iterate
// is accepted when the next correction would be below the tolerance; one
// that leaves the branch, a derivative of the wrong sign, or no closure
// within newtonIter iterations hands the step to the bracketing search
// next to yp (solveH).
func (f *flowCtx) newtonStep(p *piece, xk float64, k stepState, xu float64, super bool, yp, yk float64) (float64, bool, stepState) {
	half := math.Abs(xu-xk) / 2
	zk, zu := f.invert(xk), f.invert(xu)
	w, target := -half, zk+k.e+half*k.sf
	if super {
		w, target = half, zk+k.e-half*k.sf
	}
	onBranch := func(y float64) bool {
		if super {
			return y > 0 && y < p.yc
		}
		return y > p.yc && y < maxDepth
	}
	// The state at the previous iterate (first: the known depth) gives the
	// second derivatives by secants, for the shortcut below.
	prev := k
	y := yp
	for range newtonIter {
		if !onBranch(y) {
			break
		}
		st := f.eval(p, y)
		res := zu + st.e + w*st.sf - target
		dsf := st.dsf
		if math.IsNaN(dsf) {
			if dy := y - yk; math.Abs(dy) > 1e-9*yk {
				dsf = (st.sf - k.sf) / dy
			} else {
				dsf = 0
			}
		}
		d := 1 - st.f2 + w*dsf
		// On the subcritical branch h rises with y, on the supercritical
		// one it falls; a derivative of the other sign is no guide.
		if super == (d > 0) || math.IsNaN(d) || d == 0 {
			break
		}
		corr := res / d
		if math.Abs(corr) <= f.tol {
			return y, true, st
		}
		if !math.IsNaN(st.dsf) && onBranch(y-corr) && f.lastCorrection(p.geo, y, corr, d, w, st, prev) {
			// With the exact derivative the iteration converges
			// quadratically: the next correction is below the tolerance,
			// and the state at the corrected depth is that at y to first
			// order (the error is of the order of that correction).
			// dM/dy = A − Q²T/(gA²) = A·(1 − F²) with α = 1.
			st.e -= (1 - st.f2) * corr
			st.sf -= st.dsf * corr
			st.m -= st.a * (1 - st.f2) * corr
			// F² too: left at y it would be off by a first-order share of
			// the correction, and so would the profile slope
			// (S0 − Sf)/(1 − F²) the next step predicts from and sizes its
			// error estimate by. Whether this shortcut is taken depends on
			// the tolerance, which is in the model's length unit, so a
			// stale F² made the step sizes, and the profile within its
			// step tolerance, depend on the unit system.
			st.f2 -= f2Slope(p.geo, y, st) * corr
			st.y = y - corr
			return y - corr, true, st
		}
		prev = st
		y -= corr
	}
	yr, ok, st, known := f.branchRoot(p, zu, w, target, super, yp, math.Abs(yp-yk)/10)
	if ok && !known {
		st = f.eval(p, yr)
	}
	return yr, ok, st
}

// doubled takes one step by step doubling (see stepper) and writes its
// two points, or one critical-depth point when the branch has no solution.
func (s *stepper) doubled(xEnd, remaining float64, out *[2]pt) int {
	dir := 1.0
	if !s.super {
		dir = -1
	}
	h := s.stepLength(remaining, 2*s.dxMax)
	for try := 0; ; try++ {
		xEndStep := s.x + dir*h
		if h == remaining {
			xEndStep = xEnd
		}
		xMid := s.x + dir*h/2
		guess := 0.0
		if !s.atCrit {
			guess = s.y + s.slope*(xEndStep-s.x)
		}
		yFull, okF, _, _ := s.solveFrom(s.x, s.y, s.k, xEndStep, guess)
		gHalf, gTwo := 0.0, 0.0
		if okF {
			gHalf, gTwo = (s.y+yFull)/2, yFull
		}
		yHalf, ok1, kHalf, known := s.solveFrom(s.x, s.y, s.k, xMid, gHalf)
		yTwo, ok2 := yHalf, false
		var kTwo stepState
		knownTwo := false
		if ok1 {
			if !known {
				kHalf = s.f.eval(s.p, yHalf)
			}
			yTwo, ok2, kTwo, knownTwo = s.solveFrom(xMid, yHalf, kHalf, xEndStep, gTwo)
		}
		small := h <= s.dxMin || try >= stepMaxShrinks
		if okF && ok1 && ok2 {
			errEst := math.Abs(yTwo-yFull) / 3
			// Never ask the steps for less than the closure of the
			// energy equation can deliver (a coarse Options.Tolerance).
			allowed := math.Max(s.relTol*yTwo, 4*s.f.tol)
			change := math.Abs(yTwo-s.y) / s.y
			if (errEst <= allowed && change <= stepMaxDepthChange) || small {
				out[0] = pt{x: xMid, y: yHalf, piece: s.pi, super: s.super}
				out[1] = pt{x: xEndStep, y: yTwo, piece: s.pi, super: s.super}
				s.wrote(kHalf, true, kTwo, knownTwo)
				s.slope = (yTwo - yHalf) / (xEndStep - xMid)
				s.prevSlope, s.prevH = s.f.gvfSlope(kHalf), h/2
				s.x, s.y, s.atCrit = xEndStep, yTwo, false
				s.k, s.hasK = kTwo, knownTwo
				// The next step is one of the two halves.
				s.dx = h / 2 * growFactor(errEst, allowed)
				return 2
			}
			fac := 0.25
			if errEst > allowed {
				fac = math.Max(0.1, 0.9*math.Cbrt(allowed/errEst))
			}
			h *= fac
			continue
		}
		if s.atCrit || small {
			// No solution on this branch over the step: the flow is at
			// critical depth at its end (a fallback the caller reports).
			out[0] = pt{x: xEndStep, y: s.p.yc, piece: s.pi, super: s.super, fallback: true}
			s.wrote(stepState{}, false, stepState{}, false)
			s.x, s.y, s.atCrit, s.slope = xEndStep, s.p.yc, true, 0
			s.hasK, s.prevH = false, 0
			s.dx = h * 4
			return 1
		}
		h *= 0.25
	}
}

// solveFrom is one standard step of doubled from (xk, yk) with state k to
// xu: by Newton's method from the guess when there is one (newtonStep,
// which falls back to bracketing next to it), else by bracketing next to
// yk (stepFrom).
func (s *stepper) solveFrom(xk, yk float64, k stepState, xu, guess float64) (float64, bool, stepState, bool) {
	if guess > 0 && !math.IsInf(guess, 0) {
		y, ok, st := s.f.newtonStep(s.p, xk, k, xu, s.super, guess, yk)
		return y, ok, st, ok
	}
	return s.f.stepFrom(s.p, xk, yk, k, xu, s.super, guess)
}

// growFactor is the next-step factor from the error ratio, limited to
// [0.2, 4] with a safety factor of 0.9 (the error of the step scales as
// Δx³).
func growFactor(errEst, allowed float64) float64 {
	if errEst <= 0 {
		return 4
	}
	return math.Min(4, math.Max(0.2, 0.9*math.Cbrt(allowed/errEst)))
}

// firstStep sizes the first step from the slope of the profile so that the
// depth changes by about 2 %; the error control takes over from there.
func (s *stepper) firstStep(remaining float64) float64 {
	if s.atCrit {
		return math.Max(remaining*1e-3, s.dxMin)
	}
	dydx := s.f.slopeOfProfile(s.k)
	if !math.IsInf(dydx, 0) && !math.IsNaN(dydx) {
		s.slope = dydx // seeds the depth guess of the first step
	}
	sl := math.Abs(dydx)
	h := remaining
	if sl > 0 {
		h = 0.02 * s.y / sl
	}
	if !(h > s.dxMin) {
		h = s.dxMin
	}
	return math.Min(h, remaining)
}

// energyMinDepth is the depth of least specific energy E = y + αQ²/(2gA²)
// next to the critical depth yc. With a constant α (every shape but points
// sections) it is yc itself (Chow 1959, §3-2). In a points section α
// varies with depth, dE/dy = 1 − αQ²T/(gA³) + (dα/dy)·Q²/(2gA²), and the
// minimum can lie several per cent away from where the Froude number is 1;
// the energy equation changes branch at the minimum, so that is where the
// subcritical and supercritical branches are split and what a choke takes.
// Found by a scan of 48 depths over [yc/2, 2·yc] and a golden-section
// refinement (60 steps) between the neighbours of the lowest sample.
func energyMinDepth(g *Geometry, q, yc float64) float64 {
	if g.kind != kindPoints || !(q > 0) || !(yc > 0) {
		return yc
	}
	e := func(y float64) float64 { return SpecificEnergy(g, q, y) }
	const n = 48
	lo, hi := yc/2, 2*yc
	h := (hi - lo) / n
	best, bestE := 0, math.Inf(1)
	for i := 0; i <= n; i++ {
		if v := e(lo + float64(i)*h); v < bestE {
			best, bestE = i, v
		}
	}
	a := lo + float64(max(best-1, 0))*h
	b := lo + float64(min(best+1, n))*h
	const invPhi = 0.6180339887498949 // (√5 − 1)/2
	c, d := b-invPhi*(b-a), a+invPhi*(b-a)
	ec, ed := e(c), e(d)
	for range 60 {
		if ec < ed {
			b, d, ed = d, c, ec
			c = b - invPhi*(b-a)
			ec = e(c)
		} else {
			a, c, ec = c, d, ed
			d = a + invPhi*(b-a)
			ed = e(d)
		}
	}
	y := (a + b) / 2
	if !(y > 0) || math.IsInf(y, 0) {
		return yc
	}
	return y
}
