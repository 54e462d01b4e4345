package model

import (
	"slices"
	"strings"

	"github.com/hashicorp/hcl/v2"
)

// InletType is a named culvert inlet of the tool's table: the coefficients
// of the inlet-control equations of FHWA HDS-5 and the entrance-loss
// coefficient of outlet control, with their source.
type InletType struct {
	Name        string
	Shape       Shape  // the barrel shape it applies to (Circle or Box)
	Description string // the inlet as the publication describes it
	Coefficients
	Source string
}

// Coefficients of one culvert inlet (FHWA HDS-5, 3rd ed. 2012, Appendix
// A and Table C.2; see solver/culvert.go for the equations).
type Coefficients struct {
	// Form is 1 or 2, the form of the unsubmerged inlet-control equation.
	Form int
	// K and M are the unsubmerged coefficients, C and Y the submerged
	// ones (the c and Y of HDS-5).
	K, M, C, Y float64
	// SlopeTerm is Ks of the slope correction Ks·S0: −0.5, or +0.7 for
	// mitered inlets.
	SlopeTerm float64
	// EntranceLoss is ke of the outlet-control entrance loss ke·V²/2g.
	EntranceLoss float64
}

// Mitered and ordinary slope corrections of the HDS-5 inlet-control
// equations (HDS-5, 3rd ed. 2012, Appendix A, from memory).
const (
	SlopeTermDefault = -0.5
	SlopeTermMitered = 0.7
)

// inletSource is the source of the inlet table. The values were recalled,
// not re-read from the publication.
const inletSource = "FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. (2012), Table A.1 (inlet control) and Table C.2 (entrance loss), values from memory: check against the publication"

// InletTypes is the table of named inlets, sorted by name. Every value is
// from FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd edition
// (2012): the inlet-control coefficients of form 1 from its Table A.1
// (the regression coefficients of the inlet-control nomographs) and the
// entrance-loss coefficients from its Table C.2. They were recalled from
// memory, not re-read from the publication: a reviewer should check them
// against the published tables, or give a local manual's values with the
// explicit form of `inlet`.
var InletTypes = []InletType{
	// Circular concrete pipe.
	{Name: "groove-end-headwall", Shape: Circle, Description: "concrete pipe, groove (socket) end in a headwall",
		Coefficients: Coefficients{Form: 1, K: 0.0018, M: 2.0, C: 0.0292, Y: 0.74, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.2}},
	{Name: "groove-end-projecting", Shape: Circle, Description: "concrete pipe, groove (socket) end projecting from the fill",
		Coefficients: Coefficients{Form: 1, K: 0.0045, M: 2.0, C: 0.0317, Y: 0.69, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.2}},
	{Name: "square-edge-headwall", Shape: Circle, Description: "concrete pipe, square edge in a headwall",
		Coefficients: Coefficients{Form: 1, K: 0.0098, M: 2.0, C: 0.0398, Y: 0.67, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.5}},
	// Corrugated metal pipe.
	{Name: "corrugated-headwall", Shape: Circle, Description: "corrugated metal pipe in a headwall",
		Coefficients: Coefficients{Form: 1, K: 0.0078, M: 2.0, C: 0.0379, Y: 0.69, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.5}},
	{Name: "corrugated-mitered", Shape: Circle, Description: "corrugated metal pipe mitered to conform to the fill slope",
		Coefficients: Coefficients{Form: 1, K: 0.0210, M: 1.33, C: 0.0463, Y: 0.75, SlopeTerm: SlopeTermMitered, EntranceLoss: 0.7}},
	{Name: "corrugated-projecting", Shape: Circle, Description: "corrugated metal pipe projecting from the fill",
		Coefficients: Coefficients{Form: 1, K: 0.0340, M: 1.50, C: 0.0553, Y: 0.54, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.9}},
	// Concrete box.
	{Name: "box-wingwalls-30-75", Shape: Box, Description: "concrete box, wingwalls flared 30° to 75°, square-edged crown",
		Coefficients: Coefficients{Form: 1, K: 0.026, M: 1.0, C: 0.0347, Y: 0.81, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.4}},
	{Name: "box-wingwalls-90-15", Shape: Box, Description: "concrete box, wingwalls at 90° (headwall) or flared 15°, square edges",
		Coefficients: Coefficients{Form: 1, K: 0.061, M: 0.75, C: 0.0400, Y: 0.80, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.5}},
	{Name: "box-wingwalls-0", Shape: Box, Description: "concrete box, wingwalls parallel to the barrel (straight extensions of its sides), square-edged crown",
		Coefficients: Coefficients{Form: 1, K: 0.061, M: 0.75, C: 0.0423, Y: 0.82, SlopeTerm: SlopeTermDefault, EntranceLoss: 0.7}},
}

