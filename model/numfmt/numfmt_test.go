package numfmt

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

func TestNum(t *testing.T) {
	// Three significant digits, integer digits kept, zeros trimmed; no
	// negative zero; never NaN or Inf; exponent form only far outside the
	// magnitudes of a channel.
	for _, c := range []struct {
		in   float64
		want string
	}{
		{0, "0"}, {math.Copysign(0, -1), "0"}, {4.2, "4.2"}, {0.18, "0.18"},
		{1234.56, "1235"}, {49.5, "49.5"}, {0.0004, "0.0004"},
		{-0.898130558, "-0.898"}, {3.0, "3"}, {0.993, "0.993"},
		{0.0813196, "0.0813"}, {0.00001234, "0.0000123"},
		{-0.0000001, "-1e-7"}, {2.05e-9, "2.05e-9"}, {1.5e15, "1.5e15"},
		{-1e300, "-1e300"}, {123456789, "123456789"},
		{math.NaN(), "n/a"}, {math.Inf(1), "n/a"}, {math.Inf(-1), "n/a"},
	} {
		assert.Equal(t, c.want, Num(c.in), "%v", c.in)
		assert.Equal(t, c.want, string(AppendNum([]byte(nil), c.in)), "%v", c.in)
	}
	assert.Equal(t, "1235", Sig(1234.5, 4))
	assert.Equal(t, "12346", Sig(12345.6, 4), "no exponent for five integer digits")
	assert.Equal(t, "0.1235", Sig(0.123456, 4))
}

func TestPair(t *testing.T) {
	for _, c := range []struct {
		a, b   float64
		wa, wb string
	}{
		{0.18, 0.30, "0.18", "0.30"},
		{4.2, 3.0, "4.2", "3.0"},
		{0.5, 800, "0.5", "800.0"},
		{400, 400, "400", "400"},
		{0.001, 0.3, "0.001", "0.300"},
		{0.993, 150, "0.99", "150.00"},
		{1e-8, 0.3, "1e-8", "0.3"},
		{math.NaN(), 2, "n/a", "2"},
	} {
		a, b := Pair(c.a, c.b)
		assert.Equal(t, [2]string{c.wa, c.wb}, [2]string{a, b}, "%v %v", c.a, c.b)
	}
	assert.Equal(t, "120–180", Span(120, 180))
	assert.Equal(t, "400", Span(400, 400))
	assert.Equal(t, "400", Span(400, 400.0001), "ends that print the same are one station")
}

// TestPairTellsApart: a value beside a different limit never prints as the
// limit, so that no message reads "0.162 m is below the required 0.162 m";
// values that differ only by the noise of the computation print alike.
func TestPairTellsApart(t *testing.T) {
	for _, c := range []struct {
		a, b   float64
		wa, wb string
	}{
		{0.16166274260789137, 0.16168, "0.16166", "0.16168"},
		{29.995922756760603, 29.992, "30.00", "29.99"},
		{6.0004, 6, "6.0004", "6.0000"},
		{0.2999, 0.3, "0.2999", "0.3000"},
		{-0.0004, 0, "-0.0004", "0.0000"},
		{0.3 - 1e-12, 0.3, "0.3", "0.3"},
	} {
		a, b := Pair(c.a, c.b)
		assert.Equal(t, [2]string{c.wa, c.wb}, [2]string{a, b}, "%v %v", c.a, c.b)
	}
	assert.Equal(t, "400", Span(400, 400.0001), "a span still prints as one station")
	da, db := AppendSpan(nil, nil, 400, 400.0001)
	assert.Equal(t, "400 400", string(da)+" "+string(db))
	rapid.Check(t, func(t *rapid.T) {
		x := rapid.Float64Range(-1e6, 1e6).Draw(t, "x")
		y := x * (1 + rapid.Float64Range(-1e-3, 1e-3).Draw(t, "rel"))
		a, b := Pair(x, y)
		if math.Abs(x-y) > 1e-8*max(math.Abs(x), math.Abs(y)) && a == b {
			t.Fatalf("Pair(%v, %v) = %s, %s", x, y, a, b)
		}
	})
}

func TestUp(t *testing.T) {
	assert.Equal(t, "0.0814", Up(0.0813196))
	assert.Equal(t, "0.3", Up(0.30000000000000004), "a round value stays round")
	assert.Equal(t, "123", Up(122.35))
	assert.Equal(t, "0.993", Up(0.993))
	assert.Equal(t, "1.24e-7", Up(1.231e-7))
	assert.Equal(t, "9.92e-7", Up(9.911e-7))
	assert.Equal(t, "0.000001", Up(9.991e-7), "the carry reaches a plain magnitude")
	assert.Equal(t, "1e-8", Up(9.991e-9), "the carry moves the exponent")
	assert.Equal(t, "n/a", Up(math.Inf(1)))

	// Increments: a height to 0.01, a velocity to 0.5, a radius to 5.
	assert.Equal(t, "0.01", UpTo(0.0001, 0.01), "at least one increment")
	assert.Equal(t, "0.19", UpTo(0.181, 0.01))
	assert.Equal(t, "0.30", UpTo(0.30000000000000004, 0.01))
	assert.Equal(t, "1.00", UpTo(0.993, 0.01))
	assert.Equal(t, "3.5", UpTo(3.2, 0.5))
	assert.Equal(t, "15", UpTo(11, 5))
	assert.Equal(t, "1.5e15", UpTo(1.5e15, 0.01), "beyond 1e9 increments: Up")
}

