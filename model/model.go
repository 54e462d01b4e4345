// Package model is the channel model language of chanlint: it decodes
// *.chan.hcl files into typed, validated values that keep their source
// ranges, and builds the network graph (topological order, outlet,
// headwaters, accumulated discharges). It computes no hydraulics and imports
// no other package of the project.
package model

import (
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// Units is the unit system of a model or a policy.
type Units string

const (
	SI Units = "si" // metres, m³/s
	US Units = "us" // feet, ft³/s
)

// Manning returns Manning's constant k in V = (k/n)·R^(2/3)·S^(1/2):
// 1.0 for SI and 1.486 for US customary units.
func (u Units) Manning() float64 {
	if u == US {
		return 1.486
	}
	return 1.0
}

// Gravity returns standard gravity, 9.80665 m/s² or 32.174 ft/s².
func (u Units) Gravity() float64 {
	if u == US {
		return 32.174
	}
	return 9.80665
}

// Length is the symbol of the unit of length ("m" or "ft").
func (u Units) Length() string {
	if u == US {
		return "ft"
	}
	return "m"
}

// Velocity is the symbol of the unit of velocity ("m/s" or "ft/s").
func (u Units) Velocity() string {
	if u == US {
		return "ft/s"
	}
	return "m/s"
}

// Stress is the symbol of the unit of shear stress ("N/m²" or "lb/ft²").
func (u Units) Stress() string {
	if u == US {
		return "lb/ft²"
	}
	return "N/m²"
}

// Src is the source position of a decoded block: its header, its first
// label (the name) and the value range of every attribute that was present
// (At). A decoded block keeps its attributes' syntax nodes for that, rather
// than a map of ranges built for every block; Attrs holds ranges given
// directly (a block made in code), and is consulted first.
type Src struct {
	DefRange   hcl.Range
	LabelRange hcl.Range
	Attrs      map[string]hcl.Range
	syn        hclsyntax.Attributes // the decoded block's attributes
}

// At returns the value range of attribute name, or the block's DefRange
// when the attribute was not written.
func (s Src) At(name string) hcl.Range {
	if r, ok := s.Attrs[name]; ok {
		return r
	}
	if a, ok := s.syn[name]; ok {
		return a.Expr.Range()
	}
	return s.DefRange
}

// Has says whether attribute name was written.
func (s Src) Has(name string) bool {
	if _, ok := s.Attrs[name]; ok {
		return true
	}
	_, ok := s.syn[name]
	return ok
}

// Shape of a cross-section.
type Shape string

const (
	Rectangle Shape = "rectangle"
	Trapezoid Shape = "trapezoid"
	Triangle  Shape = "triangle"
	Circle    Shape = "circle"
	Box       Shape = "box" // closed rectangular conduit: bottom_width × height inside
	Points    Shape = "points"
)

// ShapeNames are the shape words of the model language, in the order the
// documentation lists them.
var ShapeNames = []string{string(Rectangle), string(Trapezoid), string(Triangle), string(Circle), string(Box), string(Points)}

// Point is one [offset, elevation] pair of a points section.
type Point struct {
	Offset, Elevation float64
}

// Section is a named cross-section.
type Section struct {
	Src
	Name        string
	Shape       Shape
	BottomWidth float64 // rectangle, trapezoid
	SideSlope   float64 // trapezoid, triangle: horizontal per unit vertical
	Diameter    float64 // circle
	// Height is invert to top of bank or lining. For a circle it equals the
	// diameter; for a box it is the inside rise, invert to soffit; for a points section, when not written, it is the lower of
	// the two end points above the lowest point.
	Height    float64
	Points    []Point    // points: ordered by offset
	Banks     [2]float64 // points: main channel between these offsets
	Roughness [3]float64 // left overbank, main channel, right overbank; all three equal for prismatic shapes
	Lining    string     // free word matched by policies; "" when not written
}

// Closed reports whether the section is a closed conduit (a circle or a
// box).
func (s *Section) Closed() bool { return s.Shape == Circle || s.Shape == Box }

// Segment replaces the reach's section over part of the reach.
type Segment struct {
	Src
	FromStation, ToStation float64
	SectionName            string
	Section                *Section
}

// Reach is one channel link between two nodes. Stations run downstream
// from 0 at the upstream end to Length.
type Reach struct {
	Src
	Index       int // position in Model.Reaches
	Name        string
	From, To    string // upstream and downstream node names
	Length      float64
	SectionName string
	Section     *Section
	// InvertUp and InvertDown are always set after Load: either as written
	// (`invert`) or derived from `slope` and the elevation of the node below
	// (the outlet node sits at elevation 0 unless a reach fixes it).
	InvertUp, InvertDown float64
	Slope                float64 // (InvertUp − InvertDown) / Length; may be 0 or negative
	HasInvert            bool    // `invert` was written rather than `slope`
	// MaxSpacing limits the distance between computed points (`max_spacing`);
	// 0 means the solver's step control alone decides.
	MaxSpacing float64
	// Class is the reach's facility class word (`class`, e.g.
	// "roadside-ditch"), matched by policy selectors; "" when not written.
	Class    string
	Segments []*Segment // ordered by station, not overlapping

	// Filled by the network pass.
	Upstream   []*Reach // reaches that end at From, in model order
	Downstream *Reach   // the reach that starts at To; nil for the outlet reach
	Gate       *Gate    // at station 0, if any
	Culvert    *Culvert // the culvert whose barrel this reach is, if any
	Basins     []*Basin // ordered by station
	Bends      []*Bend  // ordered by station
	// EndLoss is the local loss at the node where the reach ends (its To
	// node: a junction, or the outlet node for the exit loss into the
	// pool); nil when none is written there.
	EndLoss *Loss
	// Losses are the local losses at section changes inside the reach,
	// ordered by station.
	Losses []*Loss
}

// LossAt returns the local loss at a section change at station x of the
// reach, or nil.
func (r *Reach) LossAt(x float64) *Loss {
	for _, l := range r.Losses {
		if l.Station == x {
			return l
		}
	}
	return nil
}

// SectionAt returns the section in force at a station: a segment's section
// where from_station ≤ station ≤ to_station (the first such segment), else
// the reach's own section.
func (r *Reach) SectionAt(station float64) *Section {
	for _, s := range r.Segments {
		if station >= s.FromStation && station <= s.ToStation {
			return s.Section
		}
	}
	return r.Section
}

// InvertAt is the bed elevation at a station (linear between the ends).
func (r *Reach) InvertAt(station float64) float64 {
	if r.Length <= 0 {
		return r.InvertUp
	}
	return r.InvertUp + (r.InvertDown-r.InvertUp)*station/r.Length
}

// Gate is a sluice gate at station 0 of a reach. It may stand on any
// reach, not only a headwater: it is the upstream control of its reach, and
// the reach above sees the depth the gate holds back.
type Gate struct {
	Src
	Name        string
	ReachName   string
	Reach       *Reach
	Opening     float64
	Contraction float64 // 0.61 when not written
}

// VenaContracta is the depth of the contracted jet below the gate.
func (g *Gate) VenaContracta() float64 { return g.Contraction * g.Opening }

// Loss is a local (transition) loss: at a node, between the reaches
// meeting there (Node set); at a section change inside a reach (Reach and
// Station set); or, with neither, the model-wide default that applies at
// every node and section change without a loss of its own.
//
// The head loss is h = k·|α₂V₂²/2g − α₁V₁²/2g|, with k = Contraction where
// the velocity head rises downstream and k = Expansion where it falls.
type Loss struct {
	Src
	Name        string
	NodeName    string // "" unless at a node
	Node        *Node
	ReachName   string // "" unless at a section change inside a reach
	Reach       *Reach
	Station     float64
	Contraction float64
	Expansion   float64
}

// Default reports whether the loss is the model-wide default.
func (l *Loss) Default() bool { return l.NodeName == "" && l.ReachName == "" }

// Coefficient is k for a velocity head that rises downstream (rising true:
// the contraction coefficient) or falls (the expansion coefficient).
func (l *Loss) Coefficient(rising bool) float64 {
	if l == nil {
		return 0
	}
	if rising {
		return l.Contraction
	}
	return l.Expansion
}

// Basin is a hardened zone of a reach where a hydraulic jump is allowed.
type Basin struct {
	Src
	Name                   string
	ReachName              string
	Reach                  *Reach
	FromStation, ToStation float64
}

// Bend is a curve of a reach with its centreline radius.
type Bend struct {
	Src
	Name                   string
	ReachName              string
	Reach                  *Reach
	FromStation, ToStation float64
	Radius                 float64
}

// OutletKind is the kind of downstream control of an event.
type OutletKind string

const (
	OutletDepth     OutletKind = "depth"
	OutletElevation OutletKind = "elevation"
	OutletNormal    OutletKind = "normal"
	OutletCritical  OutletKind = "critical"
)

// Outlet is the control at the single outlet node.
type Outlet struct {
	Kind  OutletKind
	Value float64 // depth or elevation; unused for normal and critical
	Range hcl.Range
}

// Inflow is discharge entering at the upstream end of a reach.
type Inflow struct {
	ReachName string
	Reach     *Reach
	Discharge float64
	Range     hcl.Range // the key of the entry
}

// Entrance is a known depth at the upstream end of a headwater reach.
type Entrance struct {
	ReachName string
	Reach     *Reach
	Depth     float64
	Range     hcl.Range
}

// Event is one steady-flow case.
type Event struct {
	Src
	Name string
	// ReturnPeriod is the event's return period in years
	// (`return_period`, > 0); 0 when not written.
	ReturnPeriod float64
	// Class is the event's storm class word (`class`, e.g. "minor" or
	// "major"), matched by policy selectors; "" when not written.
	Class     string
	Inflows   []Inflow // in source order
	Outlet    Outlet
	Entrances []Entrance // in source order
	// Discharge is the flow each reach carries, indexed by Reach.Index:
	// its own inflow plus everything that enters its From node.
	Discharge []float64
}

// Exception is a documented design exception for one rule over a span.
type Exception struct {
	Src
	Rule                   string
	ReachName              string
	Reach                  *Reach
	FromStation, ToStation float64
	Reason                 string
}

// Node is a junction, headwater or outlet point of the network.
type Node struct {
	Name string
	In   []*Reach // reaches that end here, in model order
	Out  *Reach   // the reach that starts here; nil at the outlet
	Loss *Loss    // the local loss written at this node, if any
}

// Network is the tree of reaches.
type Network struct {
	Nodes       []*Node  // in order of first appearance in the file
	Order       []*Reach // topological: every reach after all reaches upstream of it
	Outlet      *Node
	OutletReach *Reach
	Headwaters  []*Reach // reaches with nothing upstream, in model order
}

// Model is one decoded, validated *.chan.hcl file.
type Model struct {
	File       string // path as given to Load (forward slashes)
	Source     []byte
	Units      Units
	UnitsRange hcl.Range
	Title      string
	Sections   []*Section // in source order
	Reaches    []*Reach
	Gates      []*Gate
	Culverts   []*Culvert
	Basins     []*Basin
	Bends      []*Bend
	Events     []*Event
	Exceptions []*Exception
	Losses     []*Loss // in source order, the default among them
	// DefaultLoss is the model-wide default loss (a loss block with neither
	// node nor reach); nil when none is written, and then no local losses
	// are modelled except where a loss block names the place.
	DefaultLoss *Loss
	Network     *Network
}

// NodeLoss is the local loss at the node where reach r ends, between r and
// the reach leaving that node: the loss written at the node, else the
// model-wide default. At the outlet node only a loss written there applies
// (it makes the outlet level that of still receiving water, see the
// README); the default does not, nor at the ends of a culvert barrel.
func (m *Model) NodeLoss(r *Reach) *Loss {
	if r == nil {
		return nil
	}
	if r.EndLoss != nil {
		return r.EndLoss
	}
	if r.Downstream == nil || r.Culvert != nil || r.Downstream.Culvert != nil {
		// The outlet node, and a culvert's ends, whose entrance and exit
		// losses are part of its HDS-5 computation.
		return nil
	}
	return m.DefaultLoss
}

// SectionLoss is the local loss at a section change at station x inside
// reach r: the loss written there, else the model-wide default.
func (m *Model) SectionLoss(r *Reach, x float64) *Loss {
	if r == nil {
		return nil
	}
	if l := r.LossAt(x); l != nil {
		return l
	}
	return m.DefaultLoss
}
