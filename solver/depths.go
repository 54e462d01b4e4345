package solver

import (
	"fmt"
	"math"
	"slices"

	"github.com/chanlint/chanlint/model/numfmt"
)

// maxScanSteps bounds every bracketing walk over trial depths beyond the
// scan grid of a section: doubling from 1e-12 passes the 1e9 depth limit
// in 70 steps, so this bound is never the limit for a real section.
const maxScanSteps = 200

// walkTo steps from y over the section's scan depths (points sections) or
// by doubling or halving, upwards or downwards, until done holds at the
// new depth, a bounded number of times. It returns the last depth where
// done did not hold and the first where it holds; ok is false when the
// walk reached a depth limit or its bound first.
func walkTo(g *Geometry, y float64, up bool, done func(float64) bool) (prev, at float64, ok bool) {
	prev = y
	for range maxScanSteps + len(g.pts.grid) {
		if up {
			at = g.scanAbove(prev)
		} else {
			at = g.scanBelow(prev)
		}
		if done(at) {
			return prev, at, true
		}
		if at >= maxDepth || at <= minDepth {
			break
		}
		prev = at
	}
	return 0, 0, false
}

// bracketUp finds lo < hi with f(lo) < 0 ≤ f(hi) for a function that is
// negative at small depths and not negative at large ones: from y0 it
// walks down while f ≥ 0, then up, so that for a points section the
// lowest crossing above the first grid depth is bracketed. ok is false
// when the bounded walk found no bracket.
func bracketUp(g *Geometry, f func(float64) float64, y0 float64) (lo, hi float64, ok bool) {
	lo = clampDepth(y0)
	if f(lo) >= 0 {
		if _, lo, ok = walkTo(g, lo, false, func(v float64) bool { return f(v) < 0 }); !ok {
			return 0, 0, false
		}
	}
	return walkTo(g, lo, true, func(v float64) bool { return f(v) >= 0 })
}

// normalBracket is bracketUp from the first scan depth of a points
// section for f(y) = K(y)/target − 1, with the walk up the grid done on the
// tabulated running maximum of K (see gridTable): the first grid depth
// where K reaches target is found by binary search, and the depth before
// it, where every K is below target, closes the bracket. Beyond the grid
// (and below its first depth) the walk goes on as in bracketUp.
func normalBracket(g *Geometry, f func(float64) float64, target float64) (lo, hi float64, ok bool) {
	grid, kmax := g.pts.grid, g.pts.tab.kmax
	if len(grid) == 0 || len(kmax) != len(grid) || f(grid[0]) >= 0 {
		y0 := 1.0
		if len(grid) > 0 {
			y0 = grid[0]
		}
		return bracketUp(g, f, y0)
	}
	i, _ := slices.BinarySearch(kmax, target) // first kmax[i] ≥ target
	// Near the root the table's value is checked against f itself.
	for i < len(grid) && i > 0 && math.Abs(kmax[i]/target-1) < tabulateNear && f(grid[i]) < 0 {
		i++
	}
	if i >= len(grid) {
		return walkTo(g, grid[len(grid)-1], true, func(v float64) bool { return f(v) >= 0 })
	}
	return grid[max(i-1, 0)], grid[i], true
}

