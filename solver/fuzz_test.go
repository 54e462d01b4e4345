package solver

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
)

// fuzzInput turns fuzz bytes into bounded parameters: each read takes the
// next byte (zero once the bytes run out), so every input decodes to a
// valid model.
type fuzzInput struct {
	b []byte
	i int
}

func (f *fuzzInput) byte() byte {
	if f.i >= len(f.b) {
		return 0
	}
	c := f.b[f.i]
	f.i++
	return c
}

// frac is a number in [0, 1] from two bytes.
func (f *fuzzInput) frac() float64 {
	return float64(uint16(f.byte())<<8|uint16(f.byte())) / 65535
}

// in is a number in [lo, hi].
func (f *fuzzInput) in(lo, hi float64) float64 { return lo + (hi-lo)*f.frac() }

// logIn is a number in [lo, hi] spread evenly on a log scale.
func (f *fuzzInput) logIn(lo, hi float64) float64 {
	return math.Exp(math.Log(lo) + (math.Log(hi)-math.Log(lo))*f.frac())
}

// pick is an index in [0, n).
func (f *fuzzInput) pick(n int) int { return int(f.byte()) % n }

// fuzzModel is the HCL text of a model decoded from fuzz bytes: one to
// three reaches (single, chain of two, or two reaches joining a third),
// every shape, beds from adverse to steep, optional segments, a gate or an
// entrance depth on a headwater reach, and every outlet control. Sizes are
// kept in the range of real channels (in metres or feet).
func fuzzModel(data []byte) string {
	f := &fuzzInput{b: data}
	var b strings.Builder
	units := "si"
	if f.pick(2) == 1 {
		units = "us"
	}
	fmt.Fprintf(&b, "units = %q\n", units)
	for i := range 3 {
		writeFuzzSection(&b, f, fmt.Sprintf("s%d", i))
	}
	type reach struct{ name, from, to string }
	var reaches []reach
	switch f.pick(3) {
	case 0:
		reaches = []reach{{"main", "top", "out"}}
	case 1:
		reaches = []reach{{"upper", "top", "mid"}, {"main", "mid", "out"}}
	default:
		reaches = []reach{{"upper", "top", "mid"}, {"side", "side-top", "mid"}, {"main", "mid", "out"}}
	}
	outletSlope := 0.0
	for _, r := range reaches {
		length := f.logIn(5, 3000)
		slope := 0.0
		switch f.pick(6) {
		case 0:
			slope = -f.logIn(1e-5, 0.005) // adverse
		case 1: // horizontal
		case 2, 3:
			slope = f.logIn(1e-5, 0.005) // usually mild
		default:
			slope = f.logIn(0.005, 0.2) // usually steep
		}
		if r.name == "main" {
			outletSlope = slope
		}
		fmt.Fprintf(&b, "reach %q {\n  from = %q\n  to = %q\n  length = %.6g\n  section = \"s%d\"\n  slope = %.6g\n",
			r.name, r.from, r.to, length, f.pick(3), slope)
		if f.pick(4) == 0 {
			fmt.Fprintf(&b, "  max_spacing = %.6g\n", f.logIn(0.5, 500))
		}
		if f.pick(3) == 0 {
			a := f.in(0, 0.9) * length
			fmt.Fprintf(&b, "  segment {\n    from_station = %.6g\n    to_station = %.6g\n    section = \"s%d\"\n  }\n",
				a, a+f.in(0.01, 1)*(length-a), f.pick(3))
		}
		b.WriteString("}\n")
	}
	// A sluice gate or an entrance depth on the first headwater reach.
	control := f.pick(4)
	if control == 0 {
		fmt.Fprintf(&b, "gate \"g\" {\n  reach = \"%s\"\n  opening = %.6g\n", reaches[0].name, f.logIn(0.05, 2))
		if f.pick(2) == 0 {
			fmt.Fprintf(&b, "  contraction = %.4g\n", f.in(0.5, 1))
		}
		b.WriteString("}\n")
	}
	// Local losses: at the junction node, and a model-wide default.
	if len(reaches) > 1 && f.pick(3) == 0 {
		fmt.Fprintf(&b, "loss \"node\" {\n  node = \"mid\"\n  contraction = %.4g\n  expansion = %.4g\n}\n", f.in(0, 1), f.in(0, 2))
	}
	if f.pick(3) == 0 {
		fmt.Fprintf(&b, "loss \"default\" {\n  contraction = %.4g\n  expansion = %.4g\n}\n", f.in(0, 1), f.in(0, 2))
	}
	b.WriteString("event \"e\" {\n  inflow = {")
	for i, r := range reaches {
		if r.name == "main" && len(reaches) > 1 && f.pick(2) == 0 {
			continue
		}
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, " %q = %.6g", r.name, f.logIn(0.01, 300))
	}
	b.WriteString(" }\n")
	switch k := f.pick(4); {
	case k == 0 && outletSlope > 0:
		b.WriteString("  outlet = { condition = \"normal\" }\n")
	case k == 1:
		b.WriteString("  outlet = { condition = \"critical\" }\n")
	case k == 2:
		fmt.Fprintf(&b, "  outlet = { elevation = %.6g }\n", f.in(0.01, 8))
	default:
		fmt.Fprintf(&b, "  outlet = { depth = %.6g }\n", f.logIn(0.02, 8))
	}
	if control == 1 {
		fmt.Fprintf(&b, "  entrance = { %q = %.6g }\n", reaches[0].name, f.logIn(0.01, 5))
	}
	b.WriteString("}\n")
	return b.String()
}

