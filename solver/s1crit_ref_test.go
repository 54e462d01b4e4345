package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// TestS1ToCriticalAgainstQuadrature marches an S1 backwater upstream
// until it falls to critical depth, where the subcritical branch ends, and
// compares every computed point, the last ones next to critical depth
// and the first at critical depth included, with the independent
// integration, depth at station (the reference is at critical depth
// upstream of the station where it reaches it).
//
// Source: the differential equation of gradually varied flow
// dy/dx = (S0 − Sf)/(1 − F²), Chow, Open-Channel Hydraulics (1959), ch. 9,
// integrated as dx/dy with gonum integrate/quad (Gauss–Legendre), whose
// integrand (1 − F²)/(S0 − Sf) is finite and vanishes at critical depth;
// the 0.2 % accuracy target of the project.
func TestS1ToCriticalAgainstQuadrature(t *testing.T) {
	for _, c := range []struct {
		name           string
		b, z, n, s0, q float64
		length, yOut   float64
	}{
		{"trapezoid, barely steep", 3, 2, 0.015, 0.0025, 40, 3000, 2.4},
	} {
		t.Run(c.name, func(t *testing.T) {
			ref := gvfTrapezoid{b: c.b, z: c.z, n: c.n, k: 1, g: 9.80665, q: c.q, s0: c.s0}
			yc, yn := ref.criticalDepth(), ref.normalDepth()
			require.Less(t, yn, yc, "a steep reach")
			g := NewGeometry(trapezoid("s", c.b, c.z, c.n, 10), model.SI)
			f := flowCtx{q: c.q, zUp: c.s0 * c.length, s0: c.s0, length: c.length, tol: DefaultTolerance}
			p := piece{from: 0, to: c.length, geo: g, class: Steep, hasN: true}
			p.yc, _ = CriticalDepth(g, c.q)
			p.ycF = p.yc
			p.yn, _ = NormalDepth(g, c.q, c.s0)
			var st stepper
			st.init(&f, &p, 0, false, c.length, c.yOut, false, 0)
			var out [2]pt
			var pts []pt
			for n := st.step(0, &out); n > 0 && len(pts) < 10000; n = st.step(0, &out) {
				pts = append(pts, out[:n]...)
			}
			xc := c.length + ref.distance(c.yOut, yc) // where the reference reaches critical depth
			// depthAt is the reference depth at x: critical depth upstream of
			// xc, where the reference has no subcritical branch either.
			depthAt := func(x float64) float64 {
				if x <= xc {
					return yc
				}
				return ref.depthAt(c.length, c.yOut, yc, x)
			}
			crit := -1
			worst := 0.0
			for i, q := range pts {
				want := depthAt(q.x)
				worst = math.Max(worst, math.Abs(q.y-want)/want)
				require.InDeltaf(t, want, q.y, 0.002*want, "station %.4f", q.x)
				if q.fallback {
					crit = i
					break
				}
			}
			require.GreaterOrEqual(t, crit, 5, "the profile reaches critical depth")
			require.Equal(t, p.yc, pts[crit].y)
			t.Logf("%d points to critical depth at %.4f (reference %.4f); worst relative depth error %.2e; %d evaluations",
				crit, pts[crit].x, xc, worst, f.evals)
		})
	}
}
