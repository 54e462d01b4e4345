package solver

import (
	"cmp"
	"math"
	"slices"

	"github.com/chanlint/chanlint/model"
)

// Regime of the flow at a computed point.
type Regime string

const (
	Subcritical   Regime = "subcritical"
	Supercritical Regime = "supercritical"
	Critical      Regime = "critical"
)

// SlopeClass of a reach (or of a span of it, by its bed slope against the
// normal and critical depths of its discharge).
type SlopeClass string

const (
	Mild       SlopeClass = "mild"
	Steep      SlopeClass = "steep"
	CriticalSl SlopeClass = "critical"
	Horizontal SlopeClass = "horizontal"
	Adverse    SlopeClass = "adverse"
)

// JumpType by upstream Froude number (Peterka 1958).
type JumpType string

const (
	Undular     JumpType = "undular"     // 1 – 1.7
	Weak        JumpType = "weak"        // 1.7 – 2.5
	Oscillating JumpType = "oscillating" // 2.5 – 4.5
	Steady      JumpType = "steady"      // 4.5 – 9
	Strong      JumpType = "strong"      // > 9
)

// Point is one computed cross-section of a water-surface profile.
type Point struct {
	Station       float64
	Invert        float64
	Depth         float64
	WSE           float64 // water-surface elevation = Invert + Depth
	Velocity      float64 // mean velocity Q/A
	Froude        float64
	Energy        float64 // energy grade elevation = WSE + αV²/2g
	CriticalDepth float64
	NormalDepth   float64 // valid only when HasNormal
	HasNormal     bool    // false on horizontal and adverse slopes
	Regime        Regime

	// Details the rules read.
	Section         *model.Section
	Area            float64
	TopWidth        float64
	HydraulicRadius float64
	FrictionSlope   float64
	Alpha           float64 // energy coefficient (1 for prismatic shapes)
	Full            bool    // a closed conduit flowing full at this point
}

// Jump is a hydraulic jump: toe at Station, end at Station+Length.
type Jump struct {
	Station         float64 // toe
	UpstreamDepth   float64 // supercritical sequent depth y1
	DownstreamDepth float64 // subcritical sequent depth y2
	Froude          float64 // upstream Froude number F1
	Length          float64 // Peterka's curve
	Type            JumpType
	EnergyLoss      float64 // E1 − E2
}

// End is the station where the jump ends (toe plus its length).
func (j Jump) End() float64 { return j.Station + j.Length }

// NoteKind says why the solver records a note.
type NoteKind string

const (
	// NoteCriticalFallback: the energy equation had no solution between two
	// points and critical depth was taken.
	NoteCriticalFallback NoteKind = "critical_fallback"
	// NoteNoConvergence: the iteration did not close within tolerance.
	NoteNoConvergence NoteKind = "no_convergence"
	// NoteControl: a boundary condition could not act as given (for
	// example an outlet depth that cannot control a supercritical reach,
	// a drowned gate or entrance depth, or supercritical inflow whose
	// energy is below the critical energy of the reach it enters).
	NoteControl NoteKind = "control"
	// NoteInfo: an assumption of the method that the results rest on,
	// not a failure: supercritical flows meeting at a junction (a
	// one-dimensional model cannot represent the shock waves), a reach
	// with no discharge in the event, or a jump held at a change of
	// section whose depths are those of the two profiles there.
	NoteInfo NoteKind = "assumption"
)

// Note records a numerical fallback, a control that could not act, or an
// assumption of the method.
type Note struct {
	Kind    NoteKind
	Station float64
	Message string
}

// ProfileSpan is a computed span of one gradually-varied-flow profile type
// (M1, M2, M3, S1, S2, S3, C1, C3, H2, H3, A2, A3).
type ProfileSpan struct {
	Type                   string
	FromStation, ToStation float64
}

// ReachResult is the solved flow in one reach for one event.
type ReachResult struct {
	Reach      *model.Reach
	Discharge  float64
	SlopeClass SlopeClass
	Profiles   []ProfileSpan // ordered by station
	Points     []Point       // ordered by station (non-decreasing)
	Jumps      []Jump        // ordered by station
	Notes      []Note        // ordered by station
	// GateUpstreamDepth is the depth just upstream of a controlling sluice
	// gate at station 0 (free flow: energy balance through the gate without
	// loss; submerged flow: energy to the vena contracta and momentum from
	// there to the tailwater; in the reach's section at station 0); 0
	// without a controlling gate.
	GateUpstreamDepth float64
	// Structures are the node and structure hydraulics of the reach in
	// station order: its outlet into the node below (free or drowned), the
	// local losses at its section changes, its gate. Each names the method
	// that applied and its range of validity.
	Structures []Structure
	// Drops are the drops and free overfalls onto this reach from the
	// reaches ending at its upstream node.
	Drops []Drop

	// flow is what Between and Zones recompute the flow from; empty for a
	// result built by hand (then they report ok = false).
	flow reachFlow
}

