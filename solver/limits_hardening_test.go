package solver

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/stretchr/testify/require"
)

// hostileEvents is a small model (4 kB with 200 events) of one 240 km
// reach with max_spacing 0.25 m (960,001 computed points per event, just
// under the default budget) and n events.
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
  max_spacing = 0.25
}
`)
	for i := range n {
		fmt.Fprintf(&b, "event \"q%d\" {\n  inflow = { endless = %g }\n  outlet = { condition = \"normal\" }\n}\n", i, 2+0.01*float64(i))
	}
	return b.String()
}

// TestPointBudgetCoversTheModel: the point budget counts every event of
// the Solve call, so a small file with model.MaxEvents events, each just
// under the default budget, stops in its second event with
// ErrTooManyPoints (about 1 s and some 200 MB) instead of solving all 200
// (a per-event budget needed about 17 GB and minutes).
func TestPointBudgetCoversTheModel(t *testing.T) {
	m, diags := model.Parse("hostile.chan.hcl", []byte(hostileEvents(model.MaxEvents)))
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	_, err := Solve(m, Options{})
	require.True(t, errors.Is(err, ErrTooManyPoints), "%v", err)
	require.Contains(t, err.Error(), `event "q1"`, "the budget runs out in the second event")
}

// TestPointBudgetSumsEvents: two events that each fit the budget alone
// exceed it together.
func TestPointBudgetSumsEvents(t *testing.T) {
	src := strings.Replace(hostileEvents(2), "length = 240000", "length = 300", 1)
	m, diags := model.Parse("two.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), "%s", diags.Error())
	one, err := Solve(m, Options{Events: []string{"q0"}})
	require.NoError(t, err)
	n := len(one.Events[0].Reaches[0].Points)
	require.Greater(t, n, 500, "max_spacing 0.25 m over 300 m")
	// Each event alone fits a budget of 1.5 n; both together do not.
	budget := n + n/2
	_, err = Solve(m, Options{MaxPoints: budget, Events: []string{"q1"}})
	require.NoError(t, err)
	_, err = Solve(m, Options{MaxPoints: budget})
	require.True(t, errors.Is(err, ErrTooManyPoints), "%v", err)
}