func init() {
	for i := range InletTypes {
		InletTypes[i].Source = inletSource
	}
	slices.SortFunc(InletTypes, func(a, b InletType) int { return strings.Compare(a.Name, b.Name) })
}

// LookupInlet returns the named inlet of the table.
func LookupInlet(name string) (InletType, bool) {
	i, ok := slices.BinarySearchFunc(InletTypes, name, func(t InletType, n string) int { return strings.Compare(t.Name, n) })
	if !ok {
		return InletType{}, false
	}
	return InletTypes[i], true
}

// Inlet is the inlet of a culvert: a named type of the table or explicit
// coefficients.
type Inlet struct {
	Type string // the table's name; "" for explicit coefficients
	Coefficients
	Range hcl.Range // the value of `inlet`
}

// Road is the road over a culvert, which overtops as a broad-crested weir.
type Road struct {
	Crest  float64 // elevation of the road crest (its low point)
	Length float64 // length of the crest across the valley (the weir length)
	Width  float64 // width of the road in the direction of flow (the weir's breadth)
	// Coefficient is the weir discharge coefficient written by the model,
	// 0 for the published default (see solver.RoadWeirCoefficient).
	Coefficient float64
	// Shoulder is the elevation of the edge of the road's shoulder at its
	// low point, the level freeboard is often measured to; valid when
	// HasShoulder.
	Shoulder    float64
	HasShoulder bool
	Range       hcl.Range
}

// FreeboardLevel is the elevation the headwater rule measures freeboard
// to: the shoulder when the model gives it, else the crest.
func (r *Road) FreeboardLevel() (float64, string) {
	if r.HasShoulder {
		return r.Shoulder, "shoulder"
	}
	return r.Crest, "crest"
}

// Culvert is a road culvert: the closed reach that is its barrel, the
// number of identical barrels side by side, the inlet and the road.
type Culvert struct {
	Src
	Name      string
	ReachName string
	Reach     *Reach
	Barrels   int // 1 when not written
	Inlet     Inlet
	Road      *Road // nil without a road
}

// MaxBarrels bounds the barrels of one culvert.
const MaxBarrels = 100

var culvertSchema = schema("reach", "barrels", "inlet", "road")

var (
	inletKeys = []string{"form", "K", "M", "c", "Y", "entrance_loss", "Ks"}
	roadKeys  = []string{"crest", "length", "width", "coefficient", "shoulder"}
)

func (d *decoder) culvert(b *hcl.Block) *Culvert {
	c := &Culvert{Src: newSrc(b), Name: d.blockName(b), Barrels: 1}
	a, _ := d.attrs(b, culvertSchema, &c.Src)
	a.require(b.Body, "reach", "inlet")
	c.ReachName, _ = a.name("reach")
	if a.has("barrels") {
		if n, ok := a.number("barrels"); ok {
			if n < 1 || n > MaxBarrels || n != float64(int(n)) {
				d.Errorf(a.m["barrels"].Expr.Range(), "Invalid number of barrels",
					"barrels of %s is %g; write a whole number of identical barrels from 1 to %d.", a.what, n, MaxBarrels)
			} else {
				c.Barrels = int(n)
			}
		}
	}
	if at, ok := a.m["inlet"]; ok {
		c.Inlet = d.inlet(at.Expr, a.what)
	}
	if at, ok := a.m["road"]; ok {
		c.Road = d.road(at.Expr, a.what)
	}
	return c
}

func inletNames() []string {
	out := make([]string, len(InletTypes))
	for i, t := range InletTypes {
		out[i] = t.Name
	}
	return out
}

