package main

import (
	"bytes"
	"encoding/csv"
	"flag"
	"fmt"
	"io"
	"slices"
	"strings"
	"unicode/utf8"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

func solveCommand() *command {
	return &command{
		name:    "solve",
		summary: "print the computed water-surface profiles of one model",
		run:     func(a *app, args []string) int { return a.runSolve(args) },
		help:    func(*app) string { return solveUsage() },
	}
}

type solveFlags struct {
	events nameList
	format *choice
	color  *choice
}

func newSolveFlags() (*solveFlags, *flag.FlagSet) {
	sf := &solveFlags{
		format: newChoice("table", "table", "json", "csv"),
		color:  newChoice("auto", "auto", "always", "never"),
	}
	fs := newFlagSet("solve")
	fs.Var(&sf.events, "event", "solve only the event `NAME`; repeat it or separate names by commas for several (default: every event)")
	fs.Var(sf.format, "format", "output format")
	fs.Var(sf.color, "color", "colour the diagnostics of an invalid model")
	return sf, fs
}

func solveUsage() string {
	_, fs := newSolveFlags()
	return `usage: chanlint solve MODEL [options]

Solves the steady flow events of one model and prints, for every event and
reach, the discharge, slope class, profile types, hydraulic jumps and the
computed points (station, invert, depth, water surface, velocity, Froude
number, energy grade, critical and normal depth, regime). No policy is
applied; the table and the JSON document close with the caution.

  table  aligned columns for a terminal, units in the header (default)
  json   one document: units, events, reaches, points, jumps
  csv    one row per point with the event and reach, and a header row

options:
` + flagUsage(fs) + `
exit status: 0 solved; 2 unreadable or invalid model, unknown event, or a
wrong command line.
`
}

func (a *app) runSolve(args []string) int {
	c := findCommand("solve")
	sf, fs := newSolveFlags()
	pos, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if len(pos) != 1 {
		return a.usageError(c, "expected one MODEL file, got %d arguments", len(pos))
	}
	abs := a.abs(pos[0])
	f := modelFile{abs: abs, display: a.display(abs)}
	pal := newPalette(a.useColor(sf.color.value, a.stderrTTY))
	parsed := pipeline.Load(f.pipelineFile())
	src, m := parsed.Src, parsed.Model
	for i := range parsed.Diagnostics {
		writeFindingText(a.stderr, &parsed.Diagnostics[i], src, "m", pal)
	}
	if parsed.Invalid {
		return exitInvalid
	}
	opts := solver.Options{}
	if len(sf.events) > 0 {
		var names []string
		for _, e := range m.Events {
			names = append(names, e.Name)
		}
		for _, want := range sf.events {
			if slices.Contains(names, want) {
				continue
			}
			msg := fmt.Sprintf("%s has no event %q", f.display, want)
			if s := suggest(want, names); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			} else if len(names) > 0 {
				msg += "; its events are " + strings.Join(names, ", ")
			}
			return a.usageError(c, "%s", msg)
		}
		opts.Events = sf.events
	}
	res, err := solver.Solve(m, opts)
	if err != nil {
		lf := pipeline.LimitFinding(m, err)
		writeFindingText(a.stderr, &lf, src, m.Units.Length(), pal)
		return exitInvalid
	}
	var out bytes.Buffer
	switch sf.format.value {
	case "json":
		err = writeSolveJSON(&out, m, res)
	case "csv":
		err = writeSolveCSV(&out, m.Units, res)
	default:
		writeSolveTable(&out, f.display, m, res)
	}
	if err != nil {
		fmt.Fprintf(a.stderr, "chanlint solve: cannot write %s output: %v\n", sf.format.value, err)
		return exitInvalid
	}
	if _, err := a.stdout.Write(out.Bytes()); err != nil {
		return exitInvalid
	}
	return exitOK
}

// nameList is a flag that may be repeated; each value may hold several
// names separated by commas.
type nameList []string

func (l *nameList) String() string { return strings.Join(*l, ",") }

func (l *nameList) Set(v string) error {
	for _, name := range strings.Split(v, ",") {
		if name = strings.TrimSpace(name); name != "" && !slices.Contains(*l, name) {
			*l = append(*l, name)
		}
	}
	return nil
}

