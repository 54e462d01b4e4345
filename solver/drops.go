package solver

import (
	"math"

	"github.com/chanlint/chanlint/model"
)

// Flow arriving at the head of a reach from the reaches ending at its
// upstream node, and drops.
//
// A reach receives supercritical flow from upstream where an incoming
// reach ends supercritical, or ends in a free fall at critical depth (its
// outlet is free: the water below stands under its critical level, see
// nodes.go). The flow then enters this reach supercritical and is compared
// with its subcritical profile by specific force like any upstream
// control: a hydraulic jump forms where the two forces meet, or, where the
// tailwater's force is the greater already at the start, the jump is
// drowned against the drop face (or held at the junction).
//
// Depth where the supercritical flow starts:
//   - Straight drop (Rand 1955): a single incoming reach falling freely
//     over a vertical drop of height h (its end invert above this reach's
//     start) onto a horizontal or mild apron, both sections rectangles of
//     one width b. With q = Q/b and the drop number D = q²/(g·h³):
//     y1/h = 0.54·D^0.425 (depth at the toe of the nappe),
//     yp/h = 1.00·D^0.22 (pool behind the nappe),
//     Ld/h = 4.30·D^0.27 (drop length, face to toe),
//     y2/h = 1.66·D^0.27 (sequent depth of y1).
//     Source: Rand, W., Flow geometry at straight drop spillways, Proc.
//     ASCE 81 (1955); as given in Chow, Open-Channel Hydraulics (1959),
//     ch. 15, the straight drop spillway (from memory). The relations were
//     fitted to experiments over 0.045 ≤ yc/h ≤ 1, i.e. about
//     1e-4 ≤ D ≤ 1 (from memory); outside that range, or for other shapes,
//     slopes or several incoming reaches, the next rule applies. The
//     supercritical profile starts at the toe, station Ld; from the face to
//     the toe the profile shows the jet at depth y1 (the pool depth yp is
//     in the drop record).
//   - Otherwise, energy from the brink: the depth on the supercritical
//     branch of this reach's section at station 0 whose energy equals the
//     discharge-weighted energy of the inflows less the node's local loss
//     (a loss block at the node or the model-wide default, with the
//     contraction coefficient since the velocity head rises into the jet;
//     without one no loss, which gives the fastest jet and the largest
//     sequent depth a drop of that height can produce: an upper bound for
//     the jump's size and length). A drop record names the method.

// Range of drop numbers over which Rand's relations are used.
const (
	randMinDrop = 1e-4
	randMaxDrop = 1.0
)

// RandDrop holds Rand's (1955) straight-drop relations for a drop of height
// h and drop number D, all depths and lengths in the unit of h.
type RandDrop struct {
	ToeDepth, PoolDepth, Length, SequentDepth float64
}

// RandStraightDrop evaluates Rand's relations (see drops.go's comment):
// y1/h = 0.54·D^0.425, yp/h = D^0.22, Ld/h = 4.30·D^0.27, y2/h = 1.66·D^0.27.
func RandStraightDrop(h, d float64) RandDrop {
	return RandDrop{
		ToeDepth:     0.54 * math.Pow(d, 0.425) * h,
		PoolDepth:    math.Pow(d, 0.22) * h,
		Length:       4.30 * math.Pow(d, 0.27) * h,
		SequentDepth: 1.66 * math.Pow(d, 0.27) * h,
	}
}

// arrival is the supercritical control at station 0 of a reach from the
// reaches upstream, if any arrives supercritical or falls freely.
func (s *solver) arrival(w *reachWork) superControl {
	var qs, qh, qv float64
	var falling *reachWork
	arrivals, inflows := 0, 0
	for _, u := range w.r.Upstream {
		if u == nil || u.Index < 0 || u.Index >= len(s.work) {
			continue
		}
		uw := &s.work[u.Index]
		if uw.q <= 0 {
			continue
		}
		inflows++
		qs += uw.q
		qh += uw.q * uw.endH
		if lp := uw.lastPiece(); lp != nil {
			qv += uw.q * uw.f.velocityHead(lp, uw.endY)
		}
		switch {
		case uw.endSuper:
			arrivals++
		case uw.freeFall && uw.endY == uw.lastPiece().yc && w.r.Culvert == nil:
			// (A reach falling into a culvert's headwater pool: the
			// barrel's inlet is its own control, by HDS-5.)
			arrivals++
			falling = uw
		}
	}
	if arrivals == 0 || !(qs > 0) {
		return superControl{}
	}
	if inflows == 1 && falling != nil {
		if c, ok := s.randDrop(w, falling); ok {
			return c
		}
	}
	h, hv := qh/qs, qv/qs
	p0 := &w.pieces[0]
	z0 := w.f.invert(0)
	loss := lossOf(s.m.NodeLoss(w.r.Upstream[0]))
	y, hl, k, ok := w.f.lossDepth(p0, z0, h, hv, loss, false, true)
	if !ok {
		y = p0.yc
		if h < z0+p0.ec-1e-9*math.Max(1, math.Abs(h)) {
			w.res.Notes = append(w.res.Notes, noteControl(0,
				"supercritical flow arrives with energy grade elevation %s, below the critical energy of this reach (%s): critical depth is taken at its start",
				num(h), num(z0+p0.ec)))
		}
	}
	if len(w.r.Upstream) > 1 {
		w.res.Notes = append(w.res.Notes, noteInfo(0,
			"supercritical flows meet at junction %q, where a one-dimensional model cannot represent the shock waves: the depth %s at the start of this reach is taken from the discharge-weighted energy of the inflows, less the local loss %s",
			w.r.From, num(y), num(hl)))
	}
	kind := "inflow"
	if falling != nil && inflows == 1 {
		kind = "fall"
		if dropHeight(w, falling) > 0 {
			kind = "drop"
			s.energyDrop(w, falling, y, k, loss)
		}
	}
	return superControl{ok: true, y: y, kind: kind, arriving: true}
}

