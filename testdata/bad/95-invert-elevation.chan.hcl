# Inverts 1e8 m up: a survey in millimetres read as metres, or a stray
# exponent.
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
  invert  = [1e8, 99999999.2] # want model "Elevation out of range.*the upstream invert of reach \x22main\x22 is 1e\+08 m"
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