// Documents of `solve --format json` (outputs.md).
type solveJSON struct {
	Units       string           `json:"units"`
	Title       string           `json:"title,omitempty"`
	Assumptions []string         `json:"assumptions"`
	Events      []solveEventJSON `json:"events"`
	Caution     string           `json:"caution"`
}

type solveEventJSON struct {
	Name     string           `json:"name"`
	Reaches  []solveReachJSON `json:"reaches"`
	Culverts []culvertJSON    `json:"culverts"`
}

// culvertJSON is one culvert in one event (FHWA HDS-5): levels are
// elevations, hw_d is the headwater depth above the inlet invert over the
// barrel's rise.
type culvertJSON struct {
	Name            string   `json:"name"`
	Reach           string   `json:"reach"`
	Barrels         int      `json:"barrels"`
	Headwater       *float64 `json:"headwater"`
	HeadwaterDepth  *float64 `json:"headwater_depth"`
	HWD             *float64 `json:"hw_d"`
	Control         string   `json:"control"`
	InletHeadwater  *float64 `json:"inlet_headwater"`
	InletRegime     string   `json:"inlet_regime"`
	OutletHeadwater *float64 `json:"outlet_headwater"`
	OutletMethod    string   `json:"outlet_method"`
	Tailwater       *float64 `json:"tailwater"`
	BarrelFlow      *float64 `json:"barrel_flow"`
	RoadFlow        *float64 `json:"road_flow"`
	RoadDepth       *float64 `json:"road_depth"`
	OutletDepth     *float64 `json:"outlet_depth"`
	OutletVelocity  *float64 `json:"outlet_velocity"`
	Notes           []string `json:"notes"`
}

type solveReachJSON struct {
	Name       string          `json:"name"`
	Discharge  *float64        `json:"discharge"`
	SlopeClass string          `json:"slope_class"`
	Profiles   []string        `json:"profiles"`
	Points     []pointJSON     `json:"points"`
	Jumps      []jumpJSON      `json:"jumps"`
	Drops      []dropJSON      `json:"drops"`
	Structures []structureJSON `json:"structures"`
	Notes      []noteJSON      `json:"notes"`
}

type dropJSON struct {
	Node         string   `json:"node"`
	From         string   `json:"from"`
	Station      *float64 `json:"station"`
	DropHeight   *float64 `json:"drop_height"`
	DropNumber   *float64 `json:"drop_number"`
	BrinkDepth   *float64 `json:"brink_depth"`
	Y1           *float64 `json:"y1"`
	PoolDepth    *float64 `json:"pool_depth"`
	DropLength   *float64 `json:"drop_length"`
	SequentDepth *float64 `json:"sequent_depth"`
	EnergyLoss   *float64 `json:"energy_loss"`
	Drowned      bool     `json:"drowned"`
	Method       string   `json:"method"`
	Validity     string   `json:"validity"`
}

type structureJSON struct {
	Kind            string   `json:"kind"`
	Name            string   `json:"name"`
	Station         *float64 `json:"station"`
	State           string   `json:"state"`
	Method          string   `json:"method"`
	Validity        string   `json:"validity"`
	Coefficient     *float64 `json:"coefficient"`
	HeadLoss        *float64 `json:"head_loss"`
	UpstreamDepth   *float64 `json:"upstream_depth"`
	DownstreamDepth *float64 `json:"downstream_depth"`
}

type pointJSON struct {
	Station       *float64 `json:"station"`
	Invert        *float64 `json:"invert"`
	Depth         *float64 `json:"depth"`
	WSE           *float64 `json:"wse"`
	Velocity      *float64 `json:"velocity"`
	Froude        *float64 `json:"froude"`
	Energy        *float64 `json:"energy"`
	CriticalDepth *float64 `json:"critical_depth"`
	NormalDepth   *float64 `json:"normal_depth"`
	Regime        string   `json:"regime"`
	// Zones: in a points section, the velocity of each subdivision from
	// the conveyance split V_i = Q·K_i/(K·A_i); absent for other shapes.
	Zones *zonesJSON `json:"zones,omitempty"`
}

// zonesJSON is the velocity of the left overbank, main channel and right
// overbank of a points section; null for a dry zone.
type zonesJSON struct {
	LeftOverbank  *float64 `json:"left_overbank_velocity"`
	MainChannel   *float64 `json:"main_channel_velocity"`
	RightOverbank *float64 `json:"right_overbank_velocity"`
}