// inlet decodes `inlet`: a name of the table or an object of coefficients.
func (d *decoder) inlet(expr hcl.Expression, what owner) Inlet {
	in := Inlet{Range: expr.Range()}
	if _, diags := hcl.ExprMap(expr); diags.HasErrors() {
		name, ok := d.text(expr, label{attr: "inlet", owner: what})
		if !ok {
			return in
		}
		t, known := LookupInlet(name)
		if !known {
			d.Errorf(expr.Range(), "Unknown inlet type",
				"inlet of %s is %q, which is not in the inlet table; use one of %s, or give the coefficients: { form = 1, K = ..., M = ..., c = ..., Y = ..., entrance_loss = ... }.%s",
				what, name, strings.Join(inletNames(), ", "), suggest(name, inletNames()))
			return in
		}
		in.Type, in.Coefficients = t.Name, t.Coefficients
		return in
	}
	const example = `{ form = 1, K = 0.0098, M = 2.0, c = 0.0398, Y = 0.67, entrance_loss = 0.5 }`
	entries, ok := d.object(expr, "inlet of "+what.String(), example)
	if !ok {
		return in
	}
	in.SlopeTerm = SlopeTermDefault
	seen := map[string]bool{}
	for _, e := range entries {
		lbl := label{attr: e.Key + " of the inlet", owner: what}
		var dst *float64
		switch e.Key {
		case "form":
			v, ok := d.number(e.Value, lbl)
			if ok && v != 1 && v != 2 {
				d.Errorf(e.Value.Range(), "Unknown inlet form",
					"form of the inlet of %s is %g; HDS-5 writes the unsubmerged inlet-control equation in form 1 or form 2.", what, v)
				ok = false
			}
			if ok {
				in.Form = int(v)
			}
			seen[e.Key] = true
			continue
		case "K":
			dst = &in.K
		case "M":
			dst = &in.M
		case "c":
			dst = &in.C
		case "Y":
			dst = &in.Y
		case "entrance_loss":
			dst = &in.EntranceLoss
		case "Ks":
			dst = &in.SlopeTerm
		default:
			d.Errorf(e.KeyRange, "Unknown inlet coefficient",
				"%q is not a coefficient of an inlet; use form, K, M, c, Y, entrance_loss and optionally Ks.%s", e.Key, suggest(e.Key, inletKeys))
			continue
		}
		seen[e.Key] = true
		v, ok := d.number(e.Value, lbl)
		if !ok {
			continue
		}
		switch {
		case e.Key == "Ks" && (v < -1 || v > 1):
			d.Errorf(e.Value.Range(), "Slope correction out of range",
				"Ks of the inlet of %s is %g; HDS-5 uses −0.5, or 0.7 for a mitered inlet.", what, v)
		case e.Key == "entrance_loss" && (v < 0 || v > 2):
			d.Errorf(e.Value.Range(), "Entrance loss out of range",
				"entrance_loss of the inlet of %s is %g; published coefficients run from about 0.2 (rounded or socket ends) to 0.9 (projecting corrugated pipe).", what, v)
		case e.Key != "Ks" && e.Key != "entrance_loss" && !(v > 0):
			d.Errorf(e.Value.Range(), "Value must be positive",
				"%s of the inlet of %s is %g; the inlet-control coefficients are positive.", e.Key, what, v)
		case e.Key != "Ks" && e.Key != "entrance_loss" && (v < inletRanges[e.Key][0] || v > inletRanges[e.Key][1]):
			r := inletRanges[e.Key]
			d.Errorf(e.Value.Range(), "Inlet coefficient out of range",
				"%s of the inlet of %s is %g; it must lie between %g and %g: the inlet-control coefficients of HDS-5's table span K 0.0018 to 0.6, M 0.5 to 2.0, c 0.029 to 0.055 and Y 0.54 to 0.9, and a value far outside gives a headwater no inlet has. Check the coefficient against the published table, or use a named inlet.",
				e.Key, what, v, r[0], r[1])
		default:
			*dst = v
		}
	}
	var missing []string
	for _, k := range inletKeys[:6] {
		if !seen[k] {
			missing = append(missing, k)
		}
	}
	if len(missing) > 0 {
		d.Errorf(expr.Range(), "Incomplete inlet coefficients",
			"The inlet of %s needs %s; write a named inlet type or all of form, K, M, c, Y and entrance_loss, e.g. %s.",
			what, strings.Join(missing, ", "), example)
	}
	return in
}

// road decodes `road = { crest, length, width }` with the optional
// coefficient and shoulder.
func (d *decoder) road(expr hcl.Expression, what owner) *Road {
	r := &Road{Range: expr.Range()}
	entries, ok := d.object(expr, "road of "+what.String(), `{ crest = 6.4, length = 40, width = 10 }`)
	if !ok {
		return r
	}
	seen := map[string]bool{}
	for _, e := range entries {
		lbl := label{attr: e.Key + " of the road", owner: what}
		v, ok := d.number(e.Value, lbl)
		seen[e.Key] = true
		if !ok {
			continue
		}
		switch e.Key {
		case "crest", "shoulder":
			if !d.elevation(e.Value.Range(), lbl, v) {
				continue
			}
			if e.Key == "crest" {
				r.Crest = v
			} else {
				r.Shoulder, r.HasShoulder = v, true
			}
		case "length", "width", "coefficient":
			if !(v > 0) {
				d.Errorf(e.Value.Range(), "Value must be positive", "%s of the road of %s is %g; it must be greater than 0.", e.Key, what, v)
				continue
			}
			if !d.inRange(e.Value.Range(), lbl, v, roadRanges[e.Key]) {
				continue
			}
			switch e.Key {
			case "length":
				r.Length = v
			case "width":
				r.Width = v
			default:
				r.Coefficient = v
			}
		default:
			seen[e.Key] = false
			d.Errorf(e.KeyRange, "Unknown road attribute",
				"%q is not an attribute of a road; use crest (elevation), length (along the crest), width (across it) and optionally coefficient (of the weir) and shoulder (elevation).%s",
				e.Key, suggest(e.Key, roadKeys))
		}
	}
	var missing []string
	for _, k := range roadKeys[:3] {
		if !seen[k] {
			missing = append(missing, k)
		}
	}
	if len(missing) > 0 {
		d.Errorf(expr.Range(), "Incomplete road",
			"The road of %s needs %s: the crest elevation, the length of the crest and the width of the road.", what, strings.Join(missing, ", "))
	}
	return r
}