// StructureKind names what a Structure describes.
type StructureKind string

const (
	// StructOutlet: the downstream end of a reach at a junction or at the
	// outfall, free (a fall at critical depth) or drowned.
	StructOutlet StructureKind = "outlet"
	// StructTransition: a change of section inside a reach with a local
	// loss.
	StructTransition StructureKind = "transition"
	// StructGate: a sluice gate at station 0 of the reach.
	StructGate StructureKind = "gate"
	// StructCulvert: the inlet of a culvert barrel at station 0 (FHWA
	// HDS-5); its state is the governing control, "inlet control" or
	// "outlet control".
	StructCulvert StructureKind = "culvert"
)

// Structure states.
const (
	StateFree        = "free"      // an outlet falling freely, a gate in free flow
	StateDrowned     = "drowned"   // an outlet below the tailwater's critical level
	StateSubmerged   = "submerged" // a gate whose tailwater covers the vena contracta
	StateNoControl   = "not controlling"
	StateContraction = "contraction" // velocity head rises downstream
	StateExpansion   = "expansion"   // velocity head falls downstream
)

// Structure is the hydraulics at a node or structure of a reach.
type Structure struct {
	Kind    StructureKind
	Name    string  // the model block (loss, gate) or node that it is
	Station float64 // on this reach
	State   string  // see the State constants
	// Method names the method that applied; Validity its range and
	// whether this case lies inside it, or the approximation made.
	Method   string
	Validity string
	// Coefficient is the loss coefficient k used (0 without one).
	Coefficient float64
	// HeadLoss is the energy lost across the structure.
	HeadLoss float64
	// UpstreamDepth and DownstreamDepth are the depths on its two sides:
	// for an outlet, the reach's end depth and the depth in the reach
	// below (or the tailwater); for a gate, the depth upstream and the
	// tailwater depth downstream.
	UpstreamDepth, DownstreamDepth float64
}

// Drop is a drop or free overfall from the end of a reach (the brink) onto
// the reach below, at station 0 of the lower reach (the drop face).
type Drop struct {
	Node      string  // the node at the drop
	From      string  // the reach whose end is the brink
	Station   float64 // 0: the face, on the lower reach
	Height    float64 // brink invert minus the invert at the foot of the face
	Number    float64 // drop number D = q²/(g·h³); 0 where q is not defined (not a rectangle)
	Brink     float64 // depth at the brink (critical depth of the reach above)
	ToeDepth  float64 // y1, the depth where the nappe meets the floor
	PoolDepth float64 // yp, the pool behind the nappe (Rand only; 0 otherwise)
	Length    float64 // the drop length from the face to the toe of the nappe (Rand only)
	// SequentDepth is the depth the tailwater needs for a jump at the toe
	// (the sequent depth of y1 by specific force).
	SequentDepth float64
	// EnergyLoss is the energy lost from the brink to the toe.
	EnergyLoss float64
	// Drowned: the tailwater's specific force exceeds that of the jet at
	// the toe, so the jump is drowned against the drop face.
	Drowned  bool
	Method   string
	Validity string
}

// ProfileTypes lists the distinct profile types in station order of first
// appearance, as `solve --format json` prints them.
func (r *ReachResult) ProfileTypes() []string {
	var out []string
	seen := map[string]bool{}
	for _, p := range r.Profiles {
		if !seen[p.Type] {
			seen[p.Type] = true
			out = append(out, p.Type)
		}
	}
	return out
}

// EventResult is the solution of one event.
type EventResult struct {
	Event    *model.Event
	Reaches  []*ReachResult   // in model order (Model.Reaches)
	Culverts []*CulvertResult // in model order (Model.Culverts)
}

// Result is the solution of every event of a model.
type Result struct {
	Model  *model.Model
	Events []*EventResult // in model order
}

// Options tune the solver. The zero value gives the defaults.
type Options struct {
	// Tolerance is the closure of the energy equation on the water surface,
	// in the model's length unit; 0 means the solver's documented default.
	// Accuracy comes from step control, not from this closure alone.
	Tolerance float64
	// MaxPoints bounds the computed points of the whole Solve call, all
	// events together (0: DefaultMaxPoints, 1,000,000); exceeding it ends
	// Solve with ErrTooManyPoints.
	MaxPoints int
	// MaxWork bounds the total work of the Solve call, all events
	// together, in units of about one section evaluation (0:
	// DefaultMaxWork); exceeding it ends Solve with ErrWorkBudget.
	MaxWork int64
	// Events restricts solving to the named events (nil: all).
	Events []string
	// Vary perturbs the model's inputs for a sensitivity run; the zero
	// value solves the model as written.
	Vary Vary
}

