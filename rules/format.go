package rules

import (
	"bytes"
	"math"
	"strconv"

	"github.com/chanlint/chanlint/model"
)

// Num is num for the outputs: every measured number of chanlint reads the
// same in text, JSON messages, SARIF and the report.
func Num(x float64) string { return num(x) }

// num formats a measured value compactly: three significant digits, never
// fewer digits than the integer part, trailing zeros trimmed. A value that
// is not finite (which the rules never pass on purpose) prints as "n/a" so
// that no output ever carries NaN or Inf.
func num(x float64) string {
	if !finite(x) {
		return "n/a"
	}
	var buf [40]byte
	return string(appendNum(buf[:0], x))
}

// appendNum appends num(x) of a finite x to dst: numPair of (x, x), with
// the number formatted once.
func appendNum(dst []byte, x float64) []byte {
	d := decimals(x)
	start := len(dst)
	dst = strconv.AppendFloat(dst, clean(x, d), 'f', d, 64)
	return trimZeros(dst, start, d)
}

// trimZeros drops the trailing zeros of the decimals of the number
// formatted in b[start:] with d decimals, and the point when none is left.
func trimZeros(b []byte, start, d int) []byte {
	for d > 0 && b[len(b)-1] == '0' {
		b = b[:len(b)-1]
		d--
	}
	if d == 0 && len(b) > start && b[len(b)-1] == '.' {
		b = b[:len(b)-1]
	}
	return b
}

// numPair formats a measured value and its limit (or the two ends of a
// span) with the same number of decimals, so that "0.18 m is below 0.30 m"
// reads naturally: the decimals show three significant digits of b, and at
// least two of a; trailing zeros are trimmed only where both numbers have
// them.
func numPair(a, b float64) (string, string) {
	if !finite(a) || !finite(b) {
		return numOne(a), numOne(b)
	}
	if a == b {
		// One number: both strings are the same.
		s := num(a)
		return s, s
	}
	var ba, bb [40]byte
	sa, sb := appendPair(ba[:0], bb[:0], a, b)
	return string(sa), string(sb)
}

// appendPair appends the two strings numPair returns for finite a and b to
// da and db.
func appendPair(da, db []byte, a, b float64) ([]byte, []byte) {
	d := max(decimals(b), decimals(a)-1)
	sa := strconv.AppendFloat(da, clean(a, d), 'f', d, 64)
	sb := strconv.AppendFloat(db, clean(b, d), 'f', d, 64)
	for d > 0 && sa[len(sa)-1] == '0' && sb[len(sb)-1] == '0' {
		sa, sb = sa[:len(sa)-1], sb[:len(sb)-1]
		d--
	}
	if d == 0 {
		sa, sb = bytes.TrimSuffix(sa, dot), bytes.TrimSuffix(sb, dot)
	}
	return sa, sb
}

var dot = []byte(".")

func numOne(x float64) string { return num(x) }

// decimals is the number of decimals that shows three significant digits
// of x, between 0 and 6.
func decimals(x float64) int {
	a := math.Abs(x)
	if a == 0 {
		return 0
	}
	d := 2 - int(math.Floor(math.Log10(a)))
	return min(max(d, 0), 6)
}

// pow10 holds 10^d for the decimals numbers are printed with (0 to 6).
var pow10 = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6}

// clean rounds x to d decimals and removes a negative zero.
func clean(x float64, d int) float64 {
	if math.Abs(x) >= 1e15 { // already whole; scaling could overflow
		return x
	}
	p := pow10[d]
	r := math.Round(x*p) / p
	if r == 0 {
		return 0
	}
	return r
}

// numUp formats an amount a remedy asks for ("raise the bank by at least
// ..."): like num, but rounded up at the last digit shown, so the printed
// amount is never short of what is needed.
func numUp(x float64) string {
	if !finite(x) {
		return "n/a"
	}
	d := decimals(x)
	p := pow10[d]
	// Subtract a relative hair before rounding up, so that a value that is
	// already round (0.3 computed as 0.30000000000000004) stays 0.3.
	if math.Abs(x) >= 1e15 {
		return num(x)
	}
	up := math.Ceil(x*p*(1-1e-12)) / p
	return num(up)
}

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
// practical increment of its quantity (see increment), so that what is
// printed is buildable and never short of what is needed. An amount below
// one increment is printed as one increment; one too large for the
// increment (beyond 1e12 steps) falls back to numUp.
func practicalUp(x float64, k increment, u model.Units) string {
	step := k.step(u)
	if !finite(x) || math.Abs(x/step) > 1e12 {
		return numUp(x)
	}
	n := math.Ceil(x/step*(1-1e-12) - 1e-9)
	if n < 1 {
		n = 1
	}
	return strconv.FormatFloat(n*step, 'f', stepDecimals(step), 64)
}

// stepDecimals is how many decimals a multiple of step needs.
func stepDecimals(step float64) int {
	d := 0
	for s := step; d < 6 && math.Abs(s-math.Round(s)) > 1e-9; s *= 10 {
		d++
	}
	return d
}

// stations describes a span: "at station 120 m" or "over stations 120–180 m".
func stations(from, to float64, u model.Units) string {
	if finite(from) && finite(to) {
		// The common case, with the numbers formatted on the stack and one
		// allocation for the text.
		var ba, bb [40]byte
		a, b := appendPair(ba[:0], bb[:0], from, to)
		if bytes.Equal(a, b) {
			return "at station " + string(a) + " " + u.Length()
		}
		return "over stations " + string(a) + "–" + string(b) + " " + u.Length()
	}
	a, b := numPair(from, to)
	if a == b {
		return "at station " + a + " " + u.Length()
	}
	return "over stations " + a + "–" + b + " " + u.Length()
}

// Unit symbols of the quantities the rules report.
func velocityUnit(u model.Units) string {
	if u == model.US { // u.Length() + "/s", without building it
		return "ft/s"
	}
	return "m/s"
}

func stressUnit(u model.Units) string {
	if u == model.US {
		return "lb/ft²"
	}
	return "N/m²"
}

// finite reports whether every value is a finite number: x·0 is 0 for a
// finite x and NaN for NaN or ±Inf, so the sum is 0 exactly when all are
// finite (one branch however many values; rules call it per point).
func finite(xs ...float64) bool {
	z := 0.0
	for _, x := range xs {
		z += x * 0
	}
	return z == 0
}

// Span formats a station span for the outputs as the messages do: "100–200"
// with both ends to the same decimals, or "400" when the ends are equal.
func Span(from, to float64) string {
	a, b := numPair(from, to)
	if a == b {
		return a
	}
	return a + "–" + b
}
