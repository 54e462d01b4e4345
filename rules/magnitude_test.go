package rules

import (
	"errors"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// splitRelease rewrites the single reach of jump-contained.chan.hcl (200 m
// of one rectangular section at one slope below a sluice gate) as three
// reaches of lengths first, short and the rest, the short one of section
// shortSection, with the basin shortened to stay on the first.
func splitRelease(t *testing.T, first, short float64, shortSection string) string {
	t.Helper()
	src, err := os.ReadFile("../testdata/rules/jump-contained.chan.hcl")
	require.NoError(t, err)
	one := `reach "release" {
  from    = "gate-house"
  to      = "river"
  length  = 200
  section = "outlet-channel"
  slope   = 0.0007
}`
	require.Contains(t, string(src), one)
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	three := `section "low" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 1.0
  roughness    = 0.014
  lining       = "concrete"
}
reach "release" {
  from    = "gate-house"
  to      = "a"
  length  = ` + f(first) + `
  section = "outlet-channel"
  slope   = 0.0007
}
reach "short" {
  from    = "a"
  to      = "b"
  length  = ` + f(short) + `
  section = "` + shortSection + `"
  slope   = 0.0007
}
reach "rest" {
  from    = "b"
  to      = "river"
  length  = ` + f(200-first-short) + `
  section = "outlet-channel"
  slope   = 0.0007
}`
	out := strings.Replace(string(src), one, three, 1)
	return strings.Replace(out, "to_station   = 30", "to_station   = "+f(min(first, 30)), 1)
}

// solveAndCheck parses, solves and checks a model text with the jumps
// policy of the rule goldens.
func solveAndCheck(t *testing.T, src string) (*solver.Result, []Finding) {
	t.Helper()
	m, diags := model.Parse("split.chan.hcl", []byte(src))
	require.False(t, diags.HasErrors(), diags.Error())
	res, err := solver.Solve(m, solver.Options{})
	require.NoError(t, err)
	p, pd := Language().Pack("baseline")
	require.False(t, pd.HasErrors(), pd.Error())
	return res, Check(m, res, p)
}

// TestShortReachKeepsJumpAndFailingSpan: a reach 1 mm long, the shortest
// accepted, neither swallows the hydraulic jump that forms on it nor
// hides the overtopping of its own lower section, nor does a segment 1 mm
// long. Source: common practice
// (no published source): cutting a prismatic reach into pieces of the
// same section and slope changes nothing physical, so the jump stays
// where the uncut reach has it (whose M3 curve and sequent depth
// golden_test.go integrates independently), and its depths keep
// Bélanger's sequent-depth ratio y2/y1 = (√(1 + 8F1²) − 1)/2 (Chow,
// Open-Channel Hydraulics, 1959, eq. 3-20, from memory).
func TestShortReachKeepsJumpAndFailingSpan(t *testing.T) {
	whole, err := os.ReadFile("../testdata/rules/jump-contained.chan.hcl")
	require.NoError(t, err)
	ref, _ := solveAndCheck(t, string(whole))
	require.Len(t, ref.Events[0].Reaches[0].Jumps, 1)
	toe := ref.Events[0].Reaches[0].Jumps[0]

	// The 1 mm reach straddles the toe, just before it and just after.
	for _, first := range []float64{toe.Station - 0.0005, toe.Station - 0.001, toe.Station - 0.0001} {
		t.Run(fmt.Sprintf("from %.4f m", first), func(t *testing.T) {
			res, fs := solveAndCheck(t, splitRelease(t, first, 0.001, "outlet-channel"))
			var jumps []solver.Jump
			var at []float64
			offset := map[string]float64{"release": 0, "short": first, "rest": first + 0.001}
			for _, rr := range res.Events[0].Reaches {
				for _, j := range rr.Jumps {
					jumps = append(jumps, j)
					at = append(at, offset[rr.Reach.Name]+j.Station)
				}
			}
			require.Len(t, jumps, 1, "one jump over the three reaches")
			j := jumps[0]
			assert.InDelta(t, toe.Station, at[0], 0.01, "toe within 1 cm of the uncut reach's")
			assert.InDelta(t, toe.Froude, j.Froude, 0.01*toe.Froude)
			ratio := (math.Sqrt(1+8*j.Froude*j.Froude) - 1) / 2
			assert.InDelta(t, ratio, j.DownstreamDepth/j.UpstreamDepth, 0.02*ratio, "Bélanger's sequent depths")
			var types int
			for _, f := range fs {
				if f.Rule == "jump_type" {
					types++
				}
			}
			assert.Equal(t, 1, types, "the jump is still judged")
		})
	}

	// A 1 mm reach whose section is lower than the flow overtops over its
	// whole length. Downstream of the jump the depth is about 1.18 m
	// (the golden's sequent depth), above the 1.0 m section.
	_, fs := solveAndCheck(t, splitRelease(t, 100, 0.001, "low"))
	var found bool
	for _, f := range fs {
		if f.Rule == "capacity" && f.Reach == "short" {
			found = true
			assert.Equal(t, 0.0, f.FromStation)
			assert.InDelta(t, 0.001, f.ToStation, 1e-12)
			assert.Greater(t, f.Value, 1.0)
		}
	}
	assert.True(t, found, "the overtopping of the 1 mm reach is reported")

	// So does a segment 1 mm long of that section inside the uncut reach.
	seg := strings.Replace(string(whole), `  slope   = 0.0007
}`, `  slope   = 0.0007
  segment {
    from_station = 100
    to_station   = 100.001
    section      = "low"
  }
}
section "low" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 1.0
  roughness    = 0.014
  lining       = "concrete"
}`, 1)
	require.NotEqual(t, string(whole), seg)
	_, fs = solveAndCheck(t, seg)
	found = false
	for _, f := range fs {
		if f.Rule == "capacity" {
			found = true
			assert.Equal(t, 100.0, f.FromStation)
			assert.InDelta(t, 100.001, f.ToStation, 1e-9)
		}
	}
	assert.True(t, found, "the overtopping of the 1 mm segment is reported")
}

// degenerateModel is a model drawn from the magnitudes the model language
// accepts, near its bounds and far from each other: a reach of 1 mm
// between long ones, slopes of 1e-9, sections of 1 cm and of 1 km (and
// points sections), segments 1 mm long, trickles and floods, n at its
// floor and its ceiling, gates, entrances, bends, and a culvert with
// coefficients at the ends of their ranges.
func degenerateModel(t *rapid.T) string {
	logU := func(lo, hi float64, name string) float64 {
		v := math.Pow(10, rapid.Float64Range(math.Log10(lo), math.Log10(hi)).Draw(t, name))
		return min(max(v, lo), hi) // Pow rounds past the ends
	}
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	var b strings.Builder
	u := rapid.SampledFrom([]model.Units{model.SI, model.US}).Draw(t, "units")
	fmt.Fprintf(&b, "units = %q\n", u)
	// The least length and dimension accepted, and the discharge and
	// road-coefficient ranges, in the drawn units; the other numbers
	// are drawn the same in both.
	mm, cm := model.MinLength.In(u), model.MinDimension.In(u)
	var height float64
	section := func(name string) {
		shape := rapid.SampledFrom([]string{"rectangle", "trapezoid", "triangle", "circle", "points"}).Draw(t, name+"shape")
		h := logU(cm, 1000, name+"height")
		height = max(height, h)
		fmt.Fprintf(&b, "section %q {\n  shape = %q\n  roughness = %s\n", name, shape, f(logU(0.005, 0.3, name+"n")))
		switch shape {
		case "rectangle":
			fmt.Fprintf(&b, "  bottom_width = %s\n  height = %s\n", f(logU(cm, 1e4, name+"width")), f(h))
		case "trapezoid":
			z := min(logU(1e-6, 1000, name+"z"), 2e4/h) // top width within MaxDimension
			fmt.Fprintf(&b, "  bottom_width = %s\n  side_slope = %s\n  height = %s\n", f(logU(cm, 1e4, name+"width")), f(z), f(h))
		case "triangle":
			z := max(min(logU(1e-3, 1000, name+"z"), 2e4/h), cm/h)
			fmt.Fprintf(&b, "  side_slope = %s\n  height = %s\n", f(z), f(h))
		case "circle":
			fmt.Fprintf(&b, "  diameter = %s\n", f(h))
		case "points":
			w := logU(cm, 1e4, name+"width")
			wall := rapid.Float64Range(0, 1).Draw(t, name+"wall") // a near-vertical wall
			fmt.Fprintf(&b, "  points = [[0, %s], [%s, 0], [%s, 0], [%s, %s]]\n", f(h), f(w*1e-12*wall), f(w*(1-1e-12*wall)), f(w), f(h))
		}
		b.WriteString("}\n")
	}
	section("s")
	section("t")
	n := rapid.IntRange(1, 3).Draw(t, "reaches")
	var slope, length float64
	for i := range n {
		length = logU(mm, 1e5, fmt.Sprintf("length%d", i))
		slope = rapid.SampledFrom([]float64{0, 1e-9, -1e-9, 1e-5, 0.001, 0.05, 0.5, -0.01}).Draw(t, fmt.Sprintf("slope%d", i))
		if rise := math.Abs(slope) * length; rise > 5000 {
			length = 5000 / math.Abs(slope) // three reaches stay within MaxElevation
		}
		fmt.Fprintf(&b, "reach \"r%d\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = %s\n  section = \"s\"\n  slope = %s\n", i, i, i+1, f(length), f(slope))
		if length >= 3*mm && rapid.Bool().Draw(t, fmt.Sprintf("segment%d", i)) {
			// A segment of the other section, 1 mm long or longer,
			// anywhere on the reach.
			seg := max(mm, length*rapid.Float64Range(0, 0.5).Draw(t, fmt.Sprintf("seglen%d", i)))
			from := (length - seg) * rapid.Float64Range(0, 1).Draw(t, fmt.Sprintf("segat%d", i))
			if from < mm {
				from = 0
			}
			to := from + seg
			if length-to < mm {
				to = length
			}
			fmt.Fprintf(&b, "  segment {\n    from_station = %s\n    to_station = %s\n    section = \"t\"\n  }\n", f(from), f(to))
		}
		b.WriteString("}\n")
	}
	first := strings.Index(b.String(), "reach \"r0\"")
	if rapid.Bool().Draw(t, "gate") {
		fmt.Fprintf(&b, "gate \"g\" {\n  reach = \"r%d\"\n  opening = %s\n  contraction = %s\n}\n", n-1,
			f(logU(cm, max(1.1*cm, height), "opening")), f(rapid.Float64Range(0.5, 1).Draw(t, "cc")))
	}
	_ = first
	if rapid.Bool().Draw(t, "bend") {
		fmt.Fprintf(&b, "bend \"b\" {\n  reach = \"r%d\"\n  from_station = 0\n  to_station = %s\n  radius = %s\n}\n", n-1, f(length), f(logU(cm, 1e4, "radius")))
	}
	if rapid.Bool().Draw(t, "basin") {
		fmt.Fprintf(&b, "basin \"pad\" {\n  reach = \"r%d\"\n  from_station = 0\n  to_station = %s\n}\n", n-1, f(max(mm, length*rapid.Float64Range(0, 1).Draw(t, "basin-len"))))
	}
	culvert := rapid.Bool().Draw(t, "culvert")
	last := n - 1
	if culvert {
		// A box barrel below the last reach, with explicit coefficients
		// drawn over their whole accepted ranges.
		rise := logU(cm, 20, "rise")
		fmt.Fprintf(&b, "section \"barrel\" {\n  shape = \"box\"\n  bottom_width = %s\n  height = %s\n  roughness = 0.013\n}\n", f(logU(cm, 50, "span")), f(rise))
		bl, bs := logU(mm, 500, "barrel-length"), rapid.SampledFrom([]float64{0, 1e-9, 0.01, 0.3}).Draw(t, "barrel-slope")
		fmt.Fprintf(&b, "reach \"culv\" {\n  from = \"n%d\"\n  to = \"n%d\"\n  length = %s\n  section = \"barrel\"\n  slope = %s\n}\n", n, n+1, f(bl), f(bs))
		fmt.Fprintf(&b, "culvert \"c\" {\n  reach = \"culv\"\n  barrels = %d\n  inlet = { form = %d, K = %s, M = %s, c = %s, Y = %s, entrance_loss = %s }\n",
			rapid.IntRange(1, 100).Draw(t, "barrels"), rapid.IntRange(1, 2).Draw(t, "form"),
			f(logU(1e-4, 2, "K")), f(logU(0.2, 4, "M")), f(logU(0.003, 0.6, "c")), f(logU(0.05, 3, "Y")), f(rapid.Float64Range(0, 2).Draw(t, "ke")))
		if rapid.Bool().Draw(t, "road") {
			fmt.Fprintf(&b, "  road = { crest = %s, length = %s, width = %s, coefficient = %s }\n",
				f(bl*bs+rise+max(mm, rise*logU(1e-6, 100, "crest-above"))), f(logU(cm, 1e4, "road-length")), f(logU(cm, 1e3, "road-width")), f(rapid.Float64Range(model.MinRoadCoefficient.In(u), model.MaxRoadCoefficient.In(u)).Draw(t, "cr")))
		}
		b.WriteString("}\n")
		slope = 1 // the outlet reach is the barrel: no normal-depth question
		last = -1
	}
	fmt.Fprintf(&b, "event \"e\" {\n  inflow = { \"r0\" = %s }\n", f(logU(model.MinDischarge.In(u), model.MaxDischarge.In(u), "q")))
	if rapid.Bool().Draw(t, "entrance") {
		fmt.Fprintf(&b, "  entrance = { \"r0\" = %s }\n", f(logU(mm, 1000, "entrance-depth")))
	}
	_ = last
	switch rapid.IntRange(0, 2).Draw(t, "outlet") {
	case 0:
		if slope <= 0 || culvert {
			b.WriteString("  outlet = { condition = \"critical\" }\n") // no normal depth on a level or adverse bed
			break
		}
		b.WriteString("  outlet = { condition = \"normal\" }\n")
	case 1:
		b.WriteString("  outlet = { condition = \"critical\" }\n")
	default:
		fmt.Fprintf(&b, "  outlet = { depth = %s }\n", f(logU(mm, 1000, "depth")))
	}
	b.WriteString("}\n")
	return b.String()
}

// TestDegenerateMagnitudesSolveFinitely: whatever accepted magnitudes a
// model combines, solving and checking it ends (within a generous time),
// without a panic, without a non-finite value replaced in the solution,
// and with finite numbers in every finding. Source: common practice (no
// published source): DEVELOPERS.md, "every number of a result is finite".
func TestDegenerateMagnitudesSolveFinitely(t *testing.T) {
	p, pd := Language().Pack("baseline")
	require.False(t, pd.HasErrors(), pd.Error())
	rapid.Check(t, func(t *rapid.T) {
		src := degenerateModel(t)
		m, diags := model.Parse("degenerate.chan.hcl", []byte(src))
		if diags.HasErrors() {
			t.Fatalf("drawn model refused: %s\n%s", diags.Error(), src)
		}
		type outcome struct {
			res   *solver.Result
			fs    []Finding
			err   error
			panic any
		}
		done := make(chan outcome, 1)
		go func() {
			var o outcome
			defer func() {
				o.panic = recover()
				done <- o
			}()
			o.res, o.err = solver.Solve(m, solver.Options{})
			if o.err == nil {
				o.fs = Check(m, o.res, p)
			}
		}()
		var o outcome
		select {
		case o = <-done:
		case <-time.After(60 * time.Second):
			t.Fatalf("no result within 60 s:\n%s", src)
		}
		if o.panic != nil {
			t.Fatalf("panic: %v\n%s", o.panic, src)
		}
		if o.err != nil {
			if errors.Is(o.err, solver.ErrTooManyPoints) || errors.Is(o.err, solver.ErrWorkBudget) {
				return // a limit, reported as such
			}
			t.Fatalf("Solve: %v\n%s", o.err, src)
		}
		for _, ev := range o.res.Events {
			for _, rr := range ev.Reaches {
				for _, note := range rr.Notes {
					if strings.Contains(note.Message, "not a finite number") {
						t.Fatalf("reach %s: %s\n%s", rr.Reach.Name, note.Message, src)
					}
				}
			}
		}
		for _, f := range o.fs {
			if !numfmt.Finite(f.FromStation, f.ToStation, f.Value, f.Limit) {
				t.Fatalf("finding %s with a non-finite number: %+v\n%s", f.Rule, f, src)
			}
			for _, s := range []string{f.Message, f.Remedy} {
				if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
					t.Fatalf("finding %s prints %q\n%s", f.Rule, s, src)
				}
			}
			if f.Severity != policies.Error && f.Severity != policies.Warning && f.Severity != policies.Info {
				t.Fatalf("finding %s without a severity", f.Rule)
			}
		}
	})
}