// Vary is one perturbed case of a sensitivity run: the same model solved
// with its roughness, discharges and tailwater changed by stated amounts.
type Vary struct {
	// Roughness multiplies every Manning's n of every section (0: 1).
	Roughness float64
	// Discharge multiplies the discharge of every reach in every event
	// (0: 1).
	Discharge float64
	// Tailwater is added to the outlet's depth, elevation or normal depth,
	// in the model's length unit. A critical-depth outlet (a free fall)
	// has no tailwater to vary and is left as it is; a lowered tailwater
	// never goes below the outlet's critical depth.
	Tailwater float64
}

// scale is f, or 1 when f is not a positive finite factor.
func scale(f float64) float64 {
	if !(f > 0) || math.IsInf(f, 0) {
		return 1
	}
	return f
}

// CulvertControl is the control that sets a culvert's headwater.
type CulvertControl string

const (
	InletControlled  CulvertControl = "inlet"
	OutletControlled CulvertControl = "outlet"
)

// Outlet-control methods of a culvert result.
const (
	OutletFullBarrel = "full barrel" // HDS-5 full-flow energy equation
	OutletPartlyFull = "partly full" // the gradually-varied-flow profile in the barrel
	OutletNoFlow     = "no flow"     // the event puts no discharge through the barrel
)

// CulvertResult is the hydraulics of one culvert in one event by FHWA
// HDS-5 (see culvert.go and culvertHead). Levels are elevations; depths
// are above the inlet invert unless named otherwise.
type CulvertResult struct {
	Culvert *model.Culvert
	Reach   *ReachResult // the barrel
	Rise    float64      // D: the diameter or the box's height
	// Headwater is the elevation of the headwater pool: the larger of the
	// two controls, and the energy level the reach above ends at.
	Headwater      float64
	HeadwaterDepth float64 // Headwater − inlet invert
	HWD            float64 // HeadwaterDepth / Rise
	Control        CulvertControl
	// InletHeadwater and OutletHeadwater are the elevations by each control.
	InletHeadwater, OutletHeadwater float64
	InletRegime                     InletRegime
	Intensity                       float64 // Ku·Q/(A·D^0.5) of one barrel
	OutletMethod                    string  // OutletFullBarrel, OutletPartlyFull or OutletNoFlow
	// Transition is, for a culvert whose road overtops with the barrel at
	// the switch between its two outlet-control methods, the barrel's
	// headwater minus the road's (the pool takes the road's); 0 otherwise.
	Transition                  float64
	Tailwater                   float64 // elevation at the outlet
	BarrelFlow, RoadFlow        float64 // discharges; they sum to the reach's event flow
	RoadDepth                   float64 // headwater above the road crest, 0 when it does not overtop
	OutletDepth, OutletVelocity float64 // at the barrel's downstream end, from the final profile
	// Notes say which methods applied, with their range of validity and
	// the values they used.
	Notes []string
}

// Method names the computation that set the headwater, briefly, e.g.
// "inlet control (HDS-5 form 1, unsubmerged)".
func (c *CulvertResult) Method() string {
	if c.OutletMethod == OutletNoFlow {
		return "no flow"
	}
	if c.Control == InletControlled {
		form := "1"
		if c.Culvert != nil && c.Culvert.Inlet.Form == 2 {
			form = "2"
		}
		return "inlet control (HDS-5 form " + form + ", " + string(c.InletRegime) + ")"
	}
	return "outlet control (HDS-5, " + c.OutletMethod + ")"
}

// Assumptions are model-wide statements the results rest on, for the
// outputs to print once: today, whether local losses were modelled.
func (r *Result) Assumptions() []string {
	if r == nil || r.Model == nil {
		return nil
	}
	if len(r.Model.Losses) == 0 {
		return []string{NoLocalLosses}
	}
	if r.Model.DefaultLoss == nil {
		return []string{"local losses are modelled only where a loss block names the node or section change; elsewhere nodes and section changes balance energy without loss"}
	}
	return nil
}

// NoLocalLosses is the statement of a model without loss blocks.
const NoLocalLosses = "no local losses were modelled: nodes and section changes balance energy without loss (add loss blocks, or a model-wide default, with coefficients from a published table of transition losses)"

// AtStation is the value v of the computed points pts (ordered by
// station) at station x, linear between the points around it; at a jump
// (two points at one station) the downstream point's value; beyond the
// ends the end point's. It is how outputs compare or draw two profiles
// whose points lie at different stations. pts must not be empty.
func AtStation(pts []Point, x float64, v func(*Point) float64) float64 {
	i, _ := slices.BinarySearchFunc(pts, x, func(p Point, x float64) int { return cmp.Compare(p.Station, x) })
	switch {
	case i == 0:
		return v(&pts[0])
	case i >= len(pts):
		return v(&pts[len(pts)-1])
	}
	a, b := &pts[i-1], &pts[i]
	if pts[i].Station == x {
		for i+1 < len(pts) && pts[i+1].Station == x {
			i++
		}
		return v(&pts[i])
	}
	t := (x - a.Station) / (b.Station - a.Station)
	return v(a) + t*(v(b)-v(a))
}
