package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/integrate/quad"
)

// variedFlowIntegral is ∫ du/(1 − u^N) from a to b, both on the same side
// of u = 1 (where the integrand is singular): composite 20-point
// Gauss–Legendre over 200 equal parts. The varied-flow function of the
// Bakhmeteff–Chow method is F(u, N) = ∫₀ᵘ du/(1 − u^N); a distance needs
// only its differences, hence this integral between two depths.
func variedFlowIntegral(a, b, n float64) float64 {
	if b < a {
		return -variedFlowIntegral(b, a, n)
	}
	const parts = 200
	f := func(u float64) float64 { return 1 / (1 - math.Pow(u, n)) }
	h := (b - a) / parts
	sum := 0.0
	for i := 0; i < parts; i++ {
		sum += quad.Fixed(f, a+float64(i)*h, a+float64(i+1)*h, 20, quad.Legendre{}, 0)
	}
	return sum
}

// bresse is Bresse's closed form of the varied-flow function of a wide
// rectangle with Chezy resistance (N = M = 3), for u > 1:
// φ(u) = ∫ᵤ^∞ du/(u³ − 1) = (1/6)·ln[(u²+u+1)/(u−1)²] − (1/√3)·atan[√3/(2u+1)].
func bresse(u float64) float64 {
	return math.Log((u*u+u+1)/((u-1)*(u-1)))/6 - math.Atan(math.Sqrt(3)/(2*u+1))/math.Sqrt(3)
}

// TestVariedFlowIntegralAgainstBresse checks the quadrature of the
// varied-flow function, which TestWideChannelBakhmeteff relies on, against
// Bresse's closed form and its published value.
//
// Source: Chow, Open-Channel Hydraulics (1959), ch. 10 and Appendix D
// (from memory, per references.md): φ(1.5) = 0.25481 for Bresse's function.
func TestVariedFlowIntegralAgainstBresse(t *testing.T) {
	require.InDelta(t, 0.25481, bresse(1.5), 5e-6)
	// φ(u1) − φ(u2) = ∫ du/(u³ − 1) from u1 to u2 = −∫ du/(1 − u³).
	for _, c := range [][2]float64{{1.05, 1.2}, {1.2, 1.5}, {1.5, 3}, {1.01, 1.02}} {
		got := -variedFlowIntegral(c[0], c[1], 3)
		want := bresse(c[0]) - bresse(c[1])
		require.InDeltaf(t, want, got, 1e-10*math.Abs(want), "u from %v to %v", c[0], c[1])
	}
}

// TestWideChannelBakhmeteff compares the standard-step profiles of a very
// wide rectangular channel with the Bakhmeteff–Chow varied-flow-function
// solution for Manning resistance in a wide rectangle, hydraulic exponents
// N = 10/3 (K² ∝ y^(10/3)) and M = 3 (Z² ∝ y³):
//
//	x = (yn/S0)·[u − F(u, N) + (yc/yn)^M·(J/N)·F(v, J)],
//	u = y/yn, J = N/(N − M + 1), v = u^(N/J).
//
// Source: Chow, Open-Channel Hydraulics (1959), ch. 10, the method of
// direct integration (Bakhmeteff–Chow) with N = 10/3, M = 3 for a wide
// rectangle with Manning (from memory, per references.md).
//
// The solver has no "wide" section: a rectangle 100 km wide stands in for
// it, where R = y/(1 + 2y/b) differs from y by 2e-5 of the depth and the
// exponent N by less than that; the depths checked keep 3 % or more from
// normal depth, where the distance is not singular. Tolerance: 0.5 % of
// the distance (the 0.2 % depth accuracy times dx/dy, as in
// TestPublishedTrapezoidBackwater).
func TestWideChannelBakhmeteff(t *testing.T) {
	const (
		b     = 1e5
		q     = 2.0 // m²/s
		n     = 0.02
		nExp  = 10.0 / 3
		mExp  = 3.0
		jExp  = nExp / (nExp - mExp + 1)
		grav  = 9.80665
		lenth = 8000.0
	)
	// distance from depth y1 to y2 (downstream positive) by the
	// varied-flow functions.
	distance := func(yn, yc, s0, y1, y2 float64) float64 {
		u1, u2 := y1/yn, y2/yn
		v1, v2 := math.Pow(u1, nExp/jExp), math.Pow(u2, nExp/jExp)
		return yn / s0 * ((u2 - u1) - variedFlowIntegral(u1, u2, nExp) +
			math.Pow(yc/yn, mExp)*jExp/nExp*variedFlowIntegral(v1, v2, jExp))
	}
	cases := []struct {
		name    string
		s0      float64
		outlet  model.Outlet
		profile string
		depths  []float64 // as fractions between the control depth and normal depth
	}{
		{"M1 behind a high tailwater", 0.0005, model.Outlet{Kind: model.OutletDepth, Value: 3.0}, "M1", []float64{0.2, 0.5, 0.8}},
		{"M2 to a free outfall", 0.0005, model.Outlet{Kind: model.OutletCritical}, "M2", []float64{0.3, 0.6, 0.85}},
		{"S2 below critical at the head", 0.01, model.Outlet{Kind: model.OutletCritical}, "S2", []float64{0.3, 0.6, 0.85}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			// Source: references.md closed forms for a wide rectangle:
			// yn = (q·n/√S0)^(3/5), yc = (q²/g)^(1/3).
			yn := math.Pow(q*n/math.Sqrt(c.s0), 0.6)
			yc := math.Cbrt(q * q / grav)
			sec := &model.Section{Name: "wide", Shape: model.Rectangle, BottomWidth: b, Height: 20, Roughness: [3]float64{n, n, n}}
			m := buildNet(t, model.SI, []netReach{{name: "r", from: "a", to: "b", length: lenth, slope: c.s0, sec: sec, inflow: q * b}}, c.outlet)
			rr := solveOne(t, m).Reaches[0]
			require.Equal(t, []string{c.profile}, rr.ProfileTypes())
			x0, y0 := lenth, c.outlet.Value
			if c.outlet.Kind == model.OutletCritical {
				y0 = yc
			}
			if c.profile == "S2" {
				x0 = 0
			}
			worst := 0.0
			for _, f := range c.depths {
				y := y0 + f*(yn-y0)
				got := stationOfDepth(t, rr.Points, y) - x0
				want := distance(yn, yc, c.s0, y0, y)
				require.InDeltaf(t, want, got, 0.005*math.Abs(want), "depth %.4f m (yn %.4f, yc %.4f)", y, yn, yc)
				worst = math.Max(worst, math.Abs(got-want)/math.Abs(want))
			}
			t.Logf("%s: yn %.4f m, yc %.4f m; worst relative distance error %.2e", c.profile, yn, yc, worst)
		})
	}
}
