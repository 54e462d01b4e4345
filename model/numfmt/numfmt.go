// Package numfmt formats the numbers of every chanlint output: finding
// messages and remedies, the text and JSON outputs, SARIF, the review
// report, the solve tables and the solver's notes. It imports nothing of
// the project, so that model, solver, policies, rules and the commands
// can all use it.
//
// # The rounding rule
//
// Rounding is half away from zero at the last digit kept, computed as
// round(x·10^d)/10^d (the exponent form and Written round the exact
// binary value to nearest, as strconv does), and a result of zero is
// printed without a sign: no output ever shows "-0".
//
//   - A measured or computed value (Num, Sig) keeps significant figures:
//     Num keeps three, Sig as many as asked, but never fewer digits than
//     the integer part (1234.5 prints as "1235", not "1.23e3"). Trailing
//     zeros of the decimals are dropped ("0.3", not "0.300"). A value of
//     magnitude below 1e-6 or from 1e15 up, which no channel quantity
//     has, is printed in exponent form with the same significant figures
//     ("1.23e-7"), so that a non-zero value never prints as "0" or
//     "0.0000", and 0.993 prints as "0.993", never "1".
//   - A value beside its limit (Pair, Span) is printed with the same
//     decimals as the other: enough for three significant figures of the
//     second and two of the first ("0.18 m is below 0.30 m"), and for
//     Pair more where fewer would print two different values alike
//     (up to nine significant figures: "0.16166 m is below 0.16168 m",
//     not "0.162 m is below 0.162 m"); trailing zeros are dropped only
//     where both have them. Span prints ends that look the same at the
//     first decimals as one station.
//   - An amount a remedy asks for is rounded up, never to the nearest, so
//     that what is printed is never short of what is needed: Up at the
//     last of three significant figures, UpTo to a practical increment
//     (at least one increment). A computed amount within 1e-12 (relative)
//     above a printed step is taken as that step, so that 0.3 computed as
//     0.30000000000000004 asks for 0.3 and not 0.301.
//   - A table column (Fixed) keeps exactly d decimals, except that a value
//     that is not zero but would read "0.000" is printed as Num prints it.
//   - A machine-readable number (Decimals, Round, JSON: CSV and JSON
//     outputs) keeps at most d decimals, trailing zeros dropped; JSON and
//     CSV keep JSONDecimals, so a value below half of 0.0001 is 0 there.
//     SARIF's result properties carry the numbers unrounded, as
//     encoding/json writes them.
//   - A value as a person would write it in a file (Written) is printed as
//     written when it has at most 8 significant digits, else rounded to 6.
//
// A value that is not finite, which no computation passes on purpose,
// prints as NotFinite ("n/a"), and JSON gives nil (null): no output ever
// carries NaN or Inf. Finite is the one test for that.
package numfmt

import (
	"math"
	"strconv"
)

// NotFinite is what every formatter prints for NaN or an infinity.
const NotFinite = "n/a"

// JSONDecimals is the number of decimals every computed number keeps in
// JSON and CSV output: 0.1 mm in SI and 0.001 in in US units, well below
// the 3 mm closure of the standard-step method, and short enough to read.
const JSONDecimals = 4

// Finite reports whether every value is a finite number (neither NaN nor
// an infinity). It costs one multiplication and one addition per value
// and no branch but the last: x·0 is 0 for a finite x and NaN for NaN or
// ±Inf, so the sum is 0 exactly when all are finite.
func Finite(xs ...float64) bool {
	z := 0.0
	for _, x := range xs {
		z += x * 0
	}
	return z == 0
}

// Magnitudes outside [minPlain, maxPlain) are printed in exponent form.
const (
	minPlain = 1e-6
	maxPlain = 1e15
)

// plain reports whether x is printed without an exponent.
func plain(x float64) bool {
	a := math.Abs(x)
	return a == 0 || (a >= minPlain && a < maxPlain)
}

// decimals is the number of decimals that shows n significant digits of a
// plain x, at least 0.
func decimals(x float64, n int) int {
	a := math.Abs(x)
	if a == 0 {
		return 0
	}
	return max(n-1-int(math.Floor(math.Log10(a))), 0)
}

// clean rounds a plain x to d decimals (half away from zero) and removes a
// negative zero.
func clean(x float64, d int) float64 {
	p := math.Pow10(d)
	r := math.Round(x*p) / p
	if r == 0 {
		return 0
	}
	return r
}

// Num formats a measured value with three significant figures (see the
// package doc).
func Num(x float64) string { return Sig(x, 3) }

