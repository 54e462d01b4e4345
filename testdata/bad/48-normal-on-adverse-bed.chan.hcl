# Normal depth does not exist on a rising bed.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = -0.001
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { condition = "normal" } # want model "No normal depth at the outlet"
}
