package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// Plot is one longitudinal profile, laid out in SVG user units. Every
// number in it is finite; the templates only place what is computed here.
type Plot struct {
	ID      string // unique in the page: used for aria labels
	Title   string // e.g. "q100 — main stem: west-ditch → main"
	Caption string // scale and reading notes
	W, H    float64
	Frame   Rect // plot area

	XLabel, YLabel string
	XTicks, YTicks []Tick

	Bands      []Band // failing spans, excepted spans and basins, behind the lines
	Bends      []Band // strips along the top of the frame
	Boundaries []Boundary

	Ground, Water             string // filled paths: below the bed; between bed and water surface
	Bed, WSE, Critical, Bank  string // line paths
	Energy                    string
	BankLabel                 string // "top of bank / lining" or "crown" when every section is closed
	Jumps                     []Mark
	Gates                     []Mark
	Legend                    []LegendItem
	ClipEnergy                bool // the energy grade leaves the frame and is clipped
	failing                   map[string]bool
	ReachY                    float64 // baseline of the reach names
	Empty                     string  // message shown instead of lines when nothing was computed
	HasFailing, HasExcepted   bool
	HasBasin, HasBend, HasJmp bool
}

// Rect is an axis-aligned rectangle.
type Rect struct{ X, Y, W, H float64 }

// Right and Bottom are the far edges.
func (r Rect) Right() float64  { return r.X + r.W }
func (r Rect) Bottom() float64 { return r.Y + r.H }

// Tick is an axis tick at a position (user units) with its label.
type Tick struct {
	Pos   float64
	Label string
}

// Band is a vertical zone over a station range.
type Band struct {
	X, W   float64
	Kind   string // "error", "warning", "info", "excepted", "basin", "bend"
	Label  string // short text drawn in the band ("#3", basin or bend name)
	Title  string // tooltip: the full text
	LabelX float64
	LabelY float64
	// Failing spans: the strip in its lane at the top of the frame, and
	// whether the label fits inside it (else it is drawn to its right).
	LaneY       float64
	LabelInside bool
}

// Boundary is a reach boundary on a main-stem plot.
type Boundary struct {
	X      float64
	Label  string // reach name, drawn centred over its reach
	LabelX float64
	Title  string
	First  bool // the first reach starts at the frame's edge: no line
}

// Mark is a jump or gate symbol: a vertical stroke from Y1 to Y2 at X and
// a label.
type Mark struct {
	X, Y1, Y2      float64
	X2             float64 // jump end (toe + length)
	Label          string
	LabelX, LabelY float64
	Anchor         string // text-anchor
	Title          string
}

// LegendItem is one entry of the legend row.
type LegendItem struct {
	X, Y  float64
	Kind  string
	Label string
}

// Plot sizes (SVG user units; the page scales the drawing to its width).
const (
	mainW, mainH   = 1000.0, 420.0
	smallW, smallH = 1000.0, 300.0
	marginL        = 72.0
	marginR        = 24.0
	marginT        = 40.0
	marginB        = 78.0
	charW          = 6.4 // approximate advance of an 11-unit sans-serif glyph
	maxPlotPoints  = 1600
	laneH          = 13.0 // height of a finding lane
	maxLanes       = 5
	legendRowH     = 17.0
)

// piece is one reach of a plot with its offset along the plotted line.
type piece struct {
	reach  *model.Reach
	rr     *solver.ReachResult
	offset float64
}

// mainStem returns the longest path from a headwater to the outlet (by
// summed reach length; the first headwater in model order wins a tie), in
// downstream order. Every reach appears at most once, so a malformed
// network cannot make it loop.
func mainStem(m *model.Model) []*model.Reach {
	var heads []*model.Reach
	if m.Network != nil {
		heads = m.Network.Headwaters
	}
	if len(heads) == 0 {
		for _, r := range m.Reaches {
			if len(r.Upstream) == 0 {
				heads = append(heads, r)
			}
		}
	}
	var best []*model.Reach
	bestLen := -1.0
	for _, h := range heads {
		var path []*model.Reach
		seen := map[*model.Reach]bool{}
		total := 0.0
		for r := h; r != nil && !seen[r]; r = r.Downstream {
			seen[r] = true
			path = append(path, r)
			total += r.Length
		}
		if total > bestLen {
			best, bestLen = path, total
		}
	}
	if best == nil && len(m.Reaches) > 0 {
		best = []*model.Reach{m.Reaches[0]}
	}
	return best
}

