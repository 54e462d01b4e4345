package solver

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestBrentKnownRoots(t *testing.T) {
	cases := []struct {
		name string
		f    func(float64) float64
		a, b float64
		want float64
	}{
		// Source: common practice (no published source): √2 and the cube
		// root of 10 to float64 precision.
		{"sqrt2", func(x float64) float64 { return x*x - 2 }, 0, 2, math.Sqrt2},
		{"cbrt10", func(x float64) float64 { return x*x*x - 10 }, -5, 5, math.Cbrt(10)},
		// Source: the fixed point of cos, 0.7390851332151607 (from memory;
		// the Dottie number).
		{"cos", func(x float64) float64 { return math.Cos(x) - x }, 0, 1, 0.7390851332151607},
		// Source: common practice: ln x = 1 at e; a root at an end point.
		{"log", func(x float64) float64 { return math.Log(x) - 1 }, 1, 10, math.E},
		{"end", func(x float64) float64 { return x - 3 }, 3, 7, 3},
		// A flat, high-order root: only bisection makes progress.
		{"x^9", func(x float64) float64 { return math.Pow(x-1, 9) }, 0, 3, 1},
	}
	for _, c := range cases {
		got, err := Brent(c.f, c.a, c.b, 0)
		require.NoError(t, err, c.name)
		tol := 1e-14
		if c.name == "x^9" {
			tol = 1e-3 // (x−1)^9 underflows to 0 within about 1e-35^(1/9)
		}
		assert.InDelta(t, c.want, got, tol, c.name)
	}
	// The tolerance argument is honoured.
	got, err := Brent(func(x float64) float64 { return x*x - 2 }, 0, 2, 1e-3)
	require.NoError(t, err)
	assert.InDelta(t, math.Sqrt2, got, 1e-3)
}

func TestBrentErrors(t *testing.T) {
	// Source: common practice (no published source).
	_, err := Brent(func(x float64) float64 { return x*x + 1 }, -1, 1, 0)
	assert.ErrorIs(t, err, ErrNoBracket)
	_, err = Brent(func(x float64) float64 { return x }, math.NaN(), 1, 0)
	assert.ErrorIs(t, err, ErrNoBracket)
	_, err = Brent(func(x float64) float64 { return math.NaN() }, 0, 1, 0)
	assert.ErrorIs(t, err, ErrNoConvergence)
	_, err = Brent(func(x float64) float64 {
		if x > 0.3 {
			return math.NaN()
		}
		return x - 0.5
	}, 0, 1, 0)
	assert.ErrorIs(t, err, ErrNoConvergence)
}

func TestBrentBoundedIterations(t *testing.T) {
	// Source: Brent 1973, ch. 4: the bracket shrinks every step; the
	// evaluation count stays under the bound even for a function that is
	// not a function (a random sign), and a discontinuity is located by
	// bisection.
	calls := 0
	rng := rand.New(rand.NewPCG(1, 2))
	_, _ = Brent(func(x float64) float64 { calls++; return rng.Float64() - 0.5 }, 0, 1, 0)
	assert.LessOrEqual(t, calls, brentMaxIter+2)

	calls = 0
	got, err := Brent(func(x float64) float64 {
		calls++
		if x < 0.3 {
			return -1
		}
		return 1
	}, 0, 1, 0)
	require.NoError(t, err)
	assert.InDelta(t, 0.3, got, 1e-15)
	assert.Less(t, calls, 100, "a step function converges by bisection in about 55 steps")
}

var geoSink float64

func BenchmarkBrentClosure(b *testing.B) {
	// The closure captures a variable of the caller; it must not escape.
	b.ReportAllocs()
	c := 2.0
	for i := 0; b.Loop(); i++ {
		c = 2 + float64(i%7)
		x, _ := Brent(func(x float64) float64 { return x*x - c }, 0, 10, 1e-12)
		geoSink += x
	}
}
