package report

import (
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// addLines draws the profile's lines through the computed points (thinned
// for drawing): bed, water surface, critical depth (invert + yc), top of
// bank or crown (invert + section height) and energy grade, the filled
// water between bed and surface, and the ground below the bed. A reach
// without a solution still shows its bed and bank.
func (p *Plot) addLines(pieces []piece, sc *scale) {
	fr := p.Frame
	var bed, wse, crit, bank, egl, ground, water pathBuilder
	closedOnly, anyClosed := true, false
	for _, pc := range pieces {
		for _, s := range sectionsOf(pc.reach) {
			if s.Closed() {
				anyClosed = true
			} else {
				closedOnly = false
			}
		}
	}
	groundStart := -1.0
	var lastGX float64
	var wTop, wBot [][2]float64
	for _, pc := range pieces {
		pts := thin(pointsOf(pc))
		bed.start()
		wse.start()
		crit.start()
		bank.start()
		egl.start()
		wTop, wBot = wTop[:0], wBot[:0]
		for i := range pts {
			pt := &pts[i]
			x := sc.x(pc.offset + pt.Station)
			if !numfmt.Finite(x) {
				continue
			}
			if numfmt.Finite(pt.Invert) {
				y := sc.y(pt.Invert)
				bed.to(x, y)
				if groundStart < 0 {
					groundStart = x
					ground.start()
				}
				ground.to(x, y)
				lastGX = x
				if h := sectionHeight(pt.Section); h > 0 {
					bank.to(x, sc.y(pt.Invert+h))
				}
				if numfmt.Finite(pt.CriticalDepth) && pt.CriticalDepth > 0 {
					crit.to(x, sc.y(pt.Invert+pt.CriticalDepth))
				}
				if numfmt.Finite(pt.WSE) {
					wTop = append(wTop, [2]float64{x, sc.y(pt.WSE)})
					wBot = append(wBot, [2]float64{x, y})
				}
			}
			if numfmt.Finite(pt.WSE) {
				wse.to(x, sc.y(pt.WSE))
			}
			if numfmt.Finite(pt.Energy) {
				egl.to(x, sc.y(pt.Energy))
			}
		}
		if len(wTop) > 1 {
			water.start()
			for _, q := range wTop {
				water.to(q[0], q[1])
			}
			for i := len(wBot) - 1; i >= 0; i-- {
				water.to(wBot[i][0], wBot[i][1])
			}
			water.close()
		}
		if pc.rr == nil || len(pc.rr.Points) == 0 {
			// No solution: still draw the bed and the bank from the reach.
			x1, x2 := sc.x(pc.offset), sc.x(pc.offset+pc.reach.Length)
			y1, y2 := sc.y(pc.reach.InvertUp), sc.y(pc.reach.InvertDown)
			bed.to(x1, y1)
			bed.to(x2, y2)
			if groundStart < 0 {
				groundStart = x1
				ground.start()
			}
			ground.to(x1, y1)
			ground.to(x2, y2)
			lastGX = x2
			if h := sectionHeight(pc.reach.Section); h > 0 {
				bank.to(x1, sc.y(pc.reach.InvertUp+h))
				bank.to(x2, sc.y(pc.reach.InvertDown+h))
			}
		}
	}
	if groundStart >= 0 {
		ground.to(lastGX, fr.Bottom())
		ground.to(groundStart, fr.Bottom())
		ground.close()
	}
	p.Ground, p.Water = ground.String(), water.String()
	p.Bed, p.WSE, p.Critical, p.Bank, p.Energy = bed.String(), wse.String(), crit.String(), bank.String(), egl.String()
	p.BankLabel = "top of bank / lining"
	if closedOnly {
		p.BankLabel = "crown of conduit"
	} else if anyClosed {
		p.BankLabel = "top of bank / lining / crown"
	}
}

// sectionsOf lists the sections of a reach: its own and its segments'.
func sectionsOf(r *model.Reach) []*model.Section {
	var ss []*model.Section
	if r.Section != nil {
		ss = append(ss, r.Section)
	}
	for _, sg := range r.Segments {
		if sg.Section != nil {
			ss = append(ss, sg.Section)
		}
	}
	return ss
}

// pointsOf returns the computed points of a piece (nil when unsolved).
func pointsOf(pc piece) []solver.Point {
	if pc.rr == nil {
		return nil
	}
	return pc.rr.Points
}

// thin keeps at most about maxPlotPoints points for drawing: in each of
// maxPlotPoints/4 station buckets, the first and last points and those of
// lowest and highest water surface, so that jumps and peaks survive.
func thin(pts []solver.Point) []solver.Point {
	if len(pts) <= maxPlotPoints {
		return pts
	}
	wse := func(i int) float64 { return pts[i].WSE }
	keep := thinKeep(len(pts), func(i int) float64 { return pts[i].Station }, wse, wse)
	out := make([]solver.Point, 0, maxPlotPoints)
	for i, k := range keep {
		if k {
			out = append(out, pts[i])
		}
	}
	return out
}

// thinKeep marks which of n values ordered by station (n > maxPlotPoints)
// to draw: in each of maxPlotPoints/4 station buckets, the first and the
// last, the one of lowest low and the one of highest high.
func thinKeep(n int, station, low, high func(int) float64) []bool {
	keep := make([]bool, n)
	buckets := maxPlotPoints / 4
	s0, s1 := station(0), station(n-1)
	span := s1 - s0
	if !(span > 0) {
		keep[0], keep[n-1] = true, true
		return keep
	}
	start := 0
	for b := 0; b < buckets && start < n; b++ {
		limit := s0 + span*float64(b+1)/float64(buckets)
		end := start
		for end < n && (station(end) <= limit || b == buckets-1) {
			end++
		}
		if end == start {
			continue
		}
		lo, hi := start, start
		for i := start; i < end; i++ {
			if low(i) < low(lo) {
				lo = i
			}
			if high(i) > high(hi) {
				hi = i
			}
		}
		keep[start], keep[end-1], keep[lo], keep[hi] = true, true, true, true
		start = end
	}
	return keep
}

// addEnvelope draws the water surface's envelope over a sensitivity run:
// for each piece with a band, a closed path along the highest water
// surface downstream and back along the lowest. Its title names the run
// and where the band is widest, so that the range is said in words as
// well as drawn.
func (p *Plot) addEnvelope(pieces []piece, sc *scale, env *Envelope, lu string) {
	if env == nil {
		return
	}
	var path pathBuilder
	widest, at, where := -1.0, 0.0, ""
	for _, pc := range pieces {
		b := pc.band
		if b == nil || len(b.Station) < 2 || len(b.Low) != len(b.Station) || len(b.High) != len(b.Station) {
			continue
		}
		idx := make([]int, 0, min(len(b.Station), maxPlotPoints))
		if len(b.Station) <= maxPlotPoints {
			for i := range b.Station {
				idx = append(idx, i)
			}
		} else {
			st := func(i int) float64 { return b.Station[i] }
			for i, k := range thinKeep(len(b.Station), st, func(i int) float64 { return b.Low[i] }, func(i int) float64 { return b.High[i] }) {
				if k {
					idx = append(idx, i)
				}
			}
		}
		path.start()
		for _, i := range idx {
			path.to(sc.x(pc.offset+b.Station[i]), sc.y(b.High[i]))
		}
		for j := len(idx) - 1; j >= 0; j-- {
			i := idx[j]
			path.to(sc.x(pc.offset+b.Station[i]), sc.y(b.Low[i]))
		}
		path.close()
		for i, x := range b.Station {
			if w := b.High[i] - b.Low[i]; numfmt.Finite(w) && w > widest {
				widest, at, where = w, x, pc.reach.Name
			}
		}
	}
	p.Envelope = path.String()
	if p.Envelope == "" {
		return
	}
	p.EnvelopeTitle = "Water-surface envelope over " + plural(env.Cases, "sensitivity case") + " (" + env.Sizes + "): widest " +
		num(widest) + " " + lu + ", at station " + num(at) + " " + lu + " of " + where
	note := "The hatched band is the range of the water surface over the " + plural(env.Cases, "sensitivity case") +
		" and the nominal one; it is widest (" + num(widest) + " " + lu + ") at station " + num(at) + " " + lu + " of " + where + "."
	p.addNote(note)
}

// pathBuilder writes SVG path data ("M x y L x y ...") with one decimal.
// Points on a straight run are left out: a point is written only where
// the line bends by more than pathTol, so a profile of many computed
// points on a gentle curve draws as few segments as the eye can tell
// apart. Every point left out lies within pathTol of the line drawn.
type pathBuilder struct {
	b      []byte
	fresh  bool // the next point starts a subpath
	lines  bool // some point was joined to the one before
	open   bool // a subpath is started: ax, ay is its last written point
	ax, ay float64
	run    [][2]float64 // points since the last written one; the last is the line's end so far
}

// pathTol is the largest distance (user units) of a point left out of a
// path from the line drawn: half the one decimal the path is written with.
const pathTol = 0.05

// pathRunMax bounds the points checked against one straight run.
const pathRunMax = 64

func (p *pathBuilder) start() {
	p.flush()
	p.fresh = true
}

func (p *pathBuilder) to(x, y float64) {
	if !numfmt.Finite(x, y) {
		p.flush()
		p.fresh = true
		return
	}
	x, y = round1(x), round1(y)
	if p.fresh || !p.open {
		p.flush()
		p.write('M', x, y)
		p.fresh, p.open = false, true
		p.ax, p.ay = x, y
		return
	}
	if n := len(p.run); (n == 0 && x == p.ax && y == p.ay) || (n > 0 && x == p.run[n-1][0] && y == p.run[n-1][1]) {
		return // the same point again
	}
	if len(p.run) < pathRunMax && p.straight(x, y) {
		p.run = append(p.run, [2]float64{x, y})
		return
	}
	// The run ends at its last point; the new one starts the next.
	last := p.run[len(p.run)-1]
	p.write('L', last[0], last[1])
	p.ax, p.ay = last[0], last[1]
	p.run = append(p.run[:0], [2]float64{x, y})
}

// straight says whether every point of the run lies within pathTol of the
// segment from the last written point to (x, y).
func (p *pathBuilder) straight(x, y float64) bool {
	dx, dy := x-p.ax, y-p.ay
	l2 := dx*dx + dy*dy
	for _, q := range p.run {
		qx, qy := q[0]-p.ax, q[1]-p.ay
		t := 0.0 // the nearest point of the segment, clamped to its ends
		if l2 > 0 {
			t = (qx*dx + qy*dy) / l2
			if t < 0 {
				t = 0
			} else if t > 1 {
				t = 1
			}
		}
		ex, ey := qx-t*dx, qy-t*dy
		if ex*ex+ey*ey > pathTol*pathTol {
			return false
		}
	}
	return true
}

// flush writes the end of the pending run.
func (p *pathBuilder) flush() {
	if n := len(p.run); n > 0 {
		last := p.run[n-1]
		p.write('L', last[0], last[1])
		p.ax, p.ay = last[0], last[1]
		p.run = p.run[:0]
	}
}

func (p *pathBuilder) write(cmd byte, x, y float64) {
	if len(p.b) > 0 {
		p.b = append(p.b, ' ')
	}
	p.b = append(p.b, cmd)
	if cmd == 'L' {
		p.lines = true
	}
	p.b = appendFixed(p.b, x, 10)
	p.b = append(p.b, ' ')
	p.b = appendFixed(p.b, y, 10)
}

func (p *pathBuilder) close() {
	p.flush()
	if len(p.b) > 0 {
		p.b = append(p.b, " Z"...)
	}
	p.fresh, p.open = true, false
}

// String returns the path data, or "" when it has no line segment.
func (p *pathBuilder) String() string {
	p.flush()
	if !p.lines {
		return ""
	}
	return string(p.b)
}
