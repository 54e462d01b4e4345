# A reach needs a bed: slope or invert.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" { # want model "Missing bed slope"
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
