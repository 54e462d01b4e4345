package rules

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/assert"
)

func TestStationsAndIncrements(t *testing.T) {
	assert.Equal(t, "at station 400 m", stations(400, 400, model.SI))
	assert.Equal(t, "over stations 0.5–800.0 ft", stations(0.5, 800, model.US))
	// Source: common practice (no published source): the increments of
	// practicalUp.
	for _, c := range []struct {
		x    float64
		k    increment
		u    model.Units
		want string
	}{
		{0.181, heightStep, model.SI, "0.19"},
		{0.181, heightStep, model.US, "0.20"},
		{2.01, velocityStep, model.SI, "2.1"},
		{6.1, velocityStep, model.US, "6.5"},
		{31.2, stressStep, model.SI, "32"},
		{0.61, stressStep, model.US, "0.65"},
		{40.2, radiusStep, model.SI, "41"},
		{40.2, radiusStep, model.US, "45"},
	} {
		assert.Equal(t, c.want, practicalUp(c.x, c.k, c.u), "%v %v %v", c.x, c.k, c.u)
	}
}
