package solver

import (
	"fmt"
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"pgregory.net/rapid"
)

// mildChannel is a prismatic channel on a mild slope whose outlet depth is
// set relative to the normal and critical depths of the discharge.
type mildChannel struct {
	units  model.Units
	shape  int // 0 rectangle, 1 trapezoid, 2 triangle
	b, z   float64
	n, s0  float64
	q      float64
	length float64
	t      float64 // outlet depth as yc + t·(yn − yc) (M2 for t < 1) or yn·t (M1 for t > 1)
}

func drawMildChannel(t *rapid.T) mildChannel {
	c := mildChannel{
		shape:  rapid.IntRange(0, 2).Draw(t, "shape"),
		b:      rapid.Float64Range(0.5, 20).Draw(t, "b"),
		z:      rapid.Float64Range(0.5, 3).Draw(t, "z"),
		n:      rapid.Float64Range(0.012, 0.05).Draw(t, "n"),
		s0:     rapid.Float64Range(0.0001, 0.002).Draw(t, "s0"),
		q:      rapid.Float64Range(0.5, 100).Draw(t, "q"),
		length: rapid.Float64Range(200, 5000).Draw(t, "length"),
		t:      rapid.SampledFrom([]float64{0, 0.3, 0.7, 1.05, 1.3, 2}).Draw(t, "t"),
	}
	if rapid.Bool().Draw(t, "us") {
		c.units = model.US
	} else {
		c.units = model.SI
	}
	return c
}

func (c mildChannel) section() *model.Section {
	s := &model.Section{Name: "s", Height: 1e3, Roughness: [3]float64{c.n, c.n, c.n}}
	switch c.shape {
	case 0:
		s.Shape, s.BottomWidth = model.Rectangle, c.b
	case 1:
		s.Shape, s.BottomWidth, s.SideSlope = model.Trapezoid, c.b, c.z
	default:
		s.Shape, s.SideSlope = model.Triangle, c.z
	}
	return s
}

// text is the model with the given max_spacing (0: none) and an outlet
// depth y.
func (c mildChannel) text(spacing, y float64) string {
	s := c.section()
	shape := fmt.Sprintf("  shape = %q\n", s.Shape)
	switch s.Shape {
	case model.Rectangle:
		shape += fmt.Sprintf("  bottom_width = %.17g\n", c.b)
	case model.Trapezoid:
		shape += fmt.Sprintf("  bottom_width = %.17g\n  side_slope = %.17g\n", c.b, c.z)
	default:
		shape += fmt.Sprintf("  side_slope = %.17g\n", c.z)
	}
	sp := ""
	if spacing > 0 {
		sp = fmt.Sprintf("  max_spacing = %.17g\n", spacing)
	}
	return fmt.Sprintf(`units = %q
section "s" {
%s  height = 1000
  roughness = %.17g
}
reach "r" {
  from = "a"
  to = "b"
  length = %.17g
  section = "s"
  slope = %.17g
%s}
event "e" {
  inflow = { r = %.17g }
  outlet = { depth = %.17g }
}
`, c.units, shape, c.n, c.length, c.s0, sp, c.q, y)
}

// outletDepth places the outlet depth between critical and normal depth
// (an M2 drawdown) or above normal depth (an M1 backwater).
func (c mildChannel) outletDepth(t *rapid.T) (y, yc, yn float64) {
	g := NewGeometry(c.section(), c.units)
	yc, err := CriticalDepth(g, c.q)
	if err != nil {
		t.Fatalf("critical depth: %v", err)
	}
	yn, err = NormalDepth(g, c.q, c.s0)
	if err != nil {
		t.Fatalf("normal depth: %v", err)
	}
	if !(yn > yc*1.05) {
		t.Skip("not clearly mild")
	}
	if c.t < 1 {
		return yc + c.t*(yn-yc), yc, yn
	}
	return yn * c.t, yc, yn
}

func solveText(t *rapid.T, src string) *ReachResult {
	m, diags := model.Parse("prop.chan.hcl", []byte(src))
	if diags.HasErrors() {
		t.Fatalf("invalid model: %s\n%s", diags.Error(), src)
	}
	res, err := Solve(m, Options{})
	if err != nil {
		t.Fatalf("Solve: %v", err)
	}
	return res.Events[0].Reaches[0]
}

