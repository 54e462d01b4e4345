package solver

import (
	"math"
	"sort"

	"github.com/chanlint/chanlint/model"
)

// reachLayout is the event-independent part of a reach: its runs of one
// section and the stations where a point must be computed.
type reachLayout struct {
	pieces []piece   // geometry and extent only; depths are per event
	stops  []float64 // ascending: 0, length, segment, basin and bend ends
	main   *Geometry // the reach's own section, for the slope class
}

// reachWork is one reach during one event.
type reachWork struct {
	r      *model.Reach
	q      float64
	f      flowCtx
	pieces []piece
	stops  []float64
	res    *ReachResult

	// Pass 1.
	subLo, subHi int     // range of the subcritical profile in solver.subBuf
	subPiece     []int32 // start index (relative to subLo) of each piece's points, plus the end
	junctionH    float64 // energy grade elevation the reach imposes on reaches ending at its upstream node
	junctionWSE  float64 // the water level there (upstream of a controlling gate: its pool)
	junctionHV   float64 // the velocity head αV²/2g there
	gateActs     bool    // a gate holds the water upstream (free or submerged flow)
	gateFree     bool    // in free flow: the vena contracta starts supercritical flow
	gateY        float64
	outletStruct Structure // the outlet into the node below; Kind "" when none is recorded
	borda        []float64 // section changes drowned at the level below (subcritical pass)
	freeFall     bool      // the reach ends in a free fall (critical depth at its end) into the node below
	outletReq    float64   // depth the outlet control asks for (outlet reach only)
	outletKind   model.OutletKind
	outletNotes  []Note
	culvert      *CulvertResult // a culvert barrel's result, nil for other reaches

	// Pass 2.
	endSuper bool
	endY     float64
	endH     float64 // energy grade elevation at the downstream end
	final    []pt
}

// layout splits a reach into runs of one section and collects its stops.
func (s *solver) layout(r *model.Reach) reachLayout {
	var lay reachLayout
	barrels := 1
	if r.Culvert != nil {
		barrels = r.Culvert.Barrels
	}
	if r.Section != nil {
		lay.main = s.geometry(r.Section, barrels)
	}
	length := r.Length
	if !(length > 0) || math.IsInf(length, 0) {
		length = 0
	}
	clamp := func(x float64) float64 { return math.Min(math.Max(x, 0), length) }
	bounds := []float64{0, length}
	for _, seg := range r.Segments {
		bounds = append(bounds, clamp(seg.FromStation), clamp(seg.ToStation))
	}
	bounds = uniqueSorted(bounds, length)
	for i := 0; i+1 < len(bounds); i++ {
		a, b := bounds[i], bounds[i+1]
		sec := r.SectionAt((a + b) / 2)
		if sec == nil {
			sec = r.Section
		}
		if sec == nil {
			continue
		}
		if n := len(lay.pieces); n > 0 && lay.pieces[n-1].geo.Section() == sec {
			lay.pieces[n-1].to = b
			continue
		}
		lay.pieces = append(lay.pieces, piece{from: a, to: b, geo: s.geometry(sec, barrels)})
	}
	if len(lay.pieces) == 0 && r.Section != nil {
		lay.pieces = []piece{{from: 0, to: length, geo: lay.main}}
	}
	stops := []float64{0, length}
	for _, p := range lay.pieces {
		stops = append(stops, p.from, p.to)
	}
	for _, b := range r.Basins {
		stops = append(stops, clamp(b.FromStation), clamp(b.ToStation))
	}
	for _, b := range r.Bends {
		stops = append(stops, clamp(b.FromStation), clamp(b.ToStation))
	}
	lay.stops = uniqueSorted(stops, length)
	return lay
}

// uniqueSorted sorts stations and drops those closer than 1e-9 of the
// reach length to the previous one.
func uniqueSorted(x []float64, length float64) []float64 {
	sort.Float64s(x)
	eps := 1e-9 * math.Max(length, 1)
	out := x[:0]
	for _, v := range x {
		if len(out) > 0 && v-out[len(out)-1] <= eps {
			continue
		}
		out = append(out, v)
	}
	return out
}

