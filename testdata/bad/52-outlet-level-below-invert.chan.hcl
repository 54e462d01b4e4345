# A tailwater level under the outlet invert.
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
  invert  = [10.8, 10.0]
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { elevation = 9.5 } # want model "Outlet level at or below the invert"
}