// plotInput gathers what one plot draws.
type plotInput struct {
	id, title string
	units     model.Units
	pieces    []piece
	event     string
	findings  []numbered
	w, h      float64
	stem      bool   // draw reach boundaries and names
	xlabel    string // overrides the station axis label
}

// numbered is a finding with its row number in the page's findings table.
type numbered struct {
	N int
	F rules.Finding
}

// buildPlot lays out a profile plot.
func buildPlot(in plotInput) *Plot {
	p := &Plot{ID: in.id, Title: in.title, W: in.w, H: in.h}
	p.ReachY = marginT - 6
	p.Frame = Rect{X: marginL, Y: marginT, W: in.w - marginL - marginR, H: in.h - marginT - marginB}
	lu := in.units.Length()
	p.YLabel = "Elevation (" + lu + ")"
	if in.stem && len(in.pieces) > 1 {
		p.XLabel = "Distance downstream along the main stem (" + lu + ")"
	} else {
		p.XLabel = "Station (" + lu + ")"
	}
	if in.xlabel != "" {
		p.XLabel = in.xlabel
	}

	// Extent.
	xmin, xmax := 0.0, 0.0
	for _, pc := range in.pieces {
		xmax = math.Max(xmax, pc.offset+pc.reach.Length)
	}
	if !(xmax > xmin) {
		xmax = xmin + 1
	}
	ymin, ymax := math.Inf(1), math.Inf(-1)
	grow := func(y float64) {
		if isFinite(y) {
			ymin, ymax = math.Min(ymin, y), math.Max(ymax, y)
		}
	}
	anyPoints := false
	emax := math.Inf(-1)
	for _, pc := range in.pieces {
		grow(pc.reach.InvertUp)
		grow(pc.reach.InvertDown)
		grow(pc.reach.InvertUp + sectionHeight(pc.reach.Section))
		grow(pc.reach.InvertDown + sectionHeight(pc.reach.SectionAt(pc.reach.Length)))
		if pc.rr == nil {
			continue
		}
		for _, pt := range pc.rr.Points {
			anyPoints = true
			grow(pt.Invert)
			grow(pt.WSE)
			if isFinite(pt.Energy) {
				emax = math.Max(emax, pt.Energy)
			}
			grow(pt.Invert + pt.CriticalDepth)
			grow(pt.Invert + sectionHeight(pt.Section))
		}
	}
	if !isFinite(ymin) || !isFinite(ymax) {
		ymin, ymax = 0, 1
	}
	if ymax-ymin < 1e-6 {
		ymin, ymax = ymin-0.5, ymax+0.5
	}
	// The energy grade of a fast jet (below a gate) can stand far above
	// everything else; rather than flatten the profile, it is clipped.
	if isFinite(emax) && emax > ymax {
		if emax <= ymax+0.5*(ymax-ymin) {
			ymax = emax
		} else {
			p.ClipEnergy = true
		}
	}
	pad := 0.06 * (ymax - ymin)
	ymin, ymax = ymin-pad, ymax+pad
	yt := niceTicks(ymin, ymax, 6)
	if len(yt) > 0 {
		ymin = math.Min(ymin, yt[0])
		ymax = math.Max(ymax, yt[len(yt)-1])
	}
	xt := niceTicks(xmin, xmax, 10)

	fr := p.Frame
	sx := func(x float64) float64 { return fr.X + (x-xmin)/(xmax-xmin)*fr.W }
	// Bands: basins, then findings (drawn above basins).
	bandAt := func(from, to float64, kind, label, title string, labelY float64) Band {
		x1, x2 := sx(from), sx(to)
		if x2 < x1 {
			x1, x2 = x2, x1
		}
		x1, x2 = clamp(x1, fr.X, fr.Right()), clamp(x2, fr.X, fr.Right())
		if x2-x1 < 3 {
			c := (x1 + x2) / 2
			x1, x2 = c-1.5, c+1.5
		}
		return Band{X: round1(x1), W: round1(x2 - x1), Kind: kind, Label: label, Title: title,
			LabelX: round1((x1 + x2) / 2), LabelY: round1(labelY)}
	}
	// Each failing span also gets a strip in a lane along the top of the
	// frame, labelled with its row number; lanes are packed greedily so
	// that strips and labels never overlap.
	var laneEnd []float64
	for _, nf := range in.findings {
		f := nf.F
		var pc *piece
		for i := range in.pieces {
			if in.pieces[i].reach.Name == f.Reach {
				pc = &in.pieces[i]
			}
		}
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
		b := bandAt(pc.offset+f.FromStation, pc.offset+f.ToStation, kind, label, "", 0)
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
		b.Title = fmt.Sprintf("%s %s: %s (%s %s)", label, f.Rule, f.Text(), stationRange(f.FromStation, f.ToStation), lu)
		p.Bands = append(p.Bands, b)
	}

	// Make room for the lanes above the frame, keeping its height.
	if n := len(laneEnd); n > 0 {
		p.Frame.Y += float64(n)*laneH + 4
		fr = p.Frame
	}

	sy := func(y float64) float64 { return fr.Bottom() - (y-ymin)/(ymax-ymin)*fr.H }
	for _, v := range xt {
		if v >= xmin-1e-9 && v <= xmax+1e-9 {
			p.XTicks = append(p.XTicks, Tick{Pos: round1(sx(v)), Label: formatTick(v, xt)})
		}
	}
	for _, v := range yt {
		p.YTicks = append(p.YTicks, Tick{Pos: round1(sy(v)), Label: formatTick(v, yt)})
	}
	// Vertical exaggeration: horizontal units per user unit over vertical ones.
	if hx, hy := (xmax-xmin)/fr.W, (ymax-ymin)/fr.H; hy > 0 {
		if ve := hx / hy; ve > 1.5 {
			p.Caption = "Vertical scale exaggerated about " + sig2(ve) + "×."
		}
	}

	for _, pc := range in.pieces {
		for _, b := range pc.reach.Basins {
			p.Bands = append(p.Bands, bandAt(pc.offset+b.FromStation, pc.offset+b.ToStation, "basin",
				"basin "+b.Name, "basin "+b.Name+" ("+stationRange(b.FromStation, b.ToStation)+" "+lu+")", fr.Bottom()-20))
			p.HasBasin = true
		}
		for _, b := range pc.reach.Bends {
			title := fmt.Sprintf("bend %s, radius %s %s (%s %s)", b.Name, num(b.Radius), lu, stationRange(b.FromStation, b.ToStation), lu)
			p.Bends = append(p.Bends, bandAt(pc.offset+b.FromStation, pc.offset+b.ToStation, "bend",
				"bend "+b.Name, title, fr.Bottom()-8))
			p.HasBend = true
		}
	}
	// Reach boundaries and names.
	if in.stem && len(in.pieces) > 1 {
		for i, pc := range in.pieces {
			x1, x2 := sx(pc.offset), sx(pc.offset+pc.reach.Length)
			room := int((x2 - x1 - 8) / charW)
			p.Boundaries = append(p.Boundaries, Boundary{
				X: round1(x1), First: i == 0, LabelX: round1((x1 + x2) / 2),
				Label: ellipsis(pc.reach.Name, room), Title: "reach " + pc.reach.Name,
			})
		}
	}

	if !anyPoints {
		p.Empty = "No computed profile for this event."
	}

	// Lines.
	var bed, wse, crit, bank, egl, ground, water pathBuilder
	closedOnly, anyClosed := true, false
	for _, pc := range in.pieces {
		for _, s := range sectionsOf(pc.reach) {
			if s.Closed() {
				anyClosed = true
			} else {
				closedOnly = false
			}
		}
	}
	groundStart := -1.0
	var lastGX, lastGY float64
	for _, pc := range in.pieces {
		pts := thin(pointsOf(pc))
		bed.start()
		wse.start()
		crit.start()
		bank.start()
		egl.start()
		var wTop, wBot [][2]float64
		for _, pt := range pts {
			x := sx(pc.offset + pt.Station)
			if !isFinite(x) {
				continue
			}
			if isFinite(pt.Invert) {
				y := sy(pt.Invert)
				bed.to(x, y)
				if groundStart < 0 {
					groundStart = x
					ground.start()
				}
				ground.to(x, y)
				lastGX, lastGY = x, y
				if h := sectionHeight(pt.Section); h > 0 {
					bank.to(x, sy(pt.Invert+h))
				}
				if isFinite(pt.CriticalDepth) && pt.CriticalDepth > 0 {
					crit.to(x, sy(pt.Invert+pt.CriticalDepth))
				}
				if isFinite(pt.WSE) {
					wTop = append(wTop, [2]float64{x, sy(pt.WSE)})
					wBot = append(wBot, [2]float64{x, y})
				}
			}
			if isFinite(pt.WSE) {
				wse.to(x, sy(pt.WSE))
			}
			if isFinite(pt.Energy) {
				egl.to(x, sy(pt.Energy))
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
			x1, x2 := sx(pc.offset), sx(pc.offset+pc.reach.Length)
			y1, y2 := sy(pc.reach.InvertUp), sy(pc.reach.InvertDown)
			bed.to(x1, y1)
			bed.to(x2, y2)
			if groundStart < 0 {
				groundStart = x1
				ground.start()
			}
			ground.to(x1, y1)
			ground.to(x2, y2)
			lastGX, lastGY = x2, y2
			if h := sectionHeight(pc.reach.Section); h > 0 {
				bank.to(x1, sy(pc.reach.InvertUp+h))
				bank.to(x2, sy(pc.reach.InvertDown+h))
			}
		}
	}
	if groundStart >= 0 {
		_ = lastGY
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

	// Jumps and gates.
	lastJumpX := math.Inf(-1)
	jumpRow := 0
	for _, pc := range in.pieces {
		if pc.rr != nil {
			for _, j := range pc.rr.Jumps {
				x := sx(pc.offset + j.Station)
				x2 := sx(pc.offset + j.End())
				inv := pc.reach.InvertAt(j.Station)
				if !isFinite(x) || !isFinite(inv) {
					continue
				}
				y1, y2 := sy(inv+j.UpstreamDepth), sy(inv+j.DownstreamDepth)
				label := fmt.Sprintf("jump F₁ %s, %s", num2(j.Froude), j.Type)
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
					Title: fmt.Sprintf("hydraulic jump in %s at station %s %s: y₁ %s → y₂ %s %s, F₁ %s, %s, length %s %s",
						pc.reach.Name, num(j.Station), lu, num(j.UpstreamDepth), num(j.DownstreamDepth), lu,
						num2(j.Froude), j.Type, num(j.Length), lu),
				})
				p.HasJmp = true
			}
		}
		if g := pc.reach.Gate; g != nil {
			x := sx(pc.offset)
			inv := pc.reach.InvertUp
			top := inv + sectionHeight(pc.reach.Section)
			if top <= inv+g.Opening {
				top = inv + 2*g.Opening
			}
			p.Gates = append(p.Gates, Mark{
				X: round1(x + 2), Y1: round1(sy(top)), Y2: round1(sy(inv + g.Opening)),
				Label: "gate " + g.Name, LabelX: round1(x + 7), LabelY: round1(math.Max(sy(top)-4, fr.Y+11)), Anchor: "start",
				Title: fmt.Sprintf("sluice gate %s, opening %s %s", g.Name, num(g.Opening), lu),
			})
		}
	}

	// Legend: only what is drawn, wrapped into rows that fit the width.
	x := fr.X
	y := fr.Bottom() + marginB - 16
	add := func(kind, label string) {
		w := 30 + float64(len([]rune(label)))*charW + 18
		if x > fr.X && x+w-18 > fr.Right() {
			x = fr.X
			y += legendRowH
		}
		p.Legend = append(p.Legend, LegendItem{X: round1(x), Y: round1(y), Kind: kind, Label: label})
		x += w
	}
	if p.Bed != "" {
		add("bed", "bed (invert)")
	}
	if p.WSE != "" {
		add("wse", "water surface")
	}
	if p.Critical != "" {
		add("critical", "critical depth")
	}
	if p.Energy != "" {
		add("energy", "energy grade")
	}
	if p.Bank != "" {
		add("bank", p.BankLabel)
	}
	if p.HasJmp {
		add("jump", "hydraulic jump")
	}
	if p.HasBasin {
		add("basin", "basin")
	}
	for _, sev := range []string{"error", "warning", "info"} {
		if p.failing[sev] {
			add("span-"+sev, sev+" span (#: finding)")
		}
	}
	if p.HasExcepted {
		add("excepted", "excepted span")
	}
	p.H = round1(y + 16)
	if p.ClipEnergy {
		note := "The energy grade rises above the frame and is cut off."
		if p.Caption != "" {
			p.Caption += " " + note
		} else {
			p.Caption = note
		}
	}
	return p
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
	buckets := maxPlotPoints / 4
	s0, s1 := pts[0].Station, pts[len(pts)-1].Station
	span := s1 - s0
	if !(span > 0) {
		return []solver.Point{pts[0], pts[len(pts)-1]}
	}
	keep := make([]bool, len(pts))
	start := 0
	for b := 0; b < buckets && start < len(pts); b++ {
		limit := s0 + span*float64(b+1)/float64(buckets)
		end := start
		for end < len(pts) && (pts[end].Station <= limit || b == buckets-1) {
			end++
		}
		if end == start {
			continue
		}
		lo, hi := start, start
		for i := start; i < end; i++ {
			if pts[i].WSE < pts[lo].WSE {
				lo = i
			}
			if pts[i].WSE > pts[hi].WSE {
				hi = i
			}
		}
		keep[start], keep[end-1], keep[lo], keep[hi] = true, true, true, true
		start = end
	}
	out := make([]solver.Point, 0, maxPlotPoints)
	for i, k := range keep {
		if k {
			out = append(out, pts[i])
		}
	}
	return out
}

