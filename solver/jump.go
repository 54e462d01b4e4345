package solver

import (
	"math"

	"gonum.org/v1/gonum/interp"
)

// NoJump is what ClassifyJump returns for an upstream Froude number of 1
// or less: no hydraulic jump can form from subcritical flow.
const NoJump JumpType = ""

// Upper bounds of the jump classes by upstream Froude number F1 (Peterka,
// Hydraulic Design of Stilling Basins and Energy Dissipators, USBR
// Engineering Monograph 25, 1958; Chow 1959, ch. 15). A value on a bound
// belongs to the lower class.
const (
	undularMaxF     = 1.7
	weakMaxF        = 2.5
	oscillatingMaxF = 4.5
	steadyMaxF      = 9.0
)

// ClassifyJump returns the type of a jump on a horizontal floor from its
// upstream Froude number: undular 1–1.7, weak 1.7–2.5, oscillating
// 2.5–4.5, steady 4.5–9, strong above 9 (Peterka 1958; Chow 1959, ch. 15).
// Each class includes its upper bound. F1 ≤ 1 (or NaN) gives NoJump.
func ClassifyJump(f1 float64) JumpType {
	switch {
	case !(f1 > 1):
		return NoJump
	case f1 <= undularMaxF:
		return Undular
	case f1 <= weakMaxF:
		return Weak
	case f1 <= oscillatingMaxF:
		return Oscillating
	case f1 <= steadyMaxF:
		return Steady
	}
	return Strong
}

// jumpLengthTable is Peterka's curve of the length of a free jump on a
// horizontal apron, L/y2 against the upstream Froude number F1.
//
//	Source: Peterka, USBR Engineering Monograph 25 (1958), figure of the
//	length of jump in terms of y2 (reproduced in Chow 1959, ch. 15);
//	values read from the curve to about ±0.1, from memory.
//
// The curve starts at F1 = 1.7 (below it jumps are undular and have no
// defined roller length; the first value is held) and is nearly flat at
// about 6.1 from F1 ≈ 6 to 13; beyond the last point its value is held.
var jumpLengthTable = struct{ f1, ratio []float64 }{
	f1:    []float64{1.7, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 13.0},
	ratio: []float64{4.0, 4.4, 4.9, 5.3, 5.8, 6.0, 6.1, 6.1},
}

var jumpLengthCurve = func() interp.PiecewiseLinear {
	var pl interp.PiecewiseLinear
	_ = pl.Fit(jumpLengthTable.f1, jumpLengthTable.ratio) // Fit only panics on a malformed table
	return pl
}()

// JumpLength is the length of a hydraulic jump from the toe to the end of
// the roller, L = (L/y2)(F1)·y2, with L/y2 interpolated piecewise-linearly
// in Peterka's curve (see jumpLengthTable). It returns 0 when there is no
// jump: F1 ≤ 1, y2 ≤ y1, or a non-finite argument. y1 serves only that
// check; Peterka's curve depends on F1 and y2 alone.
func JumpLength(y1, y2, f1 float64) float64 {
	if !(f1 > 1) || !(y2 > y1) || !(y1 > 0) || math.IsInf(y2, 0) || math.IsInf(f1, 0) {
		return 0
	}
	return jumpLengthCurve.Predict(f1) * y2
}

// SequentDepth returns the depth conjugate to y for discharge q: the other
// depth with the same specific force M = Q²/(g·A) + A·z̄ (Chow 1959, ch. 3
// and ch. 15), deeper when y is supercritical and shallower when it is
// subcritical. Since dM/dy = A − Q²·T/(g·A²), M is least where
// Q²·T/(g·A³) = 1; the search first finds that minimum next to y and then
// the crossing of M(y) beyond it, each bracketed over the section's scan
// depths (doubling or halving outside them) and refined by Brent's method.
// For a points section with several minima of M the nearest conjugate on
// the other side of the nearest minimum is returned. A circle's conjugate
// may lie above the crown (the jump fills the conduit: Props reports
// Full). At the minimum of M itself y is returned. Zero discharge, or no
// crossing within the bounded walk, gives ErrNoSequentDepth.
func SequentDepth(g *Geometry, q, y float64) (float64, error) {
	q = math.Abs(q)
	if !(q > 0) || math.IsInf(q, 0) || math.IsNaN(y) {
		return 0, ErrNoSequentDepth
	}
	y = clampDepth(y)
	s := specificForceSlope(g, q, y)
	if s == 0 {
		return y, nil
	}
	m1 := SpecificForce(g, q, y)
	slope := func(v float64) float64 { return specificForceSlope(g, q, v) }
	force := func(v float64) float64 { return SpecificForce(g, q, v)/m1 - 1 }
	// Supercritical (dM/dy < 0): the conjugate is deeper; subcritical:
	// shallower. Walk to the minimum of M, then on to M = M1.
	up := s < 0
	lo, hi, ok := walkTo(g, y, up, func(v float64) bool {
		d := slope(v)
		return up && d >= 0 || !up && d <= 0
	})
	if !ok {
		return 0, ErrNoSequentDepth
	}
	ym, err := Brent(slope, lo, hi, 0)
	if err != nil {
		return 0, err
	}
	lo, hi, ok = walkTo(g, ym, up, func(v float64) bool { return force(v) >= 0 })
	if !ok {
		return 0, ErrNoSequentDepth
	}
	return Brent(force, lo, hi, 0)
}
