# Golden model for the geometric and safety rules (side_slope,
# bottom_width, bed_slope, public_safety, bend_radius): a grassed roadside
# V-ish ditch joining a concrete trunk cut whose outlet runs at normal
# depth, so the trunk carries uniform flow and its depth and velocity
# follow from Manning's equation (rules/criteria_test.go computes them
# independently). An invented drainage scheme.

units = "si"
title = "Pellow Road drainage"

section "ditch" {
  shape        = "trapezoid"
  bottom_width = 0.5
  side_slope   = 2
  height       = 1.2
  roughness    = 0.03
  lining       = "grass"
}

section "cut" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.45
  roughness    = 0.015
  lining       = "concrete"
}

# want side_slope - 0..500
# want bottom_width - 0..500
# want bed_slope - 0..500
reach "roadside" {
  from    = "road-top"
  to      = "trunk-head"
  length  = 500
  section = "ditch"
  slope   = 0.003
  class   = "roadside-ditch"
}

# want bed_slope - 0..1000
# want public_safety q-design 0..1000
reach "trunk" {
  from    = "trunk-head"
  to      = "outfall"
  length  = 1000
  section = "cut"
  slope   = 0.001
  class   = "constructed"
}

# want bend_radius q-low 400..600
# want bend_radius q-design 400..600
bend "mill-curve" {
  reach        = "trunk"
  from_station = 400
  to_station   = 600
  radius       = 8
}

event "q-low" {
  inflow = { "roadside" = 0.2, "trunk" = 0.8 }
  outlet = { condition = "normal" }
}

event "q-design" {
  inflow = { "roadside" = 0.2, "trunk" = 3.8 }
  outlet = { condition = "normal" }
}