// TestOneMillimetreReachChangesNoVerdict cuts a drawn prismatic reach at
// a drawn station with a reach 1 mm long of the same section and slope:
// the channel is the same, so the same rules must fail in the same
// events, and the jumps must be as many. Source: common practice (no
// published source): the cut changes nothing physical. Solver findings
// and information are left out (a node states its own assumptions), and
// so is a finding whose margin is within 1 % of its limit (a cut moves
// the computed points, and a verdict that close turns on them).
func TestOneMillimetreReachChangesNoVerdict(t *testing.T) {
	p, pd := Language().Pack("baseline")
	require.False(t, pd.HasErrors(), pd.Error())
	rapid.Check(t, func(t *rapid.T) {
		f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
		width := rapid.Float64Range(0.5, 10).Draw(t, "width")
		z := rapid.SampledFrom([]float64{0, 1, 2}).Draw(t, "z")
		height := rapid.Float64Range(0.5, 3).Draw(t, "height")
		n := rapid.Float64Range(0.012, 0.04).Draw(t, "n")
		length := rapid.Float64Range(20, 1000).Draw(t, "length")
		slope := rapid.SampledFrom([]float64{0.0005, 0.002, 0.01, 0.05}).Draw(t, "slope")
		q := rapid.Float64Range(0.2, 20).Draw(t, "q")
		cut := length * rapid.Float64Range(0.01, 0.98).Draw(t, "cut")
		outlet := `{ condition = "normal" }`
		switch rapid.IntRange(0, 2).Draw(t, "outlet") {
		case 1:
			outlet = "{ depth = " + f(rapid.Float64Range(0.3, 2.5).Draw(t, "depth")) + " }"
		case 2:
			outlet = `{ condition = "critical" }`
		}
		head := "units = \"si\"\nsection \"s\" {\n  shape = \"trapezoid\"\n  bottom_width = " + f(width) +
			"\n  side_slope = " + f(z) + "\n  height = " + f(height) + "\n  roughness = " + f(n) + "\n  lining = \"concrete\"\n}\n"

		reach := func(name, from, to string, l float64) string {
			return "reach \"" + name + "\" {\n  from = \"" + from + "\"\n  to = \"" + to + "\"\n  length = " + f(l) +
				"\n  section = \"s\"\n  slope = " + f(slope) + "\n}\n"
		}
		event := "event \"e\" {\n  inflow = { \"up\" = " + f(q) + " }\n  outlet = " + outlet + "\n}\n"
		if rapid.Bool().Draw(t, "gate") {
			// A sluice gate at the head releases a jet that may jump.
			event += "gate \"g\" {\n  reach = \"up\"\n  opening = " + f(height*rapid.Float64Range(0.05, 0.5).Draw(t, "opening")) + "\n}\n"
		}
		// A basin over a drawn stretch of the channel, cut with it: its
		// pieces on each reach the stretch touches.
		hasBasin := rapid.Bool().Draw(t, "basin")
		bFrom := length * rapid.Float64Range(0, 0.5).Draw(t, "basin-from")
		bTo := bFrom + length*rapid.Float64Range(0.01, 0.5).Draw(t, "basin-len")
		basin := func(name, reach string, from, to float64) string {
			if !hasBasin || to-from < 0.002 {
				return ""
			}
			return "basin \"" + name + "\" {\n  reach = \"" + reach + "\"\n  from_station = " + f(from) + "\n  to_station = " + f(to) + "\n}\n"
		}
		// A bend over another drawn stretch, cut the same way.
		hasBend := rapid.Bool().Draw(t, "bend")
		kFrom := length * rapid.Float64Range(0, 0.5).Draw(t, "bend-from")
		kTo := kFrom + length*rapid.Float64Range(0.01, 0.5).Draw(t, "bend-len")
		radius := f(width * rapid.Float64Range(0.5, 20).Draw(t, "radius"))
		bend := func(name, reach string, from, to float64) string {
			if !hasBend || to-from < 0.002 {
				return ""
			}
			return "bend \"" + name + "\" {\n  reach = \"" + reach + "\"\n  from_station = " + f(from) + "\n  to_station = " + f(to) + "\n  radius = " + radius + "\n}\n"
		}
		whole := head + reach("up", "a", "d", length) + event + basin("b", "up", bFrom, bTo) + bend("k", "up", kFrom, kTo)
		verdicts := func(src string) (map[string]bool, map[string]bool, []float64) {
			m, diags := model.Parse("cut.chan.hcl", []byte(src))
			if diags.HasErrors() {
				t.Fatalf("%s\n%s", diags.Error(), src)
			}
			res, err := solver.Solve(m, solver.Options{})
			if err != nil {
				t.Fatalf("Solve: %v", err)
			}
			firm, near := map[string]bool{}, map[string]bool{}
			for _, fd := range Check(m, res, p) {
				if fd.Rule == "solver" || fd.Rule == "model" || fd.Severity == policies.Info {
					continue
				}
				key := fd.Rule + "/" + fd.Event
				if fd.HasValue && math.Abs(fd.Value-fd.Limit) <= 0.01*math.Abs(fd.Limit) {
					near[key] = true
					continue
				}
				firm[key] = true
			}
			var jumps []float64
			for _, rr := range res.Events[0].Reaches {
				for _, j := range rr.Jumps {
					jumps = append(jumps, j.Station)
				}
			}
			return firm, near, jumps
		}
		a, an, aj := verdicts(whole)
		for _, x := range aj {
			if x >= length-0.001 {
				// A jump at the outlet itself: the arriving flow's sequent
				// depth ties with the tailwater, and whether it jumps there
				// or leaves supercritical (a solver warning) turns on the
				// last computed digits; not a verdict a cut can move.
				return
			}
		}
		if len(aj) > 0 && rapid.Bool().Draw(t, "at-toe") {
			// Cut where the jump's toe is, the short reach across it.
			if toe := aj[0] - 0.001*rapid.Float64Range(0, 1).Draw(t, "toe-offset"); toe > 0.01 && toe < length-0.02 {
				cut = toe
			}
		}
		mm := rapid.SampledFrom([]float64{0.001, 0.001, 0.002, 0.01}).Draw(t, "short")
		if cut+mm > length-0.005 {
			cut = length - mm - 0.005
		}
		cutSrc := head + reach("up", "a", "b", cut) + reach("mm", "b", "c", mm) + reach("down", "c", "d", length-cut-mm) + event
		if hasBasin {
			// The basin's pieces: on up, over mm whole when it covers the
			// cut, and on down; a piece under 2 mm is left out, and the
			// verdicts may then differ, so the cut keeps clear of the
			// basin's ends.
			if math.Abs(cut-bFrom) < 0.02 || math.Abs(cut+mm-bTo) < 0.02 || math.Abs(cut-bTo) < 0.02 || math.Abs(cut+mm-bFrom) < 0.02 {
				return
			}
			cutSrc += basin("b1", "up", bFrom, min(bTo, cut))
			if bFrom < cut && bTo > cut+mm {
				cutSrc += "basin \"b2\" {\n  reach = \"mm\"\n  from_station = 0\n  to_station = " + f(mm) + "\n}\n"
			}
			cutSrc += basin("b3", "down", max(bFrom-cut-mm, 0), bTo-cut-mm)
		}
		if hasBend {
			if math.Abs(cut-kFrom) < 0.02 || math.Abs(cut+mm-kTo) < 0.02 || math.Abs(cut-kTo) < 0.02 || math.Abs(cut+mm-kFrom) < 0.02 {
				return
			}
			cutSrc += bend("k1", "up", kFrom, min(kTo, cut))
			if kFrom < cut && kTo > cut+mm {
				cutSrc += "bend \"k2\" {\n  reach = \"mm\"\n  from_station = 0\n  to_station = " + f(mm) + "\n  radius = " + radius + "\n}\n"
			}
			cutSrc += bend("k3", "down", max(kFrom-cut-mm, 0), kTo-cut-mm)
		}
		b, bn, bj := verdicts(cutSrc)
		for k := range a {
			if !b[k] && !bn[k] {
				t.Fatalf("%s fails on the whole reach but not once cut at %g (whole %v %v, cut %v %v):\n%s", k, cut, a, an, b, bn, cutSrc)
			}
		}
		for k := range b {
			if !a[k] && !an[k] {
				t.Fatalf("%s fails once cut at %g but not on the whole reach (whole %v %v, cut %v %v):\n%s", k, cut, a, an, b, bn, cutSrc)
			}
		}
		if len(aj) != len(bj) {
			t.Fatalf("%d jumps on the whole reach, %d once cut at %g:\n%s", len(aj), len(bj), cut, cutSrc)
		}
	})
}

