package revdiff

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// Gate release onto a mild rectangular channel (2.5 m wide, n 0.014,
// S0 0.0007, 200 m, 4 m³/s under a gate opened 0.43 m with contraction
// 0.61) into a tailwater of the given depth: an M3 curve from the vena
// contracta rises to the hydraulic jump, an M1 curve from the tailwater
// falls back to it.
const (
	gateWidth, gateN, gateSlope, gateLength, gateQ = 2.5, 0.014, 0.0007, 200.0, 4.0
	gateOpening, gateContraction                   = 0.43, 0.61
)

func gateRelease(tail float64) string {
	return fmt.Sprintf(`units = "si"
section "outlet-channel" {
  shape        = "rectangle"
  bottom_width = %g
  height       = 2.5
  roughness    = %g
}
reach "release" {
  from    = "gate-house"
  to      = "river"
  length  = %g
  section = "outlet-channel"
  slope   = %g
}
gate "sluice" {
  reach       = "release"
  opening     = %g
  contraction = %g
}
event "release" {
  inflow = { "release" = %g }
  outlet = { depth = %.9f }
}
`, gateWidth, gateN, gateLength, gateSlope, gateOpening, gateContraction, gateQ, tail)
}

// belanger is the sequent depth of y1 in a rectangular channel:
// y2/y1 = ½(√(1 + 8F1²) − 1).
//
// Source: Bélanger's equation, Chow, Open-Channel Hydraulics (1959),
// ch. 15; Henderson, Open Channel Flow (1966).
func (r rect) belanger(y1 float64) float64 {
	return y1 / 2 * (math.Sqrt(1+8*r.f2(y1)) - 1)
}

// refToe is the toe of the jump of gateRelease(tail) with the tailwater
// below normal depth, computed independently of the solver: the M3
// curve's station x₁(y₁) from the vena contracta and the M2 curve's
// station x₂(y₂) from the tailwater, each by quadrature of the
// varied-flow equation, and the toe where x₁(y₁) = x₂(y₂) with y₁ and y₂
// sequent by Bélanger's equation (bisection on y₂ between the tailwater
// and normal depth, where the M2 curve's station runs from the outlet to
// far upstream). It returns the toe and the two depths there.
//
// Source: Bélanger's equation and the gradually-varied-flow equation
// dx/dy = (1 − F²)/(S0 − Sf) (Chow 1959, ch. 9 and ch. 15); a jump is
// located where the sequent of the supercritical profile meets the
// subcritical one (Chow 1959, §15-7, from memory).
func refToe(tail float64) (x, y1, y2 float64) {
	r := rect{b: gateWidth, n: gateN, q: gateQ, s0: gateSlope}
	yv := gateOpening * gateContraction
	yn := r.normalDepth()
	xSup := func(y1 float64) float64 { return r.upstreamDistance(yv, y1) }
	xSub := func(y2 float64) float64 { return gateLength + r.upstreamDistance(tail, y2) }
	y2 = bisect(func(y2 float64) float64 { return xSup(r.belanger(y2)) - xSub(y2) }, tail*(1+1e-9), yn*(1-1e-9))
	y1 = r.belanger(y2) // the relation is symmetric: the sequent of y2 is y1
	return xSub(y2), y1, y2
}

// toeTolerance is the station tolerance of a toe whose depths are right
// to the solver's accuracy target, 0.2 % (as the solver's own jump
// tests take it): δx = 0.002·y1 / |dy/dx| on the steeper of the two
// profiles at the toe.
//
// Source: common practice (no published source).
func toeTolerance(y1, y2 float64) float64 {
	r := rect{b: gateWidth, n: gateN, q: gateQ, s0: gateSlope}
	slope := func(y float64) float64 { return math.Abs((r.s0 - r.sf(y)) / (1 - r.f2(y))) }
	return 0.002 * y1 / math.Max(slope(y1), slope(y2))
}

// largestRise is the largest rise over every compared point, the spans
// of jump moves included: what the comparison reported before it
// followed jumps.
func largestRise(p *Profile) float64 {
	r := math.Inf(-1)
	for i := range p.Stations {
		r = math.Max(r, p.NewWSE[i]-p.OldWSE[i])
	}
	return r
}