// pathBuilder writes SVG path data ("M x y L x y ...") with one decimal.
type pathBuilder struct {
	b     strings.Builder
	fresh bool // the next point starts a subpath
}

func (p *pathBuilder) start() { p.fresh = true }

func (p *pathBuilder) to(x, y float64) {
	if !isFinite(x) || !isFinite(y) {
		p.fresh = true
		return
	}
	if p.b.Len() > 0 {
		p.b.WriteByte(' ')
	}
	if p.fresh || p.b.Len() == 0 {
		p.b.WriteByte('M')
		p.fresh = false
	} else {
		p.b.WriteByte('L')
	}
	p.b.WriteString(strconv.FormatFloat(round1(x), 'f', -1, 64))
	p.b.WriteByte(' ')
	p.b.WriteString(strconv.FormatFloat(round1(y), 'f', -1, 64))
}

func (p *pathBuilder) close() {
	if p.b.Len() > 0 {
		p.b.WriteString(" Z")
	}
	p.fresh = true
}

// String returns the path data, or "" when it has no line segment.
func (p *pathBuilder) String() string {
	s := p.b.String()
	if !strings.Contains(s, "L") {
		return ""
	}
	return s
}

// niceTicks returns tick values covering [lo, hi] with about n intervals,
// on steps of 1, 2, 2.5 or 5 times a power of ten.
func niceTicks(lo, hi float64, n int) []float64 {
	if !isFinite(lo) || !isFinite(hi) || hi <= lo || n < 1 {
		return nil
	}
	step := niceStep((hi - lo) / float64(n))
	first := math.Floor(lo/step) * step
	var ts []float64
	for i := 0; i <= 4*n+2; i++ {
		v := first + float64(i)*step
		if v > hi+step*0.999 {
			break
		}
		ts = append(ts, roundTo(v, step))
	}
	return ts
}

