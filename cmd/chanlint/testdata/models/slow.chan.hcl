# Pellham flats drain (an invented scenario): a wide, flat concrete channel
# whose small base flow moves too slowly to keep itself clean, so the
# baseline pack warns about the velocity and nothing else.
units = "si"
title = "Pellham flats drain"

section "flat" {
  shape        = "rectangle"
  bottom_width = 10.0
  height       = 2.0
  roughness    = 0.015
  lining       = "concrete"
}

reach "drain" {
  from    = "head"
  to      = "sump"
  length  = 150
  section = "flat"
  slope   = 0.0005
}

event "base" {
  inflow = { "drain" = 0.5 }
  outlet = { condition = "normal" }
}
