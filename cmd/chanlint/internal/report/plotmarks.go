package report

import (
	"math"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// addBoundaries marks where each reach of a main stem begins and names
// it over its length (shortened with "…" when the name does not fit).
func (p *Plot) addBoundaries(pieces []piece, sc *scale) {
	for i, pc := range pieces {
		x1, x2 := sc.x(pc.offset), sc.x(pc.offset+pc.reach.Length)
		room := int((x2 - x1 - 8) / charW)
		p.Boundaries = append(p.Boundaries, Boundary{
			X: round1(x1), First: i == 0, LabelX: round1((x1 + x2) / 2),
			Label: ellipsis(pc.reach.Name, room), Title: "reach " + pc.reach.Name,
		})
	}
}

// addJumps marks every hydraulic jump: a stroke from the upstream to the
// sequent depth at the toe, a dashed line over its length, and a label
// with F₁ and the jump type. Labels of jumps closer than their own width
// alternate between two rows.
func (p *Plot) addJumps(pieces []piece, sc *scale, lu string) {
	fr := p.Frame
	lastJumpX := math.Inf(-1)
	jumpRow := 0
	for _, pc := range pieces {
		if pc.rr == nil {
			continue
		}
		for _, j := range pc.rr.Jumps {
			x := sc.x(pc.offset + j.Station)
			x2 := sc.x(pc.offset + j.End())
			inv := pc.reach.InvertAt(j.Station)
			if !numfmt.Finite(x, inv) {
				continue
			}
			y1, y2 := sc.y(inv+j.UpstreamDepth), sc.y(inv+j.DownstreamDepth)
			label := "jump F₁ " + num2(j.Froude) + ", " + string(j.Type)
			if x-lastJumpX < float64(len(label))*charW {
				jumpRow = (jumpRow + 1) % 2
			} else {
				jumpRow = 0
			}
			lastJumpX = x
			ly := math.Min(y2, y1) - 12 - float64(jumpRow)*14
			ly = math.Max(ly, fr.Y+12)
			anchor := "start"
			lx := x + 4
			if x+float64(len(label))*charW > fr.Right() {
				anchor, lx = "end", x-4
			}
			p.Jumps = append(p.Jumps, Mark{
				X: round1(x), X2: round1(clamp(x2, fr.X, fr.Right())), Y1: round1(y1), Y2: round1(y2),
				Label: label, LabelX: round1(lx), LabelY: round1(ly), Anchor: anchor,
				Title: "hydraulic jump in " + pc.reach.Name + " at station " + num(j.Station) + " " + lu +
					": y₁ " + num(j.UpstreamDepth) + " → y₂ " + num(j.DownstreamDepth) + " " + lu +
					", F₁ " + num2(j.Froude) + ", " + string(j.Type) + ", length " + num(j.Length) + " " + lu,
			})
			p.HasJmp = true
		}
	}
}

// addGates draws every sluice gate at the head of its reach: a bar from
// the top of the section (or twice the opening) down to the gate's lip.
func (p *Plot) addGates(pieces []piece, sc *scale, lu string) {
	fr := p.Frame
	for _, pc := range pieces {
		g := pc.reach.Gate
		if g == nil {
			continue
		}
		x := sc.x(pc.offset)
		inv := pc.reach.InvertUp
		top := inv + sectionHeight(pc.reach.Section)
		if top <= inv+g.Opening {
			top = inv + 2*g.Opening
		}
		p.Gates = append(p.Gates, Mark{
			X: round1(x + 2), Y1: round1(sc.y(top)), Y2: round1(sc.y(inv + g.Opening)),
			Label: "gate " + g.Name, LabelX: round1(x + 7), LabelY: round1(math.Max(sc.y(top)-4, fr.Y+11)), Anchor: "start",
			Title: "sluice gate " + g.Name + ", opening " + num(g.Opening) + " " + lu,
		})
	}
}

// addCulverts draws, for every culvert barrel on the plot, its headwater
// pool: a level line at the headwater from the inlet back over the reach
// above (as far as that reach's bed stays below it, at most a fifth of
// the frame), the inlet's headwall from the pool down to the invert, and
// a label with the headwater, HW/D and the governing control; and the
// road crest over the barrel when the culvert has a road. The barrel
// itself is drawn by the bed and the crown line (addLines).
func (p *Plot) addCulverts(pieces []piece, sc *scale, lu string, culverts map[*model.Reach]*solver.CulvertResult) {
	fr := p.Frame
	for i, pc := range pieces {
		cr := culverts[pc.reach]
		if cr == nil || !numfmt.Finite(cr.Headwater) || cr.OutletMethod == solver.OutletNoFlow {
			continue
		}
		x0, x1 := sc.x(pc.offset), sc.x(pc.offset+pc.reach.Length)
		if !numfmt.Finite(x0, x1) {
			continue
		}
		xa := math.Max(fr.X, x0-fr.W/5)
		if i > 0 {
			up := pieces[i-1]
			// Back along the reach above to where its bed rises to the pool.
			start := up.offset
			if d := up.reach.InvertUp - up.reach.InvertDown; up.reach.InvertUp > cr.Headwater && d > 0 {
				start += up.reach.Length * math.Min(1, (up.reach.InvertUp-cr.Headwater)/d)
			}
			xa = math.Max(xa, sc.x(start))
		}
		y := sc.y(cr.Headwater)
		label := "headwater " + num(cr.Headwater) + " " + lu + ", HW/D " + num2(cr.HWD) + ", " + string(cr.Control) + " control"
		// The label goes into the barrel, right of the inlet, where no jump
		// or gate label stands; left of it when the barrel is too short.
		anchor, lx := "start", x0+4
		if lx+float64(len([]rune(label)))*charW > fr.Right() {
			anchor, lx = "end", x0-4
		}
		p.Culverts = append(p.Culverts, Mark{
			X: round1(xa), X2: round1(x0), Y1: round1(y), Y2: round1(sc.y(pc.reach.InvertUp)),
			Label: label, LabelX: round1(lx), LabelY: round1(math.Max(y-5, fr.Y+11)), Anchor: anchor,
			Title: "culvert " + cr.Culvert.Name + ": headwater " + num(cr.Headwater) + " " + lu + " by " + cr.Method() +
				" (inlet control " + num(cr.InletHeadwater) + ", outlet control " + num(cr.OutletHeadwater) + " " + lu + ")",
		})
		if road := cr.Culvert.Road; road != nil && numfmt.Finite(road.Crest) {
			yr := sc.y(road.Crest)
			title := "road over culvert " + cr.Culvert.Name + ": crest " + num(road.Crest) + " " + lu
			if cr.RoadFlow > 0 {
				title += ", overtopped " + num(cr.RoadDepth) + " " + lu + " deep by " + num(cr.RoadFlow) + " " + lu + "³/s"
			}
			p.Roads = append(p.Roads, Mark{X: round1(x0), X2: round1(x1), Y1: round1(yr), Y2: round1(yr),
				Label: "road crest", LabelX: round1((x0 + x1) / 2), LabelY: round1(math.Max(yr-4, fr.Y+11)), Anchor: "middle", Title: title})
			p.HasRoad = true
		}
	}
}
