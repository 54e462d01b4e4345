package solver

import (
	"math"

	"github.com/chanlint/chanlint/model"
)

// shapeKind selects the closed form used by Props.
type shapeKind uint8

const (
	kindPrismatic shapeKind = iota // rectangle, trapezoid, triangle: one trapezoid formula
	kindCircle
	kindPoints
	kindBox
)

// Depth limits applied by Props. They keep every derived quantity finite
// for any argument (zero, negative, NaN or absurdly large depths) without a
// branch in the callers; they are far outside any real depth in metres or
// feet.
const (
	minDepth = 1e-12
	maxDepth = 1e9
)

// Geometry is a cross-section ready for hydraulic computation: the shape's
// constants are precomputed by NewGeometry so that Props costs a few
// floating-point operations and never allocates. Depth y is measured from
// the lowest point of the section (the invert). A Geometry is not changed
// after NewGeometry and is safe for concurrent use.
type Geometry struct {
	sec    *model.Section
	kind   shapeKind
	k, g   float64 // Manning's constant and gravity
	height float64

	// Prismatic: A = (b + z·y)·y.
	b, z    float64
	sideLen float64 // √(1+z²): wetted length of one side per unit depth
	kn      float64 // k/n of the single roughness

	circ circle
	box  box
	pts  compound
	// barrels is the number of identical closed barrels side by side
	// (1 for every other section): A, P, T, A·z̄ and K are those of one
	// barrel times barrels, R and the depths those of one.
	barrels float64
}

// NewGeometry precomputes the hydraulics of a validated section in the
// given unit system: k = u.Manning() and g = u.Gravity(). A section that
// model validation would reject (non-positive widths or roughness, fewer
// than two points) still gives a Geometry whose Props are finite; its
// results mean nothing.
func NewGeometry(s *model.Section, u model.Units) *Geometry {
	return NewBarrels(s, u, 1)
}

// NewBarrels is NewGeometry for n identical closed barrels side by side
// (a culvert's `barrels`); n is ignored (taken as 1) for an open section
// and below 1.
func NewBarrels(s *model.Section, u model.Units, n int) *Geometry {
	return newScaled(s, u, n, 1)
}

// newScaled is NewBarrels with every Manning's n of the section multiplied
// by nScale (a sensitivity run, see Vary). Conveyance is (k/n)·A·R^(2/3),
// so scaling n by nScale is the same as dividing k by it; the Geometry
// keeps the section itself, so identity comparisons still hold.
func newScaled(s *model.Section, u model.Units, n int, nScale float64) *Geometry {
	if !(nScale > 0) || math.IsInf(nScale, 0) {
		nScale = 1
	}
	g := &Geometry{sec: s, k: u.Manning() / nScale, g: u.Gravity(), height: s.Height, barrels: 1}
	if n > 1 && s.Closed() {
		g.barrels = float64(n)
	}
	switch s.Shape {
	case model.Box:
		g.kind = kindBox
		g.box = newBox(s.BottomWidth, s.Height, g.k/positive(s.Roughness[1]))
	case model.Circle:
		g.kind = kindCircle
		g.circ = newCircle(s.Diameter, g.k/positive(s.Roughness[1]))
		g.height = s.Diameter
	case model.Points:
		g.kind = kindPoints
		g.pts = newCompound(s, g.k)
		if !(g.height > 0) {
			g.height = g.pts.defaultHeight()
		}
		defer g.tabulate()
	default:
		g.kind = kindPrismatic
		switch s.Shape {
		case model.Rectangle:
			g.b = s.BottomWidth
		case model.Trapezoid:
			g.b, g.z = s.BottomWidth, s.SideSlope
		case model.Triangle:
			g.z = s.SideSlope
		}
		g.b, g.z = math.Max(g.b, 0), math.Max(g.z, 0)
		g.sideLen = math.Sqrt(1 + g.z*g.z)
		g.kn = g.k / positive(s.Roughness[1])
	}
	return g
}

// positive returns n, or 1 when n is not a positive number, so that an
// unvalidated section cannot put a division by zero into the hydraulics.
func positive(n float64) float64 {
	if n > 0 && !math.IsInf(n, 0) {
		return n
	}
	return 1
}

// Section returns the section the geometry was built from.
func (g *Geometry) Section() *model.Section { return g.sec }

// Height is the depth from the invert to the top of bank or lining: the
// section's `height`; the diameter of a circle; for a points section without
// `height`, the lower of the two end points above the lowest point. It is 0
// for a prismatic section whose height was not written (no bank known).
func (g *Geometry) Height() float64 { return g.height }

// K is Manning's constant of the unit system (1.0 SI, 1.486 US), divided
// by the roughness scale of a sensitivity run (see Vary).
func (g *Geometry) K() float64 { return g.k }

// G is standard gravity in the unit system.
func (g *Geometry) G() float64 { return g.g }

// Closed reports whether the section is a closed conduit (a circle or a
// box).
func (g *Geometry) Closed() bool { return g.kind == kindCircle || g.kind == kindBox }

// Barrels is the number of identical barrels of a closed section (1 for
// an open one).
func (g *Geometry) Barrels() int { return int(g.barrels) }

// scale multiplies the extensive properties of one barrel by the number
// of barrels.
func (g *Geometry) scale(p *Props) {
	n := g.barrels
	p.Area *= n
	p.Perimeter *= n
	p.TopWidth *= n
	p.FirstMoment *= n
	p.Conveyance *= n
}

