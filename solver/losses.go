package solver

import (
	"math"
	"slices"

	"github.com/chanlint/chanlint/model"
)

// Local (transition) losses at nodes and at section changes inside a
// reach. Across such a place the energy balance is
//
//	H_up = H_down + h_L,   h_L = k·|α_d·V_d²/2g − α_u·V_u²/2g|
//
// with k the contraction coefficient where the velocity head rises in the
// direction of flow and the expansion coefficient where it falls (Chow,
// Open-Channel Hydraulics, 1959, §17-2 and Table 17-1 after Hinds 1928).
// Without a loss block (and without a model-wide default) k = 0: the
// balance without loss the solver has always used.

// localLoss is the pair of coefficients in force at one place.
type localLoss struct {
	name                   string
	contraction, expansion float64
}

// lossOf is the localLoss of a model loss block (the zero value for nil).
func lossOf(l *model.Loss) localLoss {
	if l == nil {
		return localLoss{}
	}
	return localLoss{name: l.Name, contraction: l.Contraction, expansion: l.Expansion}
}

// none reports whether no loss is modelled here.
func (l localLoss) none() bool { return l.contraction == 0 && l.expansion == 0 }

// coefficient is k for a velocity head that rises downstream (rising) or
// falls.
func (l localLoss) coefficient(rising bool) float64 {
	if rising {
		return l.contraction
	}
	return l.expansion
}

// headLoss is k·|Δ(αV²/2g)| between velocity heads hvUp (upstream side)
// and hvDown, with the coefficient chosen by the sign of the change.
func (l localLoss) headLoss(hvUp, hvDown float64) (h, k float64) {
	k = l.coefficient(hvDown > hvUp)
	return k * math.Abs(hvDown-hvUp), k
}

// velocityHead is α·V²/2g at depth y in piece p.
func (f *flowCtx) velocityHead(p *piece, y float64) float64 {
	return f.eval(p, y).e - y
}

// lossDepth finds the depth y in piece p at bed elevation z on one branch
// (super: supercritical) that balances energy with a known section across
// a local loss. The known section has energy grade elevation hK and
// velocity head hvK; the unknown one lies upstream of it (upstream true:
// H(y) = hK + h_L) or downstream (H(y) = hK − h_L). It returns the depth,
// the head loss and the coefficient used; ok is false when the branch has
// no solution (the energy available is below what the branch needs), and
// then y is the control depth of the piece.
//
// With |Δhv| split by the sign of hv(y) − hvK the balance reads
// y + c·hv(y) = T with c = 1 ± k, a specific-energy curve scaled in its
// velocity head: each sign is solved on its branch (splitSolve) and the
// root kept whose sign agrees.
func (f *flowCtx) lossDepth(p *piece, z, hK, hvK float64, l localLoss, upstream, super bool) (y, hl, k float64, ok bool) {
	if l.none() {
		y, ok = f.solveBranch(p, z, 0, hK, super, 0, 0)
		return y, 0, 0, ok
	}
	// s is +1 when the unknown section is downstream (its energy is the
	// known one less the loss), −1 when it is upstream.
	s := 1.0
	if upstream {
		s = -1
	}
	choked := true
	for _, d := range []float64{1, -1} { // d: the sign of hv(y) − hvK
		// The velocity head rises downstream when the downstream side has
		// the larger one.
		rising := (d > 0) == !upstream
		kk := l.coefficient(rising)
		c := 1 + s*kk*d
		T := hK - z + s*kk*d*hvK
		yy, found := f.scaledRoot(p, c, T, super)
		if !found {
			continue
		}
		choked = false
		hv := f.velocityHead(p, yy)
		if (hv-hvK)*d >= -1e-9*(hv+hvK+1e-12) {
			h, kUsed := l.headLoss(pick(upstream, hv, hvK), pick(upstream, hvK, hv))
			return yy, h, kUsed, true
		}
	}
	if choked {
		return p.yc, 0, 0, false
	}
	// Neither sign agrees within rounding: the two velocity heads are
	// equal at the root, where the loss vanishes.
	y, ok = f.solveBranch(p, z, 0, hK, super, 0, 0)
	return y, 0, 0, ok
}

// pick returns a when cond, else b.
func pick(cond bool, a, b float64) float64 {
	if cond {
		return a
	}
	return b
}