// TestFroudeBufferCrossesShortReach keeps the counterexample of
// TestOneMillimetreReachChangesNoVerdict: a mild reach ends in a free
// outfall at critical depth, and the Froude number nears 1 within the
// control's buffer. Cut 0.4 m above the outfall by a reach 1 mm long,
// the buffer must still reach back into the first piece: the walk to the
// controls downstream measured the next reach from the start of the
// piece, not its end, and stopped at the 1 mm reach, so the cut model
// reported a froude_band warning at 19.4 to 19.6 m that the whole reach
// does not. Source: common practice (no published source): the cut
// changes nothing physical.
func TestFroudeBufferCrossesShortReach(t *testing.T) {
	const head = `units = "si"
section "s" {
  shape        = "trapezoid"
  bottom_width = 1
  side_slope   = 1
  height       = 1
  roughness    = 0.04
  lining       = "concrete"
}
`
	const event = `event "e" {
  inflow = { "up" = 5.5 }
  outlet = { depth = 1 }
}
`
	reach := func(name, from, to, length string) string {
		return "reach \"" + name + "\" {\n  from    = \"" + from + "\"\n  to      = \"" + to + "\"\n  length  = " + length +
			"\n  section = \"s\"\n  slope   = 0.0005\n}\n"
	}
	for _, src := range []string{
		head + reach("up", "a", "d", "20") + event,
		head + reach("up", "a", "b", "19.6") + reach("mm", "b", "c", "0.001") + reach("down", "c", "d", "0.399") + event,
	} {
		_, fs := solveAndCheck(t, src)
		for _, f := range fs {
			assert.NotEqual(t, "froude_band", f.Rule, "%s %s %g–%g: %s", f.Rule, f.Reach, f.FromStation, f.ToStation, f.Message)
		}
	}
}
