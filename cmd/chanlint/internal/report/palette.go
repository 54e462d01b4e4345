package report

// The colours and line styles of the profile plot, in one place. A line
// style is written as SVG presentation attributes.

// lineStyle is how a line is stroked.
type lineStyle struct {
	Colour string
	Width  string
	Dash   string // stroke-dasharray, "" for a solid line
	Join   string // stroke-linejoin, "" for the default
}

// palette names every colour of the plot.
type palette struct {
	Paper, Title, TickText, Label string
	GridY, GridX                  string
	Frame                         lineStyle

	Bed, WSE, Critical, Energy, Bank lineStyle
	Ground, Water                    string // fills
	// Envelope outlines the water surface's range over a sensitivity
	// run; EnvelopeFill fills it under its hatching (envelopeHatch).
	Envelope     lineStyle
	EnvelopeFill string
	// Existing is the existing revision's water surface in a revision
	// comparison.
	Existing lineStyle

	Basin, BasinText string
	Bend, BendText   string
	Excepted         string // outline of an excepted span
	ExceptedText     string
	Boundary         lineStyle
	Gate             lineStyle
	Jump             string
	Pool             lineStyle // a culvert's headwater level
	Road             lineStyle
	Empty            string
}

// The hues are those of the eight-colour set of Okabe and Ito (Color
// Universal Design, 2008), chosen to stay apart for readers with any of
// the common colour-vision deficiencies. Colour is never the only code:
// every line has its own dash and width, and each severity of a failing
// span its own hatching (see spanHatch), so a greyscale print or a
// colour-blind reader tells them apart too.
const (
	okBlack     = "#000000"
	okOrange    = "#e69f00"
	okSkyBlue   = "#56b4e9"
	okGreen     = "#009e73" // bluish green
	okBlue      = "#0072b2"
	okVermilion = "#d55e00"
	okPurple    = "#cc79a7" // reddish purple
)

var pal = palette{
	Paper: "#ffffff", Title: "#1d2630", TickText: "#55606b", Label: "#3b4650",
	GridY: "#e7e9ec", GridX: "#f0f1f3",
	Frame: lineStyle{Colour: "#8b949e", Width: "1"},

	Bed:      lineStyle{Colour: "#5a4634", Width: "2.2"},                    // solid, heaviest
	WSE:      lineStyle{Colour: okBlue, Width: "1.9", Join: "round"},        // solid
	Critical: lineStyle{Colour: okVermilion, Width: "1.3", Dash: "8 3 2 3"}, // dash-dot
	Energy:   lineStyle{Colour: okGreen, Width: "1.2", Dash: "2 3"},         // dotted
	Bank:     lineStyle{Colour: okBlack, Width: "1.3", Dash: "12 3"},        // long dash
	Ground:   "#ece4d6",
	Water:    "#d6ebf7",
	// The envelope is a band, not a line: sky blue under blue hatching
	// falling to the right (the spans' hatching rises), outlined thinly,
	// so that it reads apart from the water below it in greyscale too.
	Envelope:     lineStyle{Colour: okBlue, Width: "0.8"},
	EnvelopeFill: okSkyBlue,
	// The existing water surface is reddish purple in dash-dot-dot, a
	// pattern no other line uses, drawn over the proposed (solid blue)
	// one so that both read where they coincide, in greyscale too.
	Existing: lineStyle{Colour: "#a8467f", Width: "1.7", Dash: "9 2 2 2 2 2", Join: "round"},

	Basin: okGreen, BasinText: "#00664a",
	Bend: okPurple, BendText: "#8a3f68",
	Excepted: "#6b7580", ExceptedText: "#4b5560",
	Boundary: lineStyle{Colour: "#55606b", Width: "1", Dash: "1 3"},
	Gate:     lineStyle{Colour: "#1d2630", Width: "4"},
	Jump:     "#17324d",
	Pool:     lineStyle{Colour: okSkyBlue, Width: "1.6", Dash: "6 3"},
	Road:     lineStyle{Colour: "#3b3b3b", Width: "3"},
	Empty:    "#8a5a00",
}

// bandColour is the colour of a failing span by severity.
func bandColour(kind string) string {
	switch kind {
	case "error":
		return okVermilion
	case "warning":
		return okOrange
	}
	return okSkyBlue
}

// envelopeHatch is the hatching of the water-surface envelope: lines
// falling to the right, apart from every span's rising ones.
const envelopeHatch = "M0 0 L6 6 M-1 5 L1 7 M5 -1 L7 1"

// spanHatch is the hatching that codes a failing span's severity apart
// from its colour: cross-hatched errors, single-hatched warnings, and
// info spans left plain; "" for none.
func spanHatch(kind string) string {
	switch kind {
	case "error":
		return "M0 6 L6 0 M-1 1 L1 -1 M5 7 L7 5 M0 0 L6 6 M-1 5 L1 7 M5 -1 L7 1"
	case "warning":
		return "M0 6 L6 0 M-1 1 L1 -1 M5 7 L7 5"
	}
	return ""
}