// zoneVelocities is the JSON of a point's zones, nil outside points
// sections.
func zoneVelocities(rr *solver.ReachResult, p *solver.Point) *zonesJSON {
	z, ok := rr.Zones(p)
	if !ok {
		return nil
	}
	v := func(i int) *float64 {
		if z.Area[i] <= 0 {
			return nil
		}
		return numfmt.JSON(z.Velocity[i])
	}
	return &zonesJSON{LeftOverbank: v(solver.LeftOverbank), MainChannel: v(solver.MainChannel), RightOverbank: v(solver.RightOverbank)}
}

type jumpJSON struct {
	Station         *float64 `json:"station"`
	UpstreamDepth   *float64 `json:"upstream_depth"`
	DownstreamDepth *float64 `json:"downstream_depth"`
	Froude          *float64 `json:"froude"`
	Length          *float64 `json:"length"`
	Type            string   `json:"type"`
	EnergyLoss      *float64 `json:"energy_loss"`
}

type noteJSON struct {
	Kind    string   `json:"kind"`
	Station *float64 `json:"station"`
	Message string   `json:"message"`
}

func writeSolveJSON(w io.Writer, m *model.Model, res *solver.Result) error {
	doc := solveJSON{Units: string(m.Units), Title: m.Title, Assumptions: res.Assumptions(), Events: []solveEventJSON{}, Caution: rules.Caution}
	if doc.Assumptions == nil {
		doc.Assumptions = []string{}
	}
	for _, ev := range res.Events {
		ej := solveEventJSON{Name: ev.Event.Name, Reaches: []solveReachJSON{}, Culverts: []culvertJSON{}}
		for _, c := range ev.Culverts {
			ej.Culverts = append(ej.Culverts, culvertJSON{
				Name: c.Culvert.Name, Reach: c.Culvert.ReachName, Barrels: c.Culvert.Barrels,
				Headwater: numfmt.JSON(c.Headwater), HeadwaterDepth: numfmt.JSON(c.HeadwaterDepth), HWD: numfmt.JSON(c.HWD),
				Control:        string(c.Control),
				InletHeadwater: numfmt.JSON(c.InletHeadwater), InletRegime: string(c.InletRegime),
				OutletHeadwater: numfmt.JSON(c.OutletHeadwater), OutletMethod: c.OutletMethod,
				Tailwater:  numfmt.JSON(c.Tailwater),
				BarrelFlow: numfmt.JSON(c.BarrelFlow), RoadFlow: numfmt.JSON(c.RoadFlow), RoadDepth: numfmt.JSON(c.RoadDepth),
				OutletDepth: numfmt.JSON(c.OutletDepth), OutletVelocity: numfmt.JSON(c.OutletVelocity),
				Notes: append([]string{}, c.Notes...),
			})
		}
		for _, rr := range ev.Reaches {
			rj := solveReachJSON{
				Name:       rr.Reach.Name,
				Discharge:  numfmt.JSON(rr.Discharge),
				SlopeClass: string(rr.SlopeClass),
				Profiles:   rr.ProfileTypes(),
				Points:     []pointJSON{},
				Jumps:      []jumpJSON{},
				Drops:      []dropJSON{},
				Structures: []structureJSON{},
				Notes:      []noteJSON{},
			}
			if rj.Profiles == nil {
				rj.Profiles = []string{}
			}
			for i := range rr.Points {
				p := &rr.Points[i]
				pj := pointJSON{
					Station: numfmt.JSON(p.Station), Invert: numfmt.JSON(p.Invert),
					Depth: numfmt.JSON(p.Depth), WSE: numfmt.JSON(p.WSE),
					Velocity: numfmt.JSON(p.Velocity), Froude: numfmt.JSON(p.Froude),
					Energy: numfmt.JSON(p.Energy), CriticalDepth: numfmt.JSON(p.CriticalDepth),
					Regime: string(p.Regime), Zones: zoneVelocities(rr, p),
				}
				if p.HasNormal {
					pj.NormalDepth = numfmt.JSON(p.NormalDepth)
				}
				rj.Points = append(rj.Points, pj)
			}
			for _, j := range rr.Jumps {
				rj.Jumps = append(rj.Jumps, jumpJSON{
					Station: numfmt.JSON(j.Station), UpstreamDepth: numfmt.JSON(j.UpstreamDepth),
					DownstreamDepth: numfmt.JSON(j.DownstreamDepth), Froude: numfmt.JSON(j.Froude),
					Length: numfmt.JSON(j.Length), Type: string(j.Type), EnergyLoss: numfmt.JSON(j.EnergyLoss),
				})
			}
			for _, d := range rr.Drops {
				rj.Drops = append(rj.Drops, dropJSON{
					Node: d.Node, From: d.From, Station: numfmt.JSON(d.Station), DropHeight: numfmt.JSON(d.Height),
					DropNumber: numfmt.JSON(d.Number), BrinkDepth: numfmt.JSON(d.Brink), Y1: numfmt.JSON(d.ToeDepth),
					PoolDepth: numfmt.JSON(d.PoolDepth), DropLength: numfmt.JSON(d.Length), SequentDepth: numfmt.JSON(d.SequentDepth),
					EnergyLoss: numfmt.JSON(d.EnergyLoss), Drowned: d.Drowned, Method: d.Method, Validity: d.Validity,
				})
			}
			for _, st := range rr.Structures {
				rj.Structures = append(rj.Structures, structureJSON{
					Kind: string(st.Kind), Name: st.Name, Station: numfmt.JSON(st.Station), State: st.State,
					Method: st.Method, Validity: st.Validity, Coefficient: numfmt.JSON(st.Coefficient),
					HeadLoss: numfmt.JSON(st.HeadLoss), UpstreamDepth: numfmt.JSON(st.UpstreamDepth), DownstreamDepth: numfmt.JSON(st.DownstreamDepth),
				})
			}
			for _, n := range rr.Notes {
				rj.Notes = append(rj.Notes, noteJSON{Kind: string(n.Kind), Station: numfmt.JSON(n.Station), Message: n.Message})
			}
			ej.Reaches = append(ej.Reaches, rj)
		}
		doc.Events = append(doc.Events, ej)
	}
	return writeIndentedJSON(w, doc)
}

