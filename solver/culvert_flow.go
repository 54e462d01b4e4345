package solver

import (
	"fmt"
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
)

// culvertHead is pass 1 for a culvert barrel: it finds the tailwater at the
// outlet, splits the event's discharge between barrel and road, computes
// the barrel's subcritical profile for the barrel's share, and sets the
// energy the reach above ends at to the culvert's headwater.
//
// Method (FHWA HDS-5, 3rd ed. 2012, from memory; equations in culvert.go):
//   - Tailwater: the water level at the start of the reach below (its
//     subcritical profile), or the event's outlet control when the barrel
//     is the outlet reach.
//   - Exit: the exit loss of 1.0·(V²/2g − Vd²/2g) between barrel and
//     receiving channel leaves the water surface level across the outlet,
//     so a partly full barrel ends at the tailwater depth, or at critical
//     depth when the tailwater is lower (a free outfall).
//   - Inlet control: the HDS-5 unsubmerged (form 1 or 2), transition and
//     submerged equations for one barrel with its share Q/N of the flow.
//   - Outlet control, partly full (no point of the barrel's profile
//     reaches the crown and the tailwater is below it): the energy of the
//     gradually-varied-flow profile at the inlet plus the entrance loss
//     ke·V²/2g, V the velocity there.
//   - Outlet control, full (the profile reaches the crown, or the
//     tailwater submerges the outlet): HW = ho + (1 + ke + kf)·V²/2g
//     above the outlet invert, with ho = max(TW, (dc + D)/2).
//   - The headwater is the larger of the two; the reach above ends where
//     its energy grade equals it (the pool's velocity head is part of the
//     headwater, which HDS-5 takes as a still pool).
//   - Road: with a road, flow the barrel cannot pass below the crest goes
//     over it as a broad-crested weir, split so that barrel and road see
//     one headwater (SplitFlow). The road flow rejoins below the barrel.
func (s *solver) culvertHead(w *reachWork, ev *model.Event) {
	c := w.r.Culvert
	lay := &s.layouts[w.r.Index]
	cr := &CulvertResult{Culvert: c, Reach: w.res}
	w.culvert = cr
	w.subLo = len(s.subBuf)
	total := w.q
	if len(w.pieces) == 0 {
		s.subProfile(w, 0, true)
		w.imposePool(w.r.InvertUp)
		cr.Headwater = w.r.InvertUp
		return
	}
	g := w.pieces[0].geo
	cr.Rise = g.Height()
	tw := s.tailwater(w, ev)
	cr.Tailwater = tw
	headwater := func(qb float64) float64 {
		w.q = qb
		w.res.Discharge = qb
		s.prepare(w, lay)
		last := &w.pieces[len(w.pieces)-1]
		y, crit := tw-w.f.invert(w.f.length), false
		if !(y > last.yc) {
			y, crit = last.yc, true
		}
		s.subProfile(w, y, crit)
		s.culvertControls(w, cr, tw)
		return cr.Headwater
	}
	split := Split{Barrel: total}
	var weir float64
	if road := c.Road; road != nil && road.Length > 0 {
		weir = road.Coefficient
		if !(weir > 0) {
			weir = RoadWeirCoefficient(s.units)
		}
		split = SplitFlow(total, headwater, weir, road.Length, road.Crest, tw)
	}
	headwater(split.Barrel) // leave the work in the state of the final split
	cr.BarrelFlow, cr.RoadFlow = split.Barrel, total-split.Barrel
	if road := c.Road; cr.RoadFlow > 0 {
		// The outlet-control headwater jumps where the barrel's outlet
		// method changes (partly full profile below, HDS-5 full-barrel
		// equation once the profile reaches the crown): there the split
		// settles on the jump and no barrel flow balances the road
		// exactly. The pool then stands at the road's level, between the
		// two values the barrel gives, with the barrel at its transition.
		if hw := roadHeadwater(weir, road.Length, road.Crest, tw, cr.RoadFlow); math.Abs(hw-cr.Headwater) > splitTolerance && hw > cr.InletHeadwater {
			cr.Transition = cr.Headwater - hw
			cr.OutletHeadwater, cr.Headwater, cr.Control = hw, hw, OutletControlled
			cr.HeadwaterDepth = hw - w.f.invert(0)
			if cr.Rise > 0 {
				cr.HWD = cr.HeadwaterDepth / cr.Rise
			}
		}
	}
	if c.Road != nil && cr.Headwater > c.Road.Crest {
		cr.RoadDepth = cr.Headwater - c.Road.Crest
	}
	w.imposePool(cr.Headwater)
	s.culvertNotes(w, cr, weir)
}

// splitTolerance is the headwater difference between barrel and road, in
// the model's length unit, above which a flow split has not balanced (the
// split itself closes to about 1e-12 of the flow where it can).
const splitTolerance = 1e-4