// scaledRoot solves φ(y) = y + c·hv(y) = T in piece p on one branch.
// For c > 0, φ has one minimum (at the critical depth itself when c = 1)
// that splits the branches; it is found by golden-section search. For
// c ≤ 0 (an expansion coefficient of 1 or more) φ rises with y throughout
// and its single root is taken if it lies on the branch asked for (the
// branches then split at the critical depth of the piece).
func (f *flowCtx) scaledRoot(p *piece, c, T float64, super bool) (float64, bool) {
	if c == 1 {
		return f.solveBranch(p, 0, 0, T, super, 0, 0)
	}
	phi := func(y float64) float64 { return y + c*f.velocityHead(p, y) - T }
	if c <= 0 {
		a, b := p.yc, p.yc
		if phi(a) > 0 {
			for i := 0; i < branchExpand && phi(a) > 0; i++ {
				a /= 2
				if a < minDepth {
					return p.yc, false
				}
			}
		} else {
			for i := 0; i < branchExpand && !(phi(b) > 0); i++ {
				b *= 2
				if b > maxDepth {
					return p.yc, false
				}
			}
		}
		y, err := Brent(phi, a, b, f.tol)
		y, ok := f.accept(y, err, p.yc)
		if !ok || (y > p.yc) == super && y != p.yc {
			return p.yc, false
		}
		return y, true
	}
	ym := goldenMin(phi, p.yc*math.Cbrt(c)/4, p.yc*math.Cbrt(c)*4, f.tol)
	if phi(ym) > 0 {
		return ym, false
	}
	a, b := ym, ym
	if super {
		a = ym / 2
		for i := 0; i < branchExpand && !(phi(a) > 0); i++ {
			a /= 2
			if a < minDepth {
				return ym, false
			}
		}
	} else {
		b = math.Max(T, ym) * 1.01
		for i := 0; i < branchExpand && !(phi(b) > 0); i++ {
			b *= 2
			if b > maxDepth {
				return ym, false
			}
		}
	}
	y, err := Brent(phi, a, b, f.tol)
	return f.accept(y, err, ym)
}

// goldenMin is the minimum of a unimodal function on [a, b] by
// golden-section search, to tol (at most 200 iterations).
func goldenMin(fn func(float64) float64, a, b, tol float64) float64 {
	const r = 0.6180339887498949 // (√5 − 1)/2
	x1, x2 := b-r*(b-a), a+r*(b-a)
	f1, f2 := fn(x1), fn(x2)
	for i := 0; i < 200 && b-a > tol; i++ {
		if f1 <= f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - r*(b-a)
			f1 = fn(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + r*(b-a)
			f2 = fn(x2)
		}
	}
	return (a + b) / 2
}

// sectionLoss is the loss in force at a section change at station x of
// the reach.
func (s *solver) sectionLoss(w *reachWork, x float64) localLoss {
	return lossOf(s.m.SectionLoss(w.r, x))
}

// transitions records, from the final profile, every section change of
// the reach where a local loss applies: two points at one station in two
// pieces. The head loss is the difference of their energies.
func (s *solver) transitions(w *reachWork) {
	for i := 1; i < len(w.final); i++ {
		a, b := w.final[i-1], w.final[i]
		if a.x != b.x || a.piece == b.piece {
			continue
		}
		l := s.sectionLoss(w, a.x)
		borda := !a.super && !b.super && a.y == b.y && slices.Contains(w.borda, a.x)
		if l.none() && !borda {
			continue
		}
		pa, pb := &w.pieces[a.piece], &w.pieces[b.piece]
		ea, eb := w.f.eval(pa, a.y), w.f.eval(pb, b.y)
		hva, hvb := ea.e-a.y, eb.e-b.y
		_, k := l.headLoss(hva, hvb)
		if borda {
			w.res.Structures = append(w.res.Structures, Structure{
				Kind: StructTransition, Name: l.name, Station: a.x, State: StateExpansion,
				Method:      "drowned change of section: the energy balance has no subcritical solution upstream while the water below stands above the upstream section's critical level, so the water level carries across and the upstream velocity head is lost in the expansion (Borda–Carnot, k = 1)",
				Validity:    "an abrupt expansion in subcritical flow; write a loss block there to use a published coefficient instead",
				Coefficient: 1, HeadLoss: ea.e - eb.e, UpstreamDepth: a.y, DownstreamDepth: b.y,
			})
			w.res.Notes = append(w.res.Notes, noteInfo(a.x,
				"the change of section at station %s is drowned: the water level %s carries across it and the velocity head upstream is lost in the expansion (k = 1), as the energy balance has no subcritical solution",
				num(a.x), num(w.f.invert(a.x)+a.y)))
			continue
		}
		state := StateExpansion
		if hvb > hva {
			state = StateContraction
		}
		regime := "subcritical"
		if b.super {
			regime = "supercritical"
		}
		w.res.Structures = append(w.res.Structures, Structure{
			Kind: StructTransition, Name: l.name, Station: a.x, State: state,
			Method:      "local loss at a change of section, h = k·|Δ(αV²/2g)| with the " + state + " coefficient k = " + num(k) + ", " + regime + " flow (Chow 1959, §17-2; Hinds 1928)",
			Validity:    "a transition between two sections at one station, without friction over its length; the coefficient is the model's, to be chosen from a published table by the type of transition",
			Coefficient: k, HeadLoss: ea.e - eb.e, UpstreamDepth: a.y, DownstreamDepth: b.y,
		})
	}
}