// prepare fills the per-event depths of the pieces and the slope class.
func (s *solver) prepare(w *reachWork, lay *reachLayout) {
	r := w.r
	w.stops = lay.stops
	w.pieces = append(w.pieces[:0], lay.pieces...)
	w.f = flowCtx{q: w.q, zUp: r.InvertUp, s0: r.Slope, length: math.Max(r.Length, 0), tol: s.tol}
	if r.Length > 0 {
		w.f.s0 = (r.InvertUp - r.InvertDown) / r.Length
	}
	for i := range w.pieces {
		p := &w.pieces[i]
		p.ycF, p.yn, p.hasN, p.class = s.depths(p.geo, w.q, w.f.s0)
		p.yc = energyMinDepth(p.geo, w.q, p.ycF)
		p.ec = w.f.eval(p, p.yc).e
	}
	if lay.main != nil {
		_, _, _, w.res.SlopeClass = s.depths(lay.main, w.q, w.f.s0)
	}
}

// forceBoundMargin is the relative margin by which a supercritical force
// must exceed the bound of subAround to be taken as holding without
// evaluating the subcritical force: it covers the error of a force carried
// by a last Newton correction (newtonStep), of the order of the depth's
// tolerance.
const forceBoundMargin = 1e-6

// forceTie is the relative tolerance under which two specific forces are
// taken as equal when the two regimes are compared.
const forceTie = 1e-9

// subAt interpolates the subcritical depth of piece pi at station x
// linearly between the computed points of that piece.
func (s *solver) subAt(w *reachWork, pi int32, x float64) float64 {
	y, _ := s.subAround(w, pi, x)
	return y
}

// subAround is subAt with, where x lies between two computed points whose
// specific forces are known, the larger of the two (0 otherwise): on the
// subcritical branch of a prismatic section the specific force rises with
// the depth (dM/dy = A·(1 − F²)), so it bounds the force at the depth
// interpolated between them.
func (s *solver) subAround(w *reachWork, pi int32, x float64) (y, mMax float64) {
	sub := s.subBuf[w.subLo:w.subHi]
	lo, hi := int(w.subPiece[pi]), int(w.subPiece[pi+1])
	if hi <= lo {
		return w.pieces[pi].yc, 0
	}
	pts := sub[lo:hi]
	j := sort.Search(len(pts), func(i int) bool { return pts[i].x >= x })
	if j == 0 {
		return pts[0].y, 0
	}
	if j == len(pts) {
		return pts[len(pts)-1].y, 0
	}
	a, b := pts[j-1], pts[j]
	if b.x <= a.x {
		return b.y, 0
	}
	if m := s.subM[w.subLo+lo:]; m[j-1] > 0 && m[j] > 0 {
		mMax = math.Max(m[j-1], m[j])
	}
	t := (x - a.x) / (b.x - a.x)
	return a.y + t*(b.y-a.y), mMax
}

// subExact computes the subcritical depth of piece pi at station x by one
// standard step from the nearest computed point downstream of x.
func (s *solver) subExact(w *reachWork, pi int32, x float64) float64 {
	sub := s.subBuf[w.subLo:w.subHi]
	lo, hi := int(w.subPiece[pi]), int(w.subPiece[pi+1])
	p := &w.pieces[pi]
	if hi <= lo {
		return p.yc
	}
	pts := sub[lo:hi]
	j := sort.Search(len(pts), func(i int) bool { return pts[i].x >= x })
	if j == len(pts) {
		j = len(pts) - 1
	}
	if pts[j].x == x || pts[j].fallback {
		return pts[j].y
	}
	y, ok := w.f.standardStep(p, pts[j].x, pts[j].y, x, false, 0)
	if !ok {
		return p.yc
	}
	return y
}

// firstSubAfter is the index (relative to subLo) of the first subcritical
// point of piece pi with station > x, or the start of the next piece.
func (s *solver) firstSubAfter(w *reachWork, pi int32, x float64) int {
	sub := s.subBuf[w.subLo:w.subHi]
	lo, hi := int(w.subPiece[pi]), int(w.subPiece[pi+1])
	pts := sub[lo:hi]
	return lo + sort.Search(len(pts), func(i int) bool { return pts[i].x > x })
}

