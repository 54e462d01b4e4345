package rules

import (
	"bytes"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
)

// Numbers in messages and remedies are formatted by model/numfmt, whose
// package doc states the rounding rule: measured values to three
// significant figures (numfmt.Num, numfmt.Pair for a value beside its
// limit), amounts a remedy asks for rounded up (numfmt.Up, or practicalUp
// to the increment of its quantity).

// Practical increments a remedy is rounded up to, by quantity and unit
// system: a height to 0.01 m or 0.05 ft (a survey and construction
// tolerance), a velocity to 0.1 m/s or 0.5 ft/s and a shear stress to
// 1 N/m² or 0.05 lb/ft² (the steps of published lining tables), a bend
// radius to 1 m or 5 ft. Source: common practice (no published source).
type increment int

const (
	heightStep increment = iota
	velocityStep
	stressStep
	radiusStep
)

func (k increment) step(u model.Units) float64 {
	us := u == model.US
	switch k {
	case velocityStep:
		if us {
			return 0.5
		}
		return 0.1
	case stressStep:
		if us {
			return 0.05
		}
		return 1
	case radiusStep:
		if us {
			return 5
		}
		return 1
	}
	if us {
		return 0.05
	}
	return 0.01
}

// practicalUp formats an amount a remedy asks for, rounded up to the
// practical increment of its quantity (numfmt.UpTo), so that what is
// printed is buildable and never short of what is needed.
func practicalUp(x float64, k increment, u model.Units) string {
	return numfmt.UpTo(x, k.step(u))
}

// stations describes a span: "at station 120 m" or "over stations 120–180 m".
func stations(from, to float64, u model.Units) string {
	// The numbers are formatted on the stack, with one allocation for the
	// text.
	var ba, bb [40]byte
	a, b := numfmt.AppendSpan(ba[:0], bb[:0], from, to)
	if bytes.Equal(a, b) {
		return "at station " + string(a) + " " + u.Length()
	}
	return "over stations " + string(a) + "–" + string(b) + " " + u.Length()
}
