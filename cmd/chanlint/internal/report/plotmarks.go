package report

import "math"

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
			if !isFinite(x) || !isFinite(inv) {
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