// subFallbackAt reports whether the subcritical profile of piece pi does
// not exist at station x: the computed points on both sides of x (or the
// one at x) are at the control depth, as fallbacks or as a critical
// control (a free outfall, a drop). Supercritical flow is never compared
// with such a stretch: there is no subcritical flow there to jump to.
func (s *solver) subFallbackAt(w *reachWork, pi int32, x float64) bool {
	sub := s.subBuf[w.subLo:w.subHi]
	lo, hi := int(w.subPiece[pi]), int(w.subPiece[pi+1])
	if hi <= lo {
		return true
	}
	pts := sub[lo:hi]
	yc := w.pieces[pi].yc
	crit := func(c pt) bool { return c.fallback || c.y == yc }
	j := sort.Search(len(pts), func(i int) bool { return pts[i].x >= x })
	if j == len(pts) {
		j = len(pts) - 1
	}
	if !crit(pts[j]) {
		return false
	}
	return pts[j].x == x || j == 0 || crit(pts[j-1])
}

// subcritical computes the reach's subcritical profile upstream from its
// downstream control into solver.subBuf and the energy it imposes on the
// reaches above (pass 1): through a gate (gateHead), or, for a culvert
// barrel, the culvert's headwater (culvertHead).
func (s *solver) subcritical(w *reachWork, ev *model.Event) {
	if w.r.Culvert != nil {
		s.culvertHead(w, ev)
		return
	}
	w.subLo = len(s.subBuf)
	if w.q == 0 || len(w.pieces) == 0 {
		s.subProfile(w, 0, true)
		return
	}
	y, crit := s.downstreamBoundary(w, ev)
	s.subProfile(w, y, crit)
	if w.subHi > w.subLo {
		s.gateHead(w)
	}
}

// subProfile computes the subcritical profile from the depth y at the
// downstream end (critical depth when crit) into solver.subBuf from
// w.subLo on.
func (s *solver) subProfile(w *reachWork, y float64, crit bool) {
	s.subBuf = s.subBuf[:w.subLo]
	s.subM = s.subM[:w.subLo]
	w.subHi = w.subLo
	if w.q == 0 || len(w.pieces) == 0 {
		w.subPiece = w.subPiece[:0]
		return
	}
	last := len(w.pieces) - 1
	x := w.pieces[last].to
	s.subBuf = append(s.subBuf, pt{x: x, y: y, piece: int32(last)})
	s.subM = append(s.subM, 0)
	s.count(1)
	var st stepper
	var tmp [2]pt
	for pi := last; pi >= 0 && !s.tooMany; pi-- {
		p := &w.pieces[pi]
		st.init(&w.f, p, pi, false, x, y, crit, w.r.MaxSpacing)
		for si := len(w.stops) - 1; si >= 0 && !s.tooMany; si-- {
			stop := w.stops[si]
			if stop >= x || stop < p.from-1e-12*math.Max(w.f.length, 1) {
				continue
			}
			for n := st.step(stop, &tmp); n > 0 && !s.tooMany; n = st.step(stop, &tmp) {
				for i := range tmp[:n] {
					m := 0.0
					if st.outKnown[i] {
						m = st.outK[i].m
					}
					s.subM = append(s.subM, m)
				}
				s.subBuf = append(s.subBuf, tmp[:n]...)
				s.count(n)
			}
			x = stop
		}
		x, y, crit = p.from, st.y, st.atCrit
		if pi > 0 {
			// Transition into the section upstream: equal energy plus the
			// local loss there (none unless a loss block applies).
			up := &w.pieces[pi-1]
			z := w.f.invert(x)
			st := w.f.eval(p, y)
			y2, _, _, ok := w.f.lossDepth(up, z, z+st.e, st.e-y, s.sectionLoss(w, x), true, false)
			if !ok && !crit && y > up.yc && w.f.velocityHead(up, y) >= st.e-y {
				// The water below stands above the critical level of the
				// section upstream: the change is drowned, not a control
				// (see nodes.go, Borda–Carnot).
				y2, ok = y, true
				w.borda = append(w.borda, x)
			}
			s.subBuf = append(s.subBuf, pt{x: x, y: y2, piece: int32(pi - 1), fallback: !ok})
			s.subM = append(s.subM, 0)
			s.count(1)
			y, crit = y2, !ok
		}
	}
	w.subHi = len(s.subBuf)
	sub := s.subBuf[w.subLo:w.subHi]
	subM := s.subM[w.subLo:w.subHi]
	for i, j := 0, len(sub)-1; i < j; i, j = i+1, j-1 {
		sub[i], sub[j] = sub[j], sub[i]
		subM[i], subM[j] = subM[j], subM[i]
	}
	w.subPiece = w.subPiece[:0]
	pi := int32(-1)
	for i, c := range sub {
		for pi < c.piece {
			w.subPiece = append(w.subPiece, int32(i))
			pi++
		}
	}
	for int(pi) < len(w.pieces) {
		w.subPiece = append(w.subPiece, int32(len(sub)))
		pi++
	}
}