// tailwater is the water level at the outlet of a barrel: the start of the
// subcritical profile of the reach below, or the outlet control.
func (s *solver) tailwater(w *reachWork, ev *model.Event) float64 {
	z := w.f.invert(w.f.length)
	if d := w.r.Downstream; d != nil && d.Index >= 0 && d.Index < len(s.work) {
		dw := &s.work[d.Index]
		if dw.q > 0 && dw.subHi > dw.subLo {
			return dw.f.invert(0) + s.subBuf[dw.subLo].y
		}
		return z
	}
	last := &w.pieces[len(w.pieces)-1]
	s.outletBoundary(w, ev, last, z)
	return z + w.outletReq
}

// culvertControls fills the inlet- and outlet-control headwaters of cr for
// the barrel discharge w.q and the subcritical profile just computed.
func (s *solver) culvertControls(w *reachWork, cr *CulvertResult, tw float64) {
	c := w.r.Culvert
	zIn, zOut := w.f.invert(0), w.f.invert(w.f.length)
	q := w.q
	if !(q > 0) || w.subHi <= w.subLo {
		*cr = CulvertResult{Culvert: cr.Culvert, Reach: cr.Reach, Rise: cr.Rise, Tailwater: tw,
			Headwater: zIn, InletHeadwater: zIn, OutletHeadwater: zIn, Control: InletControlled,
			InletRegime: Unsubmerged, OutletMethod: OutletNoFlow}
		return
	}
	g := w.pieces[0].geo
	rise := cr.Rise
	n := float64(g.Barrels())
	full := g.Props(rise)
	a1 := full.Area / n
	hc := func(q1 float64) float64 {
		yc, _ := CriticalDepth(g, q1*n)
		return SpecificEnergy(g, q1*n, yc)
	}
	ic := InletHeadwater(c.Inlet.Coefficients, s.units, q/n, a1, rise, w.f.s0, hc)
	cr.InletHeadwater = zIn + ic.HW
	cr.InletRegime, cr.Intensity = ic.Regime, ic.Intensity

	ke := c.Inlet.EntranceLoss
	sub := s.subBuf[w.subLo:w.subHi]
	twDepth := tw - zOut
	isFull := twDepth >= rise
	for _, p := range sub {
		if p.y >= rise {
			isFull = true
			break
		}
	}
	if isFull {
		last := &w.pieces[len(w.pieces)-1]
		ho := LowTailwater(twDepth, last.ycF, rise)
		rough := g.Section().Roughness[1]
		cr.OutletHeadwater = zOut + ho + FullBarrelLoss(ke, rough, g.K(), g.G(), w.f.length, full.HydraulicRadius, q/full.Area)
		cr.OutletMethod = OutletFullBarrel
	} else {
		p0 := &w.pieces[0]
		y0 := sub[0].y
		v0 := g.Props(y0).Velocity(q)
		cr.OutletHeadwater = zIn + w.f.eval(p0, y0).e + ke*v0*v0/(2*g.G())
		cr.OutletMethod = OutletPartlyFull
	}
	cr.Control = InletControlled
	cr.Headwater = cr.InletHeadwater
	if cr.OutletHeadwater > cr.InletHeadwater {
		cr.Control, cr.Headwater = OutletControlled, cr.OutletHeadwater
	}
	cr.HeadwaterDepth = cr.Headwater - zIn
	if rise > 0 {
		cr.HWD = cr.HeadwaterDepth / rise
	}
}

