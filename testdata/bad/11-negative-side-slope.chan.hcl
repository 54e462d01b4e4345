# A trapezoid leaning inwards.
units = "si"
section "lined" {
  shape        = "trapezoid"
  bottom_width = 2.0
  side_slope   = -1 # want model "Negative side slope"
  height       = 1.2
  roughness    = 0.015
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
