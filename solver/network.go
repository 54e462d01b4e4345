package solver

import (
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
)

// This file holds the boundary conditions of each reach: the outlet
// control, junctions, sluice gates and entrance depths.
//
// Junction rules (dendritic network):
//   - Subcritical: every reach ending at a node gets as its downstream
//     control the water level, velocity head and energy grade elevation H
//     at the start of the reach leaving the node, and ends free (critical
//     depth, when the level below is under its critical level) or drowned
//     (z + E(y) = H plus the node's local loss, on the subcritical branch
//     of its own section); see nodes.go. A free fall is a control, not a
//     numerical fallback, and passes the brink's energy to the reach below
//     (drops.go).
//   - Supercritical inflow: when at least one incoming reach arrives
//     supercritical, the outgoing reach starts on its supercritical branch
//     at the discharge-weighted energy grade elevation of all incoming
//     flows, H = Σ Qᵢ·Hᵢ / Σ Qᵢ (conservation of energy flux), less the
//     node's local loss, and its supercritical profile is then compared with its
//     subcritical one as for any upstream control. With more than one
//     incoming reach a NoteInfo records the rule. If H is below the
//     outgoing reach's critical energy, critical depth is taken, with a
//     NoteControl.
//   - A jump near a junction: each incoming reach's subcritical profile
//     starts from the junction's energy H as above, whatever the regime
//     of the inflow, and its supercritical profile is compared with it by
//     specific force in its own section, so where the junction's level
//     drowns the supercritical inflow the jump is located inside the
//     incoming reach, which then ends subcritical (or is subcritical
//     throughout if its subcritical profile drowns it from its start).
//     A reach arrives supercritical only where its own subcritical profile
//     cannot hold it: H is below its critical energy (no subcritical flow
//     at its end) or its supercritical flow has the greater force there.
//     If the outgoing reach's subcritical flow nevertheless has the
//     greater specific force at its start (in its own, often wider,
//     section), the jump can move neither upstream nor downstream: it is
//     held at the junction (station 0 of the outgoing reach) with a
//     NoteControl, its depths those of the two profiles there.
//   - A gate at station 0 of the outgoing reach sets the energy upstream
//     instead (see gateHead).

// depths computes critical and normal depth and the slope class of one
// section for discharge q on bed slope s0.
//
// Slope class (Chow 1959, ch. 9): horizontal where |S0| ≤ 1e-9; adverse
// where S0 < 0; critical where |yn − yc| ≤ 1 % of yc (the 1 % is this
// solver's choice: closer than that the two regimes cannot be told apart
// within the accuracy of a design flow); mild where yn > yc; steep where
// yn < yc. A closed conduit too small to carry q at normal flow has no
// normal depth and is classed mild: its uniform flow would be above the
// crown, which is above critical depth.
func (s *solver) depths(g *Geometry, q, s0 float64) (yc, yn float64, hasN bool, class SlopeClass) {
	key := depthKey{g, q, s0}
	if d, ok := s.depthCache[key]; ok {
		return d.yc, d.yn, d.hasN, d.class
	}
	s.spend(workPerSearch + int64(len(g.pts.grid)/16))
	yc, yn, hasN, class = computeDepths(g, q, s0)
	s.depthCache[key] = depthVal{yc, yn, hasN, class}
	return yc, yn, hasN, class
}

// depthKey and depthVal cache depths: reaches of one section, discharge
// and slope (a long uniform chain) share them.
type depthKey struct {
	g     *Geometry
	q, s0 float64
}

type depthVal struct {
	yc, yn float64
	hasN   bool
	class  SlopeClass
}

// computeDepths is depths without the cache.
func computeDepths(g *Geometry, q, s0 float64) (yc, yn float64, hasN bool, class SlopeClass) {
	if q <= 0 {
		return 0, 0, false, classOf(s0, 0, 0, false)
	}
	yc, _ = CriticalDepth(g, q)
	if !(yc > 0) || math.IsInf(yc, 0) {
		// No critical depth (a degenerate section, or a conduit that is
		// supercritical up to its crown): use the crown or a unit depth so
		// that the branches stay defined.
		yc = g.Height()
		if !(yc > 0) {
			yc = 1
		}
	}
	if math.Abs(s0) > slopeHorizontal && s0 > 0 {
		if v, err := NormalDepth(g, q, s0); err == nil && v > 0 && !math.IsInf(v, 0) {
			yn, hasN = v, true
		}
	}
	return yc, yn, hasN, classOf(s0, yn, yc, hasN)
}

// slopeHorizontal is the bed slope below which a reach counts as
// horizontal (inverts written to a few decimals differ by rounding).
const slopeHorizontal = 1e-9

// classOf applies the slope-class rule of depths.
func classOf(s0, yn, yc float64, hasN bool) SlopeClass {
	switch {
	case math.Abs(s0) <= slopeHorizontal:
		return Horizontal
	case s0 < 0:
		return Adverse
	case !hasN:
		return Mild
	case math.Abs(yn-yc) <= 0.01*yc:
		return CriticalSl
	case yn > yc:
		return Mild
	}
	return Steep
}

// downstreamBoundary is the depth at the downstream end of a reach that
// starts its subcritical profile; crit is true when that depth is critical.
// At a junction it is the node's outlet rule (see nodeOutlet).
func (s *solver) downstreamBoundary(w *reachWork, ev *model.Event) (y float64, crit bool) {
	last := &w.pieces[len(w.pieces)-1]
	z := w.f.invert(w.f.length)
	if d := w.r.Downstream; d != nil && d.Index >= 0 && d.Index < len(s.work) && s.work[d.Index].q > 0 {
		return s.nodeOutlet(w, &s.work[d.Index], last, z)
	}
	return s.outletBoundary(w, ev, last, z)
}

