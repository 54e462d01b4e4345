package solver

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestVaryScalesInputs checks each perturbation of a sensitivity run
// against the independent reference of the same channel with the changed
// input written into it: a mild trapezoid with a normal-depth outlet ends
// at the normal depth of the changed discharge or roughness, and a depth
// outlet ends at the written depth plus the tailwater offset.
//
// Source: Manning's equation Q = (k/n)·A·R^(2/3)·√S0 for uniform flow
// (Chow, Open-Channel Hydraulics, 1959, ch. 6), solved by bisection in
// gvfTrapezoid, which shares no code with the solver.
func TestVaryScalesInputs(t *testing.T) {
	const q, s0, n = 12.0, 0.0008, 0.018
	build := func(outlet model.Outlet) *model.Model {
		return buildNet(t, model.SI, []netReach{{name: "main", from: "a", to: "b", length: 1500, slope: s0,
			sec: trapezoid("earth", 4, 2, n, 4), inflow: q}}, outlet)
	}
	outletDepth := func(m *model.Model, v Vary) float64 {
		res, err := Solve(m, Options{Vary: v})
		require.NoError(t, err)
		pts := res.Events[0].Reaches[0].Points
		return pts[len(pts)-1].Depth
	}
	ref := gvfTrapezoid{b: 4, z: 2, n: n, k: 1, g: 9.80665, q: q, s0: s0}
	normal := build(model.Outlet{Kind: model.OutletNormal})

	require.InDelta(t, ref.normalDepth(), outletDepth(normal, Vary{}), 1e-6)

	more := ref
	more.q = q * 1.1
	require.True(t, scalar.EqualWithinAbsOrRel(more.normalDepth(), outletDepth(normal, Vary{Discharge: 1.1}), 1e-6, 1e-6))

	rough := ref
	rough.n = n * 1.2
	require.True(t, scalar.EqualWithinAbsOrRel(rough.normalDepth(), outletDepth(normal, Vary{Roughness: 1.2}), 1e-6, 1e-6))

	// A normal-depth outlet raised by the offset.
	require.InDelta(t, ref.normalDepth()+0.3, outletDepth(normal, Vary{Tailwater: 0.3}), 1e-9)

	// A depth outlet: raised, and lowered no further than critical depth.
	deep := build(model.Outlet{Kind: model.OutletDepth, Value: 2.5})
	require.InDelta(t, 2.8, outletDepth(deep, Vary{Tailwater: 0.3}), 1e-9)
	require.InDelta(t, ref.criticalDepth(), outletDepth(deep, Vary{Tailwater: -2.4}), 1e-6)

	// A free fall has no tailwater to vary.
	free := build(model.Outlet{Kind: model.OutletCritical})
	require.InDelta(t, outletDepth(free, Vary{}), outletDepth(free, Vary{Tailwater: 0.3}), 1e-12)

	// The model itself is not changed by a varied solve.
	require.Equal(t, n, normal.Reaches[0].Section.Roughness[1])
	require.Equal(t, q, normal.Events[0].Discharge[0])
}