// csvHeader is the header row of `solve --format csv` for a model in
// units u: each column of a quantity with a unit names it after an
// underscore ("depth_m", "velocity_ft_s"), so that a spreadsheet keeps
// the unit with the number; the Froude number has none.
func csvHeader(u model.Units) []string {
	l := u.Length()
	v := l + "_s"
	return []string{"event", "reach", "station_" + l, "invert_" + l, "depth_" + l, "wse_" + l, "velocity_" + v,
		"froude", "energy_" + l, "critical_depth_" + l, "normal_depth_" + l, "regime"}
}

// writeSolveCSV writes one row per computed point; normal_depth is empty
// where no normal depth exists.
func writeSolveCSV(w io.Writer, u model.Units, res *solver.Result) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(csvHeader(u)); err != nil {
		return err
	}
	num := func(x float64) string { return numfmt.Decimals(x, numfmt.JSONDecimals) }
	for _, ev := range res.Events {
		for _, rr := range ev.Reaches {
			for _, p := range rr.Points {
				normal := ""
				if p.HasNormal {
					normal = num(p.NormalDepth)
				}
				// Names are a submittal's text: a cell starting with = + - @
				// would run as a formula in a spreadsheet.
				row := []string{safetext.CSVCell(ev.Event.Name), safetext.CSVCell(rr.Reach.Name), num(p.Station), num(p.Invert),
					num(p.Depth), num(p.WSE), num(p.Velocity), num(p.Froude), num(p.Energy),
					num(p.CriticalDepth), normal, string(p.Regime)}
				if err := cw.Write(row); err != nil {
					return err
				}
			}
		}
	}
	cw.Flush()
	return cw.Error()
}

// writeSolveTable prints each event and reach as a header block and the
// computed points in aligned columns with their units.
func writeSolveTable(w io.Writer, file string, m *model.Model, res *solver.Result) {
	L := m.Units.Length()
	title := file
	if m.Title != "" {
		title = m.Title + " — " + file
	}
	fmt.Fprintf(w, "%s (units: %s; lengths in %s, discharge in %s³/s)\n", safetext.Text(title), m.Units, L, L)
	fmt.Fprintln(w, "columns: wse water surface, energy energy grade, yc critical depth, yn normal depth (— where none)")
	for _, a := range res.Assumptions() {
		fmt.Fprintf(w, "assumption: %s\n", a)
	}
	for _, ev := range res.Events {
		fmt.Fprintf(w, "\nevent %s\n", tableName(ev.Event.Name))
		for _, rr := range ev.Reaches {
			writeReachTable(w, rr, L)
		}
		writeCulvertTable(w, ev.Culverts, L)
	}
	fmt.Fprintf(w, "\n%s\n", rules.Caution)
}

