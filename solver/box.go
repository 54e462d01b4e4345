package solver

import "math"

// box holds the precomputed constants of a closed rectangular conduit
// (inside width b, rise h).
//
// Partly full it is an open rectangle (Chow 1959, Table 2-1, from memory):
//
//	A = b·y     P = b + 2·y     T = b     A·z̄ = b·y²/2
//
// At and above the soffit it flows full under pressure, with the same
// Preissmann slot as a circle (see SlotRatio), of width SlotRatio·b:
//
//	A = b·h + T_slot·(y − h)     P = 2·(b + h)     R = b·h / (2·(b + h))
//
// so friction is that of the full barrel (K = K_full) and Full is set.
// The wetted perimeter jumps from b + 2h to 2(b + h) when the soffit is
// wetted, so the largest open-channel conveyance is that just below the
// soffit, (k/n)·b·h·(b·h/(b + 2h))^(2/3), above K_full.
type box struct {
	b, h  float64
	kn    float64
	slot  float64
	aFull float64
	kFull float64
	kMax  float64 // conveyance just below the soffit
}

func newBox(b, h, kn float64) box {
	b, h = math.Max(b, 0), math.Max(h, 0)
	x := box{b: b, h: h, kn: kn, slot: SlotRatio * b, aFull: b * h}
	if b > 0 && h > 0 {
		rFull := b * h / (2 * (b + h))
		x.kFull = kn * x.aFull * math.Cbrt(rFull*rFull)
		rOpen := b * h / (b + 2*h)
		x.kMax = kn * x.aFull * math.Cbrt(rOpen*rOpen)
	}
	return x
}

// props of a box at depth y (already clamped to a positive value).
func (x *box) props(y float64) Props {
	if x.b <= 0 || x.h <= 0 {
		return Props{Alpha: 1}
	}
	if y >= x.h {
		s := y - x.h
		return Props{
			Area:            x.aFull + x.slot*s,
			Perimeter:       2 * (x.b + x.h),
			TopWidth:        x.slot,
			HydraulicRadius: x.aFull / (2 * (x.b + x.h)),
			FirstMoment:     x.aFull*(y-x.h/2) + x.slot*s*s/2,
			Conveyance:      x.kFull,
			Alpha:           1,
			Full:            true,
		}
	}
	a := x.b * y
	p := x.b + 2*y
	r := a / p
	return Props{
		Area:            a,
		Perimeter:       p,
		TopWidth:        x.b,
		HydraulicRadius: r,
		FirstMoment:     x.b * y * y / 2,
		Conveyance:      x.kn * a * math.Cbrt(r*r),
		Alpha:           1,
	}
}
