package rules

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/assert"
)

func TestNumberFormats(t *testing.T) {
	// Three significant digits, integer digits kept, zeros trimmed; no
	// negative zero; never NaN or Inf.
	for x, want := range map[float64]string{
		0: "0", 4.2: "4.2", 0.18: "0.18", 1234.56: "1235", 49.5: "49.5",
		0.0004: "0.0004", -0.898130558: "-0.898", -0.0000001: "0", 3.0: "3",
		math.NaN(): "n/a", math.Inf(1): "n/a",
	} {
		assert.Equal(t, want, num(x), "%v", x)
	}
	a, b := numPair(0.18, 0.30)
	assert.Equal(t, [2]string{"0.18", "0.30"}, [2]string{a, b}, "a pair shares its decimals")
	a, b = numPair(4.2, 3.0)
	assert.Equal(t, [2]string{"4.2", "3.0"}, [2]string{a, b})
	// Remedies round up, so the printed amount is never short.
	assert.Equal(t, "0.0813", num(0.0813196))
	assert.Equal(t, "0.0814", numUp(0.0813196))
	assert.Equal(t, "0.3", numUp(0.30000000000000004))
	assert.Equal(t, "123", numUp(122.35))
	assert.Equal(t, "at station 400 m", stations(400, 400, model.SI))
	assert.Equal(t, "over stations 0.5–800.0 ft", stations(0.5, 800, model.US))
}
