package solver_test

import (
	"fmt"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
)

// Normal and critical depth of a trapezoidal channel in feet: b = 20 ft,
// side slopes 2:1, n = 0.025, S0 = 0.0016, Q = 400 ft³/s.
// Source: Chow, Open-Channel Hydraulics (1959), ch. 10, direct-step
// example: normal depth 3.36 ft, critical depth 2.15 ft (from memory).
func ExampleNormalDepth() {
	sec := &model.Section{Shape: model.Trapezoid, BottomWidth: 20, SideSlope: 2, Height: 10,
		Roughness: [3]float64{0.025, 0.025, 0.025}}
	g := solver.NewGeometry(sec, model.US)
	yn, err := solver.NormalDepth(g, 400, 0.0016)
	if err != nil {
		fmt.Println(err)
		return
	}
	yc, err := solver.CriticalDepth(g, 400)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("normal depth %.2f ft, critical depth %.2f ft, Froude number at normal depth %.2f\n",
		yn, yc, solver.FroudeNumber(g, 400, yn))
	// Output:
	// normal depth 3.36 ft, critical depth 2.15 ft, Froude number at normal depth 0.48
}

// The depth after a hydraulic jump in a rectangular channel 3 m wide
// carrying 12 m³/s from a depth of 0.4 m, and the jump's length.
// Source: Belanger's equation y2/y1 = ½(√(1+8F1²) − 1) gives y2 = 2.66 m
// for F1 = V/√(g·y1) = 10/√(9.80665 × 0.4) = 5.05 (closed form); the
// length is Peterka's, about 6·y2 (USBR Engineering Monograph 25, 1958).
func ExampleSequentDepth() {
	sec := &model.Section{Shape: model.Rectangle, BottomWidth: 3, Height: 4,
		Roughness: [3]float64{0.014, 0.014, 0.014}}
	g := solver.NewGeometry(sec, model.SI)
	y1 := 0.4
	f1 := solver.FroudeNumber(g, 12, y1)
	y2, err := solver.SequentDepth(g, 12, y1)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("F1 %.2f, sequent depth %.2f m, jump length %.0f m\n", f1, y2, solver.JumpLength(y1, y2, f1))
	// Output:
	// F1 5.05, sequent depth 2.66 m, jump length 16 m
}

// Solving a whole model: the canal above a dam of the direct-step
// example, whose M1 backwater curve rises from normal depth to the 5.0 ft
// held at the dam. Source: Chow, Open-Channel Hydraulics (1959), ch. 10
// (from memory); references.md gives depth 4.0 ft about 890 ft upstream
// of the dam (computed by a fine integration, not published).
func ExampleSolve() {
	src := []byte(`
units = "us"

section "canal" {
  shape        = "trapezoid"
  bottom_width = 20
  side_slope   = 2
  height       = 7
  roughness    = 0.025
}

reach "canal" {
  from    = "head"
  to      = "dam"
  length  = 5000
  section = "canal"
  slope   = 0.0016
}

event "design" {
  inflow = { canal = 400 }
  outlet = { depth = 5.0 }
}
`)
	m, diags := model.Parse("canal.chan.hcl", src)
	if diags.HasErrors() {
		fmt.Println(diags)
		return
	}
	res, err := solver.Solve(m, solver.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	rr := res.Events[0].Reaches[0]
	first, last := rr.Points[0], rr.Points[len(rr.Points)-1]
	fmt.Printf("%s slope, %s profile: depth %.2f ft at station %.0f ft, %.2f ft at the dam\n", rr.SlopeClass, rr.Profiles[0].Type, first.Depth, first.Station, last.Depth)
	// Output:
	// mild slope, M1 profile: depth 3.36 ft at station 0 ft, 5.00 ft at the dam
}