func writeFuzzSection(b *strings.Builder, f *fuzzInput, name string) {
	n := f.in(0.010, 0.08)
	fmt.Fprintf(b, "section %q {\n", name)
	switch f.pick(5) {
	case 0:
		fmt.Fprintf(b, "  shape = \"rectangle\"\n  bottom_width = %.6g\n  height = %.6g\n", f.logIn(0.2, 40), f.in(0.3, 8))
	case 1:
		fmt.Fprintf(b, "  shape = \"trapezoid\"\n  bottom_width = %.6g\n  side_slope = %.4g\n  height = %.6g\n",
			f.logIn(0.2, 40), f.in(0.1, 4), f.in(0.3, 8))
	case 2:
		fmt.Fprintf(b, "  shape = \"triangle\"\n  side_slope = %.4g\n  height = %.6g\n", f.in(0.3, 4), f.in(0.3, 8))
	case 3:
		fmt.Fprintf(b, "  shape = \"circle\"\n  diameter = %.6g\n", f.in(0.3, 5))
	default:
		w := f.in(2, 20)
		d := f.in(0.5, 3)
		ob := f.in(2, 40)
		fmt.Fprintf(b, "  shape = \"points\"\n  points = [[0, %.6g], [%.6g, %.6g], [%.6g, %.6g], [%.6g, 0], [%.6g, %.6g], [%.6g, %.6g], [%.6g, %.6g]]\n",
			d+1.5, ob, d+0.5, ob+1, d, ob+1+w/2, ob+1+w, d, ob+2+w, d+0.5, 2*ob+2+w, d+1.5)
		fmt.Fprintf(b, "  banks = [%.6g, %.6g]\n  roughness = [%.4g, %.4g, %.4g]\n  lining = \"earth\"\n}\n",
			ob+1, ob+1+w, f.in(0.03, 0.1), n, f.in(0.03, 0.1))
		return
	}
	fmt.Fprintf(b, "  roughness = %.4g\n  lining = \"concrete\"\n}\n", n)
}

