package solver

import (
	"errors"
	"math"
)

// Sluice gates at station 0 of a reach.
//
// With opening a, contraction coefficient Cc and vena contracta depth
// yv = Cc·a, in the reach's section at station 0 and with the tailwater
// depth yt the subcritical flow of the reach computed up to station 0:
//   - Free flow, when the jet at the vena contracta is supercritical
//     (yv < yc) and its specific force is not less than the tailwater's
//     (the tailwater is below the sequent depth of yv): energy is
//     conserved from upstream to the vena contracta (Henderson, Open
//     Channel Flow, 1966, §6.2 and §6.6):
//     E(y1) = yv + Q²/(2g·A(yv)²).
//   - Submerged flow, when the tailwater's specific force is the greater:
//     a roller of depth y3 stands over the jet at the vena contracta.
//     Momentum from the vena contracta to the tailwater gives y3,
//     Q²/(g·A(yv)) + [A·z̄](y3) = Q²/(g·A(yt)) + [A·z̄](yt),
//     and energy from upstream to the vena contracta, where the jet
//     moves at Q/A(yv) under the head y3, gives y1:
//     E(y1) = y3 + Q²/(2g·A(yv)²)
//     (Henderson 1966, §6.6, from memory; for a rectangle this is the
//     classical submerged-gate relation).
//   - The gate controls only when it touches the water: the depth
//     upstream it needs, y1, must stand above its lip (y1 > a). Otherwise
//     the water passes under the gate without touching it, the gate does
//     not control, and a note says so. Likewise where the jet's depth
//     would not be under the tailwater's roller (y3 < yv in submerged
//     flow: the opening is deeper than the flow it would pass).
//
// Approximation: the pressure at the vena contracta is hydrostatic over
// the roller's depth and the jet's velocity is uniform (α = 1 in the jet),
// as in the published method; Cc is held constant (about 0.61 for a
// sharp-edged vertical gate over the usual range of y1/a, Henry 1950,
// from memory).

// gateHead sets the energy grade elevation, water level and velocity head
// that a reach imposes upstream of its station 0 (pass 1, after its
// subcritical profile), through its gate when one controls.
func (s *solver) gateHead(w *reachWork) {
	p0 := &w.pieces[0]
	sub := s.subBuf[w.subLo:w.subHi]
	z0 := w.f.invert(0)
	yt := sub[0].y
	w.imposeHead(p0, z0, yt)
	g := w.r.Gate
	if g == nil {
		return
	}
	yv := g.VenaContracta()
	if !(yv > 0) || math.IsInf(yv, 0) {
		return
	}
	st := Structure{Kind: StructGate, Name: g.Name, Station: 0, DownstreamDepth: yt}
	av := p0.geo.Props(yv).Area
	jet := w.q * w.q / (2 * p0.geo.g * av * av) // velocity head of the jet
	mv, mt := w.f.force(p0, yv), w.f.force(p0, yt)
	var e1 float64 // specific energy upstream of the gate
	free := yv < p0.yc && mv >= mt*(1-forceTie)
	if free {
		// The energy of the jet as the profile below reports it (with the
		// section's α, 1 in a prismatic section).
		e1 = w.f.eval(p0, yv).e
		st.State = StateFree
		st.Method = "free flow under a sluice gate: energy conserved from upstream to the vena contracta, depth Cc·a = " + num(g.Contraction) + " × " + num(g.Opening) + " = " + num(yv) + " (Henderson 1966, §6.2)"
	} else {
		y3, ok := rollerDepth(w, p0, mt-w.q*w.q/(p0.geo.g*av), yv)
		if !ok {
			s.gateOpen(w, st, "is above the water (jet "+num(yv)+", flow below "+num(yt)+")",
				"the flow below it is not deep enough to cover the jet of its opening: the opening passes the flow without holding it back")
			return
		}
		e1 = y3 + jet
		st.State = StateSubmerged
		st.Method = "submerged sluice gate: momentum from the vena contracta (jet depth " + num(yv) + ") to the tailwater " + num(yt) + " gives the depth " + num(y3) + " over the jet, energy from upstream to the vena contracta gives the depth upstream (Henderson 1966, §6.6, from memory)"
	}
	y1, ok := w.f.solveBranch(p0, z0, 0, z0+e1, false, 0, 0)
	if !ok {
		y1 = p0.yc
	}
	if !(y1 > g.Opening) {
		s.gateOpen(w, st, "is above the water (depth "+num(y1)+", lip "+num(g.Opening)+")",
			"the depth it would hold upstream, "+num(y1)+", does not stand above its lip at opening "+num(g.Opening)+": the water passes under the gate without touching it")
		return
	}
	st.UpstreamDepth = y1
	st.HeadLoss = e1 - w.f.eval(p0, yt).e
	if free {
		st.HeadLoss = 0
	}
	st.Validity = "the gate controls because the depth upstream " + num(y1) + " stands above its lip (criterion y1 > a); Cc = " + num(g.Contraction) + " is taken constant (about 0.61 for a sharp-edged vertical gate, Henry 1950, from memory); the pressure at the vena contracta is hydrostatic and the jet's velocity uniform"
	w.gateActs, w.gateFree, w.gateY = true, free, yv
	w.res.GateUpstreamDepth = y1
	w.imposeHead(p0, z0, y1)
	w.res.Structures = append(w.res.Structures, st)
	if !free {
		w.res.Notes = append(w.res.Notes, noteInfo(0,
			"gate %q flows submerged: the tailwater depth %s is above the sequent depth of the vena contracta %s; the depth upstream %s is computed by energy to the vena contracta and momentum to the tailwater (Henderson 1966)",
			g.Name, num(yt), num(yv), num(y1)))
	}
}

