package solver

import "math"

// SlotRatio is the width of the Preissmann slot of a circular conduit as a
// fraction of its diameter. Above the crown the conduit is treated as
// flowing full under pressure, and a narrow vertical slot on the crown
// gives the water surface (the hydraulic grade line) somewhere to be:
//
//	A = A_full + T_slot·(y − D),   T = T_slot = SlotRatio·D
//
// so that area, specific energy and specific force keep growing with y and
// the energy equation stays solvable through surcharge. The slot is a
// numerical device (Preissmann slot; Cunge, Holly & Verwey, Practical
// Aspects of Computational River Hydraulics, 1980, from memory):
// friction uses the full pipe (P = πD, R = D/4, K = K_full) and Full is
// reported so that a surcharged conduit is always visible. 0.001·D keeps
// the fictitious slot storage below 0.13 % of the full area per diameter
// of surcharge; the Froude number in the slot, F = V·√(0.00127/(g·D)),
// stays far below 1 (0.2 at 10 m/s in a 0.3 m pipe).
const SlotRatio = 0.001

// Ratios of the partly full circle with constant n, found once from the
// stationary conditions of Manning's equation in terms of the central
// angle θ (A = D²(θ − sin θ)/8, P = θ·D/2):
//
//	max Q ∝ A^(5/3)/P^(2/3):  5·θ·(1 − cos θ) = 2·(θ − sin θ)
//	max V ∝ (A/P)^(2/3):      θ·(1 − cos θ) = θ − sin θ
//
// with y/D = (1 − cos(θ/2))/2, which gives y/D = 0.9382 and 0.8128
// (values computed; the classical curves of partly full circles round
// them to 0.94 and 0.81: Chow, Open-Channel Hydraulics, 1959, ch. 6, from
// memory).
var (
	circleQmaxDepthRatio = circleStationary(func(t float64) float64 {
		return 5*t*(1-math.Cos(t)) - 2*(t-math.Sin(t))
	})
	circleVmaxDepthRatio = circleStationary(func(t float64) float64 {
		return t*(1-math.Cos(t)) - (t - math.Sin(t))
	})
)

// circleStationary solves f(θ) = 0 for θ in (π, 2π) and returns y/D.
func circleStationary(f func(float64) float64) float64 {
	t, err := Brent(f, math.Pi, 2*math.Pi-1e-9, 0)
	if err != nil {
		panic("solver: partly full circle constants: " + err.Error())
	}
	return (1 - math.Cos(t/2)) / 2
}

// circle holds the precomputed constants of a circular conduit.
type circle struct {
	d, r  float64
	kn    float64 // k/n
	slot  float64 // Preissmann slot width
	aFull float64
	kFull float64 // conveyance flowing full
	yQmax float64 // depth of the largest open-channel conveyance
	kMax  float64 // that conveyance
}

func newCircle(d, kn float64) circle {
	d = math.Max(d, 0)
	c := circle{d: d, r: d / 2, kn: kn, slot: SlotRatio * d}
	c.aFull = math.Pi * d * d / 4
	c.kFull = kn * c.aFull * math.Cbrt(d*d/16)
	c.yQmax = circleQmaxDepthRatio * d
	if d > 0 {
		c.kMax = c.props(c.yQmax).Conveyance
	}
	return c
}

// props of a circle at depth y (already clamped to a positive value).
//
// Partly full (Chow 1959, Table 2-1, from memory), θ = 2·acos(1 − 2y/D) the central
// angle subtended by the water surface:
//
//	A = D²(θ − sin θ)/8     P = θ·D/2     T = 2·√(y·(D − y))
//	A·z̄ = A·(y − D/2) + T³/12
//
// The first moment follows from the centroid of a circular segment,
// 4·r·sin³(θ/2)/(3·(θ − sin θ)) from the centre (common practice, standard
// result of plane geometry), with T = 2·r·sin(θ/2).
func (c *circle) props(y float64) Props {
	if c.d <= 0 {
		return Props{Alpha: 1}
	}
	if y >= c.d {
		s := y - c.d
		a := c.aFull + c.slot*s
		return Props{
			Area:            a,
			Perimeter:       math.Pi * c.d,
			TopWidth:        c.slot,
			HydraulicRadius: c.d / 4,
			FirstMoment:     c.aFull*(y-c.r) + c.slot*s*s/2,
			Conveyance:      c.kFull,
			Alpha:           1,
			Full:            true,
		}
	}
	t := 2 * math.Acos(1-2*y/c.d)
	var tms float64 // θ − sin θ without cancellation for small θ
	if t < 1e-2 {
		t2 := t * t
		tms = t * t2 / 6 * (1 - t2/20*(1-t2/42))
	} else {
		tms = t - math.Sin(t)
	}
	a := c.d * c.d * tms / 8
	p := t * c.r
	w := 2 * math.Sqrt(y*(c.d-y))
	r := a / p
	return Props{
		Area:            a,
		Perimeter:       p,
		TopWidth:        w,
		HydraulicRadius: r,
		FirstMoment:     a*(y-c.r) + w*w*w/12,
		Conveyance:      c.kn * a * math.Cbrt(r*r),
		Alpha:           1,
	}
}

// FullFlow returns, for a closed conduit, its conveyance flowing full
// (K_full, so that the full-pipe discharge at slope S is K_full·√S) and
// the largest open-channel conveyance with the depth where it occurs
// (about 1.0757·K_full at y/D ≈ 0.9382 in a circle; just below the
// soffit of a box), all barrels together. ok is false for open sections.
func (g *Geometry) FullFlow() (kFull, kMax, yMax float64, ok bool) {
	switch g.kind {
	case kindCircle:
		return g.barrels * g.circ.kFull, g.barrels * g.circ.kMax, g.circ.yQmax, true
	case kindBox:
		return g.barrels * g.box.kFull, g.barrels * g.box.kMax, g.box.h, true
	}
	return 0, 0, 0, false
}