// superControl is an upstream control of a reach.
type superControl struct {
	ok       bool
	x        float64 // station where the supercritical flow starts (the toe of a drop's nappe; else 0)
	y        float64
	kind     string // "gate", "entrance", "inflow", "drop"
	arriving bool   // supercritical flow arriving from upstream reaches
}

// combine walks the reach downstream, switching between the
// supercritical profile (computed here, as it goes) and the subcritical
// one of pass 1, and places the jumps (pass 2).
func (s *solver) combine(w *reachWork) {
	w.final = s.finBuf[:0]
	if w.q == 0 || w.subHi <= w.subLo {
		return
	}
	sub := s.subBuf[w.subLo:w.subHi]
	ctrl := s.upstreamControl(w)
	k := 0 // next subcritical point to emit
	superAt := false
	var sx, sy float64
	var spi int32
	atCrit := false
	if ctrl.ok {
		p0 := &w.pieces[0]
		ys := sub[0].y
		if ctrl.x > 0 {
			ys = s.subExact(w, 0, ctrl.x) // the tailwater at the toe of the nappe
		}
		fs, fb := w.f.force(p0, ctrl.y), w.f.force(p0, ys)
		if s.subFallbackAt(w, 0, ctrl.x) {
			fb = fs // no subcritical flow there to jump to
		}
		if fs-fb >= -forceTie*math.Max(fs, fb) {
			superAt, sx, sy, spi = true, ctrl.x, ctrl.y, 0
			atCrit = ctrl.y == p0.yc
			if ctrl.x > 0 {
				// The jet from the drop face to the toe of the nappe.
				w.final = append(w.final, pt{x: 0, y: ctrl.y, piece: 0, super: true})
			}
			w.final = append(w.final, pt{x: ctrl.x, y: ctrl.y, piece: 0, super: true})
		} else {
			s.drowned(w, ctrl, ys)
		}
	}
	for !s.tooMany {
		if !superAt {
			if k >= len(sub) {
				break
			}
			c := sub[k]
			w.final = append(w.final, c)
			k++
			if c.fallback && k < len(sub) && sub[k].piece == c.piece+1 && sub[k].x == c.x {
				// A section change chokes the flow: it passes critical
				// depth at the end of this section, so the next section
				// starts supercritical with that energy if its force
				// holds against the subcritical flow there.
				p, next := &w.pieces[c.piece], &w.pieces[sub[k].piece]
				z := w.f.invert(c.x)
				st := w.f.eval(p, c.y)
				if y, _, _, ok := w.f.lossDepth(next, z, z+st.e, st.e-c.y, s.sectionLoss(w, c.x), false, true); ok && !s.dominated(w, next, y, sub[k].y) {
					w.final = append(w.final, pt{x: c.x, y: y, piece: sub[k].piece, super: true})
					superAt, sx, sy, spi, atCrit = true, c.x, y, sub[k].piece, false
					k++
				}
				continue
			}
			if c.fallback && k < len(sub) && sub[k].piece == c.piece && sub[k].x > c.x {
				// Flow passes through critical depth here; try a
				// supercritical profile downstream of it.
				// Only where the supercritical flow holds its own against
				// the subcritical one there (in a points section the
				// depths of least energy and least force differ).
				p := &w.pieces[c.piece]
				xm := c.x + (sub[k].x-c.x)/2
				if y, ok := w.f.standardStep(p, c.x, p.yc, xm, true, 0); ok && (s.subFallbackAt(w, c.piece, xm) || !s.dominated(w, p, y, s.subAt(w, c.piece, xm))) {
					w.final[len(w.final)-1].fallback = false
					superAt, sx, sy, spi, atCrit = true, c.x, p.yc, c.piece, true
				}
			}
			continue
		}
		next, done := s.superWalk(w, sx, sy, spi, atCrit)
		if done {
			return
		}
		superAt, k = false, next
	}
}