// TestMildProfilesMonotone: on a mild slope the gradually-varied-flow
// equation dy/dx = (S0 − Sf)/(1 − F²) has a fixed sign in each zone: in
// an M1 profile (y > yn > yc) the depth rises downstream, in an M2 profile
// (yn > y > yc) it falls downstream. Every computed point of an M1 or M2
// span must follow that order.
//
// Source: Chow, Open-Channel Hydraulics (1959), §9-2 and Fig. 9-1
// (from memory).
func TestMildProfilesMonotone(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		c := drawMildChannel(t)
		y, yc, yn := c.outletDepth(t)
		src := c.text(0, y)
		rr := solveText(t, src)
		want := "M1"
		if c.t < 1 {
			want = "M2"
		}
		found := false
		for _, sp := range rr.Profiles {
			if sp.Type != "M1" && sp.Type != "M2" {
				continue
			}
			found = found || sp.Type == want
			prev := math.NaN()
			for _, p := range rr.Points {
				if p.Station < sp.FromStation || p.Station > sp.ToStation {
					continue
				}
				if !math.IsNaN(prev) {
					// Depths are closed to 1e-7 of the unit; allow that.
					if sp.Type == "M1" && p.Depth < prev-1e-7 {
						t.Fatalf("M1 depth falls from %.9g to %.9g at station %.6g (yn %.6g, yc %.6g)\n%s", prev, p.Depth, p.Station, yn, yc, src)
					}
					if sp.Type == "M2" && p.Depth > prev+1e-7 {
						t.Fatalf("M2 depth rises from %.9g to %.9g at station %.6g (yn %.6g, yc %.6g)\n%s", prev, p.Depth, p.Station, yn, yc, src)
					}
				}
				prev = p.Depth
			}
		}
		if !found {
			t.Fatalf("no %s span in %v (outlet %.6g, yn %.6g, yc %.6g)\n%s", want, rr.Profiles, y, yn, yc, src)
		}
	})
}

// TestRefiningSpacingConverges: halving max_spacing brings the computed
// profile closer and closer to the converged one. With h a quarter of the
// reach, the depth at the upstream end computed with spacings h, h/2, h/4
// and h/8 is compared with a reference computed at h/64: the error may
// not grow as the spacing shrinks (beyond the local error the step control
// allows in one step, stepRelTol of the depth: where the step control,
// not the spacing, sets the steps, halving the spacing moves a few steps
// and the result by about that much),
// and no gap between points may exceed the spacing asked for (but for the
// 0.1 % end snap of the stepper). (Where the
// step control already takes shorter steps than the spacing, the result
// does not change at all.)
//
// Source: common practice (no published source): a consistent
// second-order scheme converges as its step shrinks; the reference is the
// same scheme refined, checked against independent quadrature in
// TestProfileAgainstQuadrature.
func TestRefiningSpacingConverges(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		c := drawMildChannel(t)
		y, _, _ := c.outletDepth(t)
		h := c.length / 4
		spacings := []float64{h, h / 2, h / 4, h / 8, h / 64}
		up := make([]float64, len(spacings))
		for i, sp := range spacings {
			rr := solveText(t, c.text(sp, y))
			up[i] = rr.Points[0].Depth
			for j := 1; j < len(rr.Points); j++ {
				// The stepper takes the rest of a run whole when it is
				// within 0.1 % of the step (stepper.step), so a gap may
				// exceed the spacing by that much (reported: it should not).
				if gap := rr.Points[j].Station - rr.Points[j-1].Station; gap > sp*1.001 {
					t.Fatalf("max_spacing %.6g: points %.6g apart at station %.6g", sp, gap, rr.Points[j].Station)
				}
			}
		}
		ref := up[len(up)-1]
		prev := math.Inf(1)
		for i := range len(spacings) - 1 {
			e := math.Abs(up[i] - ref)
			if e > prev+stepRelTol*ref {
				t.Fatalf("error grows from %.3g to %.3g as max_spacing goes from %.6g to %.6g (depths %v)\n%s",
					prev, e, spacings[i-1], spacings[i], up, c.text(spacings[i], y))
			}
			prev = e
		}
		// The coarsest result is within the step control's accuracy:
		// 2e-5 of the depth per step, accumulated over at most a few tens
		// of steps.
		if e := math.Abs(up[0] - ref); e > 1e-3*ref {
			t.Fatalf("coarse and fine spacing differ by %.3g at depth %.6g\n%s", e, ref, c.text(h, y))
		}
	})
}
