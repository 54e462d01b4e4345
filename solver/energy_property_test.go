package solver

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"pgregory.net/rapid"
)

// energySection writes a section block of a random shape.
func energySection(t *rapid.T, b *strings.Builder, name string) {
	n := rapid.Float64Range(0.012, 0.05).Draw(t, name+"-n")
	switch rapid.IntRange(0, 3).Draw(t, name+"-shape") {
	case 0:
		fmt.Fprintf(b, "section %q {\n  shape = \"rectangle\"\n  bottom_width = %g\n  height = 6\n  roughness = %g\n}\n",
			name, rapid.Float64Range(0.8, 8).Draw(t, name+"-b"), n)
	case 1:
		fmt.Fprintf(b, "section %q {\n  shape = \"trapezoid\"\n  bottom_width = %g\n  side_slope = %g\n  height = 6\n  roughness = %g\n}\n",
			name, rapid.Float64Range(0.8, 8).Draw(t, name+"-b"), rapid.Float64Range(0.5, 3).Draw(t, name+"-z"), n)
	case 2:
		fmt.Fprintf(b, "section %q {\n  shape = \"circle\"\n  diameter = %g\n  roughness = %g\n}\n",
			name, rapid.Float64Range(1.0, 3).Draw(t, name+"-d"), n)
	default:
		w := rapid.Float64Range(2, 10).Draw(t, name+"-w")
		d := rapid.Float64Range(0.8, 2.5).Draw(t, name+"-depth")
		ob := rapid.Float64Range(3, 20).Draw(t, name+"-ob")
		fmt.Fprintf(b, "section %q {\n  shape = \"points\"\n  points = [[0, %g], [%g, %g], [%g, 0], [%g, %g], [%g, %g]]\n  banks = [%g, %g]\n  roughness = [0.06, %g, 0.06]\n}\n",
			name, d+3, ob, d, ob+w/2, ob+w, d, 2*ob+w, d+3, ob, ob+w, n)
	}
}

// energyNetwork writes a random network of one to three reaches (single,
// chain, junction) with drops or steps at the nodes, section changes,
// loss blocks, a default loss, gates and every kind of outlet.
func energyNetwork(t *rapid.T) string {
	var b strings.Builder
	b.WriteString("units = \"si\"\n")
	layout, names := drawLayout(t)
	// Inverts from the outlet up: each reach's end stands a random step
	// above (a drop) or slightly below the start of the reach below it.
	up := map[string]float64{"out": 0} // invert at the start of the reach leaving a node
	type reach struct {
		from, to   float64
		length, s0 float64
	}
	rs := make([]reach, len(names))
	for i := len(names) - 1; i >= 0; i-- {
		nm := names[i]
		length := rapid.Float64Range(20, 800).Draw(t, fmt.Sprint("length", i))
		s0 := rapid.SampledFrom([]float64{0, 2e-4, 1e-3, 4e-3, 0.02, 0.06}).Draw(t, fmt.Sprint("slope", i))
		step := 0.0
		if nm[2] != "out" {
			step = rapid.SampledFrom([]float64{0, 0, -0.05, 0.3, 1.5, 3}).Draw(t, fmt.Sprint("drop", i))
		}
		down := up[nm[2]] + step
		rs[i] = reach{from: down + s0*length, to: down, length: length, s0: s0}
		up[nm[1]] = rs[i].from
	}
	// One rectangle throughout, half the time, so that drops meet Rand's
	// conditions (rectangles of one width onto a level or mild apron).
	uniform := rapid.Bool().Draw(t, "uniform")
	width := rapid.Float64Range(0.8, 8).Draw(t, "width")
	for i := range names {
		if uniform {
			for _, n := range []string{"s", "seg"} {
				fmt.Fprintf(&b, "section \"%s%d\" {\n  shape = \"rectangle\"\n  bottom_width = %g\n  height = 8\n  roughness = 0.015\n}\n", n, i, width)
			}
			continue
		}
		energySection(t, &b, fmt.Sprint("s", i))
		energySection(t, &b, fmt.Sprint("seg", i))
	}
	var losses [][2]string // place, block
	for i, nm := range names {
		r := rs[i]
		fmt.Fprintf(&b, "reach %q {\n  from = %q\n  to = %q\n  length = %g\n  section = \"s%d\"\n  invert = [%g, %g]\n",
			nm[0], nm[1], nm[2], r.length, i, r.from, r.to)
		if rapid.Bool().Draw(t, fmt.Sprint("segment?", i)) {
			x := math.Round(rapid.Float64Range(0.2, 0.8).Draw(t, fmt.Sprint("segat", i))*r.length*10) / 10
			fmt.Fprintf(&b, "  segment {\n    from_station = %g\n    to_station = %g\n    section = \"seg%d\"\n  }\n", x, r.length, i)
			if rapid.Bool().Draw(t, fmt.Sprint("segloss?", i)) {
				losses = append(losses, [2]string{fmt.Sprint("t", i), fmt.Sprintf("loss \"t%d\" {\n  reach = %q\n  station = %g\n  contraction = %g\n  expansion = %g\n}\n",
					i, nm[0], x, rapid.Float64Range(0, 0.5).Draw(t, fmt.Sprint("kc", i)), rapid.Float64Range(0, 1).Draw(t, fmt.Sprint("ke", i)))})
			}
		}
		b.WriteString("}\n")
		if rapid.IntRange(0, 4).Draw(t, fmt.Sprint("gate?", i)) == 0 {
			fmt.Fprintf(&b, "gate \"g%d\" {\n  reach = %q\n  opening = %g\n}\n", i, nm[0], rapid.Float64Range(0.1, 1.5).Draw(t, fmt.Sprint("opening", i)))
		}
		if rapid.Bool().Draw(t, fmt.Sprint("nodeloss?", i)) {
			losses = append(losses, [2]string{nm[2], fmt.Sprintf("loss \"n%d\" {\n  node = %q\n  contraction = %g\n  expansion = %g\n}\n",
				i, nm[2], rapid.Float64Range(0, 0.5).Draw(t, fmt.Sprint("nkc", i)), rapid.Float64Range(0, 1).Draw(t, fmt.Sprint("nke", i)))})
		}
	}
	// At most one loss per node (a junction has two incoming reaches).
	seen := map[string]bool{}
	for _, l := range losses {
		if !seen[l[0]] {
			seen[l[0]] = true
			b.WriteString(l[1])
		}
	}
	if rapid.Bool().Draw(t, "default?") {
		fmt.Fprintf(&b, "loss \"default\" {\n  contraction = %g\n  expansion = %g\n}\n",
			rapid.Float64Range(0, 0.3).Draw(t, "dkc"), rapid.Float64Range(0, 0.6).Draw(t, "dke"))
	}
	q := rapid.Float64Range(0.2, 25).Draw(t, "q")
	inflow := fmt.Sprintf("{ %q = %g }", names[0][0], q)
	if layout == 2 {
		inflow = fmt.Sprintf("{ \"r0\" = %g, \"r1\" = %g }", q, rapid.Float64Range(0.2, 25).Draw(t, "q1"))
	}
	outlet := rapid.SampledFrom([]string{`{ condition = "critical" }`, `{ condition = "normal" }`,
		fmt.Sprintf("{ depth = %g }", rapid.Float64Range(0.2, 5).Draw(t, "tail"))}).Draw(t, "outlet")
	if rs[len(rs)-1].s0 == 0 && strings.Contains(outlet, "normal") {
		outlet = `{ condition = "critical" }` // no normal depth on a level bed
	}
	fmt.Fprintf(&b, "event \"e\" {\n  inflow = %s\n  outlet = %s\n}\n", inflow, outlet)
	return b.String()
}