// superWalk marches the supercritical profile from (x, y) in piece pi
// downstream, appending points to w.final, until its specific force falls
// below the subcritical profile's (a jump, or the two meeting at critical
// depth) or the reach ends. It returns the index of the next subcritical
// point to emit, or done when the reach ends supercritical.
func (s *solver) superWalk(w *reachWork, x, y float64, pi int32, atCrit bool) (int, bool) {
	var st stepper
	var tmp [2]pt
	prev := pt{x: x, y: y, piece: pi, super: true}
	// runStart indexes w.final at the first point of the current
	// supercritical run in this piece (the candidates for the toe).
	runStart := len(w.final) - 1
	if runStart < 0 || w.final[runStart].x != x || w.final[runStart].piece != pi {
		runStart = len(w.final)
	}
	for ; int(pi) < len(w.pieces); pi++ {
		p := &w.pieces[pi]
		if prev.piece != pi {
			// Transition from the previous section: equal energy less the
			// local loss there (none unless a loss block applies).
			z := w.f.invert(p.from)
			up := &w.pieces[pi-1]
			st := w.f.eval(up, prev.y)
			y2, _, _, ok := w.f.lossDepth(p, z, z+st.e, st.e-prev.y, s.sectionLoss(w, p.from), false, true)
			c := pt{x: p.from, y: y2, piece: pi, super: true, fallback: !ok}
			s.count(1)
			ys := s.subAt(w, pi, c.x)
			if s.dominated(w, p, c.y, ys) {
				// The jump is held at the section change.
				y2s := s.subAt(w, pi-1, c.x)
				s.addJump(w, up, c.x, prev.y, y2s, "the section changes there")
				w.final = append(w.final, pt{x: c.x, y: y2s, piece: pi - 1})
				return s.firstSubAfter(w, pi-1, c.x), false
			}
			w.final = append(w.final, c)
			prev, atCrit, runStart = c, !ok, len(w.final)-1
		}
		st.init(&w.f, p, int(pi), true, prev.x, prev.y, atCrit, w.r.MaxSpacing)
		for _, stop := range w.stops {
			if stop <= st.x || stop > p.to+1e-12*math.Max(w.f.length, 1) {
				continue
			}
			for n := st.step(stop, &tmp); n > 0; n = st.step(stop, &tmp) {
				s.count(n)
				if s.tooMany {
					return 0, true
				}
				for i, c := range tmp[:n] {
					ys, mMax := s.subAround(w, pi, c.x)
					fs := st.force(i, c.y)
					var fb float64
					if p.geo.kind == kindPrismatic && mMax > 0 && fs >= mMax*(1+forceBoundMargin) {
						// The subcritical force here is at most mMax: the
						// supercritical flow holds, as evaluating it would
						// find.
						fb = mMax
					} else {
						fb = w.f.force(p, ys)
					}
					if s.subFallbackAt(w, pi, c.x) {
						fb = fs // no subcritical flow here to jump to
					}
					if fs-fb < -forceTie*math.Max(fs, fb) && !c.fallback {
						// Confirm against the subcritical depth computed at
						// this station rather than interpolated.
						fb = w.f.force(p, s.subExact(w, pi, c.x))
					}
					if fs-fb < -forceTie*math.Max(fs, fb) {
						xt, y1, y2, ok := s.locateJump(w, p, pi, runStart, c)
						if !ok {
							w.final = w.final[:min(runStart+1, len(w.final))]
							first := &w.final[len(w.final)-1]
							if first.y == p.yc {
								first.fallback, first.super = true, false
							} else if first.super && first.piece == pi && !first.fallback {
								// Supercritical flow that entered within the
								// force tie of its sequent (a toe a hair
								// downstream of a node, the reach above
								// ending a hair short of it): the jump
								// stands where the run starts, rather than
								// vanishing between two reaches.
								if ys := s.subExact(w, pi, first.x); jumpRises(FroudeNumber(p.geo, w.q, first.y), first.y, ys) {
									s.addJump(w, p, first.x, first.y, ys, "the supercritical flow enters there")
									w.final = append(w.final, pt{x: first.x, y: ys, piece: pi})
								}
							}
							return s.firstSubAfter(w, first.piece, first.x), false
						}
						if !jumpRises(FroudeNumber(p.geo, w.q, y1), y1, y2) {
							// The two profiles meet at critical depth: the
							// flow turns subcritical without a jump.
							if n := len(w.final); n == 0 || xt > w.final[n-1].x {
								w.final = append(w.final, pt{x: xt, y: y1, piece: pi, super: true})
							}
							return s.firstSubAfter(w, pi, xt), false
						}
						w.final = append(w.final, pt{x: xt, y: y1, piece: pi, super: true})
						s.addJump(w, p, xt, y1, y2, "where the subcritical profile begins")
						// y2 is exactly the control depth only where the
						// subcritical profile itself fell back to it.
						w.final = append(w.final, pt{x: xt, y: y2, piece: pi, fallback: y2 == p.yc})
						return s.firstSubAfter(w, pi, xt), false
					}
					w.final = append(w.final, c)
					prev = c
					if c.fallback {
						// Both profiles at critical depth: the flow
						// continues subcritical without a jump.
						return s.firstSubAfter(w, pi, c.x), false
					}
				}
			}
		}
		atCrit = st.atCrit
		prev = pt{x: st.x, y: st.y, piece: pi, super: true}
	}
	w.endSuper = true
	return 0, true
}

