package solver

import (
	"errors"
	"math"

	"github.com/chanlint/chanlint/model/numfmt"
)

// Sentinel errors of the section hydraulics. Callers test them with
// errors.Is; some are returned wrapped with the numbers that explain them.
var (
	// ErrNoBracket: the function has the same sign at both ends of the
	// interval given to Brent.
	ErrNoBracket = errors.New("root not bracketed: the function has the same sign at both ends")
	// ErrNoConvergence: an iteration did not close within its bound, or
	// the function returned NaN.
	ErrNoConvergence = errors.New("root finder did not converge")
	// ErrNoNormalDepth: no uniform flow exists — the bed slope is zero or
	// adverse, or a closed conduit cannot carry the discharge in open
	// channel flow at that slope.
	ErrNoNormalDepth = errors.New("no normal depth")
	// ErrNoCriticalDepth: no critical depth exists below the crown of a
	// closed conduit for this discharge, or the section is degenerate.
	ErrNoCriticalDepth = errors.New("no critical depth")
	// ErrNoSequentDepth: no conjugate depth with the same specific force
	// exists (zero discharge, or none within the bounded search).
	ErrNoSequentDepth = errors.New("no sequent depth")
)

// brentMaxIter bounds Brent's iteration. The method needs at most about
// (log2(|b−a|/tol))² evaluations (Brent 1973, ch. 4); with the
// machine-precision floor on tol that is far below this bound for any
// bracket a float64 can hold, so hitting it means f is not a function
// (for example it returns different values for the same argument).
const brentMaxIter = 400

// Brent finds a root of f in [a, b] by Brent's method: inverse quadratic
// interpolation and secant steps, safeguarded by bisection so that the
// bracket always shrinks.
//
//	Source: R. P. Brent, Algorithms for Minimization without Derivatives,
//	Prentice-Hall, 1973, ch. 4 (procedure zero).
//
// tol is the absolute tolerance on x; the effective tolerance is
// 2·ε·|x| + tol/2 with ε the float64 machine epsilon, so tol = 0 asks for
// full precision. f(a) and f(b) must have opposite signs (or one be zero),
// else ErrNoBracket. A NaN from f, or more than a bounded number of
// iterations, gives ErrNoConvergence with the best estimate so far.
//
// Brent does not retain f, so a closure literal passed by the caller does
// not escape and costs no heap allocation (see BenchmarkBrentClosure).
func Brent(f func(float64) float64, a, b, tol float64) (float64, error) {
	if !numfmt.Finite(a, b) {
		return 0, ErrNoBracket
	}
	if !(tol >= 0) {
		tol = 0
	}
	return brentFrom(f, a, b, f(a), f(b), tol)
}

// brentFrom is Brent with f(a) = fa and f(b) = fb already evaluated, for a
// caller that found the bracket by evaluating its ends.
func brentFrom(f func(float64) float64, a, b, fa, fb, tol float64) (float64, error) {
	if !(tol >= 0) {
		tol = 0
	}
	if math.IsNaN(fa) || math.IsNaN(fb) {
		return a, ErrNoConvergence
	}
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	if (fa > 0) == (fb > 0) {
		return a, ErrNoBracket
	}
	const eps = 0x1p-52
	c, fc := a, fa
	d := b - a
	e := d
	for range brentMaxIter {
		if (fb > 0) == (fc > 0) {
			// b and c on the same side: restore the bracket from a.
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			// Keep b the best estimate.
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 2*eps*math.Abs(b) + 0.5*tol
		m := 0.5 * (c - b)
		if math.Abs(m) <= tol1 || fb == 0 {
			return b, nil
		}
		if math.Abs(e) < tol1 || math.Abs(fa) <= math.Abs(fb) {
			// The last step was too small, or did not improve: bisect.
			d, e = m, m
		} else {
			s := fb / fa
			var p, q float64
			if a == c {
				// Linear (secant) interpolation.
				p = 2 * m * s
				q = 1 - s
			} else {
				// Inverse quadratic interpolation.
				qq := fa / fc
				r := fb / fc
				p = s * (2*m*qq*(qq-r) - (b-a)*(r-1))
				q = (qq - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < 3*m*q-math.Abs(tol1*q) && p < math.Abs(0.5*e*q) {
				e = d
				d = p / q
			} else {
				d, e = m, m
			}
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else if m > 0 {
			b += tol1
		} else {
			b -= tol1
		}
		fb = f(b)
		if math.IsNaN(fb) {
			return b, ErrNoConvergence
		}
	}
	return b, ErrNoConvergence
}
