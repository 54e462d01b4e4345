package model

import (
	"fmt"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// treeModel: main ← left, right; right ← r1, r2. right has fixed inverts
// that stand 9 m above the top of main (a drop at the junction).
const treeModel = `units = "si"
section "s" {
  shape = "rectangle"
  bottom_width = 2
  height = 1
  roughness = 0.014
}
reach "main" {
  from = "j1"
  to = "out"
  length = 1000
  section = "s"
  slope = 0.001
}
reach "left" {
  from = "h1"
  to = "j1"
  length = 500
  section = "s"
  slope = 0.002
}
reach "right" {
  from = "j2"
  to = "j1"
  length = 400
  section = "s"
  invert = [20, 10]
}
reach "r1" {
  from = "h2"
  to = "j2"
  length = 100
  section = "s"
  slope = 0.01
}
reach "r2" {
  from = "h3"
  to = "j2"
  length = 200
  section = "s"
  slope = 0.005
}
event "e" {
  inflow = { left = 2, r1 = 1, r2 = 0.5, main = 0.25 }
  outlet = { depth = 1 }
}
`

func reachNames(rs []*Reach) []string {
	out := make([]string, len(rs))
	for i, r := range rs {
		out[i] = r.Name
	}
	return out
}

func TestNetworkOrder(t *testing.T) {
	m := parseOK(t, treeModel)
	net := m.Network
	assert.Equal(t, []string{"left", "r1", "r2", "right", "main"}, reachNames(net.Order))
	assert.Equal(t, []string{"left", "r1", "r2"}, reachNames(net.Headwaters))
	var nodes []string
	for _, n := range net.Nodes {
		nodes = append(nodes, n.Name)
	}
	assert.Equal(t, []string{"j1", "out", "h1", "j2", "h2", "h3"}, nodes)
	assert.Equal(t, "out", net.Outlet.Name)
	assert.Nil(t, net.Outlet.Out)
	assert.Equal(t, "main", net.OutletReach.Name)
	main, right := m.Reaches[0], m.Reaches[2]
	assert.Equal(t, []string{"left", "right"}, reachNames(main.Upstream))
	assert.Nil(t, main.Downstream)
	assert.Same(t, main, right.Downstream)
	assert.Equal(t, []string{"r1", "r2"}, reachNames(right.Upstream))
}

func TestInvertDerivation(t *testing.T) {
	m := parseOK(t, treeModel)
	// Expected values by hand from the invert rule: a slope reach ends at
	// the upstream invert of the reach below (0 at the outlet) and rises
	// slope × length; an invert reach keeps what was written.
	want := map[string][2]float64{
		"main":  {1.0, 0},   // 0 + 0.001 × 1000
		"left":  {2.0, 1.0}, // 1 + 0.002 × 500
		"right": {20, 10},   // written
		"r1":    {21, 20},   // 20 + 0.01 × 100
		"r2":    {21, 20},   // 20 + 0.005 × 200
	}
	for _, r := range m.Reaches {
		w := want[r.Name]
		assert.InDelta(t, w[0], r.InvertUp, 1e-12, r.Name)
		assert.InDelta(t, w[1], r.InvertDown, 1e-12, r.Name)
	}
	assert.InDelta(t, 0.025, m.Reaches[2].Slope, 1e-15, "(20-10)/400")
	assert.InDelta(t, 15.0, m.Reaches[2].InvertAt(200), 1e-12)
}

func TestDischargeAccumulation(t *testing.T) {
	m := parseOK(t, treeModel)
	q := m.Events[0].Discharge
	want := map[string]float64{"left": 2, "r1": 1, "r2": 0.5, "right": 1.5, "main": 3.75}
	for _, r := range m.Reaches {
		assert.InDelta(t, want[r.Name], q[r.Index], 1e-12, r.Name)
	}
}

// TestRandomTrees builds random dendritic networks in shuffled file order
// and checks the network pass against independent computations: the order
// is topological, every reach carries the sum of the inflows of all the
// reaches whose water passes through it, and slope reaches meet the reach
// below at its upstream invert.
func TestRandomTrees(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 40).Draw(t, "reaches")
		parent := make([]int, n) // parent[i] < i is the reach below i; -1 for the outlet reach
		parent[0] = -1
		for i := 1; i < n; i++ {
			parent[i] = rapid.IntRange(0, i-1).Draw(t, fmt.Sprintf("parent%d", i))
		}
		perm := rapid.Permutation(seq(n)).Draw(t, "order")
		inflow := make([]float64, n)
		var b strings.Builder
		b.WriteString("units = \"si\"\nsection \"s\" {\n shape = \"rectangle\"\n bottom_width = 1\n height = 1\n roughness = 0.013\n}\n")
		var entries []string
		for _, i := range perm {
			to := "out"
			if parent[i] >= 0 {
				to = fmt.Sprintf("n%d", parent[i])
			}
			fmt.Fprintf(&b, "reach \"r%d\" {\n from = \"n%d\"\n to = %q\n length = %d\n section = \"s\"\n slope = 0.00%d\n}\n", i, i, to, 10+i, 1+i%9)
		}
		for i := range n {
			// Every headwater needs water; others get some at random.
			headwater := true
			for j := range n {
				if parent[j] == i {
					headwater = false
				}
			}
			if headwater || rapid.Bool().Draw(t, fmt.Sprintf("q%d", i)) {
				inflow[i] = float64(rapid.IntRange(1, 100).Draw(t, fmt.Sprintf("v%d", i))) / 10
				entries = append(entries, fmt.Sprintf("r%d = %g", i, inflow[i]))
			}
		}
		fmt.Fprintf(&b, "event \"e\" {\n inflow = { %s }\n outlet = { depth = 1 }\n}\n", strings.Join(entries, ", "))
		m, diags := Parse("rand.chan.hcl", []byte(b.String()))
		if diags.HasErrors() {
			t.Fatalf("%s\n%s", diags.Error(), b.String())
		}
		byName := map[string]*Reach{}
		for _, r := range m.Reaches {
			byName[r.Name] = r
		}
		pos := map[*Reach]int{}
		for k, r := range m.Network.Order {
			pos[r] = k
		}
		require.Len(t, pos, n)
		want := make([]float64, n)
		for i := range n {
			for k := i; k >= 0; k = parent[k] {
				want[k] += inflow[i]
			}
		}
		for i := range n {
			r := byName[fmt.Sprintf("r%d", i)]
			if parent[i] >= 0 {
				down := byName[fmt.Sprintf("r%d", parent[i])]
				require.Less(t, pos[r], pos[down], "order puts %s before %s", r.Name, down.Name)
				require.Same(t, down, r.Downstream)
				require.InDelta(t, down.InvertUp, r.InvertDown, 1e-9)
			} else {
				require.Same(t, r, m.Network.OutletReach)
				require.Equal(t, 0.0, r.InvertDown)
			}
			require.InDelta(t, want[i], m.Events[0].Discharge[r.Index], 1e-9, r.Name)
		}
	})
}

func seq(n int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = i
	}
	return s
}

func TestMisspeltNodeSuggested(t *testing.T) {
	diags := parseErr(t, strings.Replace(treeModel, `to = "j1"
  length = 500`, `to = "jl"
  length = 500`, 1))
	require.Len(t, diags, 1, "%s", diags.Error())
	assert.Equal(t, "More than one outlet", diags[0].Summary)
	assert.Equal(t, 17, diags[0].Subject.Start.Line, "the to of reach left")
	assert.Contains(t, diags[0].Detail, `Reach "left" ends at "jl". Did you mean "j1"?`)
}