// FuzzSolve solves models generated from fuzz bytes (see fuzzModel) and
// checks the physics of the output rather than particular numbers:
//   - every number finite and no value replaced by sanitize;
//   - depths positive, stations ordered within the reach;
//   - the standard-step energy equation closed between neighbouring points
//     of one regime and one section with no jump or note between them
//     (checkEnergyClosure);
//   - equal specific force across every jump, the toe supercritical and
//     the end subcritical;
//   - discharge conserved at junctions.
//
// Run: go test ./solver -run '^$' -fuzz '^FuzzSolve$' -fuzztime 4m
func FuzzSolve(f *testing.F) {
	f.Add([]byte{})
	f.Add([]byte("mild backwater behind a depth control"))
	f.Add([]byte{1, 0, 0, 0, 200, 9, 9, 1, 40, 40, 40, 0, 40, 2, 2, 2, 2, 4, 0, 0, 0, 9, 200, 1, 0, 0, 3, 3})
	f.Add([]byte{0, 1, 128, 0, 128, 0, 20, 0, 3, 1, 128, 0, 128, 0, 128, 0, 4, 200, 0, 128, 5, 5, 5, 0, 0, 255, 255, 0, 0, 30, 0})
	for i := range 8 {
		seed := make([]byte, 96)
		for j := range seed {
			seed[j] = byte((j*37 + i*101) ^ (i * 13))
		}
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		src := fuzzModel(data)
		m, diags := model.Parse("fuzz.chan.hcl", []byte(src))
		if diags.HasErrors() {
			t.Fatalf("the generator made an invalid model: %s\n%s", diags.Error(), src)
		}
		res, err := Solve(m, Options{MaxPoints: 200_000})
		if errors.Is(err, ErrTooManyPoints) {
			return // a limit, reported as such
		}
		if err != nil {
			t.Fatalf("Solve: %v\n%s", err, src)
		}
		checkSolved(t, m, res, src)
	})
}

// jumpForceTol is the relative tolerance on the specific force across a
// jump. The toe is located by Brent's method on the force difference with
// a station tolerance of 1e-10 of the length and depths closed to 1e-7, so
// the two forces agree to about 1e-6; this allows ten times that.
const jumpForceTol = 1e-5

// checkSolved applies the physical checks of FuzzSolve to a result.
func checkSolved(t *testing.T, m *model.Model, res *Result, src string) {
	t.Helper()
	requireFinite(t, res)
	for _, er := range res.Events {
		for _, rr := range er.Reaches {
			for _, n := range rr.Notes {
				if strings.Contains(n.Message, "not a finite number") {
					t.Fatalf("reach %s: sanitize replaced a value: %s\n%s", rr.Reach.Name, n.Message, src)
				}
			}
			if rr.Discharge > 0 {
				for _, p := range rr.Points {
					if !(p.Depth > 0) {
						t.Fatalf("reach %s: depth %v at station %v\n%s", rr.Reach.Name, p.Depth, p.Station, src)
					}
					if p.Station < -1e-9 || p.Station > rr.Reach.Length*(1+1e-12)+1e-9 {
						t.Fatalf("reach %s: station %v outside [0, %v]", rr.Reach.Name, p.Station, rr.Reach.Length)
					}
				}
			}
			checkEnergyClosure(t, m.Units, rr, src)
			checkJumps(t, m.Units, rr, src, jumpForceTol)
		}
		checkJunctions(t, er, src)
		checkHeldAtJunction(t, m.Units, er, src)
	}
}