// dominated reports whether the subcritical depth ys has the greater
// specific force than the supercritical depth y in piece p.
func (s *solver) dominated(w *reachWork, p *piece, y, ys float64) bool {
	fs, fb := w.f.force(p, y), w.f.force(p, ys)
	return fs-fb < -forceTie*math.Max(fs, fb)
}

// locateJump finds the toe of a jump detected at the supercritical point
// b of piece pi, where the specific force of the supercritical profile
// equals that of the subcritical one:
//
//	D(x) = M(y_super(x)) − M(y_sub(x)) = 0
//
// The detection compares against the subcritical profile interpolated
// linearly, so the toe can lie before the last supercritical point: the
// computed points of the run (w.final[runStart:], ascending, in piece pi)
// are checked backwards with the exact D until one has D ≥ 0 (at most
// jumpBackScan of them), the points after it are dropped from w.final, and
// D is solved by Brent's method between that point and the next. Both
// depths are recomputed at x by a standard step (see toeSearch): the
// supercritical one from the point found, the subcritical one from the
// nearest subcritical point downstream. Where no point of the run has
// D ≥ 0, ok is false: the run was drowned from its start and there is no
// jump. Where the ends do not bracket (a numerical corner), the toe is put
// at the linear interpolation of D.
func (s *solver) locateJump(w *reachWork, p *piece, pi int32, runStart int, b pt) (xt, y1, y2 float64, ok bool) {
	ts := toeSearch{s: s, w: w, p: p, pi: pi, subJ: -1}
	k := len(w.final) - 1
	if runStart < 0 {
		runStart = 0
	}
	next := b
	var dBase float64
	found := false
	for scanned := 0; k >= runStart && scanned < jumpBackScan; k, scanned = k-1, scanned+1 {
		c := w.final[k]
		if c.piece != pi || !c.super {
			break
		}
		ysub, msub := ts.sub(c.x)
		if d := ts.diff(c.x, w.f.force(p, c.y), msub); d >= 0 {
			ts.base, dBase, found = c, d, true
			ts.remember(c.x, c.y, ysub, d)
			break
		}
		next = c
	}
	if !found {
		// Drowned from the first point of the run: that start (a depth of
		// least energy where the subcritical profile fell back, in a
		// points section whose depths of least energy and least force
		// differ) does not start supercritical flow after all.
		return 0, 0, 0, false
	}
	w.final = w.final[:k+1] // keep base, drop what lies beyond the toe
	ts.next = next
	ts.kBase = w.f.eval(p, ts.base.y)
	// The toe to 1e-10 of the reach, or finer on a very short, steep
	// curve: 1e-8 of the interval searched.
	base := ts.base
	xtol := math.Min(1e-10*math.Max(w.f.length, 1), 1e-8*(next.x-base.x))
	da, db := dBase, ts.d(next.x)
	switch {
	case da >= 0 && db <= 0 && da != db:
		if x, err := Brent(ts.d, base.x, next.x, xtol); err == nil {
			xt = x
		} else {
			xt = base.x + (next.x-base.x)*da/(da-db)
		}
	default:
		xt = base.x
		if da != db {
			xt = base.x + (next.x-base.x)*math.Min(1, math.Max(0, da/(da-db)))
		}
	}
	y1, y2 = ts.depths(xt)
	return xt, y1, y2, true
}