// TestJumpMovesWithTailwater raises the tailwater of the gate release by
// 5 cm: the jump moves upstream. The diff reports one move whose toes
// and distance agree with the independent Bélanger computation; the
// water surface over the span between the toes, one jump height higher,
// is the move's, not the profile's: the profile's largest rise is the
// 5 cm at the outlet. A no_rise limit above 5 cm fails over exactly the
// span of the move, since a move of metres is beyond the solver's
// toe-location tolerance and the surface does rise there.
//
// Source: refToe (Bélanger's equation and quadrature of the varied-flow
// equation, Chow 1959); the outlet's rise is the tailwater's change.
func TestJumpMovesWithTailwater(t *testing.T) {
	const tailOld, tailNew = 1.00, 1.05
	xOld, y1Old, y2Old := refToe(tailOld)
	xNew, y1New, y2New := refToe(tailNew)
	t.Logf("reference toes: %.4f m (y1 %.4f, y2 %.4f) → %.4f m (y1 %.4f, y2 %.4f)", xOld, y1Old, y2Old, xNew, y1New, y2New)
	require.Less(t, xNew, xOld-1, "the reference jump moves upstream by more than a metre")

	old := solved(t, "old.chan.hcl", gateRelease(tailOld), nil)
	new := solved(t, "new.chan.hcl", gateRelease(tailNew), nil)
	d := Compare(old, new, nil)
	require.Len(t, d.Profiles, 1)
	p := &d.Profiles[0]
	require.Len(t, p.Jumps, 1, "%+v", p.Jumps)
	m := p.Jumps[0]
	assert.Equal(t, JumpMoved, m.Kind)
	assert.Equal(t, "upstream", m.Direction())
	tolOld, tolNew := toeTolerance(y1Old, y2Old), toeTolerance(y1New, y2New)
	assert.InDelta(t, xOld, m.From, tolOld, "existing toe (tolerance %.3g)", tolOld)
	assert.InDelta(t, xNew, m.To, tolNew, "proposed toe (tolerance %.3g)", tolNew)
	assert.InDelta(t, xNew-xOld, m.Distance, tolOld+tolNew)
	assert.False(t, m.Numerical, "a move of %.3g m against a tolerance of %.3g m", m.Distance, m.Tolerance)
	rr := rect{b: gateWidth, n: gateN, q: gateQ, s0: gateSlope}
	assert.InDelta(t, math.Sqrt(rr.f2(y1Old)), m.OldFroude, 0.005*m.OldFroude)
	assert.InDelta(t, math.Sqrt(rr.f2(y1New)), m.NewFroude, 0.005*m.NewFroude)
	// Over the span the proposed flow is on the subcritical side of its
	// jump and the existing one still on its M3 curve, which at the
	// proposed toe is the proposed y1: the difference is the proposed
	// jump's height, largest at its toe.
	assert.InDelta(t, y2New-y1New, m.Surface.Delta, 0.005*(y2New-y1New))
	assert.InDelta(t, m.To, m.Surface.Station, 1e-9)
	assert.Positive(t, m.Compared)
	// The profile's own extremes: the tailwater's 5 cm at the outlet, no
	// fall (the M3 curve upstream of both toes is the same, but for the
	// linear interpolation of the existing one between its points, some
	// 3e-5 m).
	assert.InDelta(t, tailNew-tailOld, p.Rise.Delta, 1e-6)
	assert.InDelta(t, gateLength, p.Rise.Station, 1e-9)
	assert.InDelta(t, 0, p.Fall.Delta, 1e-4)
	t.Logf("move %+.4f m (tolerance %.3g m), surface %+.4f m at %.3f; profile rise %+.5f at %g (%+.4f counting the move's span)",
		m.Distance, m.Tolerance, m.Surface.Delta, m.Surface.Station, p.Rise.Delta, p.Rise.Station, largestRise(p))

	fails := Compare(old, new, policy(t, "no_rise {\n limit = 0.1\n}"))
	require.Len(t, fails.NoRise, 1)
	f := fails.NoRise[0]
	assert.Equal(t, m.To, f.FromStation, "the span starts at the proposed toe")
	assert.Equal(t, m.From, f.ToStation, "the span ends at the existing toe")
	assert.InDelta(t, m.Surface.Delta, f.Value, 1e-12)
	assert.Contains(t, f.Message, "the hydraulic jump's move")
	assert.Empty(t, Compare(old, new, policy(t, fmt.Sprintf("no_rise {\n limit = %g\n}", y2New-y1New+0.01))).NoRise)
}

