# Heron Flats outfall (an invented scenario for the report tests).
# A gated chute and a long grassed ditch meet at Heron Junction; a lined
# outfall channel with one bend carries both to the river.

units = "si"
title = "Heron Flats outfall channel"

section "chute" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.014
  lining       = "concrete"
}

section "ditch" {
  shape        = "trapezoid"
  bottom_width = 1.5
  side_slope   = 2.5
  height       = 1.1
  roughness    = 0.030
  lining       = "grass"
}

section "outfall" {
  shape        = "trapezoid"
  bottom_width = 3.0
  side_slope   = 2.0
  height       = 1.6
  roughness    = 0.015
  lining       = "concrete"
}

reach "chute" {
  from    = "chute-head"
  to      = "heron-junction"
  length  = 60
  section = "chute"
  slope   = 0.05
}

reach "long-ditch" {
  from    = "ditch-head"
  to      = "heron-junction"
  length  = 900
  section = "ditch"
  slope   = 0.0015
}

reach "outfall" {
  from    = "heron-junction"
  to      = "river"
  length  = 700
  section = "outfall"
  slope   = 0.001
}

gate "chute-gate" {
  reach   = "chute"
  opening = 0.3
}

basin "apron" {
  reach        = "chute"
  from_station = 30
  to_station   = 52
}

bend "mill-bend" {
  reach        = "outfall"
  from_station = 250
  to_station   = 330
  radius       = 45
}

event "q10" {
  inflow = { "chute" = 3.0, "long-ditch" = 2.0 }
  outlet = { condition = "normal" }
}

event "q100" {
  inflow = { "chute" = 5.5, "long-ditch" = 3.5 }
  outlet = { depth = 1.5 }
}

exception "freeboard" {
  reach        = "outfall"
  from_station = 600
  to_station   = 700
  reason       = "Tailwater from the river governs; bank raised under the levee permit"
}