// toeSearch is the state of locateJump's search: the supercritical point
// the search starts from (base, with its state) and the next computed
// one, the subcritical point last stepped from (with its state), and the
// last few stations evaluated, so that the toe Brent's method returns is
// not computed again. Each depth is a standard step solved by Newton's
// method from a guess interpolated between the computed points around it
// (newtonStep), the specific force taken from the state at the root: one
// or two section evaluations a depth where a step without a guess costs
// five or more.
type toeSearch struct {
	s          *solver
	w          *reachWork
	p          *piece
	pi         int32
	base, next pt
	kBase      stepState
	subJ       int // index in the piece's subcritical points of kSub; -1: none
	kSub       stepState
	seen       [4]toeEval
	nSeen      int
}

// toeEval is one station evaluated by a toeSearch.
type toeEval struct{ x, ySup, ySub, d float64 }

func (t *toeSearch) remember(x, ySup, ySub, d float64) {
	t.seen[t.nSeen%len(t.seen)] = toeEval{x, ySup, ySub, d}
	t.nSeen++
}

// diff is D at station x from the two specific forces; where the
// subcritical profile does not exist the supercritical flow holds, and D
// is kept positive there.
func (t *toeSearch) diff(x, mSup, mSub float64) float64 {
	d := mSup - mSub
	if t.s.subFallbackAt(t.w, t.pi, x) {
		d = math.Max(d, forceTie*mSup)
	}
	return d
}

// sub is the subcritical depth at x and its specific force, by a standard
// step from the nearest computed point downstream (subExact).
func (t *toeSearch) sub(x float64) (float64, float64) {
	s, w, p := t.s, t.w, t.p
	lo, hi := int(w.subPiece[t.pi]), int(w.subPiece[t.pi+1])
	if hi <= lo {
		return p.yc, w.f.force(p, p.yc)
	}
	pts := s.subBuf[w.subLo:w.subHi][lo:hi]
	j := sort.Search(len(pts), func(i int) bool { return pts[i].x >= x })
	if j == len(pts) {
		j = len(pts) - 1
	}
	c := pts[j]
	if c.x == x || c.fallback {
		return c.y, w.f.force(p, c.y)
	}
	if t.subJ != j {
		t.subJ, t.kSub = j, w.f.eval(p, c.y)
	}
	guess := s.subAt(w, t.pi, x)
	y, ok, st := w.f.newtonStep(p, c.x, t.kSub, x, false, guess, c.y)
	if !ok {
		return p.yc, w.f.force(p, p.yc)
	}
	return y, st.m
}

// sup is the supercritical depth at x and its specific force, by a
// standard step from base.
func (t *toeSearch) sup(x float64) (float64, float64) {
	w, p, base := t.w, t.p, t.base
	if x <= base.x {
		return base.y, t.kBase.m
	}
	guess := base.y
	if t.next.x > base.x {
		guess += (t.next.y - base.y) * (x - base.x) / (t.next.x - base.x)
	}
	y, ok, st := w.f.newtonStep(p, base.x, t.kBase, x, true, guess, base.y)
	if !ok {
		return p.yc, w.f.force(p, p.yc)
	}
	return y, st.m
}