// TestNumericalJumpMove raises the tailwater by a micrometre: the toe
// moves by far less than the solver's toe-location tolerance, and the
// diff reports the move as numerical, keeps the jump height it straddles
// out of every extreme, and a no_rise limit of zero finds no more than
// the micrometre.
//
// Source: common practice (no published source).
func TestNumericalJumpMove(t *testing.T) {
	const tailOld = 1.00
	old := solved(t, "old.chan.hcl", gateRelease(tailOld), nil)
	new := solved(t, "new.chan.hcl", gateRelease(tailOld+1e-6), nil)
	d := Compare(old, new, policy(t, "no_rise {\n limit = 0.0001\n}"))
	require.Len(t, d.Profiles, 1)
	p := &d.Profiles[0]
	for _, m := range p.Jumps {
		t.Logf("move %+.3g m, tolerance %.3g m, numerical %v, compared %d, surface %+.3g", m.Distance, m.Tolerance, m.Numerical, m.Compared, m.Surface.Delta)
		assert.True(t, m.Numerical)
	}
	t.Logf("profile rise %+.3g m (%+.4f counting the move's span)", p.Rise.Delta, largestRise(p))
	assert.Less(t, p.Rise.Delta, 1e-5)
	assert.Greater(t, p.Fall.Delta, -1e-5)
	assert.Less(t, math.Abs(p.Faster.Delta), 1e-4)
	assert.Less(t, math.Abs(p.Slower.Delta), 1e-4)
	assert.Empty(t, d.NoRise)
}

// TestToeToleranceCoversTheToeError: the solver's toe-location
// tolerance, which decides whether a move is numerical, covers the
// distance between the toe the solver computes and the independent
// Bélanger toe on gate releases into several tailwaters; the same model
// computed with points at most 5 cm apart puts its toe within a
// hundredth of that tolerance of the reference (the reference is right).
//
// Source: refToe (Bélanger's equation and quadrature of the varied-flow
// equation, Chow 1959).
func TestToeToleranceCoversTheToeError(t *testing.T) {
	for _, tail := range []float64{0.9, 1.0, 1.05, 1.1} {
		src := gateRelease(tail)
		rr := solved(t, "a.chan.hcl", src, nil).Solution.Events[0].Reaches[0]
		require.Len(t, rr.Jumps, 1)
		tol, ok := rr.ToeTolerance(0)
		require.True(t, ok)
		ref, _, _ := refToe(tail)
		fine := strings.Replace(src, "slope   = 0.0007", "slope   = 0.0007\n  max_spacing = 0.05", 1)
		rf := solved(t, "b.chan.hcl", fine, nil).Solution.Events[0].Reaches[0]
		require.Len(t, rf.Jumps, 1)
		t.Logf("tailwater %g m: toe %.4f m, fine %.4f m, reference %.4f m; error %.3g m, tolerance %.3g m (ratio %.2f)",
			tail, rr.Jumps[0].Station, rf.Jumps[0].Station, ref, rr.Jumps[0].Station-ref, tol, math.Abs(rr.Jumps[0].Station-ref)/tol)
		assert.InDelta(t, ref, rf.Jumps[0].Station, tol/100, "the finely computed toe")
		assert.InDelta(t, ref, rr.Jumps[0].Station, tol, "the toe within its tolerance")
	}
}

// TestPairJumps: jumps pair nearest toes first, each once; the rest
// appear or disappear.
//
// Source: common practice (no published source).
func TestPairJumps(t *testing.T) {
	js := func(xs ...float64) []solver.Jump {
		var out []solver.Jump
		for _, x := range xs {
			out = append(out, solver.Jump{Station: x})
		}
		return out
	}
	pairs, gone, appeared := pairJumps(js(10, 100), js(60))
	assert.Equal(t, [][2]int{{1, 0}}, pairs, "60 is nearer 100 than 10")
	assert.Equal(t, []int{0}, gone)
	assert.Empty(t, appeared)
	pairs, gone, appeared = pairJumps(js(10, 20), js(18, 30))
	assert.Equal(t, [][2]int{{1, 0}, {0, 1}}, pairs, "18 takes 20; 30 the one left")
	assert.Empty(t, gone)
	assert.Empty(t, appeared)
	pairs, gone, appeared = pairJumps(nil, js(5))
	assert.Empty(t, pairs)
	assert.Empty(t, gone)
	assert.Equal(t, []int{0}, appeared)
}