// checkEnergyClosure recomputes the standard step between neighbouring
// points i and i+1 of one regime from the output fields alone:
//
//	(z + y + αV²/2g)_i − (z + y + αV²/2g)_{i+1} = Δx·(Sf_i + Sf_{i+1})/2
//
// (Chow 1959, §10-3, the energy equation with the mean friction slope).
// Pairs are skipped where the section changes (a transition without
// friction), where a jump, a note or a critical point lies in between,
// and at coincident stations. The solver closes the equation on the depth
// to 1e-7 (DefaultTolerance); the energy residual is that times |dH/dy| =
// |1 − F² ± Δx/2·dSf/dy| at the unknown point, so the tolerance allowed is
// 1e-6·(1 + F² + Δx·Sf/y) with a floor of 1e-9 of the energy head.
func checkEnergyClosure(t *testing.T, u model.Units, rr *ReachResult, src string) {
	t.Helper()
	pts := rr.Points
	for i := 0; i+1 < len(pts); i++ {
		a, c := pts[i], pts[i+1]
		dx := c.Station - a.Station
		if dx <= 0 || a.Section != c.Section || a.Regime != c.Regime || a.Regime == Critical {
			continue
		}
		if blocked(rr, a.Station, c.Station) {
			continue
		}
		lhs := a.Energy - c.Energy
		rhs := dx * (a.FrictionSlope + c.FrictionSlope) / 2
		fr2 := math.Max(a.Froude*a.Froude, c.Froude*c.Froude)
		sfy := math.Max(a.FrictionSlope/a.Depth, c.FrictionSlope/c.Depth)
		tol := 1e-6*(1+fr2+dx*sfy) + 1e-9*math.Abs(a.Energy)
		if math.Abs(lhs-rhs) > tol {
			t.Fatalf("reach %s (%s): energy not closed between stations %.9g and %.9g (%s): head loss %.9g, friction %.9g, residual %.3g > %.3g\ndepths %.9g %.9g\n%s",
				rr.Reach.Name, u, a.Station, c.Station, a.Regime, lhs, rhs, lhs-rhs, tol, a.Depth, c.Depth, src)
		}
	}
}

// blocked reports whether a jump or a note lies in [x0, x1].
func blocked(rr *ReachResult, x0, x1 float64) bool {
	for _, j := range rr.Jumps {
		if j.Station >= x0 && j.Station <= x1 {
			return true
		}
	}
	for _, n := range rr.Notes {
		if n.Station >= x0 && n.Station <= x1 {
			return true
		}
	}
	return false
}

// checkJumps: the specific force M = Q²/(gA) + A·z̄ is the same on both
// sides of a hydraulic jump in a prismatic channel (Chow 1959, ch. 3 and
// 15); the toe is supercritical and the end subcritical.
func checkJumps(t *testing.T, u model.Units, rr *ReachResult, src string, tol float64) {
	t.Helper()
	for _, j := range rr.Jumps {
		if heldByNote(rr, j.Station) {
			// A jump held at a junction (checkHeldAtJunction verifies it
			// truly stays there) or at the start of the subcritical
			// profile in a points section: its depths are the two
			// profiles there, not a sequent pair, as its note says.
			continue
		}
		if atSectionChange(rr.Reach, j.Station) {
			// A jump held at an abrupt change of section: the change
			// takes up the difference of the forces, which are not equal.
			continue
		}
		g := NewGeometry(rr.Reach.SectionAt(j.Station), u)
		m1, m2 := SpecificForce(g, rr.Discharge, j.UpstreamDepth), SpecificForce(g, rr.Discharge, j.DownstreamDepth)
		if math.Abs(m1-m2) > tol*math.Max(m1, m2) {
			t.Fatalf("reach %s: jump at %.9g: specific force %.9g upstream, %.9g downstream\n%s", rr.Reach.Name, j.Station, m1, m2, src)
		}
		if !(j.UpstreamDepth < j.DownstreamDepth) || !(j.Froude > 1) {
			t.Fatalf("reach %s: jump at %.9g from %.9g to %.9g with F1 = %.6g\n%s", rr.Reach.Name, j.Station, j.UpstreamDepth, j.DownstreamDepth, j.Froude, src)
		}
		if j.Station < 0 || j.Station > rr.Reach.Length {
			t.Fatalf("reach %s: jump at %.9g outside the reach", rr.Reach.Name, j.Station)
		}
	}
}

// atSectionChange reports whether a segment of r starts or ends at x.
func atSectionChange(r *model.Reach, x float64) bool {
	eps := 1e-9 * math.Max(r.Length, 1)
	for _, sg := range r.Segments {
		if math.Abs(sg.FromStation-x) <= eps || math.Abs(sg.ToStation-x) <= eps {
			return true
		}
	}
	return false
}

// heldByNote reports whether the note of a held jump sits at station x.
func heldByNote(rr *ReachResult, x float64) bool {
	for _, n := range rr.Notes {
		if n.Kind == NoteInfo && strings.Contains(n.Message, "the jump is held") && n.Station == x {
			return true
		}
	}
	return false
}

