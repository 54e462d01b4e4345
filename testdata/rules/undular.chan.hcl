# Golden model for the jump-containment threshold: a sluice gate releases
# a jet onto a rectangular channel whose normal depth is only 1.3 times
# critical, so the jump that returns the flow to normal depth is undular
# (F1 about 1.5, Peterka's range 1–1.7) and dissipates a few centimetres
# of head. No basin is built. With no threshold the jump is reported; a
# policy that exempts jumps below F1 1.7, or below a head loss of 0.05 m,
# reports nothing. An invented outlet works.

units = "si"
title = "Fennick weir relief outlet"

section "relief" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 1.6
  roughness    = 0.014
  lining       = "concrete"
}

# want:all jump_containment q toe..end
reach "relief" {
  from    = "weir-pool"
  to      = "cut"
  length  = 200
  section = "relief"
  slope   = 0.0019
}

gate "relief-gate" {
  reach       = "relief"
  opening     = 0.7
  contraction = 0.61
}

event "q" {
  inflow = { "relief" = 4.0 }
  outlet = { condition = "normal" }
}