// niceStep rounds a raw step up to 1, 2, 2.5 or 5 × 10^k.
func niceStep(raw float64) float64 {
	if !(raw > 0) || !isFinite(raw) {
		return 1
	}
	exp := math.Floor(math.Log10(raw))
	base := math.Pow(10, exp)
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*base >= raw*(1-1e-9) {
			return m * base
		}
	}
	return 10 * base
}

// roundTo removes the floating-point noise of a multiple of step.
func roundTo(v, step float64) float64 {
	d := decimals(step)
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', d, 64), 64)
	if r == 0 {
		return 0
	}
	return r
}

// decimals is the number of decimals needed to print multiples of step.
func decimals(step float64) int {
	for d := 0; d < 8; d++ {
		s := step * math.Pow(10, float64(d))
		if math.Abs(s-math.Round(s)) < 1e-6*s {
			return d
		}
	}
	return 8
}

// formatTick prints a tick with the decimals its axis needs.
func formatTick(v float64, ticks []float64) string {
	d := 0
	if len(ticks) > 1 {
		d = decimals(ticks[1] - ticks[0])
	}
	return strconv.FormatFloat(v, 'f', d, 64)
}

// sectionHeight is the invert-to-top height of a section (0 when unknown).
func sectionHeight(s *model.Section) float64 {
	if s == nil {
		return 0
	}
	if s.Height > 0 && isFinite(s.Height) {
		return s.Height
	}
	if s.Shape == model.Circle && s.Diameter > 0 {
		return s.Diameter
	}
	return 0
}

func isFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func clamp(x, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, x)) }

func round1(x float64) float64 {
	if !isFinite(x) {
		return 0
	}
	r := math.Round(x*10) / 10
	if r == 0 {
		return 0
	}
	return r
}

// sig2 prints a positive number with two significant figures.
func sig2(x float64) string {
	if x <= 0 || !isFinite(x) {
		return "0"
	}
	d := 1 - int(math.Floor(math.Log10(x)))
	if d < 0 {
		d = 0
	}
	e := math.Pow(10, math.Floor(math.Log10(x))-1)
	return strconv.FormatFloat(math.Round(x/e)*e, 'f', d, 64)
}

// ellipsis shortens s to at most n runes, ending in "…" when cut.
func ellipsis(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	if n < 2 {
		return ""
	}
	return string(r[:n-1]) + "…"
}