// NormalDepth is the depth of uniform flow of discharge q on bed slope
// `slope`: the depth where the conveyance K(y) (subdivided for points
// sections) equals Q/√S0, from Manning's equation
//
//	Q = K·√S0,  K = Σ (k/n_i)·A_i·R_i^(2/3)   (Manning; Chow 1959, ch. 6)
//
// found by Brent's method on a bracket grown from a wide-channel estimate
// (a bounded number of doublings) or, for points sections, on the first
// crossing over the section's scan depths (the lowest normal depth when
// the subdivided conveyance is not monotonic).
//
// It returns ErrNoNormalDepth (unwrapped, no allocation) when slope ≤ 0:
// no uniform flow exists on horizontal and adverse beds. For a circle it
// searches below y/D = 0.9382, where the open-channel conveyance is
// largest (about 1.0757·K_full); between K_full and that maximum two
// normal depths exist and the lower one, the one reached by a rising
// discharge, is returned. A discharge above the largest open-channel flow
// returns ErrNoNormalDepth wrapped with a message giving the capacity: the
// conduit then runs full under pressure with a friction slope steeper than
// the bed. A zero discharge has normal depth 0.
func NormalDepth(g *Geometry, q, slope float64) (float64, error) {
	if !(slope > 0) || math.IsInf(slope, 0) {
		return 0, ErrNoNormalDepth
	}
	q = math.Abs(q)
	if q == 0 {
		return 0, nil
	}
	if !numfmt.Finite(q) {
		return 0, ErrNoNormalDepth
	}
	target := q / math.Sqrt(slope)
	f := func(y float64) float64 { return g.Props(y).Conveyance/target - 1 }
	switch g.kind {
	case kindCircle, kindBox:
		kFull, kMax, yMax, _ := g.FullFlow()
		if !(target <= kMax) {
			rs := math.Sqrt(slope)
			return 0, fmt.Errorf("%w: discharge %s exceeds the largest open-channel flow %s of the %s-high conduit at slope %s (at a depth of %s; flowing full it carries %s), so it runs full under pressure",
				ErrNoNormalDepth, num(q), num(kMax*rs), num(g.height), num(slope), num(yMax), num(kFull*rs))
		}
		if g.kind == kindBox {
			// The conveyance rises with depth up to the soffit, where the
			// perimeter jumps: search just below it.
			yMax *= 1 - 1e-12
		}
		return Brent(f, minDepth, yMax, 0)
	case kindPoints:
		lo, hi, ok := normalBracket(g, f, target)
		if !ok {
			return 0, ErrNoNormalDepth
		}
		return Brent(f, lo, hi, 0)
	}
	// Prismatic: start from the wide-rectangle depth (q·n/(k·b·√S))^(3/5),
	// which is below the normal depth because R < y, or for a triangle
	// from its exact power law K = (k/n)·z·y²·(z·y/(2√(1+z²)))^(2/3).
	var y0 float64
	if g.b > 0 {
		y0 = math.Pow(target/(g.kn*g.b), 0.6)
	} else if g.z > 0 {
		y0 = math.Pow(target/(g.kn*g.z*math.Cbrt(sq(g.z/(2*g.sideLen)))), 3.0/8)
	} else {
		return 0, ErrNoNormalDepth // zero-width section
	}
	lo, hi, ok := bracketUp(g, f, y0)
	if !ok {
		return 0, ErrNoNormalDepth
	}
	return Brent(f, lo, hi, 0)
}

func sq(x float64) float64 { return x * x }

// criticalFn is −ln(α·Q²·T/(g·A³)): negative below the critical depth,
// positive above, and close to linear in ln y, which keeps Brent's
// interpolation steps useful over many orders of magnitude.
func criticalFn(g *Geometry, q float64) func(float64) float64 {
	return func(y float64) float64 {
		p := g.Props(y)
		return math.Log(g.g*p.Area*p.Area*p.Area) - math.Log(p.Alpha*q*q*p.TopWidth)
	}
}

// CriticalDepth is the depth where α·Q²·T/(g·A³) = 1, the minimum of the
// specific energy for a single subdivision (Chow 1959, ch. 4).
// A zero discharge has critical depth 0.
//
// Rectangle, trapezoid, triangle: the condition has a single root, found
// by Brent's method on a bracket grown from the rectangle (or triangle)
// closed form.
//
// Circle: as y approaches the crown T → 0, so the Froude number falls to 0
// and a critical depth below the crown exists for every discharge; the
// search is capped just below the crown. A discharge so large that the
// flow is still supercritical within 1e-12·D of the crown returns the
// diameter with ErrNoCriticalDepth (wrapped): the conduit cannot pass it
// in open-channel flow. Critical depths above about 0.9·D are unstable in
// practice (the surface seals against the crown).
//
// Points: the condition can hold at several depths (for example once in
// the main channel and again when wide overbanks flood). All roots are
// found by a sign scan over the vertex elevations (CriticalDepths) and the
// one with the least specific energy is returned: that is the state with
// the minimum energy that can pass the discharge, the control a free
// overfall or a steep entrance sets, and the one that decides whether a
// section chokes (compare Blalock & Sturm, J. Hydraulic Div. ASCE 1981,
// on multiple critical depths in compound channels, from memory). Where α
// varies with depth the true minimum of E = y + α·Q²/(2·g·A²) lies
// slightly off this condition (by the dα/dy term); the α-condition is kept
// so that the critical depth, FroudeNumber and the regime always agree.
func CriticalDepth(g *Geometry, q float64) (float64, error) {
	q = math.Abs(q)
	if q == 0 {
		return 0, nil
	}
	if !numfmt.Finite(q) {
		return 0, ErrNoCriticalDepth
	}
	if g.kind == kindPoints {
		var buf [8]float64
		roots := CriticalDepths(g, q, buf[:0])
		if len(roots) == 0 {
			return 0, ErrNoCriticalDepth
		}
		best, bestE := roots[0], SpecificEnergy(g, q, roots[0])
		for _, r := range roots[1:] {
			if e := SpecificEnergy(g, q, r); e < bestE {
				best, bestE = r, e
			}
		}
		return best, nil
	}
	return criticalSingle(g, q)
}