// AppendNum appends Num(x) to dst.
func AppendNum(dst []byte, x float64) []byte { return AppendSig(dst, x, 3) }

// Sig formats x with n significant figures (n ≥ 1), never fewer digits
// than its integer part, trailing zeros dropped.
func Sig(x float64, n int) string {
	var buf [40]byte
	return string(AppendSig(buf[:0], x, n))
}

// AppendSig appends Sig(x, n) to dst.
func AppendSig(dst []byte, x float64, n int) []byte {
	n = max(n, 1)
	if !Finite(x) {
		return append(dst, NotFinite...)
	}
	if !plain(x) {
		return appendExp(dst, x, n)
	}
	d := decimals(x, n)
	start := len(dst)
	dst = strconv.AppendFloat(dst, clean(x, d), 'f', d, 64)
	return trimZeros(dst, start, d)
}

// appendExp appends x with n significant figures in exponent form:
// trailing zeros of the mantissa dropped, the exponent without a plus
// sign or leading zeros ("1.5e15", "2.05e-7").
func appendExp(dst []byte, x float64, n int) []byte {
	var buf [40]byte
	s := strconv.AppendFloat(buf[:0], x, 'e', n-1, 64)
	e := 0
	for e < len(s) && s[e] != 'e' {
		e++
	}
	m, exp := s[:e], s[e+1:]
	if len(m) > 0 {
		m = trimZeros(m, 0, n-1)
	}
	dst = append(dst, m...)
	dst = append(dst, 'e')
	if len(exp) > 0 && exp[0] == '-' {
		dst = append(dst, '-')
	}
	if len(exp) > 0 && (exp[0] == '-' || exp[0] == '+') {
		exp = exp[1:]
	}
	for len(exp) > 1 && exp[0] == '0' {
		exp = exp[1:]
	}
	return append(dst, exp...)
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

// Pair formats a measured value and its limit (or the two ends of a span)
// with the same number of decimals, so that "0.18 m is below 0.30 m"
// reads naturally: the decimals show three significant digits of b and at
// least two of a, and more where fewer would print two different numbers
// alike ("0.16166 m is below 0.16168 m", never "0.162 m is below
// 0.162 m", up to nine significant figures: closer values are the noise
// of the computation); trailing zeros are dropped only where both numbers
// have them. Equal numbers give equal strings.
func Pair(a, b float64) (string, string) {
	if a == b {
		s := Num(a)
		return s, s
	}
	var ba, bb [40]byte
	sa, sb := AppendPair(ba[:0], bb[:0], a, b)
	return string(sa), string(sb)
}

// AppendPair appends the two strings Pair returns to da and db. A number
// that is not finite or needs an exponent is formatted alone, as Num (or
// Sig with the figures that tell the two apart).
func AppendPair(da, db []byte, a, b float64) ([]byte, []byte) {
	return appendPair(da, db, a, b, a != b)
}

// AppendSpan appends the two ends of a station span as Span prints them:
// as Pair, except that ends which print the same at Pair's first decimals
// stay the same (one station).
func AppendSpan(da, db []byte, from, to float64) ([]byte, []byte) {
	return appendPair(da, db, from, to, false)
}

// pairFigures is how many significant figures of the larger number Pair
// shows at most to tell two numbers apart: values closer than that
// (a relative 1e-9, the noise of the computation) print alike.
const pairFigures = 9

// appendPair is AppendPair; with distinct, decimals are added until the
// two strings differ.
func appendPair(da, db []byte, a, b float64, distinct bool) ([]byte, []byte) {
	if !Finite(a, b) || !plain(a) || !plain(b) || a == b {
		sa, sb := AppendNum(da, a), AppendNum(db, b)
		for n := 4; distinct && n <= pairFigures && string(sa[len(da):]) == string(sb[len(db):]); n++ {
			sa, sb = AppendSig(sa[:len(da)], a, n), AppendSig(sb[:len(db)], b, n)
		}
		return sa, sb
	}
	d := max(decimals(b, 3), decimals(a, 3)-1)
	sa := strconv.AppendFloat(da, clean(a, d), 'f', d, 64)
	sb := strconv.AppendFloat(db, clean(b, d), 'f', d, 64)
	most := decimals(max(math.Abs(a), math.Abs(b)), pairFigures)
	for distinct && d < most && string(sa[len(da):]) == string(sb[len(db):]) {
		d++
		sa = strconv.AppendFloat(sa[:len(da)], clean(a, d), 'f', d, 64)
		sb = strconv.AppendFloat(sb[:len(db)], clean(b, d), 'f', d, 64)
	}
	for d > 0 && sa[len(sa)-1] == '0' && sb[len(sb)-1] == '0' {
		sa, sb = sa[:len(sa)-1], sb[:len(sb)-1]
		d--
	}
	if d == 0 {
		sa, sb = trimZeros(sa, len(da), 0), trimZeros(sb, len(db), 0)
	}
	return sa, sb
}

// Span formats a station span as the messages do: "100–200" with both
// ends to the same decimals (Pair), or "400" when the ends print the same
// (AppendSpan).
func Span(from, to float64) string {
	var ba, bb [40]byte
	a, b := AppendSpan(ba[:0], bb[:0], from, to)
	if string(a) == string(b) {
		return string(a)
	}
	return string(a) + "–" + string(b)
}

// Up formats an amount a remedy asks for ("raise the bank by at least
// ..."): like Num, but rounded up at the last of its three significant
// figures, so that the printed amount is never short of x.
func Up(x float64) string {
	if !Finite(x) {
		return NotFinite
	}
	if !plain(x) {
		return upExp(x)
	}
	d := decimals(x, 3)
	p := math.Pow10(d)
	// A relative hair below x before rounding up, so that a value that is
	// already round (0.3 computed as 0.30000000000000004) stays 0.3.
	return Num(math.Ceil(x*p*(1-1e-12)) / p)
}

// upExp is Up for a value printed in exponent form: the three significant
// figures rounded to nearest, raised by one in the last place when that
// fell below x.
func upExp(x float64) string {
	s := strconv.FormatFloat(x, 'e', 2, 64)
	if r, _ := strconv.ParseFloat(s, 64); r >= x*(1-1e-12) || x < 0 {
		return Num(r)
	}
	// s is "d.dde±XX": add one unit of the last digit.
	digits := int(s[0]-'0')*100 + int(s[2]-'0')*10 + int(s[3]-'0') + 1
	exp, _ := strconv.Atoi(s[5:])
	if digits == 1000 {
		digits, exp = 100, exp+1
	}
	r, _ := strconv.ParseFloat(strconv.Itoa(digits)+"e"+strconv.Itoa(exp-2), 64)
	return Num(r)
}

// UpTo formats an amount a remedy asks for rounded up to a multiple of a
// practical increment step (> 0), with the decimals the step needs: what
// is printed is buildable and never short of x. An amount below one
// increment is printed as one increment; one too large for the increment
// (beyond 1e9 steps, where the relative hair of the rule would reach a
// step) or not finite falls back to Up.
func UpTo(x, step float64) string {
	if !Finite(x, step) || !(step > 0) || math.Abs(x/step) > 1e9 {
		return Up(x)
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

// Round returns x rounded to d decimals (half away from zero), with -0
// turned into 0 and 0 for a value that is not finite. A value too large
// to scale (from 1e15 up) is returned as it is.
func Round(x float64, d int) float64 {
	if !Finite(x) {
		return 0
	}
	if math.Abs(x) >= maxPlain {
		return x
	}
	return clean(x, d)
}

// Decimals prints x with at most d decimals and no trailing zeros ("120",
// "0.18", "3.25").
func Decimals(x float64, d int) string {
	if !Finite(x) {
		return NotFinite
	}
	return strconv.FormatFloat(Round(x, d), 'f', -1, 64)
}

// Fixed prints x with exactly d decimals, for aligned table columns; a
// value that is not zero but would print as zero with d decimals is
// printed as Num prints it instead ("0.00004", not "0.000").
func Fixed(x float64, d int) string {
	if !Finite(x) {
		return NotFinite
	}
	r := Round(x, d)
	if r == 0 && x != 0 {
		return Num(x)
	}
	return strconv.FormatFloat(r, 'f', d, 64)
}

// JSON returns a pointer to x rounded to JSONDecimals, or nil (JSON null)
// when x is not finite.
func JSON(x float64) *float64 {
	if !Finite(x) {
		return nil
	}
	r := Round(x, JSONDecimals)
	return &r
}

// Written prints v as a person would write it in a file: as it is when it
// has at most 8 significant digits, else rounded to 6 (the noise of a unit
// conversion), without an exponent for plain magnitudes. It is the form of
// the settings `policy show` prints.
func Written(v float64) string {
	if !Finite(v) {
		return NotFinite
	}
	if v == 0 {
		return "0" // also -0
	}
	var buf [32]byte
	short := strconv.AppendFloat(buf[:0], v, 'e', -1, 64)
	digits := 0
	for _, c := range short {
		if c == 'e' {
			break
		}
		if c >= '0' && c <= '9' {
			digits++
		}
	}
	if digits > 8 {
		v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	}
	if !plain(v) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}
