package report

// The profile plot is built in two stages. buildPlot lays it out: every
// position, path and label of the drawing is computed here in Go, in SVG
// user units, split by part:
//
//	plot.go        the Plot type, the main stem and the order of the parts
//	plotaxes.go    the data extent, the scale, ticks and axis labels
//	plotspans.go   failing and excepted spans in their lanes, basins, bends
//	plotlines.go   bed, water surface, critical depth, bank, energy grade,
//	               the water surface's envelope over a sensitivity run
//	plotmarks.go   reach boundaries, hydraulic jumps, gates, culverts
//	plotlegend.go  the legend rows
//
// plotsvg.go then writes the laid-out Plot as SVG markup with the colours
// and line styles of palette.go, escaping every string; it computes no
// geometry of its own.

import (
	"math"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/revdiff"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// Plot is one longitudinal profile, laid out in SVG user units. Every
// number in it is finite; the SVG writer only places what is computed here.
type Plot struct {
	ID      string // unique in the page: used for aria labels
	Title   string // e.g. "q100 — main stem: west-ditch → main"
	Caption string // scale and reading notes
	Small   bool   // a reach or detail plot below the main stem
	W, H    float64
	Frame   Rect // plot area

	XLabel, YLabel string
	XTicks, YTicks []Tick
	Text           TextPos // where the title, axis labels and messages go

	Bands      []Band // failing spans, excepted spans and basins, behind the lines
	Bends      []Band // strips along the bottom of the frame
	Boundaries []Boundary

	Ground, Water            string // filled paths: below the bed; between bed and water surface
	Bed, WSE, Critical, Bank string // line paths
	Energy                   string
	// Envelope is the filled path of the water surface's range over a
	// sensitivity run (between the lowest and highest water surface of
	// all its cases), drawn behind the water-surface line; EnvelopeTitle
	// says what it is and where it is widest.
	Envelope, EnvelopeTitle string
	// Existing is the line path of the existing revision's water surface
	// when the model is compared with one (Model.Revision), drawn dashed
	// over the water surface; ExistingTitle names that revision.
	Existing, ExistingTitle string
	BankLabel               string // "top of bank / lining" or "crown" when every section is closed
	Jumps                   []Mark
	Gates                   []Mark
	// Culverts are the headwater pools in front of culvert inlets (a level
	// line from X to X2 at Y1, the inlet's headwall from Y1 down to Y2)
	// and Roads the road crests over them (X to X2 at Y1).
	Culverts, Roads           []Mark
	Legend                    []LegendItem
	ClipEnergy                bool // the energy grade leaves the frame and is clipped
	failing                   map[string]bool
	ReachY                    float64 // baseline of the reach names
	Empty                     string  // message shown instead of lines when nothing was computed
	HasFailing, HasExcepted   bool
	HasBasin, HasBend, HasJmp bool
	HasRoad                   bool
}

// Rect is an axis-aligned rectangle.
type Rect struct{ X, Y, W, H float64 }

// Right and Bottom are the far edges.
func (r Rect) Right() float64  { return r.X + r.W }
func (r Rect) Bottom() float64 { return r.Y + r.H }

// CentreX and CentreY are the middle of the rectangle.
func (r Rect) CentreX() float64 { return r.X + r.W/2 }
func (r Rect) CentreY() float64 { return r.Y + r.H/2 }

// TextPos holds the anchor points of the plot's fixed texts.
type TextPos struct {
	TitleX, TitleY   float64 // the plot title, above the frame
	YTickX           float64 // right edge of the elevation tick labels
	XTickY           float64 // baseline of the station tick labels
	XLabelX, XLabelY float64 // station axis label, centred under the frame
	YLabelX, YLabelY float64 // elevation axis label, rotated, centred beside it
	BendY            float64 // top of the bend strips
}

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
	// Href links a failing span's strip to its row of the findings table
	// ("#m1-f3"); "" for other bands.
	Href string
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
	band   *pipeline.Band   // the water surface's range over a sensitivity run; nil without one
	old    *revdiff.Profile // the existing revision's water surface on this reach; nil without one
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
	culverts  map[*model.Reach]*solver.CulvertResult // by barrel reach
	stem      bool                                   // draw reach boundaries and names
	small     bool                                   // drawn below the main stem, in the smaller size
	xlabel    string                                 // overrides the station axis label
	envelope  *Envelope                              // the model's sensitivity run; nil without one
	oldFile   string                                 // the existing revision compared with; "" without one
}

// numbered is a finding with its row number in the page's findings table
// and the id of that row.
type numbered struct {
	Anchor string
	N      int
	F      rules.Finding
}

// buildPlot lays out a profile plot, part by part. The order matters: the
// finding lanes push the frame down, and everything drawn against the
// elevation axis is placed after that.
func buildPlot(in plotInput) *Plot {
	p := &Plot{ID: in.id, Title: in.title, Small: in.small, W: in.w, H: in.h}
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

	sc := newScale(in.pieces, p, in.culverts)
	p.addFindingSpans(in, sc, lu) // moves the frame down by its lanes
	sc.fr = p.Frame
	p.addAxes(sc)
	p.addBasinsAndBends(in.pieces, sc, lu)
	if in.stem && len(in.pieces) > 1 {
		p.addBoundaries(in.pieces, sc)
	}
	if !sc.anyPoints {
		p.Empty = "No computed profile for this event."
	}
	p.addLines(in.pieces, sc)
	p.addEnvelope(in.pieces, sc, in.envelope, lu)
	if in.oldFile != "" {
		p.addExisting(in.pieces, sc, in.oldFile)
	}
	p.addJumps(in.pieces, sc, lu)
	p.addGates(in.pieces, sc, lu)
	p.addCulverts(in.pieces, sc, lu, in.culverts)
	p.addLegend()
	if p.ClipEnergy {
		p.addNote("The energy grade rises above the frame and is cut off.")
	}
	return p
}

// addNote adds a sentence to the plot's caption.
func (p *Plot) addNote(note string) {
	if p.Caption != "" {
		p.Caption += " " + note
	} else {
		p.Caption = note
	}
}

// sectionHeight is the invert-to-top height of a section (0 when unknown).
func sectionHeight(s *model.Section) float64 {
	if s == nil {
		return 0
	}
	if s.Height > 0 && numfmt.Finite(s.Height) {
		return s.Height
	}
	if s.Shape == model.Circle && s.Diameter > 0 {
		return s.Diameter
	}
	return 0
}

func clamp(x, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, x)) }

func round1(x float64) float64 {
	if !numfmt.Finite(x) {
		return 0
	}
	r := math.Round(x*10) / 10
	if r == 0 {
		return 0
	}
	return r
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
