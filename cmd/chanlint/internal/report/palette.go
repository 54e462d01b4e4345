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

var pal = palette{
	Paper: "#ffffff", Title: "#1d2630", TickText: "#55606b", Label: "#3b4650",
	GridY: "#e7e9ec", GridX: "#f0f1f3",
	Frame: lineStyle{Colour: "#8b949e", Width: "1"},

	Bed:      lineStyle{Colour: "#6b5644", Width: "1.7"},
	WSE:      lineStyle{Colour: "#1f5f99", Width: "1.9", Join: "round"},
	Critical: lineStyle{Colour: "#b0472a", Width: "1.2", Dash: "7 4"},
	Energy:   lineStyle{Colour: "#4d7c3a", Width: "1.1", Dash: "2 3"},
	Bank:     lineStyle{Colour: "#39434d", Width: "1.3"},
	Ground:   "#efe8dc",
	Water:    "#d4e6f4",

	Basin: "#2e8b77", BasinText: "#1f6b5b",
	Bend: "#6c5b9b", BendText: "#4e4175",
	Excepted: "#7b8794", ExceptedText: "#4b5560",
	Boundary: lineStyle{Colour: "#55606b", Width: "1", Dash: "1 3"},
	Gate:     lineStyle{Colour: "#1d2630", Width: "4"},
	Jump:     "#17324d",
	Pool:     lineStyle{Colour: "#1f5f99", Width: "1.4", Dash: "6 3"},
	Road:     lineStyle{Colour: "#3b3b3b", Width: "3"},
	Empty:    "#8a5a00",
}

// bandColour is the colour of a failing span by severity.
func bandColour(kind string) string {
	switch kind {
	case "error":
		return "#c0392b"
	case "warning":
		return "#c27c0e"
	}
	return "#5d6d7e"
}
