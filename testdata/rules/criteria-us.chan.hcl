# criteria.chan.hcl in US customary units: every length divided by 0.3048
# m/ft and every discharge by 0.3048³, so its findings are those of the SI
# model converted.
#
# Golden model for the geometric and safety rules (side_slope,
# bottom_width, bed_slope, public_safety, bend_radius): a grassed roadside
# V-ish ditch joining a concrete trunk cut whose outlet runs at normal
# depth, so the trunk carries uniform flow and its depth and velocity
# follow from Manning's equation (rules/criteria_test.go computes them
# independently). An invented drainage scheme.

units = "us"
title = "Pellow Road drainage (feet)"

section "ditch" {
  shape        = "trapezoid"
  bottom_width = 1.6404199475065615
  side_slope   = 2
  height       = 3.937007874015748
  roughness    = 0.03
  lining       = "grass"
}

section "cut" {
  shape        = "rectangle"
  bottom_width = 9.84251968503937
  height       = 4.757217847769028
  roughness    = 0.015
  lining       = "concrete"
}

# want side_slope - 0..1640.4199475065616
# want bottom_width - 0..1640.4199475065616
# want bed_slope - 0..1640.4199475065616
reach "roadside" {
  from    = "road-top"
  to      = "trunk-head"
  length  = 1640.4199475065616
  section = "ditch"
  slope   = 0.003
  class   = "roadside-ditch"
}

# want bed_slope - 0..3280.839895013123
# want public_safety q-design 0..3280.839895013123
reach "trunk" {
  from    = "trunk-head"
  to      = "outfall"
  length  = 3280.839895013123
  section = "cut"
  slope   = 0.001
  class   = "constructed"
}

# want bend_radius q-low 1312.3359580052493..1968.503937007874
# want bend_radius q-design 1312.3359580052493..1968.503937007874
bend "mill-curve" {
  reach        = "trunk"
  from_station = 1312.3359580052493
  to_station   = 1968.503937007874
  radius       = 26.246719160104984
}

event "q-low" {
  inflow = { "roadside" = 7.062933344297718, "trunk" = 28.25173337719087 }
  outlet = { condition = "normal" }
}

event "q-design" {
  inflow = { "roadside" = 7.062933344297718, "trunk" = 134.1957335416566 }
  outlet = { condition = "normal" }
}