// lastPiece is the piece at the downstream end of the reach (nil without
// pieces).
func (w *reachWork) lastPiece() *piece {
	if len(w.pieces) == 0 {
		return nil
	}
	return &w.pieces[len(w.pieces)-1]
}

// dropHeight is the invert at the brink (the end of the reach above)
// minus the invert at station 0 of this reach.
func dropHeight(w, up *reachWork) float64 {
	return up.f.invert(up.f.length) - w.f.invert(0)
}

// randDrop applies Rand's straight-drop relations where they hold.
func (s *solver) randDrop(w, up *reachWork) (superControl, bool) {
	p0, lp := &w.pieces[0], up.lastPiece()
	h := dropHeight(w, up)
	sec, usec := p0.geo.Section(), lp.geo.Section()
	if !(h > 0) || sec == nil || usec == nil || sec.Shape != model.Rectangle || usec.Shape != model.Rectangle ||
		math.Abs(sec.BottomWidth-usec.BottomWidth) > 0.01*sec.BottomWidth ||
		(p0.class != Horizontal && p0.class != Mild) {
		return superControl{}, false
	}
	q := w.q / sec.BottomWidth
	d := q * q / (p0.geo.g * h * h * h)
	if d < randMinDrop || d > randMaxDrop {
		return superControl{}, false
	}
	r := RandStraightDrop(h, d)
	x := r.Length
	validity := "a vertical drop onto a horizontal or mild apron, rectangular sections of one width, critical flow at the brink, drop number within 1e-4 to 1 (0.045 ≤ yc/h ≤ 1), the range of Rand's experiments (from memory); this drop: D = " + num(d)
	if len(w.stops) > 1 && x > w.stops[1] {
		x = w.stops[1]
		validity += "; the drop length " + num(r.Length) + " reaches past station " + num(x) + ", where the toe is placed"
	}
	y1 := r.ToeDepth
	e1 := w.f.invert(x) + w.f.eval(p0, y1).e
	y2, err := SequentDepth(p0.geo, w.q, y1)
	if err != nil {
		y2 = r.SequentDepth
	}
	w.res.Drops = append(w.res.Drops, Drop{
		Node: w.r.From, From: up.r.Name, Height: h, Number: d, Brink: up.endY,
		ToeDepth: y1, PoolDepth: r.PoolDepth, Length: r.Length, SequentDepth: y2,
		EnergyLoss: up.endH - e1,
		Method:     "Rand (1955) straight-drop relations: y1/h = 0.54·D^0.425, yp/h = D^0.22, Ld/h = 4.30·D^0.27 (Rand's sequent depth 1.66·D^0.27·h = " + num(r.SequentDepth) + "; the jump is checked with the sequent depth by specific force)",
		Validity:   validity,
	})
	return superControl{ok: true, x: x, y: y1, kind: "drop", arriving: true}, true
}

// energyDrop records a drop (or a free overfall without a drop) where the
// start depth came from the energy of the brink.
func (s *solver) energyDrop(w, up *reachWork, y1, k float64, loss localLoss) {
	p0 := &w.pieces[0]
	h := dropHeight(w, up)
	d := 0.0
	if sec := p0.geo.Section(); sec != nil && sec.Shape == model.Rectangle && h > 0 {
		q := w.q / sec.BottomWidth
		d = q * q / (p0.geo.g * h * h * h)
	}
	y2, err := SequentDepth(p0.geo, w.q, y1)
	if err != nil {
		y2 = y1
	}
	method := "energy conserved from the brink (critical depth " + num(up.endY) + ") to the jet at the foot of the drop, without loss: no loss block at the node and no model-wide default; this gives the fastest jet and the largest sequent depth for the drop (an upper bound)"
	if !loss.none() {
		method = "energy from the brink (critical depth " + num(up.endY) + ") to the jet at the foot of the drop less the local loss " + quote(loss.name) + ", h = k·|Δ(αV²/2g)| with k = " + num(k)
	}
	why := "Rand's straight-drop relations do not apply here: they need a single reach falling over a vertical drop onto a horizontal or mild apron, rectangular sections of one width and a drop number within 1e-4 to 1"
	w.res.Drops = append(w.res.Drops, Drop{
		Node: w.r.From, From: up.r.Name, Height: h, Number: d, Brink: up.endY,
		ToeDepth: y1, SequentDepth: y2, EnergyLoss: up.endH - (w.f.invert(0) + w.f.eval(p0, y1).e),
		Method: method, Validity: why + "; the jet is taken at station 0, the face, with no drop length",
	})
}