// TestJumpDrowned raises the tailwater of the gate release until the
// subcritical profile at the gate is deeper than the vena contracta's
// sequent depth: the gate is submerged and the jump disappears. The
// diff says so; the profile is compared as computed, and the rise over
// what was the M3 curve is a real change, not a move.
//
// Source: a gate is submerged when the tailwater exceeds the sequent
// depth of the vena contracta (Henderson 1966, ch. 6, from memory);
// Bélanger's equation for that sequent depth.
func TestJumpDrowned(t *testing.T) {
	r := rect{b: gateWidth, n: gateN, q: gateQ, s0: gateSlope}
	yv := gateOpening * gateContraction
	seq := r.belanger(yv)
	// The M1 curve from a tailwater of seq + 0.2 m stays above seq over
	// the reach (it falls toward normal depth upstream, 1.18 m, below seq).
	tail := seq + 0.2
	require.Greater(t, r.upstreamDistance(seq*(1+1e-6), tail), gateLength)
	old := solved(t, "old.chan.hcl", gateRelease(1.0), nil)
	new := solved(t, "new.chan.hcl", gateRelease(tail), nil)
	d := Compare(old, new, nil)
	require.Len(t, d.Profiles, 1)
	p := &d.Profiles[0]
	require.Len(t, p.Jumps, 1)
	m := p.Jumps[0]
	assert.Equal(t, JumpGone, m.Kind)
	assert.Equal(t, old.Solution.Events[0].Reaches[0].Jumps[0].Station, m.From)
	assert.Contains(t, m.Text("m"), "is gone")
	assert.Greater(t, p.Rise.Delta, seq-yv-0.1, "the M3 curve is drowned: a rise of about a jump height")
	for _, a := range p.Across {
		assert.Equal(t, -1, a)
	}
}

// TestSweepMatchesScan: the sweep over the spans of moved jumps finds
// for every station what a scan of all the moves finds.
//
// Source: common practice (no published source).
func TestSweepMatchesScan(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		var moves []JumpMove
		for range rapid.IntRange(0, 12).Draw(t, "jumps") {
			kind := rapid.SampledFrom([]MoveKind{JumpMoved, JumpMoved, JumpAppeared, JumpGone}).Draw(t, "kind")
			from := float64(rapid.IntRange(0, 40).Draw(t, "from"))
			to := float64(rapid.IntRange(0, 40).Draw(t, "to"))
			moves = append(moves, JumpMove{Kind: kind, From: from, To: to, Distance: to - from})
		}
		scan := func(x float64, upstream bool) int {
			side := func(toe float64) bool { return x < toe || (x == toe && upstream) }
			for i := range moves {
				m := &moves[i]
				if lo, hi := m.Span(); m.Kind == JumpMoved && x >= lo && x <= hi && side(m.From) != side(m.To) {
					return i
				}
			}
			return -1
		}
		w := newSweep(moves)
		x := 0.0
		for range rapid.IntRange(0, 60).Draw(t, "points") {
			x += float64(rapid.IntRange(0, 2).Draw(t, "step")) / 2
			up := rapid.Bool().Draw(t, "upstream")
			if got, want := w.across(x, up), scan(x, up); got != want {
				t.Fatalf("station %g (upstream %v): sweep %d, scan %d", x, up, got, want)
			}
		}
	})
}

// TestFinerStepsMoveJumpsOnlyNumerically diffs the demo against itself
// with the apron's points at most 2 cm apart: the same flow computed
// with other steps. Its jumps move by millimetres, within the solver's
// toe-location tolerance, and no profile reads a jump's height (about a
// metre) as a rise.
//
// Source: common practice (no published source): a finer computation of
// the same model is the same flow.
func TestFinerStepsMoveJumpsOnlyNumerically(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "..", "..", "testdata", "demo", "kestrel-ridge.chan.hcl"))
	require.NoError(t, err)
	const apron = "  invert  = [1.05, 1.05]\n"
	require.Equal(t, 1, strings.Count(string(src), apron), "the demo's apron")
	fine := strings.Replace(string(src), apron, apron+"  max_spacing = 0.02\n", 1)
	d := Compare(solved(t, "old.chan.hcl", string(src), nil), solved(t, "new.chan.hcl", fine, nil), policy(t, "no_rise {\n limit = 0.01\n}"))
	moves := 0
	for _, p := range d.Profiles {
		for _, m := range p.Jumps {
			moves++
			t.Logf("%s %s: %s", p.Reach, p.Event, m.Text("m"))
			assert.Equal(t, JumpMoved, m.Kind)
			assert.True(t, m.Numerical, "%s %s: %+.4f m against %.4f m", p.Reach, p.Event, m.Distance, m.Tolerance)
		}
		if len(p.Jumps) > 0 {
			fall := math.Inf(1)
			for i := range p.Stations {
				fall = math.Min(fall, p.NewWSE[i]-p.OldWSE[i])
			}
			t.Logf("%s %s: rise %+.4f, fall %+.4f m (%+.4f, %+.4f counting the moves' spans)", p.Reach, p.Event, p.Rise.Delta, p.Fall.Delta, largestRise(&p), fall)
		}
		assert.Less(t, p.Rise.Delta, 0.01, "%s %s", p.Reach, p.Event)
		assert.Greater(t, p.Fall.Delta, -0.01, "%s %s", p.Reach, p.Event)
	}
	assert.Positive(t, moves, "the finer steps move the apron's jumps")
	assert.Empty(t, d.NoRise)
}