// TestEnergyNeverRises: over random networks, the energy grade elevation
// (with α) does not rise in the direction of flow between neighbouring
// computed points of a reach, nor from the end of a reach to the start of
// the reach below, except where the solver records a note (a fallback to
// critical depth, a control that cannot act, supercritical flows meeting):
// friction, local losses, drops and jumps only take energy away.
//
// Source: common practice (no published source): the energy principle;
// Chow, Open-Channel Hydraulics (1959), ch. 3.
func TestEnergyNeverRises(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		src := energyNetwork(t)
		m, diags := model.Parse("energy.chan.hcl", []byte(src))
		if diags.HasErrors() {
			t.Fatalf("invalid model: %s\n%s", diags.Error(), src)
		}
		res, err := Solve(m, Options{})
		if err != nil {
			t.Fatalf("Solve: %v", err)
		}
		ev := res.Events[0]
		// The depths close to DefaultTolerance, so the energy of a point
		// is known to |dE/dy|·tolerance = |1 − F²|·tolerance (large in a
		// fast, shallow jet) on top of rounding.
		tol := func(e float64, ps ...Point) float64 {
			t := 1e-6 * math.Max(1, math.Abs(e))
			for _, p := range ps {
				t += 2 * DefaultTolerance * math.Abs(1-p.Froude*p.Froude)
			}
			return t
		}
		noted := func(rr *ReachResult, a, b float64) bool {
			for _, n := range rr.Notes {
				if n.Station >= a-1e-9 && n.Station <= b+1e-9 {
					return true
				}
			}
			return false
		}
		for _, rr := range ev.Reaches {
			pts := rr.Points
			for i := 1; i < len(pts); i++ {
				p, c := pts[i-1], pts[i]
				if c.Energy <= p.Energy+tol(p.Energy, p, c) || noted(rr, p.Station, c.Station) ||
					p.Regime == Critical || c.Regime == Critical {
					continue
				}
				t.Fatalf("reach %s: energy rises from %.9g at station %g to %.9g at station %g without a note\nnotes: %v\n%s",
					rr.Reach.Name, p.Energy, p.Station, c.Energy, c.Station, rr.Notes, src)
			}
			d := rr.Reach.Downstream
			if d == nil || len(pts) == 0 {
				continue
			}
			dr := ev.Reaches[d.Index]
			if len(dr.Points) == 0 || dr.Discharge == 0 {
				continue
			}
			end, start := pts[len(pts)-1], dr.Points[0]
			if start.Energy <= end.Energy+tol(end.Energy, end, start) || noted(rr, rr.Reach.Length, rr.Reach.Length) || noted(dr, 0, 0) {
				continue
			}
			t.Fatalf("node %s: energy rises from %.9g at the end of %s to %.9g at the start of %s without a note\nnotes: %v / %v\n%s",
				rr.Reach.To, end.Energy, rr.Reach.Name, start.Energy, d.Name, rr.Notes, dr.Notes, src)
		}
	})
}