func writeReachTable(w io.Writer, rr *solver.ReachResult, L string) {
	profiles := strings.Join(rr.ProfileTypes(), ", ")
	if profiles == "" {
		profiles = "none"
	}
	fmt.Fprintf(w, "\n  reach %s: Q = %s %s³/s, %s slope (S0 = %s), profiles %s, %s\n",
		tableName(rr.Reach.Name), numfmt.Fixed(rr.Discharge, 3), L, rr.SlopeClass,
		numfmt.Decimals(rr.Reach.Slope, 6), profiles, plural(len(rr.Jumps), "jump", "jumps"))
	if len(rr.Profiles) > 1 {
		var spans []string
		for _, p := range rr.Profiles {
			spans = append(spans, fmt.Sprintf("%s %s–%s", p.Type, numfmt.Decimals(p.FromStation, 2), numfmt.Decimals(p.ToStation, 2)))
		}
		fmt.Fprintf(w, "    profile spans: %s %s\n", strings.Join(spans, ", "), L)
	}
	// A reach with a points section gets the velocities of its left
	// overbank, main channel and right overbank (conveyance split).
	zoned := false
	for i := range rr.Points {
		if _, ok := rr.Zones(&rr.Points[i]); ok {
			zoned = true
			break
		}
	}
	t := &table{}
	names := []string{"station", "invert", "depth", "wse", "velocity", "froude", "energy", "yc", "yn"}
	units := []string{L, L, L, L, L + "/s", "", L, L, L}
	if zoned {
		names = append(names, "v left", "v main", "v right")
		units = append(units, L+"/s", L+"/s", L+"/s")
		fmt.Fprintln(w, "    v left, v main, v right: velocity of the left overbank, main channel and right overbank, V = Q·K_i/(K·A_i) (— where dry or not a points section)")
	}
	t.header(append(names, "regime"), append(units, ""))
	for i := range rr.Points {
		p := &rr.Points[i]
		yn := "—"
		if p.HasNormal {
			yn = numfmt.Fixed(p.NormalDepth, 3)
		}
		row := []string{numfmt.Fixed(p.Station, 2), numfmt.Fixed(p.Invert, 3), numfmt.Fixed(p.Depth, 3), numfmt.Fixed(p.WSE, 3),
			numfmt.Fixed(p.Velocity, 3), numfmt.Fixed(p.Froude, 3), numfmt.Fixed(p.Energy, 3),
			numfmt.Fixed(p.CriticalDepth, 3), yn}
		if zoned {
			z, ok := rr.Zones(p)
			for k := range 3 {
				cell := "—"
				if ok && z.Area[k] > 0 {
					cell = numfmt.Fixed(z.Velocity[k], 3)
				}
				row = append(row, cell)
			}
		}
		t.row(append(row, string(p.Regime))...)
	}
	t.write(w, "    ")
	for _, j := range rr.Jumps {
		fmt.Fprintf(w, "    jump at %s %s: depth %s → %s %s, F1 = %s, %s, length %s %s, energy loss %s %s\n",
			numfmt.Fixed(j.Station, 2), L, numfmt.Fixed(j.UpstreamDepth, 3), numfmt.Fixed(j.DownstreamDepth, 3), L,
			numfmt.Fixed(j.Froude, 2), j.Type, numfmt.Fixed(j.Length, 2), L, numfmt.Fixed(j.EnergyLoss, 3), L)
	}
	for _, d := range rr.Drops {
		state := "jump below it checked by the jump rules"
		if d.Drowned {
			state = "drowned against the drop face"
		}
		fmt.Fprintf(w, "    drop from %s at %s %s: height %s %s, drop number %s, y1 %s %s, pool depth %s %s, drop length %s %s, sequent depth %s %s; %s\n",
			d.From, numfmt.Fixed(d.Station, 2), L, numfmt.Fixed(d.Height, 3), L, numfmt.Decimals(d.Number, 4), numfmt.Fixed(d.ToeDepth, 3), L,
			numfmt.Fixed(d.PoolDepth, 3), L, numfmt.Fixed(d.Length, 2), L, numfmt.Fixed(d.SequentDepth, 3), L, state)
		fmt.Fprintf(w, "      method: %s\n      validity: %s\n", d.Method, d.Validity)
	}
	for _, st := range rr.Structures {
		what := string(st.Kind)
		if st.Name != "" {
			what += " " + st.Name
		}
		fmt.Fprintf(w, "    %s at %s %s: %s, depths %s → %s %s, head loss %s %s\n",
			what, numfmt.Fixed(st.Station, 2), L, st.State, numfmt.Fixed(st.UpstreamDepth, 3), numfmt.Fixed(st.DownstreamDepth, 3), L,
			numfmt.Fixed(st.HeadLoss, 3), L)
		fmt.Fprintf(w, "      method: %s\n      validity: %s\n", st.Method, st.Validity)
	}
	for _, n := range rr.Notes {
		fmt.Fprintf(w, "    note at %s %s (%s): %s\n", numfmt.Fixed(n.Station, 2), L, n.Kind, n.Message)
	}
}

