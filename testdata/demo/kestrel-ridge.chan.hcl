# Kestrel Ridge, phase 2 storm drainage (an invented development).
#
# Two roadside tributaries meet at Ridge Junction and feed a lined trunk
# channel. The trunk drops down the escarpment through a gate-controlled
# chute onto a horizontal stilling apron, passes under Quarry Lane in a
# culvert and leaves along the natural bed of Merrow Brook to the outfall.

units = "si"
title = "Kestrel Ridge phase 2 storm drainage"

section "swale" {
  shape        = "trapezoid"
  bottom_width = 1.0
  side_slope   = 3.0
  height       = 1.2
  roughness    = 0.035
  lining       = "grass"
}

section "ditch" {
  shape        = "rectangle"
  bottom_width = 1.2
  height       = 1.3
  roughness    = 0.014
  lining       = "concrete"
}

section "trunk" {
  shape        = "trapezoid"
  bottom_width = 2.0
  side_slope   = 1.5
  height       = 1.8
  roughness    = 0.015
  lining       = "concrete"
}

section "trunk-throat" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 1.8
  roughness    = 0.015
  lining       = "concrete"
}

section "chute" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 1.5
  roughness    = 0.014
  lining       = "concrete"
}

section "apron" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 2.2
  roughness    = 0.014
  lining       = "concrete"
}

section "quarry-lane-pipe" {
  shape     = "circle"
  diameter  = 2.0
  roughness = 0.013
  lining    = "concrete"
}

section "merrow-brook" {
  shape     = "points"
  points    = [[0, 3.0], [8, 1.6], [12, 0.6], [14, 0.0], [16, 0.1], [19, 0.7], [24, 1.8], [34, 3.2]]
  banks     = [8, 24]
  roughness = [0.06, 0.035, 0.07]
  lining    = "earth"
}

reach "north-swale" {
  from    = "north-inlet"
  to      = "ridge-junction"
  length  = 350
  section = "swale"
  slope   = 0.004
}

reach "east-ditch" {
  from    = "east-inlet"
  to      = "ridge-junction"
  length  = 280
  section = "ditch"
  slope   = 0.003
}

reach "trunk" {
  from        = "ridge-junction"
  to          = "chute-head"
  length      = 620
  section     = "trunk"
  slope       = 0.002
  max_spacing = 20

  segment {
    from_station = 570
    to_station   = 620
    section      = "trunk-throat"
  }
}

reach "chute" {
  from    = "chute-head"
  to      = "apron-head"
  length  = 45
  section = "chute"
  slope   = 0.06
}

# The apron floor is level and sits 0.20 m above the culvert inlet invert,
# which keeps the culvert's headwater pool low enough for the jump to stay
# off the chute.
reach "apron" {
  from    = "apron-head"
  to      = "culvert-inlet"
  length  = 30
  section = "apron"
  invert  = [1.05, 1.05]
}

reach "quarry-lane-culvert" {
  from    = "culvert-inlet"
  to      = "culvert-outlet"
  length  = 40
  section = "quarry-lane-pipe"
  invert  = [0.85, 0.77]
}

reach "merrow-brook" {
  from    = "culvert-outlet"
  to      = "outfall"
  length  = 500
  section = "merrow-brook"
  slope   = 0.0015
}

# Quarry Lane crosses the brook on a 2 m concrete pipe with a square-edged
# headwall; the lane's low point is 4.6 m, 1.75 m above the pipe's crown.
culvert "quarry-lane" {
  reach   = "quarry-lane-culvert"
  barrels = 1
  inlet   = "square-edge-headwall"
  road    = { crest = 4.6, length = 40, width = 10 }
}

# The trunk narrows into its lined throat over a warped transition; the
# coefficients are those tabulated for warped transitions (Hinds 1928, USBR,
# in Chow 1959, ch. 17).
loss "throat" {
  reach       = "trunk"
  station     = 570
  contraction = 0.1
  expansion   = 0.2
}

gate "escarpment-gate" {
  reach   = "chute"
  opening = 0.8
}

basin "apron-basin" {
  reach        = "apron"
  from_station = 0
  to_station   = 24
}

# The east ditch starts below a pipe outfall from the business park, where
# the 10-year flow arrives shallow and fast and jumps on a short apron.
basin "east-inlet-apron" {
  reach        = "east-ditch"
  from_station = 0
  to_station   = 15
}

bend "junction-curve" {
  reach        = "trunk"
  from_station = 380
  to_station   = 450
  radius       = 35
}

event "q10" {
  inflow   = { "north-swale" = 1.6, "east-ditch" = 1.1, "trunk" = 0.7 }
  outlet   = { depth = 0.9 }
  entrance = { "east-ditch" = 0.3 }
}

event "q100" {
  inflow = { "north-swale" = 2.6, "east-ditch" = 1.8, "trunk" = 1.2 }
  outlet = { elevation = 2.1 }
}

exception "max_velocity" {
  reach        = "chute"
  from_station = 0
  to_station   = 45
  reason       = "Chute slab designed for high-velocity flow; reviewed with the county drainage engineer"
}

exception "max_velocity" {
  reach        = "apron"
  from_station = 0
  to_station   = 12
  reason       = "Basin floor slab takes the entering jet; designed with the chute slab and reviewed with it"
}
