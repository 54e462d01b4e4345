package report

import (
	"math"
	"strconv"
)

// band is a vertical zone of the frame from one distance to another,
// at least 3 units wide so that a span of one point stays visible.
func (s *scale) band(from, to float64, kind, label, title string, labelY float64) Band {
	x1, x2 := s.x(from), s.x(to)
	if x2 < x1 {
		x1, x2 = x2, x1
	}
	x1, x2 = clamp(x1, s.fr.X, s.fr.Right()), clamp(x2, s.fr.X, s.fr.Right())
	if x2-x1 < 3 {
		c := (x1 + x2) / 2
		x1, x2 = c-1.5, c+1.5
	}
	return Band{X: round1(x1), W: round1(x2 - x1), Kind: kind, Label: label, Title: title,
		LabelX: round1((x1 + x2) / 2), LabelY: round1(labelY)}
}

// addFindingSpans shades the station span of every finding of the event
// on a reach of the plot. Each span also gets a strip in a lane along the
// top of the frame, labelled with its row number; lanes are packed
// greedily so that strips and labels never overlap, and the frame moves
// down to make room for them, keeping its height.
func (p *Plot) addFindingSpans(in plotInput, sc *scale, lu string) {
	var laneEnd []float64
	for _, nf := range in.findings {
		f := &nf.F
		pc := pieceOf(in.pieces, f.Reach)
		if pc == nil || !f.HasSpan || (f.Event != "" && f.Event != in.event) {
			continue
		}
		kind := string(f.Severity)
		if f.Excepted {
			kind = "excepted"
			p.HasExcepted = true
		} else {
			p.HasFailing = true
			if p.failing == nil {
				p.failing = map[string]bool{}
			}
			p.failing[kind] = true
		}
		label := "#" + strconv.Itoa(nf.N)
		b := sc.band(pc.offset+f.FromStation, pc.offset+f.ToStation, kind, label, "", 0)
		if nf.Anchor != "" {
			b.Href = "#" + nf.Anchor
		}
		textW := float64(len(label))*charW + 4
		b.LabelInside = b.W >= textW+4
		if b.LabelInside {
			b.LabelX = round1(b.X + b.W/2)
		} else {
			b.LabelX = round1(b.X + b.W + 2)
		}
		end := b.X + b.W
		if !b.LabelInside {
			end = b.LabelX + textW
		}
		lane := -1
		for i, e := range laneEnd {
			if e+3 <= b.X {
				lane = i
				break
			}
		}
		if lane < 0 {
			if len(laneEnd) < maxLanes {
				laneEnd = append(laneEnd, 0)
				lane = len(laneEnd) - 1
			} else {
				lane = maxLanes - 1
			}
		}
		laneEnd[lane] = math.Max(laneEnd[lane], end)
		b.LaneY = round1(marginT + 2 + float64(lane)*laneH)
		b.LabelY = round1(b.LaneY + laneH - 4)
		b.Title = label + " " + f.Rule + ": " + f.Text() + " (" + stationRange(f.FromStation, f.ToStation) + " " + lu + ")"
		p.Bands = append(p.Bands, b)
	}
	if n := len(laneEnd); n > 0 {
		p.Frame.Y += float64(n)*laneH + 4
	}
}

// pieceOf is the piece of the named reach (the last one when a name
// repeats), or nil.
func pieceOf(pieces []piece, reach string) *piece {
	var pc *piece
	for i := range pieces {
		if pieces[i].reach.Name == reach {
			pc = &pieces[i]
		}
	}
	return pc
}

// addBasinsAndBends shades the stilling basins over the frame's height
// and draws each bend as a strip along the bottom of the frame.
func (p *Plot) addBasinsAndBends(pieces []piece, sc *scale, lu string) {
	fr := p.Frame
	for _, pc := range pieces {
		for _, b := range pc.reach.Basins {
			p.Bands = append(p.Bands, sc.band(pc.offset+b.FromStation, pc.offset+b.ToStation, "basin",
				"basin "+b.Name, "basin "+b.Name+" ("+stationRange(b.FromStation, b.ToStation)+" "+lu+")", fr.Bottom()-20))
			p.HasBasin = true
		}
		for _, b := range pc.reach.Bends {
			title := "bend " + b.Name + ", radius " + num(b.Radius) + " " + lu + " (" + stationRange(b.FromStation, b.ToStation) + " " + lu + ")"
			p.Bends = append(p.Bends, sc.band(pc.offset+b.FromStation, pc.offset+b.ToStation, "bend",
				"bend "+b.Name, title, fr.Bottom()-8))
			p.HasBend = true
		}
	}
}
