package solver

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// hostileEvents is a 4 kB model of one 240 km reach with max_spacing 0.5 m
// (about 960,000 computed points per event, just under the per-event
// budget) and n events.
func hostileEvents(n int) string {
	var b strings.Builder
	b.WriteString(`units = "si"
section "s" {
  shape = "rectangle"
  bottom_width = 3
  height = 2
  roughness = 0.015
}
reach "endless" {
  from = "a"
  to = "b"
  length = 240000
  section = "s"
  slope = 0.001
  max_spacing = 0.5
}
`)
	for i := range n {
		fmt.Fprintf(&b, "event \"q%d\" {\n  inflow = { endless = %g }\n  outlet = { condition = \"normal\" }\n}\n", i, 2+0.01*float64(i))
	}
	return b.String()
}

// TestPointBudgetCoversTheModel: the point budget is per event, so a
// small file with model.MaxEvents events, each just under the budget, is
// solved in full: measured with five such events, 3.4 s and 433 MB, so 200
// events take over two minutes and about 17 GB, all results being kept
// until the end. A budget over the whole model (or per file in check)
// would end it with ErrTooManyPoints.
func TestPointBudgetCoversTheModel(t *testing.T) {
	t.Skip("known defect: Options.MaxPoints bounds each event, not the model; 200 events of 960,000 points each (a 4 kB file) need about 17 GB. Fix: count the points of every event against one budget")
	m, diags := model.Parse("hostile.chan.hcl", []byte(hostileEvents(model.MaxEvents)))
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	_, err := Solve(m, Options{})
	require.True(t, errors.Is(err, ErrTooManyPoints), "%v", err)
}
