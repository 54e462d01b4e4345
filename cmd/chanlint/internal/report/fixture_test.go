package report

import (
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
	"github.com/stretchr/testify/require"
)

// loadModel parses a model of testdata.
func loadModel(t testing.TB, name string) *model.Model {
	t.Helper()
	p := filepath.Join("testdata", name)
	src, err := os.ReadFile(p)
	require.NoError(t, err)
	m, diags := model.Parse(filepath.ToSlash(p), src)
	require.False(t, diags.HasErrors(), diags.Error())
	return m
}

// displayResult builds a plausible solution for drawing: depths from the
// solver's normal and critical depths, blended towards a control with an
// exponential, and a jump at the sequent depth in a gated steep reach. It
// is a rendering fixture, not a profile computation: the report tests
// check what is drawn and escaped, never these numbers.
func displayResult(t testing.TB, m *model.Model) *solver.Result {
	t.Helper()
	res := &solver.Result{Model: m}
	for _, ev := range m.Events {
		er := &solver.EventResult{Event: ev}
		for _, r := range m.Reaches {
			q := ev.Discharge[r.Index]
			g := solver.NewGeometry(r.Section, m.Units)
			yc, err := solver.CriticalDepth(g, q)
			require.NoError(t, err)
			yn, err := solver.NormalDepth(g, q, r.Slope)
			if err != nil {
				yn = 1.4 * yc
			}
			rr := &solver.ReachResult{Reach: r, Discharge: q}
			const n = 60
			depth := func(s float64) float64 {
				if yn < yc && r.Gate != nil { // steep, gated: S3 below the gate, then S1 after a jump
					return yn - (yn-r.Gate.VenaContracta())*math.Exp(-s/12)
				}
				down := 1.15 * yc
				if r.Downstream == nil && ev.Outlet.Kind == model.OutletDepth {
					down = ev.Outlet.Value
				}
				if yn < yc {
					return yn
				}
				return yn + (down-yn)*math.Exp(-(r.Length-s)/(0.3*r.Length))
			}
			jumpAt := -1.0
			var y2 float64
			if yn < yc && r.Gate != nil {
				rr.SlopeClass = solver.Steep
				jumpAt = 0.6 * r.Length
				y2, err = solver.SequentDepth(g, q, depth(jumpAt))
				require.NoError(t, err)
				rr.Profiles = []solver.ProfileSpan{{Type: "S3", FromStation: 0, ToStation: jumpAt}, {Type: "S1", FromStation: jumpAt, ToStation: r.Length}}
			} else {
				rr.SlopeClass = solver.Mild
				rr.Profiles = []solver.ProfileSpan{{Type: "M1", FromStation: 0, ToStation: r.Length}}
			}
			add := func(s, y float64) {
				pr := g.Props(y)
				v := q / pr.Area
				fr := v / math.Sqrt(m.Units.Gravity()*pr.Area/pr.TopWidth)
				reg := solver.Subcritical
				if fr > 1 {
					reg = solver.Supercritical
				}
				inv := r.InvertAt(s)
				rr.Points = append(rr.Points, solver.Point{Station: s, Invert: inv, Depth: y, WSE: inv + y, Velocity: v, Froude: fr,
					Energy: inv + y + v*v/(2*m.Units.Gravity()), CriticalDepth: yc, NormalDepth: yn, HasNormal: true, Regime: reg,
					Section: r.SectionAt(s), Area: pr.Area, TopWidth: pr.TopWidth, HydraulicRadius: pr.HydraulicRadius, Alpha: 1})
			}
			for i := 0; i <= n; i++ {
				s := r.Length * float64(i) / n
				if jumpAt >= 0 && s > jumpAt {
					if len(rr.Jumps) == 0 {
						y1 := depth(jumpAt)
						add(jumpAt, y1)
						add(jumpAt, y2)
						pr := g.Props(y1)
						f1 := q / pr.Area / math.Sqrt(m.Units.Gravity()*pr.Area/pr.TopWidth)
						rr.Jumps = append(rr.Jumps, solver.Jump{Station: jumpAt, UpstreamDepth: y1, DownstreamDepth: y2, Froude: f1,
							Length: solver.JumpLength(y1, y2, f1), Type: solver.ClassifyJump(f1)})
					}
					add(s, y2+(s-jumpAt)*r.Slope*0.8)
					continue
				}
				add(s, depth(s))
			}
			er.Reaches = append(er.Reaches, rr)
		}
		res.Events = append(res.Events, er)
	}
	return res
}

// fixtureInput is the Heron Flats model with its display result, checked
// by the real rules against a policy of the test's own.
func fixtureInput(t testing.TB, names ...string) Input {
	t.Helper()
	p := testPolicy(t)
	in := Input{Policy: p, Caution: rules.Caution, ToolVersion: "0.1.0-test"}
	for _, name := range names {
		m := loadModel(t, name)
		res := displayResult(t, m)
		in.Models = append(in.Models, Model{Model: m, Result: res, Findings: rules.Check(m, res, p)})
	}
	return in
}

func testPolicy(t testing.TB) *policies.Policy {
	t.Helper()
	p, diags := rules.Language().Pack("baseline")
	require.False(t, diags.HasErrors(), diags.Error())
	return p
}
