package solver

import (
	"math"

	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// TestSteadyJumpDissipation: a steady jump (4.5 < F1 < 9) dissipates 45 %
// to 70 % of the upstream specific energy, the loss rising with F1.
//
// Source: Peterka, Hydraulic Design of Stilling Basins and Energy
// Dissipators, USBR Engineering Monograph 25 (1958); Chow, Open-Channel
// Hydraulics (1959), ch. 15 (per references.md). The band's ends are
// rounded: Belanger's relations give 44.5 % at F1 = 4.5 and 70.1 % at 9, so
// the check allows one percentage point at either end.
func TestSteadyJumpDissipation(t *testing.T) {
	for _, u := range []model.Units{model.SI, model.US} {
		g := geoRect(3, 0.014, u)
		const y1 = 0.25
		prev := 0.0
		for _, f1 := range []float64{4.5 + 1e-9, 5, 6, 7, 8, 9} {
			q := f1 * math.Sqrt(u.Gravity()*y1*y1*y1) * 3
			y2, err := SequentDepth(g, q, y1)
			require.NoError(t, err)
			e1 := SpecificEnergy(g, q, y1)
			frac := (e1 - SpecificEnergy(g, q, y2)) / e1
			require.Equal(t, Steady, ClassifyJump(f1), "F1 %v", f1)
			require.GreaterOrEqualf(t, frac, 0.45-0.01, "F1 %v %s", f1, u)
			require.LessOrEqualf(t, frac, 0.70+0.01, "F1 %v %s", f1, u)
			require.Greater(t, frac, prev)
			prev = frac
		}
	}
}