// Props are the hydraulic properties of a section at one depth.
type Props struct {
	Area, Perimeter, TopWidth, HydraulicRadius float64
	// FirstMoment is A·z̄, the first moment of the wetted area about the
	// water surface (z̄ the depth of its centroid below the surface).
	FirstMoment float64
	// Conveyance is K = Σ (k/n_i)·A_i·R_i^(2/3) over the subdivisions, so
	// that Q = K·√Sf (Manning).
	Conveyance float64
	// Alpha is the energy (Coriolis) coefficient of a subdivided section,
	// (Σ K_i³/A_i²)/(K³/A²) (Chow 1959, ch. 6, from memory); 1 for a single
	// subdivision.
	Alpha float64
	// Full is true for a closed conduit at or above its crown.
	Full bool
}

// Velocity is the mean velocity Q/A (0 for an empty section).
func (p Props) Velocity(q float64) float64 {
	if p.Area <= 0 {
		return 0
	}
	return q / p.Area
}

// clampDepth maps any argument into [minDepth, maxDepth]; NaN goes to
// minDepth.
func clampDepth(y float64) float64 {
	if !(y > minDepth) {
		return minDepth
	}
	if y > maxDepth {
		return maxDepth
	}
	return y
}

// Props returns the hydraulic properties at depth y above the invert.
// Depths below 1e-12 (including zero, negative and NaN) are evaluated at
// 1e-12 and depths above 1e9 at 1e9, so every field is finite. Props does
// not allocate.
//
// Rectangle, trapezoid and triangle (bottom width b, side slope z
// horizontal per unit vertical; Chow 1959, Table 2-1, from memory):
//
//	A = (b + z·y)·y      P = b + 2·y·√(1+z²)      T = b + 2·z·y
//	A·z̄ = b·y²/2 + z·y³/3
//
// Circles are in circle.go, boxes in box.go and points sections in
// compound.go.
func (g *Geometry) Props(y float64) Props {
	y = clampDepth(y)
	switch g.kind {
	case kindCircle:
		p := g.circ.props(y)
		if g.barrels != 1 {
			g.scale(&p)
		}
		return p
	case kindBox:
		p := g.box.props(y)
		if g.barrels != 1 {
			g.scale(&p)
		}
		return p
	case kindPoints:
		return g.pts.props(y)
	}
	a := (g.b + g.z*y) * y
	p := g.b + 2*y*g.sideLen
	r := a / p
	return Props{
		Area:            a,
		Perimeter:       p,
		TopWidth:        g.b + 2*g.z*y,
		HydraulicRadius: r,
		FirstMoment:     g.b*y*y/2 + g.z*y*y*y/3,
		Conveyance:      g.kn * a * math.Cbrt(r*r),
		Alpha:           1,
	}
}

// FroudeNumber is F = √(α·Q²·T / (g·A³)), the Froude number of the
// section with the energy coefficient α included, so that F = 1 exactly
// where the critical-flow condition α·Q²·T/(g·A³) = 1 holds (Chow 1959,
// ch. 4, with the hydraulic depth D = A/T) and CriticalDepth, FroudeNumber
// and the regime agree. It is 0 for zero discharge, falls to 0 just below
// the crown of a circle, where T → 0, and is small in the Preissmann slot
// above it (see SlotRatio).
func FroudeNumber(g *Geometry, q, y float64) float64 {
	p := g.Props(y)
	return math.Sqrt(froude2(g, q, p))
}

// froude2 is α·Q²·T/(g·A³) for already computed properties.
func froude2(g *Geometry, q float64, p Props) float64 {
	if p.Area <= 0 {
		return 0
	}
	return p.Alpha * q * q * p.TopWidth / (g.g * p.Area * p.Area * p.Area)
}

// SpecificEnergy is E = y + α·Q²/(2·g·A²), the energy head above the
// invert (Chow 1959, ch. 3).
func SpecificEnergy(g *Geometry, q, y float64) float64 {
	y = clampDepth(y)
	p := g.Props(y)
	return y + p.Alpha*q*q/(2*g.g*p.Area*p.Area)
}

// SpecificForce is the momentum function M = Q²/(g·A) + A·z̄ (Chow 1959,
// ch. 3), in units of volume; it is equal on both sides of a hydraulic
// jump. The momentum coefficient is taken as 1 for every shape; for a
// points section A·z̄ is that of the whole wetted area.
func SpecificForce(g *Geometry, q, y float64) float64 {
	p := g.Props(y)
	return q*q/(g.g*p.Area) + p.FirstMoment
}

// specificForceSlope is dM/dy = A − Q²·T/(g·A²): d(A·z̄)/dy = A exactly,
// so M is stationary where Q²·T/(g·A³) = 1.
func specificForceSlope(g *Geometry, q, y float64) float64 {
	p := g.Props(y)
	return p.Area - q*q*p.TopWidth/(g.g*p.Area*p.Area)
}

// FrictionSlope is Sf = (Q/K)², Manning's equation solved for the slope of
// the energy line, with K the (subdivided) conveyance.
func FrictionSlope(g *Geometry, q, y float64) float64 {
	p := g.Props(y)
	c := q / p.Conveyance
	return c * c
}