func TestTables(t *testing.T) {
	assert.Equal(t, "0.125", Decimals(0.12500001, 4))
	assert.Equal(t, "120", Decimals(120.00001, 3))
	assert.Equal(t, "0", Decimals(-0.00001, 3), "no negative zero")
	assert.Equal(t, "0.13", Fixed(0.125, 2), "half away from zero")
	assert.Equal(t, "-0.0001", Fixed(-0.0001, 3), "not zero, so not 0.000")
	assert.Equal(t, "0.000", Fixed(0, 3))
	assert.Equal(t, "0.000", Fixed(math.Copysign(0, -1), 3), "no negative zero")
	assert.Equal(t, "0.99", Fixed(0.993, 2))
	assert.Equal(t, "-0.001", Fixed(-0.0005, 3), "half away from zero")
	assert.Equal(t, "n/a", Fixed(math.NaN(), 2))
	assert.Nil(t, JSON(math.NaN()))
	assert.Equal(t, 0.1235, *JSON(0.12345))
	assert.Equal(t, 1e20, Round(1e20, 2), "too large to scale")
}

// A zero written with a sign prints as 0, as every other form does.
func TestWrittenNegativeZero(t *testing.T) {
	assert.Equal(t, "0", Written(math.Copysign(0, -1)))
}

func TestWritten(t *testing.T) {
	twenty := 20.0
	for _, c := range []struct {
		in   float64
		want string
	}{
		{0.3, "0.3"}, {20, "20"}, {0.075, "0.075"}, {0.3 / 0.3048, "0.984252"},
		{6.096, "6.096"}, {twenty * 0.3048, "6.096"}, // computed at run time: 6.096000000000001
		{1234.5678, "1234.5678"}, {-0.25, "-0.25"}, {47.88025898, "47.8803"},
		{1e-9, "1e-09"}, {2e15, "2e+15"},
		{math.NaN(), "n/a"},
	} {
		assert.Equal(t, c.want, Written(c.in), "%v", c.in)
	}
}

func TestFinite(t *testing.T) {
	assert.True(t, Finite())
	assert.True(t, Finite(0, -1, math.MaxFloat64, math.SmallestNonzeroFloat64))
	assert.False(t, Finite(1, math.NaN()))
	assert.False(t, Finite(math.Inf(-1), 2))
	assert.False(t, Finite(math.Inf(1), math.Inf(-1)), "+Inf and -Inf do not cancel")
}

// lastUnit is the value of one unit in the last digit of a number printed
// by Num or Up: 10^-decimals, or for the exponent form the unit of the
// mantissa's last digit times the power of ten.
func lastUnit(s string) float64 {
	mant, exp := s, 0
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		mant = s[:i]
		exp, _ = strconv.Atoi(s[i+1:])
	}
	d := 0
	if i := strings.IndexByte(mant, '.'); i >= 0 {
		d = len(mant) - i - 1
	}
	return math.Pow10(exp - d)
}

// value draws finite doubles across every magnitude, with and without
// sign, and a share of round numbers and of values next to them.
func value(t *rapid.T) float64 {
	switch rapid.IntRange(0, 3).Draw(t, "shape") {
	case 0:
		// Up to 1e300, so that three figures rounded up still parse.
		return rapid.Float64Range(-1e300, 1e300).Draw(t, "any")
	case 1:
		k := rapid.IntRange(-100000, 100000).Draw(t, "k")
		e := rapid.IntRange(-9, 6).Draw(t, "e")
		return float64(k) * math.Pow10(e)
	case 2:
		x := float64(rapid.IntRange(-10000, 10000).Draw(t, "k")) / 1000
		return math.Nextafter(x, rapid.Float64().Draw(t, "towards"))
	}
	m := rapid.Float64Range(-10, 10).Draw(t, "mantissa")
	return m * math.Pow10(rapid.IntRange(-12, 18).Draw(t, "exp"))
}