// checkJunctions: the discharge of a reach is its own inflow plus the
// discharges of the reaches that end at its upstream node.
func checkJunctions(t *testing.T, er *EventResult, src string) {
	t.Helper()
	own := map[*model.Reach]float64{}
	for _, in := range er.Event.Inflows {
		own[in.Reach] += in.Discharge
	}
	for _, rr := range er.Reaches {
		q := own[rr.Reach]
		for _, up := range rr.Reach.Upstream {
			q += er.Reaches[up.Index].Discharge
		}
		if math.Abs(q-rr.Discharge) > 1e-12*math.Max(q, 1) {
			t.Fatalf("reach %s carries %.12g, inflow plus upstream is %.12g\n%s", rr.Reach.Name, rr.Discharge, q, src)
		}
	}
}

// checkHeldAtJunction: a jump the solver holds at a junction (station 0
// of the outgoing reach, with its note) must truly stay there: every
// incoming reach that arrives supercritical must hold against the
// junction's level in its own section, that is, either the junction's
// energy grade elevation H is below its critical energy (no subcritical
// flow at its end to jump to) or its supercritical depth has at least the
// specific force of the subcritical depth with energy H. Otherwise the
// jump belonged inside that incoming reach. H is the energy of the first
// non-supercritical point at station 0 of the outgoing reach; the
// subcritical depth with energy H is found here by bisection on
// y + α(y)·V²/2g above critical depth.
//
// Source: a jump forms where the specific forces of the supercritical and
// subcritical flows are equal (Chow 1959, ch. 3 and §10-3, from memory);
// energy balance without loss at a junction (Chow 1959, §10-3, from
// memory).
func checkHeldAtJunction(t *testing.T, u model.Units, er *EventResult, src string) {
	t.Helper()
	for _, rr := range er.Reaches {
		held := false
		for _, n := range rr.Notes {
			held = held || (n.Kind == NoteControl && n.Station == 0 && strings.Contains(n.Message, "the jump is held at the junction"))
		}
		if !held {
			continue
		}
		h, ok := 0.0, false
		for _, p := range rr.Points {
			if p.Station > 0 {
				break
			}
			if p.Regime != Supercritical {
				h, ok = p.Energy, true
				break
			}
		}
		if !ok {
			t.Fatalf("reach %s: a jump held at the junction without subcritical flow at station 0\n%s", rr.Reach.Name, src)
		}
		for _, up := range rr.Reach.Upstream {
			ur := er.Reaches[up.Index]
			if len(ur.Points) == 0 {
				continue
			}
			last := ur.Points[len(ur.Points)-1]
			if last.Regime != Supercritical {
				continue
			}
			g := NewGeometry(last.Section, u)
			q := ur.Discharge
			energy := func(y float64) float64 {
				pr := g.Props(y)
				v := q / pr.Area
				return y + pr.Alpha*v*v/(2*g.G())
			}
			e := h - last.Invert
			yc := last.CriticalDepth
			if e <= energy(yc)*(1+1e-6) {
				continue // no subcritical flow at the end of the incoming reach
			}
			hi := 2 * yc
			for i := 0; i < 60 && energy(hi) < e; i++ {
				hi *= 2
			}
			ySub := bisect(func(y float64) float64 { return energy(y) - e }, yc, hi)
			mSup := SpecificForce(g, q, last.Depth)
			// The solver closes depths to 1e-7: allow the force that far
			// on either side of the subcritical depth.
			d := 1e-6 * math.Max(ySub, 1)
			mSub := math.Min(SpecificForce(g, q, ySub-d), SpecificForce(g, q, ySub+d))
			if mSup < mSub*(1-1e-6) {
				t.Fatalf("reach %s: jump held at junction %q, but incoming reach %s arrives supercritical (depth %.9g, force %.9g) where its subcritical depth %.9g with the junction's energy has the greater force %.9g: the jump belongs inside %s\n%s",
					rr.Reach.Name, rr.Reach.From, ur.Reach.Name, last.Depth, mSup, ySub, mSub, ur.Reach.Name, src)
			}
		}
	}
}