// outletBoundary applies the event's outlet control at the downstream end
// of the outlet reach:
//   - depth: the depth given;
//   - elevation: the elevation minus the invert; at or below the invert the
//     outlet is a free outfall and critical depth is taken (NoteControl);
//   - normal: normal depth of the last section; where none exists
//     (horizontal or adverse bed, or a conduit that cannot carry the flow)
//     critical depth is taken (NoteControl);
//   - critical: critical depth.
//
// A depth below critical cannot start a subcritical profile: critical depth
// is taken instead, and finish records a NoteControl if the flow arrives
// subcritical there.
func (s *solver) outletBoundary(w *reachWork, ev *model.Event, last *piece, z float64) (float64, bool) {
	out := ev.Outlet
	w.outletKind = out.Kind
	L := w.f.length
	y := last.yc
	tw := s.vary.Tailwater // a sensitivity run's offset; 0 as written
	if !numfmt.Finite(tw) {
		tw = 0
	}
	switch out.Kind {
	case model.OutletDepth:
		y = out.Value + tw
	case model.OutletElevation:
		y = out.Value + tw - z
		if !(y > 0) {
			w.outletNotes = append(w.outletNotes, noteControl(L,
				"outlet water level %s is at or below the invert %s: the outlet is a free outfall and critical depth %s is taken",
				num(out.Value+tw), num(z), num(last.yc)))
			y = last.yc
		}
	case model.OutletNormal:
		if last.hasN {
			y = last.yn + tw
		} else {
			why := "the bed is horizontal or adverse"
			if w.f.s0 > slopeHorizontal {
				why = "the section cannot carry the discharge in uniform flow"
			}
			w.outletNotes = append(w.outletNotes, noteControl(L,
				"outlet condition \"normal\" has no normal depth here (%s): critical depth %s is taken", why, num(last.yc)))
		}
	case model.OutletCritical:
	default:
		w.outletNotes = append(w.outletNotes, noteControl(L,
			"event has no outlet control: critical depth %s is taken at the outlet", num(last.yc)))
	}
	if !(y > 0) || math.IsInf(y, 0) {
		y = last.yc
	}
	w.outletReq = y
	y = s.outfallLoss(w, last, z, y)
	if y <= last.yc {
		return last.yc, true
	}
	return y, false
}

// upstreamControl is the supercritical control at station 0 of a reach:
// a controlling gate, else an entrance depth below critical depth, else
// supercritical flow arriving from the reaches upstream. Without one, the
// walk of combine starts subcritical and switches to a supercritical
// profile only where the subcritical one reached critical depth (the head
// of a steep reach).
func (s *solver) upstreamControl(w *reachWork) superControl {
	p0 := &w.pieces[0]
	if w.gateFree {
		return superControl{ok: true, y: w.gateY, kind: "gate"}
	}
	if ye := s.entrance[w.r.Index]; ye > 0 {
		if ye < p0.yc {
			return superControl{ok: true, y: ye, kind: "entrance"}
		}
		sub := s.subBuf[w.subLo:w.subHi]
		w.res.Notes = append(w.res.Notes, noteControl(0,
			"entrance depth %s is not below critical depth %s: subcritical flow is set from downstream, and the computed depth at station 0 is %s",
			num(ye), num(p0.yc), num(sub[0].y)))
	}
	return s.arrival(w)
}

// drowned records an upstream control that the subcritical flow below it
// overpowers (its specific force is greater at station 0).
func (s *solver) drowned(w *reachWork, c superControl, ySub float64) {
	switch c.kind {
	case "gate":
		w.res.Notes = append(w.res.Notes, noteControl(0,
			"gate %q is submerged: the subcritical flow below it (depth %s) has a greater specific force than the jet at the vena contracta (depth %s), so the vena contracta depth does not apply and the flow is computed subcritical",
			w.r.Gate.Name, num(ySub), num(c.y)))
	case "entrance":
		w.res.Notes = append(w.res.Notes, noteControl(0,
			"entrance depth %s is drowned: the subcritical flow from downstream (depth %s at station 0) has a greater specific force, so the flow is computed subcritical",
			num(c.y), num(ySub)))
	case "fall":
		w.res.Notes = append(w.res.Notes, noteInfo(0,
			"the free fall from the reach above into node %q is drowned in this reach: its subcritical flow (depth %s) has a greater specific force than the jet (depth %s), so the flow is computed subcritical from its start",
			w.r.From, num(ySub), num(c.y)))
	case "drop":
		d := &w.res.Drops[len(w.res.Drops)-1]
		d.Drowned = true
		w.res.Notes = append(w.res.Notes, noteInfo(0,
			"the jump below the drop from reach %q is drowned against the drop face: the tailwater (depth %s at the toe of the nappe) is above the sequent depth %s of the jet (depth %s), so the nappe is submerged and the flow below is computed subcritical",
			d.From, num(ySub), num(d.SequentDepth), num(c.y)))
	default:
		p0 := &w.pieces[0]
		w.final = append(w.final, pt{x: 0, y: c.y, piece: 0, super: true})
		s.addJump(w, p0, 0, c.y, ySub, "at the junction")
		w.res.Notes = append(w.res.Notes, noteControl(0,
			"supercritical flow arriving at node %q (depth %s here) meets subcritical flow (depth %s) with a greater specific force, yet in the incoming channel the supercritical flow holds against the junction's level to its end: the jump is held at the junction, station 0, and its depths are not a sequent pair",
			w.r.From, num(c.y), num(ySub)))
	}
}