// imposeHead sets what the reaches ending at this reach's upstream node
// see there: the water level z + y, its velocity head in piece p and the
// energy grade elevation. A structure at the head of the reach (a gate, a
// culvert inlet) calls it with the depth it holds upstream; without one
// it is the subcritical depth at station 0. nodeOutlet then settles the
// end of every incoming reach from these three values, free or drowned,
// with the node's local loss.
func (w *reachWork) imposeHead(p *piece, z, y float64) {
	e := w.f.eval(p, y).e
	w.junctionH, w.junctionWSE, w.junctionHV = z+e, z+y, e-y
}

// imposePool is imposeHead for a still pool at level h (a culvert's
// headwater, which HDS-5 takes without velocity head).
func (w *reachWork) imposePool(h float64) {
	w.junctionH, w.junctionWSE, w.junctionHV = h, h, 0
}

// gateOpen records a gate that does not control the flow: short is the
// reason for the note, why the full one for the structure record.
func (s *solver) gateOpen(w *reachWork, st Structure, short, why string) {
	g := w.r.Gate
	st.State = StateNoControl
	st.Method = "no gate control: " + why
	st.Validity = "a gate controls only when the water upstream stands above its lip (y1 > a)"
	w.res.Structures = append(w.res.Structures, st)
	w.res.Notes = append(w.res.Notes, noteControl(0, "gate %q %s", g.Name, short))
}

// rollerDepth solves [A·z̄](y3) = target for the depth y3 over the jet at
// a submerged gate's vena contracta; ok is false when y3 would be below
// the jet depth yv.
func rollerDepth(w *reachWork, p *piece, target, yv float64) (float64, bool) {
	moment := func(y float64) float64 { return p.geo.Props(y).FirstMoment - target }
	if !(moment(yv) < 0) {
		return yv, false
	}
	hi := 2 * yv
	for i := 0; i < branchExpand && !(moment(hi) > 0); i++ {
		hi *= 2
		if hi > maxDepth {
			return yv, false
		}
	}
	y, err := Brent(moment, yv, hi, w.f.tol)
	if err != nil && !errors.Is(err, ErrNoConvergence) {
		return yv, false
	}
	return y, true
}
