package revdiff

import (
	"cmp"
	"math"
	"slices"
	"strings"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// MoveKind is what became of a hydraulic jump between the revisions.
type MoveKind string

const (
	// JumpMoved: a jump of the existing revision paired with one of the
	// proposed revision whose toe lies elsewhere.
	JumpMoved MoveKind = "moved"
	// JumpAppeared: a jump of the proposed revision with none of the
	// existing one left to pair it with.
	JumpAppeared MoveKind = "appeared"
	// JumpGone: a jump of the existing revision with none of the proposed
	// one left to pair it with.
	JumpGone MoveKind = "disappeared"
)

// JumpMove is one hydraulic jump of a reach and event followed from the
// existing revision to the proposed one. Jumps are paired nearest toe
// first, each at most once; a jump whose toe stayed where it was is not
// listed. Between the two toes of a moved jump one revision is on the
// supercritical side of the jump and the other on the subcritical side:
// the difference of the water surface there is the jump's move, not a
// change of either profile, and is kept out of the profile's extremes.
type JumpMove struct {
	Kind MoveKind
	// From and To are the toe's stations in the existing and the proposed
	// revision (From alone for a jump gone, To alone for one that
	// appeared); Distance is To − From, negative upstream.
	From, To, Distance   float64
	OldFroude, NewFroude float64 // upstream Froude number F1
	OldType, NewType     solver.JumpType
	// Tolerance is the solver's toe-location tolerance of the pair
	// (solver.ReachResult.ToeTolerance, the larger of the two
	// revisions'); Numerical is true when the move is within it: a move
	// of the computation, not of the flow, which no_rise does not count.
	Tolerance float64
	Numerical bool
	// Compared is the number of compared points between the two toes;
	// Surface and Velocity the largest difference, proposed minus
	// existing, of the water surface and the velocity there (by size,
	// with its sign and station).
	Compared          int
	Surface, Velocity Extreme
}

// Span is the stretch between the two toes of a moved jump.
func (m *JumpMove) Span() (lo, hi float64) {
	return math.Min(m.From, m.To), math.Max(m.From, m.To)
}

// Direction is "upstream" or "downstream" for a moved jump, else "".
func (m *JumpMove) Direction() string {
	switch {
	case m.Kind != JumpMoved:
		return ""
	case m.Distance < 0:
		return "upstream"
	}
	return "downstream"
}

// allPairs bounds the jumps (existing times proposed) up to which
// pairJumps weighs every pair; beyond it only the two existing toes that
// bracket each proposed one are candidates.
const allPairs = 1 << 12

// pairJumps pairs the jumps of the existing and the proposed profile of
// one reach, nearest toes first, each jump at most once. Both lists are
// ordered by station (as solver.ReachResult.Jumps is). A reach holds a
// few jumps, and every pair is weighed; a hostile model with more than
// allPairs pairs has its candidates limited to the bracketing toes, so
// that the work stays of the order of the jumps times their logarithm.
func pairJumps(old, new []solver.Jump) (pairs [][2]int, gone, appeared []int) {
	type candidate struct {
		o, n int
		d    float64
	}
	var cands []candidate
	for n, j := range new {
		lo, hi := 0, len(old)
		if len(old)*len(new) > allPairs {
			i, _ := slices.BinarySearchFunc(old, j.Station, func(o solver.Jump, x float64) int { return cmp.Compare(o.Station, x) })
			lo, hi = max(i-1, 0), min(i+1, len(old))
		}
		for o := lo; o < hi; o++ {
			cands = append(cands, candidate{o, n, math.Abs(j.Station - old[o].Station)})
		}
	}
	slices.SortStableFunc(cands, func(a, b candidate) int { return cmp.Compare(a.d, b.d) })
	usedO, usedN := make([]bool, len(old)), make([]bool, len(new))
	for _, c := range cands {
		if usedO[c.o] || usedN[c.n] {
			continue
		}
		usedO[c.o], usedN[c.n] = true, true
		pairs = append(pairs, [2]int{c.o, c.n})
	}
	slices.SortFunc(pairs, func(a, b [2]int) int { return cmp.Compare(a[1], b[1]) })
	for o, used := range usedO {
		if !used {
			gone = append(gone, o)
		}
	}
	for n, used := range usedN {
		if !used {
			appeared = append(appeared, n)
		}
	}
	return pairs, gone, appeared
}

// jumpMoves follows the jumps of one reach and event between the
// revisions, in the order of the proposed toes (the jumps gone last, in
// the order of the existing ones).
func jumpMoves(old, new *solver.ReachResult) []JumpMove {
	pairs, gone, appeared := pairJumps(old.Jumps, new.Jumps)
	var out []JumpMove
	for _, p := range pairs {
		oj, nj := &old.Jumps[p[0]], &new.Jumps[p[1]]
		if oj.Station == nj.Station {
			continue
		}
		m := JumpMove{Kind: JumpMoved, From: oj.Station, To: nj.Station, Distance: nj.Station - oj.Station,
			OldFroude: oj.Froude, NewFroude: nj.Froude, OldType: oj.Type, NewType: nj.Type}
		for _, t := range []struct {
			rr *solver.ReachResult
			j  int
		}{{old, p[0]}, {new, p[1]}} {
			if tol, ok := t.rr.ToeTolerance(t.j); ok {
				m.Tolerance = math.Max(m.Tolerance, tol)
			}
		}
		m.Numerical = math.Abs(m.Distance) <= m.Tolerance
		out = append(out, m)
	}
	for _, n := range appeared {
		j := &new.Jumps[n]
		out = append(out, JumpMove{Kind: JumpAppeared, To: j.Station, NewFroude: j.Froude, NewType: j.Type})
	}
	slices.SortStableFunc(out, func(a, b JumpMove) int { return cmp.Compare(a.To, b.To) })
	for _, o := range gone {
		j := &old.Jumps[o]
		out = append(out, JumpMove{Kind: JumpGone, From: j.Station, OldFroude: j.Froude, OldType: j.Type})
	}
	return out
}

// sweep finds, for compared points taken in station order, the moved
// jump whose two toes a point lies between (across). It keeps the moves
// whose span has begun and not ended, so that a point costs the number
// of spans over it rather than the number of jumps of the reach.
type sweep struct {
	moves  []JumpMove
	order  []int // the moved jumps by the start of their span
	next   int
	active []int
}

func newSweep(moves []JumpMove) *sweep {
	w := &sweep{moves: moves}
	for i := range moves {
		if moves[i].Kind == JumpMoved {
			w.order = append(w.order, i)
		}
	}
	slices.SortStableFunc(w.order, func(a, b int) int {
		la, _ := moves[a].Span()
		lb, _ := moves[b].Span()
		return cmp.Compare(la, lb)
	})
	return w
}

// across is the index of the moved jump whose two toes the proposed
// point at station x (the first of two points there when upstream) lies
// between, or −1: the point is on one side of the jump and the existing
// value compared with it (oldAt) on the other. Stations come in
// non-decreasing order.
func (w *sweep) across(x float64, upstream bool) int {
	for w.next < len(w.order) {
		if lo, _ := w.moves[w.order[w.next]].Span(); lo > x {
			break
		}
		w.active = append(w.active, w.order[w.next])
		w.next++
	}
	side := func(toe float64) bool { return x < toe || (x == toe && upstream) }
	found := -1
	keep := w.active[:0]
	for _, i := range w.active {
		m := &w.moves[i]
		if _, hi := m.Span(); hi < x {
			continue // ended
		}
		keep = append(keep, i)
		if side(m.From) != side(m.To) && (found < 0 || i < found) {
			found = i
		}
	}
	w.active = keep
	return found
}

// record counts a compared point between the toes of m with the
// differences of the water surface and the velocity there.
func (m *JumpMove) record(dw, dv, x float64) {
	if m.Compared == 0 || math.Abs(dw) > math.Abs(m.Surface.Delta) {
		m.Surface = Extreme{Delta: dw, Station: x}
	}
	if m.Compared == 0 || math.Abs(dv) > math.Abs(m.Velocity.Delta) {
		m.Velocity = Extreme{Delta: dv, Station: x}
	}
	m.Compared++
}

// toleranceBasis names what Tolerance is, for the outputs that print it.
var toleranceBasis = "the solver's toe-location tolerance (each depth of the specific-force balance to " +
	numfmt.Sig(solver.ToeDepthAccuracy, 1) + " of itself, carried to the toe's station)"

// Text describes the move in one sentence with lengths in unit
// (velocities in unit/s); it holds no name from a model.
func (m *JumpMove) Text(unit string) string {
	f1 := func(f float64, t solver.JumpType) string {
		s := "F1 " + numfmt.Num(f)
		if t != solver.NoJump {
			s += " (" + string(t) + ")"
		}
		return s
	}
	switch m.Kind {
	case JumpAppeared:
		return "a hydraulic jump appears with its toe at " + numfmt.Num(m.To) + " " + unit + ", " + f1(m.NewFroude, m.NewType) +
			": the existing revision has no jump left to pair it with, and the profiles on either side are compared as computed"
	case JumpGone:
		return "the hydraulic jump with its toe at " + numfmt.Num(m.From) + " " + unit + " (" + f1(m.OldFroude, m.OldType) +
			") is gone: the proposed revision has no jump left to pair it with, and the profiles on either side are compared as computed"
	}
	from, to := numfmt.Pair(m.From, m.To)
	oldF, newF := numfmt.Pair(m.OldFroude, m.NewFroude)
	types := string(m.OldType) + " → " + string(m.NewType)
	if m.OldType == m.NewType {
		types = string(m.NewType)
	}
	var b strings.Builder
	b.WriteString("the hydraulic jump moved " + numfmt.Num(math.Abs(m.Distance)) + " " + unit + " " + m.Direction() +
		", toe " + from + " → " + to + " " + unit + ", F1 " + oldF + " → " + newF + " (" + types + ")")
	lo, hi := m.Span()
	a, z := numfmt.Pair(lo, hi) // ends that never print alike
	span := a + "–" + z + " " + unit
	if m.Numerical {
		b.WriteString(": within " + toleranceBasis + " of " + numfmt.Num(m.Tolerance) + " " + unit +
			", a move of the computation, not of the flow; the difference across " + span + " is not counted as a rise or fall")
		return b.String()
	}
	b.WriteString("; over " + span + " the proposed water surface is ")
	if m.Compared == 0 {
		b.WriteString("on the other side of the jump (no computed point there)")
		return b.String()
	}
	higher := "higher"
	if m.Surface.Delta < 0 {
		higher = "lower"
	}
	b.WriteString(numfmt.Num(math.Abs(m.Surface.Delta)) + " " + unit + " " + higher)
	if math.Abs(m.Velocity.Delta) > 0 {
		faster := "faster"
		if m.Velocity.Delta < 0 {
			faster = "slower"
		}
		b.WriteString(" and the flow " + numfmt.Num(math.Abs(m.Velocity.Delta)) + " " + unit + "/s " + faster)
	}
	if m.Distance < 0 {
		b.WriteString(", subcritical where the existing flow was supercritical: a real rise over that span, with as much less " +
			"freeboard (the check of the proposed model judges its freeboard there)")
	} else {
		b.WriteString(", supercritical where the existing flow was subcritical")
	}
	b.WriteString("; the move exceeds " + toleranceBasis + " of " + numfmt.Num(m.Tolerance) + " " + unit)
	return b.String()
}