// culvertNotes records on the result which methods applied, with their
// range of validity (CulvertResult.Notes).
func (s *solver) culvertNotes(w *reachWork, cr *CulvertResult, weir float64) {
	c := cr.Culvert
	if cr.OutletMethod == OutletNoFlow {
		return
	}
	inlet := "explicit coefficients"
	if c.Inlet.Type != "" {
		inlet = "inlet \"" + c.Inlet.Type + "\" of the tool's table (values from memory of HDS-5 Table A.1 and C.2)"
	}
	form := "1"
	if c.Inlet.Form == 2 {
		form = "2"
	}
	barrels := ""
	if n := w.pieces[0].geo.Barrels(); n > 1 {
		barrels = ", each of " + num(float64(n)) + " identical barrels carrying 1/" + num(float64(n)) + " of the flow"
	}
	outlet := "partly full: the energy of the barrel's gradually-varied-flow profile at the inlet plus the entrance loss ke·V²/2g"
	if cr.OutletMethod == OutletFullBarrel {
		outlet = "barrel full: HW = ho + (1 + ke + kf)·V²/2g above the outlet invert with ho the tailwater above the crown"
		if cr.Tailwater-w.r.InvertDown < cr.Rise {
			outlet = "barrel full: HW = ho + (1 + ke + kf)·V²/2g above the outlet invert with ho = max(TW, (dc + D)/2), the HDS-5 approximation for a tailwater below the crown (a backwater profile in the barrel would be more exact where the headwater is low)"
		}
	}
	validity := "inlet control: the HDS-5 regression of its nomographs, unsubmerged up to Ku·Q/(A·D^0.5) = 3.5, submerged from 4.0, here " + num(cr.Intensity) +
		" (" + string(cr.InletRegime) + "); outlet control: one-dimensional energy equation through the barrel, subcritical profile or full flow; equations and named coefficients from memory of HDS-5 (2012)"
	w.res.Structures = append(w.res.Structures, Structure{
		Kind: StructCulvert, Name: c.Name, Station: 0, State: string(cr.Control) + " control",
		Method:        cr.Method() + ": headwater " + num(cr.Headwater) + " (inlet control " + num(cr.InletHeadwater) + ", outlet control " + num(cr.OutletHeadwater) + "); outlet control " + outlet,
		Validity:      validity,
		Coefficient:   c.Inlet.EntranceLoss,
		HeadLoss:      cr.Headwater - cr.Tailwater,
		UpstreamDepth: cr.HeadwaterDepth, DownstreamDepth: cr.Tailwater - w.r.InvertDown,
	})
	cr.Notes = append(cr.Notes, fmt.Sprintf(
		"culvert %q: headwater %s (HW/D %s) by %s control (FHWA HDS-5, 2012). Inlet control %s with %s, form %s, %s: Ku·Q/(A·D^0.5) = %s (unsubmerged up to 3.5, submerged from 4.0, interpolated between)%s. Outlet control %s, tailwater %s, ke = %s: %s",
		c.Name, num(cr.Headwater), num(cr.HWD), cr.Control, num(cr.InletHeadwater), inlet, form, cr.InletRegime,
		num(cr.Intensity), barrels, num(cr.OutletHeadwater), num(cr.Tailwater), num(c.Inlet.EntranceLoss), outlet))
	if cr.Transition != 0 {
		cr.Notes = append(cr.Notes, fmt.Sprintf(
			"culvert %q is at its transition to full flow: at %s through the barrel the partly full profile and the HDS-5 full-barrel equation give outlet-control headwaters %s apart, so no flow split balances barrel and road exactly; the headwater %s is the road weir's, between the two (an approximation of the method, not of the culvert)",
			c.Name, num(cr.BarrelFlow), num(math.Abs(cr.Transition)), num(cr.Headwater)))
	}
	if cr.RoadFlow > 0 {
		hr := cr.RoadDepth
		kt := 1.0
		if ht := cr.Tailwater - c.Road.Crest; ht > 0 && hr > 0 {
			kt = RoadSubmergenceFactor(ht / hr)
		}
		msg := "the road over culvert %q overtops: %s of the %s flow passes over the crest at %s, %s deep, as a broad-crested weir Q = kt·Cr·L·Hr^1.5 (Cr = %s, L = %s, kt = %s for the tailwater), and the barrel carries %s at the same headwater"
		args := []any{c.Name, num(cr.RoadFlow), num(cr.BarrelFlow + cr.RoadFlow), num(c.Road.Crest), num(hr), num(weir), num(c.Road.Length), num(kt), num(cr.BarrelFlow)}
		if c.Road.Width > 0 && hr/c.Road.Width > 0.15 {
			msg += "; the head is more than 0.15 of the road width, where the published coefficient for deep overtopping applies"
		} else {
			msg += "; the head is at most 0.15 of the road width, where the published coefficient runs slightly below Cr, so the road flow is slightly overstated"
		}
		cr.Notes = append(cr.Notes, fmt.Sprintf(msg, args...))
	}
}

// finishCulvert reads the outlet depth and velocity of a culvert from the
// barrel's final profile (pass 2), g the barrel's geometry, and keeps every
// number finite. A barrel full at its outlet reports the rise as its depth
// and the full-barrel velocity Q/A (HDS-5 2012, outlet velocity, from
// memory: the flow area at the outlet is at most that of the full barrel).
func finishCulvert(cr *CulvertResult, g *Geometry) {
	if rr := cr.Reach; rr != nil && len(rr.Points) > 0 && g != nil {
		p := rr.Points[len(rr.Points)-1]
		cr.OutletDepth, cr.OutletVelocity = p.Depth, p.Velocity
		if p.Depth >= cr.Rise {
			cr.OutletDepth = cr.Rise
			cr.OutletVelocity = g.Props(cr.Rise).Velocity(rr.Discharge)
		}
	}
	for _, v := range []*float64{&cr.Rise, &cr.Headwater, &cr.HeadwaterDepth, &cr.HWD, &cr.InletHeadwater, &cr.OutletHeadwater,
		&cr.Intensity, &cr.Tailwater, &cr.Transition, &cr.BarrelFlow, &cr.RoadFlow, &cr.RoadDepth, &cr.OutletDepth, &cr.OutletVelocity} {
		if !numfmt.Finite(*v) {
			*v = 0
		}
	}
}