// d is D(x) for Brent's method.
func (t *toeSearch) d(x float64) float64 {
	ySup, mSup := t.sup(x)
	ySub, mSub := t.sub(x)
	d := t.diff(x, mSup, mSub)
	t.remember(x, ySup, ySub, d)
	return d
}

// depths are the two depths at the toe x: those of an evaluation of x
// already made, else computed.
func (t *toeSearch) depths(x float64) (ySup, ySub float64) {
	for i := range min(t.nSeen, len(t.seen)) {
		if e := t.seen[i]; e.x == x {
			return e.ySup, e.ySub
		}
	}
	ySup, _ = t.sup(x)
	ySub, _ = t.sub(x)
	return ySup, ySub
}

// unbalancedJump is the relative difference of specific force above which
// a jump is reported as held rather than balanced; a located toe balances
// to about 1e-7.
const unbalancedJump = 1e-5

// jumpBackScan bounds how many computed points locateJump re-examines
// before the point where a jump was detected.
const jumpBackScan = 64

// jumpRises reports whether depths y1 to y2 with upstream Froude number f1
// are a hydraulic jump: a rise from supercritical flow. Where F1 is within
// criticalFroudeTol of 1 the flow upstream is critical (see regimeOf): the
// sequent depth equals y1 to within the profile's own step error, so such
// a "jump" is the two profiles meeting at critical depth, not a jump. On a
// near-critical slope the supercritical profile wanders about critical
// depth by that error, and a jump of a few 1e-5 of the depth would
// otherwise appear or not with the rounding of the model's unit.
func jumpRises(f1, y1, y2 float64) bool {
	return y2 > y1 && f1 > 1+criticalFroudeTol
}

// addJump records a hydraulic jump with toe at station x; a "jump" that
// does not rise from supercritical flow (y2 ≤ y1 or F1 critical, two
// profiles meeting at critical depth; see jumpRises) is not one and is not
// recorded. A jump whose
// two depths do not balance in specific force (held by a change of
// section, a junction, or the start of the subcritical profile in a points
// section) gets a NoteInfo saying why (the why argument).
func (s *solver) addJump(w *reachWork, p *piece, x, y1, y2 float64, why string) {
	f1 := FroudeNumber(p.geo, w.q, y1)
	if !jumpRises(f1, y1, y2) {
		return
	}
	if m1, m2 := w.f.force(p, y1), w.f.force(p, y2); math.Abs(m1-m2) > unbalancedJump*math.Max(m1, m2) {
		w.res.Notes = append(w.res.Notes, noteInfo(x,
			"the jump is held at station %s (%s): the specific forces on its two sides differ by %s %%, so its depths are those of the two profiles there, not a sequent pair",
			num(x), why, num(100*math.Abs(m1-m2)/math.Max(m1, m2))))
	}
	// A gain within the depths' tolerance is rounding, not a gain: a weak
	// jump near critical flow loses next to no energy.
	if e1, e2 := w.f.eval(p, y1).e, w.f.eval(p, y2).e; e2-e1 > w.f.tol {
		w.res.Notes = append(w.res.Notes, noteInfo(x,
			"the jump at station %s balances in specific force but gains %s of energy: the energy coefficient α of the section changes between its depths and the momentum coefficient is taken as 1, so its depths are approximate",
			num(x), num(e2-e1)))
	}
	if p.class == Steep {
		// Specific force balances the two sides of a jump on a horizontal
		// bed; on a steep bed the weight of the roller pushes downstream
		// and the sequent depth and length are larger (Chow 1959, ch. 15,
		// jumps in sloping channels, from memory). No correction is applied.
		w.res.Notes = append(w.res.Notes, noteInfo(x,
			"jump at %s on bed slope %s uses the horizontal-bed relation", num(x), num(w.f.s0)))
	}
	j := Jump{
		Station:         x,
		UpstreamDepth:   y1,
		DownstreamDepth: y2,
		Froude:          f1,
		Length:          JumpLength(y1, y2, f1),
		Type:            ClassifyJump(f1),
		EnergyLoss:      w.f.eval(p, y1).e - w.f.eval(p, y2).e,
	}
	w.res.Jumps = append(w.res.Jumps, j)
}
