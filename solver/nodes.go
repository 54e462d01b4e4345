package solver

import (
	"math"

	"github.com/chanlint/chanlint/model"
)

// Outlets of reaches into nodes: free or drowned.
//
// A reach ending at a junction (or at the head of the reach below) sees
// the water level WSE_d, energy grade elevation H_d and velocity head hv_d
// at the start of the reach leaving the node (upstream of its gate when a
// gate controls there). With z the reach's end invert, yc its critical
// depth and E_c the specific energy there:
//   - Free: WSE_d ≤ z + yc and H_d ≤ z + E_c. The water below stands under
//     the critical level of the reach: the reach ends at critical depth, a
//     free fall (or a free overfall where the invert drops) into the node,
//     and the reach below receives the flow from the brink (see drops.go).
//   - Drowned otherwise: the reach ends where its energy equals the energy
//     below plus the local loss of the node, H = H_d + k·|Δ(αV²/2g)| (a
//     loss block at the node, or the model-wide default; without either,
//     k = 0 and the balance is without loss).
//   - Drowned, and the balance has no subcritical solution (the level
//     below stands above the critical level while its energy is below the
//     critical energy of the reach, as at a narrow conduit discharging into
//     a wide pool with no loss written): the outlet cannot pass critical
//     depth under that level, so the reach ends at the level below (its
//     pressure is the tailwater's at the exit), and its velocity head is
//     lost in the expansion (Borda–Carnot, the sudden-expansion loss of
//     k = 1; Chow 1959, §17-2). A structure record names the rule.

// nodeOutlet is the downstream boundary of reach w at the node where the
// reach dw starts.
func (s *solver) nodeOutlet(w *reachWork, dw *reachWork, last *piece, z float64) (float64, bool) {
	hK, hvK, wseK := dw.junctionH, dw.junctionHV, dw.junctionWSE
	loss := lossOf(s.m.NodeLoss(w.r))
	L := w.f.length
	critLevel, critEnergy := z+last.yc, z+last.ec
	st := Structure{Kind: StructOutlet, Name: w.r.To, Station: L, DownstreamDepth: wseK - dw.f.invert(0)}
	if dw.gateActs {
		st.DownstreamDepth = dw.res.GateUpstreamDepth
	}
	if wseK <= critLevel && hK <= critEnergy {
		w.freeFall = true
		st.State = StateFree
		st.UpstreamDepth = last.yc
		st.Method = "free fall: the water level below (" + num(wseK) + ") is not above the critical level of this reach (" + num(critLevel) + "), so the reach ends at critical depth " + num(last.yc) + " at its end"
		st.Validity = "critical depth is taken at the end of the reach; at a free overfall the brink depth itself is about 0.715 of it (Rouse, from memory), and critical depth stands a few critical depths upstream of the brink"
		w.outletStruct = st
		return last.yc, true
	}
	var y, hl, k float64
	var ok bool
	if loss.none() {
		guess := 0.0
		if dw.subHi > dw.subLo && !dw.gateActs {
			guess = s.subBuf[dw.subLo].y // exact when the section and invert carry on
		}
		y, ok = w.f.solveBranch(last, z, 0, hK, false, guess, 0.05*guess)
	} else {
		y, hl, k, ok = w.f.lossDepth(last, z, hK, hvK, loss, true, false)
	}
	st.State = StateDrowned
	switch {
	case ok:
		if loss.none() {
			st.Method = "energy balance without loss with the reach below (no loss block at the node, no model-wide default)"
		} else {
			st.Method = "energy balance with the local loss " + quote(loss.name) + ": h = k·|Δ(αV²/2g)| with k = " + num(k)
		}
		st.Validity = "subcritical flow on both sides of the node"
	case wseK > critLevel:
		y = wseK - z
		hl = z + w.f.eval(last, y).e - hK
		k = 1
		st.Method = "drowned outlet: the energy balance has no subcritical solution under the level below (" + num(wseK) + "), so the reach ends at that level and its velocity head is lost in the expansion (Borda–Carnot, k = 1)"
		st.Validity = "a sudden expansion into slower water; write a loss block at the node to use a published coefficient instead"
		w.res.Notes = append(w.res.Notes, noteInfo(L,
			"outlet into node %q is drowned: the water level below (%s) stands above the critical level of this reach (%s) while the energy below (%s) is less than this reach's critical energy (%s); the reach ends at the level below, depth %s, and its velocity head is lost in the expansion (k = 1)",
			w.r.To, num(wseK), num(critLevel), num(hK), num(critEnergy), num(y)))
	default:
		// The energy balance with the node's loss chokes the reach.
		w.freeFall = true
		st.State = StateFree
		st.UpstreamDepth = last.yc
		st.Method = "choked: with the local loss of the node the energy below cannot be reached on the subcritical branch, so the reach ends at critical depth"
		w.res.Notes = append(w.res.Notes, noteControl(L,
			"node %q cannot balance: energy below %s with loss %q is less than subcritical flow here needs; critical depth %s is taken",
			w.r.To, num(hK), loss.name, num(last.yc)))
		st.Validity = "critical depth at the end of the reach"
		w.outletStruct = st
		return last.yc, true
	}
	st.UpstreamDepth, st.HeadLoss, st.Coefficient = y, hl, k
	if !loss.none() || k != 0 || math.Abs(z-dw.f.invert(0)) > 1e-9*math.Max(1, math.Abs(z)) {
		w.outletStruct = st
	}
	return y, false
}

// outfallLoss applies a loss block written at the outlet node: the
// event's outlet level is then that of still receiving water, and the
// outlet reach ends where its energy equals that level plus the exit loss
// k·αV²/2g (with k = 1, exactly at the receiving level, as FHWA HDS-5
// takes a conduit outlet). A level at or below the critical level of the
// reach is a free outfall (critical depth, as without a loss).
func (s *solver) outfallLoss(w *reachWork, last *piece, z, y float64) float64 {
	l := w.r.EndLoss
	if l == nil || w.outletKind != model.OutletDepth && w.outletKind != model.OutletElevation {
		return y
	}
	L := w.f.length
	st := Structure{Kind: StructOutlet, Name: w.r.To, Station: L, DownstreamDepth: y}
	if y <= last.yc {
		st.State, st.UpstreamDepth = StateFree, last.yc
		st.Method = "free outfall: the receiving water level is not above the critical level of the reach, so it ends at critical depth"
		st.Validity = "critical depth is taken at the end of the reach (the brink depth of a free overfall is about 0.715 of it, Rouse, from memory)"
		w.outletStruct = st
		return y
	}
	loss := lossOf(l)
	yy, hl, k, ok := w.f.lossDepth(last, z, z+y, 0, loss, true, false)
	st.State = StateDrowned
	if !ok {
		yy, k = y, 1
		hl = w.f.velocityHead(last, y)
		st.Method = "drowned outlet at the receiving level (Borda–Carnot, k = 1): the exit loss of " + quote(loss.name) + " has no subcritical solution"
	} else {
		st.Method = "exit into still receiving water: energy at the end of the reach = receiving level + k·αV²/2g with k = " + num(k) + " (" + quote(loss.name) + ")"
	}
	st.Validity = "the receiving water taken as still (no velocity head); FHWA HDS-5 takes k = 1 for a conduit outlet (from memory)"
	st.UpstreamDepth, st.HeadLoss, st.Coefficient = yy, hl, k
	w.outletStruct = st
	return yy
}

// quote is a name in double quotes for a structure's text.
func quote(name string) string { return `"` + name + `"` }