// writeCulvertTable prints one performance row per culvert of the event.
func writeCulvertTable(w io.Writer, culverts []*solver.CulvertResult, L string) {
	if len(culverts) == 0 {
		return
	}
	fmt.Fprintf(w, "\n  culverts (FHWA HDS-5; headwater levels, HW/D over the rise):\n")
	t := &table{}
	t.header([]string{"culvert", "headwater", "HW/D", "inlet ctl", "outlet ctl", "barrel Q", "road Q", "over road", "outlet y", "outlet V", "control"},
		[]string{"", L, "", L, L, L + "³/s", L + "³/s", L, L, L + "/s", ""})
	for _, c := range culverts {
		t.row(tableName(c.Culvert.Name), numfmt.Fixed(c.Headwater, 3), numfmt.Fixed(c.HWD, 2), numfmt.Fixed(c.InletHeadwater, 3), numfmt.Fixed(c.OutletHeadwater, 3),
			numfmt.Fixed(c.BarrelFlow, 3), numfmt.Fixed(c.RoadFlow, 3), numfmt.Fixed(c.RoadDepth, 3), numfmt.Fixed(c.OutletDepth, 3), numfmt.Fixed(c.OutletVelocity, 3),
			string(c.Control))
	}
	t.write(w, "    ")
	for _, c := range culverts {
		for _, n := range c.Notes {
			fmt.Fprintf(w, "    note: %s\n", n)
		}
	}
}

// table aligns columns: every column but the last is right-aligned (the
// last, a word, is left-aligned). The first rows are headers.
// tableNameWidth bounds a name in the solve table, in characters, so that
// a very long name cannot push the values off the screen.
const tableNameWidth = 40

// tableName is a submittal's name as the table prints it: neutralised and
// shortened in the middle to tableNameWidth.
func tableName(s string) string { return safetext.Clip(safetext.Text(s), tableNameWidth) }

type table struct {
	rows    [][]string
	headers int
}

func (t *table) header(rows ...[]string) {
	for _, r := range rows {
		for i, c := range r {
			if c != "" && t.headers > 0 && i < len(r)-1 {
				r[i] = "(" + c + ")"
			}
		}
		t.rows = append(t.rows, r)
		t.headers++
	}
}

func (t *table) row(cells ...string) { t.rows = append(t.rows, cells) }

func (t *table) write(w io.Writer, indent string) {
	if len(t.rows) == 0 {
		return
	}
	widths := make([]int, len(t.rows[0]))
	for _, r := range t.rows {
		for i, c := range r {
			widths[i] = max(widths[i], utf8.RuneCountInString(c))
		}
	}
	last := len(widths) - 1
	for _, r := range t.rows {
		var b strings.Builder
		b.WriteString(indent)
		for i, c := range r {
			pad := strings.Repeat(" ", widths[i]-utf8.RuneCountInString(c))
			switch {
			case i == last:
				b.WriteString(c)
			default:
				b.WriteString(pad + c + "  ")
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
}
