package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// TestS1ToCriticalAgainstQuadrature marches an S1 backwater on a barely
// steep trapezoid upstream until it falls to critical depth, where the
// subcritical branch ends, and compares it with the independent
// integration: every computed point more than 1 % above critical depth by
// its depth at its station (within 1 % of critical depth dy/dx grows
// without bound and the depth at a station says nothing of the method),
// and the station where the profile reaches critical depth.
//
// Source: the differential equation of gradually varied flow
// dy/dx = (S0 − Sf)/(1 − F²), Chow, Open-Channel Hydraulics (1959), ch. 9,
// integrated as dx/dy with gonum integrate/quad (Gauss–Legendre), whose
// integrand (1 − F²)/(S0 − Sf) is finite and vanishes at critical depth;
// the 0.2 % accuracy target of the project, for the depths, and applied
// to the length of the profile for the station of critical depth (common
// practice, no published source).
func TestS1ToCriticalAgainstQuadrature(t *testing.T) {
	const b, z, n, s0, q, length, yOut = 3.0, 2.0, 0.015, 0.0025, 40.0, 3000.0, 2.4
	ref := gvfTrapezoid{b: b, z: z, n: n, k: 1, g: 9.80665, q: q, s0: s0}
	yc, yn := ref.criticalDepth(), ref.normalDepth()
	require.Less(t, yn, yc, "a steep reach")
	g := NewGeometry(trapezoid("s", b, z, n, 10), model.SI)
	f := flowCtx{q: q, zUp: s0 * length, s0: s0, length: length, tol: DefaultTolerance}
	p := piece{from: 0, to: length, geo: g, class: Steep, hasN: true}
	p.yc, _ = CriticalDepth(g, q)
	p.ycF = p.yc
	p.yn, _ = NormalDepth(g, q, s0)
	var st stepper
	st.init(&f, &p, 0, false, length, yOut, false, 0)
	var out [2]pt
	var pts []pt
	for k := st.step(0, &out); k > 0 && len(pts) < 10000; k = st.step(0, &out) {
		pts = append(pts, out[:k]...)
	}
	xc := length + ref.distance(yOut, yc) // where the reference reaches critical depth
	crit, checked, worst := -1, 0, 0.0
	for i, c := range pts {
		if c.y == p.yc {
			crit = i
			break
		}
		if c.y <= 1.01*yc {
			continue
		}
		want := ref.depthAt(length, yOut, yc, c.x)
		worst = math.Max(worst, math.Abs(c.y-want)/want)
		require.InDeltaf(t, want, c.y, 0.002*want, "station %.4f", c.x)
		checked++
	}
	require.Greater(t, checked, 5)
	require.Positive(t, crit, "the profile reaches critical depth")
	require.Less(t, crit+1, len(pts))
	require.True(t, pts[crit+1].fallback, "no subcritical solution upstream of critical depth")
	require.InDelta(t, xc, pts[crit].x, 0.002*(length-xc), "station of critical depth")
	t.Logf("%d points to critical depth at %.4f (reference %.4f); worst relative depth error %.2e; %d evaluations",
		crit, pts[crit].x, xc, worst, f.evals)
}