// criticalSingle is the critical depth of a prismatic section or a
// circle, where it is unique.
func criticalSingle(g *Geometry, q float64) (float64, error) {
	f := criticalFn(g, q)
	if g.kind == kindBox {
		// yc = (Q²/(g·B²))^(1/3) with B the width of all barrels, below the
		// soffit (Chow 1959, ch. 4).
		h, w := g.box.h, g.barrels*g.box.b
		if !(h > 0 && w > 0) {
			return 0, ErrNoCriticalDepth
		}
		yc := math.Cbrt(q * q / (g.g * w * w))
		if yc >= h {
			return h, fmt.Errorf("%w: discharge %s is supercritical up to the soffit of the %s-high box", ErrNoCriticalDepth, num(q), num(h))
		}
		return yc, nil
	}
	if g.kind == kindCircle {
		d := g.circ.d
		if !(d > 0) {
			return 0, ErrNoCriticalDepth
		}
		hi := d * (1 - 1e-12)
		if f(hi) < 0 {
			return d, fmt.Errorf("%w: discharge %s is supercritical up to the crown of the %s conduit", ErrNoCriticalDepth, num(q), num(d))
		}
		lo := clampDepth(math.Min(d/2, math.Pow(q*q/g.g, 0.2))) // √(Q²/g)^(2/5): the scale of yc in a pipe
		for i := 0; f(lo) > 0; i++ {
			if i == maxScanSteps || lo <= minDepth {
				return 0, ErrNoCriticalDepth
			}
			lo /= 2
		}
		return Brent(f, lo, hi, 0)
	}
	// yc = (Q²/(g·b²))^(1/3) for a rectangle; (2·Q²/(g·z²))^(1/5) for a
	// triangle (Chow 1959, ch. 4).
	var y0 float64
	switch {
	case g.b > 0:
		y0 = math.Cbrt(q * q / (g.g * g.b * g.b))
	case g.z > 0:
		y0 = math.Pow(2*q*q/(g.g*g.z*g.z), 0.2)
	default:
		return 0, ErrNoCriticalDepth
	}
	lo, hi, ok := bracketUp(g, f, y0)
	if !ok {
		return 0, ErrNoCriticalDepth
	}
	return Brent(f, lo, hi, 0)
}

// CriticalDepths appends to dst, in ascending order, every depth where the
// Froude number falls through 1 as the depth rises (α·Q²·T/(g·A³) = 1
// with dE/dy changing from negative to positive: the local minima of the
// specific energy) and returns the extended slice. Where F rises through
// 1 with depth — when the top width jumps as a flat overbank floods — the
// specific energy has a local maximum; that is not a critical depth and is
// not returned. For a points section the roots come from a sign scan over
// gridSub intervals between consecutive vertex elevations plus a depth
// just above each of them; above the highest vertex the scan stops at the
// first subcritical trial (between vertical walls the condition falls
// monotonically). For the other shapes it appends the single
// CriticalDepth. A tangency that touches 1 without crossing is not a root.
// It does not allocate when dst has room.
func CriticalDepths(g *Geometry, q float64, dst []float64) []float64 {
	q = math.Abs(q)
	if q == 0 || !numfmt.Finite(q) {
		return dst
	}
	if g.kind != kindPoints {
		if y, err := criticalSingle(g, q); err == nil {
			dst = append(dst, y)
		}
		return dst
	}
	f := criticalFn(g, q)
	grid, zc := g.pts.grid, g.pts.tab.zc
	lo, top := 1.0, 0.0
	if len(grid) > 0 {
		lo, top = grid[0], grid[len(grid)-1]
	}
	flo := f(lo)
	for i := 0; flo >= 0; i++ {
		if i == maxScanSteps || lo <= minDepth {
			return dst // still supercritical at 1e-12: nothing to report
		}
		lo /= 2
		flo = f(lo)
	}
	// Over the grid the condition comes from the table (see gridTable),
	// f = zc − ln Q², re-evaluated only next to a root; Brent's method
	// refines each bracket on f itself.
	lnq2 := 2 * math.Log(q)
	tabulated := len(zc) == len(grid)
	j, _ := slices.BinarySearch(grid, lo)
	for range maxScanSteps + len(grid) {
		// The next scan depth above lo, as scanAbove finds it.
		for j < len(grid) && !(grid[j] > lo*(1+1e-12)) {
			j++
		}
		var hi, fhi float64
		switch {
		case j < len(grid) && tabulated:
			hi = grid[j]
			if fhi = zc[j] - lnq2; math.Abs(fhi) < tabulateNear {
				fhi = f(hi)
			}
		case j < len(grid):
			hi = grid[j]
			fhi = f(hi)
		default:
			hi = 2 * lo
			fhi = f(hi)
		}
		if flo < 0 && fhi >= 0 {
			if y, err := Brent(f, lo, hi, 0); err == nil {
				dst = append(dst, y)
			}
		}
		if hi > top && fhi >= 0 || hi >= maxDepth {
			break
		}
		lo, flo = hi, fhi
	}
	return dst
}