// resolveCulverts attaches each culvert to its reach and checks that the
// reach is a closed barrel of one section whose shape fits the inlet.
func (d *decoder) resolveCulverts() {
	for _, c := range d.m.Culverts {
		what := ownerOf("culvert", c.Name)
		r := d.lookupReach(c.ReachName, c.At("reach"), what)
		c.Reach = r
		if r == nil || r.Section == nil {
			continue
		}
		if prev := r.Culvert; prev != nil {
			d.Errorf(c.At("reach"), "More than one culvert on a reach",
				"Reach %q is already the barrel of culvert %q (line %d); one reach is one culvert, whose barrels = N gives identical barrels side by side.",
				r.Name, prev.Name, prev.DefRange.Start.Line)
			continue
		}
		if !r.Section.Closed() {
			d.Errorf(c.At("reach"), "Culvert on an open section",
				"%s names reach %q, whose section %q is a %s; a culvert barrel is a closed section: shape = \"circle\" or \"box\".",
				what, r.Name, r.Section.Name, r.Section.Shape)
			continue
		}
		if len(r.Segments) > 0 {
			d.Errorf(c.At("reach"), "Culvert barrel with segments",
				"Reach %q has segment blocks; a culvert barrel has one section from inlet to outlet. Split the reach at the barrel's ends.", r.Name)
			continue
		}
		if r.Gate != nil {
			d.Errorf(c.At("reach"), "Culvert barrel with a gate",
				"Reach %q starts at gate %q; the inlet of a culvert is its own control. Put the gate on another reach.", r.Name, r.Gate.Name)
			continue
		}
		if c.Inlet.Type != "" {
			if t, ok := LookupInlet(c.Inlet.Type); ok && t.Shape != r.Section.Shape {
				d.Errorf(c.Inlet.Range, "Inlet type for another barrel shape",
					"inlet %q is for a %s barrel, and reach %q is a %s; choose an inlet of a %s or give explicit coefficients.",
					t.Name, t.Shape, r.Name, r.Section.Shape, r.Section.Shape)
				continue
			}
		}
		r.Culvert = c
	}
}

// culvertLevels checks, once the network and the inverts are known, that
// no loss block stands at a culvert's inlet or outlet node (the culvert's
// entrance and exit losses are part of its HDS-5 computation) and that
// each road crest stands above the crown of its culvert's inlet.
func (d *decoder) culvertLevels() {
	for _, c := range d.m.Culverts {
		r := c.Reach
		if r == nil || r.Culvert != c || r.Section == nil {
			continue
		}
		for _, l := range []*Loss{r.EndLoss, upstreamLoss(r)} {
			if l != nil {
				d.Errorf(l.At("node"), "Loss at a culvert",
					"loss %q is at node %q, an end of culvert %q, whose entrance and exit losses are part of its HDS-5 computation (the inlet's entrance_loss, and the exit into the tailwater); remove the loss block.",
					l.Name, l.NodeName, c.Name)
			}
		}
		if c.Road == nil {
			continue
		}
		if crown := r.InvertUp + r.Section.Height; c.Road.Crest <= crown {
			d.Errorf(c.Road.Range, "Road crest below the barrel crown",
				"The road crest of culvert %q is at %g, not above the crown %g of its inlet (invert %g plus rise %g); give the crest as an elevation of the road's low point.",
				c.Name, c.Road.Crest, crown, r.InvertUp, r.Section.Height)
		}
	}
}

// upstreamLoss is the loss written at the node where reach r starts (that
// of the reaches ending there), or nil.
func upstreamLoss(r *Reach) *Loss {
	for _, u := range r.Upstream {
		if u.EndLoss != nil {
			return u.EndLoss
		}
	}
	return nil
}