// TestRoundingRule checks the package doc's rule on random values: a
// printed value parses back within half a unit of its last digit, never
// reads "-0", never reads as zero when it is not, keeps three significant
// figures (so 0.993 is never "1"), and a remedy is never short.
func TestRoundingRule(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		x := value(t)
		if !Finite(x) {
			t.Skip("not finite")
		}
		s := Num(x)
		r, err := strconv.ParseFloat(s, 64)
		require.NoError(t, err, s)
		half := lastUnit(s) / 2
		assert.LessOrEqual(t, math.Abs(r-x), half*(1+1e-9)+math.Abs(x)*1e-15, "%v printed %s", x, s)
		assert.False(t, strings.HasPrefix(s, "-0") && r == 0, "%v printed %s", x, s)
		assert.NotContains(t, s, "-0e")
		if x != 0 {
			assert.NotEqual(t, 0.0, r, "%v printed %s", x, s)
			// Three significant figures: within half a unit of the third,
			// so 0.993 never reads "1".
			assert.LessOrEqual(t, math.Abs(r-x), 0.005*math.Abs(x)*(1+1e-9), "%v printed %s", x, s)
		}

		// Remedies: rounded up, never below what is needed.
		if x > 0 {
			up := Up(x)
			u, err := strconv.ParseFloat(up, 64)
			require.NoError(t, err, up)
			assert.GreaterOrEqual(t, u, x*(1-1e-12), "Up(%v) = %s", x, up)
			assert.LessOrEqual(t, u-x, lastUnit(up)*(1+1e-9), "Up(%v) = %s rounds up by at most one unit", x, up)
			step := rapid.SampledFrom([]float64{0.01, 0.05, 0.1, 0.5, 1, 5}).Draw(t, "step")
			p := UpTo(x, step)
			v, err := strconv.ParseFloat(p, 64)
			require.NoError(t, err, p)
			assert.GreaterOrEqual(t, v, x*(1-1e-12)-step*1e-9, "UpTo(%v, %v) = %s", x, step, p)
			assert.GreaterOrEqual(t, v, step*(1-1e-12), "UpTo(%v, %v) = %s is at least one increment", x, step, p)
		}

		// A table cell: d decimals, never "-0.000", never zero for a
		// value that is not.
		d := rapid.IntRange(0, 4).Draw(t, "decimals")
		f := Fixed(x, d)
		fv, err := strconv.ParseFloat(f, 64)
		require.NoError(t, err, f)
		assert.False(t, x != 0 && fv == 0, "Fixed(%v, %d) = %s", x, d, f)
		assert.False(t, strings.HasPrefix(f, "-") && fv == 0, "Fixed(%v, %d) = %s", x, d, f)
		if math.Abs(x) >= math.Pow10(-d) && plain(x) {
			assert.LessOrEqual(t, math.Abs(fv-x), math.Pow10(-d)/2*(1+1e-9)+math.Abs(x)*1e-15, "Fixed(%v, %d) = %s", x, d, f)
			decimals := 0
			if i := strings.IndexByte(f, '.'); i >= 0 {
				decimals = len(f) - i - 1
			}
			assert.Equal(t, d, decimals, "Fixed(%v, %d) = %s", x, d, f)
		}

		// A pair: both parse back within half a unit of the shared last
		// digit, and the decimals are shared.
		y := value(t)
		a, b := Pair(x, y)
		for _, c := range []struct {
			v float64
			s string
		}{{x, a}, {y, b}} {
			r, err := strconv.ParseFloat(c.s, 64)
			require.NoError(t, err, c.s)
			assert.LessOrEqual(t, math.Abs(r-c.v), lastUnit(c.s)/2*(1+1e-9)+math.Abs(c.v)*1e-15, "Pair(%v, %v) = %s, %s", x, y, a, b)
			assert.False(t, c.v != 0 && r == 0, "Pair(%v, %v) = %s, %s", x, y, a, b)
			assert.LessOrEqual(t, math.Abs(r-c.v), 0.05*math.Abs(c.v)*(1+1e-9), "Pair(%v, %v) = %s, %s: two figures at least", x, y, a, b)
			assert.False(t, strings.HasPrefix(c.s, "-") && r == 0, "Pair(%v, %v) = %s, %s", x, y, a, b)
		}
	})
}

var sink int

// BenchmarkFinite compares Finite with the pair of math tests it replaces,
// over finite values (the common case): Finite must not cost more.
func BenchmarkFinite(b *testing.B) {
	xs := make([]float64, 1024)
	for i := range xs {
		xs[i] = float64(i) * 0.37
	}
	b.Run("Finite", func(b *testing.B) {
		for b.Loop() {
			n := 0
			for _, x := range xs {
				if Finite(x) {
					n++
				}
			}
			sink = n
		}
	})
	b.Run("IsNaN-IsInf", func(b *testing.B) {
		for b.Loop() {
			n := 0
			for _, x := range xs {
				if !math.IsNaN(x) && !math.IsInf(x, 0) {
					n++
				}
			}
			sink = n
		}
	})
}
